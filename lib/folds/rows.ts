/**
 * Turning a fold plan into row index lists for one fit.
 *
 * @module
 */

import { CurbfitError } from "../errors/error.ts";
import { showValue } from "./options.ts";
import type { FoldPlan } from "./plan.ts";

/** The rows one fit trains on and the rows it is validated on, each in ascending row order. */
export interface FoldRows {
  /** Rows whose fold differs from the chosen fold (including never-validated −1 rows). */
  readonly training: Int32Array;
  /** Rows whose fold is the chosen fold. */
  readonly validation: Int32Array;
}

/**
 * The training and validation rows of fold `fold` in repeat `repeat` of `plan`. Every row is in
 * exactly one of the two lists; both are sorted ascending. O(nRows) per call.
 *
 * @example
 * ```ts
 * import { explicitPlan } from "./explicit.ts";
 * import { foldRows } from "./rows.ts";
 * const plan = explicitPlan(5, { assignment: [0, 1, 0, 1, -1] });
 * const { training, validation } = foldRows(plan, 0, 1);
 * // validation: Int32Array [1, 3]; training: Int32Array [0, 2, 4]
 * ```
 */
export function foldRows(plan: FoldPlan, repeat: number, fold: number): FoldRows {
  checkIndex(repeat, plan.repeats, "repeat");
  checkIndex(fold, plan.k, "fold");
  const folds = plan.assignment[repeat];
  let validationCount = 0;
  for (let i = 0; i < folds.length; i++) if (folds[i] === fold) validationCount++;
  const validation = new Int32Array(validationCount);
  const training = new Int32Array(folds.length - validationCount);
  let v = 0;
  let t = 0;
  for (let i = 0; i < folds.length; i++) {
    if (folds[i] === fold) validation[v++] = i;
    else training[t++] = i;
  }
  return { training, validation };
}

/** Throws BAD_OPTION unless `value` is an integer in 0..count−1. */
function checkIndex(value: number, count: number, option: string): void {
  if (!Number.isInteger(value) || value < 0 || value >= count) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option ${option} is ${showValue(value)}, but this plan has ${option}s 0 to ${count - 1}`,
      `Pass a ${option} index from 0 to ${count - 1}`,
      { option },
    );
  }
}
