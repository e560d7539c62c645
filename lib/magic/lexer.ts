/**
 * Splitting a `curb` template into lines of tokens. The template is read as text in which every
 * `${…}` interpolation is one token carrying its value; lines are statements, `#` starts a
 * comment, words are letters, digits, `_`, `-` and `.` starting with a letter, numbers are
 * decimal (`12`, `0.5`, `1e-4`, `-3`), and `"…"` quotes a name or path (`\"` and `\\` escape).
 *
 * @module
 */
import { MagicError, type Spot } from "./error.ts";

/** How an interpolation shows in the rendered template text and in error excerpts. */
export const SLOT_TEXT = "${…}";

/**
 * One token of a line.
 *
 * @example
 * ```ts
 * import type { Token } from "./lexer.ts";
 * const t: Token = { kind: "word", text: "folds", spot: { line: 2, column: 3, length: 5 } };
 * ```
 */
export type Token =
  | { readonly kind: "word"; readonly text: string; readonly spot: Spot }
  | { readonly kind: "number"; readonly value: number; readonly text: string; readonly spot: Spot }
  | { readonly kind: "string"; readonly value: string; readonly text: string; readonly spot: Spot }
  | {
    readonly kind: "value";
    readonly value: unknown;
    readonly index: number;
    readonly text: string;
    readonly spot: Spot;
  }
  | { readonly kind: "comma"; readonly text: string; readonly spot: Spot };

/**
 * A line of the template: its 1-based number, its text (interpolations shown as `${…}`) and
 * its tokens (none for blank and comment-only lines).
 *
 * @example
 * ```ts
 * import { lexTemplate } from "./lexer.ts";
 * const [first] = lexTemplate(["folds 5"], []).filter((l) => l.tokens.length > 0);
 * console.log(first.number, first.tokens.length); // 1 2
 * ```
 */
export interface SourceLine {
  /** 1-based line number; line 1 holds the opening backtick. */
  readonly number: number;
  /** The line's text with each interpolation shown as `${…}`, as error excerpts print it. */
  readonly text: string;
  /** The line's tokens in order; empty for blank and comment-only lines. */
  readonly tokens: readonly Token[];
}

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?/;
const WORD_START = /[\p{L}_]/u;
const WORD_PART = /[\p{L}\p{N}_.\-]/u;
const BLANK = /[ \t\r\f\v\u00a0]/;

/** Hints for characters that come from other notations. */
const FOREIGN: Readonly<Record<string, string>> = {
  "~": "curb has no formula notation: name the column on a `predict` line and the terms on a " +
    "`terms` line",
  "%": "curb is a tagged template, not a command prefix: write the statements directly",
  "=": 'write a statement as words, e.g. "folds 5 seed 42", without "="',
  ":": 'write a statement as words, e.g. "rule one-se", without ":"',
  "(": 'write a term as words, e.g. "legendre x degree 4", without parentheses',
  ")": 'write a term as words, e.g. "legendre x degree 4", without parentheses',
  "[": 'write a list as numbers separated by commas, e.g. "lambda 0.1, 1, 10"',
  "]": 'write a list as numbers separated by commas, e.g. "lambda 0.1, 1, 10"',
  "+": 'separate terms with commas, e.g. "terms column a, column b"',
  "*": 'write a product of two terms with "times", e.g. "terms column a times indicators b"',
  ";": "put each statement on its own line; a semicolon between a CSV file's fields is named " +
    'as a word: data "plots.txt" separated by semicolon',
  "|": 'name a separator as a word or in quotes: data "plots.txt" separated by bar',
};

/**
 * The lines of a template given as a tagged template's strings and values.
 *
 * @throws {MagicError} `MAGIC_SYNTAX` for an unclosed quote, a malformed number or a character
 * that has no meaning here.
 *
 * @example
 * ```ts
 * import { lexTemplate } from "./lexer.ts";
 * const lines = lexTemplate(["\n  data ", "\n  predict y\n"], [{ y: [1, 2] }]);
 * console.log(lines[1].tokens.map((t) => t.kind)); // [ "word", "value" ]
 * ```
 */
export function lexTemplate(
  strings: readonly string[],
  values: readonly unknown[],
): SourceLine[] {
  const lines: SourceLine[] = [];
  let chars: string[] = [];
  let slots = new Map<number, number>();
  const flush = () => {
    lines.push(lexLine(lines.length + 1, chars, slots, values));
    chars = [];
    slots = new Map();
  };
  strings.forEach((piece, i) => {
    for (const ch of piece) {
      if (ch === "\n") flush();
      else chars.push(ch);
    }
    if (i < values.length) {
      slots.set(chars.length, i);
      chars.push(...SLOT_TEXT);
    }
  });
  flush();
  return lines;
}

/** Tokens of one line; `slots` maps a column index (0-based) to the interpolation there. */
function lexLine(
  number: number,
  chars: readonly string[],
  slots: ReadonlyMap<number, number>,
  values: readonly unknown[],
): SourceLine {
  const text = chars.join("");
  const tokens: Token[] = [];
  const spot = (start: number, length: number): Spot => ({
    line: number,
    column: start + 1,
    length,
  });
  const fail = (start: number, length: number, what: string, hint: string): never => {
    throw new MagicError("MAGIC_SYNTAX", what, hint, spot(start, length), text);
  };
  let i = 0;
  while (i < chars.length) {
    const ch = chars[i];
    const slot = slots.get(i);
    if (slot !== undefined) {
      const length = [...SLOT_TEXT].length;
      tokens.push({
        kind: "value",
        value: values[slot],
        index: slot,
        text: SLOT_TEXT,
        spot: spot(i, length),
      });
      i += length;
    } else if (BLANK.test(ch)) {
      i++;
    } else if (ch === "#") {
      break;
    } else if (ch === ",") {
      tokens.push({ kind: "comma", text: ",", spot: spot(i, 1) });
      i++;
    } else if (ch === '"') {
      const end = closingQuote(chars, i, slots);
      if (end < 0) {
        fail(i, 1, "this quote is not closed", 'End the quoted name on the same line with "');
      }
      const raw = chars.slice(i, end + 1).join("");
      tokens.push({ kind: "string", value: unquote(raw), text: raw, spot: spot(i, end + 1 - i) });
      i = end + 1;
    } else if (WORD_START.test(ch)) {
      let j = i + 1;
      while (j < chars.length && !slots.has(j) && WORD_PART.test(chars[j])) j++;
      tokens.push({ kind: "word", text: chars.slice(i, j).join(""), spot: spot(i, j - i) });
      i = j;
    } else {
      const match = NUMBER.exec(chars.slice(i).join(""));
      if (match === null) {
        fail(
          i,
          1,
          `"${ch}" has no meaning here`,
          FOREIGN[ch] ?? "Use words, numbers, commas, quoted names and ${…} values only",
        );
      }
      const length = [...match![0]].length;
      const after = chars[i + length];
      if (after !== undefined && !slots.has(i + length) && !/[\s,#]/.test(after)) {
        let j = i + length;
        while (j < chars.length && !/[\s,#]/.test(chars[j])) j++;
        fail(
          i,
          j - i,
          `expected a number, but found "${chars.slice(i, j).join("")}"`,
          "Write a plain decimal number such as 12, 0.5 or 1e-4, followed by a space or comma",
        );
      }
      tokens.push({
        kind: "number",
        value: Number(match![0]),
        text: match![0],
        spot: spot(i, length),
      });
      i += length;
    }
  }
  return { number, text, tokens };
}

/** Index of the quote closing the one at `start`, or −1 when the line ends first. */
function closingQuote(
  chars: readonly string[],
  start: number,
  slots: ReadonlyMap<number, number>,
): number {
  for (let j = start + 1; j < chars.length; j++) {
    if (slots.has(j)) return -1;
    if (chars[j] === "\\") j++;
    else if (chars[j] === '"') return j;
  }
  return -1;
}

/** The text inside quotes, with `\"` and `\\` unescaped. */
function unquote(raw: string): string {
  return raw.slice(1, -1).replace(/\\(["\\])/g, "$1");
}
