/**
 * The exact solver's fast path: iterative refinement of the regularized normal equations,
 * preconditioned by the eigendecomposition of the all-rows co-moment matrix that the sweep
 * already has, with every residual and gradient formed from the design rows in double-double
 * (./residuals.ts). No QR of the rows and no copy of them: each step is one O(np) pass.
 *
 * Problem (as in ./exact.ts, sum-of-squares units):
 *   minimize Σᵢ (yᵢ − b − zᵢᵀw)² + Σ_q c_q² w_q²,   c_q = √(λγ_q)·s_q.
 * With e = y − b − Zw the step solves the normal equations for the correction,
 *   [n  nμᵀ; nμ  G + C] [δb; δw] = [Σe; Zᵀe − C w],   C = diag(c²),
 * by block elimination: (S + C) δw = Zᵀe − Cw − μ Σe and δb = Σe/n − μᵀδw, where S is the centered
 * Gram matrix (co-moments) and μ the column means (without an intercept, S is the raw Gram
 * matrix and there is no δb). S + C comes from its eigendecomposition in the penalty metric
 * m_q = 1/(√γ_q s_q): diag(m)(S + C)diag(m) = V diag(e + λ) Vᵀ (lib/sweep/spectrum.ts).
 *
 * Why it is exact: the fixed point has gradient Zᵀe − Cw = 0 to the accuracy the double-double
 * pass computes it, the same residual accuracy Björck's refinement of a QR solution reaches; the
 * co-moments only set the speed. Each step shrinks the error by about κ²·ε, with κ² the spread
 * (e_max + λ)/(e_min + λ) and ε the co-moments' relative error, so the path is tried only when
 * that spread is at most 10¹⁰, and it gives up (the caller then uses the QR path) unless the
 * correction falls below half an ulp of the largest coefficient (or the contraction seen over two
 * steps puts the next one there), or levels off within a few ulps, in a few steps. This is iterative refinement of the seminormal kind (Björck 1987, "Stability
 * analysis of the method of seminormal equations for linear least squares problems", Linear
 * Algebra Appl. 88/89; recalled from memory) with the factor taken from the co-moments.
 *
 * @module
 */
import { DDAccumulator } from "../numeric/dd.ts";
import type { LsProblem, LsSolution } from "./exact.ts";
import { type ColumnSums, columnsWithLo, residualPass } from "./residuals.ts";

/**
 * The all-rows co-moment matrix S in eigen form, in the penalty metric: diag(m) S diag(m) =
 * V diag(e) Vᵀ, g = Vᵀ(m ⊙ S_xy). `Spectrum` from lib/sweep/spectrum.ts is one.
 */
export interface GramEigen {
  /** Eigenvalues, descending, ≥ 0. */
  readonly e: Float64Array;
  /** Eigenvectors, `vectors[j]` for `e[j]`. */
  readonly vectors: readonly Float64Array[];
  /** m_q = 1/(√γ_q s_q). */
  readonly metric: Float64Array;
  /** Vᵀ(m ⊙ S_xy), the target's cross moments in the eigenbasis. */
  readonly g: Float64Array;
  /** Column means μ (used with an intercept). */
  readonly meanX: Float64Array;
  /** Target mean (used with an intercept). */
  readonly meanY: number;
}

/** Largest (e_max + λ)/(e_min + λ) for which the fast path is tried. */
const MAX_SPREAD = 1e10;
/** Passes over the rows before giving up. */
const MAX_PASSES = 6;
/** Converged: the correction is at most half an ulp of the largest (scaled) component. */
const CONVERGED = 2 ** -54;
/** A correction that stops shrinking below this (a few ulps) has reached limiting accuracy. */
const LEVELLED = 2 ** -50;

/**
 * Solves the problem from the co-moments' eigen form by refinement with double-double
 * gradients; `lambda` is the strength the eigen form's metric belongs to (c_q² = λ/m_q² up to
 * the rounding of the column scales). Returns undefined when the fast path does not apply or
 * does not converge quickly; then solve with `solveRefined` (./exact.ts).
 *
 * @example
 * ```ts
 * import { solveSeminormal } from "./seminormal.ts";
 * const problem = {
 *   n: 3, p: 1, hi: Float64Array.of(0, 1, 2), lo: new Float64Array(3),
 *   y: Float64Array.of(1, 3, 5), intercept: true,
 * };
 * // Centered co-moment of x is 2; metric 1, so e = [2], g = [S_xy] = [4].
 * const gram = {
 *   e: Float64Array.of(2), vectors: [Float64Array.of(1)], metric: Float64Array.of(1),
 *   g: Float64Array.of(4), meanX: Float64Array.of(1), meanY: 3,
 * };
 * const sol = solveSeminormal(problem, gram, 0);
 * console.log(sol?.intercept, sol?.w[0]); // 1 2
 * ```
 */
export function solveSeminormal(
  problem: LsProblem,
  gram: GramEigen,
  lambda: number,
): LsSolution | undefined {
  const { n, p, intercept } = problem;
  if (p === 0 || !((gram.e[0] + lambda) <= MAX_SPREAD * (gram.e[p - 1] + lambda))) {
    return undefined;
  }
  const withLo = columnsWithLo(problem);
  const penalty = problem.penaltyRoot === undefined
    ? new Float64Array(p)
    : problem.penaltyRoot.map((c) => c * c);
  const size = Float64Array.from(gram.metric, (m) => 1 / m);
  let w = startingPoint(gram, lambda);
  let b = intercept ? interceptFor(gram, w) : 0;
  const sums: ColumnSums = {
    hi: new Float64Array(p + 1),
    lo: new Float64Array(p + 1),
    intercept: true,
  };
  let last = 0;
  for (let pass = 1; pass <= MAX_PASSES; pass++) {
    const rss = residualPass(problem, withLo, b, w, { sums, multiplier: "residual" });
    const { dw, db } = correction(gram, lambda, gradient(sums, penalty, w), n, intercept);
    const rel = relativeSize(dw, db, w, b, size);
    w = w.map((v, q) => v + dw[q]);
    b += db;
    // After two passes the ratio of corrections estimates the contraction, and so the size of
    // the next correction: stop when that is below half an ulp too (it saves the pass that would
    // only confirm it), or when the corrections stopped shrinking at a few ulps.
    const rate = pass === 1 ? NaN : rel / last; // NaN: no comparison holds
    const settled = rate <= 0.25 && rel * rate <= CONVERGED;
    const levelled = rate > 0.5 && rel <= LEVELLED;
    if (rel <= CONVERGED || settled || levelled) {
      // The RSS is the pass's, at the iterate before this last correction: the correction is
      // below a few ulps of the largest coefficient, so it moves the RSS by about
      // (2⁻⁵⁰·‖y‖)² at most, below the RSS's own rounding.
      return { intercept: b, w, rss, iterations: pass, lastCorrection: rel };
    }
    if (rate > 0.25) return undefined;
    last = rel;
  }
  return undefined;
}

/** The co-moment solution w = m ⊙ V h, h_j = g_j/(e_j + λ). */
function startingPoint(gram: GramEigen, lambda: number): Float64Array {
  const h = Float64Array.from(gram.e, (e, j) => gram.g[j] / (e + lambda));
  return inMetric(gram, h);
}

/** m ⊙ V h. */
function inMetric(gram: GramEigen, h: Float64Array): Float64Array {
  const p = gram.metric.length;
  const w = new Float64Array(p);
  gram.vectors.forEach((v, j) => {
    for (let q = 0; q < p; q++) w[q] += v[q] * h[j];
  });
  for (let q = 0; q < p; q++) w[q] *= gram.metric[q];
  return w;
}

/** b = ȳ − μᵀw. */
function interceptFor(gram: GramEigen, w: Float64Array): number {
  let b = gram.meanY;
  for (let q = 0; q < w.length; q++) b -= gram.meanX[q] * w[q];
  return b;
}

/** [Σe, Zᵀe − C w] rounded from the pass's double-double sums (the penalty term in double-double). */
function gradient(sums: ColumnSums, penalty: Float64Array, w: Float64Array): Float64Array {
  const acc = new DDAccumulator();
  return Float64Array.from(sums.hi, (h, j) => {
    acc.hi = h;
    acc.lo = sums.lo[j];
    if (j > 0) acc.addProduct(-penalty[j - 1], w[j - 1]);
    return acc.value();
  });
}

/** The correction from the gradient by block elimination through the eigen form. */
function correction(
  gram: GramEigen,
  lambda: number,
  g: Float64Array,
  n: number,
  intercept: boolean,
): { dw: Float64Array; db: number } {
  const p = gram.metric.length;
  const rhs = Float64Array.from(
    { length: p },
    (_, q) => (g[q + 1] - (intercept ? gram.meanX[q] * g[0] : 0)) * gram.metric[q],
  );
  const h = Float64Array.from(gram.vectors, (v, j) => {
    let s = 0;
    for (let q = 0; q < p; q++) s += v[q] * rhs[q];
    return s / (gram.e[j] + lambda);
  });
  const dw = inMetric(gram, h);
  return { dw, db: intercept ? interceptFor({ ...gram, meanY: g[0] / n }, dw) : 0 };
}

/**
 * Size of the correction against the solution, component by component on the scale of the
 * columns (s_q·√γ_q·w_q, in units of y): ‖δ‖∞/‖x‖∞ over the coefficients, or the intercept's
 * |δb|/|b| when that is larger and b is not negligible beside them.
 */
function relativeSize(
  dw: Float64Array,
  db: number,
  w: Float64Array,
  b: number,
  size: Float64Array,
): number {
  let dMax = 0, xMax = 0;
  for (let q = 0; q < w.length; q++) {
    dMax = Math.max(dMax, Math.abs(dw[q] * size[q]));
    xMax = Math.max(xMax, Math.abs(w[q] * size[q]));
  }
  const relW = xMax === 0 ? (dMax === 0 ? 0 : Infinity) : dMax / xMax;
  const relB = Math.abs(db) / Math.max(Math.abs(b), xMax);
  return Math.max(relW, Number.isFinite(relB) ? relB : 0);
}
