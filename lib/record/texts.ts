/**
 * The fixed sentences a record carries so that it can be read (and a statement rendered)
 * without the library: the objective, the meaning of each CV column, the rule, the comparison
 * criterion and the cautions. `verify` compares them exactly with what this version writes.
 *
 * @module
 */
import type { RidgePenalty, StrengthScale } from "../fit/penalty.ts";
import type { SparsePenalty } from "../sparse/mod.ts";
import type { SelectionRule } from "../sweep/select.ts";

/**
 * The objective of one model, one statement per line (the convention of lib/fit/fit.ts).
 *
 * @example
 * ```ts
 * import { objectiveLines } from "./texts.ts";
 * const lines = objectiveLines({ kind: "ridge", weights: "equal", exponent: 1 }, true, true);
 * console.log(lines[0]); // minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q (s_q w_q)² over b and w
 * ```
 */
export function objectiveLines(
  penalty: RidgePenalty,
  standardize: boolean,
  intercept: boolean,
): string[] {
  return [
    "minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q (s_q w_q)² over b and w",
    "zᵢ: row i of the design (the terms' output columns, final.names); w_q: coefficient of " +
    "column q on the original scale",
    standardize
      ? "s_q: standard deviation (divisor n) of design column q over the training rows; " +
        "s_q w_q is the standardized coefficient"
      : "s_q = 1 (standardize: false): the penalty acts on the original-scale coefficients",
    intercept ? "b: the intercept, never penalized" : "b = 0 (intercept: false)",
    gammaLine(penalty),
    "λ ≥ 0 in sum-of-squares units; per training row the objective is " +
    "E_in + (λ/N) Σ_q γ_q (s_q w_q)², with E_in the training mean squared error and N the " +
    "number of training rows",
  ];
}

/**
 * The objective of one lasso / elastic-net model, one statement per line (the 1/(2N)
 * convention of lib/sparse/penalty.ts), with the solver and its stopping rule. With per-column
 * weights the penalty reads α Σ_q γ_q [ρ |s_q w_q| + ((1 − ρ)/2) (s_q w_q)²] and a line says
 * how γ was chosen; without them the lines are those of records written before weights existed.
 *
 * @example
 * ```ts
 * import { sparseObjectiveLines } from "./texts.ts";
 * console.log(sparseObjectiveLines({ kind: "lasso", mix: 1 }, true, true)[0]);
 * console.log(sparseObjectiveLines({ kind: "lasso", mix: 1, weights: [0, 1] }, true, true)[0]);
 * ```
 */
export function sparseObjectiveLines(
  penalty: SparsePenalty,
  standardize: boolean,
  intercept: boolean,
): string[] {
  const weighted = isWeighted(penalty);
  return [
    (weighted
      ? "minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α Σ_q γ_q [ρ |s_q w_q| + ((1 − ρ)/2) (s_q w_q)²] "
      : "minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α [ρ Σ_q |s_q w_q| + ((1 − ρ)/2) Σ_q (s_q w_q)²] ") +
    "over b and w",
    "zᵢ: row i of the design (the terms' output columns, final.names); w_q: coefficient of " +
    "column q on the original scale; N: the number of training rows",
    standardize
      ? "s_q: standard deviation (divisor n) of design column q over the training rows; " +
        "s_q w_q is the standardized coefficient"
      : "s_q = 1 (standardize: false): the penalty acts on the original-scale coefficients",
    intercept ? "b: the intercept, never penalized" : "b = 0 (intercept: false)",
    penalty.kind === "lasso"
      ? `ρ = 1 (lasso): the penalty is α Σ_q ${weighted ? "γ_q " : ""}|s_q w_q|`
      : `ρ = ${penalty.mix} (elastic net): the L1 share of the penalty`,
    ...(weighted ? [sparseGammaLine(penalty)] : []),
    "α > 0 in the 1/(2N) convention common to coordinate-descent solvers; it is not the ridge λ " +
    "(the quadratic part alone is ridge with λ = N·α·(1 − ρ))",
    "solved by cyclic coordinate descent with covariance updates (Friedman, Hastie & Tibshirani " +
    "2010), warm-started along the decreasing α path, stopped when every column's scaled KKT " +
    "violation is at most penalty.tolerance; final.descent reports the violation and the duality gap",
  ];
}

/** Whether a sparse penalty has weights other than all 1. */
function isWeighted(penalty: SparsePenalty): boolean {
  return penalty.weights !== undefined && penalty.weights !== "equal";
}

/** How γ was chosen for a weighted sparse penalty, and what γ_q = 0 means. */
function sparseGammaLine(penalty: SparsePenalty): string {
  const { weights, exponent = 1 } = penalty;
  const chosen = typeof weights !== "string"
    ? "γ_q ≥ 0: given per design column (penalty.gamma)"
    : weights === "rising"
    ? `γ_q = order_q^${exponent} (penalty.gamma): higher polynomial orders are penalized more`
    : `γ_q = order_q^(−${exponent}) (penalty.gamma): lower polynomial orders are penalized more`;
  return `${chosen}; a column with γ_q = 0 is unpenalized and in the model at every α`;
}

function gammaLine(penalty: RidgePenalty): string {
  const { weights, exponent } = penalty;
  if (typeof weights !== "string") return "γ_q: given per design column (penalty.gamma)";
  if (weights === "equal") return "γ_q = 1 for every column (ridge / weight decay)";
  return weights === "rising"
    ? `γ_q = order_q^${exponent}: higher polynomial orders are penalized more`
    : `γ_q = order_q^(−${exponent}): lower polynomial orders are penalized more`;
}

/**
 * What each column of the CV table means.
 *
 * @example
 * ```ts
 * import { CV_DEFINITIONS } from "./texts.ts";
 * console.log(CV_DEFINITIONS.length > 0); // true
 * ```
 */
export const CV_DEFINITIONS: readonly string[] = Object.freeze([
  "foldMse[l][f]: mean squared error on the validation rows of fold f at λ = lambda[l], " +
  "fitted on that fold's training rows with terms and standardization learned on them only; " +
  "folds are repeat-major (repeat 0 folds 0…K−1, then repeat 1, …)",
  "cvMean: mean of the K·R fold errors; cvSe: their standard deviation (divisor K·R − 1) " +
  "divided by √K",
  "trainMse: training mean squared error of the all-rows fit; foldTrainMse: mean training " +
  "mean squared error over the folds' training rows",
  "df: effective degrees of freedom Σ_j e_j/(e_j + λ) of the all-rows fit (intercept not " +
  "counted); budget: C(λ) = Σ_q γ_q (s_q w_q)² of the all-rows fit",
  "gcv: generalized cross-validation error of the all-rows fit; loo: closed-form " +
  "leave-one-out mean squared error (null when not computed)",
  "path[l]: standardized coefficients s_q w_q of the all-rows fit at λ = lambda[l], in " +
  "final.names order",
]);

/**
 * What each column of a sparse model's CV table means.
 *
 * @example
 * ```ts
 * import { SPARSE_CV_DEFINITIONS } from "./texts.ts";
 * console.log(SPARSE_CV_DEFINITIONS.length > 0); // true
 * ```
 */
export const SPARSE_CV_DEFINITIONS: readonly string[] = Object.freeze([
  "foldMse[l][f]: mean squared error on the validation rows of fold f at α = alpha[l], " +
  "fitted on that fold's training rows with terms and standardization learned on them only; " +
  "folds are repeat-major (repeat 0 folds 0…K−1, then repeat 1, …); every fold is solved at " +
  "the same α values, those of the all-rows path",
  CV_DEFINITIONS[1],
  CV_DEFINITIONS[2],
  "nonzero: number of nonzero coefficients of the all-rows fit (intercept not counted); " +
  "penaltyValue: ρ Σ_q |s_q w_q| + ((1 − ρ)/2) Σ_q (s_q w_q)² of the all-rows fit",
  "path[l]: standardized coefficients s_q w_q of the all-rows fit at α = alpha[l], in " +
  "final.names order",
]);

/**
 * What each column of a sparse model's CV table means, for its penalty: SPARSE_CV_DEFINITIONS,
 * with the penalty value written with γ_q when the penalty has weights.
 *
 * @example
 * ```ts
 * import { SPARSE_CV_DEFINITIONS, sparseCvDefinitions } from "./texts.ts";
 * console.log(sparseCvDefinitions({ kind: "lasso", mix: 1 })[3] === SPARSE_CV_DEFINITIONS[3]); // true
 * ```
 */
export function sparseCvDefinitions(penalty: SparsePenalty): string[] {
  if (!isWeighted(penalty)) return [...SPARSE_CV_DEFINITIONS];
  return SPARSE_CV_DEFINITIONS.map((line, i) =>
    i === PENALTY_VALUE_LINE
      ? "nonzero: number of nonzero coefficients of the all-rows fit (intercept not counted); " +
        "penaltyValue: Σ_q γ_q [ρ |s_q w_q| + ((1 − ρ)/2) (s_q w_q)²] of the all-rows fit " +
        "(γ_q: penalty.gamma)"
      : line
  );
}

/** Index of the line of SPARSE_CV_DEFINITIONS that defines penaltyValue. */
const PENALTY_VALUE_LINE = 3;

/**
 * The rule in words.
 *
 * @example
 * ```ts
 * import { ruleDefinition } from "./texts.ts";
 * console.log(ruleDefinition("min")); // min: the λ with the smallest cvMean (the first on ties)
 * ```
 */
export function ruleDefinition(rule: SelectionRule, scale: StrengthScale = "lambda"): string {
  const symbol = scale === "alpha" ? "α" : "λ";
  return rule === "min"
    ? `min: the ${symbol} with the smallest cvMean (the first on ties)`
    : `one-se: the largest ${symbol} whose cvMean is at most cvMean + cvSe at the minimum ` +
      "(Breiman, Friedman, Olshen & Stone 1984)";
}

/**
 * How a comparison pairs candidates.
 *
 * @example
 * ```ts
 * import { COMPARISON_CRITERION } from "./texts.ts";
 * console.log(COMPARISON_CRITERION.startsWith("paired")); // true
 * ```
 */
export const COMPARISON_CRITERION = "paired per-fold differences d_f = foldMse_f(candidate) − " +
  "foldMse_f(best), each at its own chosen λ, on the identical folds; mean ± SE with SE = " +
  "SD(d)/√K; indistinguishable when |mean| ≤ 2·SE (a rough screen: fold errors are " +
  "correlated, so this is not a formal test)";

/**
 * How a comparison pairs candidates, when some candidate is lasso / elastic net (each at its
 * own chosen strength, λ or α).
 *
 * @example
 * ```ts
 * import { SPARSE_COMPARISON_CRITERION } from "./texts.ts";
 * console.log(SPARSE_COMPARISON_CRITERION.includes("α")); // true
 * ```
 */
export const SPARSE_COMPARISON_CRITERION = COMPARISON_CRITERION.replace(
  "its own chosen λ",
  "its own chosen strength (λ for ridge, α for lasso / elastic net)",
);

/**
 * Plain cautions every record carries.
 *
 * @example
 * ```ts
 * import { CAUTIONS } from "./texts.ts";
 * console.log(CAUTIONS.length); // 3
 * ```
 */
export const CAUTIONS: readonly string[] = Object.freeze([
  "A cross-validation error is an estimate from a finite sample, with its own uncertainty " +
  "(cvSe); it is not a guarantee of the error on new data.",
  "Predictions for inputs outside the ranges in data.columns (and outside learned Legendre " +
  "domains) are extrapolation: polynomial terms can grow quickly there.",
  "Random folds assume exchangeable rows; rows that come in clusters or in time order need " +
  "grouped or explicit folds, or the validation error looks better than it will be.",
]);
