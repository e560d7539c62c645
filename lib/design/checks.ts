/**
 * Shared checks for terms: option validation, column look-up with helpful errors, row lists.
 * Internal to the design folder (not re-exported by mod.ts).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { CategoryColumn, Column, NumericColumn, Table } from "../table/types.ts";
import type { DesignBlock, Term } from "./types.ts";

/**
 * Largest polynomial degree a term accepts.
 *
 * @example
 * ```ts
 * import { MAX_DEGREE } from "./checks.ts";
 * console.log(MAX_DEGREE); // 200
 * ```
 */
export const MAX_DEGREE = 200;

/** How many column names an unknown-column message lists before "and N more". */
const LISTED_NAMES = 20;

/**
 * Checks a polynomial degree option: a whole number from 1 to `MAX_DEGREE`.
 *
 * @example
 * ```ts
 * import { checkDegree } from "./checks.ts";
 * checkDegree(3, "legendre(x, 3)"); // ok
 * ```
 */
export function checkDegree(degree: unknown, label: string): void {
  if (typeof degree === "number" && Number.isInteger(degree) && degree >= 1) {
    if (degree <= MAX_DEGREE) return;
  }
  throw new CurbfitError(
    "BAD_OPTION",
    `${label}: degree must be a whole number from 1 to ${MAX_DEGREE}, not ${show(degree)}`,
    "Pass the highest polynomial order wanted, e.g. 5",
    { option: "degree" },
  );
}

/**
 * Checks a column-name option: a non-empty string.
 *
 * @example
 * ```ts
 * import { checkName } from "./checks.ts";
 * checkName("x", "column"); // ok
 * ```
 */
export function checkName(name: unknown, fn: string): asserts name is string {
  if (typeof name === "string" && name.length > 0) return;
  throw new CurbfitError(
    "BAD_OPTION",
    `${fn}(): column must be a column name (a non-empty string), not ${show(name)}`,
    `Pass the column's name as text, e.g. ${fn}("x")`,
    { option: "column" },
  );
}

/**
 * Checks a domain option `[lo, hi]`: finite numbers with lo < hi and a finite width.
 *
 * @example
 * ```ts
 * import { checkDomain } from "./checks.ts";
 * console.log(checkDomain([0, 1], "legendre(x, 2)")); // [ 0, 1 ]
 * ```
 */
export function checkDomain(domain: unknown, label: string): readonly [number, number] {
  if (Array.isArray(domain) && domain.length === 2) {
    const [lo, hi] = domain;
    if (typeof lo === "number" && typeof hi === "number" && lo < hi && Number.isFinite(hi - lo)) {
      return [lo, hi];
    }
  }
  throw new CurbfitError(
    "BAD_OPTION",
    `${label}: domain must be [lo, hi] with finite lo < hi, not ${show(domain)}`,
    "Pass the interval the column's values are mapped from, e.g. [0, 100], or omit it to learn it",
    { option: "domain" },
  );
}

/**
 * The column `name` of `table`, or an UNKNOWN_COLUMN error that lists the available columns
 * and suggests the nearest name.
 *
 * @example
 * ```ts
 * import { findColumn } from "./checks.ts";
 * const table = {
 *   nRows: 1, names: ["x"], columns: new Map([["x", { kind: "number" as const, name: "x", values: Float64Array.of(1) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * console.log(findColumn(table, "x", "column(x)").kind); // number
 * ```
 */
export function findColumn(table: Table, name: string, label: string): Column {
  const column = table.columns.get(name);
  if (column !== undefined) return column;
  const listed = table.names.slice(0, LISTED_NAMES).map((n) => JSON.stringify(n)).join(", ");
  const more = table.names.length > LISTED_NAMES
    ? ` and ${table.names.length - LISTED_NAMES} more`
    : "";
  const near = nearestName(name, table.names);
  throw new CurbfitError(
    "UNKNOWN_COLUMN",
    `${label} reads column ${JSON.stringify(name)}, but the table has no such column ` +
      `(columns: ${listed === "" ? "none" : listed}${more})`,
    near === undefined
      ? "Use one of the listed column names; names are case-sensitive"
      : `Did you mean ${JSON.stringify(near)}? Names are case-sensitive`,
    { source: table.source, column: name },
  );
}

/**
 * The numeric column `name`, or a clear error when it is missing or holds categories.
 *
 * @example
 * ```ts
 * import { numericColumn } from "./checks.ts";
 * const table = {
 *   nRows: 1, names: ["x"], columns: new Map([["x", { kind: "number" as const, name: "x", values: Float64Array.of(1) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * console.log(numericColumn(table, "x", "column(x)").values); // Float64Array(1) [ 1 ]
 * ```
 */
export function numericColumn(table: Table, name: string, label: string): NumericColumn {
  const column = findColumn(table, name, label);
  if (column.kind === "number") return column;
  throw new CurbfitError(
    "BAD_OPTION",
    `${label} needs numbers, but column ${JSON.stringify(name)} holds categories ` +
      `(${column.levels.length} levels, e.g. ${JSON.stringify(column.levels[0])})`,
    `Use indicators(${JSON.stringify(name)}) for a category column, or fix the values that ` +
      "are not numbers if it should be numeric",
    { source: table.source, column: name },
  );
}

/**
 * The category column `name`, or a clear error when it is missing or holds numbers.
 *
 * @example
 * ```ts
 * import { categoryColumn } from "./checks.ts";
 * const table = {
 *   nRows: 1, names: ["g"],
 *   columns: new Map([["g", { kind: "category" as const, name: "g", levels: ["a"], codes: Int32Array.of(0) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * console.log(categoryColumn(table, "g", "indicators(g)").levels); // [ "a" ]
 * ```
 */
export function categoryColumn(table: Table, name: string, label: string): CategoryColumn {
  const column = findColumn(table, name, label);
  if (column.kind === "category") return column;
  throw new CurbfitError(
    "BAD_OPTION",
    `${label} needs categories, but column ${JSON.stringify(name)} holds numbers`,
    `Use column(${JSON.stringify(name)}), power() or legendre() for a numeric column; ` +
      "load it as text to treat its values as categories",
    { source: table.source, column: name },
  );
}

/**
 * Number of rows selected by `rows` (all of the table when omitted), after checking that every
 * index is a row of `table`.
 *
 * @example
 * ```ts
 * import { rowCount } from "./checks.ts";
 * const table = {
 *   nRows: 3, names: [], columns: new Map(), source: "rows", lineOfRow: Int32Array.of(1, 2, 3),
 *   missing: { policy: "error" as const, droppedLines: [] },
 * };
 * console.log(rowCount(table, Int32Array.of(0, 2), "column(x)")); // 2
 * ```
 */
export function rowCount(table: Table, rows: Int32Array | undefined, label: string): number {
  if (rows === undefined) return table.nRows;
  if (!(rows instanceof Int32Array)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `${label}: option rows must be an Int32Array of 0-based row indices`,
      "Pass Int32Array.from(indices), or omit rows to use every row",
      { option: "rows" },
    );
  }
  for (let i = 0; i < rows.length; i++) {
    const r = rows[i];
    if (r < 0 || r >= table.nRows) {
      throw new CurbfitError(
        "BAD_OPTION",
        `${label}: rows[${i}] is ${r}, but the table has rows 0 to ${table.nRows - 1}`,
        "Pass 0-based row indices of this table",
        { option: "rows", source: table.source },
      );
    }
  }
  return rows.length;
}

/**
 * Checks that `width` columns starting at `offset` fit in `block` and that the block has `n` rows
 * (and trailing parts when the term writes them: `trailing`).
 *
 * @example
 * ```ts
 * import { checkBlock } from "./checks.ts";
 * checkBlock({ n: 2, p: 3, hi: new Float64Array(6), lo: new Float64Array(6) }, 2, 1, 2, "power(x, 2)");
 * ```
 */
export function checkBlock(
  block: DesignBlock,
  n: number,
  offset: number,
  width: number,
  label: string,
  trailing = false,
): void {
  const lo = block.lo === null ? !trailing : block.lo.length === n * block.p;
  const fits = block.n === n && Number.isInteger(offset) && offset >= 0 &&
    offset + width <= block.p && block.hi.length === n * block.p && lo;
  if (fits) return;
  throw new CurbfitError(
    "BAD_OPTION",
    `${label}: cannot write ${n} rows × ${width} columns at column ${offset} into a block of ` +
      `${block.n} rows × ${block.p} columns`,
    "Allocate the block with one row per selected row, room for every term's columns, and " +
      "trailing parts (lo) when a term writes them",
    { option: "block" },
  );
}

/**
 * Smallest and largest value of `values` over the selected rows; TOO_FEW_ROWS when none.
 *
 * @example
 * ```ts
 * import { valueRange } from "./checks.ts";
 * console.log(valueRange(Float64Array.of(3, 1, 2), undefined, 3, "column(x)")); // [ 1, 3 ]
 * ```
 */
export function valueRange(
  values: Float64Array,
  rows: Int32Array | undefined,
  n: number,
  label: string,
): [number, number] {
  if (n === 0) {
    throw new CurbfitError(
      "TOO_FEW_ROWS",
      `${label}: no training rows to learn from`,
      "Pass at least one training row (two distinct values for legendre)",
      { option: "rows" },
    );
  }
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < n; i++) {
    const v = values[rows === undefined ? i : rows[i]];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  return [lo, hi];
}

/**
 * Refuses a value that is not a term (e.g. a column name passed where a term belongs), naming
 * the function and option, e.g. `checkTerm(side, "product()", "left")`.
 *
 * @example
 * ```ts
 * import { checkTerm } from "./checks.ts";
 * import { column } from "./power.ts";
 * checkTerm(column("x"), "learnTerms()", "terms[0]"); // ok
 * ```
 */
export function checkTerm(value: unknown, fn: string, option: string): asserts value is Term {
  const ok = typeof value === "object" && value !== null && "learn" in value &&
    typeof value.learn === "function" && "label" in value && typeof value.label === "string";
  if (ok) return;
  throw new CurbfitError(
    "BAD_OPTION",
    `${fn}: ${option} must be a term, not ${show(value)}`,
    'Build terms with column(), power(), legendre(), indicators() or product(), e.g. column("dose")',
    { option },
  );
}

/** The closest name by edit distance when it is close enough to be a likely typo. */
function nearestName(name: string, names: readonly string[]): string | undefined {
  const lower = name.toLowerCase();
  const sameIgnoringCase = names.find((n) => n.toLowerCase() === lower);
  if (sameIgnoringCase !== undefined) return sameIgnoringCase;
  let best: string | undefined;
  let bestDistance = Math.max(1, Math.floor(name.length / 3));
  for (const candidate of names) {
    const d = editDistance(lower, candidate.toLowerCase());
    if (d <= bestDistance && (best === undefined || d < bestDistance)) {
      best = candidate;
      bestDistance = d;
    }
  }
  return best;
}

/** Levenshtein distance (insertions, deletions, substitutions), two-row dynamic programme. */
function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const current = [i];
    for (let j = 1; j <= b.length; j++) {
      const substitute = previous[j - 1] + (a[i - 1] === b[j - 1] ? 0 : 1);
      current.push(Math.min(previous[j] + 1, current[j - 1] + 1, substitute));
    }
    previous = current;
  }
  return previous[b.length];
}

/** A value as it appears in a message. */
function show(value: unknown): string {
  if (typeof value === "number") return String(value);
  if (value === undefined) return "missing";
  try {
    return JSON.stringify(value) ?? String(value);
  } catch {
    return String(value);
  }
}
