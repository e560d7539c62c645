/**
 * Per-bucket summaries accumulated chunk by chunk. Each chunk of rows becomes a small table (its
 * category columns with sorted levels, as lib/table makes them), its
 * design is built by the learned terms (the same code as the in-memory sweep, so design values
 * are identical), each bucket's chunk summary is computed two-pass (lib/sweep/moments.ts) and
 * merged into the running total with Chan, Golub & LeVeque's pairwise formula. With repeated
 * fold plans every row has a bucket in each repeat: the design is built once per chunk and
 * summarized once per repeat. Memory: the totals, repeats · buckets · (p+1)(p+2) doubles, plus
 * one chunk — independent of the row count.
 *
 * @module
 */
import type { LearnedTerm } from "../design/types.ts";
import { buildDesign } from "../design/mod.ts";
import type { CategoryColumn, Column, Table } from "../table/types.ts";
import { bucketMoments, emptyMoments, mergeMoments, type Moments } from "../sweep/moments.ts";

/**
 * The values of one category column in a chunk: a code per row indexing `levels`.
 *
 * @example
 * ```ts
 * import type { ChunkCategory } from "./accumulate.ts";
 * const site: ChunkCategory = { levels: ["north", "east"], codes: Int32Array.of(1, 0, 0) };
 * ```
 */
export interface ChunkCategory {
  /** Levels in the order the reader first met them (not sorted; may hold levels of earlier chunks). */
  readonly levels: readonly string[];
  /** Index into `levels` of each row (the first `size` entries are rows). */
  readonly codes: Int32Array;
}

/**
 * Rows of numeric and category columns held until they are summarized.
 *
 * @example
 * ```ts
 * import type { Chunk } from "./accumulate.ts";
 * const chunk: Chunk = {
 *   size: 1, columns: new Map([["y", Float64Array.of(2)]]), categories: new Map(),
 *   buckets: [Int32Array.of(0)], lines: Int32Array.of(2),
 * };
 * ```
 */
export interface Chunk {
  /** Rows filled. */
  readonly size: number;
  /** Values of numeric columns by name (the first `size` entries are rows). */
  readonly columns: ReadonlyMap<string, Float64Array>;
  /** Category columns by name. */
  readonly categories: ReadonlyMap<string, ChunkCategory>;
  /** Per repeat: the bucket of each row (the first `size` entries are rows). */
  readonly buckets: readonly Int32Array[];
  /** Source line of each row, for messages. */
  readonly lines: Int32Array;
}

/**
 * Running per-bucket summaries over the design of `terms` and the target, for each of `repeats`
 * bucket assignments (`chunk.buckets[r]`; default one).
 *
 * @example
 * ```ts
 * import { FoldAccumulator } from "./accumulate.ts";
 * import { learnTerms, column } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const terms = learnTerms([column("x")], tableFromColumns({ x: [0, 1] }));
 * const acc = new FoldAccumulator(terms, "y", 2, "demo");
 * acc.add({
 *   size: 4,
 *   columns: new Map([["x", Float64Array.of(0, 1, 2, 3)], ["y", Float64Array.of(1, 2, 2, 4)]]),
 *   categories: new Map(),
 *   buckets: [Int32Array.of(0, 1, 0, 1)], lines: Int32Array.of(2, 3, 4, 5),
 * });
 * console.log(acc.totals().map((m) => m.count)); // [ 2, 2 ]
 * ```
 */
export class FoldAccumulator {
  readonly #terms: readonly LearnedTerm[];
  readonly #target: string;
  readonly #source: string;
  #totals: Moments[][];

  constructor(
    terms: readonly LearnedTerm[],
    target: string,
    buckets: number,
    source: string,
    repeats = 1,
  ) {
    this.#terms = terms;
    this.#target = target;
    this.#source = source;
    const d = terms.reduce((s, t) => s + t.names.length, 0) + 1;
    this.#totals = Array.from(
      { length: repeats },
      () => Array.from({ length: buckets }, () => emptyMoments(d)),
    );
  }

  /** Summarizes a chunk (in every repeat's buckets) and merges it into the totals. */
  add(chunk: Chunk): void {
    const n = chunk.size;
    if (n === 0) return;
    const columns = new Map<string, Column>();
    for (const [name, values] of chunk.columns) {
      columns.set(name, { kind: "number", name, values: values.subarray(0, n) });
    }
    for (const [name, category] of chunk.categories) {
      columns.set(name, sortedCategory(name, category, n));
    }
    const table: Table = {
      nRows: n,
      names: [...columns.keys()],
      columns,
      source: this.#source,
      lineOfRow: chunk.lines.subarray(0, n),
      missing: { policy: "error", droppedLines: [] },
    };
    const design = buildDesign(this.#terms, table);
    const y = chunk.columns.get(this.#target)!.subarray(0, n);
    const d = design.p + 1;
    this.#totals = this.#totals.map((totals, r) => {
      const bucket = chunk.buckets[r].subarray(0, n);
      const parts = bucketMoments(design.block.hi, design.p, y, bucket, totals.length);
      return totals.map((total, b) => mergeMoments([total, parts[b]], d));
    });
  }

  /** The summaries so far of repeat `repeat` (default 0), one per bucket. */
  totals(repeat = 0): readonly Moments[] {
    return this.#totals[repeat];
  }

  /** Bytes held by the summaries (what grows with p, buckets and repeats, never with rows). */
  bytes(): number {
    return this.#totals.flat().reduce((s, m) => s + m.mean.byteLength + m.cross.byteLength, 0);
  }
}

/**
 * The first n rows of a chunk's category column as lib/table stores one: the levels those rows
 * use, sorted by UTF-16 code units, and codes renumbered to match. A level of the data that the
 * terms did not learn is then reported by `indicators` itself (UNKNOWN_LEVEL, naming its line).
 */
function sortedCategory(name: string, category: ChunkCategory, n: number): CategoryColumn {
  const used = new Uint8Array(category.levels.length);
  for (let i = 0; i < n; i++) used[category.codes[i]] = 1;
  const levels = category.levels.filter((_, code) => used[code] === 1).sort();
  const slot = new Map(levels.map((level, i) => [level, i]));
  const renumber = Int32Array.from(category.levels, (level) => slot.get(level) ?? -1);
  const codes = Int32Array.from(category.codes.subarray(0, n), (code) => renumber[code]);
  return { kind: "category", name, levels, codes };
}
