/**
 * Tables from data already in memory: row objects, column arrays, or an existing table.
 * The caller's objects and arrays are only read, never changed; the table holds copies.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { TableBuilder } from "./builder.ts";
import { checkOptions, isPlainObject, type LoadOptions } from "./options.ts";
import { count, describeValue } from "./describe.ts";
import type { Table } from "./types.ts";

/** Values a column array may hold (strings are read like CSV fields). */
export type CellValue = number | string | null | undefined;

/** Column arrays by name, all of the same length. */
export type ColumnArrays = Readonly<Record<string, ArrayLike<CellValue>>>;

/** Row objects, one per row, keyed by column name. */
export type RowObjects = readonly Readonly<Record<string, unknown>>[];

/**
 * Builds a {@link Table} from row objects. Columns are the keys in order of first appearance
 * (a key a row lacks is missing there). Values may be numbers, bigints, strings (read like CSV
 * fields), or null / undefined / NaN for missing. Rows are numbered from 1 in messages and in
 * `lineOfRow` / `missing.droppedLines`. The source label defaults to `"rows"`.
 *
 * @example
 * ```ts
 * import { tableFromRows } from "./memory.ts";
 * const table = tableFromRows([
 *   { speed: 12.5, surface: "gravel" },
 *   { speed: null, surface: "asphalt" },
 *   { speed: 30, surface: "asphalt" },
 * ], { missing: "drop" });
 * table.nRows; // 2
 * table.missing.droppedLines; // [2]
 * ```
 */
export function tableFromRows(rows: RowObjects, options?: LoadOptions): Table {
  const checked = checkOptions(options, "rows");
  if (!Array.isArray(rows)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `tableFromRows takes an array of row objects, but was given ${describeValue(rows)}`,
      "Pass an array such as [{ x: 1, y: 2 }, { x: 2, y: 3 }]",
      { option: "rows" },
    );
  }
  const names: string[] = [];
  const seen = new Set<string>();
  rows.forEach((row, i) => {
    if (typeof row !== "object" || row === null || Array.isArray(row)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `row ${i + 1} is ${describeValue(row)}, not an object`,
        "Make every row an object such as { x: 1, y: 2 }",
        { source: checked.source, line: i + 1 },
      );
    }
    for (const name of Object.keys(row)) {
      if (!seen.has(name)) {
        seen.add(name);
        names.push(name);
      }
    }
  });
  if (names.length === 0) {
    throw new CurbfitError(
      "EMPTY_INPUT",
      rows.length === 0 ? "there are no rows" : "the rows have no keys, so there are no columns",
      "Pass at least one row object with the column names as keys",
      { source: checked.source },
    );
  }
  const builder = new TableBuilder(names, checked);
  const values = new Array<unknown>(names.length);
  rows.forEach((row, i) => {
    for (let j = 0; j < names.length; j++) values[j] = row[names[j]];
    builder.addRow(values, i + 1);
  });
  return builder.finish();
}

/**
 * Builds a {@link Table} from column arrays of equal length (plain arrays or typed arrays such as
 * Float64Array). Values follow the rules of {@link tableFromRows}. The source label defaults to
 * `"columns"`.
 *
 * @example
 * ```ts
 * import { tableFromColumns } from "./memory.ts";
 * const table = tableFromColumns({
 *   hour: new Float64Array([0, 6, 12, 18]),
 *   shift: ["night", "day", "day", "night"],
 * });
 * table.columns.get("shift"); // { kind: "category", levels: ["day", "night"], codes: [1, 0, 0, 1] }
 * ```
 */
export function tableFromColumns(columns: ColumnArrays, options?: LoadOptions): Table {
  const checked = checkOptions(options, "columns");
  if (typeof columns !== "object" || columns === null || Array.isArray(columns)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `tableFromColumns takes an object of column arrays, but was given ${describeValue(columns)}`,
      "Pass an object such as { x: [1, 2, 3], y: [2, 4, 5] }",
      { option: "columns" },
    );
  }
  const names = Object.keys(columns);
  if (names.length === 0) {
    throw new CurbfitError(
      "EMPTY_INPUT",
      "there are no columns",
      "Pass at least one column, such as { x: [1, 2, 3] }",
      { source: checked.source },
    );
  }
  const arrays = names.map((name) => columns[name]);
  arrays.forEach((array, j) => {
    if (typeof array !== "object" || array === null || typeof array.length !== "number") {
      throw new CurbfitError(
        "BAD_OPTION",
        `the column is ${describeValue(array)}, not an array`,
        "Give every column as an array or a typed array",
        { source: checked.source, column: names[j] },
      );
    }
    if (array.length !== arrays[0].length) {
      throw new CurbfitError(
        "RAGGED_ROW",
        `the column has ${count(array.length, "value")}, but column ${
          JSON.stringify(names[0])
        } has ${arrays[0].length}`,
        "Give every column the same number of values",
        { source: checked.source, column: names[j] },
      );
    }
  });
  const builder = new TableBuilder(names, checked);
  const values = new Array<unknown>(names.length);
  for (let i = 0; i < arrays[0].length; i++) {
    for (let j = 0; j < names.length; j++) values[j] = arrays[j][i];
    builder.addRow(values, i + 1);
  }
  return builder.finish();
}

/**
 * Whether `value` is a {@link Table} (as made by the loaders): checks its shape.
 *
 * @example
 * ```ts
 * import { isTable, tableFromColumns } from "./memory.ts";
 * isTable(tableFromColumns({ x: [1, 2] })); // true
 * isTable({ x: [1, 2] }); // false
 * ```
 */
export function isTable(value: unknown): value is Table {
  if (typeof value !== "object" || value === null) return false;
  const t = value as Partial<Record<keyof Table, unknown>>;
  return typeof t.nRows === "number" && Array.isArray(t.names) && t.columns instanceof Map &&
    typeof t.source === "string" && t.lineOfRow instanceof Int32Array &&
    typeof t.missing === "object" && t.missing !== null;
}

/**
 * Turns whatever data a caller passes into a {@link Table}: a table is returned unchanged (the
 * options are then not used), an array is read as row objects ({@link tableFromRows}), any other
 * object as column arrays ({@link tableFromColumns}). CSV text and files go through
 * {@link parseCsv} / {@link readCsv} first.
 *
 * @example
 * ```ts
 * import { toTable } from "./memory.ts";
 * const fromRows = toTable([{ x: 1, y: 2 }, { x: 2, y: 4.5 }]);
 * const fromColumns = toTable({ x: [1, 2], y: [2, 4.5] });
 * toTable(fromRows) === fromRows; // true
 * fromColumns.nRows; // 2
 * ```
 */
export function toTable(data: Table | RowObjects | ColumnArrays, options?: LoadOptions): Table {
  if (isTable(data)) return data;
  if (Array.isArray(data)) return tableFromRows(data, options);
  if (isPlainObject(data)) return tableFromColumns(data as ColumnArrays, options);
  const value = data as unknown;
  const hint = typeof value === "string"
    ? "For CSV text use parseCsv(text); for a file use await readCsv(path)"
    : typeof (value as { then?: unknown })?.then === "function"
    ? "It is a promise: await it first, e.g. toTable(await readCsv(path))"
    : "Pass a table, an array of row objects, or an object of column arrays";
  throw new CurbfitError(
    "BAD_OPTION",
    `the data is ${describeValue(value)}, which is not a table, rows or columns`,
    hint,
    { option: "data" },
  );
}
