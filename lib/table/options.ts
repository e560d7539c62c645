/**
 * Options shared by every loader, and their validation.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { describeValue } from "./describe.ts";
import { DEFAULT_SEPARATOR, separatorProblem } from "./separator.ts";

/** How a column is stored: `"number"` (Float64Array) or `"category"` (sorted levels + codes). */
export type ColumnKind = "number" | "category";

/**
 * Options of every loader.
 *
 * @example
 * ```ts
 * import type { LoadOptions } from "./options.ts";
 * const options: LoadOptions = { missing: "drop", types: { zip: "category" }, source: "sites" };
 * ```
 */
export interface LoadOptions {
  /**
   * What to do with missing values (empty, `NA`, `NaN`, `null`; in memory also null, undefined
   * and NaN): `"error"` (default) stops at the first one; `"drop"` removes every row that has
   * one and lists those rows in `table.missing.droppedLines`.
   */
  readonly missing?: "error" | "drop";
  /**
   * Column kinds that override detection, by column name. Without an entry a column is numeric
   * when its first non-missing value reads as a number, and a category otherwise.
   */
  readonly types?: Readonly<Record<string, ColumnKind>>;
  /** Label naming the data in messages and in `table.source`; defaults to the loader's label. */
  readonly source?: string;
}

/**
 * Options of the CSV loaders (`parseCsv`, `readCsv`, `readCsvStream`): those of every loader,
 * and the field separator.
 *
 * @example
 * ```ts
 * import type { CsvOptions } from "./options.ts";
 * const semicolons: CsvOptions = { fieldSeparator: ";", missing: "drop" };
 * const tabs: CsvOptions = { fieldSeparator: "\t" };
 * ```
 */
export interface CsvOptions extends LoadOptions {
  /**
   * The one character between fields; `","` when absent. Common others are `";"` (files from
   * spreadsheets set up for a decimal comma), `"\t"` and `"|"`. Not `"`, CR or LF, nor an ASCII
   * letter or digit, `.`, `+` or `-`, which occur inside values. Line ends are found on their
   * own (`\r\n`, `\n` or a bare `\r`).
   */
  readonly fieldSeparator?: string;
}

/** Options after validation, with defaults filled in. */
export interface CheckedOptions {
  readonly policy: "error" | "drop";
  readonly types: ReadonlyMap<string, ColumnKind>;
  readonly source: string;
}

/** CSV options after validation, with defaults filled in. */
export interface CheckedCsvOptions extends CheckedOptions {
  readonly separator: string;
}

const OPTION_NAMES = ["missing", "types", "source"];
const CSV_OPTION_NAMES = [...OPTION_NAMES, "fieldSeparator"];

/**
 * Validates the options of the row and column loaders, throwing `BAD_OPTION` for anything
 * unknown or mistyped (`fieldSeparator` included: rows and columns have no separator).
 *
 * @example
 * ```ts
 * import { checkOptions } from "./options.ts";
 * const checked = checkOptions({ missing: "drop" }, "rows");
 * checked.policy; // "drop"
 * checked.source; // "rows"
 * ```
 */
export function checkOptions(
  options: LoadOptions | undefined,
  defaultSource: string,
): CheckedOptions {
  return checkShared(options, defaultSource, OPTION_NAMES);
}

/**
 * Validates the options of the CSV loaders, throwing `BAD_OPTION` for anything unknown or
 * mistyped.
 *
 * @example
 * ```ts
 * import { checkCsvOptions } from "./options.ts";
 * const checked = checkCsvOptions({ fieldSeparator: ";" }, "CSV text");
 * checked.separator; // ";"
 * checked.source; // "CSV text"
 * ```
 */
export function checkCsvOptions(
  options: CsvOptions | undefined,
  defaultSource: string,
): CheckedCsvOptions {
  const checked = checkShared(options, defaultSource, CSV_OPTION_NAMES);
  return { ...checked, separator: checkFieldSeparator(options?.fieldSeparator) };
}

/**
 * The field separator option checked (`","` when undefined); `BAD_OPTION` naming the option
 * `fieldSeparator` when it is not one character that may separate fields.
 *
 * @example
 * ```ts
 * import { checkFieldSeparator } from "./options.ts";
 * checkFieldSeparator(undefined); // ","
 * checkFieldSeparator("\t"); // "\t" (a tab)
 * ```
 */
export function checkFieldSeparator(value: unknown): string {
  if (value === undefined) return DEFAULT_SEPARATOR;
  const problem = separatorProblem(value);
  if (problem === undefined) return value as string;
  throw badOption(
    "fieldSeparator",
    `fieldSeparator is ${describeValue(value)}, but ${problem}`,
    'Pass one character, such as ";", "|" or "\\t" (a tab); leave it out for a comma',
  );
}

function checkShared(
  options: LoadOptions | undefined,
  defaultSource: string,
  names: readonly string[],
): CheckedOptions {
  if (options === undefined) return { policy: "error", types: new Map(), source: defaultSource };
  if (!isPlainObject(options)) {
    throw badOption(
      "options",
      `options must be an object, not ${describeValue(options)}`,
      'Pass an object such as { missing: "drop" }',
    );
  }
  for (const key of Object.keys(options)) {
    if (key === "fieldSeparator" && !names.includes(key)) {
      throw badOption(
        key,
        "fieldSeparator applies to CSV input only; rows and columns in memory have no separator",
        "Remove it, or read the CSV with parseCsv, readCsv or readCsvStream",
      );
    }
    if (!names.includes(key)) {
      throw badOption(
        key,
        `there is no option ${JSON.stringify(key)}; the options are ${names.join(", ")}`,
        "Remove it, or correct its spelling",
      );
    }
  }
  const { missing = "error", types = {}, source = defaultSource } = options;
  if (missing !== "error" && missing !== "drop") {
    throw badOption(
      "missing",
      `missing must be "error" or "drop", not ${describeValue(missing)}`,
      'Pass missing: "drop" to drop rows with a missing value, or leave it out to stop at the first',
    );
  }
  if (typeof source !== "string" || source.trim() === "") {
    throw badOption(
      "source",
      `source must be a non-blank string, not ${describeValue(source)}`,
      'Pass a label such as "field survey"',
    );
  }
  if (!isPlainObject(types)) {
    throw badOption(
      "types",
      `types must be an object mapping column names to kinds, not ${describeValue(types)}`,
      'Pass types such as { zip: "category" }',
    );
  }
  const kinds = new Map<string, ColumnKind>();
  for (const [name, kind] of Object.entries(types)) {
    if (kind !== "number" && kind !== "category") {
      throw badOption(
        `types.${name}`,
        `the kind must be "number" or "category", not ${describeValue(kind)}`,
        'Use "number" or "category"',
      );
    }
    kinds.set(name, kind);
  }
  return { policy: missing, types: kinds, source };
}

/** True for `{...}` objects (object literals, `Object.create(null)`), not arrays or class instances. */
export function isPlainObject(value: unknown): value is Record<string, unknown> {
  if (typeof value !== "object" || value === null) return false;
  const proto = Object.getPrototypeOf(value);
  return proto === Object.prototype || proto === null;
}

function badOption(option: string, what: string, hint: string): CurbfitError {
  return new CurbfitError("BAD_OPTION", what, hint, { option });
}
