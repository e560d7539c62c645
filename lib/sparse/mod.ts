/**
 * Lasso and elastic-net solvers on mergeable summaries (the Moments of lib/sweep/moments.ts),
 * so a cross-validated path runs from per-fold summaries without revisiting rows.
 *
 * Objective, on standardized columns (coefficients w*_q = s_q w_q, s_q the training SD with
 * divisor N), in the 1/(2N) scaling common to coordinate-descent solvers:
 *   minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α Σ_q γ_q [ ρ |w*_q| + ((1 − ρ)/2) (w*_q)² ]
 * with ρ ∈ (0, 1] the L1 share (`mix`; ρ = 1 is the lasso), γ_q ≥ 0 per-column weights
 * (`weights`, the option and schemes of `ridge()`; every γ_q = 1 without it; γ_q = 0 leaves
 * column q unpenalized, so it is in the model at every α) and the intercept b unpenalized.
 * α is not the ridge λ: ridge's λ is in sum-of-squares units, and the quadratic part alone
 * (ρ → 0) is ridge with λ_ridge = N·α and the same γ_q.
 *
 * Method: coordinate descent with covariance updates (Friedman, Hastie & Tibshirani 2010,
 * J. Stat. Softw. 33), warm starts along a decreasing α path, active-set cycling, sequential
 * strong rules (Tibshirani et al. 2012, JRSS-B 74) always followed by a KKT check over every
 * column. Stopping rule: scaled KKT violation ≤ tolerance (default 10⁻⁷; descent.ts states the
 * scaling). The duality gap is reported per α (path.ts states the formula), and so are the
 * nonzero count and the effective degrees of freedom tr[(G_AA + α(1 − ρ)Γ_A)⁻¹ G_AA] over the
 * active Gram block, Γ = diag(γ) (df.ts derives it: the count for the lasso, less for the
 * elastic net). Unpenalized columns start at their least-squares values and α_max is the
 * largest α at which a penalized column would enter (grid.ts, unpenalized.ts).
 *
 * Cautions: cross-validated error is an estimate for data like the held-out rows, not a
 * guarantee; the lasso's choice of columns is unstable when columns are strongly correlated;
 * and no linear model is reliable outside the range of the data it was fitted on.
 *
 * @example
 * ```ts
 * import { lasso, sparsePathFromRows } from "./mod.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0, 5, 1), y = Float64Array.of(1.1, 2.3, 2.9, 4.2, 5);
 * const path = sparsePathFromRows(x, 2, y, lasso(), { alphas: { count: 10 } });
 * for (const s of path.solutions) console.log(s.alpha, s.nonzero, s.coefficients);
 * ```
 *
 * @module
 */
export {
  canonicalSparse,
  columnWeights,
  DEFAULT_MIX,
  elasticNet,
  lasso,
  penaltyMix,
  type SparsePenalty,
} from "./penalty.ts";
export { type GramOptions, type GramProblem, gramProblem } from "./gram.ts";
export { type DfMeter, dfMeter, solutionDf } from "./df.ts";
export { type AlphaGrid, alphaGrid, alphaMax, DEFAULT_PATH_SIZE } from "./grid.ts";
export {
  DEFAULT_MAX_PASSES,
  DEFAULT_TOLERANCE,
  heldOutMse,
  type PathOptions,
  type SparsePath,
  sparsePath,
  sparsePathFromRows,
  type SparseSolution,
} from "./path.ts";
