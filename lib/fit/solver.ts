/**
 * How the exact fit gets its factor. A well-conditioned design (standardized condition number
 * at most 10⁵) is solved from the all-rows co-moments: their eigendecomposition gives df, C(λ)
 * and the condition number, and preconditions a refinement whose gradients come from the rows in
 * double-double (lib/solve/seminormal.ts). Otherwise, or when that refinement does not settle
 * within a few passes, the rows are factored by Householder QR and refined by Björck's method
 * (lib/solve/exact.ts). Both reach the same fixed point: the solution whose gradient, formed
 * in double-double from the rows, vanishes.
 *
 * @module
 */
import type { Design, DesignBlock } from "../design/types.ts";
import {
  type DataFactor,
  factorData,
  type LsProblem,
  type LsSolution,
  solveRefined,
  triangularOf,
} from "../solve/exact.ts";
import { solveSeminormal } from "../solve/seminormal.ts";
import { type SpectralForm, spectralForm, type Triangular } from "../solve/spectral.ts";
import { jacobiSvd } from "../numeric/svd.ts";
import { bucketMoments, type Moments } from "../sweep/moments.ts";
import { decompose, type Spectrum, type SpectrumOptions } from "../sweep/spectrum.ts";

/** Largest standardized condition number solved from the co-moments. */
const MOMENTS_CONDITION = 1e5;

/**
 * The factor a fit solves with: the co-moments' spectrum, or a QR of the rows.
 *
 * @example
 * ```ts
 * import type { SolverBasis } from "./solver.ts";
 * const describe = (b: SolverBasis) => `${b.kind}, condition ${b.condition}`;
 * ```
 */
export type SolverBasis =
  | {
    readonly kind: "moments";
    /** The all-rows spectrum in the penalty metric (lib/sweep/spectrum.ts). */
    readonly spectrum: Spectrum;
    /** σ_max/σ_min of the centered (with an intercept) standardized design. */
    readonly condition: number;
  }
  | {
    readonly kind: "rows";
    readonly factor: DataFactor;
    readonly triangular: Triangular;
    readonly condition: number;
  };

/** What the caller may already have computed on all rows (a sweep has both). */
export interface KnownSummaries {
  readonly moments?: Moments;
  readonly spectrum?: Spectrum;
}

/**
 * Picks the basis for a fit of `design` to `y`: the co-moments when the design is well
 * conditioned, else a QR of the rows.
 *
 * @example
 * ```ts
 * import { solverBasis } from "./solver.ts";
 * import { buildDesign, column, learnTerms } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const table = tableFromColumns({ x: [0, 1, 2, 4] });
 * const design = buildDesign(learnTerms([column("x")], table), table);
 * const options = { gamma: Float64Array.of(1), standardize: true, intercept: true };
 * console.log(solverBasis(design, Float64Array.of(1, 2, 2, 5), Float64Array.of(1.48), options).kind); // moments
 * ```
 */
export function solverBasis(
  design: Design,
  y: Float64Array,
  sds: Float64Array,
  options: SpectrumOptions,
  known: KnownSummaries = {},
): SolverBasis {
  const moments = known.moments ?? allRowsMoments(design.block, y);
  const spectrum = known.spectrum ?? decompose(moments, options);
  const condition = momentsCondition(moments, spectrum, options);
  if (condition <= MOMENTS_CONDITION) return { kind: "moments", spectrum, condition };
  return rowsBasis(design, y, sds, options.intercept);
}

/**
 * Count, means and centered co-moments of the design columns and the target over all rows (one
 * pass; lib/sweep/moments.ts).
 *
 * @example
 * ```ts
 * import { allRowsMoments } from "./solver.ts";
 * const block = { n: 2, p: 1, hi: Float64Array.of(1, 3), lo: null };
 * console.log(allRowsMoments(block, Float64Array.of(0, 1)).mean); // Float64Array(2) [ 2, 0.5 ]
 * ```
 */
export function allRowsMoments(block: DesignBlock, y: Float64Array): Moments {
  const { n, p, hi } = block;
  return bucketMoments(hi, p, y, new Int32Array(n), 1)[0];
}

/** The QR basis of the rows (and the condition number from its triangular factor). */
function rowsBasis(
  design: Design,
  y: Float64Array,
  sds: Float64Array,
  intercept: boolean,
): SolverBasis {
  const factor = factorData(design.block, intercept);
  const triangular = triangularOf(factor, y);
  const { s } = jacobiSvd(triangular.r.map((col, q) => col.map((x) => x / sds[q])));
  const condition = s.length === 0 ? 1 : s[0] / s[s.length - 1];
  return { kind: "rows", factor, triangular, condition };
}

/**
 * √(e_max/e_min) of the standardized co-moment matrix (NaN-free: ∞ when singular). Its relative
 * accuracy is about κ²·10⁻¹⁶, so at most 10⁻⁶ wherever the co-moments are used.
 */
function momentsCondition(moments: Moments, spectrum: Spectrum, options: SpectrumOptions): number {
  const uniform = options.gamma.every((g) => g === options.gamma[0]);
  const { e } = uniform
    ? spectrum
    : decompose(moments, { ...options, gamma: new Float64Array(options.gamma.length).fill(1) });
  if (e.length === 0) return 1;
  const ratio = e[0] / e[e.length - 1];
  return Number.isFinite(ratio) ? Math.sqrt(ratio) : Infinity;
}

/**
 * The spectral form (df, C(λ), λ for a budget) of the basis, for column scales `sds` and
 * weights `gamma`.
 *
 * @example
 * ```ts
 * import { solverBasis, spectralFormOf } from "./solver.ts";
 * import { degreesOfFreedom } from "../solve/spectral.ts";
 * import { buildDesign, column, learnTerms } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const table = tableFromColumns({ x: [0, 1, 2, 4] });
 * const design = buildDesign(learnTerms([column("x")], table), table);
 * const options = { gamma: Float64Array.of(1), standardize: false, intercept: true };
 * const basis = solverBasis(design, Float64Array.of(1, 2, 2, 5), Float64Array.of(1), options);
 * console.log(degreesOfFreedom(spectralFormOf(basis, Float64Array.of(1), options.gamma), 0)); // 1
 * ```
 */
export function spectralFormOf(
  basis: SolverBasis,
  sds: Float64Array,
  gamma: Float64Array,
): SpectralForm {
  if (basis.kind === "rows") return spectralForm(basis.triangular, sds, gamma);
  const sp = basis.spectrum;
  const sigma = sp.e.map(Math.sqrt);
  const c = sp.g.map((g, j) => (sigma[j] > 0 ? g / sigma[j] : 0));
  const explained = c.reduce((s, v) => s + v * v, 0);
  return { sigma, c, v: sp.vectors, metric: sp.metric, rho2: Math.max(sp.syy - explained, 0) };
}

/**
 * Solves the ridge problem at `lambda` on the basis: from the co-moments when that converges,
 * else (or on the rows basis) by QR and Björck's refinement.
 *
 * @example
 * ```ts
 * import { solveOn, solverBasis } from "./solver.ts";
 * import { buildDesign, column, learnTerms } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const table = tableFromColumns({ x: [0, 1, 2] });
 * const design = buildDesign(learnTerms([column("x")], table), table);
 * const y = Float64Array.of(1, 3, 5);
 * const options = { gamma: Float64Array.of(1), standardize: false, intercept: true };
 * const basis = solverBasis(design, y, Float64Array.of(1), options);
 * const sol = solveOn(basis, { ...design.block, y, intercept: true }, 0);
 * console.log(sol.intercept, sol.w[0]); // 1 2
 * ```
 */
export function solveOn(basis: SolverBasis, problem: LsProblem, lambda: number): LsSolution {
  if (basis.kind === "rows") return solveRefined(problem, basis.factor);
  return solveSeminormal(problem, basis.spectrum, lambda) ?? solveRefined(problem);
}
