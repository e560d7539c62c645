/**
 * Sparse penalties: the lasso and the elastic net. On standardized columns (coefficients w*_q)
 * the fitted objective, in the 1/(2N) scaling common to coordinate-descent solvers, is
 *   (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α·[ ρ Σ_q |w*_q| + ((1 − ρ)/2) Σ_q (w*_q)² ],
 * with ρ = `mix` ∈ (0, 1] the share of the penalty that is L1 (ρ = 1: lasso) and the intercept b
 * unpenalized. The strength is called α, not λ, because its units differ from the ridge λ of
 * `ridge()` (sum-of-squares units): multiplying the objective by 2N shows that the quadratic part
 * alone (ρ → 0) is ridge with λ_ridge = N·α·(1 − ρ), i.e. λ_ridge = N·α at ρ = 0.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

/** A lasso or elastic-net penalty; `mix` is ρ, the L1 share (1 for the lasso). */
export interface SparsePenalty {
  /** Which sparse penalty; its strength is α in the 1/(2N) convention, never the ridge λ. */
  readonly kind: "lasso" | "elastic-net";
  /** ρ ∈ (0, 1], the L1 share of the penalty: 1 for the lasso. */
  readonly mix: number;
}

/** Default L1 share of `elasticNet()` (an even split; common practice). */
export const DEFAULT_MIX = 0.5;

/**
 * The lasso: α Σ_q |w*_q| (ρ = 1).
 *
 * @example
 * ```ts
 * import { lasso } from "./penalty.ts";
 * console.log(lasso()); // { kind: "lasso", mix: 1 }
 * ```
 */
export function lasso(): SparsePenalty {
  return Object.freeze({ kind: "lasso", mix: 1 });
}

/**
 * The elastic net: α [ρ Σ_q |w*_q| + ((1 − ρ)/2) Σ_q (w*_q)²] with ρ = `mix` ∈ (0, 1]
 * (default 0.5). For a purely quadratic penalty use `ridge()`.
 *
 * @example
 * ```ts
 * import { elasticNet } from "./penalty.ts";
 * console.log(elasticNet({ mix: 0.3 })); // { kind: "elastic-net", mix: 0.3 }
 * ```
 */
export function elasticNet(options: { mix?: number } = {}): SparsePenalty {
  return Object.freeze({ kind: "elastic-net", mix: checkedMix(options.mix ?? DEFAULT_MIX) });
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
