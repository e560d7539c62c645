/**
 * The all-rows lasso / elastic-net model as a FitSummary.
 *
 * Objective (1/(2N) convention, standardized coefficients w*_q = s_q w_q, intercept b
 * unpenalized, per-column weights γ_q ≥ 0 resolved per design column like ridge's, every γ_q = 1
 * without weights; lib/sparse/penalty.ts):
 *   minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α Σ_q γ_q [ ρ |w*_q| + ((1 − ρ)/2) w*_q² ].
 * α is not the ridge λ (sum-of-squares units): the summary says which with `scale: "alpha"`.
 * The solution comes from coordinate descent on the Gram form of the rows' summary, stopped at
 * a scaled KKT violation ≤ `tolerance` (lib/sparse/descent.ts); the exact QR solver with
 * iterative refinement is for quadratic penalties only, so there is no exact refit here.
 *
 * Reported: `budget` = Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] (the penalty's value per unit α;
 * ‖w*‖₁ for the unweighted lasso); `gamma`, the γ_q used; `nonzero`, the count of nonzero
 * coefficients; `df`, the effective degrees of freedom tr[Z_A (Z_AᵀZ_A + N·α·(1 − ρ)·Γ_A)⁻¹ Z_Aᵀ]
 * (Γ = diag(γ); with equal weights Σ_j μ_j/(μ_j + α(1 − ρ)) over the eigenvalues μ_j of the
 * active block of the standardized Gram matrix; lib/sparse/df.ts derives it in this
 * convention). For the lasso it is the nonzero count (an unbiased estimate of the lasso's degrees
 * of freedom: Zou, Hastie & Tibshirani 2007, Ann. Statist. 35); for the elastic net it is below
 * the count (Zou & Hastie 2005, J. R. Statist. Soc. B 67; recalled from memory). `residualSd` =
 * √(RSS / (n − intercept − df)), the convention of FitSummary.
 *
 * @module
 */
import { deepFreeze } from "../common/freeze.ts";
import type { Design } from "../design/types.ts";
import type { Moments } from "../sweep/moments.ts";
import {
  canonicalSparse,
  gramProblem,
  solutionDf,
  type SparsePath,
  sparsePath,
  type SparsePenalty,
  type SparseSolution,
} from "../sparse/mod.ts";
import { objectiveText, penaltyWeights } from "./penalty.ts";
import type { FitSummary } from "./fit.ts";

/** What a sparse summary needs besides the solution. */
export interface SparseSummaryContext {
  readonly target: string;
  /** Names and orders of the design columns (a whole Design, or just these from a summary). */
  readonly design: Pick<Design, "names" | "orders">;
  readonly penalty: SparsePenalty;
  readonly condition: number;
}

/**
 * Solves the sparse problem on all rows of a design, from their co-moments, over the given α
 * values (solutions in decreasing α), with the penalty's weights resolved per design column
 * (`penaltyWeights`, from the columns' orders).
 *
 * @example
 * ```ts
 * import { buildDesign, learnTerms, legendre } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * import { lasso } from "../sparse/mod.ts";
 * import { allRowsPath } from "./sparse_fit.ts";
 * import { allRowsMoments } from "./solver.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const table = tableFromColumns({ x });
 * const design = buildDesign(learnTerms([legendre("x", 5)], table), table);
 * const moments = allRowsMoments(design.block, Float64Array.from(x, (v) => v * v));
 * const path = allRowsPath(design, moments, lasso(), [0.1, 0.01], { standardize: true, intercept: true });
 * console.log(path.solutions.map((s) => s.nonzero)); // fewer nonzero at α = 0.1
 * ```
 */
export function allRowsPath(
  design: Design,
  moments: Moments,
  penalty: SparsePenalty,
  alphas: readonly number[],
  options: { standardize: boolean; intercept: boolean; tolerance?: number },
): SparsePath {
  const problem = gramProblem(moments, { ...options, names: design.names, where: "rows" });
  const gamma = penaltyWeights(penalty, design.orders);
  return sparsePath(problem, penalty, { alphas, gamma, tolerance: options.tolerance });
}

/**
 * The sparse penalty's value per unit α, Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²]
 * (ρ‖w*‖₁ + ((1 − ρ)/2)‖w*‖² with every γ_q = 1, the default; ‖w*‖₁ for the unweighted lasso).
 *
 * @example
 * ```ts
 * import { penaltyValue } from "./sparse_fit.ts";
 * console.log(penaltyValue(1, [0.5, -1]), penaltyValue(0.5, [2])); // 1.5 2
 * console.log(penaltyValue(1, [0.5, -1], [0, 2])); // 2
 * ```
 */
export function penaltyValue(
  mix: number,
  standardized: readonly number[],
  gamma?: readonly number[],
): number {
  let l1 = 0, l2 = 0;
  standardized.forEach((v, q) => {
    const g = gamma === undefined ? 1 : gamma[q];
    l1 += g * Math.abs(v);
    l2 += g * v * v;
  });
  return mix * l1 + ((1 - mix) / 2) * l2;
}

/**
 * The FitSummary of one solution of an all-rows path.
 *
 * @example
 * ```ts
 * import { fit, lasso, legendre } from "../../mod.ts";
 * // fit() with a sparse penalty builds its summary here:
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const m = fit({ x, y: x.map((v) => v * v) }, { target: "y", terms: [legendre("x", 5)], penalty: lasso(), alpha: 0.01 });
 * console.log(m.summary.scale, m.summary.nonzero, m.summary.descent?.converged); // "alpha" … true
 * ```
 */
export function sparseSummary(
  path: SparsePath,
  sol: SparseSolution,
  context: SparseSummaryContext,
): FitSummary {
  const { design } = context;
  const penalty = canonicalSparse(context.penalty);
  const { mix } = penalty;
  const w = [...sol.coefficients];
  const wStd = [...sol.standardized];
  const means = path.standardize ? [...path.means] : new Array<number>(w.length).fill(0);
  const n = path.count;
  const df = solutionDf(sol);
  const residualDf = n - (path.intercept ? 1 : 0) - df;
  return deepFreeze({
    target: context.target,
    n,
    names: [...design.names],
    orders: [...design.orders],
    penalty,
    scale: "alpha",
    objective: objectiveText(penalty),
    gamma: [...path.gamma],
    strength: sol.alpha,
    budget: penaltyValue(mix, wStd, path.gamma),
    df,
    nonzero: sol.nonzero,
    intercept: sol.intercept,
    coefficients: w,
    standardized: {
      intercept: sol.intercept + w.reduce((s, v, q) => s + v * means[q], 0),
      coefficients: wStd,
    },
    standardize: path.standardize,
    hasIntercept: path.intercept,
    means,
    sds: [...path.scales],
    trainMse: sol.trainMse,
    residualSd: residualDf > 0 ? Math.sqrt((sol.trainMse * n) / residualDf) : NaN,
    condition: context.condition,
    refinementSteps: 0,
    descent: {
      passes: sol.passes,
      violation: sol.violation,
      converged: sol.converged,
      gap: sol.gap,
      tolerance: path.tolerance,
    },
  });
}
