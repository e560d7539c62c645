/**
 * Sparse penalties: the lasso and the elastic net. On standardized columns (coefficients w*_q)
 * the fitted objective, in the 1/(2N) scaling common to coordinate-descent solvers, is
 *   (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α Σ_q γ_q [ ρ |w*_q| + ((1 − ρ)/2) (w*_q)² ],
 * with ρ = `mix` ∈ (0, 1] the share of the penalty that is L1 (ρ = 1: lasso), γ_q ≥ 0 per-column
 * weights (`weights`, the same option and schemes as `ridge()`; every γ_q = 1 without it) and
 * the intercept b unpenalized. A column with γ_q = 0 is unpenalized: it is in the model at every
 * α. The strength is called α, not λ, because its units differ from the ridge λ of `ridge()`
 * (sum-of-squares units): multiplying the objective by 2N shows that the quadratic part alone
 * (ρ → 0) is ridge with λ_ridge = N·α·(1 − ρ), i.e. λ_ridge = N·α at ρ = 0, with the same γ_q.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { checkedWeights, type RidgeWeights } from "../fit/penalty.ts";

/**
 * A lasso or elastic-net penalty; `mix` is ρ, the L1 share (1 for the lasso). Without `weights`
 * every γ_q is 1; `lasso()` and `elasticNet()` leave `weights` and `exponent` out for equal
 * weights, so a penalty without weights is the same object as before weights existed.
 */
export interface SparsePenalty {
  /** Which sparse penalty; its strength is α in the 1/(2N) convention, never the ridge λ. */
  readonly kind: "lasso" | "elastic-net";
  /** ρ ∈ (0, 1], the L1 share of the penalty: 1 for the lasso. */
  readonly mix: number;
  /**
   * How γ_q is set per design column, as for `ridge()`: `"rising"` (γ_q = order_q^exponent),
   * `"falling"` (order_q^−exponent) or one weight ≥ 0 per column (0: unpenalized). Absent:
   * every γ_q = 1.
   */
  readonly weights?: RidgeWeights;
  /** For `"rising"` / `"falling"` weights; present (default 1) whenever `weights` is. */
  readonly exponent?: number;
}

/** Default L1 share of `elasticNet()` (an even split; common practice). */
export const DEFAULT_MIX = 0.5;

/**
 * The lasso: α Σ_q γ_q |w*_q| (ρ = 1), every γ_q = 1 unless `weights` are given — the option
 * and schemes of `ridge()`: `"equal"` (default), `"rising"` (γ_q = order_q^exponent),
 * `"falling"` (order_q^−exponent) or one weight ≥ 0 per design column (0: unpenalized, in the
 * model at every α; not all of them 0).
 *
 * @example
 * ```ts
 * import { lasso } from "./penalty.ts";
 * console.log(lasso()); // { kind: "lasso", mix: 1 }
 * console.log(lasso({ weights: "rising", exponent: 2 })); // … weights: "rising", exponent: 2 }
 * ```
 */
export function lasso(options: { weights?: RidgeWeights; exponent?: number } = {}): SparsePenalty {
  return Object.freeze({ kind: "lasso", mix: 1, ...weighting(options, "lasso") });
}

/**
 * The elastic net: α Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2)(w*_q)²] with ρ = `mix` ∈ (0, 1] (default
 * 0.5), every γ_q = 1 unless `weights` are given (as for `lasso()`). For a purely quadratic
 * penalty use `ridge()`.
 *
 * @example
 * ```ts
 * import { elasticNet } from "./penalty.ts";
 * console.log(elasticNet({ mix: 0.3 })); // { kind: "elastic-net", mix: 0.3 }
 * console.log(elasticNet({ mix: 0.3, weights: [0, 1, 1] }).weights); // [0, 1, 1]
 * ```
 */
export function elasticNet(
  options: { mix?: number; weights?: RidgeWeights; exponent?: number } = {},
): SparsePenalty {
  return Object.freeze({
    kind: "elastic-net",
    mix: checkedMix(options.mix ?? DEFAULT_MIX),
    ...weighting(options, "elastic-net"),
  });
}

/**
 * The L1 share ρ of a penalty object, after checking it (objects not made by `lasso()` or
 * `elasticNet()` may carry anything).
 *
 * @example
 * ```ts
 * import { elasticNet, lasso, penaltyMix } from "./penalty.ts";
 * console.log(penaltyMix(lasso()), penaltyMix(elasticNet({ mix: 0.25 }))); // 1 0.25
 * ```
 */
export function penaltyMix(penalty: SparsePenalty): number {
  if (penalty?.kind !== "lasso" && penalty?.kind !== "elastic-net") {
    throw new CurbfitError(
      "BAD_OPTION",
      `the penalty kind is ${JSON.stringify(penalty?.kind)}`,
      "Make the penalty with lasso() or elasticNet({ mix })",
      { option: "penalty" },
    );
  }
  if (penalty.kind === "lasso" && penalty.mix !== 1) {
    throw new CurbfitError(
      "BAD_OPTION",
      `a lasso penalty has mix ${penalty.mix}, but the lasso is mix 1`,
      "Make the penalty with lasso(), or use elasticNet({ mix }) for another L1 share",
      { option: "penalty.mix" },
    );
  }
  return checkedMix(penalty.mix);
}

/**
 * A sparse penalty checked and written the way `lasso()` / `elasticNet()` write it: kind, mix,
 * and `weights` with `exponent` only when the weights are not equal. Frozen.
 *
 * @example
 * ```ts
 * import { canonicalSparse } from "./penalty.ts";
 * console.log(canonicalSparse({ kind: "lasso", mix: 1, weights: "equal" })); // { kind: "lasso", mix: 1 }
 * ```
 */
export function canonicalSparse(penalty: SparsePenalty): SparsePenalty {
  const mix = penaltyMix(penalty);
  return Object.freeze({ kind: penalty.kind, mix, ...weighting(penalty, penalty.kind) });
}

/**
 * γ_q for each of the p design columns of a sparse problem: `gamma` itself when given (the
 * penalty's weights already resolved per column, e.g. by `penaltyWeights(penalty, orders)` of
 * lib/fit/penalty.ts), else the penalty's own weights — all 1 without weights, the given list
 * as is. `"rising"` and `"falling"` depend on each column's polynomial order, which a bare
 * design does not carry: they need `gamma`. Every γ_q must be a finite number ≥ 0, at least one
 * of them > 0.
 *
 * @example
 * ```ts
 * import { columnWeights, lasso } from "./penalty.ts";
 * console.log(columnWeights(lasso(), 3)); // Float64Array [1, 1, 1]
 * console.log(columnWeights(lasso({ weights: [0, 2] }), 2)); // Float64Array [0, 2]
 * ```
 */
export function columnWeights(
  penalty: SparsePenalty,
  p: number,
  gamma?: ArrayLike<number>,
): Float64Array {
  const { weights } = canonicalSparse(penalty);
  if (gamma === undefined && (weights === "rising" || weights === "falling")) {
    throw new CurbfitError(
      "BAD_OPTION",
      `weights "${weights}" depend on each design column's polynomial order, which this ` +
        "design does not carry",
      "Pass gamma (e.g. penaltyWeights(penalty, orders)), or give the weights as a list",
      { option: "penalty.weights" },
    );
  }
  const given = gamma ?? (Array.isArray(weights) ? weights : undefined);
  if (given === undefined) return new Float64Array(p).fill(1);
  const option = gamma === undefined ? "penalty.weights" : "gamma";
  if (given.length !== p) {
    throw new CurbfitError(
      "BAD_OPTION",
      `${given.length} weights were given for ${p} design columns`,
      "Give exactly one weight per design column",
      { option },
    );
  }
  const out = Float64Array.from(given);
  out.forEach((g, q) => {
    if (!(Number.isFinite(g) && g >= 0)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `γ of column ${q + 1} is ${g}, but every weight must be a finite number >= 0`,
        "Give one weight >= 0 per design column",
        { option: `${option}[${q}]` },
      );
    }
  });
  if (!out.some((g) => g > 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      "every column weight is 0, so no column would be penalized and α would have nothing to " +
        "act on",
      "Give at least one weight > 0; for a fit without any penalty use ridge() with lambda 0",
      { option },
    );
  }
  return out;
}

/** `mix` itself if it is a valid L1 share (a number > 0 and <= 1); otherwise a clear error. */
function checkedMix(mix: number): number {
  if (!(typeof mix === "number" && mix > 0 && mix <= 1)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `mix is ${mix}, but the L1 share must be a number > 0 and <= 1`,
      "Pass for example elasticNet({ mix: 0.5 }); for a purely quadratic penalty use ridge()",
      { option: "penalty.mix" },
    );
  }
  return mix;
}

/**
 * The `weights` and `exponent` fields of a sparse penalty: none for equal weights (absent or
 * "equal"), else both, checked. An exponent without rising or falling weights or a list is an
 * error rather than something silently dropped.
 */
function weighting(
  options: { readonly weights?: RidgeWeights; readonly exponent?: number },
  kind: SparsePenalty["kind"],
): { weights?: RidgeWeights; exponent?: number } {
  if (options.weights === undefined || options.weights === "equal") {
    if (options.exponent !== undefined) {
      throw new CurbfitError(
        "BAD_OPTION",
        `an exponent (${options.exponent}) was given with equal weights, where it has no effect`,
        'Give weights: "rising" or "falling" with the exponent, or leave the exponent out',
        { option: "penalty.exponent" },
      );
    }
    return {};
  }
  return checkedWeights(options, kind);
}
