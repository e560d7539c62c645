/**
 * Singular value decomposition of a small dense matrix by one-sided Jacobi rotations
 * (Hestenes 1958; Demmel & Veselić 1992 show it computes small singular values to high
 * relative accuracy). Used on p×p triangular factors, never on the n-row data.
 *
 * @module
 */

/** A = U diag(s) Vᵀ with s descending; U is m×r and V is r×r, both as arrays of columns. */
export interface SVD {
  readonly s: Float64Array;
  readonly u: Float64Array[];
  readonly v: Float64Array[];
}

const MAX_SWEEPS = 60;

/**
 * SVD of the m×r matrix given by its columns (m ≥ r). The input is not modified.
 *
 * @example
 * ```ts
 * import { jacobiSvd } from "./svd.ts";
 * const { s } = jacobiSvd([Float64Array.of(3, 0), Float64Array.of(0, 4)]);
 * console.log(Array.from(s)); // [4, 3]
 * ```
 */
export function jacobiSvd(columns: readonly Float64Array[]): SVD {
  const r = columns.length;
  const m = r === 0 ? 0 : columns[0].length;
  const a = columns.map((c) => Float64Array.from(c));
  const v = identityColumns(r);
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let i = 0; i < r - 1; i++) {
      for (let j = i + 1; j < r; j++) {
        if (rotatePair(a[i], a[j], v[i], v[j], m)) rotated = true;
      }
    }
    if (!rotated) break;
  }
  const norms = a.map((c) => Math.sqrt(dot(c, c)));
  const order = norms.map((_, k) => k).sort((x, y) => norms[y] - norms[x] || x - y);
  const s = Float64Array.from(order, (k) => norms[k]);
  const u = order.map((k) => a[k].map((x) => (norms[k] > 0 ? x / norms[k] : 0)));
  return { s, u, v: order.map((k) => v[k]) };
}

/** Orthogonalizes columns x and y by one Jacobi rotation; false when already orthogonal. */
function rotatePair(
  x: Float64Array,
  y: Float64Array,
  vx: Float64Array,
  vy: Float64Array,
  m: number,
): boolean {
  let alpha = 0, beta = 0, gamma = 0;
  for (let k = 0; k < m; k++) {
    alpha += x[k] * x[k];
    beta += y[k] * y[k];
    gamma += x[k] * y[k];
  }
  if (gamma === 0 || Math.abs(gamma) <= 1e-16 * Math.sqrt(alpha * beta)) return false;
  const zeta = (beta - alpha) / (2 * gamma);
  const t = Math.sign(zeta || 1) / (Math.abs(zeta) + Math.sqrt(1 + zeta * zeta));
  const c = 1 / Math.sqrt(1 + t * t);
  const sn = c * t;
  rotate(x, y, c, sn, m);
  rotate(vx, vy, c, sn, vx.length);
  return true;
}

function rotate(x: Float64Array, y: Float64Array, c: number, s: number, len: number): void {
  for (let k = 0; k < len; k++) {
    const xk = x[k];
    const yk = y[k];
    x[k] = c * xk - s * yk;
    y[k] = s * xk + c * yk;
  }
}

function identityColumns(r: number): Float64Array[] {
  return Array.from({ length: r }, (_, k) => {
    const e = new Float64Array(r);
    e[k] = 1;
    return e;
  });
}

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let k = 0; k < a.length; k++) s += a[k] * b[k];
  return s;
}
