/**
 * The one error class curbfit throws. Every error carries a stable machine code, says what is
 * wrong and where (file, line, column or option), and what to do about it.
 *
 * @module
 */

/** Stable error codes. Codes never change meaning once released; new ones may be added. */
export type ErrorCode =
  | "EMPTY_INPUT"
  | "NO_ROWS"
  | "RAGGED_ROW"
  | "OPEN_QUOTE"
  | "BAD_NUMBER"
  | "NOT_FINITE"
  | "DUPLICATE_HEADER"
  | "BLANK_HEADER"
  | "UNKNOWN_COLUMN"
  | "UNKNOWN_LEVEL"
  | "CONSTANT_COLUMN"
  | "MISSING_VALUE"
  | "ALL_MISSING"
  | "CONSTANT_TARGET"
  | "TOO_LARGE"
  | "BAD_OPTION"
  | "RANK_DEFICIENT"
  | "TOO_FEW_ROWS"
  | "READ_FAILED"
  | "RENDER_FAILED"
  | "BAD_RECORD"
  | "MAGIC_SYNTAX"
  | "FOLDER_NOT_EMPTY";

/** Where an error was found. All fields optional; the message already names them in words. */
export interface ErrorPlace {
  /** Source name: a file path, or a label such as "CSV text" or "rows". */
  readonly source?: string;
  /** 1-based line number in the source text. */
  readonly line?: number;
  /** Column name (or 1-based field number when there is no name). */
  readonly column?: string;
  /** Option name in a spec, e.g. "lambda" or "terms[2].degree". */
  readonly option?: string;
}

/**
 * An error a user can act on: `code` is stable, `message` says what is wrong and where,
 * `hint` says what to do.
 *
 * @example
 * ```ts
 * import { CurbfitError } from "./error.ts";
 * try {
 *   throw new CurbfitError("BAD_OPTION", "option lambda is -1, but it must be >= 0", "pass a non-negative number", { option: "lambda" });
 * } catch (e) {
 *   if (e instanceof CurbfitError) console.log(e.code, e.message);
 * }
 * ```
 */
export class CurbfitError extends Error {
  /** Stable code, safe to branch on. */
  readonly code: ErrorCode;
  /** What to do about it, as one sentence. */
  readonly hint: string;
  /** Where the problem was found. */
  readonly place: ErrorPlace;

  /**
   * The message is the place prefix (see `describePlace`), then `what`, a full stop, then `hint`.
   *
   * @param code stable code for the kind of problem
   * @param what what is wrong, without a trailing full stop
   * @param hint what to do about it, one sentence
   * @param place where it was found (default: nowhere in particular)
   */
  constructor(code: ErrorCode, what: string, hint: string, place: ErrorPlace = {}) {
    super(`${describePlace(place)}${what}. ${hint}`);
    this.name = "CurbfitError";
    this.code = code;
    this.hint = hint;
    this.place = place;
  }
}

/** "data.csv line 4, column "x": " — the prefix that locates an error, or "" when unknown. */
export function describePlace(place: ErrorPlace): string {
  const parts: string[] = [];
  if (place.source !== undefined) parts.push(place.source);
  if (place.line !== undefined) parts.push(`line ${place.line}`);
  if (place.column !== undefined) parts.push(`column ${JSON.stringify(place.column)}`);
  if (place.option !== undefined) parts.push(`option ${place.option}`);
  return parts.length === 0 ? "" : `${parts.join(", ")}: `;
}
