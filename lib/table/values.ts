/**
 * How one text token or one in-memory value is read: missing tokens, decimal numbers, and the
 * limits a numeric value must respect.
 *
 * @module
 */

/**
 * Magnitude limit for numeric values: 2^500. A sum of squares of values below it cannot
 * overflow float64 (max ≈ 1.8e308 ≈ 2^1024) even over 2^23 rows, so later stages may square
 * and sum without scaling.
 */
export const LARGEST_MAGNITUDE: number = 2 ** 500;

/** The text tokens that mean "missing", after trimming spaces and tabs. */
export const MISSING_TOKENS: readonly string[] = Object.freeze(["", "NA", "NaN", "null"]);

const SPACE = 32;
const TAB = 9;

/**
 * Whether a text token is missing: empty, `NA`, `NaN` or `null` (exactly these spellings),
 * possibly surrounded by spaces or tabs.
 *
 * @example
 * ```ts
 * import { isMissingToken } from "./values.ts";
 * isMissingToken(" NA "); // true
 * isMissingToken("na"); // false
 * ```
 */
export function isMissingToken(token: string): boolean {
  const n = token.length;
  if (n === 0) return true;
  const first = token.charCodeAt(0);
  const last = token.charCodeAt(n - 1);
  const t = first === SPACE || first === TAB || last === SPACE || last === TAB
    ? trimSpaces(token)
    : token;
  return t === "" || t === "NA" || t === "NaN" || t === "null";
}

/**
 * The value of a decimal literal such as `42`, `-1.5e-3`, `.11019`, `760.` or `+7`, with optional
 * spaces or tabs around it; `NaN` for anything else (hex, `Infinity`, thousands separators,
 * words). Values too large for float64 come out as ±Infinity.
 *
 * @example
 * ```ts
 * import { parseDecimal } from "./values.ts";
 * parseDecimal(" .11019 "); // 0.11019
 * parseDecimal("0x10"); // NaN
 * ```
 */
export function parseDecimal(token: string): number {
  let digits = false;
  for (let i = 0; i < token.length; i++) {
    const c = token.charCodeAt(i);
    if (c >= 48 && c <= 57) digits = true;
    else if (
      c !== 46 && c !== 45 && c !== 43 && c !== 101 && c !== 69 && c !== SPACE && c !== TAB
    ) {
      return NaN;
    }
  }
  // The characters are now those of JavaScript's StrDecimalLiteral minus "Infinity", so Number()
  // accepts exactly the decimal literals among them and gives NaN for the rest (e.g. "1.2.3").
  return digits ? Number(token) : NaN;
}

/**
 * Whether a token spells an infinity: `inf` or `infinity` in any letter case, optionally signed
 * and surrounded by spaces or tabs.
 *
 * @example
 * ```ts
 * import { isInfinityWord } from "./values.ts";
 * isInfinityWord("-Infinity"); // true
 * isInfinityWord("info"); // false
 * ```
 */
export function isInfinityWord(token: string): boolean {
  return /^[ \t]*[+-]?inf(inity)?[ \t]*$/i.test(token);
}

/**
 * Whether a token reads as a number (finite or not): this decides that a column is numeric when
 * it is the column's first non-missing value.
 *
 * @example
 * ```ts
 * import { looksNumeric } from "./values.ts";
 * looksNumeric("1e5"); // true
 * looksNumeric("inf"); // true
 * looksNumeric("north"); // false
 * ```
 */
export function looksNumeric(token: string): boolean {
  return !Number.isNaN(parseDecimal(token)) || isInfinityWord(token);
}

function trimSpaces(s: string): string {
  let start = 0;
  let end = s.length;
  while (start < end && (s.charCodeAt(start) === SPACE || s.charCodeAt(start) === TAB)) start++;
  while (end > start && (s.charCodeAt(end - 1) === SPACE || s.charCodeAt(end - 1) === TAB)) end--;
  return s.slice(start, end);
}
