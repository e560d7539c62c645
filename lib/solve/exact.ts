/**
 * The exact solver: regularized least squares on the data matrix by Householder QR, polished by
 * augmented-system iterative refinement (Björck 1967, "Iterative refinement of linear least
 * squares solutions I", BIT 7) with residuals computed in double-double.
 *
 * Problem (augmented-error convention, sum-of-squares units):
 *   minimize Σᵢ (yᵢ − b − Σ_q Z_iq w_q)² + Σ_q c_q² w_q²
 * where c_q = √(λ γ_q) · s_q is supplied by the caller (s_q the column's scale). The penalty
 * enters as p extra rows of the matrix, so λ = 0 is ordinary least squares and the intercept
 * b is never penalized. The normal equations are never formed.
 *
 * @module
 */
import { applyQ, applyQt, householderQR, solveR, solveRt } from "../numeric/qr.ts";
import { DDAccumulator } from "../numeric/dd.ts";

/** A least-squares problem with a double-double design (row-major n×p). */
export interface LsProblem {
  readonly n: number;
  readonly p: number;
  readonly hi: Float64Array;
  readonly lo: Float64Array;
  readonly y: Float64Array;
  readonly intercept: boolean;
  /** c_q = √(λγ_q)·s_q per column; omitted or all zero for no penalty. */
  readonly penaltyRoot?: Float64Array;
}

/** The refined solution. */
export interface LsSolution {
  /** Intercept (0 when the problem has none). */
  readonly intercept: number;
  /** Coefficients on the design's own scale. */
  readonly w: Float64Array;
  /** Σᵢ residualᵢ² over the data rows, from double-double residuals. */
  readonly rss: number;
  /** Refinement steps taken. */
  readonly iterations: number;
  /** Relative size of the last correction (‖δx‖∞/‖x‖∞, scaled units). */
  readonly lastCorrection: number;
}

const MAX_STEPS = 40;
const CONVERGED = 2 ** -60;

/**
 * Solves the problem to (near) full double precision in the coefficients.
 *
 * @example
 * ```ts
 * import { solveRefined } from "./exact.ts";
 * const sol = solveRefined({
 *   n: 3, p: 1, hi: Float64Array.of(0, 1, 2), lo: new Float64Array(3),
 *   y: Float64Array.of(1, 3, 5), intercept: true,
 * });
 * console.log(sol.intercept, sol.w[0]); // 1 2
 * ```
 */
export function solveRefined(problem: LsProblem): LsSolution {
  const a = augmentedColumns(problem);
  const { m, hi, lo, scale } = a;
  const nc = hi.length;
  const qr = householderQR(hi.map((c) => Float64Array.from(c)), m);
  const b = new Float64Array(m);
  b.set(problem.y);
  const x = new Float64Array(nc);
  const r = new Float64Array(m);
  const acc = new DDAccumulator();
  let steps = 0;
  let last = Infinity;
  for (; steps < MAX_STEPS; steps++) {
    const f = new Float64Array(m);
    for (let i = 0; i < m; i++) {
      acc.reset();
      acc.add(b[i]);
      acc.add(-r[i]);
      for (let j = 0; j < nc; j++) acc.addDDProduct(-hi[j][i], -lo[j][i], x[j]);
      f[i] = acc.value();
    }
    const g = new Float64Array(nc);
    for (let j = 0; j < nc; j++) {
      acc.reset();
      const h = hi[j], l = lo[j];
      for (let i = 0; i < m; i++) acc.addDDProduct(h[i], l[i], r[i]);
      g[j] = -acc.value();
    }
    // Solve [I A; Aᵀ 0][δr; δx] = [f; g] with A = Q[R; 0].
    const h = solveRt(qr, g);
    applyQt(qr, f);
    const d1h = new Float64Array(nc);
    for (let j = 0; j < nc; j++) d1h[j] = f[j] - h[j];
    const dx = solveR(qr, d1h);
    const dr = f; // reuse: [h; d2]
    dr.set(h);
    applyQ(qr, dr);
    let dxMax = 0, xMax = 0;
    for (let j = 0; j < nc; j++) {
      x[j] += dx[j];
      dxMax = Math.max(dxMax, Math.abs(dx[j]));
      xMax = Math.max(xMax, Math.abs(x[j]));
    }
    for (let i = 0; i < m; i++) r[i] += dr[i];
    const rel = xMax === 0 ? 0 : dxMax / xMax;
    const stalled = steps >= 2 && rel > 0.5 * last;
    last = rel;
    if (rel <= CONVERGED || stalled) {
      steps++;
      break;
    }
  }
  for (let j = 0; j < nc; j++) x[j] *= scale[j];
  const off = problem.intercept ? 1 : 0;
  const w = x.slice(off);
  const intercept = problem.intercept ? x[0] : 0;
  return {
    intercept,
    w,
    rss: residualSumOfSquares(problem, intercept, w),
    iterations: steps,
    lastCorrection: last,
  };
}

/** Σ (yᵢ − b − zᵢᵀw)² with each residual formed in double-double. */
export function residualSumOfSquares(
  problem: Pick<LsProblem, "n" | "p" | "hi" | "lo" | "y">,
  intercept: number,
  w: Float64Array,
): number {
  const { n, p, hi, lo, y } = problem;
  const acc = new DDAccumulator();
  const sum = new DDAccumulator();
  for (let i = 0; i < n; i++) {
    acc.reset();
    acc.add(y[i]);
    acc.add(-intercept);
    const row = i * p;
    for (let j = 0; j < p; j++) acc.addDDProduct(-hi[row + j], -lo[row + j], w[j]);
    const e = acc.value();
    sum.addProduct(e, e);
  }
  return sum.value();
}

/** Columns of [1 Z; 0 diag(c)] scaled by exact powers of two to unit max-abs. */
function augmentedColumns(problem: LsProblem) {
  const { n, p, intercept } = problem;
  const pen = problem.penaltyRoot;
  const penalized = pen !== undefined && pen.some((c) => c > 0);
  const m = n + (penalized ? p : 0);
  const hi: Float64Array[] = [];
  const lo: Float64Array[] = [];
  const scale: number[] = [];
  if (intercept) {
    const ones = new Float64Array(m);
    ones.fill(1, 0, n);
    hi.push(ones);
    lo.push(new Float64Array(m));
    scale.push(1);
  }
  for (let q = 0; q < p; q++) {
    const h = new Float64Array(m);
    const l = new Float64Array(m);
    let maxAbs = 0;
    for (let i = 0; i < n; i++) maxAbs = Math.max(maxAbs, Math.abs(problem.hi[i * p + q]));
    if (penalized) maxAbs = Math.max(maxAbs, pen![q]);
    const d = maxAbs > 0 ? 2 ** -Math.floor(Math.log2(maxAbs)) : 1;
    for (let i = 0; i < n; i++) {
      h[i] = problem.hi[i * p + q] * d;
      l[i] = problem.lo[i * p + q] * d;
    }
    if (penalized) h[n + q] = pen![q] * d;
    hi.push(h);
    lo.push(l);
    scale.push(d);
  }
  return { m, hi, lo, scale: Float64Array.from(scale) };
}
