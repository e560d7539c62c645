/**
 * The ridge problem in spectral form. With R the triangular factor of the (centered, when
 * there is an intercept) design and z the matching part of Qᵀy, the penalized problem
 *   minimize ‖z − R w‖² + λ Σ_q γ_q (s_q w_q)²
 * becomes, for u_q = √γ_q s_q w_q and M = R·diag(1/(√γ_q s_q)) = U diag(σ) Vᵀ, c = Uᵀz:
 *   u(λ) = V diag(σ/(σ²+λ)) c,          df(λ) = Σ σ²/(σ²+λ),
 *   C(λ) = ‖u‖² = Σ (σc/(σ²+λ))²,        RSS(λ) = ρ² + Σ (λc/(σ²+λ))²,
 * where ρ² is the unpenalized residual sum of squares (Hastie, Tibshirani & Friedman,
 * *Elements of Statistical Learning*, 2nd ed., eq. 3.47 and §3.4.1 for df). Every λ then costs
 * O(p²) (coefficients) or O(p) (df, C, RSS). Used by the exact fit for df, condition and budget,
 * and by the sweep for every fold.
 *
 * @module
 */
import { jacobiSvd } from "../numeric/svd.ts";

/** A ridge problem reduced to p numbers per direction. */
export interface SpectralForm {
  /** Singular values σ_j of M, descending. */
  readonly sigma: Float64Array;
  /** c = Uᵀz. */
  readonly c: Float64Array;
  /** Right singular vectors of M (columns), length p each. */
  readonly v: readonly Float64Array[];
  /** 1/(√γ_q s_q): maps u back to coefficients w. */
  readonly metric: Float64Array;
  /** Unpenalized residual sum of squares ρ². */
  readonly rho2: number;
}

/**
 * Triangular factor R (p×p, as columns) and z, ρ² of a least-squares problem: with an intercept,
 * the trailing block of the factor of [1 Z y], i.e. the centered problem (Golub & Van Loan
 * §5.3), so the intercept stays unpenalized. Made by `triangularOf` in ./exact.ts.
 */
export interface Triangular {
  readonly r: Float64Array[];
  readonly z: Float64Array;
  readonly rho2: number;
}

/**
 * Spectral form of the reduced problem for scales `s` and penalty weights `gamma` (> 0).
 *
 * @example
 * ```ts
 * import { degreesOfFreedom, spectralForm } from "./spectral.ts";
 * import { factorData, triangularOf } from "./exact.ts";
 * const design = { n: 3, p: 1, hi: Float64Array.of(0, 1, 2), lo: new Float64Array(3) };
 * const t = triangularOf(factorData(design, true), Float64Array.of(1, 3, 5));
 * const sf = spectralForm(t, Float64Array.of(1), Float64Array.of(1));
 * console.log(degreesOfFreedom(sf, 0)); // 1
 * ```
 */
export function spectralForm(t: Triangular, s: Float64Array, gamma: Float64Array): SpectralForm {
  const metric = Float64Array.from(s, (sq, q) => 1 / (Math.sqrt(gamma[q]) * sq));
  const m = t.r.map((col, q) => col.map((x) => x * metric[q]));
  const svd = jacobiSvd(m);
  const c = Float64Array.from(svd.u, (u) => {
    let acc = 0;
    for (let i = 0; i < u.length; i++) acc += u[i] * t.z[i];
    return acc;
  });
  return { sigma: svd.s, c, v: svd.v, metric, rho2: t.rho2 };
}

/** df(λ) = Σ σ²/(σ²+λ). */
export function degreesOfFreedom(sf: SpectralForm, lambda: number): number {
  let df = 0;
  for (const s of sf.sigma) df += s === 0 ? 0 : (s * s) / (s * s + lambda);
  return df;
}

/** C(λ) = Σ γ_q (s_q w_q)² of the solution at λ. */
export function budgetAt(sf: SpectralForm, lambda: number): number {
  let b = 0;
  for (let j = 0; j < sf.sigma.length; j++) {
    const s = sf.sigma[j];
    const t = s === 0 ? 0 : (s * sf.c[j]) / (s * s + lambda);
    b += t * t;
  }
  return b;
}

/** Residual sum of squares of the fitted rows at λ. */
export function rssAt(sf: SpectralForm, lambda: number): number {
  let rss = sf.rho2;
  for (let j = 0; j < sf.sigma.length; j++) {
    const s = sf.sigma[j];
    const t = s === 0 ? sf.c[j] : (lambda * sf.c[j]) / (s * s + lambda);
    rss += t * t;
  }
  return rss;
}

/** Coefficients w(λ) on the design's own scale. */
export function coefficientsAt(sf: SpectralForm, lambda: number): Float64Array {
  const p = sf.metric.length;
  const w = new Float64Array(p);
  for (let j = 0; j < sf.sigma.length; j++) {
    const s = sf.sigma[j];
    if (s === 0) continue;
    const f = (s * sf.c[j]) / (s * s + lambda);
    const v = sf.v[j];
    for (let q = 0; q < p; q++) w[q] += v[q] * f;
  }
  for (let q = 0; q < p; q++) w[q] *= sf.metric[q];
  return w;
}

/**
 * The λ ≥ 0 whose solution has budget exactly `budget`: safeguarded Newton on the secular
 * equation 1/√C(λ) − 1/√budget = 0 (nearly linear in λ; Reinsch 1971, Moré & Sorensen 1983),
 * bisecting whenever a step leaves the bracket. Returns 0 when the unpenalized solution
 * already meets the budget. Converges to |C(λ)/budget − 1| ≤ 1e-14.
 *
 * @example
 * ```ts
 * import { budgetAt, lambdaForBudget, spectralForm } from "./spectral.ts";
 * import { factorData, triangularOf } from "./exact.ts";
 * const design = { n: 4, p: 1, hi: Float64Array.of(0, 1, 2, 3), lo: new Float64Array(4) };
 * const t = triangularOf(factorData(design, true), Float64Array.of(1, 2, 2, 4));
 * const sf = spectralForm(t, Float64Array.of(1), Float64Array.of(1));
 * const lam = lambdaForBudget(sf, 0.25);
 * console.log(Math.abs(budgetAt(sf, lam) - 0.25) < 1e-12); // true
 * ```
 */
export function lambdaForBudget(sf: SpectralForm, budget: number): number {
  const full = sf.sigma.some((s) => s === 0) ? Infinity : budgetAt(sf, 0);
  if (budget >= full) return 0;
  if (budget <= 0) return Infinity;
  let top = 0;
  for (let j = 0; j < sf.sigma.length; j++) top += (sf.sigma[j] * sf.c[j]) ** 2;
  let lo = 0;
  let hi = Math.sqrt(top / budget); // C(hi) ≤ Σ(σc)²/hi² = budget
  let lambda = hi / 2;
  const target = 1 / Math.sqrt(budget);
  for (let iter = 0; iter < 200; iter++) {
    const c = budgetAt(sf, lambda);
    if (Math.abs(c / budget - 1) <= 1e-14) return lambda;
    if (c > budget) lo = lambda;
    else hi = lambda;
    let dc = 0;
    for (let j = 0; j < sf.sigma.length; j++) {
      const s2 = sf.sigma[j] ** 2;
      dc -= (2 * s2 * sf.c[j] ** 2) / (s2 + lambda) ** 3;
    }
    const phi = 1 / Math.sqrt(c) - target;
    const dphi = -0.5 * dc / (c * Math.sqrt(c));
    const next = lambda - phi / dphi;
    lambda = next > lo && next < hi ? next : (lo + hi) / 2;
    if (hi - lo <= 1e-16 * hi) return lambda;
  }
  return lambda;
}
