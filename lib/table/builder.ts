/**
 * Builds a {@link Table} row by row from text tokens or in-memory values: checks column names,
 * decides column kinds, checks every value, applies the missing-value policy and freezes the
 * result. Every loader goes through here, so CSV text, row objects and column arrays follow
 * exactly the same rules.
 *
 * @module
 */
import { CurbfitError, type ErrorPlace } from "../errors/error.ts";
import type { CategoryColumn, Column, NumericColumn, Table } from "./types.ts";
import {
  isInfinityWord,
  isMissingToken,
  LARGEST_MAGNITUDE,
  looksNumeric,
  parseDecimal,
} from "./values.ts";
import type { CheckedOptions, ColumnKind } from "./options.ts";
import { describeValue } from "./describe.ts";
import { Blocks } from "./blocks.ts";
import { tableBundle, withDisplay } from "../views/display.ts";

/** Marks a missing entry of a category column while loading (numeric columns use NaN). */
const MISSING_CODE = -1;

const newFloats = (n: number) => new Float64Array(n);
const newInts = (n: number) => new Int32Array(n);

/**
 * A copy of `s` that does not point into a larger string. V8 may make a substring a view of the
 * text it was cut from; a level kept as such a view would keep a whole chunk of the input alive.
 */
function detached(s: string): string {
  return (" " + s).slice(1);
}

/** How a column got its kind, for messages: from `types`, or from a value on some line. */
type KindOrigin = { readonly fromTypes: true } | {
  readonly fromTypes: false;
  readonly written: string;
  readonly line: number;
};

/** Accumulates one column; its kind is fixed by `types` or else by its first non-missing value. */
class ColumnBuilder {
  readonly name: string;
  readonly #source: string;
  #kind: ColumnKind | undefined;
  #origin: KindOrigin | undefined;
  /** Rows added so far. */
  #n = 0;
  /** Non-missing values added so far. */
  #present = 0;
  #values = new Blocks(newFloats);
  #codes = new Blocks(newInts);
  /** Level → provisional code (order of first appearance); renumbered in `finish`. */
  readonly #codeOf = new Map<string, number>();
  readonly #levels: string[] = [];

  constructor(name: string, kind: ColumnKind | undefined, source: string) {
    this.name = name;
    this.#source = source;
    this.#kind = kind;
    if (kind !== undefined) this.#origin = { fromTypes: true };
  }

  /** Whether any value so far is not missing. */
  get hasValues(): boolean {
    return this.#present > 0;
  }

  /**
   * Adds one value: a text token, or a number, bigint, null or undefined. Returns true when the
   * value is missing; throws for values that cannot be stored.
   */
  add(value: unknown, line: number): boolean {
    if (typeof value === "string") return this.#addText(value, line);
    if (value === null || value === undefined || Number.isNaN(value)) {
      this.#addMissing();
      return true;
    }
    if (typeof value !== "number" && typeof value !== "bigint") {
      throw new CurbfitError(
        "BAD_NUMBER",
        `the value is ${describeValue(value)}, which is neither a number nor text`,
        "Convert it to a number, or to text for a category, before loading",
        this.#place(line),
      );
    }
    const written = String(value);
    const v = Number(value);
    if (!Number.isFinite(v)) throw this.#valueError("NOT_FINITE", written, line);
    if (this.#kind === undefined) this.#fix("number", written, line);
    if (this.#kind === "number") this.#addNumber(v, written, line);
    else this.#addLevel(written);
    return false;
  }

  #addText(token: string, line: number): boolean {
    if (this.#kind === "number") {
      // Most tokens of a numeric column are numbers: try that first.
      const v = parseDecimal(token);
      if (Number.isFinite(v)) {
        this.#addNumber(v, token, line);
        return false;
      }
      if (isMissingToken(token)) {
        this.#addMissing();
        return true;
      }
      const code = Number.isNaN(v) && !isInfinityWord(token) ? "BAD_NUMBER" : "NOT_FINITE";
      throw this.#valueError(code, token, line);
    }
    if (isMissingToken(token)) {
      this.#addMissing();
      return true;
    }
    if (this.#kind === undefined) {
      this.#fix(looksNumeric(token) ? "number" : "category", token, line);
      if (this.#kind === "number") return this.#addText(token, line);
    }
    this.#addLevel(token);
    return false;
  }

  #addNumber(v: number, written: string, line: number): void {
    if (Math.abs(v) >= LARGEST_MAGNITUDE) throw this.#valueError("TOO_LARGE", written, line);
    this.#values.push(v);
    this.#n++;
    this.#present++;
  }

  #addLevel(level: string): void {
    let code = this.#codeOf.get(level);
    if (code === undefined) {
      code = this.#levels.length;
      const own = detached(level);
      this.#codeOf.set(own, code);
      this.#levels.push(own);
    }
    this.#codes.push(code);
    this.#n++;
    this.#present++;
  }

  #addMissing(): void {
    if (this.#kind === "number") this.#values.push(NaN);
    else if (this.#kind === "category") this.#codes.push(MISSING_CODE);
    this.#n++;
  }

  /** Fixes the kind from a first non-missing value; the rows before it were all missing. */
  #fix(kind: ColumnKind, written: string, line: number): void {
    this.#kind = kind;
    this.#origin = { fromTypes: false, written, line };
    for (let i = 0; i < this.#n; i++) {
      if (kind === "number") this.#values.push(NaN);
      else this.#codes.push(MISSING_CODE);
    }
  }

  /** The finished column, keeping the rows whose `keep` entry is 1 (all rows when omitted). */
  finish(keep: Uint8Array | undefined): Column {
    if (this.#kind === "number") {
      const column: NumericColumn = {
        kind: "number",
        name: this.name,
        values: this.#values.collect(keep),
      };
      return Object.freeze(column);
    }
    const codes = this.#codes.collect(keep);
    // Levels of the kept rows only (a level seen only in dropped rows would describe no row),
    // sorted by UTF-16 code units (the default sort order); codes renumbered to match.
    const used = new Uint8Array(this.#levels.length);
    for (const code of codes) used[code] = 1;
    const levels = this.#levels.filter((_, code) => used[code] === 1).sort();
    const renumber = new Int32Array(this.#levels.length);
    levels.forEach((level, i) => renumber[this.#codeOf.get(level)!] = i);
    for (let i = 0; i < codes.length; i++) codes[i] = renumber[codes[i]];
    const column: CategoryColumn = {
      kind: "category",
      name: this.name,
      levels: Object.freeze(levels),
      codes,
    };
    return Object.freeze(column);
  }

  #place(line: number): ErrorPlace {
    return { source: this.#source, line, column: this.name };
  }

  #valueError(
    code: "BAD_NUMBER" | "NOT_FINITE" | "TOO_LARGE",
    written: string,
    line: number,
  ): CurbfitError {
    const shown = JSON.stringify(written);
    const name = JSON.stringify(this.name);
    switch (code) {
      case "BAD_NUMBER": {
        const origin = this.#origin;
        const why = origin === undefined || origin.fromTypes
          ? 'types says it is "number"'
          : `its first value, ${
            JSON.stringify(origin.written)
          } on line ${origin.line}, is a number`;
        return new CurbfitError(
          code,
          `${shown} is not a number, but the column is numeric (${why})`,
          `If column ${name} holds text, load it with types: { ${optionKey(this.name)}: ` +
            '"category" }; write a missing value as empty, NA, NaN or null',
          this.#place(line),
        );
      }
      case "NOT_FINITE":
        return new CurbfitError(
          code,
          `${shown} is not a finite number`,
          "Replace it with a finite value, or write it as missing (empty or NA) and load with " +
            'missing: "drop"',
          this.#place(line),
        );
      case "TOO_LARGE":
        return new CurbfitError(
          code,
          `${shown} has magnitude >= 2^500 (about 3.27e150), so its square could overflow sums ` +
            "of squares",
          `Rescale column ${name} (for example divide it by a power of ten) before loading`,
          this.#place(line),
        );
    }
  }
}

/** `name` as it would be written as an object key in code: bare if it is an identifier. */
function optionKey(name: string): string {
  return /^[A-Za-z_$][\w$]*$/.test(name) ? name : JSON.stringify(name);
}

/** The first missing value met, for the MISSING_VALUE message. */
interface MissingSeen {
  readonly line: number;
  readonly column: string;
  readonly written: unknown;
}

/**
 * Collects rows into typed columns and turns them into a frozen {@link Table}.
 *
 * @example
 * ```ts
 * import { TableBuilder } from "./builder.ts";
 * import { checkOptions } from "./options.ts";
 * const b = new TableBuilder(["x", "site"], checkOptions(undefined, "demo"));
 * b.addRow(["1.5", "north"], 2);
 * b.addRow([2, "south"], 3);
 * const table = b.finish();
 * table.nRows; // 2
 * ```
 */
export class TableBuilder {
  readonly #names: readonly string[];
  readonly #options: CheckedOptions;
  readonly #columns: ColumnBuilder[];
  #rows = 0;
  readonly #lines = new Blocks(newInts);
  /** Indices of rows with a missing value. */
  readonly #missingRows: number[] = [];
  #firstMissing: MissingSeen | undefined;

  /**
   * Starts a table with these column names (checked: none blank, no duplicates, every name in
   * `types` present). `headerLine` is the source line of the names, when they come from text.
   */
  constructor(names: readonly string[], options: CheckedOptions, headerLine?: number) {
    checkNames(names, options, headerLine);
    this.#names = Object.freeze([...names]);
    this.#options = options;
    this.#columns = names.map((name) =>
      new ColumnBuilder(name, options.types.get(name), options.source)
    );
  }

  /** Adds a row: one value per column, in column order. `line` locates it in the source. */
  addRow(values: ArrayLike<unknown>, line: number): void {
    const columns = this.#columns;
    let missingAt = -1;
    for (let j = 0; j < columns.length; j++) {
      if (columns[j].add(values[j], line) && missingAt < 0) missingAt = j;
    }
    if (missingAt >= 0) {
      this.#missingRows.push(this.#rows);
      this.#firstMissing ??= { line, column: this.#names[missingAt], written: values[missingAt] };
    }
    this.#lines.push(line);
    this.#rows++;
  }

  /**
   * Checks the whole table (rows, all-missing columns, missing policy) and freezes it.
   * `fieldSeparator` is kept as `table.fieldSeparator` (the CSV loaders pass one that is not
   * the comma).
   */
  finish(fieldSeparator?: string): Table {
    const { source, policy } = this.#options;
    if (this.#rows === 0) {
      throw new CurbfitError(
        "NO_ROWS",
        "there are column names but no data rows",
        "Add data rows below the column names",
        { source },
      );
    }
    const empty = this.#columns.find((column) => !column.hasValues);
    if (empty !== undefined) {
      throw new CurbfitError(
        "ALL_MISSING",
        `every value of this column (${this.#rows} rows) is missing`,
        "Remove the column, or fill it in; missing values are written as empty, NA, NaN or null",
        { source, column: empty.name },
      );
    }
    const missingRows = this.#missingRows;
    const first = this.#firstMissing;
    if (first !== undefined && policy === "error") {
      throw new CurbfitError(
        "MISSING_VALUE",
        `the value is missing (${describeValue(first.written)}); rows with a missing value: ` +
          `${missingRows.length} of ${this.#rows}`,
        'Fill in the missing values, or load with missing: "drop" to drop those rows (they are ' +
          "then listed in table.missing.droppedLines)",
        { source, line: first.line, column: first.column },
      );
    }
    if (missingRows.length === this.#rows) {
      throw new CurbfitError(
        "NO_ROWS",
        `every one of the ${this.#rows} rows has a missing value, so dropping them leaves no rows`,
        "Fill in the missing values, or leave out the columns that have most of them",
        { source },
      );
    }
    const lines = this.#lines.collect();
    const keep = missingRows.length === 0 ? undefined : keepMask(this.#rows, missingRows);
    const columns = new Map<string, Column>();
    for (const column of this.#columns) columns.set(column.name, column.finish(keep));
    const table: Table = {
      nRows: this.#rows - missingRows.length,
      names: this.#names,
      columns,
      source,
      ...(fieldSeparator === undefined ? {} : { fieldSeparator }),
      lineOfRow: keep === undefined ? lines : this.#lines.collect(keep),
      missing: Object.freeze({
        policy,
        droppedLines: Object.freeze(missingRows.map((row) => lines[row])),
      }),
    };
    // In a notebook a table shows its summary (a non-enumerable display method).
    return Object.freeze(withDisplay(table, tableBundle));
  }
}

/** 1 for each of `n` rows except the `dropped` ones. */
function keepMask(n: number, dropped: readonly number[]): Uint8Array {
  const keep = new Uint8Array(n).fill(1);
  for (const row of dropped) keep[row] = 0;
  return keep;
}

/** Throws BLANK_HEADER, DUPLICATE_HEADER or UNKNOWN_COLUMN for bad column names. */
function checkNames(names: readonly string[], options: CheckedOptions, line?: number): void {
  const { source } = options;
  const fieldOf = new Map<string, number>();
  names.forEach((name, i) => {
    if (name.trim() === "") {
      throw new CurbfitError(
        "BLANK_HEADER",
        `the name of column ${i + 1} is blank`,
        "Give every column a name",
        { source, line, column: String(i + 1) },
      );
    }
    const earlier = fieldOf.get(name);
    if (earlier !== undefined) {
      throw new CurbfitError(
        "DUPLICATE_HEADER",
        `the name is used by both column ${earlier + 1} and column ${i + 1}`,
        "Give every column a different name",
        { source, line, column: name },
      );
    }
    fieldOf.set(name, i);
  });
  for (const name of options.types.keys()) {
    if (!fieldOf.has(name)) {
      throw new CurbfitError(
        "UNKNOWN_COLUMN",
        `types names column ${JSON.stringify(name)}, but there is no such column; the columns are ${
          names.map((n) => JSON.stringify(n)).join(", ")
        }`,
        "Correct the name in types (names are case-sensitive)",
        { source, option: `types.${name}` },
      );
    }
  }
}
