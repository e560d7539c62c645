/**
 * Effective degrees of freedom of a lasso / elastic-net solution, from the Gram form alone.
 *
 * Derivation in the convention of this folder. Let Z be the N×p matrix of the columns the
 * penalty acts on: standardized (x_iq − x̄_q)/s_q with an intercept, x_iq/s_q without one
 * (s_q = 1 when not standardizing), so ZᵀZ = N·G with G the per-observation Gram matrix of
 * gram.ts. With an intercept, b = ȳ − x̄ᵀw and Zᵀ1 = 0. With per-column weights γ_q ≥ 0
 * (penalty.ts; every γ_q = 1 without weights) and Γ = diag(γ), multiplying the objective by 2N
 * gives
 *   ‖y − b·1 − Z w*‖² + 2Nαρ Σ_q γ_q |w*_q| + Nα(1 − ρ) Σ_q γ_q (w*_q)².
 * On the active set A = {q : w*_q ≠ 0}, with signs σ = sign(w*_A), the optimality conditions
 * read Z_Aᵀ(y − ȳ1 − Z_A w*_A) = Nαρ Γ_A σ + Nα(1 − ρ) Γ_A w*_A, so
 *   w*_A = (Z_AᵀZ_A + Nα(1 − ρ) Γ_A)⁻¹ (Z_Aᵀ y − Nαρ Γ_A σ).
 * (Without an intercept, drop ȳ1.) Z depends on x only (x̄_q and s_q too), and so do γ_q. For
 * almost every y, A and σ do not change under a small change of y (Zou, Hastie & Tibshirani
 * 2007, Ann. Statist. 35; Tibshirani & Taylor 2012, Ann. Statist. 40 — recalled from memory),
 * so the fitted values ŷ = ȳ1 + Z_A w*_A are locally affine in y, and their divergence
 * Σᵢ ∂ŷᵢ/∂yᵢ, whose expectation is the degrees of freedom (Stein 1981, Ann. Statist. 9;
 * recalled from memory), is 1 for the intercept (not counted here, as in the ridge df and the
 * nonzero count; absent without one) plus the trace of
 *   H = Z_A (Z_AᵀZ_A + Nα(1 − ρ) Γ_A)⁻¹ Z_Aᵀ.
 * With Γ = I this is the elastic net's df of Zou & Hastie (2005), J. R. Statist. Soc. B 67, in
 * their naive elastic net's λ₂ = Nα(1 − ρ) (recalled from memory, not checked against the
 * paper; our coefficients are not rescaled by 1 + λ₂). With Z_AᵀZ_A = N·G_AA and β = α(1 − ρ):
 *   df = tr[(G_AA + βΓ_A)⁻¹ G_AA].
 * Computed as follows. Split A into its unpenalized columns U (γ_q = 0) and penalized ones P.
 * Minimizing over w_U first (least squares given w_P) leaves a ridge problem in w_P on the
 * columns with U projected out, whose Gram matrix is the Schur complement
 * S = G_PP − G_PU G_UU⁻¹ G_UP (S = G_PP when U is empty), so H is the projection onto Z_U (trace
 * |U|) plus a ridge hat matrix, and
 *   df = |U| + tr[(S + βΓ_P)⁻¹ S] = |U| + Σ_j ν_j / (ν_j + β),
 * ν_j the eigenvalues of Γ_P^{−1/2} S Γ_P^{−1/2} (similar to (S + βΓ_P)⁻¹S up to the shift:
 * (S + βΓ_P)⁻¹S = Γ_P^{−1/2}(M + βI)⁻¹ M Γ_P^{1/2} with M = Γ_P^{−1/2} S Γ_P^{−1/2}). With equal
 * weights this is Σ_j μ_j/(μ_j + β) over the eigenvalues μ_j of G_AA.
 * Checks of the scaling: at ρ = 1 (β = 0) it is |A|, the nonzero count, the lasso's unbiased
 * estimate (Zou, Hastie & Tibshirani 2007), whatever the weights; for ρ → 0 with every column
 * active it is Σ ν_j/(ν_j + α), the ridge df Σ e_j/(e_j + λ) of lib/sweep/spectrum.ts at
 * λ = N·α, because its e_j are the eigenvalues of N·Γ^{−1/2} G Γ^{−1/2} (the same weights γ_q).
 * test/sparse_test.ts checks the value against the trace of H formed from rows and against a
 * finite-difference divergence of the solver's fitted values.
 *
 * For the lasso the count is returned exactly, without an eigendecomposition. It assumes the
 * active columns are linearly independent, which holds for the lasso solution when the columns
 * are in general position (Tibshirani 2013, Electron. J. Statist. 7; recalled from memory); with
 * dependent active columns the lasso's df is the rank of
 * Z_A (Tibshirani & Taylor 2012, recalled from memory) and the count overstates it.
 *
 * Accuracy: the eigenvalues of M (unit diagonal when standardized with equal weights) have
 * absolute error about 10⁻¹⁶·‖M‖, so each term is off by at most about 10⁻¹⁶·‖M‖/β; the Schur
 * complement adds the error of the G_UU solves (unpenalized.ts bounds its condition);
 * eigenvalues that round below 0 count as 0.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { symmetricEigen } from "../numeric/eigen.ts";
import type { GramProblem } from "./gram.ts";
import { blockSolver } from "./unpenalized.ts";

/** The df of the solution w* (standardized coefficients) at α, for one problem and ρ. */
export type DfMeter = (alpha: number, standardized: ArrayLike<number>) => number;

/**
 * A df meter for a problem, L1 share ρ and column weights γ (default all 1):
 * |U| + Σ_j ν_j/(ν_j + α(1 − ρ)) over the eigenvalues ν_j of Γ_P^{−1/2} S Γ_P^{−1/2} for the
 * active set (the module text defines U, P and S; with equal weights, the eigenvalues μ_j of the
 * active block of the Gram matrix), or the nonzero count when ρ = 1. Along a path the active set
 * often stays the same from one α to the next; the meter then reuses the last active set's
 * eigenvalues (they do not depend on α).
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
 * console.log(dfMeter(gramProblem(m), 0.5, Float64Array.of(2, 1))(0.1, [0.8, 0])); // 1/(1 + 0.1)
 * ```
 */
export function dfMeter(
  problem: GramProblem,
  mix: number,
  gamma: Float64Array = new Float64Array(problem.p).fill(1),
): DfMeter {
  let key = "";
  let free = 0;
  let eigenvalues: Float64Array = new Float64Array(0);
  return (alpha, standardized) => {
    const active: number[] = [];
    for (let q = 0; q < problem.p; q++) if (standardized[q] !== 0) active.push(q);
    if (mix === 1) return active.length;
    const now = active.join(",");
    if (now !== key) {
      key = now;
      const unpenalized = active.filter((q) => gamma[q] === 0);
      free = unpenalized.length;
      eigenvalues = penalizedEigenvalues(
        problem,
        gamma,
        active.filter((q) => gamma[q] > 0),
        unpenalized,
      );
    }
    const beta = alpha * (1 - mix);
    let df = free;
    for (const nu of eigenvalues) df += nu / (nu + beta);
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

/**
 * Eigenvalues of Γ_P^{−1/2} S Γ_P^{−1/2}, S = G_PP − G_PU G_UU⁻¹ G_UP (G_PP itself without
 * unpenalized columns), rounded-negative ones set to 0.
 */
function penalizedEigenvalues(
  problem: GramProblem,
  gamma: Float64Array,
  penalized: readonly number[],
  unpenalized: readonly number[],
): Float64Array {
  const { gram, p } = problem;
  const k = penalized.length;
  const block = new Float64Array(k * k);
  penalized.forEach((q, i) => {
    penalized.forEach((r, j) => (block[i * k + j] = gram[q * p + r]));
  });
  const free = blockSolver(problem, Int32Array.from(unpenalized));
  if (free !== null) {
    // S = G_PP − G_PU G_UU⁻¹ G_UP, one solve per penalized column r.
    penalized.forEach((r, j) => {
      const x = free.solve(unpenalized.map((u) => gram[u * p + r]));
      penalized.forEach((q, i) => {
        let t = 0;
        unpenalized.forEach((u, m) => (t += gram[q * p + u] * x[m]));
        block[i * k + j] -= t;
      });
    });
    // symmetrize the rounding of the two triangles
    for (let i = 0; i < k; i++) {
      for (let j = 0; j < i; j++) {
        block[i * k + j] = block[j * k + i] = (block[i * k + j] + block[j * k + i]) / 2;
      }
    }
  }
  penalized.forEach((q, i) => {
    penalized.forEach((r, j) => (block[i * k + j] /= Math.sqrt(gamma[q] * gamma[r])));
  });
  return symmetricEigen(block, k).values.map((nu) => Math.max(nu, 0));
}
