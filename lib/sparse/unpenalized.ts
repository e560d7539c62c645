/**
 * Columns with weight γ_q = 0: unpenalized, so in the model at every α. Their coefficients are
 * fitted by least squares given the others, which needs solves with their Gram block G_UU
 * (U the set of unpenalized columns, G the per-observation Gram matrix of gram.ts):
 *
 * - the solution at α ≥ α_max: every penalized coefficient is 0 and w_U minimizes
 *   ½(v_y − 2cᵀw + wᵀGw) over w_U alone, i.e. G_UU w_U = c_U (least squares on the unpenalized
 *   columns); the gradient residuals there, g = c − G w, give α_max (grid.ts);
 * - the duality gap (path.ts) and the effective df (df.ts) project the unpenalized columns out.
 *
 * Solves use the eigendecomposition of G_UU. When its eigenvalues span more than 10¹² (a
 * condition number above 10⁶ for the columns themselves), the unpenalized columns are
 * (nearly) collinear, their least-squares coefficients are not determined, and a
 * RANK_DEFICIENT error says so rather than returning arbitrary numbers.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { symmetricEigen } from "../numeric/eigen.ts";
import type { GramProblem } from "./gram.ts";

/** Largest eigenvalue ratio of G_UU accepted (10¹²: a column condition number of 10⁶). */
const EIGEN_RATIO_LIMIT = 1e12;

/** Solves with the Gram block of a set of columns. */
export interface BlockSolver {
  /** The columns, in increasing order. */
  readonly columns: Int32Array;
  /** x with G_BB x = rhs (rhs and x indexed like `columns`). */
  solve(rhs: ArrayLike<number>): Float64Array;
}

/**
 * The columns with γ_q = 0, in increasing order.
 *
 * @example
 * ```ts
 * import { unpenalizedColumns } from "./unpenalized.ts";
 * console.log(unpenalizedColumns(Float64Array.of(0, 1, 0))); // Int32Array [0, 2]
 * ```
 */
export function unpenalizedColumns(gamma: ArrayLike<number>): Int32Array {
  const out: number[] = [];
  for (let q = 0; q < gamma.length; q++) if (gamma[q] === 0) out.push(q);
  return Int32Array.from(out);
}

/**
 * A solver for G_BB over `columns` (a RANK_DEFICIENT error when they are nearly collinear),
 * or null for no columns.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { blockSolver } from "./unpenalized.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0), y = Float64Array.of(1, 2, 4, 3);
 * const [m] = bucketMoments(x, 2, y, new Int32Array(4), 1);
 * const g = gramProblem(m, { standardize: false });
 * console.log(blockSolver(g, Int32Array.of(0))?.solve([g.gram[0]])); // Float64Array [1]
 * ```
 */
export function blockSolver(problem: GramProblem, columns: Int32Array): BlockSolver | null {
  const k = columns.length;
  if (k === 0) return null;
  const block = new Float64Array(k * k);
  columns.forEach((q, i) => {
    columns.forEach((r, j) => (block[i * k + j] = problem.gram[q * problem.p + r]));
  });
  const { values, vectors } = symmetricEigen(block, k);
  if (!(values[k - 1] > values[0] / EIGEN_RATIO_LIMIT)) {
    const list = Array.from(columns, (q) => q + 1).join(", ");
    throw new CurbfitError(
      "RANK_DEFICIENT",
      `the unpenalized design columns (weight 0: column${k > 1 ? "s" : ""} ${list}) are ` +
        "collinear or nearly so over these rows, so their least-squares coefficients are not " +
        "determined",
      "Give at least one of them a weight > 0, or drop the duplicate term",
      { option: "penalty.weights" },
    );
  }
  return {
    columns,
    solve(rhs) {
      const x = new Float64Array(k);
      values.forEach((mu, j) => {
        const v = vectors[j];
        let t = 0;
        for (let i = 0; i < k; i++) t += v[i] * rhs[i];
        t /= mu;
        for (let i = 0; i < k; i++) x[i] += v[i] * t;
      });
      return x;
    },
  };
}

/**
 * The solution at α ≥ α_max and its gradient residuals g = c − G w: every penalized coefficient
 * 0, the unpenalized ones (if any) at their least-squares values G_UU w_U = c_U.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * import { nullSolution, unpenalizedColumns } from "./unpenalized.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0), y = Float64Array.of(1, 2, 4, 3);
 * const [m] = bucketMoments(x, 2, y, new Int32Array(4), 1);
 * const g = gramProblem(m);
 * console.log(nullSolution(g, unpenalizedColumns([0, 1])).w); // w_1 ≠ 0 (least squares), w_2 = 0
 * ```
 */
export function nullSolution(
  problem: GramProblem,
  unpenalized: Int32Array,
): { w: Float64Array; g: Float64Array } {
  const w = new Float64Array(problem.p);
  const g = Float64Array.from(problem.covariance);
  const free = blockSolver(problem, unpenalized);
  if (free === null) return { w, g };
  const wU = free.solve(Array.from(unpenalized, (q) => problem.covariance[q]));
  unpenalized.forEach((q, i) => (w[q] = wU[i]));
  const { gram, p } = problem;
  for (const q of unpenalized) {
    for (let j = 0; j < p; j++) g[j] -= gram[q * p + j] * w[q];
  }
  return { w, g };
}
