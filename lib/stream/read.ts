/**
 * Reading a CSV or NDJSON source record by record into chunks of rows, each row with its fold
 * in every repeat from the fold hash. Only the named columns are converted: numeric columns to float64, category
 * columns to level codes. Values follow the table loaders' rules (lib/table/README.md): missing
 * tokens `""`, `NA`, `NaN`, `null`; decimal literals only; finite; magnitude below 2^500;
 * category text kept verbatim (a JSON number becomes its JavaScript text, as in `tableFromRows`).
 * A bad record either stops the read with a CurbfitError naming its line (policy "error") or is
 * dropped and counted (policy "drop").
 *
 * @module
 */
import { CurbfitError, type ErrorCode } from "../errors/error.ts";
import { CsvTokenizer } from "../table/csv_tokenizer.ts";
import { checkHeaderSeparator, DEFAULT_SEPARATOR, separatorName } from "../table/separator.ts";
import {
  isInfinityWord,
  isMissingToken,
  LARGEST_MAGNITUDE,
  parseDecimal,
} from "../table/values.ts";
import type { Chunk } from "./accumulate.ts";
import { type FoldHash, foldOfReduced, reduceKey } from "./hash.ts";

/**
 * Where rows come from: a file path or `file:` URL (re-readable), a function returning a fresh
 * stream each time it is called (re-readable), or one stream (read once).
 *
 * @example
 * ```ts
 * import type { StreamSource } from "./read.ts";
 * const sources: StreamSource[] = ["data.csv", () => ReadableStream.from(["x,y\n1,2\n"])];
 * ```
 */
export type StreamSource =
  | string
  | URL
  | ReadableStream<Uint8Array | string>
  | (() => ReadableStream<Uint8Array | string>);

/**
 * Text formats: RFC 4180 CSV with a header line, or one JSON object per line.
 *
 * @example
 * ```ts
 * import type { StreamFormat } from "./read.ts";
 * const format: StreamFormat = "ndjson";
 * ```
 */
export type StreamFormat = "csv" | "ndjson";

/**
 * What to read and how to treat bad records.
 *
 * @example
 * ```ts
 * import type { ReadPlan } from "./read.ts";
 * import { foldHash } from "./hash.ts";
 * const plan: ReadPlan = {
 *   format: "csv", columns: ["x", "y"], categories: ["site"], key: "id", hashes: [foldHash(1, 5)],
 *   missing: "drop", malformed: "error", chunkRows: 8192, label: "data.csv",
 * };
 * ```
 */
export interface ReadPlan {
  readonly format: StreamFormat;
  /** Numeric columns to convert (target and term inputs). */
  readonly columns: readonly string[];
  /** Category columns to read as text levels (inputs of `indicators`); default none. */
  readonly categories?: readonly string[];
  /** Key column hashed into folds, or null to hash the 0-based data record number. */
  readonly key: string | null;
  /** The fold hash of each repeat (a row gets one fold per repeat). */
  readonly hashes: readonly FoldHash[];
  readonly missing: "error" | "drop";
  readonly malformed: "error" | "drop";
  readonly chunkRows: number;
  /** Label for messages. */
  readonly label: string;
  /** CSV field separator, already checked (lib/table/options.ts); default ",". */
  readonly fieldSeparator?: string;
}

/**
 * One dropped record.
 *
 * @example
 * ```ts
 * import type { DroppedRecord } from "./read.ts";
 * const d: DroppedRecord = { line: 17, reason: 'column "x": this record has a missing value' };
 * ```
 */
export interface DroppedRecord {
  /** 1-based line of the record in the source text. */
  readonly line: number;
  /** Why it was dropped, naming the column when there is one. */
  readonly reason: string;
}

/**
 * What a read saw.
 *
 * @example
 * ```ts
 * import type { ReadStats } from "./read.ts";
 * const share = (s: ReadStats) => s.used / s.records;
 * ```
 */
export interface ReadStats {
  /** Data records read (header and blank lines excluded). */
  readonly records: number;
  /** Records kept. */
  readonly used: number;
  /** Records dropped for a missing value (policy `missing: "drop"`). */
  readonly droppedMissing: number;
  /** Records dropped as malformed (policy `malformed: "drop"`). */
  readonly droppedMalformed: number;
  /** The first dropped records (at most 20), with why. */
  readonly firstDropped: readonly DroppedRecord[];
  /** Size read: bytes for files and byte streams, UTF-16 code units for streams of strings. */
  readonly bytes: number;
}

/**
 * How far a read has come.
 *
 * @example
 * ```ts
 * import type { ReadProgress } from "./read.ts";
 * const percent = (p: ReadProgress) => (100 * p.bytes) / p.totalBytes;
 * ```
 */
export interface ReadProgress {
  readonly bytes: number;
  /** Total bytes when known (files), else NaN. */
  readonly totalBytes: number;
  readonly rows: number;
}

const KEPT_DROPS = 20;
const FILE_READ_BYTES = 1 << 20;

/** A bad record: thrown under policy "error", counted under "drop". */
class BadRecord {
  constructor(
    readonly code: ErrorCode,
    readonly kind: "missing" | "malformed",
    readonly what: string,
    readonly hint: string,
    readonly column?: string,
  ) {}
}

/** One category column being read: codes of the current chunk, levels by first appearance. */
class LevelCodes {
  readonly levels: string[] = [];
  readonly codes: Int32Array;
  readonly #codeOf = new Map<string, number>();

  constructor(rows: number) {
    this.codes = new Int32Array(rows);
  }

  /** Stores the level of row `row`. */
  set(row: number, level: string): void {
    let code = this.#codeOf.get(level);
    if (code === undefined) {
      code = this.levels.length;
      // A copy, so that a kept level does not hold on to the text piece it was cut from.
      const own = (" " + level).slice(1);
      this.#codeOf.set(own, code);
      this.levels.push(own);
    }
    this.codes[row] = code;
  }
}

/** Collects converted rows into a chunk and hands full chunks on. */
class RowSink {
  readonly #plan: ReadPlan;
  readonly #onChunk: (chunk: Chunk) => void;
  readonly #columns: Map<string, Float64Array>;
  readonly #categories: Map<string, LevelCodes>;
  readonly #buckets: Int32Array[];
  readonly #lines: Int32Array;
  readonly #dropped: DroppedRecord[] = [];
  #size = 0;
  records = 0;
  used = 0;
  droppedMissing = 0;
  droppedMalformed = 0;

  constructor(plan: ReadPlan, onChunk: (chunk: Chunk) => void) {
    this.#plan = plan;
    this.#onChunk = onChunk;
    this.#columns = new Map(plan.columns.map((c) => [c, new Float64Array(plan.chunkRows)]));
    this.#categories = new Map(
      (plan.categories ?? []).map((c) => [c, new LevelCodes(plan.chunkRows)]),
    );
    this.#buckets = plan.hashes.map(() => new Int32Array(plan.chunkRows));
    this.#lines = new Int32Array(plan.chunkRows);
  }

  /** One data record: `value(name)` gives a column's raw value (text or JSON). */
  record(line: number, value: (name: string) => unknown): void {
    const index = this.records++;
    try {
      const row = this.#size;
      for (const name of this.#plan.columns) {
        this.#columns.get(name)![row] = toNumber(value(name), name);
      }
      for (const [name, codes] of this.#categories) codes.set(row, toLevel(value(name), name));
      const x = this.#plan.key === null
        ? reduceKey(index)
        : toKey(value(this.#plan.key), this.#plan.key);
      this.#plan.hashes.forEach((hash, r) => (this.#buckets[r][row] = foldOfReduced(hash, x)));
      this.#lines[row] = line;
    } catch (e) {
      if (!(e instanceof BadRecord)) throw e;
      this.reject(line, e);
      return;
    }
    this.used++;
    if (++this.#size === this.#plan.chunkRows) this.flush();
  }

  /** A record refused before its values were read (e.g. a wrong field count). */
  reject(line: number, bad: BadRecord): void {
    const policy = bad.kind === "missing" ? this.#plan.missing : this.#plan.malformed;
    if (policy === "error") {
      throw new CurbfitError(bad.code, bad.what, bad.hint, {
        source: this.#plan.label,
        line,
        ...(bad.column === undefined ? {} : { column: bad.column }),
      });
    }
    if (bad.kind === "missing") this.droppedMissing++;
    else this.droppedMalformed++;
    if (this.#dropped.length < KEPT_DROPS) {
      const at = bad.column === undefined ? "" : `column ${JSON.stringify(bad.column)}: `;
      this.#dropped.push({ line, reason: at + bad.what });
    }
  }

  flush(): void {
    if (this.#size === 0) return;
    this.#onChunk({
      size: this.#size,
      columns: this.#columns,
      categories: this.#categories,
      buckets: this.#buckets,
      lines: this.#lines,
    });
    this.#size = 0;
  }

  stats(bytes: number): ReadStats {
    return {
      records: this.records,
      used: this.used,
      droppedMissing: this.droppedMissing,
      droppedMalformed: this.droppedMalformed,
      firstDropped: [...this.#dropped],
      bytes,
    };
  }
}

function missing(column: string): BadRecord {
  return new BadRecord(
    "MISSING_VALUE",
    "missing",
    "this record has a missing value",
    'Fill it in, or pass missing: "drop" to leave such records out (they are counted)',
    column,
  );
}

/** A numeric value from CSV text or a JSON value, or a BadRecord. */
function toNumber(raw: unknown, column: string): number {
  let v: number;
  if (raw === null || raw === undefined) throw missing(column);
  if (typeof raw === "number") v = raw;
  else if (typeof raw === "string") {
    if (isMissingToken(raw)) throw missing(column);
    v = parseDecimal(raw);
    if (Number.isNaN(v)) {
      throw new BadRecord(
        isInfinityWord(raw) ? "NOT_FINITE" : "BAD_NUMBER",
        "malformed",
        `the value ${JSON.stringify(raw.slice(0, 40))} is not a finite decimal number`,
        'Fix the value, or pass malformed: "drop" to leave bad records out (they are counted)',
        column,
      );
    }
  } else {
    throw new BadRecord(
      "BAD_NUMBER",
      "malformed",
      `the value ${JSON.stringify(raw)?.slice(0, 40)} is not a number`,
      'Fix the value, or pass malformed: "drop" to leave bad records out (they are counted)',
      column,
    );
  }
  if (!(Math.abs(v) < LARGEST_MAGNITUDE)) {
    throw new BadRecord(
      Number.isFinite(v) ? "TOO_LARGE" : "NOT_FINITE",
      "malformed",
      `the value ${v} is not finite or not below 2^500 in magnitude`,
      "Rescale the column, or fix the value",
      column,
    );
  }
  return v;
}

/** A category level from CSV text or a JSON value, or a BadRecord (as lib/table reads one). */
function toLevel(raw: unknown, column: string): string {
  if (raw === null || raw === undefined) throw missing(column);
  if (typeof raw === "string") {
    if (isMissingToken(raw)) throw missing(column);
    return raw;
  }
  if (typeof raw === "number" && Number.isFinite(raw)) return String(raw);
  throw new BadRecord(
    typeof raw === "number" ? "NOT_FINITE" : "BAD_NUMBER",
    "malformed",
    `the value ${JSON.stringify(raw)?.slice(0, 40)} is neither text nor a finite number`,
    'Write the level as text, or pass malformed: "drop" to leave bad records out (they are counted)',
    column,
  );
}

/** key mod P of a key value, or a BadRecord. */
function toKey(raw: unknown, column: string): number {
  if (raw === null || raw === undefined || (typeof raw === "string" && isMissingToken(raw))) {
    throw missing(column);
  }
  const x = typeof raw === "number" || typeof raw === "string" ? reduceKey(raw) : NaN;
  if (Number.isNaN(x)) {
    throw new BadRecord(
      "BAD_NUMBER",
      "malformed",
      `the key ${JSON.stringify(raw)?.slice(0, 40)} is not a whole number from −2^63 to 2^63 − 1`,
      "Use an integer key column, or leave the key out to hash record numbers",
      column,
    );
  }
  return x;
}

/** Pieces of input and the total size when known. */
interface Opened {
  readonly pieces: AsyncIterator<Uint8Array | string>;
  readonly totalBytes: number;
  close(): Promise<void>;
}

async function open(source: StreamSource, label: string): Promise<Opened> {
  if (typeof source === "string" || source instanceof URL) {
    let file: Deno.FsFile;
    let size: number;
    try {
      file = await Deno.open(source, { read: true });
      size = (await file.stat()).size;
    } catch (cause) {
      throw new CurbfitError(
        "READ_FAILED",
        `could not open the data (${firstLine(cause)})`,
        "Check the path and that Deno has --allow-read",
        { source: label },
      );
    }
    const buffer = new Uint8Array(FILE_READ_BYTES);
    const pieces = (async function* () {
      for (;;) {
        const n = await file.read(buffer);
        if (n === null) return;
        yield buffer.subarray(0, n);
      }
    })();
    return { pieces, totalBytes: size, close: () => Promise.resolve(file.close()) };
  }
  const stream = typeof source === "function" ? source() : source;
  if (!(stream instanceof ReadableStream)) {
    throw new CurbfitError(
      "BAD_OPTION",
      "the source is not a file path, a ReadableStream or a function returning one",
      'Pass a path such as "data.csv", response.body, or () => fresh stream',
      { option: "source" },
    );
  }
  if (stream.locked) {
    throw new CurbfitError(
      "BAD_OPTION",
      "the stream was already read (it is locked)",
      "Pass a function that returns a fresh stream, or a file path, when several passes are needed",
      { option: "source" },
    );
  }
  const reader = stream.getReader();
  const pieces = {
    next: async () => {
      const r = await reader.read();
      return r.done ? { done: true as const, value: undefined } : { done: false, value: r.value };
    },
  };
  return {
    pieces,
    totalBytes: NaN,
    close: () => reader.cancel().catch(() => {}),
  };
}

/**
 * Reads the source once, handing full chunks (and a last partial one) to `onChunk` and
 * reporting progress after each chunk. Throws a CurbfitError naming the line of the first bad
 * record under policy "error"; the source is closed either way.
 *
 * @example
 * ```ts
 * import { readChunks } from "./read.ts";
 * import { foldHash } from "./hash.ts";
 * const plan = {
 *   format: "csv" as const, columns: ["x", "y"], key: null, hashes: [foldHash(1, 2)],
 *   missing: "error" as const, malformed: "error" as const, chunkRows: 2, label: "demo",
 * };
 * const stats = await readChunks(ReadableStream.from(["x,y\n1,2\n3,4\n5,7\n"]), plan, (c) => {}, () => {});
 * console.log(stats.used); // 3
 * ```
 */
export async function readChunks(
  source: StreamSource,
  plan: ReadPlan,
  onChunk: (chunk: Chunk) => void,
  onProgress: (progress: ReadProgress) => void,
): Promise<ReadStats> {
  const opened = await open(source, plan.label);
  let bytes = 0;
  const sink = new RowSink(plan, (chunk) => {
    onChunk(chunk);
    onProgress({ bytes, totalBytes: opened.totalBytes, rows: sink.used });
  });
  const parser = plan.format === "csv" ? csvParser(plan, sink) : ndjsonParser(sink);
  const decoder = new TextDecoder("utf-8", { fatal: true });
  const decode = (piece?: Uint8Array): string => {
    try {
      return piece === undefined ? decoder.decode() : decoder.decode(piece, { stream: true });
    } catch {
      throw new CurbfitError(
        "READ_FAILED",
        `the bytes near line ${parser.line()} are not valid UTF-8 text`,
        "Save the data as UTF-8",
        { source: plan.label },
      );
    }
  };
  try {
    for (;;) {
      let next: IteratorResult<Uint8Array | string>;
      try {
        next = await opened.pieces.next();
      } catch (cause) {
        throw new CurbfitError(
          "READ_FAILED",
          `reading stopped near line ${parser.line()} (${firstLine(cause)})`,
          "Check that the file or stream stays readable; no result was produced",
          { source: plan.label },
        );
      }
      if (next.done) break;
      const piece = next.value;
      bytes += typeof piece === "string" ? piece.length : piece.byteLength;
      parser.push(typeof piece === "string" ? decode() + piece : decode(piece));
    }
    parser.push(decode());
    parser.end();
    sink.flush();
  } finally {
    await opened.close();
  }
  return sink.stats(bytes);
}

/** Pushes text, ends input, and tells the current line. */
interface Parser {
  push(text: string): void;
  end(): void;
  line(): number;
}

function csvParser(plan: ReadPlan, sink: RowSink): Parser {
  let header: string[] | undefined;
  let index = new Map<string, number>();
  let started = false;
  const separator = plan.fieldSeparator ?? DEFAULT_SEPARATOR;
  const tokenizer = new CsvTokenizer({
    source: plan.label,
    separator,
    columnOf: (i) => header?.[i] ?? String(i + 1),
    onRecord: (fields, line, quoted) => {
      if (header === undefined) {
        checkHeaderSeparator(fields, quoted, separator, plan.label, line);
        header = fields.map((f) => f.trim());
        index = columnIndex(
          header,
          [...plan.columns, ...(plan.categories ?? []), ...(plan.key === null ? [] : [plan.key])],
          plan.label,
          line,
        );
        return;
      }
      if (fields.length !== header.length) {
        sink.records++;
        sink.reject(
          line,
          new BadRecord(
            "RAGGED_ROW",
            "malformed",
            `this record has ${fields.length} fields, but the header has ${header.length}`,
            `Check it for a missing or extra ${separatorName(separator)}, or pass malformed: ` +
              '"drop" to leave such records out',
          ),
        );
        return;
      }
      sink.record(line, (name) => fields[index.get(name)!]);
    },
  });
  return {
    push(text) {
      if (!started && text !== "") {
        started = true;
        if (text.charCodeAt(0) === 0xfeff) text = text.slice(1);
      }
      tokenizer.push(text);
    },
    end() {
      tokenizer.end();
      if (header === undefined) {
        throw new CurbfitError(
          "EMPTY_INPUT",
          "the input is empty: there is no header line",
          "Give a header line with the column names, then one line per row",
          { source: plan.label },
        );
      }
    },
    line: () => tokenizer.line,
  };
}

function ndjsonParser(sink: RowSink): Parser {
  let rest = "";
  let line = 1;
  const one = (text: string) => {
    const t = text.endsWith("\r") ? text.slice(0, -1) : text;
    if (t.trim() !== "") {
      let value: unknown;
      try {
        value = JSON.parse(t);
      } catch (e) {
        value = new BadRecord(
          "RAGGED_ROW",
          "malformed",
          `this line is not valid JSON (${firstLine(e)})`,
          'Fix the line, or pass malformed: "drop" to leave such lines out (they are counted)',
        );
      }
      if (value instanceof BadRecord) {
        sink.records++;
        sink.reject(line, value);
      } else if (typeof value !== "object" || value === null || Array.isArray(value)) {
        sink.records++;
        sink.reject(
          line,
          new BadRecord(
            "RAGGED_ROW",
            "malformed",
            "this line is not a JSON object",
            'Write one object per line, e.g. {"x": 1.5, "y": 2}, or pass malformed: "drop"',
          ),
        );
      } else {
        const row = value as Record<string, unknown>;
        sink.record(line, (name) => (Object.hasOwn(row, name) ? row[name] : null));
      }
    }
    line++;
  };
  return {
    push(text) {
      let start = 0;
      const all = rest + text;
      for (let i = all.indexOf("\n"); i !== -1; i = all.indexOf("\n", start)) {
        one(all.slice(start, i));
        start = i + 1;
      }
      rest = all.slice(start);
    },
    end() {
      if (rest !== "") one(rest);
      rest = "";
    },
    line: () => line,
  };
}

/** Positions of the wanted columns in a CSV header, or UNKNOWN_COLUMN / DUPLICATE_HEADER. */
function columnIndex(
  header: readonly string[],
  wanted: readonly string[],
  label: string,
  line: number,
): Map<string, number> {
  const index = new Map<string, number>();
  for (const name of wanted) {
    const at = header.indexOf(name);
    if (at === -1) {
      throw new CurbfitError(
        "UNKNOWN_COLUMN",
        `the header has no column ${JSON.stringify(name)} (columns: ${
          header.slice(0, 20).map((h) => JSON.stringify(h)).join(", ")
        })`,
        "Use one of the listed names; names are case-sensitive",
        { source: label, line, column: name },
      );
    }
    if (header.indexOf(name, at + 1) !== -1) {
      throw new CurbfitError(
        "DUPLICATE_HEADER",
        `the header names column ${JSON.stringify(name)} twice`,
        "Rename one of them",
        { source: label, line, column: name },
      );
    }
    index.set(name, at);
  }
  return index;
}

/**
 * First line of an error's message, without its stack (what a CurbfitError may quote).
 *
 * @example
 * ```ts
 * import { firstLine } from "./read.ts";
 * console.log(firstLine(new Error("socket closed\n    at x"))); // socket closed
 * ```
 */
export function firstLine(cause: unknown): string {
  return (cause instanceof Error ? cause.message : String(cause)).split("\n")[0];
}
