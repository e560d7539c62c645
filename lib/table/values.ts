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
const PLUS = 43;
const MINUS = 45;
const DOT = 46;
const DIGIT_0 = 48;
const DIGIT_9 = 57;
const UPPER_E = 69;
const LOWER_E = 101;

function isSpace(c: number): boolean {
  return c === SPACE || c === TAB;
}

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
  const t = isSpace(first) || isSpace(last) ? trimSpaces(token) : token;
  return t === "" || t === "NA" || t === "NaN" || t === "null";
}

/** 10^0 … 10^22: every one is exact in float64 (5^22 < 2^53). */
const EXACT_POWERS_OF_TEN = Float64Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * The value of a decimal literal such as `42`, `-1.5e-3`, `.11019`, `760.` or `+7`, with optional
 * spaces or tabs around it; `NaN` for anything else (hex, `Infinity`, thousands separators,
 * words). The result is the correctly rounded float64, exactly what `Number()` gives for the same
 * literal; values too large for float64 come out as ±Infinity.
 *
 * Speed: when the digits form an integer m ≤ 2^53 and the decimal exponent e has |e| ≤ 22, the
 * value is m·10^e or m/10^-e in one correctly rounded operation on two exact doubles (Clinger's
 * fast path: W. D. Clinger, "How to Read Floating Point Numbers Accurately", PLDI 1990). Other
 * literals go to `Number()`.
 *
 * @example
 * ```ts
 * import { parseDecimal } from "./values.ts";
 * parseDecimal(" .11019 "); // 0.11019
 * parseDecimal("760."); // 760
 * parseDecimal("0x10"); // NaN
 * ```
 */
export function parseDecimal(token: string): number {
  let end = token.length;
  let i = 0;
  while (i < end && isSpace(token.charCodeAt(i))) i++;
  while (end > i && isSpace(token.charCodeAt(end - 1))) end--;
  let c = token.charCodeAt(i);
  const negative = c === MINUS;
  if (negative || c === PLUS) c = token.charCodeAt(++i);
  let mantissa = 0;
  let digits = 0;
  let exponent = 0;
  while (c >= DIGIT_0 && c <= DIGIT_9) {
    mantissa = mantissa * 10 + (c - DIGIT_0);
    digits++;
    c = token.charCodeAt(++i);
  }
  if (c === DOT) {
    c = token.charCodeAt(++i);
    while (c >= DIGIT_0 && c <= DIGIT_9) {
      mantissa = mantissa * 10 + (c - DIGIT_0);
      digits++;
      exponent--;
      c = token.charCodeAt(++i);
    }
  }
  if (digits === 0) return NaN;
  if (c === LOWER_E || c === UPPER_E) {
    c = token.charCodeAt(++i);
    const negativeExponent = c === MINUS;
    if (negativeExponent || c === PLUS) c = token.charCodeAt(++i);
    let written = 0;
    let magnitude = 0;
    while (c >= DIGIT_0 && c <= DIGIT_9) {
      if (magnitude < 1e6) magnitude = magnitude * 10 + (c - DIGIT_0);
      written++;
      c = token.charCodeAt(++i);
    }
    if (written === 0) return NaN;
    exponent += negativeExponent ? -magnitude : magnitude;
  }
  if (i !== end) return NaN;
  // The digits accumulate exactly while they stay <= 2^53 (and once above it, stay above).
  if (mantissa <= Number.MAX_SAFE_INTEGER && exponent >= -22 && exponent <= 22) {
    const magnitude = exponent >= 0
      ? mantissa * EXACT_POWERS_OF_TEN[exponent]
      : mantissa / EXACT_POWERS_OF_TEN[-exponent];
    return negative ? -magnitude : magnitude;
  }
  // The text is a valid decimal literal, which Number() reads correctly rounded.
  return Number(token);
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
  while (start < end && isSpace(s.charCodeAt(start))) start++;
  while (end > start && isSpace(s.charCodeAt(end - 1))) end--;
  return s.slice(start, end);
}
