/**
 * Column statistics for standardization: means and standard deviations of design columns over
 * the rows given, with the population divisor n (SD = √(Σ(x − mean)²/n), as in most
 * coordinate-descent and preprocessing libraries; common practice). Sums are compensated.
 *
 * @module
 */
import { productError, splitHigh, sumError } from "../numeric/dd.ts";
import type { DesignBlock } from "../design/types.ts";

/** Means and SDs of each design column. */
export interface ColumnScales {
  readonly means: Float64Array;
  readonly sds: Float64Array;
}

/**
 * Two-pass mean and SD (divisor n) of every column of a double-double design block.
 *
 * @example
 * ```ts
 * import { columnScales } from "./scale.ts";
 * const s = columnScales({ n: 2, p: 1, hi: Float64Array.of(1, 3), lo: new Float64Array(2) });
 * console.log(s.means[0], s.sds[0]); // 2 1
 * ```
 */
export function columnScales(block: DesignBlock): ColumnScales {
  const { n, p, hi, lo } = block;
  // One compensated sum per column (leading parts in sumHi, trailing in sumLo), updated row by
  // row so the row-major block is read in order: the operations of one DDAccumulator per column.
  const sumHi = new Float64Array(p);
  const sumLo = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const row = i * p;
    for (let q = 0; q < p; q++) {
      const a = hi[row + q];
      const s = sumHi[q] + a;
      const l = sumLo[q] + sumError(sumHi[q], a, s);
      sumLo[q] = lo === null ? l : l + lo[row + q];
      sumHi[q] = s;
    }
  }
  const means = sumHi.map((h, q) => (h + sumLo[q]) / n);
  sumHi.fill(0);
  sumLo.fill(0);
  for (let i = 0; i < n; i++) {
    const row = i * p;
    for (let q = 0; q < p; q++) {
      const d = lo === null ? hi[row + q] - means[q] : (hi[row + q] - means[q]) + lo[row + q];
      const sq = d * d;
      const dHi = splitHigh(d);
      const s = sumHi[q] + sq;
      let l = sumLo[q] + sumError(sumHi[q], sq, s);
      l += productError(sq, dHi, d - dHi, dHi, d - dHi);
      sumHi[q] = s;
      sumLo[q] = l;
    }
  }
  const sds = sumHi.map((h, q) => Math.sqrt((h + sumLo[q]) / n));
  return { means, sds };
}
