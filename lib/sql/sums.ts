/**
 * From the raw sums of the moments query to a summary in the design's basis, after checking that
 * every row's category levels were learned and that no sum overflowed. Per fold:
 *   G = Σ u uᵀ (Chebyshev blocks from the sums of T_m: T_j T_l = (T_{j+l} + T_{|j−l|})/2),
 *   s = Σ u,  mean = s/n (+ shift),  centered co-moments C = G − s sᵀ/n,
 * then the Chebyshev blocks are mapped to Legendre columns by the positive, sum-to-one
 * coefficients of lib/sql/chebyshev.ts (lib/sweep/basis.ts applies the map).
 *
 * Stability: plain columns and the target are summed as deviations from shifts close to their
 * means (found by the ranges query), and powers, indicators and products from guesses at theirs
 * (lib/sql/query.ts `featureBlocks`), so s is small and C loses little to cancellation;
 * Chebyshev columns lie in [−1, 1] inside their domain. The rounding left is that of computing
 * each value and summing n products in float64 in the engine (README.md).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Moments } from "../sweep/moments.ts";
import { type BasisChange, changeMoments } from "../sweep/basis.ts";
import { legendreFromChebyshev } from "./chebyshev.ts";
import { blockSize, type FeatureBlock, type SumItem } from "./query.ts";

/**
 * The summary, in the design basis (the blocks' columns in order, target last), of one fold's
 * row count and sums (`sums[i]` is the SUM of `items[i]`).
 *
 * Errors: a category level that was not learned (UNKNOWN_LEVEL, naming the column; the data
 * changed after the levels query, or holds a NULL there), a sum that is not finite
 * (NOT_FINITE: design values overflow double precision). `source` names the data in messages.
 *
 * @example
 * ```ts
 * import { momentsFromSums } from "./sums.ts";
 * const blocks = [{ kind: "shifted" as const, column: "y", shift: 10 }];
 * const items = [{ kind: "linear" as const, block: 0, index: 0 }, { kind: "product" as const, left: 0, leftIndex: 0, right: 0, rightIndex: 0 }];
 * // rows y = 9, 11: deviations −1, 1 → Σ = 0, Σ² = 2
 * const m = momentsFromSums(blocks, items, 2, Float64Array.of(0, 2));
 * console.log(m.mean[0], m.cross[0]); // 10 2
 * ```
 */
export function momentsFromSums(
  blocks: readonly FeatureBlock[],
  items: readonly SumItem[],
  count: number,
  sums: Float64Array,
  source = "SQL source",
): Moments {
  checkSums(blocks, items, count, sums, source);
  const offsets: number[] = [];
  let d = 0;
  for (const b of blocks) {
    offsets.push(d);
    d += blockSize(b);
  }
  const s = new Float64Array(d);
  const g = new Float64Array(d * d);
  const cheb = blocks.map((b) => {
    const v = new Float64Array(b.kind === "chebyshev" ? 2 * b.degree + 1 : 0);
    if (v.length > 0) v[0] = count;
    return v;
  });
  items.forEach((item, i) => {
    const value = sums[i];
    if (item.kind === "chebyshev") cheb[item.block][item.m] = value;
    else if (item.kind === "linear") s[offsets[item.block] + item.index] = value;
    else if (item.kind === "product") {
      const r = offsets[item.left] + item.leftIndex;
      const c = offsets[item.right] + item.rightIndex;
      g[r * d + c] = value;
      g[c * d + r] = value;
    }
  });
  blocks.forEach((b, i) => {
    if (b.kind !== "chebyshev") return;
    const t = cheb[i], o = offsets[i];
    for (let j = 1; j <= b.degree; j++) {
      s[o + j - 1] = t[j];
      for (let l = 1; l <= b.degree; l++) {
        g[(o + j - 1) * d + o + l - 1] = (t[j + l] + t[Math.abs(j - l)]) / 2;
      }
    }
  });
  const mean = Float64Array.from(s, (v) => v / count);
  const cross = new Float64Array(d * d);
  for (let r = 0; r < d; r++) {
    for (let c = r; c < d; c++) {
      cross[r * d + c] = cross[c * d + r] = g[r * d + c] - s[r] * mean[c];
    }
  }
  blocks.forEach((b, i) => {
    if (b.kind === "shifted") mean[offsets[i]] += b.shift;
    if (b.kind === "factors") b.columns.forEach((c, j) => (mean[offsets[i] + j] += c.shift));
  });
  return changeMoments({ count, d, mean, cross }, chebyshevToLegendre(blocks, offsets));
}

/** UNKNOWN_LEVEL when a fold has rows of unlearned levels; NOT_FINITE when a sum overflowed. */
function checkSums(
  blocks: readonly FeatureBlock[],
  items: readonly SumItem[],
  count: number,
  sums: Float64Array,
  source: string,
): void {
  items.forEach((item, i) => {
    const block = item.kind === "levels" ? blocks[item.block] : undefined;
    if (block?.kind === "levels" && sums[i] !== count) {
      const rows = Number.isNaN(sums[i]) ? count : count - sums[i];
      const learned = block.levels.slice(0, 20).map((l) => JSON.stringify(l)).join(", ");
      throw new CurbfitError(
        "UNKNOWN_LEVEL",
        `${rows} rows have a level of column ${JSON.stringify(block.column)} that was not ` +
          `among the learned levels (${learned})`,
        "Do not change the table while it is being swept, and fill in or drop NULLs; " +
          "no result was produced",
        { source, column: block.column },
      );
    }
    if (!Number.isFinite(sums[i])) {
      throw new CurbfitError(
        "NOT_FINITE",
        "a sum of design values overflows double precision (beyond ±1.8e308)",
        "Use legendre() on a learned domain, a lower degree, or rescale the column",
        { source },
      );
    }
  });
}

/** The block-diagonal change from Chebyshev columns T_1 … T_d to Legendre P_1 … P_d. */
function chebyshevToLegendre(blocks: readonly FeatureBlock[], offsets: number[]): BasisChange {
  return {
    blocks: blocks.map((b, i) => {
      if (b.kind !== "chebyshev") {
        return { offset: offsets[i], size: blockSize(b), matrix: null, constant: null };
      }
      const size = b.degree, w = size + 1;
      const l = legendreFromChebyshev(size);
      const matrix = new Float64Array(size * size);
      const constant = new Float64Array(size);
      for (let j = 0; j < size; j++) {
        constant[j] = l[(j + 1) * w];
        for (let k = 0; k < size; k++) matrix[k * size + j] = l[(j + 1) * w + k + 1];
      }
      return { offset: offsets[i], size, matrix, constant };
    }),
  };
}
