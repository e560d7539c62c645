/**
 * Householder QR of a tall matrix held as columns, without pivoting (column order matters:
 * the intercept column goes first so the trailing block of R is the centered problem).
 * Source: Golub & Van Loan, *Matrix Computations* (4th ed.), Algorithms 5.1.1 and 5.2.1.
 *
 * @module
 */

/** A factorization A = QR stored compactly: reflectors below the diagonal, R on and above. */
export interface HouseholderQR {
  readonly m: number;
  readonly n: number;
  /** Column j: R[0..j] in entries 0..j-1 and R[j][j] in `rdiag[j]`; reflector j in j..m-1. */
  readonly cols: Float64Array[];
  readonly rdiag: Float64Array;
  /** Reflector scalars: H_j = I - beta_j v_j v_jᵀ. */
  readonly beta: Float64Array;
}

/**
 * Factors the m×n matrix whose columns are `cols` (m ≥ n), overwriting them.
 *
 * @example
 * ```ts
 * import { householderQR } from "./qr.ts";
 * const qr = householderQR([Float64Array.of(1, 1, 1), Float64Array.of(0, 1, 2)], 3);
 * console.log(Math.abs(qr.rdiag[0])); // √3
 * ```
 */
export function householderQR(cols: Float64Array[], m: number): HouseholderQR {
  const n = cols.length;
  const rdiag = new Float64Array(n);
  const beta = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    const v = cols[k];
    let norm2 = 0;
    for (let i = k; i < m; i++) norm2 += v[i] * v[i];
    const norm = Math.sqrt(norm2);
    if (norm === 0) {
      rdiag[k] = 0;
      beta[k] = 0;
      continue;
    }
    const xk = v[k];
    const alpha = xk > 0 ? -norm : norm;
    v[k] = xk - alpha;
    beta[k] = 1 / (norm * (norm + Math.abs(xk))); // 2 / vᵀv with vᵀv = 2 norm (norm + |x_k|)
    rdiag[k] = alpha;
    for (let j = k + 1; j < n; j++) reflect(v, beta[k], cols[j], k, m);
  }
  return { m, n, cols, rdiag, beta };
}

/** w ← (I − beta v vᵀ) w on rows k..m-1. */
function reflect(v: Float64Array, beta: number, w: Float64Array, k: number, m: number): void {
  if (beta === 0) return;
  let s = 0;
  for (let i = k; i < m; i++) s += v[i] * w[i];
  s *= beta;
  if (s === 0) return;
  for (let i = k; i < m; i++) w[i] -= s * v[i];
}

/** b ← Qᵀ b (length m), in place. */
export function applyQt(qr: HouseholderQR, b: Float64Array): void {
  for (let k = 0; k < qr.n; k++) reflect(qr.cols[k], qr.beta[k], b, k, qr.m);
}

/** b ← Q b (length m), in place. */
export function applyQ(qr: HouseholderQR, b: Float64Array): void {
  for (let k = qr.n - 1; k >= 0; k--) reflect(qr.cols[k], qr.beta[k], b, k, qr.m);
}

/** Entry R[i][j] (i ≤ j). */
export function rEntry(qr: HouseholderQR, i: number, j: number): number {
  return i === j ? qr.rdiag[j] : qr.cols[j][i];
}

/** Solves R x = b (b of length ≥ n, first n used); returns x. */
export function solveR(qr: HouseholderQR, b: ArrayLike<number>): Float64Array {
  const n = qr.n;
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i];
    for (let j = i + 1; j < n; j++) s -= qr.cols[j][i] * x[j];
    x[i] = s / qr.rdiag[i];
  }
  return x;
}

/** Solves Rᵀ x = b; returns x. */
export function solveRt(qr: HouseholderQR, b: ArrayLike<number>): Float64Array {
  const n = qr.n;
  const x = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    let s = b[j];
    const col = qr.cols[j];
    for (let i = 0; i < j; i++) s -= col[i] * x[i];
    x[j] = s / qr.rdiag[j];
  }
  return x;
}
