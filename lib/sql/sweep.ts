/**
 * `sweepSql`: the cross-validated sweep (λ for ridge, α for lasso / elastic net) pushed down
 * into a SQL engine. The engine computes per-fold sums with two portable GROUP BY aggregates
 * (lib/sql/query.ts); curbfit turns them into per-fold summaries (lib/sql/sums.ts) and runs the
 * same summary-only engine as every other sweep (lib/stream/finish.ts → lib/sweep/engine.ts).
 * Rows never leave the engine.
 *
 * Queries, in order: the source's column names (no rows); with missing: "drop", a row count;
 * the ranges query (fold counts, MIN/MAX, shifts, NULL checks); one levels query per category
 * column of `indicators` terms (its distinct values); the moments query (split when
 * it would exceed `maxAggregates` sums); rarely, one more moments query for a fold whose
 * change of Legendre basis would amplify rounding, or whose learned domain of a Legendre factor
 * inside a product differs from all rows'. With `folds.repeats` R > 1 the ranges and moments
 * queries group by the folds of several repeats at once (one fold column per repeat, so one scan
 * serves them) and the client adds up each repeat's fold groups; they are repeated per batch of
 * repeats only when k^b fold groups would exceed 1000 (`repeatBatches` in lib/sql/query.ts).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import { scaleSweepBundle, withDisplay } from "../views/display.ts";
import type { LearnedTerm } from "../design/types.ts";
import type { Moments } from "../sweep/moments.ts";
import {
  checkScaleSpec,
  finishSweep,
  hashFoldsOf,
  scaleColumns,
  type ScaleProgressListener,
  type ScaleSweepResult,
  type ScaleSweepSpec,
} from "../stream/finish.ts";
import {
  addLevelRows,
  emptyRanges,
  type FoldRanges,
  learnOnRanges,
  rowCount,
} from "../stream/ranges.ts";
import { firstLine } from "../stream/read.ts";
import type { SqlConnection, SqlRows } from "./connection.ts";
import {
  columnsQuery,
  countQuery,
  featureBlocks,
  levelRows,
  levelsQuery,
  momentsQueries,
  rangesQuery,
  repeatBatches,
  type SqlQuery,
  type SqlShape,
  sumItems,
} from "./query.ts";
import { momentsFromSums } from "./sums.ts";

/**
 * A sweep over a SQL table or query. On PostgreSQL, `SET jit = off` on the connection first:
 * compiling the wide aggregate can take longer than the scan (README.md, "Scale").
 *
 * @example
 * ```ts
 * import type { SqlSweepSpec } from "./sweep.ts";
 * import { legendre } from "../design/mod.ts";
 * const spec: SqlSweepSpec = { table: ["lab", "obs"], target: "y", terms: [legendre("x", 8)], folds: { key: "id" } };
 * ```
 */
export interface SqlSweepSpec extends ScaleSweepSpec {
  /** Table name, or its parts (e.g. ["lab", "readings"] for lab.readings). */
  readonly table?: string | readonly string[];
  /** Instead of a table: a SELECT statement to read from (trusted SQL, used as a subquery). */
  readonly query?: string;
  /**
   * Columns the table is partitioned (sharded) by. They join the GROUP BY, so each partition's
   * groups are complete and the engine can aggregate partition by partition — on PostgreSQL
   * with foreign partitions, on the shards (enable_partitionwise_aggregate).
   */
  readonly partitionBy?: readonly string[];
  /** Rows with a NULL in a used column: stop with an error (default) or leave them out. */
  readonly missing?: "error" | "drop";
  /** Most SUMs in one query (default 1500; PostgreSQL allows 1664 output columns). */
  readonly maxAggregates?: number;
  /** Receives a report after the ranges query, after each moments query, per fold, and at the fit. */
  readonly progress?: ScaleProgressListener;
}

/**
 * A SQL sweep's result: the scale result plus the engine's side.
 *
 * @example
 * ```ts
 * import type { SqlSweepResult } from "./sweep.ts";
 * const sqlText = (r: SqlSweepResult) => r.queries.map((q) => q.text).join(";\n");
 * ```
 */
export interface SqlSweepResult extends ScaleSweepResult {
  /** The dialect, e.g. "postgresql" or "duckdb". */
  readonly engine: string;
  /** Rows left out for NULLs (missing: "drop"), else 0. */
  readonly dropped: number;
  /** Every query run, with its parameters, in order (the evidence of what was computed). */
  readonly queries: readonly SqlQuery[];
  /** Wall-clock seconds of the whole sweep, from the first query to the fitted result. */
  readonly seconds: number;
  /** Rows aggregated per second over the moments queries. */
  readonly rowsPerSecond: number;
}

/**
 * Sweeps λ (ridge, the default) or α (`penalty: lasso()` / `elasticNet({ mix })`, with
 * `alphas`) over the rows of a SQL table or query, with folds from the hash of `folds.key`;
 * the result's `scale` says which.
 *
 * @example
 * ```ts ignore
 * import { DuckDBInstance } from "@duckdb/node-api";
 * import { duckdbConnection, legendre, sweepSql } from "../../mod.ts";
 * const db = await DuckDBInstance.create(":memory:");
 * const con = await db.connect();
 * await con.run("CREATE TABLE obs AS SELECT i AS id, i / 999.0 AS x, sin(6 * i / 999.0) AS y FROM range(1000) t(i)");
 * const s = await sweepSql(duckdbConnection(con), {
 *   table: "obs", target: "y", terms: [legendre("x", 8)], folds: { k: 5, seed: 2, key: "id" },
 * });
 * console.log(s.chosen.strength, s.n); // λ, 1000
 * ```
 */
export async function sweepSql(
  connection: SqlConnection,
  spec: SqlSweepSpec,
): Promise<SqlSweepResult> {
  const inputs = checkScaleSpec(spec);
  const { categories } = scaleColumns(spec.terms);
  checkTableOrQuery(spec);
  const key = spec.folds?.key;
  if (key === undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      "a SQL sweep needs a key column to hash into folds (SQL rows have no fixed order)",
      'Name a whole-number column that identifies rows, e.g. folds: { k: 10, seed: 1, key: "id" }',
      { option: "folds.key" },
    );
  }
  const { k, seed, repeats, hashes } = hashFoldsOf(spec.folds);
  const label = sourceLabel(spec);
  const drop = checkMissing(spec.missing);
  const used = [...new Set([spec.target, ...inputs, ...categories, key])];
  const shape: SqlShape = {
    dialect: connection.dialect,
    table: spec.table === undefined
      ? null
      : typeof spec.table === "string"
      ? [spec.table]
      : [...spec.table],
    query: spec.query ?? null,
    key,
    hash: hashes[0],
    partitionBy: [...(spec.partitionBy ?? [])],
    required: drop ? used : [],
  };
  const maxAggregates = checkMaxAggregates(spec.maxAggregates);
  const report = spec.progress ?? (() => {});
  const ran: SqlQuery[] = [];
  const run = async (q: SqlQuery): Promise<SqlRows> => {
    ran.push(q);
    try {
      return await connection.run(q);
    } catch (cause) {
      throw new CurbfitError(
        "READ_FAILED",
        `the ${connection.dialect.name} query failed: ${firstLine(cause)}`,
        "Check the connection, the table and the column types (numbers, an integer key); " +
          "no result was produced",
        { source: label },
      );
    }
  };
  const started = performance.now();

  const names = (await run(columnsQuery(shape))).columns;
  for (const c of [...used, ...shape.partitionBy]) {
    if (!names.includes(c)) {
      throw new CurbfitError(
        "UNKNOWN_COLUMN",
        `the source has no column ${JSON.stringify(c)} (columns: ${
          names.slice(0, 20).map((n) => JSON.stringify(n)).join(", ")
        })`,
        "Use one of the listed names; quoted names are case-sensitive",
        { source: label, column: c },
      );
    }
  }
  const total = drop ? Number((await run(countQuery(shape))).rows[0][0]) : NaN;

  // Shifts (column means) for every numeric input outside a plain Legendre term, and the target.
  const shifted = [
    ...new Set([
      ...spec.terms.filter((t) => t.kind !== "legendre").flatMap((t) => [...t.inputs]),
      spec.target,
    ]),
  ].filter((c) => !categories.includes(c));
  const counted = drop ? [] : used;
  // Repeats grouped per scan: one fold column per repeat of the batch (R = 1: one batch, `hash`).
  const batchShape = (batch: readonly number[]): SqlShape =>
    batch.length === 1
      ? { ...shape, hash: hashes[batch[0]] }
      : { ...shape, hashes: batch.map((r) => hashes[r]) };
  const rangeResults: { rows: SqlRows; repeats: readonly number[] }[] = [];
  const batches = repeatBatches(repeats, k);
  for (const batch of batches) {
    const rows = await run(rangesQuery(batchShape(batch), inputs, shifted, counted));
    rangeResults.push({ rows, repeats: batch });
  }
  const { ranges, shifts } = readRanges(rangeResults, shape, inputs, shifted, counted, k, label);
  for (const c of categories) {
    const levels = levelRows(await run(levelsQuery(shape, c)), shape.partitionBy.length);
    for (const [level, rows] of levels) addLevelRows(ranges, c, level, rows);
  }
  const n = rowCount(ranges);
  report({ stage: "domains", done: 1, total: 1, rows: n, rowsPerSecond: NaN });

  const terms = learnOnRanges(spec.terms, ranges, -1, label);
  const momentsStarted = performance.now();
  /**
   * Summaries of the moments queries of `queryShape`: per repeat it groups by (one, or those of
   * `queryShape.hashes`), per bucket. `progress` places its queries among all the moments
   * queries of this step.
   */
  const summaries = async (
    queryShape: SqlShape,
    termsOf: readonly LearnedTerm[],
    outside: boolean,
    bucket: number | null,
    buckets: number,
    progress: { readonly before: number; readonly total: number },
  ): Promise<Moments[][]> => {
    const blocks = featureBlocks(termsOf, spec.target, shifts, ranges, outside);
    const items = sumItems(blocks);
    const queries = momentsQueries(queryShape, blocks, items, maxAggregates, bucket);
    const grouped = bucket === null ? queryShape.hashes?.length ?? 1 : 1;
    const counts = Array.from({ length: grouped }, () => new Float64Array(buckets));
    const sums = Array.from(
      { length: grouped },
      () => Array.from({ length: buckets }, () => new Float64Array(items.length)),
    );
    let start = 0;
    for (const [i, q] of queries.entries()) {
      const rows = (await run(q)).rows;
      const width = q === queries[queries.length - 1] ? items.length - start : maxAggregates;
      addSums(rows, shape.partitionBy.length, start, width, i === 0 ? counts : null, sums, label);
      start += width;
      const seconds = (performance.now() - momentsStarted) / 1000;
      report({
        stage: "summaries",
        done: progress.before + i + 1,
        total: progress.total,
        rows: n,
        rowsPerSecond: n / seconds,
      });
    }
    return sums.map((perBucket, j) =>
      perBucket.map((s, b) => momentsFromSums(blocks, items, counts[j][b], s, label))
    );
  };
  const items = sumItems(featureBlocks(terms, spec.target, shifts, ranges, false)).length;
  const perBatch = Math.max(1, Math.ceil(items / maxAggregates));
  const buckets: Moments[][] = [];
  for (const [b, batch] of batches.entries()) {
    const progress = { before: b * perBatch, total: batches.length * perBatch };
    buckets.push(...await summaries(batchShape(batch), terms, false, null, k, progress));
  }
  const aggregated = (performance.now() - momentsStarted) / 1000;
  checkCounts(buckets, ranges, label);
  const result = await finishSweep({
    spec,
    k,
    seed,
    key,
    source: label,
    ranges,
    terms,
    buckets,
    refetch: async (r, f, foldTerms) => {
      const one = { ...shape, hash: hashes[r] };
      const [side] = await summaries(one, foldTerms, true, f, 2, { before: 0, total: perBatch });
      return side as [Moments, Moments];
    },
    passes: 0,
    report,
  });
  return deepFreeze(withDisplay({
    ...result,
    passes: ran.length,
    engine: connection.dialect.name,
    dropped: drop ? total - n : 0,
    queries: ran,
    seconds: (performance.now() - started) / 1000,
    rowsPerSecond: n / aggregated,
  }, scaleSweepBundle));
}

/**
 * Adds one query's rows (grouped by the folds of `sums.length` repeats, then partitions) into
 * per-repeat, per-fold counts and sums: a row's values count once in each repeat, in its fold.
 */
function addSums(
  rows: readonly (readonly unknown[])[],
  partitions: number,
  start: number,
  width: number,
  counts: Float64Array[] | null,
  sums: Float64Array[][],
  label: string,
): void {
  const at = sums.length + partitions;
  const values = new Float64Array(width);
  for (const row of rows) {
    for (let i = 0; i < width; i++) values[i] = Number(row[at + 1 + i] ?? NaN);
    sums.forEach((perFold, j) => {
      const f = foldOf(row[j], perFold.length, label);
      if (counts !== null) counts[j][f] += Number(row[at]);
      const target = perFold[f];
      for (let i = 0; i < width; i++) target[start + i] += values[i];
    });
  }
}

/** READ_FAILED when a fold's rows differ between the ranges and the moments queries. */
function checkCounts(buckets: readonly Moments[][], ranges: FoldRanges, label: string): void {
  buckets.forEach((perFold, r) =>
    perFold.forEach((m, f) => {
      const expected = ranges.counts[r * ranges.k + f];
      if (m.count === expected) return;
      const repeat = ranges.repeats > 1 ? ` of repeat ${r + 1}` : "";
      throw new CurbfitError(
        "READ_FAILED",
        `fold ${f + 1}${repeat} had ${expected} rows in the ranges query and ${m.count} in the ` +
          "moments query",
        "Do not change the table while it is being swept; no result was produced",
        { source: label },
      );
    })
  );
}

function foldOf(value: unknown, k: number, label: string): number {
  if (value === null || value === undefined) {
    throw new CurbfitError(
      "MISSING_VALUE",
      "some rows have a NULL key",
      'Give every row a key, or pass missing: "drop" to leave such rows out',
      { source: label },
    );
  }
  const f = Number(value);
  if (!Number.isInteger(f) || f < 0 || f >= k) {
    throw new CurbfitError(
      "READ_FAILED",
      `the engine returned the fold ${String(value)}, outside 0 … ${k - 1}`,
      "Check that the key column holds whole numbers; report this if it does",
      { source: label },
    );
  }
  return f;
}

/**
 * Reads the ranges queries (one per batch of repeats, each row grouped by the folds of its
 * batch's repeats, then partitions): per-repeat, per-fold counts and [min, max]; shifts and NULL
 * checks from the first query (every query sees every row once).
 */
function readRanges(
  results: readonly { readonly rows: SqlRows; readonly repeats: readonly number[] }[],
  shape: SqlShape,
  ranged: readonly string[],
  summed: readonly string[],
  counted: readonly string[],
  k: number,
  label: string,
): { ranges: FoldRanges; shifts: Map<string, number> } {
  const repeats = results.reduce((s, r) => s + r.repeats.length, 0);
  const ranges = emptyRanges(ranged, k, [], repeats);
  const sums = new Float64Array(summed.length);
  const nonNull = new Float64Array(counted.length);
  let nulls = 0;
  for (const [q, { rows, repeats: batch }] of results.entries()) {
    const at = batch.length + shape.partitionBy.length;
    for (const row of rows.rows) {
      const n = Number(row[at]);
      if (row[0] === null || row[0] === undefined) {
        if (q === 0) nulls += n;
        continue;
      }
      batch.forEach((r, j) => {
        const f = r * k + foldOf(row[j], k, label);
        (ranges.counts as Float64Array)[f] += n;
        ranged.forEach((c, i) => {
          const lo = row[at + 1 + 2 * i], hi = row[at + 2 + 2 * i];
          if (lo === null) return;
          ranges.min.get(c)![f] = Math.min(ranges.min.get(c)![f], Number(lo));
          ranges.max.get(c)![f] = Math.max(ranges.max.get(c)![f], Number(hi));
        });
      });
      if (q > 0) continue;
      summed.forEach((_, j) => (sums[j] += Number(row[at + 1 + 2 * ranged.length + j] ?? 0)));
      counted.forEach((
        _,
        j,
      ) => (nonNull[j] += Number(row[at + 1 + 2 * ranged.length + summed.length + j])));
    }
  }
  const n = rowCount(ranges);
  const missing = counted.findIndex((_, j) => nonNull[j] < n);
  if (nulls > 0 || missing !== -1) {
    throw new CurbfitError(
      "MISSING_VALUE",
      missing === -1
        ? `${nulls} rows have a NULL key`
        : `${n - nonNull[missing]} rows have a NULL in column ${JSON.stringify(counted[missing])}`,
      'Fill them in, or pass missing: "drop" to leave such rows out (they are counted)',
      { source: label, column: missing === -1 ? shape.key : counted[missing] },
    );
  }
  for (const c of ranged) {
    const lo = Math.min(...ranges.min.get(c)!), hi = Math.max(...ranges.max.get(c)!);
    if (n > 0 && !(Number.isFinite(lo) && Number.isFinite(hi))) {
      throw new CurbfitError(
        "NOT_FINITE",
        `column ${JSON.stringify(c)} holds NaN or infinite values (range ${lo} … ${hi})`,
        "Filter them out in a query (e.g. WHERE x <> 'NaN'), or fix the data",
        { source: label, column: c },
      );
    }
  }
  const shifts = new Map(summed.map((c, j) => [c, n > 0 ? sums[j] / n : 0]));
  for (const [c, v] of shifts) {
    if (!Number.isFinite(v)) {
      throw new CurbfitError(
        "NOT_FINITE",
        `column ${JSON.stringify(c)} holds NaN or infinite values`,
        "Filter them out in a query, or fix the data",
        { source: label, column: c },
      );
    }
  }
  return { ranges, shifts };
}

function checkTableOrQuery(spec: SqlSweepSpec): void {
  if ((spec.table === undefined) === (spec.query === undefined)) {
    throw new CurbfitError(
      "BAD_OPTION",
      "give exactly one of table and query",
      'Pass e.g. { table: "readings" } or { query: "SELECT … FROM readings" }',
      { option: "table" },
    );
  }
}

function sourceLabel(spec: SqlSweepSpec): string {
  if (spec.table === undefined) return "SQL query";
  return `SQL table ${typeof spec.table === "string" ? spec.table : spec.table.join(".")}`;
}

function checkMissing(value: unknown): boolean {
  if (value === undefined || value === "error") return false;
  if (value === "drop") return true;
  throw new CurbfitError(
    "BAD_OPTION",
    `missing is ${JSON.stringify(value)}, but it must be "error" or "drop"`,
    'Pass missing: "drop" to leave rows with NULLs out, or leave it out',
    { option: "missing" },
  );
}

function checkMaxAggregates(value: number | undefined): number {
  if (value === undefined) return 1500;
  if (Number.isInteger(value) && value >= 1 && value <= 100_000) return value;
  throw new CurbfitError(
    "BAD_OPTION",
    `maxAggregates is ${value}, but it must be a whole number from 1 to 100000`,
    "Leave it out for 1500",
    { option: "maxAggregates" },
  );
}
