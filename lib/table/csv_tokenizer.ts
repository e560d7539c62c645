/**
 * An incremental RFC 4180 tokenizer that knows the source line where every record starts.
 *
 * Grammar (RFC 4180, with the tolerances listed here): fields are separated by one separator
 * character (`,` unless the caller chooses another) and records by a line end: `\r\n`, `\n` or a
 * bare `\r`, mixed freely in one file, each counted as one line. A field that starts with `"` is
 * quoted: it ends at the next lone `"`, a doubled `""` inside it stands for one `"`, and it may
 * hold separators and line ends, which are kept exactly as written. After a closing quote only
 * the separator, a line end or the end of input may follow. A `"` inside an unquoted field is
 * kept as a literal character. Completely empty lines are not records. Nothing is trimmed; the
 * caller decides about spaces.
 *
 * Text may arrive in chunks of any size (a chunk may end anywhere, even inside `\r\n`); each
 * character is examined once, so a long quoted field that spans many chunks costs linear time.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { DEFAULT_SEPARATOR, likelySeparator, separatorName } from "./separator.ts";

const QUOTE = 34;
const LF = 10;
const CR = 13;

// Where the tokenizer stands between two characters.
/** Between records. */
const RECORD_START = 0;
/** At the start of a field after a separator. */
const FIELD_START = 1;
/** Inside an unquoted field. */
const UNQUOTED = 2;
/** Inside a quoted field. */
const QUOTED = 3;
/** Inside a quoted field right after a `"`: a closing quote, or the first of a `""` pair. */
const QUOTE_SEEN = 4;

/**
 * Receives each record: its fields, the 1-based source line where it starts, and whether any of
 * its fields was written in double quotes.
 */
export type RecordSink = (fields: string[], line: number, quoted: boolean) => void;

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
  /**
   * The character between fields; `","` when absent. The caller checks it (see
   * `separatorProblem` in separator.ts): one character, not `"`, CR or LF.
   */
  readonly separator?: string;
}

/**
 * Splits CSV text into records of string fields, reporting the line where each record starts
 * (line 1 is the first line; each `\r\n`, `\n` or bare `\r` ends a line, also inside quotes).
 * Malformed quoting throws a {@link CurbfitError} with code `OPEN_QUOTE` naming the line where
 * the quote opened.
 *
 * @example
 * ```ts
 * import { CsvTokenizer } from "./csv_tokenizer.ts";
 * const seen: [string[], number][] = [];
 * const t = new CsvTokenizer({ source: "demo", onRecord: (f, line) => seen.push([f, line]) });
 * t.push('city,note\nOslo,"two\nlines"\r\nLima,');
 * t.push('"say ""hi"""\rQuito,dry\n');
 * t.end();
 * // seen: [["city","note"],1], [["Oslo","two\nlines"],2], [["Lima",'say "hi"'],4], [["Quito","dry"],5]
 * ```
 */
export class CsvTokenizer {
  readonly #source: string;
  readonly #onRecord: RecordSink;
  readonly #columnOf: (index: number) => string;
  readonly #separator: string;
  readonly #separatorCode: number;
  #mode = RECORD_START;
  /** Line the next character is on. */
  #line = 1;
  /** Line where the current record started. */
  #recordLine = 1;
  /** Line where the current quoted field opened. */
  #quoteLine = 1;
  /** Whether a field of the current record was quoted. */
  #quoted = false;
  /**
   * The text pushed last ended with a `\r` that was counted as a line end: a `\n` starting the
   * next text completes that `\r\n` and is not a line of its own.
   */
  #afterCr = false;
  /** Completed fields of the current record. */
  #fields: string[] = [];
  /** Text of the field being read so far. */
  #field = "";

  constructor(options: CsvTokenizerOptions) {
    this.#source = options.source;
    this.#onRecord = options.onRecord;
    this.#columnOf = options.columnOf ?? ((index) => String(index + 1));
    this.#separator = options.separator ?? DEFAULT_SEPARATOR;
    this.#separatorCode = this.#separator.charCodeAt(0);
  }

  /** The 1-based line that the next character fed will be on. */
  get line(): number {
    return this.#line;
  }

  /** Feeds the next piece of text; complete records are passed to `onRecord` right away. */
  push(text: string): void {
    const n = text.length;
    if (n === 0) return;
    let i = 0;
    if (this.#afterCr) {
      this.#afterCr = false;
      if (text.charCodeAt(0) === LF) {
        if (this.#mode === QUOTED) this.#field += "\n";
        i = 1;
      }
    }
    if (this.#mode !== RECORD_START) i = this.#scan(text, i);
    const separator = this.#separator;
    let nextQuote = text.indexOf('"', i);
    let nextLf = text.indexOf("\n", i);
    let nextCr = text.indexOf("\r", i);
    while (i < n) {
      if (nextLf !== -1 && nextLf < i) nextLf = text.indexOf("\n", i);
      if (nextCr !== -1 && nextCr < i) nextCr = text.indexOf("\r", i);
      const lineEnd = nextCr === -1 || (nextLf !== -1 && nextLf < nextCr) ? nextLf : nextCr;
      if (lineEnd === -1) break;
      if (nextQuote !== -1 && nextQuote < lineEnd) {
        // A record with a quote in it: read it character by character.
        i = this.#scan(text, i);
        if (nextQuote < i) nextQuote = text.indexOf('"', i);
        continue;
      }
      // Fast path: a whole line without quotes is one record.
      if (lineEnd > i) this.#onRecord(text.slice(i, lineEnd).split(separator), this.#line, false);
      this.#line++;
      i = this.#afterLineEnd(text, lineEnd);
    }
    if (i < n) this.#scan(text, i);
  }

  /** Signals the end of input: emits a last record without a line end, checks quotes. */
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
   * The index after the line end that starts at `at` (a `\r` followed by `\n` is one line end).
   * A `\r` that ends the text may be the first half of a `\r\n` cut between two pieces.
   */
  #afterLineEnd(text: string, at: number): number {
    if (text.charCodeAt(at) === CR) {
      if (at + 1 === text.length) this.#afterCr = true;
      else if (text.charCodeAt(at + 1) === LF) return at + 2;
    }
    return at + 1;
  }

  /**
   * Reads character by character from `i`, continuing the current record, until that record
   * ends (returns the index after its line end) or the text runs out (returns its length).
   */
  #scan(text: string, i: number): number {
    const n = text.length;
    const separator = this.#separatorCode;
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
            this.#quoted = true;
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
            if (c === separator || c === LF || c === CR) break;
            j++;
          }
          this.#field += text.slice(i, j);
          if (j === n) return n;
          if (c !== separator) {
            this.#endRecord(true);
            this.#line++;
            return this.#afterLineEnd(text, j);
          }
          this.#endField();
          this.#mode = FIELD_START;
          i = j + 1;
          break;
        }
        case QUOTED: {
          const q = text.indexOf('"', i);
          const stop = q === -1 ? n : q;
          const piece = text.slice(i, stop);
          this.#field += piece;
          this.#line += countLineEnds(piece);
          if (q === -1) {
            this.#afterCr = piece.charCodeAt(piece.length - 1) === CR;
            return n;
          }
          this.#mode = QUOTE_SEEN;
          i = q + 1;
          break;
        }
        case QUOTE_SEEN: {
          const c = text.charCodeAt(i);
          if (c === QUOTE) {
            this.#field += '"';
            this.#mode = QUOTED;
          } else if (c === separator) {
            this.#endField();
            this.#mode = FIELD_START;
          } else if (c === LF || c === CR) {
            this.#endRecord(false);
            this.#line++;
            return this.#afterLineEnd(text, i);
          } else {
            this.#throwAfterQuote(text[i]);
          }
          i++;
          break;
        }
      }
    }
    return n;
  }

  #endField(): void {
    this.#fields.push(this.#field);
    this.#field = "";
  }

  /** Ends the record; `unquoted` says whether its last field was unquoted (so may be empty). */
  #endRecord(unquoted: boolean): void {
    const last = this.#field;
    const fields = this.#fields;
    const blankLine = unquoted && fields.length === 0 && last === "";
    const quoted = this.#quoted;
    fields.push(last);
    this.#fields = [];
    this.#field = "";
    this.#quoted = false;
    this.#mode = RECORD_START;
    if (!blankLine) this.#onRecord(fields, this.#recordLine, quoted);
  }

  #throwAfterQuote(found: string): never {
    const usual = `end a quoted field right after its closing quote (with the separator ${
      JSON.stringify(this.#separator)
    } or a line end), and write each " inside it as ""`;
    const other = likelySeparator(found, this.#separator);
    throw this.#quoteError(
      `the quoted field that opens here is followed by ${
        JSON.stringify(found)
      } after its closing quote`,
      other === undefined
        ? usual.charAt(0).toUpperCase() + usual.slice(1)
        : `If the fields are separated by ${separatorName(other, true)}, set the field ` +
          `separator to ${JSON.stringify(other)} (fieldSeparator; --field-separator on the ` +
          `command line); otherwise ${usual}`,
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

/** Line ends in `s`: each `\n`, and each `\r` not followed by `\n` in `s`. */
function countLineEnds(s: string): number {
  let count = 0;
  for (let i = s.indexOf("\n"); i !== -1; i = s.indexOf("\n", i + 1)) count++;
  for (let i = s.indexOf("\r"); i !== -1; i = s.indexOf("\r", i + 1)) {
    if (s.charCodeAt(i + 1) !== LF) count++;
  }
  return count;
}
