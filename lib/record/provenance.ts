/**
 * What a sweep keeps for its model-choice record beyond the numbers it computed: the data
 * summary and fingerprint, the group column behind grouped folds, and the λ grid request as
 * given. `sweep` and `compare` build it; `recordOf` reads it.
 *
 * @module
 */
import type { Table } from "../table/types.ts";
import type { Term } from "../design/types.ts";
import type { FoldPlan } from "../folds/mod.ts";
import type { FoldRequest } from "../sweep/folds.ts";
import type { LambdaGrid } from "../sweep/grid.ts";
import type { AlphaGrid } from "../sparse/grid.ts";
import { type DataSummary, summarizeData } from "./fingerprint.ts";

/** The data side of a sweep's provenance, shared by every candidate of a comparison. */
export interface SweepSource {
  /** Summary and fingerprint of the target, every term input and the group column. */
  readonly data: DataSummary;
  /** The column whose values grouped the folds (`folds: { groups }`), or null. */
  readonly groups: string | null;
}

/** A sweep's provenance: its source plus its own λ (ridge) or α (sparse) grid request. */
export interface SweepProvenance extends SweepSource {
  /** The `lambdas` option as given (copied), or null when it was left out. */
  readonly lambdas: LambdaGrid | null;
  /** The `alphas` option as given (copied), or null when it was left out. */
  readonly alphas: AlphaGrid | null;
}

/**
 * The source of a sweep (or of all candidates of a comparison) over `table`. Reads the target,
 * every input of every term list and the group column; malformed terms and unknown columns are
 * skipped here, since the sweep's own checks report them.
 *
 * @example
 * ```ts
 * import { sweepSource } from "./provenance.ts";
 * import { legendre } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const table = tableFromColumns({ x: [1, 2, 3], y: [2, 4, 7] });
 * const s = sweepSource(table, "y", [[legendre("x", 2)]], { k: 3, seed: 1 });
 * console.log(s.data.columns.map((c) => c.name), s.groups); // [ "x", "y" ] null
 * ```
 */
export function sweepSource(
  table: Table,
  target: string,
  termLists: readonly (readonly Term[])[],
  folds: FoldPlan | FoldRequest | undefined,
): SweepSource {
  const groups = groupColumn(folds);
  const inputs = termLists.flatMap((terms) =>
    Array.isArray(terms)
      ? terms.flatMap((t) => (Array.isArray(t?.inputs) ? t.inputs : []) as string[])
      : []
  );
  const names = [target, ...inputs, ...(groups === null ? [] : [groups])];
  return { data: summarizeData(table, names.filter((n) => typeof n === "string")), groups };
}

/**
 * The provenance of one sweep: its source and copies of its `lambdas` and `alphas` requests.
 *
 * @example
 * ```ts
 * import { sweepProvenance, sweepSource } from "./provenance.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const source = sweepSource(tableFromColumns({ y: [1, 2] }), "y", [], undefined);
 * console.log(sweepProvenance(source, [0.1, 1]).lambdas); // [ 0.1, 1 ]
 * ```
 */
export function sweepProvenance(
  source: SweepSource,
  lambdas: LambdaGrid | undefined,
  alphas?: AlphaGrid,
): SweepProvenance {
  return { ...source, lambdas: copyGrid(lambdas), alphas: copyAlphas(alphas) };
}

function copyAlphas(grid: AlphaGrid | undefined): AlphaGrid | null {
  if (grid === undefined) return null;
  if (Array.isArray(grid)) return [...grid];
  const { count, ratio } = grid as { count?: number; ratio?: number };
  return { count, ratio };
}

function copyGrid(grid: LambdaGrid | undefined): LambdaGrid | null {
  if (grid === undefined) return null;
  if (Array.isArray(grid)) return [...grid];
  const { count, min, max } = grid as { count?: number; min?: number; max?: number };
  return { count, min, max };
}

function groupColumn(folds: FoldPlan | FoldRequest | undefined): string | null {
  if (typeof folds !== "object" || folds === null || "assignment" in folds) return null;
  if (folds.leaveOneOut || folds.holdout !== undefined) return null; // as planFolds decides
  return typeof folds.groups === "string" ? folds.groups : null;
}
