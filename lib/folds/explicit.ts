/**
 * A fold plan the user supplies row by row (for example folds by calendar year), checked and
 * copied into a FoldPlan.
 *
 * @module
 */

import { CurbfitError } from "../errors/error.ts";
import { checkRowCount, rejectUnknownOptions, showValue } from "./options.ts";
import { type FoldPlan, makePlan } from "./plan.ts";

/** Options of {@link explicitPlan}. */
export interface ExplicitOptions {
  /** The validation fold of each row (0..k−1), or −1 for a row that only ever trains. */
  readonly assignment: Int32Array | readonly number[];
  /** The number of folds; default: the largest fold index + 1. */
  readonly k?: number;
}

/**
 * Plan from a user-supplied assignment. Checks, in this order: one entry per row; every entry an
 * integer from −1 to k−1 (−1: the row trains in every fold and is never validated); every fold
 * 0..k−1 holds at least one row; every fold leaves at least one training row (k ≥ 2, or some
 * −1 rows). The first bad row is named in the error. The caller's array is copied, not kept.
 * One repeat; nothing is drawn (seed and prng are null).
 *
 * @example
 * ```ts
 * import { explicitPlan } from "./explicit.ts";
 * const byYear = explicitPlan(6, { assignment: [0, 0, 1, 1, 2, 2] });
 * byYear.k; // 3
 * const lastYearOnly = explicitPlan(4, { assignment: [-1, -1, 0, 0] }); // k = 1
 * ```
 */
export function explicitPlan(nRows: number, options: ExplicitOptions): FoldPlan {
  rejectUnknownOptions(options, ["assignment", "k"], "explicitPlan");
  const n = checkRowCount(nRows);
  const given: unknown = options.assignment;
  if (!(given instanceof Int32Array) && !Array.isArray(given)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option assignment is ${showValue(given)}, but it must be an Int32Array or an array`,
      "Pass one fold index per row",
      { option: "assignment" },
    );
  }
  if (given.length !== n) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option assignment has ${given.length} entries, but there are ${n} rows`,
      "Pass exactly one fold index per row, in row order",
      { option: "assignment" },
    );
  }
  // Every fold needs a row, so k ≤ n; a larger inferred k shows up below as a bad row.
  const k = options.k === undefined
    ? Math.min(largestEntry(given) + 1, n)
    : checkGivenK(options.k, n);
  const folds = new Int32Array(n);
  const rowsInFold = new Float64Array(k);
  for (let i = 0; i < n; i++) {
    const fold: unknown = given[i];
    if (typeof fold !== "number" || !Number.isInteger(fold) || fold < -1 || fold >= k) {
      throw new CurbfitError(
        "BAD_OPTION",
        `option assignment[${i}] (row ${i}) is ${showValue(fold)}, but fold indices must be ` +
          `whole numbers from 0 to ${k - 1}, or -1 for a row that is never validated`,
        "Number the folds 0, 1, 2, … without gaps and fix this row",
        { option: `assignment[${i}]` },
      );
    }
    folds[i] = fold;
    if (fold >= 0) rowsInFold[fold]++;
  }
  if (k === 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      "option assignment marks every row -1, so no row is ever validated",
      "Put the validation rows in fold 0 (and further folds 1, 2, …)",
      { option: "assignment" },
    );
  }
  const emptyFold = rowsInFold.findIndex((count) => count === 0);
  if (emptyFold >= 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option assignment puts no row in fold ${emptyFold} (folds run from 0 to ${k - 1})`,
      "Number the folds 0, 1, 2, … without gaps, or pass a smaller k",
      { option: "assignment" },
    );
  }
  if (k === 1 && rowsInFold[0] === n) {
    throw new CurbfitError(
      "BAD_OPTION",
      "option assignment puts every row in fold 0, which leaves no row to train on",
      "Use at least two folds, or mark training-only rows with -1",
      { option: "assignment" },
    );
  }
  return makePlan({ scheme: "explicit", nRows: n, k, repeats: 1, assignment: [folds] });
}

/** The largest finite number among the entries (−1 if none); bad entries are reported later. */
function largestEntry(entries: ArrayLike<unknown>): number {
  let largest = -1;
  for (let i = 0; i < entries.length; i++) {
    const entry = entries[i];
    if (typeof entry === "number" && Number.isInteger(entry) && entry > largest) largest = entry;
  }
  return largest;
}

/** A user-given k: an integer from 1 to n (the assignment is checked against it afterwards). */
function checkGivenK(k: unknown, n: number): number {
  if (typeof k !== "number" || !Number.isInteger(k) || k < 1 || k > n) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option k is ${showValue(k)}, but it must be a whole number of folds from 1 to ${n} ` +
        "(each fold needs a row)",
      "Pass the number of folds your assignment uses, or leave k out to infer it",
      { option: "k" },
    );
  }
  return k;
}
