/**
 * Lasso and elastic-net paths from a training summary.
 *
 * Objective (1/(2N) scaling, standardized coefficients w*_q = s_q w_q, intercept unpenalized,
 * per-column weights γ_q ≥ 0 — all 1 without weights; penalty.ts):
 *   (1/(2N)) Σᵢ (yᵢ − b − xᵢᵀw)² + α Σ_q γ_q [ ρ |w*_q| + ((1 − ρ)/2) (w*_q)² ],
 * solved by coordinate descent on the Gram form (gram.ts, descent.ts), warm-started along a
 * decreasing α path with strong-rule screening and a full KKT check. For ρ → 0 the penalty is
 * ridge with λ_ridge = N·α and the same γ_q in the sum-of-squares units of `ridge()`. Columns
 * with γ_q = 0 are unpenalized: fitted by least squares at α_max (unpenalized.ts) and in the
 * model at every α.
 *
 * Reported per α, besides the coefficients on both scales:
 * - the effective degrees of freedom `df` = tr[(G_AA + α(1 − ρ)Γ_A)⁻¹ G_AA] over the active set
 *   A (Γ = diag(γ)): the nonzero count for the lasso, less for the elastic net (df.ts derives it
 *   in this convention and states its sources);
 * - the duality gap of the problem above (a bound on how far the objective is from its
 *   minimum). With a = αρ, β = α(1 − ρ), a_j = aγ_j, β_j = βγ_j and g = c − Gw, write the
 *   elastic net as a weighted lasso on augmented data (rows √(Nβ_j)·e_jᵀ with target 0). Its
 *   dual is D(θ) = s(v_y − cᵀw') − ½s²(MSE' + Σ_j β_j w_j²) at θ = s·r̃'/N, where r̃' is the
 *   augmented residual of w' = w with the unpenalized coefficients refitted by least squares
 *   (w'_U = w_U + δ, G_UU δ = g_U; w' = w without unpenalized columns), so that the dual
 *   constraints of the unpenalized columns, Z_Uᵀθ = 0, hold; g' = g − G_{·U}δ and
 *   MSE' = MSE − δᵀg_U are its gradient residuals and training MSE. The other constraints
 *   |g'_j − β_j w_j| ≤ a_j/s hold with s = min(1, a / max_{γ_j>0} |g'_j − β_j w_j|/γ_j). Then,
 *   per observation,
 *     gap = ½(1 + s²)·MSE − s·(v_y − cᵀw) + a Σ_j γ_j|w_j| + ½β(1 + s²) Σ_j γ_j w_j²
 *           − ½s²·δᵀg_U + s·c_Uᵀδ,
 *   with MSE = v_y − cᵀw − gᵀw the training MSE (the last two terms vanish without unpenalized
 *   columns); it is ≥ 0 up to rounding (about 10⁻¹⁶·v_y). The stopping rule itself is the KKT
 *   violation (descent.ts);
 * - the training MSE, and the held-out MSE from a held-out summary (n_v, x̄_v, ȳ_v, S_v) with
 *     SSE_v = S_v,yy − 2wᵀS_v,xy + wᵀS_v,xx w + n_v (ȳ_v − b − x̄_vᵀw)²
 *   (exact for any w and b; the same algebra as the ridge sweep's held-out error).
 *
 * Validation error is an estimate for data like the held-out rows, not a guarantee, and a
 * linear model says nothing reliable outside the range of the data it was fitted on.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import { bucketMoments, type Moments } from "../sweep/moments.ts";
import { type GramOptions, type GramProblem, gramProblem } from "./gram.ts";
import { type AlphaGrid, alphaGrid, alphaMax } from "./grid.ts";
import { canonicalSparse, columnWeights, type SparsePenalty } from "./penalty.ts";
import { descend, type DescentSettings, type DescentState, startState } from "./descent.ts";
import { type DfMeter, dfMeter } from "./df.ts";
import { type BlockSolver, blockSolver, unpenalizedColumns } from "./unpenalized.ts";

/** Default largest scaled KKT violation accepted (see descent.ts for the scaling). */
export const DEFAULT_TOLERANCE = 1e-7;

/** Default most coordinate passes for one α. */
export const DEFAULT_MAX_PASSES = 100_000;

/** How to run a path. */
export interface PathOptions {
  /** Explicit α values or an automatic path (default: 100 values from α_max down). */
  readonly alphas?: AlphaGrid;
  /**
   * γ_q per design column, the penalty's weights already resolved (e.g. by
   * `penaltyWeights(penalty, orders)` of lib/fit/penalty.ts); used as given. Default: the
   * penalty's own weights — all 1 without weights, a given list as is; `"rising"` and
   * `"falling"` need the columns' orders and so need this option.
   */
  readonly gamma?: ArrayLike<number>;
  /** Largest scaled KKT violation accepted at each α (default 10⁻⁷). */
  readonly tolerance?: number;
  /** Most coordinate passes for one α (default 100 000). */
  readonly maxPasses?: number;
  /**
   * Warm starts with strong-rule screening along the path (default true). With false, every α
   * is solved from zero coefficients over all columns (slower; for checks).
   */
  readonly warmStart?: boolean;
  /** Held-out rows' summary; fills `heldOutMse`. */
  readonly validation?: Moments;
  /**
   * Compute each solution's effective df (df.ts: an eigendecomposition of the active Gram block
   * whenever the active set changes, which can cost more than the path itself for the elastic
   * net). Default: true without `validation`, false with it — a path scored on held-out rows is
   * a cross-validation fold, and only the all-rows path's df is reported.
   */
  readonly df?: boolean;
}

/** The solution at one α. Frozen. */
export interface SparseSolution {
  readonly alpha: number;
  /** w*_q, on the standardized scale (the scale the penalty acts on). */
  readonly standardized: readonly number[];
  /** w_q = w*_q / s_q, on the original scale of the data. */
  readonly coefficients: readonly number[];
  /** b = ȳ − x̄ᵀw with an intercept, else 0. */
  readonly intercept: number;
  /** Number of nonzero coefficients. */
  readonly nonzero: number;
  /**
   * Effective degrees of freedom, intercept not counted: tr[(G_AA + α(1 − ρ)Γ_A)⁻¹ G_AA] over
   * the active set A (df.ts; Σ_j μ_j/(μ_j + α(1 − ρ)) over the eigenvalues μ_j of G_AA with
   * equal weights). Equals `nonzero` for the lasso; below it for the elastic net. Null when not
   * computed (`PathOptions.df`).
   */
  readonly df: number | null;
  /** Coordinate-descent passes (iterations) spent on this α. */
  readonly passes: number;
  /** Largest scaled KKT violation over all columns (see descent.ts). */
  readonly violation: number;
  /** Whether `violation` ≤ tolerance within the pass limit. */
  readonly converged: boolean;
  /** The objective's value, per observation (units of y²). */
  readonly objective: number;
  /** Duality gap, per observation (units of y²). */
  readonly gap: number;
  /** Σ residual² / N on the training rows. */
  readonly trainMse: number;
  /** Mean squared error on the held-out rows, or null without a validation summary. */
  readonly heldOutMse: number | null;
}

/** A path of solutions. Frozen. */
export interface SparsePath {
  /** The penalty, as `lasso()` / `elasticNet()` write it (`weights` only when not equal). */
  readonly penalty: SparsePenalty;
  /** γ_q per design column, as the solver used them (all 1 without weights). */
  readonly gamma: readonly number[];
  readonly count: number;
  readonly standardize: boolean;
  readonly intercept: boolean;
  /** Column scales s_q and means of the training rows. */
  readonly scales: readonly number[];
  readonly means: readonly number[];
  /** The smallest α at which every penalized coefficient is zero (grid.ts). */
  readonly alphaMax: number;
  readonly tolerance: number;
  /** One solution per α, in decreasing α order. */
  readonly solutions: readonly SparseSolution[];
}

/**
 * Solves the lasso or elastic net at every α of a path from a Gram problem.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem, lasso, sparsePath } from "./mod.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0, 5, 1), y = Float64Array.of(1.1, 2.3, 2.9, 4.2, 5);
 * const [m] = bucketMoments(x, 2, y, new Int32Array(5), 1);
 * const path = sparsePath(gramProblem(m), lasso(), { alphas: { count: 20 } });
 * console.log(path.solutions.map((s) => s.nonzero)); // 0, then 1, then 2 coefficients
 * ```
 */
export function sparsePath(
  problem: GramProblem,
  penalty: SparsePenalty,
  options: PathOptions = {},
): SparsePath {
  const canonical = canonicalSparse(penalty);
  const { mix } = canonical;
  const gamma = columnWeights(canonical, problem.p, options.gamma);
  const alphas = alphaGrid(problem, canonical, options.alphas, gamma);
  const settings = descentSettings(options);
  const top = alphaMax(problem, canonical, gamma);
  const warm = options.warmStart ?? true;
  const df = (options.df ?? options.validation === undefined) ? dfMeter(problem, mix, gamma) : null;
  const unpenalized = unpenalizedColumns(gamma);
  const weights = { mix, gamma, free: blockSolver(problem, unpenalized) };
  let state = startState(problem, top, unpenalized);
  const solutions = alphas.map((alpha) => {
    if (!warm) state = startState(problem, top, unpenalized);
    const outcome = descend(problem, state, alpha, mix, gamma, settings);
    return describe(problem, state, alpha, weights, outcome, options.validation, df);
  });
  return deepFreeze({
    penalty: canonical,
    gamma: Array.from(gamma),
    count: problem.count,
    standardize: problem.standardize,
    intercept: problem.intercept,
    scales: Array.from(problem.scales),
    means: Array.from(problem.meanX),
    alphaMax: top,
    tolerance: settings.tolerance,
    solutions,
  });
}

/**
 * The path for in-memory rows: `x` is the n×p row-major design, `y` the target. Summarizes the
 * rows (bucketMoments) and solves as `sparsePath`.
 *
 * @example
 * ```ts
 * import { elasticNet, sparsePathFromRows } from "./mod.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0, 5, 1), y = Float64Array.of(1.1, 2.3, 2.9, 4.2, 5);
 * const path = sparsePathFromRows(x, 2, y, elasticNet({ mix: 0.5 }), { alphas: [0.5, 0.05] });
 * console.log(path.solutions[1].coefficients, path.solutions[1].intercept);
 * ```
 */
export function sparsePathFromRows(
  x: Float64Array,
  p: number,
  y: Float64Array,
  penalty: SparsePenalty,
  options: PathOptions & GramOptions = {},
): SparsePath {
  if (!(Number.isInteger(p) && p >= 1 && x.length === y.length * p)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `x has ${x.length} values, which is not ${y.length} rows (one per target value) of ${p} columns`,
      "Pass x as the n×p row-major design and p as its column count",
      { option: "p" },
    );
  }
  const [moments] = bucketMoments(x, p, y, new Int32Array(y.length), 1);
  return sparsePath(gramProblem(moments, options), penalty, options);
}

/**
 * Mean squared error on held-out rows from their summary alone, for original-scale
 * coefficients and intercept (0 without one).
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { heldOutMse } from "./path.ts";
 * const [v] = bucketMoments(Float64Array.of(0, 1, 2), 1, Float64Array.of(1, 3, 6), new Int32Array(3), 1);
 * console.log(heldOutMse(v, [2], 1)); // 1/3: residuals 0, 0, 1
 * ```
 */
export function heldOutMse(
  validation: Moments,
  coefficients: readonly number[],
  intercept: number,
): number {
  const { count: n, d, mean, cross } = validation;
  const p = d - 1;
  if (!(n > 0) || coefficients.length !== p) {
    throw new CurbfitError(
      "BAD_OPTION",
      n > 0
        ? `the validation summary has ${p} design columns but there are ${coefficients.length} coefficients`
        : "the validation summary holds no rows",
      "Summarize the held-out rows with the same design columns as the training rows",
      { option: "validation" },
    );
  }
  const nonzero = coefficients.flatMap((w, q) => (w !== 0 ? [q] : []));
  let sse = cross[p * d + p];
  let offset = mean[p] - intercept;
  for (const q of nonzero) {
    const wq = coefficients[q];
    sse -= 2 * wq * cross[q * d + p];
    for (const r of nonzero) sse += wq * cross[q * d + r] * coefficients[r];
    offset -= mean[q] * wq;
  }
  return Math.max(sse + n * offset * offset, 0) / n;
}

function descentSettings(options: PathOptions): DescentSettings {
  const tolerance = options.tolerance ?? DEFAULT_TOLERANCE;
  const maxPasses = options.maxPasses ?? DEFAULT_MAX_PASSES;
  if (!(typeof tolerance === "number" && tolerance > 0 && tolerance < 1)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `tolerance is ${tolerance}, but it must be a number > 0 and < 1`,
      "Pass for example { tolerance: 1e-7 }",
      { option: "tolerance" },
    );
  }
  if (!(Number.isInteger(maxPasses) && maxPasses >= 1)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `maxPasses is ${maxPasses}, but it must be a whole number >= 1`,
      "Pass for example { maxPasses: 100000 }",
      { option: "maxPasses" },
    );
  }
  return { tolerance, maxPasses, screening: options.warmStart ?? true };
}

/** The reported numbers for the state's solution at α. */
function describe(
  problem: GramProblem,
  state: DescentState,
  alpha: number,
  weights: { mix: number; gamma: Float64Array; free: BlockSolver | null },
  outcome: { passes: number; violation: number; converged: boolean },
  validation: Moments | undefined,
  df: DfMeter | null,
): SparseSolution {
  const { w, g } = state;
  const { mix, gamma, free } = weights;
  const a = alpha * mix;
  const beta = alpha * (1 - mix);
  const refit = unpenalizedRefit(problem, g, free);
  let cw = 0, gw = 0, l1 = 0, l2 = 0, dualNorm = 0, nonzero = 0;
  for (let j = 0; j < problem.p; j++) {
    cw += problem.covariance[j] * w[j];
    gw += g[j] * w[j];
    l1 += gamma[j] * Math.abs(w[j]);
    l2 += gamma[j] * w[j] * w[j];
    if (gamma[j] > 0) {
      dualNorm = Math.max(dualNorm, Math.abs(refit.g[j] - beta * gamma[j] * w[j]) / gamma[j]);
    }
    if (w[j] !== 0) nonzero++;
  }
  const vy = problem.targetSquare;
  const mse = Math.max(vy - cw - gw, 0);
  const s = dualNorm > a ? a / dualNorm : 1;
  const penalty = a * l1 + 0.5 * beta * l2;
  const gap = 0.5 * (1 + s * s) * mse - s * (vy - cw) + a * l1 + 0.5 * beta * (1 + s * s) * l2 -
    0.5 * s * s * refit.deltaG + s * refit.deltaC;
  const coefficients = Array.from(w, (v, q) => v / problem.scales[q]);
  let intercept = 0;
  if (problem.intercept) {
    intercept = problem.meanY;
    coefficients.forEach((v, q) => (intercept -= problem.meanX[q] * v));
  }
  return {
    alpha,
    standardized: Array.from(w),
    coefficients,
    intercept,
    nonzero,
    df: df === null ? null : df(alpha, w),
    passes: outcome.passes,
    violation: outcome.violation,
    converged: outcome.converged,
    objective: 0.5 * mse + penalty,
    gap,
    trainMse: mse,
    heldOutMse: validation ? heldOutMse(validation, coefficients, intercept) : null,
  };
}

/**
 * The dual point's correction for unpenalized columns (module text): δ with G_UU δ = g_U, the
 * gradient residuals g' = g − G_{·U}δ of w with w_U refitted, δᵀg_U and c_Uᵀδ. Without
 * unpenalized columns: g itself and zeros.
 */
function unpenalizedRefit(
  problem: GramProblem,
  g: Float64Array,
  free: BlockSolver | null,
): { g: Float64Array; deltaG: number; deltaC: number } {
  if (free === null) return { g, deltaG: 0, deltaC: 0 };
  const { gram, p, covariance } = problem;
  const delta = free.solve(Array.from(free.columns, (u) => g[u]));
  const refitted = Float64Array.from(g);
  let deltaG = 0, deltaC = 0;
  free.columns.forEach((u, m) => {
    deltaG += delta[m] * g[u];
    deltaC += delta[m] * covariance[u];
    for (let j = 0; j < p; j++) refitted[j] -= gram[u * p + j] * delta[m];
  });
  return { g: refitted, deltaG, deltaC };
}
