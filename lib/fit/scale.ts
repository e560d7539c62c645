/**
 * Column statistics for standardization: means and standard deviations of design columns over
 * the training rows, with the population divisor n (SD = √(Σ(x − mean)²/n), as in most
 * coordinate-descent and preprocessing libraries; common practice).
 *
 * They are read from the all-rows co-moments the solver needs anyway (lib/sweep/moments.ts): two
 * passes within each bucket of rows (means, then centered products), merged by the formulas of
 * Chan, Golub & LeVeque (1979). Each is accurate to a few ulps; the design's trailing parts (below
 * half an ulp of each value) are not included.
 *
 * @module
 */
import type { Moments } from "../sweep/moments.ts";

/** Means and SDs of each design column. */
export interface ColumnScales {
  /** Column means over the rows. */
  readonly means: Float64Array;
  /** Column standard deviations, divisor n. */
  readonly sds: Float64Array;
}

/**
 * Means and SDs (divisor n) of the design columns of all-rows co-moments (the target, last, is
 * left out).
 *
 * @example
 * ```ts
 * import { columnScales } from "./scale.ts";
 * import { bucketMoments } from "../sweep/moments.ts";
 * const [m] = bucketMoments(Float64Array.of(1, 3), 1, Float64Array.of(0, 1), Int32Array.of(0, 0), 1);
 * const s = columnScales(m);
 * console.log(s.means[0], s.sds[0]); // 2 1
 * ```
 */
export function columnScales(moments: Moments): ColumnScales {
  const p = moments.d - 1;
  const means = moments.mean.slice(0, p);
  const sds = Float64Array.from(
    { length: p },
    (_, q) => Math.sqrt(moments.cross[q * moments.d + q] / moments.count),
  );
  return { means, sds };
}
