/**
 * An incremental RFC 4180 tokenizer that knows the source line where every record starts.
 *
 * Grammar (RFC 4180, with the tolerances listed here): fields are separated by `,` and records by
 * `\n` or `\r\n` (both may be mixed in one file). A field that starts with `"` is quoted: it ends
 * at the next lone `"`, a doubled `""` inside it stands for one `"`, and it may hold commas and
 * line breaks, which are kept exactly as written. After a closing quote only `,`, a line break or
 * the end of input may follow. A `"` inside an unquoted field is kept as a literal character.
 * Completely empty lines are not records. Nothing is trimmed; the caller decides about spaces.
 *
 * Text may arrive in chunks of any size (a chunk may end anywhere, even inside `\r\n`); each
 * character is examined once, so a long quoted field that spans many chunks costs linear time.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

const QUOTE = 34;
const COMMA = 44;
const LF = 10;
const CR = 13;

// Where the tokenizer stands between two characters.
/** Between records. */
const RECORD_START = 0;
/** At the start of a field after a comma. */
const FIELD_START = 1;
/** Inside an unquoted field. */
const UNQUOTED = 2;
/** Inside a quoted field. */
const QUOTED = 3;
/** Inside a quoted field right after a `"`: a closing quote, or the first of a `""` pair. */
const QUOTE_SEEN = 4;
/** After a closing quote and a `\r`: only `\n` may follow. */
const CLOSED_CR = 5;

/** Receives each record: its fields and the 1-based source line where it starts. */
export type RecordSink = (fields: string[], line: number) => void;

/** Options of {@link CsvTokenizer}. */
export interface CsvTokenizerOptions {
  /** Source label used in error messages, e.g. a file path. */
  readonly source: string;
  /** Called once per record, in order. May throw; the tokenizer then stops. */
  readonly onRecord: RecordSink;
  /**
   * Column label of field `index` (0-based) for error messages: its header name once known.
   * Defaults to the 1-based field number.
   */
  readonly columnOf?: (index: number) => string;
}

/**
 * Splits CSV text into records of string fields, reporting the line where each record starts
 * (line 1 is the first line; a quoted line break moves later records down). Malformed quoting
 * throws a {@link CurbfitError} with code `OPEN_QUOTE` naming the line where the quote opened.
 *
 * @example
 * ```ts
 * import { CsvTokenizer } from "./csv_tokenizer.ts";
 * const seen: [string[], number][] = [];
 * const t = new CsvTokenizer({ source: "demo", onRecord: (f, line) => seen.push([f, line]) });
 * t.push('city,note\nOslo,"two\nlines"\r\nLima,');
 * t.push('"say ""hi"""\n');
 * t.end();
 * // seen: [["city","note"],1], [["Oslo","two\nlines"],2], [["Lima",'say "hi"'],4]
 * ```
 */
export class CsvTokenizer {
  readonly #source: string;
  readonly #onRecord: RecordSink;
  readonly #columnOf: (index: number) => string;
  #mode = RECORD_START;
  /** Line the next character is on. */
  #line = 1;
  /** Line where the current record started. */
  #recordLine = 1;
  /** Line where the current quoted field opened. */
  #quoteLine = 1;
  /** Completed fields of the current record. */
  #fields: string[] = [];
  /** Text of the field being read so far. */
  #field = "";

  constructor(options: CsvTokenizerOptions) {
    this.#source = options.source;
    this.#onRecord = options.onRecord;
    this.#columnOf = options.columnOf ?? ((index) => String(index + 1));
  }

  /** The 1-based line that the next character fed will be on. */
  get line(): number {
    return this.#line;
  }

  /** Feeds the next piece of text; complete records are passed to `onRecord` right away. */
  push(text: string): void {
    const n = text.length;
    let i = this.#mode === RECORD_START ? 0 : this.#scan(text, 0);
    let nextQuote = text.indexOf('"', i);
    while (i < n) {
      const lineEnd = text.indexOf("\n", i);
      if (lineEnd === -1) break;
      if (nextQuote !== -1 && nextQuote < lineEnd) {
        // A record with a quote in it: read it character by character.
        i = this.#scan(text, i);
        if (nextQuote < i) nextQuote = text.indexOf('"', i);
        continue;
      }
      // Fast path: a whole line without quotes is one record.
      const end = lineEnd > i && text.charCodeAt(lineEnd - 1) === CR ? lineEnd - 1 : lineEnd;
      if (end > i) this.#onRecord(text.slice(i, end).split(","), this.#line);
      this.#line++;
      i = lineEnd + 1;
    }
    if (i < n) this.#scan(text, i);
  }

  /** Signals the end of input: emits a last record without a line break, checks quotes. */
  end(): void {
    switch (this.#mode) {
      case RECORD_START:
        return;
      case QUOTED:
        throw this.#quoteError(
          "the double quote that opens this field is never closed",
          'Close the quoted field with ", and write each " inside a quoted field as ""',
        );
      case UNQUOTED:
        this.#endRecord(true);
        return;
      default:
        this.#endRecord(false);
    }
  }

  /**
   * Reads character by character from `i`, continuing the current record, until that record
   * ends (returns the index after its line break) or the text runs out (returns its length).
   */
  #scan(text: string, i: number): number {
    const n = text.length;
    if (this.#mode === RECORD_START) {
      this.#mode = FIELD_START;
      this.#recordLine = this.#line;
    }
    while (i < n) {
      switch (this.#mode) {
        case FIELD_START:
          if (text.charCodeAt(i) === QUOTE) {
            this.#mode = QUOTED;
            this.#quoteLine = this.#line;
            i++;
          } else {
            this.#mode = UNQUOTED;
          }
          break;
        case UNQUOTED: {
          let j = i;
          let c = 0;
          while (j < n) {
            c = text.charCodeAt(j);
            if (c === COMMA || c === LF) break;
            j++;
          }
          this.#field += text.slice(i, j);
          if (j === n) return n;
          if (c === COMMA) {
            this.#endField();
            this.#mode = FIELD_START;
          } else {
            this.#endRecord(true);
            this.#line++;
            return j + 1;
          }
          i = j + 1;
          break;
        }
        case QUOTED: {
          const q = text.indexOf('"', i);
          const stop = q === -1 ? n : q;
          const piece = text.slice(i, stop);
          this.#field += piece;
          this.#line += countLineFeeds(piece);
          if (q === -1) return n;
          this.#mode = QUOTE_SEEN;
          i = q + 1;
          break;
        }
        case QUOTE_SEEN: {
          const c = text.charCodeAt(i);
          if (c === QUOTE) {
            this.#field += '"';
            this.#mode = QUOTED;
          } else if (c === COMMA) {
            this.#endField();
            this.#mode = FIELD_START;
          } else if (c === LF) {
            this.#endRecord(false);
            this.#line++;
            return i + 1;
          } else if (c === CR) {
            this.#mode = CLOSED_CR;
          } else {
            this.#throwAfterQuote(text[i]);
          }
          i++;
          break;
        }
        case CLOSED_CR:
          if (text.charCodeAt(i) !== LF) this.#throwAfterQuote("\r");
          this.#endRecord(false);
          this.#line++;
          return i + 1;
      }
    }
    return n;
  }

  #endField(): void {
    this.#fields.push(this.#field);
    this.#field = "";
  }

  /** Ends the record; `unquoted` says whether its last field was unquoted (may end in `\r`). */
  #endRecord(unquoted: boolean): void {
    let last = this.#field;
    if (unquoted && last.charCodeAt(last.length - 1) === CR) last = last.slice(0, -1);
    const fields = this.#fields;
    const blankLine = unquoted && fields.length === 0 && last === "";
    fields.push(last);
    this.#fields = [];
    this.#field = "";
    this.#mode = RECORD_START;
    if (!blankLine) this.#onRecord(fields, this.#recordLine);
  }

  #throwAfterQuote(found: string): never {
    throw this.#quoteError(
      `the quoted field that opens here is followed by ${
        JSON.stringify(found)
      } after its closing quote`,
      'End a quoted field right after its closing quote, and write each " inside it as ""',
    );
  }

  /** An OPEN_QUOTE error placed at the line where the current quoted field opened. */
  #quoteError(what: string, hint: string): CurbfitError {
    return new CurbfitError("OPEN_QUOTE", what, hint, {
      source: this.#source,
      line: this.#quoteLine,
      column: this.#columnOf(this.#fields.length),
    });
  }
}

/** Number of `\n` characters in `s`. */
function countLineFeeds(s: string): number {
  let count = 0;
  for (let i = s.indexOf("\n"); i !== -1; i = s.indexOf("\n", i + 1)) count++;
  return count;
}
