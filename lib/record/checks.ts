/**
 * Field-by-field comparisons for `verify`, each with its tolerance stated:
 *
 * - `exact`: identical text, integers, booleans, hashes and lists of them (canonical JSON).
 * - `relative 1e-9 (each value)`: |a − e| ≤ 1e-9 · max(|a|, |e|) for every value.
 * - `relative 1e-9 (of the vector's largest magnitude)`: |a_i − e_i| ≤ 1e-9 · max_j max(|a_j|,
 *   |e_j|) — for coefficient vectors, whose small entries come from cancellation.
 *
 * NaN matches NaN and an infinity matches the same infinity; nothing else non-finite matches.
 *
 * @module
 */
import { canonicalJson } from "./json.ts";

/**
 * Relative tolerance of every numeric comparison.
 *
 * @example
 * ```ts
 * import { RELATIVE_TOLERANCE } from "./checks.ts";
 * console.log(RELATIVE_TOLERANCE); // 1e-9
 * ```
 */
export const RELATIVE_TOLERANCE = 1e-9;

/**
 * Tolerance labels, as they appear in reports.
 *
 * @example
 * ```ts
 * import { TOLERANCE } from "./checks.ts";
 * console.log(TOLERANCE.exact); // exact
 * ```
 */
export const TOLERANCE = {
  exact: "exact",
  each: "relative 1e-9 (each value)",
  vector: "relative 1e-9 (of the vector's largest magnitude)",
} as const;

/**
 * A value as shown in a report: numbers and text as they are; lists and objects as one-line
 * JSON, shortened; non-finite numbers as "NaN", "Infinity", "-Infinity".
 *
 * @example
 * ```ts
 * import type { Shown } from "./checks.ts";
 * const cell = (v: Shown) => (typeof v === "string" ? v : JSON.stringify(v));
 * ```
 */
export type Shown = string | number | boolean | null;

/**
 * One comparison: the recorded value, the recomputed value, the tolerance and the outcome.
 * For lists, the values shown are those of the element farthest from its recorded value, and
 * `where` says which (null when every element is identical).
 *
 * @example
 * ```ts
 * import type { VerifyEntry } from "./checks.ts";
 * const entry: VerifyEntry = {
 *   field: "data.sha256", ok: true, expected: "ab…", actual: "ab…", tolerance: "exact", where: null,
 * };
 * ```
 */
export interface VerifyEntry {
  /** Path of the record field, e.g. `models[0].final.coefficients`. */
  readonly field: string;
  /** Whether the recomputed value is within the tolerance of the recorded one. */
  readonly ok: boolean;
  /** As recorded. */
  readonly expected: Shown;
  /** As recomputed from the data and the record's settings. */
  readonly actual: Shown;
  /** The comparison rule, one of the `TOLERANCE` labels. */
  readonly tolerance: string;
  /** Which element or setting, when the field is a list or was rebuilt from settings. */
  readonly where: string | null;
}

/**
 * Collects entries. Each method compares one record field with its recomputed value.
 *
 * @example
 * ```ts
 * import { Checks } from "./checks.ts";
 * const checks = new Checks();
 * checks.exact("data.rows", 10, 10);
 * checks.numbers("cv.cvMean", [1, 2], [1, 2 + 1e-6], "each");
 * console.log(checks.entries.map((e) => e.ok)); // [ true, false ]
 * ```
 */
export class Checks {
  readonly entries: VerifyEntry[] = [];

  /** Identical canonical JSON. */
  exact(field: string, expected: unknown, actual: unknown, where: string | null = null): void {
    const e = canonicalJson(expected);
    const a = canonicalJson(actual);
    this.add(field, e === a, show(expected), show(actual), TOLERANCE.exact, where);
  }

  /** A recorded failure that has no recomputed value (e.g. a rerun that could not run). */
  fail(field: string, expected: Shown, actual: Shown, where: string | null = null): void {
    this.add(field, false, expected, actual, TOLERANCE.exact, where);
  }

  /** One number, relative 1e-9. */
  number(field: string, expected: number, actual: number): void {
    this.numbers(field, [expected], [actual], "each", () => null);
  }

  /**
   * Two lists of numbers: lengths exact, values at 1e-9 relative per `mode`.
   * `whereOf(i)` describes element i for the report.
   */
  numbers(
    field: string,
    expected: readonly number[],
    actual: readonly number[],
    mode: "each" | "vector",
    whereOf: (i: number) => string | null = (i) => `index ${i}`,
  ): void {
    this.rows(field, [expected], [actual], mode, (_, i) => whereOf(i));
  }

  /**
   * Two tables of numbers (lists of rows): shape exact, values at 1e-9 relative per `mode`,
   * where "vector" scales by each row's largest magnitude. One entry, showing the worst value.
   */
  rows(
    field: string,
    expected: readonly (readonly number[])[],
    actual: readonly (readonly number[])[],
    mode: "each" | "vector",
    whereOf: (row: number, i: number) => string | null,
  ): void {
    const tolerance = TOLERANCE[mode];
    const shape = (t: readonly (readonly number[])[]) => t.map((r) => r.length).join(",");
    if (expected.length !== actual.length || shape(expected) !== shape(actual)) {
      const size = (t: readonly (readonly number[])[]) =>
        t.length === 1 ? `${t[0].length} values` : `${t.length} rows of ${shape(t)} values`;
      this.add(field, false, size(expected), size(actual), tolerance, "list lengths differ");
      return;
    }
    let worst = { excess: 0, row: 0, i: 0 };
    expected.forEach((row, r) => {
      const scale = mode === "vector" ? largest(row, actual[r]) : undefined;
      row.forEach((e, i) => {
        const excess = misfit(e, actual[r][i], scale);
        if (excess > worst.excess) worst = { excess, row: r, i };
      });
    });
    const e = expected[worst.row]?.[worst.i] ?? null;
    const a = actual[worst.row]?.[worst.i] ?? null;
    const where = worst.excess > 0 ? whereOf(worst.row, worst.i) : null;
    this.add(field, worst.excess <= 1, shownNumber(e), shownNumber(a), tolerance, where);
  }

  private add(
    field: string,
    ok: boolean,
    expected: Shown,
    actual: Shown,
    tolerance: string,
    where: string | null,
  ): void {
    this.entries.push(Object.freeze({ field, ok, expected, actual, tolerance, where }));
  }
}

/** How far outside the tolerance a pair is: ≤ 1 passes, Infinity for non-finite mismatches. */
function misfit(e: number, a: number, scale: number | undefined): number {
  if (Object.is(e, a) || e === a) return 0;
  if (!Number.isFinite(e) || !Number.isFinite(a)) return Infinity;
  const s = scale ?? Math.max(Math.abs(e), Math.abs(a));
  return Math.abs(a - e) / (RELATIVE_TOLERANCE * s);
}

function largest(a: readonly number[], b: readonly number[]): number {
  let m = 0;
  for (const v of a) if (Math.abs(v) > m) m = Math.abs(v);
  for (const v of b) if (Math.abs(v) > m) m = Math.abs(v);
  return m;
}

function shownNumber(v: number | null): Shown {
  return v === null || Number.isFinite(v) ? v : String(v);
}

/** A value for a report: plain values as they are, others as one-line JSON, shortened. */
function show(v: unknown): Shown {
  if (v === null || typeof v === "boolean" || typeof v === "string") return v;
  if (typeof v === "number") return shownNumber(v);
  const text = canonicalJson(v).replace(/\s*\n\s*/g, " ");
  return text.length > 120 ? `${text.slice(0, 117)}...` : text;
}
