/**
 * The α path. α_max, the smallest α at which every penalized coefficient is zero, follows from
 * the optimality conditions there. Let w⁰ be that solution: w⁰_q = 0 for every column with
 * γ_q > 0, and the unpenalized columns (γ_q = 0, if any) at their least-squares values
 * (unpenalized.ts), so g = c − G w⁰ is the gradient residual (g = c without unpenalized
 * columns). Column q stays at zero while |g_q| ≤ αργ_q, so
 *   α_max = max over γ_q > 0 of |g_q| / (ρ γ_q),
 * which with every γ_q = 1 and no unpenalized column is max_q |c_q| / ρ =
 * max_q |⟨z*_q, y − ȳ⟩| / (N ρ) (z*_q the standardized, centered column; without an intercept,
 * uncentered z*_q and y). At least one γ_q is > 0 (penalty.ts refuses all-zero weights).
 * The automatic path runs from α_max down to ε·α_max, log-spaced, with ε = 10⁻³ when N > p and
 * 10⁻² otherwise (common practice for coordinate-descent paths).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { GramProblem } from "./gram.ts";
import { columnWeights, penaltyMix, type SparsePenalty } from "./penalty.ts";
import { nullSolution, unpenalizedColumns } from "./unpenalized.ts";

/** Explicit α values (each > 0), or the length and depth of an automatic path. */
export type AlphaGrid =
  | readonly number[]
  | {
    /** Number of α values (default 100). */
    readonly count?: number;
    /** ε: the smallest α as a share of α_max (default 10⁻³ when N > p, else 10⁻²). */
    readonly ratio?: number;
  };

/** Default number of α values on an automatic path. */
export const DEFAULT_PATH_SIZE = 100;

/**
 * α_max = max over γ_q > 0 of |g_q| / (ργ_q), g the gradient residuals with every penalized
 * coefficient 0 and the unpenalized ones fitted (max_q |c_q| / ρ for equal weights): at and
 * above it every penalized coefficient is zero. `gamma`: the per-column weights, resolved as
 * `columnWeights` (penalty.ts) resolves them (default: the penalty's own).
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { alphaMax } from "./grid.ts";
 * import { elasticNet, lasso } from "./penalty.ts";
 * const [m] = bucketMoments(Float64Array.of(0, 1, 2, 3), 1, Float64Array.of(0, 1, 2, 3), new Int32Array(4), 1);
 * const g = gramProblem(m);
 * console.log(alphaMax(g, lasso()), alphaMax(g, elasticNet({ mix: 0.5 }))); // 1.118… 2.236…
 * console.log(alphaMax(g, lasso({ weights: [2] }))); // 0.559…
 * ```
 */
export function alphaMax(
  problem: GramProblem,
  penalty: SparsePenalty,
  gamma?: ArrayLike<number>,
): number {
  const weights = columnWeights(penalty, problem.p, gamma);
  const { g } = nullSolution(problem, unpenalizedColumns(weights));
  let top = 0;
  weights.forEach((gq, q) => {
    if (gq > 0) top = Math.max(top, Math.abs(g[q]) / gq);
  });
  return top / penaltyMix(penalty);
}

/**
 * The α values to solve at, in decreasing order (the order a warm-started path runs):
 * explicit values deduplicated and sorted, or the automatic log-spaced path
 * α_max·ε^(i/(count−1)), i = 0 … count − 1. `gamma` as for `alphaMax`.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { alphaGrid } from "./grid.ts";
 * import { lasso } from "./penalty.ts";
 * const [m] = bucketMoments(Float64Array.of(0, 1, 2, 3), 1, Float64Array.of(0, 1, 2, 5), new Int32Array(4), 1);
 * const g = gramProblem(m);
 * console.log(alphaGrid(g, lasso(), { count: 3 }).length, alphaGrid(g, lasso(), [0.1, 1])); // 3 [1, 0.1]
 * ```
 */
export function alphaGrid(
  problem: GramProblem,
  penalty: SparsePenalty,
  spec?: AlphaGrid,
  gamma?: ArrayLike<number>,
): number[] {
  if (Array.isArray(spec)) return explicitAlphas(spec as readonly number[]);
  const auto = (spec ?? {}) as { count?: number; ratio?: number };
  const count = auto.count ?? DEFAULT_PATH_SIZE;
  if (!Number.isInteger(count) || count < 2 || count > 10000) {
    throw new CurbfitError(
      "BAD_OPTION",
      `alphas.count is ${count}, but it must be a whole number from 2 to 10000`,
      "Ask for e.g. { count: 50 }",
      { option: "alphas.count" },
    );
  }
  const ratio = auto.ratio ?? (problem.count > problem.p ? 1e-3 : 1e-2);
  if (!(typeof ratio === "number" && ratio > 0 && ratio < 1)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `alphas.ratio is ${ratio}, but it must be a number > 0 and < 1`,
      "Pass for example { ratio: 0.001 } (the smallest α as a share of the largest)",
      { option: "alphas.ratio" },
    );
  }
  const top = alphaMax(problem, penalty, gamma);
  if (!(top > 0)) {
    const free = columnWeights(penalty, problem.p, gamma).includes(0);
    throw new CurbfitError(
      "BAD_OPTION",
      (free
        ? "no penalized design column is correlated with the target once the unpenalized " +
          "columns are fitted, so every α gives the same coefficients"
        : "no design column is correlated with the target, so every α gives all-zero " +
          "coefficients") + " and there is no automatic α path",
      "Give explicit alphas, or check the target and terms",
      { option: "alphas" },
    );
  }
  return Array.from({ length: count }, (_, i) => top * ratio ** (i / (count - 1)));
}

function explicitAlphas(values: readonly number[]): number[] {
  if (values.length === 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      "alphas is an empty list",
      "Give at least one α > 0, or leave alphas out for an automatic path",
      { option: "alphas" },
    );
  }
  values.forEach((v, i) => {
    if (!(typeof v === "number" && Number.isFinite(v) && v > 0)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `alphas[${i}] is ${v}, but every α must be a finite number > 0`,
        "Remove zero, negative or non-numeric values; for an unpenalized fit use fit() with lambda 0",
        { option: `alphas[${i}]` },
      );
    }
  });
  return [...new Set(values)].sort((a, b) => b - a);
}
