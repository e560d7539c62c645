/**
 * Lasso and elastic-net paths from a training summary.
 *
 * Objective (1/(2N) scaling, standardized coefficients w*_q = s_q w_q, intercept unpenalized):
 *   (1/(2N)) Σᵢ (yᵢ − b − xᵢᵀw)² + α·[ ρ Σ_q |w*_q| + ((1 − ρ)/2) Σ_q (w*_q)² ],
 * solved by coordinate descent on the Gram form (gram.ts, descent.ts), warm-started along a
 * decreasing α path with strong-rule screening and a full KKT check. For ρ → 0 the penalty is
 * ridge with λ_ridge = N·α in the sum-of-squares units of `ridge()`.
 *
 * Reported per α, besides the coefficients on both scales:
 * - the effective degrees of freedom `df` = Σ_j μ_j/(μ_j + α(1 − ρ)) over the eigenvalues μ_j
 *   of the active block of the Gram matrix: the nonzero count for the lasso, less for the
 *   elastic net (df.ts derives it in this convention and states its sources);
 * - the duality gap of the problem above (a bound on how far the objective is from its
 *   minimum). Writing the elastic net as a lasso on augmented data and scaling the feasible dual
 *   point u = s·r by s = min(1, a / ‖g − βw‖_∞) (a = αρ, β = α(1 − ρ), g = c − Gw), it is, per
 *   observation,
 *     gap = ½(1 + s²)·MSE − s·(v_y − cᵀw) + a‖w‖₁ + ½β(1 + s²)‖w‖²,
 *   with MSE = v_y − cᵀw − gᵀw the training mean squared error; it is ≥ 0 up to rounding
 *   (about 10⁻¹⁶·v_y). The stopping rule itself is the KKT violation (descent.ts);
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
import { penaltyMix, type SparsePenalty } from "./penalty.ts";
import { descend, type DescentSettings, type DescentState, startState } from "./descent.ts";
import { type DfMeter, dfMeter } from "./df.ts";

/** Default largest scaled KKT violation accepted (see descent.ts for the scaling). */
export const DEFAULT_TOLERANCE = 1e-7;

/** Default most coordinate passes for one α. */
export const DEFAULT_MAX_PASSES = 100_000;

/** How to run a path. */
export interface PathOptions {
  /** Explicit α values or an automatic path (default: 100 values from α_max down). */
  readonly alphas?: AlphaGrid;
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
   * Effective degrees of freedom, intercept not counted: Σ_j μ_j/(μ_j + α(1 − ρ)) over the
   * eigenvalues μ_j of the active block of the Gram matrix (df.ts). Equals `nonzero` for the
   * lasso; below it for the elastic net. Null when not computed (`PathOptions.df`).
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
  readonly penalty: SparsePenalty;
  readonly count: number;
  readonly standardize: boolean;
  readonly intercept: boolean;
  /** Column scales s_q and means of the training rows. */
  readonly scales: readonly number[];
  readonly means: readonly number[];
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
  const mix = penaltyMix(penalty);
  const alphas = alphaGrid(problem, penalty, options.alphas);
  const settings = descentSettings(options);
  const top = alphaMax(problem, penalty);
  const warm = options.warmStart ?? true;
  const df = (options.df ?? options.validation === undefined) ? dfMeter(problem, mix) : null;
  let state = startState(problem, top);
  const solutions = alphas.map((alpha) => {
    if (!warm) state = startState(problem, top);
    const outcome = descend(problem, state, alpha, mix, settings);
    return describe(problem, state, alpha, mix, outcome, options.validation, df);
  });
  return deepFreeze({
    penalty: { kind: penalty.kind, mix },
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
  mix: number,
  outcome: { passes: number; violation: number; converged: boolean },
  validation: Moments | undefined,
  df: DfMeter | null,
): SparseSolution {
  const { w, g } = state;
  const a = alpha * mix;
  const beta = alpha * (1 - mix);
  let cw = 0, gw = 0, l1 = 0, l2 = 0, dualNorm = 0, nonzero = 0;
  for (let j = 0; j < problem.p; j++) {
    cw += problem.covariance[j] * w[j];
    gw += g[j] * w[j];
    l1 += Math.abs(w[j]);
    l2 += w[j] * w[j];
    dualNorm = Math.max(dualNorm, Math.abs(g[j] - beta * w[j]));
    if (w[j] !== 0) nonzero++;
  }
  const vy = problem.targetSquare;
  const mse = Math.max(vy - cw - gw, 0);
  const s = dualNorm > a ? a / dualNorm : 1;
  const penalty = a * l1 + 0.5 * beta * l2;
  const gap = 0.5 * (1 + s * s) * mse - s * (vy - cw) + a * l1 + 0.5 * beta * (1 + s * s) * l2;
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
