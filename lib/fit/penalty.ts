/**
 * Penalties. The quadratic ("ridge" / weight-decay) penalty is λ Σ_q γ_q w*_q², where w*_q is
 * the coefficient of column q on the standardized scale (or the raw scale with
 * `standardize: false`) and γ_q > 0 per-column weights. The intercept is never penalized. λ is in
 * sum-of-squares units: the fitted objective is Σᵢ residualᵢ² + λ Σ γ_q w*_q².
 *
 * The same per-column weights, with the same option name and schemes, serve the sparse
 * penalties of lib/sparse (`lasso({ weights })`, `elasticNet({ mix, weights })`): there
 * γ_q ≥ 0, and γ_q = 0 leaves a column unpenalized.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { SparsePenalty } from "../sparse/penalty.ts";

/**
 * How γ_q is chosen: all equal, growing with polynomial order, falling with it, or given. One
 * vocabulary for every penalty: `ridge({ weights })`, `lasso({ weights })` and
 * `elasticNet({ mix, weights })` all take it.
 */
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
  const { weights, exponent } = checkedWeights(options, "ridge");
  return Object.freeze({ kind: "ridge", weights, exponent });
}

/**
 * The weight settings of a penalty, checked, with defaults filled in (`"equal"`, exponent 1)
 * and an explicit array copied and frozen. Ridge weights must be > 0; the weights of a sparse
 * penalty (`kind` "lasso" or "elastic-net") may be 0 (that column is then unpenalized) but not
 * all of them. Errors name the option (`penalty.weights`, `penalty.weights[q]`,
 * `penalty.exponent`).
 *
 * @example
 * ```ts
 * import { checkedWeights } from "./penalty.ts";
 * console.log(checkedWeights({ weights: [0, 1, 2] }, "lasso")); // { weights: [0, 1, 2], exponent: 1 }
 * ```
 */
export function checkedWeights(
  options: { readonly weights?: RidgeWeights; readonly exponent?: number },
  kind: Penalty["kind"],
): { readonly weights: RidgeWeights; readonly exponent: number } {
  const weights = options.weights ?? "equal";
  const exponent = options.exponent ?? 1;
  const sparse = kind !== "ridge";
  if (!(typeof exponent === "number" && Number.isFinite(exponent) && exponent >= 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `the exponent is ${exponent}, but it must be a finite number >= 0`,
      'Pass for example { weights: "rising", exponent: 2 }',
      { option: "penalty.exponent" },
    );
  }
  if (Array.isArray(weights)) {
    weights.forEach((g, q) => {
      if (!(typeof g === "number" && Number.isFinite(g) && (sparse ? g >= 0 : g > 0))) {
        throw new CurbfitError(
          "BAD_OPTION",
          `weight ${q + 1} is ${g}, but every weight must be a finite number ` +
            (sparse ? ">= 0 (0 leaves that column unpenalized)" : "> 0"),
          sparse
            ? "Give one weight >= 0 per design column"
            : "Give one positive weight per design column",
          { option: `penalty.weights[${q}]` },
        );
      }
    });
    if (sparse && weights.length > 0 && !weights.some((g) => g > 0)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `every weight of the ${kind} penalty is 0, so no column would be penalized and α ` +
          "would have nothing to act on",
        "Give at least one weight > 0; for a fit without any penalty use ridge() with lambda 0",
        { option: "penalty.weights" },
      );
    }
    return { weights: Object.freeze([...weights]), exponent };
  }
  if (!(["equal", "rising", "falling"] as unknown[]).includes(weights)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `weights is ${JSON.stringify(weights)}`,
      `Use "equal", "rising", "falling" or an array of ${
        sparse ? "numbers >= 0" : "positive numbers"
      }`,
      { option: "penalty.weights" },
    );
  }
  return { weights, exponent };
}

/**
 * γ_q for each design column, given the columns' polynomial orders: the penalty's weights
 * resolved per column, the same way for every penalty (a lasso or elastic net without weights
 * has every γ_q = 1).
 *
 * @example
 * ```ts
 * import { penaltyWeights, ridge } from "./penalty.ts";
 * import { lasso } from "../sparse/mod.ts";
 * console.log(penaltyWeights(ridge({ weights: "rising" }), [1, 2, 3])); // Float64Array [1, 2, 3]
 * console.log(penaltyWeights(lasso({ weights: "rising", exponent: 2 }), [1, 2, 3])); // [1, 4, 9]
 * ```
 */
export function penaltyWeights(penalty: Penalty, orders: readonly number[]): Float64Array {
  if (isSparse(penalty) && penalty.weights === undefined) {
    return new Float64Array(orders.length).fill(1);
  }
  const { weights, exponent } = isSparse(penalty) ? checkedWeights(penalty, penalty.kind) : penalty;
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
 * ((1/(2N)) Σ residual² + α Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²], every γ_q = 1 unless weights
 * are given). The two are never interchangeable.
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
 * The fitted objective in words and symbols, exactly as the solver minimizes it. A lasso or
 * elastic net with per-column weights reads
 * `(1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²]`; without weights
 * (every γ_q = 1) the γ_q are left out.
 *
 * @example
 * ```ts
 * import { objectiveText, ridge } from "./penalty.ts";
 * import { elasticNet, lasso } from "../sparse/mod.ts";
 * console.log(objectiveText(ridge()));
 * console.log(objectiveText(elasticNet({ mix: 0.5 })));
 * console.log(objectiveText(lasso({ weights: [0, 1, 1] }))); // … + α Σ_q γ_q |w*_q| …
 * ```
 */
export function objectiveText(penalty: Penalty): string {
  if (!isSparse(penalty)) {
    return "minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q w*_q² (λ in sum-of-squares units)";
  }
  const weighted = penalty.weights !== undefined && penalty.weights !== "equal";
  const rho = penalty.kind === "lasso" ? "" : ` with ρ = ${penalty.mix}`;
  const term = penalty.kind === "lasso"
    ? (weighted ? "α Σ_q γ_q |w*_q|" : "α Σ_q |w*_q|")
    : weighted
    ? "α Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²]"
    : "α [ρ Σ_q |w*_q| + ((1 − ρ)/2) Σ_q w*_q²]";
  const gamma = weighted
    ? "; γ_q ≥ 0 per design column (see gamma), γ_q = 0 leaves column q unpenalized"
    : "";
  return `minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + ${term}${rho}${gamma} (α in the 1/(2N) ` +
    "convention; not the ridge λ)";
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
