/**
 * Options shared by every loader, and their validation.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { describeValue } from "./describe.ts";

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

/** Options after validation, with defaults filled in. */
export interface CheckedOptions {
  readonly policy: "error" | "drop";
  readonly types: ReadonlyMap<string, ColumnKind>;
  readonly source: string;
}

const OPTION_NAMES = ["missing", "types", "source"];

/**
 * Validates loader options, throwing `BAD_OPTION` for anything unknown or mistyped.
 *
 * @example
 * ```ts
 * import { checkOptions } from "./options.ts";
 * const checked = checkOptions({ missing: "drop" }, "CSV text");
 * checked.policy; // "drop"
 * checked.source; // "CSV text"
 * ```
 */
export function checkOptions(
  options: LoadOptions | undefined,
  defaultSource: string,
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
    if (!OPTION_NAMES.includes(key)) {
      throw badOption(
        key,
        `there is no option ${JSON.stringify(key)}; the options are ${OPTION_NAMES.join(", ")}`,
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
