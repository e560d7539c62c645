/**
 * CSV loaders: text, files and streams. The first record is the header; every later record is a
 * row, located by the source line where it starts.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { CsvTokenizer } from "./csv_tokenizer.ts";
import { TableBuilder } from "./builder.ts";
import { checkCsvOptions, type CheckedCsvOptions, type CsvOptions } from "./options.ts";
import { count, describeValue } from "./describe.ts";
import {
  checkHeaderSeparator,
  DEFAULT_SEPARATOR,
  likelySeparator,
  separatorName,
} from "./separator.ts";
import type { Table } from "./types.ts";

const BYTE_ORDER_MARK = 0xfeff;

/** Turns CSV text, pushed in pieces, into a table: header first, then one row per record. */
class CsvLoader {
  readonly #options: CheckedCsvOptions;
  readonly #tokenizer: CsvTokenizer;
  #header: readonly string[] | undefined;
  #builder: TableBuilder | undefined;
  #started = false;

  constructor(options: CheckedCsvOptions) {
    this.#options = options;
    this.#tokenizer = new CsvTokenizer({
      source: options.source,
      onRecord: (fields, line, quoted) => this.#record(fields, line, quoted),
      columnOf: (index) => this.#header?.[index] ?? String(index + 1),
      separator: options.separator,
    });
  }

  /** The line the next text pushed starts on. */
  get line(): number {
    return this.#tokenizer.line;
  }

  /** Feeds the next piece of text (a UTF-8 byte order mark at the very start is skipped). */
  push(text: string): void {
    if (!this.#started) {
      if (text === "") return;
      this.#started = true;
      if (text.charCodeAt(0) === BYTE_ORDER_MARK) text = text.slice(1);
    }
    this.#tokenizer.push(text);
  }

  /** Ends the input and returns the table. */
  finish(): Table {
    this.#tokenizer.end();
    if (this.#builder === undefined) {
      throw new CurbfitError(
        "EMPTY_INPUT",
        "the input is empty: there is no header line",
        "Give a header line with the column names, then one line per row",
        { source: this.#options.source },
      );
    }
    const { separator } = this.#options;
    return this.#builder.finish(separator === DEFAULT_SEPARATOR ? undefined : separator);
  }

  #record(fields: string[], line: number, quoted: boolean): void {
    const { source, separator } = this.#options;
    if (this.#builder === undefined) {
      checkHeaderSeparator(fields, quoted, separator, source, line);
      this.#header = fields.map((name) => name.trim());
      this.#builder = new TableBuilder(this.#header, this.#options, line);
      return;
    }
    const expected = this.#header!.length;
    if (fields.length !== expected) {
      throw new CurbfitError(
        "RAGGED_ROW",
        `this record has ${count(fields.length, "field")}, but the header has ${expected}`,
        raggedHint(fields, expected, separator),
        { source, line },
      );
    }
    this.#builder.addRow(fields, line);
  }
}

/**
 * What to do about a record with the wrong number of fields; when it has too few and holds
 * another common separator, says that its fields seem separated by that one instead.
 */
function raggedHint(fields: readonly string[], expected: number, separator: string): string {
  const other = fields.length < expected ? likelySeparator(fields.join(""), separator) : undefined;
  const name = separatorName(separator);
  if (other !== undefined) {
    return `If the ${separatorName(other, true)} in it are meant to separate its fields, use one ` +
      `separator throughout the file (the header's are ${separatorName(separator, true)}); ` +
      `otherwise check it for a missing ${name}`;
  }
  return `Check it for a missing or extra ${name}; a field holding a ${name} or a line break ` +
    "must be in double quotes";
}

/**
 * Parses CSV text (RFC 4180: comma separators unless `options.fieldSeparator` names another
 * character; double-quoted fields that may hold separators, line breaks and doubled `""` quotes;
 * `\r\n`, `\n` or bare `\r` line ends) into a {@link Table}. The first line holds the column
 * names (spaces around them are trimmed). A column is numeric when its first non-missing value
 * reads as a decimal number (e.g. `.11019`, `760.`, `-1.5e-3`), otherwise a category;
 * `options.types` overrides that. Missing values are empty, `NA`, `NaN` or `null`. Empty lines
 * are skipped. Errors are {@link CurbfitError}s naming the line and column; a header line that
 * does not split but holds another common separator (`;` in a comma read, say) stops with
 * `BAD_OPTION` naming `fieldSeparator`.
 *
 * @example
 * ```ts
 * import { parseCsv } from "./csv.ts";
 * const table = parseCsv("load,site\n1.5,north\n.25,south\n");
 * table.nRows; // 2
 * table.columns.get("load"); // { kind: "number", values: Float64Array [1.5, 0.25], ... }
 * table.lineOfRow; // Int32Array [2, 3]
 * parseCsv("load;site\r1.5;north\r", { fieldSeparator: ";" }).nRows; // 1 (bare CR line ends)
 * ```
 */
export function parseCsv(text: string, options?: CsvOptions): Table {
  const checked = checkCsvOptions(options, "CSV text");
  if (typeof text !== "string") {
    throw new CurbfitError(
      "BAD_OPTION",
      `parseCsv takes CSV text, but was given ${describeValue(text)}`,
      "Pass a string; to read a file use await readCsv(path)",
      { option: "text" },
    );
  }
  if (!/[\r\n]/.test(text) && /^[^,"]*\.(csv|txt)$/i.test(text.trim())) {
    throw new CurbfitError(
      "NO_ROWS",
      `the CSV text is the single line ${JSON.stringify(text)}, which looks like a file name`,
      `To read a file, use await readCsv(${JSON.stringify(text.trim())})`,
      { source: checked.source, line: 1 },
    );
  }
  const loader = new CsvLoader(checked);
  loader.push(text);
  return loader.finish();
}

/**
 * Reads a CSV stream of UTF-8 bytes or of text chunks (e.g. `response.body`, or a file's
 * `readable`) into a {@link Table}, record by record, without holding the whole text. Same rules
 * as {@link parseCsv}; the source label defaults to `"stream"`. A stream that fails, or bytes
 * that are not UTF-8, give `READ_FAILED`. On an error the stream is cancelled.
 *
 * @example
 * ```ts
 * import { readCsvStream } from "./csv.ts";
 * const body = ReadableStream.from(["x,y\n1,2\n", "3,4\n"]);
 * const table = await readCsvStream(body, { source: "sensor feed" });
 * table.nRows; // 2
 * const piped = ReadableStream.from(["x|y\r1|2\r"]);
 * (await readCsvStream(piped, { fieldSeparator: "|" })).nRows; // 1
 * ```
 */
export async function readCsvStream(
  stream: ReadableStream<Uint8Array | string>,
  options?: CsvOptions,
): Promise<Table> {
  const checked = checkCsvOptions(options, "stream");
  if (!(stream instanceof ReadableStream)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `readCsvStream takes a ReadableStream, but was given ${describeValue(stream)}`,
      "Pass a web ReadableStream, such as response.body or (await Deno.open(path)).readable",
      { option: "stream" },
    );
  }
  return await load(streamChunks(stream), checked);
}

/**
 * Reads a CSV file (UTF-8, optionally with a byte order mark) into a {@link Table}, streaming it
 * so the text is never held whole. Same rules as {@link parseCsv}; messages and `table.source`
 * name the path. A file that cannot be read gives `READ_FAILED`.
 *
 * @example
 * ```ts
 * import { readCsv } from "./csv.ts";
 * const path = await Deno.makeTempFile({ suffix: ".csv" });
 * await Deno.writeTextFile(path, "dose,response\n1,0.5\n2,NA\n3,1.4\n");
 * const table = await readCsv(path, { missing: "drop" });
 * table.nRows; // 2
 * table.missing.droppedLines; // [3]
 * await Deno.writeTextFile(path, "dose\tresponse\n1\t0.5\n");
 * (await readCsv(path, { fieldSeparator: "\t" })).names; // ["dose", "response"]
 * ```
 */
export async function readCsv(path: string | URL, options?: CsvOptions): Promise<Table> {
  const checked = checkCsvOptions(options, pathLabel(path));
  let file: Deno.FsFile;
  try {
    file = await Deno.open(path, { read: true });
  } catch (cause) {
    throw readFailed(checked.source, cause);
  }
  try {
    return await load(fileChunks(file), checked);
  } finally {
    file.close();
  }
}

/**
 * Bytes asked of a file per read. Reading 1 MiB at a time costs far less per byte than a file's
 * `readable` stream (64 KiB chunks); see test/bench/csv_parsers.ts.
 */
const FILE_CHUNK_BYTES = 1 << 20;

/** Pieces of CSV input: text or UTF-8 bytes, each valid only until the next is asked for. */
type Chunks = AsyncIterator<Uint8Array | string, undefined>;

async function* fileChunks(file: Deno.FsFile): AsyncGenerator<Uint8Array, undefined> {
  const buffer = new Uint8Array(FILE_CHUNK_BYTES);
  for (;;) {
    const n = await file.read(buffer);
    if (n === null) return;
    yield buffer.subarray(0, n);
  }
}

function streamChunks(stream: ReadableStream<Uint8Array | string>): Chunks {
  const reader = stream.getReader();
  return {
    next: async () => {
      const { done, value } = await reader.read();
      return done ? { done: true, value: undefined } : { done: false, value };
    },
    return: async () => {
      await reader.cancel();
      return { done: true, value: undefined };
    },
  };
}

/** Feeds chunks to a {@link CsvLoader}; stops the chunk source early if loading fails. */
async function load(chunks: Chunks, options: CheckedCsvOptions): Promise<Table> {
  const loader = new CsvLoader(options);
  // ignoreBOM keeps a byte order mark in the text, so the loader skips exactly one for every kind
  // of input; fatal rejects bytes that are not UTF-8 instead of replacing them.
  const decoder = new TextDecoder("utf-8", { fatal: true, ignoreBOM: true });
  const decode = (bytes?: Uint8Array): string => {
    try {
      return bytes === undefined ? decoder.decode() : decoder.decode(bytes, { stream: true });
    } catch {
      throw new CurbfitError(
        "READ_FAILED",
        `the bytes at or after line ${loader.line} are not valid UTF-8 text`,
        "Save the data as UTF-8 (most spreadsheet programs offer 'CSV UTF-8')",
        { source: options.source },
      );
    }
  };
  try {
    for (;;) {
      let next: IteratorResult<Uint8Array | string, undefined>;
      try {
        next = await chunks.next();
      } catch (cause) {
        throw readFailed(options.source, cause);
      }
      if (next.done) break;
      const chunk = next.value;
      if (typeof chunk === "string") loader.push(decode() + chunk);
      else if (chunk instanceof Uint8Array) loader.push(decode(chunk));
      else {
        throw new CurbfitError(
          "READ_FAILED",
          `the stream gave ${describeValue(chunk)} where text or bytes were expected`,
          "Pass a stream of Uint8Array or string chunks",
          { source: options.source },
        );
      }
    }
    loader.push(decode());
    return loader.finish();
  } catch (error) {
    await chunks.return?.().catch(() => {});
    throw error;
  }
}

/** The label of a path in messages: the path as given, or a file URL's path. */
function pathLabel(path: string | URL): string {
  if (path instanceof URL) {
    return path.protocol === "file:" ? decodeURIComponent(path.pathname) : path.href;
  }
  return path;
}

/** A READ_FAILED error for a failure of the file system or of a stream. */
function readFailed(source: string, cause: unknown): CurbfitError {
  const [why, hint] = cause instanceof Deno.errors.NotFound
    ? ["the file does not exist", `Check the path; a relative path starts from ${workingDir()}`]
    : cause instanceof Deno.errors.NotCapable
    ? ["Deno was not given permission to read it", "Run Deno with --allow-read"]
    : cause instanceof Deno.errors.PermissionDenied
    ? ["the operating system denied access", "Check the file's permissions"]
    : cause instanceof Deno.errors.IsADirectory
    ? ["it is a directory", "Give the path of a CSV file inside it"]
    : [`reading failed (${firstLine(cause)})`, "Check that the file or stream is readable"];
  return new CurbfitError("READ_FAILED", `could not read the data: ${why}`, hint, { source });
}

function workingDir(): string {
  try {
    return `the working directory, ${Deno.cwd()}`;
  } catch {
    return "the working directory";
  }
}

/** First line of an error's message, without its stack. */
function firstLine(cause: unknown): string {
  const text = cause instanceof Error ? cause.message : String(cause);
  return text.split("\n")[0];
}
