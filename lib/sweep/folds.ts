/**
 * Turning a sweep's `folds` option into a FoldPlan for a table.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Table } from "../table/types.ts";
import {
  type FoldPlan,
  groupedKFoldPlan,
  holdoutPlan,
  kFoldPlan,
  leaveOneOutPlan,
} from "../folds/mod.ts";

/**
 * How to split rows, when no ready plan is given. Default: 10 folds, seed 1.
 * - `k`, `seed`, `repeats`: (repeated) K-fold;
 * - `groups`: name of a column whose rows must stay together (grouped K-fold);
 * - `holdout`: a fraction of rows kept for validation (one split);
 * - `leaveOneOut: true`: every row its own fold (use the closed form for large n).
 */
export interface FoldRequest {
  /** Number of folds for (grouped) K-fold; default min(10, row count). */
  readonly k?: number;
  /** PCG32 seed, an integer from 0 to 2^53−1 (default 1); unused by leave-one-out. */
  readonly seed?: number;
  /** Independent reshuffles for K-fold, grouped K-fold or holdout (default 1). */
  readonly repeats?: number;
  /** Name of a column in the data whose equal values keep rows in the same fold. */
  readonly groups?: string;
  /** Fraction of rows held out for validation, strictly between 0 and 1; overrides `k`/`groups`. */
  readonly holdout?: number;
  /** When true, every row is its own fold; overrides every other field. */
  readonly leaveOneOut?: boolean;
}

/** Default fold count and seed. */
export const DEFAULT_FOLDS = { k: 10, seed: 1 } as const;

/** Is this a ready-made plan? */
export function isFoldPlan(value: unknown): value is FoldPlan {
  return typeof value === "object" && value !== null && "assignment" in value &&
    "scheme" in value;
}

/**
 * The plan for `request` over the table's rows.
 *
 * @example
 * ```ts
 * import { planFolds } from "./folds.ts";
 * import { parseCsv } from "../table/mod.ts";
 * const plan = planFolds(parseCsv("x,y\n1,2\n2,3\n3,5\n4,4\n"), { k: 2, seed: 7 });
 * console.log(plan.k, plan.seed); // 2 7
 * ```
 */
export function planFolds(table: Table, request: FoldPlan | FoldRequest | undefined): FoldPlan {
  if (isFoldPlan(request)) {
    if (request.nRows !== table.nRows) {
      throw new CurbfitError(
        "BAD_OPTION",
        `the fold plan covers ${request.nRows} rows but the data has ${table.nRows}`,
        "Make the plan for this data (after missing rows are dropped)",
        { option: "folds" },
      );
    }
    return request;
  }
  const r = request ?? {};
  const n = table.nRows;
  const seed = r.seed ?? DEFAULT_FOLDS.seed;
  if (r.leaveOneOut) return leaveOneOutPlan(n);
  if (r.holdout !== undefined) {
    return holdoutPlan(n, { fraction: r.holdout, seed, repeats: r.repeats });
  }
  const k = r.k ?? Math.min(DEFAULT_FOLDS.k, n);
  if (r.groups !== undefined) {
    return groupedKFoldPlan(n, {
      k,
      seed,
      repeats: r.repeats,
      groups: groupCodes(table, r.groups),
    });
  }
  return kFoldPlan(n, { k, seed, repeats: r.repeats });
}

function groupCodes(table: Table, name: string): Int32Array | number[] {
  const col = table.columns.get(name);
  if (col === undefined) {
    throw new CurbfitError(
      "UNKNOWN_COLUMN",
      `the group column ${JSON.stringify(name)} is not in the data`,
      `Choose one of: ${table.names.join(", ")}`,
      { option: "folds.groups", source: table.source },
    );
  }
  return col.kind === "category" ? col.codes : Array.from(col.values);
}
