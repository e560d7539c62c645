/**
 * Column statistics for standardization: means and standard deviations of design columns over
 * the rows given, with the population divisor n (SD = √(Σ(x − mean)²/n), as in most
 * coordinate-descent and preprocessing libraries; common practice). Sums are compensated.
 *
 * @module
 */
import { DDAccumulator } from "../numeric/dd.ts";
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
  const means = new Float64Array(p);
  const sds = new Float64Array(p);
  const acc = new DDAccumulator();
  for (let q = 0; q < p; q++) {
    acc.reset();
    for (let i = 0; i < n; i++) acc.addDD(hi[i * p + q], lo[i * p + q]);
    const mean = acc.value() / n;
    acc.reset();
    for (let i = 0; i < n; i++) {
      const d = (hi[i * p + q] - mean) + lo[i * p + q];
      acc.addProduct(d, d);
    }
    means[q] = mean;
    sds[q] = Math.sqrt(acc.value() / n);
  }
  return { means, sds };
}
