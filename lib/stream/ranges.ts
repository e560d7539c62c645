/**
 * Per-fold row counts and column ranges, the levels of category columns, and terms learned from
 * these alone. Everything a term learns from numeric rows is their [min, max] (Legendre domains;
 * the ranges that count rows outside them), and everything `indicators` learns is the sorted list
 * of levels over all rows, so terms learned on a two-row *witness table* holding each numeric
 * column's min and max and each category column's levels equal terms learned on the rows
 * themselves. Fold f's training ranges are the ranges over all other folds, so every fold's terms
 * come from k ranges per column, without the rows (levels are the same for every fold, as in the
 * in-memory sweep, where they come from the whole table). With repeated fold plans the counts and
 * ranges are kept per repeat and fold (repeat-major), the levels once.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { LearnedTerm, Term } from "../design/types.ts";
import { learnTerms } from "../design/mod.ts";
import type { Column, Table } from "../table/types.ts";
import type { Chunk } from "./accumulate.ts";

/**
 * Row counts and per-column [min, max] of each fold of each repeat (index r·k + f for fold f of
 * repeat r), and the levels of category columns over all rows.
 *
 * @example
 * ```ts
 * import { emptyRanges, type FoldRanges } from "./ranges.ts";
 * const r: FoldRanges = emptyRanges(["x"], 3, ["site"]);
 * console.log(r.k, r.counts, r.levels.get("site")); // 3 Float64Array [0, 0, 0] Map(0) {}
 * ```
 */
export interface FoldRanges {
  /** Number of folds in each repeat. */
  readonly k: number;
  /** Number of repeats: fold assignments of the same rows. */
  readonly repeats: number;
  /** Rows in each fold, repeat-major (entry r·k + f: fold f of repeat r). */
  readonly counts: Float64Array;
  /** Per numeric column name: minima by fold as `counts` (+Infinity for an empty fold). */
  readonly min: ReadonlyMap<string, Float64Array>;
  /** Per numeric column name: maxima by fold as `counts` (−Infinity for an empty fold). */
  readonly max: ReadonlyMap<string, Float64Array>;
  /** Per category column name: rows of each level seen, over all folds (in order first seen). */
  readonly levels: ReadonlyMap<string, ReadonlyMap<string, number>>;
}

/**
 * Empty ranges for numeric `columns` and category columns `categories` over k folds of each of
 * `repeats` repeats (default 1), to be filled by {@link addToRanges}, {@link addChunkToRanges}
 * and {@link addLevelRows}.
 *
 * @example
 * ```ts
 * import { addToRanges, emptyRanges } from "./ranges.ts";
 * const r = emptyRanges(["x"], 2);
 * addToRanges(r, 1, new Map([["x", 3.5]]));
 * console.log(r.counts, r.min.get("x")); // Float64Array [0, 1] Float64Array [Infinity, 3.5]
 * ```
 */
export function emptyRanges(
  columns: readonly string[],
  k: number,
  categories: readonly string[] = [],
  repeats = 1,
): FoldRanges {
  const size = k * repeats;
  return {
    k,
    repeats,
    counts: new Float64Array(size),
    min: new Map(columns.map((c) => [c, new Float64Array(size).fill(Infinity)])),
    max: new Map(columns.map((c) => [c, new Float64Array(size).fill(-Infinity)])),
    levels: new Map(categories.map((c) => [c, new Map<string, number>()])),
  };
}

/**
 * Counts one row of fold `f` of repeat `repeat` (default 0) with its column values.
 *
 * @example
 * ```ts
 * import { addToRanges, emptyRanges } from "./ranges.ts";
 * const r = emptyRanges(["x"], 1);
 * addToRanges(r, 0, new Map([["x", -2]]));
 * console.log(r.max.get("x")![0]); // -2
 * ```
 */
export function addToRanges(
  r: FoldRanges,
  f: number,
  values: ReadonlyMap<string, number>,
  repeat = 0,
): void {
  const at = repeat * r.k + f;
  (r.counts as Float64Array)[at]++;
  for (const [name, v] of values) {
    const lo = r.min.get(name)!, hi = r.max.get(name)!;
    if (v < lo[at]) lo[at] = v;
    if (v > hi[at]) hi[at] = v;
  }
}

/**
 * Counts the rows of a chunk (read by lib/stream/read.ts) into their folds of every repeat of
 * `r`: the [min, max] of every numeric column and (once) the rows of every level of its category
 * columns.
 *
 * @example
 * ```ts
 * import { addChunkToRanges, emptyRanges } from "./ranges.ts";
 * const r = emptyRanges(["x"], 2, ["site"]);
 * addChunkToRanges(r, {
 *   size: 3,
 *   columns: new Map([["x", Float64Array.of(4, -1, 2)]]),
 *   categories: new Map([["site", { levels: ["b", "a"], codes: Int32Array.of(0, 1, 0) }]]),
 *   buckets: [Int32Array.of(0, 1, 1)],
 *   lines: Int32Array.of(2, 3, 4),
 * });
 * console.log(r.counts, r.max.get("x"), r.levels.get("site")); // Float64Array [1, 2] Float64Array [4, 2] Map(2) { "b" => 2, "a" => 1 }
 * ```
 */
export function addChunkToRanges(r: FoldRanges, chunk: Chunk): void {
  const counts = r.counts as Float64Array;
  for (let repeat = 0; repeat < r.repeats; repeat++) {
    const bucket = chunk.buckets[repeat], base = repeat * r.k;
    for (let i = 0; i < chunk.size; i++) counts[base + bucket[i]]++;
    for (const [name, lo] of r.min) {
      const v = chunk.columns.get(name)!;
      const hi = r.max.get(name)!;
      for (let i = 0; i < chunk.size; i++) {
        const f = base + bucket[i];
        if (v[i] < lo[f]) lo[f] = v[i];
        if (v[i] > hi[f]) hi[f] = v[i];
      }
    }
  }
  for (const name of r.levels.keys()) {
    const { levels, codes } = chunk.categories.get(name)!;
    const rows = new Float64Array(levels.length);
    for (let i = 0; i < chunk.size; i++) rows[codes[i]]++;
    rows.forEach((count, code) => {
      if (count > 0) addLevelRows(r, name, levels[code], count);
    });
  }
}

/**
 * Adds `rows` rows of `level` to category column `column` (a column not yet in `r` is added).
 *
 * @example
 * ```ts
 * import { addLevelRows, emptyRanges } from "./ranges.ts";
 * const r = emptyRanges([], 1);
 * addLevelRows(r, "site", "north", 12);
 * addLevelRows(r, "site", "north", 3);
 * console.log(r.levels.get("site")); // Map(1) { "north" => 15 }
 * ```
 */
export function addLevelRows(r: FoldRanges, column: string, level: string, rows: number): void {
  const all = r.levels as Map<string, Map<string, number>>;
  let seen = all.get(column);
  if (seen === undefined) all.set(column, seen = new Map());
  seen.set(level, (seen.get(level) ?? 0) + rows);
}

/**
 * The levels of a category column in the order lib/table gives them (and so `indicators`):
 * sorted by UTF-16 code units, the first being the reference level.
 *
 * @example
 * ```ts
 * import { addLevelRows, emptyRanges, sortedLevels } from "./ranges.ts";
 * const r = emptyRanges([], 1);
 * for (const level of ["b", "a", "B", "10", "9"]) addLevelRows(r, "g", level, 1);
 * console.log(sortedLevels(r, "g")); // [ "10", "9", "B", "a", "b" ]
 * ```
 */
export function sortedLevels(r: FoldRanges, column: string): string[] {
  return [...(r.levels.get(column)?.keys() ?? [])].sort();
}

/**
 * Rows counted in `r`: the rows of every fold of one repeat (each repeat counts every row once).
 *
 * @example
 * ```ts
 * import { addToRanges, emptyRanges, rowCount } from "./ranges.ts";
 * const r = emptyRanges([], 2, [], 3);
 * addToRanges(r, 1, new Map(), 0);
 * addToRanges(r, 0, new Map(), 1);
 * addToRanges(r, 1, new Map(), 2);
 * console.log(rowCount(r)); // 1
 * ```
 */
export function rowCount(r: FoldRanges): number {
  let n = 0;
  for (let f = 0; f < r.k; f++) n += r.counts[f];
  return n;
}

/** [min, max] of a column over the folds of `repeat` except `skip` (−1: over all folds). */
function rangeOver(r: FoldRanges, name: string, skip: number, repeat: number): [number, number] {
  const lo = r.min.get(name)!, hi = r.max.get(name)!;
  let a = Infinity, b = -Infinity;
  for (let f = 0; f < r.k; f++) {
    if (f === skip) continue;
    const at = repeat * r.k + f;
    if (lo[at] < a) a = lo[at];
    if (hi[at] > b) b = hi[at];
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
  const fold = (empty % r.k) + 1;
  const repeat = r.repeats > 1 ? ` of repeat ${Math.floor(empty / r.k) + 1}` : "";
  throw new CurbfitError(
    "TOO_FEW_ROWS",
    `fold ${fold} of ${r.k}${repeat} received no rows (${rowCount(r)} rows in all)`,
    "Use fewer folds, more rows, or a key column with more distinct values",
    { source, option: "folds.k" },
  );
}

/**
 * A two-row table whose numeric columns take the given [min, max] (row 0 the min, row 1 the
 * max) and whose category columns have the given levels (already sorted): learning on it equals
 * learning on rows with those ranges and levels.
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
  levels: ReadonlyMap<string, readonly string[]> = new Map(),
): Table {
  const columns = new Map<string, Column>();
  for (const [name, [lo, hi]] of ranges) {
    columns.set(name, { kind: "number", name, values: Float64Array.of(lo, hi) });
  }
  for (const [name, sorted] of levels) {
    columns.set(name, { kind: "category", name, levels: sorted, codes: new Int32Array(2) });
  }
  return {
    nRows: 2,
    names: [...columns.keys()],
    columns,
    source,
    lineOfRow: Int32Array.of(0, 0),
    missing: { policy: "error", droppedLines: [] },
  };
}

/**
 * Terms learned on the rows of all folds of repeat `repeat` (default 0) except `skip` (−1: all
 * rows), from the ranges alone; category levels are those of all rows whatever `skip` is (as in
 * the in-memory sweep). Ranges of no rows at all are refused first ({@link checkFoldsFilled}):
 * nothing can be learned.
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
  repeat = 0,
): readonly LearnedTerm[] {
  if (r.counts.every((c) => c === 0)) checkFoldsFilled(r, source);
  const ranges = new Map<string, [number, number]>();
  for (const name of r.min.keys()) ranges.set(name, rangeOver(r, name, skip, repeat));
  const levels = new Map([...r.levels.keys()].map((name) => [name, sortedLevels(r, name)]));
  return learnTerms(terms, witnessTable(ranges, source, levels));
}
