/**
 * Effective degrees of freedom of a lasso / elastic-net solution, from the Gram form alone.
 *
 * Derivation in the convention of this folder. Let Z be the N×p matrix of the columns the
 * penalty acts on: standardized (x_iq − x̄_q)/s_q with an intercept, x_iq/s_q without one
 * (s_q = 1 when not standardizing), so ZᵀZ = N·G with G the per-observation Gram matrix of
 * gram.ts. With an intercept, b = ȳ − x̄ᵀw and Zᵀ1 = 0. Multiplying the objective by 2N gives
 *   ‖y − b·1 − Z w*‖² + 2Nαρ ‖w*‖₁ + Nα(1 − ρ) ‖w*‖².
 * On the active set A = {q : w*_q ≠ 0}, with signs σ = sign(w*_A), the optimality conditions
 * read Z_Aᵀ(y − ȳ1 − Z_A w*_A) = Nαρ σ + Nα(1 − ρ) w*_A, so
 *   w*_A = (Z_AᵀZ_A + Nα(1 − ρ) I)⁻¹ (Z_Aᵀ y − Nαρ σ).
 * (Without an intercept, drop ȳ1.) Z depends on x only (x̄_q and s_q too). For almost every y,
 * A and σ do not change under a small change of y (Zou, Hastie & Tibshirani 2007, Ann. Statist.
 * 35; Tibshirani & Taylor 2012, Ann. Statist. 40 — recalled from memory), so the fitted values
 * ŷ = ȳ1 + Z_A w*_A are locally affine in y, and their divergence Σᵢ ∂ŷᵢ/∂yᵢ, whose expectation
 * is the degrees of freedom (Stein 1981, Ann. Statist. 9; recalled from memory), is 1 for the
 * intercept (not counted here, as in the ridge df and the nonzero count; absent without one)
 * plus the trace of
 *   H = Z_A (Z_AᵀZ_A + Nα(1 − ρ) I)⁻¹ Z_Aᵀ.
 * This is the elastic net's df of Zou & Hastie (2005), J. R. Statist. Soc. B 67, in their naive
 * elastic net's λ₂ = Nα(1 − ρ) (recalled from memory, not checked against the paper; our
 * coefficients are not rescaled by 1 + λ₂). With Z_AᵀZ_A = N·G_AA and μ_j the eigenvalues of G_AA:
 *   df = tr[(G_AA + βI)⁻¹ G_AA] = Σ_j μ_j / (μ_j + β),   β = α(1 − ρ).
 * Checks of the scaling: at ρ = 1 (β = 0) it is |A|, the nonzero count, the lasso's unbiased
 * estimate (Zou, Hastie & Tibshirani 2007); for ρ → 0 with every column active it is
 * Σ μ_j/(μ_j + α), the ridge df Σ e_j/(e_j + λ) of lib/sweep/spectrum.ts at λ = N·α, because its
 * e_j are the eigenvalues of N·G. test/sparse_test.ts checks the value against the trace of H
 * formed from rows and against a finite-difference divergence of the solver's fitted values.
 *
 * For the lasso the count is returned exactly, without an eigendecomposition. It assumes the
 * active columns are linearly independent, which holds for the lasso solution when the columns
 * are in general position (Tibshirani 2013, Electron. J. Statist. 7; recalled from memory); with
 * dependent active columns the lasso's df is the rank of
 * Z_A (Tibshirani & Taylor 2012, recalled from memory) and the count overstates it.
 *
 * Accuracy: the eigenvalues of G_AA (unit diagonal when standardized) have absolute error about
 * 10⁻¹⁶·‖G_AA‖, so each term is off by at most about 10⁻¹⁶·‖G_AA‖/β; eigenvalues that round
 * below 0 count as 0.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { symmetricEigen } from "../numeric/eigen.ts";
import type { GramProblem } from "./gram.ts";

/** The df of the solution w* (standardized coefficients) at α, for one problem and ρ. */
export type DfMeter = (alpha: number, standardized: ArrayLike<number>) => number;

/**
 * A df meter for a problem and L1 share ρ: Σ_j μ_j/(μ_j + α(1 − ρ)) over the eigenvalues μ_j of
 * the active block of the Gram matrix, or the nonzero count when ρ = 1. Along a path the active
 * set often stays the same from one α to the next; the meter then reuses the last active
 * block's eigenvalues (they do not depend on α).
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { dfMeter } from "./df.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0), y = Float64Array.of(1, 2, 4, 3);
 * const [m] = bucketMoments(x, 2, y, new Int32Array(4), 1);
 * const df = dfMeter(gramProblem(m), 0.5);
 * console.log(df(0.1, [0.8, 0]), dfMeter(gramProblem(m), 1)(0.1, [0.8, 0])); // 1/(1 + 0.05) 1
 * ```
 */
export function dfMeter(problem: GramProblem, mix: number): DfMeter {
  let key = "";
  let eigenvalues: Float64Array = new Float64Array(0);
  return (alpha, standardized) => {
    const active: number[] = [];
    for (let q = 0; q < problem.p; q++) if (standardized[q] !== 0) active.push(q);
    if (mix === 1) return active.length;
    const now = active.join(",");
    if (now !== key) {
      key = now;
      eigenvalues = activeEigenvalues(problem, active);
    }
    const beta = alpha * (1 - mix);
    let df = 0;
    for (const mu of eigenvalues) df += mu / (mu + beta);
    return df;
  };
}

/**
 * The df of a solution that is to be reported, i.e. from a path solved with df on (an all-rows
 * path); a clear error for a solution without one.
 *
 * @example
 * ```ts
 * import { lasso, sparsePathFromRows } from "./mod.ts";
 * import { solutionDf } from "./df.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0, 5, 1), y = Float64Array.of(1.1, 2.3, 2.9, 4.2, 5);
 * const path = sparsePathFromRows(x, 2, y, lasso(), { alphas: [0.05] });
 * console.log(solutionDf(path.solutions[0]) === path.solutions[0].nonzero); // true
 * ```
 */
export function solutionDf(solution: { readonly df: number | null }): number {
  if (solution.df === null) {
    throw new CurbfitError(
      "BAD_OPTION",
      "this lasso / elastic-net solution carries no df: its path was solved with df off " +
        "(the default for a path scored on held-out rows)",
      "Report solutions of the all-rows path, or solve the path with { df: true }",
      { option: "df" },
    );
  }
  return solution.df;
}

/** Eigenvalues of G_AA, rounded-negative ones set to 0. */
function activeEigenvalues(problem: GramProblem, active: readonly number[]): Float64Array {
  const k = active.length;
  const block = new Float64Array(k * k);
  active.forEach((q, i) => {
    active.forEach((r, j) => (block[i * k + j] = problem.gram[q * problem.p + r]));
  });
  return symmetricEigen(block, k).values.map((mu) => Math.max(mu, 0));
}
