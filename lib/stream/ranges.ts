/**
 * Per-fold row counts and column ranges, and terms learned from ranges alone. Everything a term
 * learns from numeric rows is their [min, max] (Legendre domains; the ranges that count rows
 * outside them), so terms learned on a two-row *witness table* holding each column's min and
 * max equal terms learned on the rows themselves. Fold f's training ranges are the ranges over
 * all other folds, so every fold's terms come from k ranges per column, without the rows.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { LearnedTerm, Term } from "../design/types.ts";
import { learnTerms } from "../design/mod.ts";
import type { Column, Table } from "../table/types.ts";

/**
 * Row counts and per-column [min, max] of each fold (index = fold).
 *
 * @example
 * ```ts
 * import { emptyRanges, type FoldRanges } from "./ranges.ts";
 * const r: FoldRanges = emptyRanges(["x"], 3);
 * console.log(r.k, r.counts); // 3 Float64Array [0, 0, 0]
 * ```
 */
export interface FoldRanges {
  readonly k: number;
  readonly counts: Float64Array;
  /** Per column name: minima and maxima by fold (±Infinity for an empty fold). */
  readonly min: ReadonlyMap<string, Float64Array>;
  readonly max: ReadonlyMap<string, Float64Array>;
}

/**
 * Empty ranges for `columns` over k folds, to be filled by {@link addToRanges}.
 *
 * @example
 * ```ts
 * import { addToRanges, emptyRanges } from "./ranges.ts";
 * const r = emptyRanges(["x"], 2);
 * addToRanges(r, 1, new Map([["x", 3.5]]));
 * console.log(r.counts, r.min.get("x")); // Float64Array [0, 1] Float64Array [Infinity, 3.5]
 * ```
 */
export function emptyRanges(columns: readonly string[], k: number): FoldRanges {
  return {
    k,
    counts: new Float64Array(k),
    min: new Map(columns.map((c) => [c, new Float64Array(k).fill(Infinity)])),
    max: new Map(columns.map((c) => [c, new Float64Array(k).fill(-Infinity)])),
  };
}

/**
 * Counts one row of fold `f` with its column values.
 *
 * @example
 * ```ts
 * import { addToRanges, emptyRanges } from "./ranges.ts";
 * const r = emptyRanges(["x"], 1);
 * addToRanges(r, 0, new Map([["x", -2]]));
 * console.log(r.max.get("x")![0]); // -2
 * ```
 */
export function addToRanges(r: FoldRanges, f: number, values: ReadonlyMap<string, number>): void {
  (r.counts as Float64Array)[f]++;
  for (const [name, v] of values) {
    const lo = r.min.get(name)!, hi = r.max.get(name)!;
    if (v < lo[f]) lo[f] = v;
    if (v > hi[f]) hi[f] = v;
  }
}

/** [min, max] of a column over all folds except `skip` (−1: over all folds). */
function rangeOver(r: FoldRanges, name: string, skip: number): [number, number] {
  const lo = r.min.get(name)!, hi = r.max.get(name)!;
  let a = Infinity, b = -Infinity;
  for (let f = 0; f < r.k; f++) {
    if (f === skip) continue;
    if (lo[f] < a) a = lo[f];
    if (hi[f] > b) b = hi[f];
  }
  return [a, b];
}

/**
 * Refuses ranges with an empty fold (too few rows, or keys that all hash alike).
 *
 * @example
 * ```ts
 * import { checkFoldsFilled, emptyRanges } from "./ranges.ts";
 * try { checkFoldsFilled(emptyRanges([], 2), "data.csv"); } catch (e) { console.log((e as Error).message); }
 * ```
 */
export function checkFoldsFilled(r: FoldRanges, source: string): void {
  const empty = Array.from(r.counts).findIndex((c) => c === 0);
  if (empty === -1) return;
  const total = r.counts.reduce((s, c) => s + c, 0);
  throw new CurbfitError(
    "TOO_FEW_ROWS",
    `fold ${empty + 1} of ${r.k} received no rows (${total} rows in all)`,
    "Use fewer folds, more rows, or a key column with more distinct values",
    { source, option: "folds.k" },
  );
}

/**
 * A two-row table whose numeric columns take the given [min, max] (row 0 the min, row 1 the
 * max): learning on it equals learning on rows with those ranges.
 *
 * @example
 * ```ts
 * import { witnessTable } from "./ranges.ts";
 * const t = witnessTable(new Map([["x", [0, 10] as [number, number]]]), "data.csv");
 * console.log(t.nRows, t.columns.get("x")); // 2 { kind: "number", name: "x", values: [0, 10] }
 * ```
 */
export function witnessTable(
  ranges: ReadonlyMap<string, readonly [number, number]>,
  source: string,
): Table {
  const columns = new Map<string, Column>();
  for (const [name, [lo, hi]] of ranges) {
    columns.set(name, { kind: "number", name, values: Float64Array.of(lo, hi) });
  }
  return {
    nRows: 2,
    names: [...ranges.keys()],
    columns,
    source,
    lineOfRow: Int32Array.of(0, 0),
    missing: { policy: "error", droppedLines: [] },
  };
}

/**
 * Terms learned on the rows of all folds except `skip` (−1: all rows), from the ranges alone.
 *
 * @example
 * ```ts
 * import { addToRanges, emptyRanges, learnOnRanges } from "./ranges.ts";
 * import { legendre } from "../design/mod.ts";
 * const r = emptyRanges(["x"], 2);
 * addToRanges(r, 0, new Map([["x", 0]]));
 * addToRanges(r, 1, new Map([["x", 4]]));
 * console.log(learnOnRanges([legendre("x", 2)], r, -1, "demo")[0].params); // { domain: [0, 4] }
 * ```
 */
export function learnOnRanges(
  terms: readonly Term[],
  r: FoldRanges,
  skip: number,
  source: string,
): readonly LearnedTerm[] {
  const ranges = new Map<string, [number, number]>();
  for (const name of r.min.keys()) ranges.set(name, rangeOver(r, name, skip));
  return learnTerms(terms, witnessTable(ranges, source));
}
