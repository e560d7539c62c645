/**
 * Table loaders: CSV text, files and streams, row objects and column arrays, all turned into
 * one immutable {@link Table} of typed columns under the same rules (see README.md here).
 *
 * @example
 * ```ts
 * import { parseCsv, toTable } from "./mod.ts";
 * const table = parseCsv("x,y\n1,2\n2,4.1\n");
 * toTable(table) === table; // true
 * ```
 *
 * @module
 */
export { parseCsv, readCsv, readCsvStream } from "./csv.ts";
export {
  type CellValue,
  type ColumnArrays,
  isTable,
  type RowObjects,
  tableFromColumns,
  tableFromRows,
  toTable,
} from "./memory.ts";
export type { ColumnKind, CsvOptions, LoadOptions } from "./options.ts";
export type { CategoryColumn, Column, MissingReport, NumericColumn, Table } from "./types.ts";
