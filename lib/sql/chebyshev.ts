/**
 * Legendre polynomials from Chebyshev polynomials, so that SQL can compute every Legendre design
 * column from flat expressions. With t = cos θ, T_m(t) = cos(mθ) is one expression per column
 * (no recurrence, so nothing is nested or repeated in the query), and
 *   P_n(cos θ) = Σ_{j=0}^{n} a_j a_{n−j} cos((n − 2j)θ),   a_j = (2j choose j) / 4^j
 * (the classical Fourier series of the Legendre polynomials, e.g. Whittaker & Watson §15.14;
 * recalled from memory, and checked against Bonnet's recurrence in test/sql_test.ts). All
 * coefficients are positive and sum to P_n(1) = 1, so the change of basis cannot amplify
 * rounding. Products also stay flat: T_j T_l = (T_{j+l} + T_{|j−l|}) / 2, so the Gram matrix of
 * one Legendre term needs only the sums of T_0 … T_{2d}.
 *
 * @module
 */

/**
 * The (d+1)×(d+1) matrix L, row-major, with P_n(t) = Σ_m L[n·(d+1) + m] T_m(t) for n = 0 … d.
 *
 * @example
 * ```ts
 * import { legendreFromChebyshev } from "./chebyshev.ts";
 * // P_2 = (3t² − 1)/2 = 1/4 T_0 + 3/4 T_2
 * console.log(legendreFromChebyshev(2).slice(6, 9)); // Float64Array [0.25, 0, 0.75]
 * ```
 */
export function legendreFromChebyshev(d: number): Float64Array {
  const w = d + 1;
  const a = new Float64Array(w);
  a[0] = 1;
  for (let j = 1; j <= d; j++) a[j] = (a[j - 1] * (2 * j - 1)) / (2 * j);
  const out = new Float64Array(w * w);
  for (let n = 0; n <= d; n++) {
    for (let j = 0; j <= n; j++) out[n * w + Math.abs(n - 2 * j)] += a[j] * a[n - j];
  }
  return out;
}

/**
 * T_m(t) for m = 0 … count−1 at one point, any real t (cos(m·acos t) inside [−1, 1],
 * cosh(m·acosh |t|) with sign (−1)^m for t < −1 outside): the values the SQL expressions give.
 *
 * @example
 * ```ts
 * import { chebyshevValues } from "./chebyshev.ts";
 * console.log(chebyshevValues(0.5, 3)); // Float64Array [1, 0.5, -0.5] (up to rounding)
 * ```
 */
export function chebyshevValues(t: number, count: number): Float64Array {
  return Float64Array.from({ length: count }, (_, m) => {
    if (t > 1) return Math.cosh(m * Math.acosh(t));
    if (t < -1) return (m % 2 === 0 ? 1 : -1) * Math.cosh(m * Math.acosh(-t));
    return Math.cos(m * Math.acos(t));
  });
}
