/**
 * The α path. α_max, the smallest α at which every coefficient is zero, follows from the
 * optimality conditions at w* = 0 (the gradient of the smooth part is −c there):
 *   α_max = max_q |c_q| / ρ = max_q |⟨z*_q, y − ȳ⟩| / (N ρ)
 * (z*_q the standardized, centered column; without an intercept, uncentered z*_q and y).
 * The automatic path runs from α_max down to ε·α_max, log-spaced, with ε = 10⁻³ when N > p and
 * 10⁻² otherwise (common practice for coordinate-descent paths).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { GramProblem } from "./gram.ts";
import { penaltyMix, type SparsePenalty } from "./penalty.ts";

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
 * α_max = max_q |c_q| / ρ: at and above it every coefficient is zero.
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
 * ```
 */
export function alphaMax(problem: GramProblem, penalty: SparsePenalty): number {
  let top = 0;
  for (const c of problem.covariance) top = Math.max(top, Math.abs(c));
  return top / penaltyMix(penalty);
}

/**
 * The α values to solve at, in decreasing order (the order a warm-started path runs):
 * explicit values deduplicated and sorted, or the automatic log-spaced path
 * α_max·ε^(i/(count−1)), i = 0 … count − 1.
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
  const top = alphaMax(problem, penalty);
  if (!(top > 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      "no design column is correlated with the target, so every α gives all-zero coefficients " +
        "and there is no automatic α path",
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
