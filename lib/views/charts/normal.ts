/**
 * Standard normal quantiles, for the normal quantile plot of residuals: Wichura (1988),
 * Algorithm AS 241 "The percentage points of the normal distribution", Applied Statistics
 * 37(3): 477–484, routine PPND16 (about 16 correct digits).
 *
 * @module
 */

/** Horner evaluation of c[0]·r^(n−1) + … + c[n−1] (coefficients highest power first). */
function horner(c: readonly number[], r: number): number {
  let v = c[0];
  for (let i = 1; i < c.length; i++) v = v * r + c[i];
  return v;
}

// AS 241 coefficients, highest power first: |p − 0.5| ≤ 0.425.
const CENTRAL_NUM = [
  2.5090809287301226727e+3,
  3.3430575583588128105e+4,
  6.7265770927008700853e+4,
  4.5921953931549871457e+4,
  1.3731693765509461125e+4,
  1.9715909503065514427e+3,
  1.3314166789178437745e+2,
  3.3871328727963666080e+0,
];
const CENTRAL_DEN = [
  5.2264952788528545610e+3,
  2.8729085735721942674e+4,
  3.9307895800092710610e+4,
  2.1213794301586595867e+4,
  5.3941960214247511077e+3,
  6.8718700749205790830e+2,
  4.2313330701600911252e+1,
  1.0,
];
// r = √(−ln(min(p, 1 − p))) ≤ 5, in powers of r − 1.6.
const NEAR_NUM = [
  7.7454501427834140764e-4,
  2.2723844989269184583e-2,
  2.4178072517745061177e-1,
  1.2704582524523683826e+0,
  3.6478483247632045946e+0,
  5.7694972214606914055e+0,
  4.6303378461565452959e+0,
  1.4234371107496835773e+0,
];
const NEAR_DEN = [
  1.0507500716444168432e-9,
  5.4759380849953449460e-4,
  1.5198666563616457197e-2,
  1.4810397642748007459e-1,
  6.8976733498510000455e-1,
  1.6763848301838038494e+0,
  2.0531916266377588219e+0,
  1.0,
];
// r > 5, in powers of r − 5.
const FAR_NUM = [
  2.0103343992922881327e-7,
  2.7115555687434875782e-5,
  1.2426609473880784386e-3,
  2.6532189526576123093e-2,
  2.9656057182850489123e-1,
  1.7848265399172913358e+0,
  5.4637849111641143699e+0,
  6.6579046435011037772e+0,
];
const FAR_DEN = [
  2.0442631033899397856e-15,
  1.4215117583164458887e-7,
  1.8463183175100546818e-5,
  7.8686913114561325910e-4,
  1.4875361290850614853e-2,
  1.3692988092273580531e-1,
  5.9983220655588793769e-1,
  1.0,
];

/**
 * The standard normal quantile Φ⁻¹(p) for 0 < p < 1 (NaN outside), by AS 241.
 *
 * @example
 * ```ts
 * import { normalQuantile } from "./normal.ts";
 * console.log(normalQuantile(0.975)); // 1.959963984540054
 * ```
 */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) return NaN;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (q * horner(CENTRAL_NUM, r)) / horner(CENTRAL_DEN, r);
  }
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p));
  let x: number;
  if (r <= 5) {
    r -= 1.6;
    x = horner(NEAR_NUM, r) / horner(NEAR_DEN, r);
  } else {
    r -= 5;
    x = horner(FAR_NUM, r) / horner(FAR_DEN, r);
  }
  return q < 0 ? -x : x;
}

/**
 * Blom's plotting positions (i − 3/8)/(n + 1/4), i = 1..n (Blom 1958, *Statistical Estimates
 * and Transformed Beta-Variables*), mapped through Φ⁻¹: the expected positions of n sorted
 * standard normal draws, to close approximation.
 *
 * @example
 * ```ts
 * import { normalScores } from "./normal.ts";
 * console.log(normalScores(3)); // [-0.8193…, 0, 0.8193…]
 * ```
 */
export function normalScores(n: number): number[] {
  return Array.from({ length: n }, (_, i) => normalQuantile((i + 1 - 0.375) / (n + 0.25)));
}
