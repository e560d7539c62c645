/**
 * Residual passes over the design rows in double-double: the one place the exact solvers read
 * the data. Each residual yᵢ − rᵢ − b − zᵢᵀw is formed with the operations of one double-double
 * accumulator per row (TwoSum and Dekker's TwoProduct, inlined: the split of each w_q is taken
 * once), then rounded; column sums of a multiplier tᵢ times the design are accumulated the same
 * way, one compensated sum per column.
 *
 * @module
 */
import { productError, splitHigh, sumError } from "../numeric/dd.ts";
import type { DesignBlock } from "../design/types.ts";

/** The rows a pass reads: the design and the target. */
export type DataRows = Pick<DesignBlock, "n" | "p" | "hi" | "lo"> & { readonly y: Float64Array };

/**
 * What one pass adds up, in double-double (leading parts in `hi`, trailing parts in `lo`): the
 * multiplier's sum first when `intercept` is set, then one entry per design column.
 */
export interface ColumnSums {
  readonly hi: Float64Array;
  readonly lo: Float64Array;
  readonly intercept: boolean;
}

/** Where a pass takes the multiplier tᵢ of its column sums from. */
export type Multiplier = "given" | "residual";

/**
 * One pass over the data rows at intercept `b` and coefficients `w`:
 * dᵢ = yᵢ − rᵢ − b − Σ_q (hi + lo)_iq w_q in double-double, rounded to double (rᵢ = 0 when `r`
 * is omitted), written to `out` when given. When `sums` is given it is reset to Σᵢ tᵢ (with an
 * intercept) and Σᵢ (hi + lo)_iq tᵢ, where tᵢ = rᵢ (`multiplier` "given": Aᵀr of Björck's
 * refinement) or tᵢ = dᵢ ("residual": the gradient Aᵀe of the normal equations). Returns
 * Σᵢ dᵢ² in double-double, rounded. `withLo` flags the columns whose lo parts are read. For
 * "residual" the multiplier is dᵢ unrounded (its double-double value), as refinement needs.
 *
 * @example
 * ```ts
 * import { residualPass } from "./residuals.ts";
 * const rows = { n: 2, p: 1, hi: Float64Array.of(1, 2), lo: new Float64Array(2), y: Float64Array.of(1, 1) };
 * console.log(residualPass(rows, Uint8Array.of(0), 0, Float64Array.of(1))); // 1
 * ```
 */
export function residualPass(
  rows: DataRows,
  withLo: Uint8Array,
  b: number,
  w: Float64Array,
  options: {
    readonly r?: Float64Array;
    readonly out?: Float64Array;
    readonly sums?: ColumnSums;
    readonly multiplier?: Multiplier;
  } = {},
): number {
  const { n, p, hi, y } = rows;
  // Read only where withLo is 1, which columnsWithLo never sets when lo is null.
  const lo = rows.lo ?? new Float64Array(0);
  const { r, out, sums } = options;
  const ownResidual = options.multiplier === "residual";
  const wHi = w.map(splitHigh);
  const wLo = w.map((v, q) => v - wHi[q]);
  const sumHi = sums?.hi ?? new Float64Array(0);
  const sumLo = sums?.lo ?? new Float64Array(0);
  const off = sums?.intercept ? 1 : 0;
  sumHi.fill(0);
  sumLo.fill(0);
  let sqHi = 0;
  let sqLo = 0;
  for (let i = 0; i < n; i++) {
    let h = y[i];
    let l = 0;
    let s: number;
    if (r !== undefined) {
      s = h - r[i];
      l += sumError(h, -r[i], s);
      h = s;
    }
    s = h - b;
    l += sumError(h, -b, s);
    h = s;
    const row = i * p;
    for (let q = 0; q < p; q++) {
      const v = hi[row + q];
      const vHi = splitHigh(v);
      // The product (−v)·w_q; the split of −v is the negated split of v.
      const prod = -v * w[q];
      s = h + prod;
      l += sumError(h, prod, s);
      h = s;
      l += productError(prod, -vHi, vHi - v, wHi[q], wLo[q]);
      if (withLo[q] === 1) l -= lo[row + q] * w[q];
    }
    const d = h + l;
    const dLo = sumError(h, l, d);
    if (out !== undefined) out[i] = d;
    const dHi = splitHigh(d);
    const sq = d * d;
    s = sqHi + sq;
    sqLo += sumError(sqHi, sq, s) + productError(sq, dHi, d - dHi, dHi, d - dHi);
    sqHi = s;
    if (sums === undefined) continue;
    // The multiplier in double-double: the residual keeps its trailing part, so the gradient
    // Aᵀe is not limited by rounding e (which would cost digits when residuals are large).
    const t = ownResidual ? d : r === undefined ? 0 : r[i];
    const tTrail = ownResidual ? dLo : 0;
    const tHi = splitHigh(t);
    const tLo = t - tHi;
    if (off === 1) {
      s = sumHi[0] + t;
      sumLo[0] += sumError(sumHi[0], t, s) + tTrail;
      sumHi[0] = s;
    }
    for (let q = 0; q < p; q++) {
      const v = hi[row + q];
      const vHi = splitHigh(v);
      const gp = v * t;
      const j = off + q;
      s = sumHi[j] + gp;
      let gl = sumLo[j] + sumError(sumHi[j], gp, s);
      gl += productError(gp, vHi, v - vHi, tHi, tLo) + v * tTrail;
      if (withLo[q] === 1) gl += lo[row + q] * t;
      sumHi[j] = s;
      sumLo[j] = gl;
    }
  }
  return sqHi + sqLo;
}

/**
 * Σ (yᵢ − b − zᵢᵀw)² with each residual formed in double-double. `withLo` flags the design
 * columns whose lo parts are not all zero (computed from the block when omitted).
 *
 * @example
 * ```ts
 * import { residualSumOfSquares } from "./residuals.ts";
 * const rows = { n: 2, p: 1, hi: Float64Array.of(1, 2), lo: new Float64Array(2), y: Float64Array.of(1, 1) };
 * console.log(residualSumOfSquares(rows, 0, Float64Array.of(1))); // 1
 * ```
 */
export function residualSumOfSquares(
  rows: DataRows,
  intercept: number,
  w: Float64Array,
  withLo: Uint8Array = columnsWithLo(rows),
): number {
  return residualPass(rows, withLo, intercept, w);
}

/**
 * Flags (1) the columns of a design block whose lo parts are not all zero (none when lo is null).
 *
 * @example
 * ```ts
 * import { columnsWithLo } from "./residuals.ts";
 * console.log(columnsWithLo({ n: 1, p: 2, hi: Float64Array.of(0.1, 0.01), lo: Float64Array.of(0, 1e-19) })); // Uint8Array(2) [ 0, 1 ]
 * ```
 */
export function columnsWithLo(block: Pick<DesignBlock, "n" | "p" | "lo">): Uint8Array {
  const { n, p, lo } = block;
  const flags = new Uint8Array(p);
  if (lo === null) return flags;
  for (let i = 0; i < n; i++) {
    const row = i * p;
    for (let q = 0; q < p; q++) if (lo[row + q] !== 0) flags[q] = 1;
  }
  return flags;
}
