/**
 * Errors that point into a `curb` template: line, column, a caret under the offending text,
 * what was expected and, when one is close, the nearest valid word.
 *
 * @module
 */
import { CurbfitError, type ErrorCode } from "../errors/error.ts";

/** What error messages call the template. */
export const SOURCE_NAME = "curb template";

/**
 * A stretch of the template: 1-based line and column, and its length in characters. Line 1 is
 * the line that holds the opening backtick; an interpolation counts as the 4 characters `${…}`.
 *
 * @example
 * ```ts
 * import type { Spot } from "./error.ts";
 * const spot: Spot = { line: 3, column: 7, length: 4 };
 * ```
 */
export interface Spot {
  /** 1-based line; line 1 holds the opening backtick. */
  readonly line: number;
  /** 1-based column, counted in Unicode code points. */
  readonly column: number;
  /** Number of code points covered (the caret shows at least one). */
  readonly length: number;
}

/**
 * The line as the template shows it and a caret line under `spot`, each prefixed by a gutter:
 *
 * ```text
 *    4 | folds five seed 3
 *      |       ^^^^
 * ```
 *
 * @example
 * ```ts
 * import { caretExcerpt } from "./error.ts";
 * console.log(caretExcerpt("folds five", { line: 4, column: 7, length: 4 }));
 * ```
 */
export function caretExcerpt(lineText: string, spot: Spot): string {
  const shown = [...lineText].map((ch) => (ch === "\t" ? " " : ch)).join("");
  const number = String(spot.line);
  const gutter = " ".repeat(number.length);
  const caret = " ".repeat(spot.column - 1) + "^".repeat(Math.max(1, spot.length));
  return `  ${number} | ${shown}\n  ${gutter} | ${caret}`;
}

/**
 * A CurbfitError located in a `curb` template. `message` reads
 * `curb template, line L, column C: what. hint` followed by the caret excerpt.
 *
 * @example
 * ```ts
 * import { MagicError } from "./error.ts";
 * const e = new MagicError("MAGIC_SYNTAX", "expected a number, but found \"five\"",
 *   "Write the number of folds, e.g. \"folds 5\"", { line: 2, column: 7, length: 4 }, "folds five");
 * console.log(e.line, e.column, e.message);
 * ```
 */
export class MagicError extends CurbfitError {
  /** 1-based line in the template. */
  readonly line: number;
  /** 1-based column in the line. */
  readonly column: number;
  /** The line and a caret under the problem. */
  readonly excerpt: string;
  /** The nearest valid word, when one was close to what was written. */
  readonly suggestion: string | undefined;

  /**
   * Builds the located message and the caret excerpt.
   *
   * @param code stable error code, usually `MAGIC_SYNTAX`
   * @param what what is wrong, without a trailing full stop
   * @param hint what to do about it, one sentence
   * @param spot where in the template the problem is
   * @param lineText the text of line `spot.line`, interpolations shown as `${…}`
   * @param suggestion the nearest valid word, if one is close
   */
  constructor(
    code: ErrorCode,
    what: string,
    hint: string,
    spot: Spot,
    lineText: string,
    suggestion?: string,
  ) {
    super(code, what, hint, { source: SOURCE_NAME, line: spot.line });
    this.name = "CurbfitError";
    this.line = spot.line;
    this.column = spot.column;
    this.excerpt = caretExcerpt(lineText, spot);
    this.suggestion = suggestion;
    this.message = `${SOURCE_NAME}, line ${spot.line}, column ${spot.column}: ${what}. ${hint}\n` +
      this.excerpt;
  }
}
