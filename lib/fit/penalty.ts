/**
 * Penalties. The quadratic ("ridge" / weight-decay) penalty is λ Σ_q γ_q w*_q², where w*_q is
 * the coefficient of column q on the standardized scale (or the raw scale with
 * `standardize: false`) and γ_q ≥ 0 per-column weights, all > 0 here. The intercept is never
 * penalized. λ is in sum-of-squares units: the fitted objective is Σᵢ residualᵢ² + λ Σ γ_q w*_q².
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { SparsePenalty } from "../sparse/penalty.ts";

/** How γ_q is chosen: all equal, growing with polynomial order, falling with it, or given. */
export type RidgeWeights = "equal" | "rising" | "falling" | readonly number[];

/** A quadratic penalty λ Σ γ_q w*_q². */
export interface RidgePenalty {
  /** Discriminant: always "ridge" (quadratic penalty, strength λ). */
  readonly kind: "ridge";
  /** How γ_q is set per design column; an explicit array is copied and frozen. */
  readonly weights: RidgeWeights;
  /** For "rising"/"falling": γ_q = order_q^exponent or order_q^−exponent. */
  readonly exponent: number;
}

/**
 * The quadratic penalty. `weights`:
 * - `"equal"` (default): γ_q = 1, plain ridge / weight decay;
 * - `"rising"`: γ_q = order_q^exponent — higher polynomial orders cost more, favouring low orders;
 * - `"falling"`: γ_q = order_q^−exponent — the opposite, favouring high orders;
 * - an explicit array, one positive weight per design column.
 *
 * @example
 * ```ts
 * import { ridge } from "./penalty.ts";
 * const plain = ridge();
 * const lowOrdersFirst = ridge({ weights: "rising", exponent: 2 });
 * console.log(plain.weights, lowOrdersFirst.exponent); // "equal" 2
 * ```
 */
export function ridge(options: { weights?: RidgeWeights; exponent?: number } = {}): RidgePenalty {
  const weights = options.weights ?? "equal";
  const exponent = options.exponent ?? 1;
  if (!Number.isFinite(exponent) || exponent < 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      `the exponent is ${exponent}, but it must be a finite number >= 0`,
      'Pass for example { weights: "rising", exponent: 2 }',
      { option: "penalty.exponent" },
    );
  }
  if (typeof weights !== "string") {
    weights.forEach((g, q) => {
      if (!(Number.isFinite(g) && g > 0)) {
        throw new CurbfitError(
          "BAD_OPTION",
          `weight ${q + 1} is ${g}, but every weight must be a finite number > 0`,
          "Give one positive weight per design column",
          { option: `penalty.weights[${q}]` },
        );
      }
    });
  } else if (!["equal", "rising", "falling"].includes(weights)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `weights is ${JSON.stringify(weights)}`,
      'Use "equal", "rising", "falling" or an array of positive numbers',
      { option: "penalty.weights" },
    );
  }
  return Object.freeze({
    kind: "ridge",
    weights: typeof weights === "string" ? weights : Object.freeze([...weights]),
    exponent,
  });
}

/**
 * γ_q for each design column, given the columns' polynomial orders (all 1 for a sparse
 * penalty, which weighs every column alike).
 *
 * @example
 * ```ts
 * import { penaltyWeights, ridge } from "./penalty.ts";
 * console.log(penaltyWeights(ridge({ weights: "rising" }), [1, 2, 3])); // Float64Array [1, 2, 3]
 * ```
 */
export function penaltyWeights(penalty: Penalty, orders: readonly number[]): Float64Array {
  if (isSparse(penalty)) return new Float64Array(orders.length).fill(1);
  const { weights, exponent } = penalty;
  if (typeof weights !== "string") {
    if (weights.length !== orders.length) {
      throw new CurbfitError(
        "BAD_OPTION",
        `${weights.length} weights were given for ${orders.length} design columns`,
        "Give exactly one weight per design column (see fit.names for their order)",
        { option: "penalty.weights" },
      );
    }
    return Float64Array.from(weights);
  }
  const sign = weights === "rising" ? 1 : weights === "falling" ? -1 : 0;
  return Float64Array.from(orders, (k) => k ** (sign * exponent));
}

/** Any penalty `fit`, `sweep` and `compare` accept: quadratic (ridge) or sparse (lasso, elastic net). */
export type Penalty = RidgePenalty | SparsePenalty;

/**
 * Which strength convention a number is on: `"lambda"` is the ridge λ in sum-of-squares units
 * (Σ residual² + λ Σ γ_q w*_q²); `"alpha"` is the sparse α in the 1/(2N) convention
 * ((1/(2N)) Σ residual² + α[ρ‖w*‖₁ + ((1 − ρ)/2)‖w*‖²]). The two are never interchangeable.
 */
export type StrengthScale = "lambda" | "alpha";

/**
 * Whether a penalty is sparse (lasso or elastic net) rather than quadratic.
 *
 * @example
 * ```ts
 * import { isSparse, ridge } from "./penalty.ts";
 * import { lasso } from "../sparse/mod.ts";
 * console.log(isSparse(lasso()), isSparse(ridge())); // true false
 * ```
 */
export function isSparse(penalty: Penalty): penalty is SparsePenalty {
  return penalty.kind === "lasso" || penalty.kind === "elastic-net";
}

/**
 * The strength scale of a penalty: `"alpha"` for lasso and elastic net, `"lambda"` for ridge.
 *
 * @example
 * ```ts
 * import { ridge, strengthScale } from "./penalty.ts";
 * console.log(strengthScale(ridge())); // "lambda"
 * ```
 */
export function strengthScale(penalty: Penalty): StrengthScale {
  return isSparse(penalty) ? "alpha" : "lambda";
}

/**
 * The symbol a human reads next to a strength: λ (ridge) or α (sparse).
 *
 * @example
 * ```ts
 * import { strengthSymbol } from "./penalty.ts";
 * console.log(strengthSymbol("alpha")); // "α"
 * ```
 */
export function strengthSymbol(scale: StrengthScale): "λ" | "α" {
  return scale === "alpha" ? "α" : "λ";
}

/**
 * The fitted objective in words and symbols, exactly as the solver minimizes it.
 *
 * @example
 * ```ts
 * import { objectiveText, ridge } from "./penalty.ts";
 * import { elasticNet } from "../sparse/mod.ts";
 * console.log(objectiveText(ridge()));
 * console.log(objectiveText(elasticNet({ mix: 0.5 })));
 * ```
 */
export function objectiveText(penalty: Penalty): string {
  if (!isSparse(penalty)) {
    return "minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q w*_q² (λ in sum-of-squares units)";
  }
  const rho = penalty.kind === "lasso" ? "" : ` with ρ = ${penalty.mix}`;
  const term = penalty.kind === "lasso"
    ? "α Σ_q |w*_q|"
    : "α [ρ Σ_q |w*_q| + ((1 − ρ)/2) Σ_q w*_q²]";
  return `minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + ${term}${rho} (α in the 1/(2N) convention; ` +
    "not the ridge λ)";
}

/** The strength options of each convention, for messages. */
const STRENGTH_OPTIONS = {
  lambda: ["lambda", "lambdas", "budget"],
  alpha: ["alpha", "alphas", "tolerance"],
} as const;

/**
 * Rejects strength options of the other convention: `lambda`, `lambdas` and `budget` belong to
 * ridge; `alpha`, `alphas` and `tolerance` to lasso / elastic net.
 *
 * @example
 * ```ts
 * import { checkStrengthOptions, ridge } from "./penalty.ts";
 * checkStrengthOptions(ridge(), { lambda: 1 }); // fine
 * ```
 */
export function checkStrengthOptions(
  penalty: Penalty,
  spec: Readonly<Record<string, unknown>>,
  prefix = "",
): void {
  const scale = strengthScale(penalty);
  const other = scale === "alpha" ? "lambda" : "alpha";
  for (const option of STRENGTH_OPTIONS[other]) {
    if (spec[option] === undefined) continue;
    throw new CurbfitError(
      "BAD_OPTION",
      scale === "alpha"
        ? `${option} was given with a ${penalty.kind} penalty, but λ options belong to ridge()`
        : `${option} was given with a ridge penalty, but α options belong to lasso() and ` +
          "elasticNet()",
      scale === "alpha"
        ? "Give the sparse strength as alpha (one value) or alphas (a grid), in the 1/(2N) convention"
        : "Give the ridge strength as lambda, lambdas or budget (sum-of-squares units), or use " +
          "penalty: lasso() / elasticNet({ mix }) with alpha",
      { option: prefix + option },
    );
  }
}
