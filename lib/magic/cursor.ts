/**
 * Reading the tokens of one template line, with errors that say what was expected, what was
 * found, and the nearest valid word.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { MagicError, type Spot } from "./error.ts";
import type { SourceLine, Token } from "./lexer.ts";
import { nearestWord } from "./words.ts";

/**
 * A name with where it was written: a column, a candidate.
 *
 * @example
 * ```ts
 * import type { Named } from "./cursor.ts";
 * const target: Named = { name: "moisture", spot: { line: 3, column: 11, length: 8 } };
 * ```
 */
export interface Named {
  /** The name itself: a word as written, a quoted name unquoted and unescaped, or a string value. */
  readonly name: string;
  /** Where it was written in the template. */
  readonly spot: Spot;
}

/**
 * The spot from the start of `a` to the end of `b` (same line).
 *
 * @example
 * ```ts
 * import { spanOf } from "./cursor.ts";
 * console.log(spanOf({ line: 1, column: 3, length: 2 }, { line: 1, column: 8, length: 4 }).length); // 9
 * ```
 */
export function spanOf(a: Spot, b: Spot): Spot {
  return { line: a.line, column: a.column, length: b.column + b.length - a.column };
}

/**
 * How a token is named in "but found …".
 *
 * @example
 * ```ts
 * import { describeToken } from "./cursor.ts";
 * console.log(describeToken(undefined)); // the end of the line
 * ```
 */
export function describeToken(token: Token | undefined): string {
  if (token === undefined) return "the end of the line";
  if (token.kind === "value") return `\${…} holding ${describeValue(token.value)}`;
  if (token.kind === "number") return token.text;
  return `"${token.text.replace(/^"|"$/g, "")}"`;
}

/**
 * A short description of an interpolated value: "a number", "an array of 3 values", ….
 *
 * @example
 * ```ts
 * import { describeValue } from "./cursor.ts";
 * console.log(describeValue([1, 2, 3])); // an array of 3 values
 * ```
 */
export function describeValue(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return `an array of ${value.length} values`;
  if (typeof value === "object") return "an object";
  if (typeof value === "undefined") return "undefined";
  return `a ${typeof value}`;
}

/**
 * Walks the tokens of one line; token 0 is the statement word, already read.
 *
 * @example
 * ```ts
 * import { Cursor } from "./cursor.ts";
 * import { lexTemplate } from "./lexer.ts";
 * const [line] = lexTemplate(["rule one-se"], []);
 * const c = new Cursor(line);
 * console.log(c.word(["min", "one-se"], "a rule", "Write min or one-se")); // "one-se"
 * c.end("rule");
 * ```
 */
export class Cursor {
  readonly line: SourceLine;
  #at = 1;

  constructor(line: SourceLine) {
    this.line = line;
  }

  /** The token `ahead` places on (0 = next), if any. */
  peek(ahead = 0): Token | undefined {
    return this.line.tokens[this.#at + ahead];
  }

  /** Moves past the next token and returns it (call only after `peek` found one). */
  take(): Token {
    return this.line.tokens[this.#at++];
  }

  /** Whether the next token is the word `word`. */
  isWord(word: string): boolean {
    const t = this.peek();
    return t?.kind === "word" && t.text === word;
  }

  /** Takes a comma if one is next. */
  comma(): boolean {
    if (this.peek()?.kind !== "comma") return false;
    this.take();
    return true;
  }

  /** Where the next token is, or just past the last one at the end of the line. */
  here(): Spot {
    const t = this.peek();
    if (t !== undefined) return t.spot;
    const last = this.line.tokens[this.line.tokens.length - 1].spot;
    return { line: last.line, column: last.column + last.length + 1, length: 1 };
  }

  /** Throws: expected `expected`, found the next token; suggests the nearest of `accepted`. */
  fail(expected: string, hint: string, accepted: readonly string[] = []): never {
    const t = this.peek();
    const near = t?.kind === "word" ? nearestWord(t.text, accepted) : undefined;
    throw this.error(
      `expected ${expected}, but found ${describeToken(t)}`,
      near === undefined ? hint : `Did you mean "${near}"? ${hint}`,
      this.here(),
      near,
    );
  }

  /** A MAGIC_SYNTAX error at `spot` of this line. */
  error(what: string, hint: string, spot: Spot, suggestion?: string): MagicError {
    return new MagicError("MAGIC_SYNTAX", what, hint, spot, this.line.text, suggestion);
  }

  /** Runs `make`; a CurbfitError it throws is re-thrown pointing at `spot`. */
  build<T>(spot: Spot, make: () => T): T {
    return buildAt(spot, this.line.text, make);
  }

  /** The next token, which must be one of the words `accepted`. */
  word(accepted: readonly string[], expected: string, hint: string): string {
    const t = this.peek();
    if (t?.kind === "word" && accepted.includes(t.text)) {
      this.take();
      return t.text;
    }
    return this.fail(expected, hint, accepted);
  }

  /** A number written out or interpolated. */
  number(expected: string, hint: string): { value: number; spot: Spot } {
    const t = this.peek();
    if (t?.kind === "number" || (t?.kind === "value" && typeof t.value === "number")) {
      this.take();
      return { value: t.value as number, spot: t.spot };
    }
    return this.fail(expected, hint);
  }

  /** A whole number from `min` to `max`. */
  integer(expected: string, min: number, max: number, hint: string): { value: number; spot: Spot } {
    const t = this.peek();
    const n = this.number(expected, hint);
    if (!Number.isInteger(n.value) || n.value < min || n.value > max) {
      throw this.error(`expected ${expected}, but found ${describeToken(t)}`, hint, n.spot);
    }
    return n;
  }

  /** A name: a word, a quoted name, or an interpolated string. */
  name(expected: string, hint: string): Named {
    const t = this.peek();
    if (t?.kind === "word" || t?.kind === "string") {
      this.take();
      return { name: t.kind === "word" ? t.text : t.value, spot: t.spot };
    }
    if (t?.kind === "value" && typeof t.value === "string") {
      this.take();
      return { name: t.value, spot: t.spot };
    }
    return this.fail(expected, hint);
  }

  /** Numbers separated by commas, or one interpolated number or array of numbers. */
  numbers(expected: string, hint: string): { values: number[]; spot: Spot } {
    const t = this.peek();
    if (t?.kind === "value" && Array.isArray(t.value)) {
      this.take();
      const bad = t.value.findIndex((v) => typeof v !== "number");
      if (bad >= 0) {
        throw this.error(
          `expected ${expected}, but element ${bad} of the \${…} array is ${
            describeValue(t.value[bad])
          }`,
          hint,
          t.spot,
        );
      }
      return { values: [...t.value], spot: t.spot };
    }
    const first = this.number(expected, hint);
    const values = [first.value];
    let last = first.spot;
    while (this.comma()) {
      const next = this.number("a number after the comma", hint);
      values.push(next.value);
      last = next.spot;
    }
    return { values, spot: spanOf(first.spot, last) };
  }

  /** Throws unless the line is used up. */
  end(statement: string): void {
    if (this.peek() === undefined) return;
    this.fail(
      "the end of the line",
      `The "${statement}" statement is complete here; put each statement on its own line`,
    );
  }
}

/**
 * Runs `make`; a CurbfitError it throws (other than a MagicError) is re-thrown as a MagicError
 * pointing at `spot` of the line `lineText`, for checks made after that line was read.
 *
 * @example
 * ```ts
 * import { buildAt } from "./cursor.ts";
 * import { ridge } from "../fit/penalty.ts";
 * try {
 *   buildAt({ line: 4, column: 7, length: 4 }, "gamma 0, 1", () => ridge({ weights: [0, 1] }));
 * } catch (e) {
 *   console.log((e as Error).message); // … line 4, column 7: weight 1 is 0 …
 * }
 * ```
 */
export function buildAt<T>(spot: Spot, lineText: string, make: () => T): T {
  try {
    return make();
  } catch (e) {
    if (!(e instanceof CurbfitError) || e instanceof MagicError) throw e;
    const what = e.message.endsWith(` ${e.hint}`)
      ? e.message.slice(0, -e.hint.length - 2)
      : e.message;
    throw new MagicError(e.code, what, e.hint, spot, lineText);
  }
}
