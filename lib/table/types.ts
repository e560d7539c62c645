/**
 * The table: typed columns with provenance. Produced by the loaders in this folder, read by the
 * design. Tables are immutable; loaders copy caller data.
 *
 * @module
 */

/** A numeric column: float64 values, never NaN or ±Infinity once inside a table. */
export interface NumericColumn {
  /** Discriminant: always "number". */
  readonly kind: "number";
  /** Column name as in the source header or input key. */
  readonly name: string;
  /** One value per kept row, in row order. */
  readonly values: Float64Array;
}

/** A text column stored as categories: `levels` sorted (first level is the reference). */
export interface CategoryColumn {
  /** Discriminant: always "category". */
  readonly kind: "category";
  /** Column name as in the source header or input key. */
  readonly name: string;
  /** Distinct values seen in kept rows, sorted by UTF-16 code units (JavaScript's default sort). */
  readonly levels: readonly string[];
  /** Index into `levels` for each row. */
  readonly codes: Int32Array;
}

/** One column of a table. */
export type Column = NumericColumn | CategoryColumn;

/** What happened to missing values on the way in. */
export interface MissingReport {
  /** "error" (default): any missing value is an error. "drop": rows with one are removed. */
  readonly policy: "error" | "drop";
  /** Source line numbers (1-based; for rows/columns input: 1-based row numbers) of dropped rows. */
  readonly droppedLines: readonly number[];
}

/** A loaded table. */
export interface Table {
  /** Number of rows kept (after any rows dropped for missing values). */
  readonly nRows: number;
  /** Column names in source order. */
  readonly names: readonly string[];
  /** Columns by name, in source order. */
  readonly columns: ReadonlyMap<string, Column>;
  /** Where the data came from: a file path, "CSV text", "stream", "rows" or "columns". */
  readonly source: string;
  /**
   * The field separator CSV input was read with, when it was not the comma (`";"`, `"\t"`, …);
   * absent for comma-separated CSV and for rows and columns in memory. Model-choice records
   * keep it, so their data can be read again the same way (lib/record/README.md).
   */
  readonly fieldSeparator?: string;
  /** Source line (or 1-based row number) of each kept row, for messages that point at data. */
  readonly lineOfRow: Int32Array;
  /** The missing-value policy applied and which source rows it dropped. */
  readonly missing: MissingReport;
}
