/**
 * Closed-form leave-one-out error and generalized cross-validation for in-memory data, from the
 * all-rows fit (standardization and Legendre domains learned on all rows, as the closed forms
 * require). For a linear smoother ŷ = H y the leave-one-out residual is (yᵢ − ŷᵢ)/(1 − Hᵢᵢ)
 * exactly (Allen 1974, PRESS; Hastie, Tibshirani & Friedman, *Elements of Statistical Learning*
 * 2nd ed., eq. 7.52), and GCV replaces Hᵢᵢ by its average tr(H)/n (Golub, Heath & Wahba 1979,
 * "Generalized cross-validation as a method for choosing a good ridge parameter").
 * Here tr(H) = df(λ) + 1 with an intercept. Cost: O(n·(p² + p·L)) for LOO, O(p·L) for GCV.
 *
 * @module
 */
import type { Spectrum } from "./spectrum.ts";
import { solutionAt, spectralWeights } from "./spectrum.ts";

/**
 * Mean squared leave-one-out error per λ.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "./moments.ts";
 * import { decompose } from "./spectrum.ts";
 * import { leaveOneOutErrors } from "./loo.ts";
 * const x = Float64Array.of(0, 1, 2, 3), y = Float64Array.of(1, 3, 4, 7);
 * const sp = decompose(bucketMoments(x, 1, y, new Int32Array(4), 1)[0], {
 *   gamma: Float64Array.of(1), standardize: true, intercept: true,
 * });
 * console.log(leaveOneOutErrors(sp, x, y, [0, 1]).length); // 2
 * ```
 */
export function leaveOneOutErrors(
  sp: Spectrum,
  x: Float64Array,
  y: Float64Array,
  lambdas: readonly number[],
): Float64Array {
  const { p } = sp;
  const n = y.length;
  const weights = lambdas.map((lambda) => ({
    h: spectralWeights(sp, lambda),
    inverse: Float64Array.from(sp.e, (e) => 1 / (e + lambda)),
  }));
  const sums = new Float64Array(lambdas.length);
  const t = new Float64Array(p);
  const centered = new Float64Array(p);
  const base = sp.intercept ? 1 / n : 0;
  for (let i = 0; i < n; i++) {
    for (let q = 0; q < p; q++) {
      centered[q] = (x[i * p + q] - (sp.intercept ? sp.meanX[q] : 0)) * sp.metric[q];
    }
    sp.vectors.forEach((v, j) => {
      let s = 0;
      for (let q = 0; q < p; q++) s += v[q] * centered[q];
      t[j] = s;
    });
    const yc = y[i] - (sp.intercept ? sp.meanY : 0);
    weights.forEach(({ h, inverse }, l) => {
      let leverage = base, fitted = 0;
      for (let j = 0; j < p; j++) {
        if (h[j] === 0) continue;
        leverage += t[j] * t[j] * inverse[j];
        fitted += t[j] * h[j];
      }
      const r = (yc - fitted) / (1 - leverage);
      sums[l] += r * r;
    });
  }
  return sums.map((s) => s / n);
}

/**
 * GCV(λ) = (RSS/n) / (1 − tr(H)/n)² per λ.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "./moments.ts";
 * import { decompose } from "./spectrum.ts";
 * import { generalizedCrossValidation } from "./loo.ts";
 * const x = Float64Array.of(0, 1, 2, 3), y = Float64Array.of(1, 3, 4, 7);
 * const sp = decompose(bucketMoments(x, 1, y, new Int32Array(4), 1)[0], {
 *   gamma: Float64Array.of(1), standardize: true, intercept: true,
 * });
 * console.log(generalizedCrossValidation(sp, [1])[0] > 0); // true
 * ```
 */
export function generalizedCrossValidation(sp: Spectrum, lambdas: readonly number[]): Float64Array {
  const n = sp.count;
  return Float64Array.from(lambdas, (lambda) => {
    const s = solutionAt(sp, lambda);
    const trace = s.df + (sp.intercept ? 1 : 0);
    return s.rss / n / (1 - trace / n) ** 2;
  });
}
