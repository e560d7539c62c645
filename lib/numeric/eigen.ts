/**
 * Symmetric eigendecomposition of small dense matrices (p×p Gram-type summaries), through
 * ml-matrix's Householder tridiagonalization and QL iteration (EISPACK tred2/tql2).
 *
 * @module
 */
import { EigenvalueDecomposition, Matrix } from "ml-matrix";

/** A = V diag(values) Vᵀ with values descending; `vectors[j]` is the j-th eigenvector. */
export interface SymmetricEigen {
  readonly values: Float64Array;
  readonly vectors: readonly Float64Array[];
}

/**
 * Eigenvalues (descending) and eigenvectors of the symmetric p×p matrix `a` (row-major).
 *
 * @example
 * ```ts
 * import { symmetricEigen } from "./eigen.ts";
 * const { values } = symmetricEigen(Float64Array.of(2, 0, 0, 1), 2);
 * console.log(Array.from(values)); // [2, 1]
 * ```
 */
export function symmetricEigen(a: Float64Array, p: number): SymmetricEigen {
  if (p === 0) return { values: new Float64Array(0), vectors: [] };
  const rows = Array.from({ length: p }, (_, i) => Array.from(a.subarray(i * p, i * p + p)));
  const evd = new EigenvalueDecomposition(new Matrix(rows), { assumeSymmetric: true });
  const values = evd.realEigenvalues;
  const vecs = evd.eigenvectorMatrix;
  const order = values.map((_, j) => j).sort((x, y) => values[y] - values[x] || x - y);
  return {
    values: Float64Array.from(order, (j) => values[j]),
    vectors: order.map((j) => Float64Array.from({ length: p }, (_, i) => vecs.get(i, j))),
  };
}
