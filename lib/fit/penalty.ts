/**
 * Penalties. The quadratic ("ridge" / weight-decay) penalty is λ Σ_q γ_q w*_q², where w*_q is
 * the coefficient of column q on the standardized scale (or the raw scale with
 * `standardize: false`) and γ_q ≥ 0 per-column weights, all > 0 here. The intercept is never
 * penalized. λ is in sum-of-squares units: the fitted objective is Σᵢ residualᵢ² + λ Σ γ_q w*_q².
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

/** How γ_q is chosen: all equal, growing with polynomial order, falling with it, or given. */
export type RidgeWeights = "equal" | "rising" | "falling" | readonly number[];

/** A quadratic penalty λ Σ γ_q w*_q². */
export interface RidgePenalty {
  readonly kind: "ridge";
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
 * γ_q for each design column, given the columns' polynomial orders.
 *
 * @example
 * ```ts
 * import { penaltyWeights, ridge } from "./penalty.ts";
 * console.log(penaltyWeights(ridge({ weights: "rising" }), [1, 2, 3])); // Float64Array [1, 2, 3]
 * ```
 */
export function penaltyWeights(penalty: RidgePenalty, orders: readonly number[]): Float64Array {
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
