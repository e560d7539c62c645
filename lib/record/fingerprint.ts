/**
 * The data fingerprint of a model-choice record: a SHA-256 digest of a canonical byte encoding
 * of the rows a sweep read, plus a summary of each column (numeric range, category levels) and
 * the missing-value provenance. The byte layout ("curbfit.rows/1") is stated in README.md here.
 *
 * @module
 */
import { createHash } from "node:crypto";
import type { Column, Table } from "../table/types.ts";
import { DEFAULT_SEPARATOR } from "../table/separator.ts";

/**
 * Name of the byte encoding hashed into `sha256`; changing the layout needs a new name.
 *
 * @example
 * ```ts
 * import { ROW_ENCODING } from "./fingerprint.ts";
 * console.log(ROW_ENCODING); // curbfit.rows/1
 * ```
 */
export const ROW_ENCODING = "curbfit.rows/1";

/**
 * Summary of one fingerprinted numeric column over the rows used.
 *
 * @example
 * ```ts
 * import type { NumberColumnSummary } from "./fingerprint.ts";
 * const range: NumberColumnSummary = { name: "x", kind: "number", min: 0, max: 10 };
 * ```
 */
export interface NumberColumnSummary {
  /** Column name. */
  readonly name: string;
  /** Numbers. */
  readonly kind: "number";
  /** Smallest value over the rows used. */
  readonly min: number;
  /** Largest value over the rows used. */
  readonly max: number;
}

/**
 * Summary of one fingerprinted category column: the table's sorted level list.
 *
 * @example
 * ```ts
 * import type { CategoryColumnSummary } from "./fingerprint.ts";
 * const sites: CategoryColumnSummary = { name: "site", kind: "category", levels: ["east", "west"] };
 * ```
 */
export interface CategoryColumnSummary {
  /** Column name. */
  readonly name: string;
  /** Categories. */
  readonly kind: "category";
  /** The table's levels, sorted; the first is the reference level of indicators. */
  readonly levels: readonly string[];
}

/**
 * One fingerprinted column.
 *
 * @example
 * ```ts
 * import type { ColumnSummary } from "./fingerprint.ts";
 * const describe = (c: ColumnSummary) =>
 *   c.kind === "number" ? `${c.name} in [${c.min}, ${c.max}]` : `${c.name}: ${c.levels.join(", ")}`;
 * ```
 */
export type ColumnSummary = NumberColumnSummary | CategoryColumnSummary;

/**
 * Where the rows came from and what they hash to. Key order is the record's key order.
 *
 * @example
 * ```ts
 * import type { DataSummary } from "./fingerprint.ts";
 * const short = (d: DataSummary) => `${d.rows} rows, ${d.sha256.slice(0, 12)}…`;
 * ```
 */
export interface DataSummary {
  /** The table's source label: a file path, "CSV text", "stream", "rows" or "columns". */
  readonly source: string;
  /**
   * The field separator the CSV was read with when it was not the comma (`table.fieldSeparator`);
   * absent for commas and for rows and columns in memory.
   */
  readonly fieldSeparator?: string;
  /** Rows used (after the missing-value policy). */
  readonly rows: number;
  /** The columns the model read, sorted by name (UTF-16 code units). */
  readonly columns: readonly ColumnSummary[];
  /** The missing-value policy and the source lines of the rows it dropped. */
  readonly missing: { readonly policy: "error" | "drop"; readonly droppedLines: readonly number[] };
  /** The byte encoding hashed into `sha256` (`ROW_ENCODING`). */
  readonly encoding: string;
  /** SHA-256 of the `curbfit.rows/1` encoding, 64 lowercase hex digits. */
  readonly sha256: string;
}

/**
 * Summarizes and fingerprints the named columns of `table` (names absent from the table are
 * skipped: the caller reports them). Columns are taken in sorted name order, so the digest does
 * not depend on the order of columns in the source or of terms in a spec. The field separator
 * of a CSV table read with one other than the comma is kept beside the source; it does not
 * enter the digest, which depends on the parsed rows alone.
 *
 * @example
 * ```ts
 * import { summarizeData } from "./fingerprint.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const s = summarizeData(tableFromColumns({ y: [1, 2], x: [0.5, 3] }), ["y", "x"]);
 * console.log(s.columns.map((c) => c.name), s.rows, s.sha256.length); // [ "x", "y" ] 2 64
 * ```
 */
export function summarizeData(table: Table, names: readonly string[]): DataSummary {
  const columns = [...new Set(names)].sort().flatMap((name) => {
    const column = table.columns.get(name);
    return column === undefined ? [] : [column];
  });
  const { sha256, ranges } = digestRows(table.nRows, columns);
  const separator = table.fieldSeparator;
  return {
    source: table.source,
    ...(separator === undefined || separator === DEFAULT_SEPARATOR
      ? {}
      : { fieldSeparator: separator }),
    rows: table.nRows,
    columns: columns.map((column, j) => summarizeColumn(column, ranges[j])),
    missing: { policy: table.missing.policy, droppedLines: [...table.missing.droppedLines] },
    encoding: ROW_ENCODING,
    sha256,
  };
}

/** A numeric column's [min, max]; null for a category column. */
type Range = readonly [number, number] | null;

function summarizeColumn(column: Column, range: Range): ColumnSummary {
  if (column.kind === "category") {
    return { name: column.name, kind: "category", levels: [...column.levels] };
  }
  const [min, max] = range ?? [Infinity, -Infinity];
  return { name: column.name, kind: "number", min, max };
}

/** Smallest and largest value of each numeric column (null for categories). */
function columnRanges(columns: readonly Column[]): Range[] {
  return columns.map((column) => {
    if (column.kind === "category") return null;
    const values = column.values;
    let min = Infinity;
    let max = -Infinity;
    for (let i = 0; i < values.length; i++) {
      const v = values[i];
      if (v < min) min = v;
      if (v > max) max = v;
    }
    return [min, max];
  });
}

const KIND_BYTE = { number: 0x4e, category: 0x43 } as const; // "N", "C"
const CHUNK = 1 << 16;

/**
 * SHA-256 (FIPS 180-4, via node:crypto) of the `curbfit.rows/1` bytes of `columns` over
 * `nRows` rows, as 64 lowercase hex digits. All integers little-endian:
 * 1. the ASCII text `curbfit.rows/1` and one line feed (0x0a);
 * 2. the row count as uint64, the column count as uint32;
 * 3. per column: name byte length (uint32), the name in UTF-8, kind byte `N` (0x4e, numbers)
 *    or `C` (0x43, categories);
 * 4. row by row, and within a row column by column: a number as its 8 IEEE-754 binary64
 *    bytes (as stored: −0 and 0 differ), a category as its level's UTF-8 byte length (uint32)
 *    and bytes.
 *
 * @example
 * ```ts
 * import { rowsDigest } from "./fingerprint.ts";
 * const x = { kind: "number" as const, name: "x", values: Float64Array.of(1, 2) };
 * console.log(rowsDigest(2, [x]).length); // 64
 * ```
 */
export function rowsDigest(nRows: number, columns: readonly Column[]): string {
  return digestRows(nRows, columns).sha256;
}

/**
 * The digest of `rowsDigest` and each column's range. All-numeric rows (the common case) are
 * hashed a block of rows at a time and their ranges found in the same read of the columns.
 */
function digestRows(
  nRows: number,
  columns: readonly Column[],
): { sha256: string; ranges: Range[] } {
  const hash = createHash("sha256");
  const utf8 = new TextEncoder();
  const out = new ByteWriter((bytes) => hash.update(bytes));
  out.bytes(utf8.encode(`${ROW_ENCODING}\n`));
  out.uint64(nRows);
  out.uint32(columns.length);
  for (const column of columns) {
    out.text(utf8.encode(column.name));
    out.byte(KIND_BYTE[column.kind]);
  }
  const numeric = columns.flatMap((c) => (c.kind === "number" ? [c.values] : []));
  if (LITTLE_ENDIAN && numeric.length === columns.length && numeric.length > 0) {
    out.flush();
    const ranges = hashNumericRows(nRows, numeric, (bytes) => hash.update(bytes));
    return { sha256: hash.digest("hex"), ranges };
  }
  const levelBytes = columns.map((c) =>
    c.kind === "category" ? c.levels.map((level) => utf8.encode(level)) : []
  );
  for (let i = 0; i < nRows; i++) {
    columns.forEach((column, j) => {
      if (column.kind === "number") out.float64(column.values[i]);
      else out.text(levelBytes[j][column.codes[i]]);
    });
  }
  out.flush();
  return { sha256: hash.digest("hex"), ranges: columnRanges(columns) };
}

/** Whether this machine stores doubles little-endian (then Float64Array bytes are the layout). */
const LITTLE_ENDIAN = new Uint8Array(Float64Array.of(1).buffer)[7] === 0x3f;

/**
 * Step 4 for all-numeric rows: the same bytes, written a block of rows at a time; returns each
 * column's [min, max], found while its values are copied.
 */
function hashNumericRows(
  nRows: number,
  values: readonly Float64Array[],
  sink: (bytes: Uint8Array) => void,
): Range[] {
  const c = values.length;
  const rowsPerBlock = Math.max(1, Math.floor(CHUNK / (8 * c)));
  const block = new Float64Array(rowsPerBlock * c);
  const mins = new Float64Array(c).fill(Infinity);
  const maxes = new Float64Array(c).fill(-Infinity);
  for (let start = 0; start < nRows; start += rowsPerBlock) {
    const m = Math.min(rowsPerBlock, nRows - start);
    for (let j = 0; j < c; j++) {
      const v = values[j];
      let min = mins[j];
      let max = maxes[j];
      for (let i = 0; i < m; i++) {
        const x = v[start + i];
        block[i * c + j] = x;
        if (x < min) min = x;
        if (x > max) max = x;
      }
      mins[j] = min;
      maxes[j] = max;
    }
    sink(new Uint8Array(block.buffer, 0, m * c * 8));
  }
  return Array.from(mins, (min, j) => [min, maxes[j]] as const);
}

/** Little-endian writer into a reused buffer, handing full chunks to a synchronous `sink`. */
class ByteWriter {
  readonly #buffer = new Uint8Array(CHUNK);
  readonly #view = new DataView(this.#buffer.buffer);
  readonly #sink: (bytes: Uint8Array) => void;
  #used = 0;

  constructor(sink: (bytes: Uint8Array) => void) {
    this.#sink = sink;
  }

  byte(value: number): void {
    this.#room(1);
    this.#buffer[this.#used++] = value;
  }

  uint32(value: number): void {
    this.#room(4);
    this.#view.setUint32(this.#used, value, true);
    this.#used += 4;
  }

  uint64(value: number): void {
    this.#room(8);
    this.#view.setBigUint64(this.#used, BigInt(value), true);
    this.#used += 8;
  }

  float64(value: number): void {
    this.#room(8);
    this.#view.setFloat64(this.#used, value, true);
    this.#used += 8;
  }

  /** Length (uint32) then the bytes. */
  text(bytes: Uint8Array): void {
    this.uint32(bytes.length);
    this.bytes(bytes);
  }

  bytes(bytes: Uint8Array): void {
    if (bytes.length > CHUNK) {
      this.flush();
      this.#sink(bytes);
      return;
    }
    this.#room(bytes.length);
    this.#buffer.set(bytes, this.#used);
    this.#used += bytes.length;
  }

  flush(): void {
    if (this.#used > 0) this.#sink(this.#buffer.subarray(0, this.#used));
    this.#used = 0;
  }

  #room(size: number): void {
    if (this.#used + size > CHUNK) this.flush();
  }
}
