/**
 * Checks for the options of the fold planners. Each check throws a CurbfitError that names the
 * option, shows the value received and says what to pass instead.
 *
 * @module
 */

import { CurbfitError } from "../errors/error.ts";

/** Largest row count a plan can index (row numbers are stored as int32). */
export const MAX_ROWS = 2147483647;

/** How a received value is shown in a message: strings quoted, everything else as text. */
export function showValue(value: unknown): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (typeof value === "bigint") return `${value}n`;
  return String(value);
}

/** Throws BAD_OPTION for any key of `options` not in `allowed` (catches misspelt options). */
export function rejectUnknownOptions(
  options: object,
  allowed: readonly string[],
  planner: string,
): void {
  for (const key of Object.keys(options)) {
    if (!allowed.includes(key)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `option ${key} is not an option of ${planner}`,
        `Use only ${allowed.join(", ")}`,
        { option: key },
      );
    }
  }
}

/** The row count: an integer from 2 to MAX_ROWS. */
export function checkRowCount(nRows: unknown): number {
  if (typeof nRows !== "number" || !Number.isInteger(nRows) || nRows < 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option nRows is ${showValue(nRows)}, but it must be a whole number of rows`,
      "Pass the table's row count, a non-negative integer",
      { option: "nRows" },
    );
  }
  if (nRows > MAX_ROWS) {
    throw new CurbfitError(
      "TOO_LARGE",
      `option nRows is ${nRows}, but fold plans index at most ${MAX_ROWS} rows`,
      "Split the data into smaller tables, or validate on a sample of rows",
      { option: "nRows" },
    );
  }
  if (nRows < 2) {
    throw new CurbfitError(
      "TOO_FEW_ROWS",
      `there ${nRows === 1 ? "is 1 row" : "are 0 rows"}, but validation needs at least 2`,
      "Load more rows before planning folds",
      { option: "nRows" },
    );
  }
  return nRows;
}

/** The fold count k: an integer from 2 to `most` (the number of rows or groups). */
export function checkFoldCount(k: unknown, most: number, unit: string): number {
  if (k === undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      "option k is missing",
      `Pass k, the number of folds, an integer from 2 to ${most} (the number of ${unit})`,
      { option: "k" },
    );
  }
  if (typeof k !== "number" || !Number.isInteger(k) || k < 2 || k > most) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option k is ${showValue(k)}, but it must be a whole number from 2 to ${most} ` +
        `(there are ${most} ${unit})`,
      `Pass k between 2 and ${most}; 5 or 10 are common choices when there are enough ${unit}`,
      { option: "k" },
    );
  }
  return k;
}

/** The seed: an integer from 0 to 2^53−1 (becomes PCG's 64-bit initstate unchanged). */
export function checkSeed(seed: unknown): number {
  if (typeof seed !== "number" || !Number.isSafeInteger(seed) || seed < 0) {
    const what = seed === undefined
      ? "option seed is missing"
      : `option seed is ${showValue(seed)}, but it must be a whole number from 0 to 2^53-1`;
    throw new CurbfitError(
      "BAD_OPTION",
      what,
      "Pass an explicit non-negative integer seed, for example seed: 20240611, and keep it " +
        "with your results so the folds can be rebuilt",
      { option: "seed" },
    );
  }
  return seed;
}

/** The repeat count: an integer ≥ 1 (default 1 when undefined). */
export function checkRepeats(repeats: unknown): number {
  if (repeats === undefined) return 1;
  if (typeof repeats !== "number" || !Number.isSafeInteger(repeats) || repeats < 1) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option repeats is ${showValue(repeats)}, but it must be a whole number of at least 1`,
      "Pass repeats: 1 for a single split of the rows, or more to repeat it with fresh shuffles",
      { option: "repeats" },
    );
  }
  return repeats;
}
