/**
 * The SQL text of curbfit's aggregates, with every value (seeded hash coefficients, fold count,
 * Legendre domains, shifts, category levels) passed as a parameter and every name quoted.
 *
 * 1. The ranges query: per fold, the row count, each numeric input's MIN and MAX (Legendre
 *    domains of every training fold), each shifted column's SUM (its shift) and non-null counts.
 * 2. The levels query, one per category column (`indicators`): its distinct values as text and
 *    their row counts.
 * 3. The moments query: per fold, COUNT(*) and SUMs of the features u and their products,
 *    where u is T_1 … T_d (Chebyshev, lib/sql/chebyshev.ts) of each Legendre term's mapped
 *    column, (value − shift) for plain columns and the target, and (product of factors − shift)
 *    for the columns of `power`, `indicators` and `product` terms (factors: a value, a POWER of
 *    it, a 0/1 level indicator, or a Legendre polynomial written as its Chebyshev sum). Within
 *    one Legendre term only the sums of T_m (m ≤ 2d) are needed. One more SUM per category
 *    column counts rows whose level was learned (the rest would silently read as the reference
 *    level). The client turns these raw sums into centered co-moments in the design basis
 *    (lib/sql/sums.ts).
 *
 * The fold of a row is the fold hash `curbfit.fold-hash/1` (lib/stream/README.md) in BIGINT
 * arithmetic: every product is below 2^62, so nothing overflows. With repeated fold plans the
 * ranges and moments queries group by the folds of several repeats at once (one fold column per
 * repeat, `SqlShape.hashes`): one scan computes every row's values once, and the client adds up
 * the groups of each repeat's folds ({@link repeatBatches} keeps the groups few).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Json, LearnedTerm } from "../design/types.ts";
import { type FoldRanges, rowCount } from "../stream/ranges.ts";
import { quoteIdentifier, type SqlDialect } from "./dialect.ts";
import { legendreFromChebyshev } from "./chebyshev.ts";
import type { SqlRows } from "./connection.ts";
import { FOLD_HASH_PRIME, type FoldHash } from "../stream/hash.ts";

/**
 * A column mapped onto [−1, 1] by its domain, for Chebyshev and Legendre values.
 *
 * @example
 * ```ts
 * import type { MappedColumn } from "./query.ts";
 * const t: MappedColumn = { column: "x", domain: [0, 10], outside: false };
 * ```
 */
export interface MappedColumn {
  /** The column's name. */
  readonly column: string;
  /** [lo, hi], mapped to [−1, 1]. */
  readonly domain: readonly [number, number];
  /** Whether some rows may lie outside the domain (then |t| > 1 is handled). */
  readonly outside: boolean;
}

/**
 * One factor of a design column of a `power`, `indicators` or `product` term.
 *
 * @example
 * ```ts
 * import type { Factor } from "./query.ts";
 * const cube: Factor = { kind: "power", column: "x", exponent: 3 };
 * const north: Factor = { kind: "level", column: "site", level: "north" };
 * ```
 */
export type Factor =
  | { readonly kind: "value"; readonly column: string }
  | { readonly kind: "power"; readonly column: string; readonly exponent: number }
  | { readonly kind: "level"; readonly column: string; readonly level: string }
  | (MappedColumn & { readonly kind: "legendre"; readonly order: number });

/**
 * A design column as SQL computes it: the product of its factors, minus a shift close to its
 * mean (so that sums of products lose little to cancellation).
 *
 * @example
 * ```ts
 * import type { FactorColumn } from "./query.ts";
 * const dose: FactorColumn = { factors: [{ kind: "value", column: "dose" }], shift: 2.5 };
 * ```
 */
export interface FactorColumn {
  /** Multiplied together, left to right. */
  readonly factors: readonly Factor[];
  /** Subtracted from the product before summing. */
  readonly shift: number;
}

/**
 * One block of features: a Legendre term (as Chebyshev columns), one shifted column, the
 * columns of a `power`, `indicators` or `product` term, or (no design columns) the check that
 * every row's level of a category column is one of the learned `levels`.
 *
 * @example
 * ```ts
 * import type { FeatureBlock } from "./query.ts";
 * const y: FeatureBlock = { kind: "shifted", column: "y", shift: 1.5 };
 * ```
 */
export type FeatureBlock =
  | (MappedColumn & { readonly kind: "chebyshev"; readonly degree: number })
  | { readonly kind: "shifted"; readonly column: string; readonly shift: number }
  | { readonly kind: "factors"; readonly columns: readonly FactorColumn[] }
  | { readonly kind: "levels"; readonly column: string; readonly levels: readonly string[] };

/**
 * What one SUM adds up, for rebuilding the moment matrix: T_m of a Chebyshev block, column
 * `index` of a block, the product of two columns, or the rows of a "levels" block whose level
 * is known.
 *
 * @example
 * ```ts
 * import type { SumItem } from "./query.ts";
 * const item: SumItem = { kind: "chebyshev", block: 0, m: 3 }; // SUM(T_3(t))
 * ```
 */
export type SumItem =
  | { readonly kind: "chebyshev"; readonly block: number; readonly m: number }
  | { readonly kind: "linear"; readonly block: number; readonly index: number }
  | { readonly kind: "levels"; readonly block: number }
  | {
    readonly kind: "product";
    readonly left: number;
    readonly leftIndex: number;
    readonly right: number;
    readonly rightIndex: number;
  };

/**
 * A query and its parameters.
 *
 * @example
 * ```ts
 * import type { SqlQuery } from "./query.ts";
 * const q: SqlQuery = { text: "SELECT CAST($1 AS BIGINT)", params: [7] };
 * ```
 */
export interface SqlQuery {
  /** SQL text with placeholders written in the dialect's form (`$1`, `$2`, …). */
  readonly text: string;
  /** Value of placeholder i + 1 at index i; names never go here, only values. */
  readonly params: readonly (number | string)[];
}

/**
 * The data source and grouping shared by every query.
 *
 * @example
 * ```ts
 * import type { SqlShape } from "./query.ts";
 * import { DUCKDB } from "./dialect.ts";
 * import { foldHash } from "../stream/hash.ts";
 * const shape: SqlShape = { dialect: DUCKDB, table: ["obs"], query: null, key: "id", hash: foldHash(1, 10), partitionBy: [], required: [] };
 * ```
 */
export interface SqlShape {
  readonly dialect: SqlDialect;
  /** Table name parts (schema-qualified when several), or null when `query` is given. */
  readonly table: readonly string[] | null;
  /** A SELECT statement to read from instead of a table (trusted SQL). */
  readonly query: string | null;
  readonly key: string;
  /** The fold hash grouped by, unless `hashes` is given. */
  readonly hash: FoldHash;
  /**
   * Fold hashes of several repeats grouped by together, one fold column each in this order
   * (instead of `hash`); a row's group is then its folds in all of them.
   */
  readonly hashes?: readonly FoldHash[];
  /** Columns the table is partitioned by, added to GROUP BY. */
  readonly partitionBy: readonly string[];
  /** Columns that must not be NULL when rows with NULLs are dropped (else empty). */
  readonly required: readonly string[];
}

/** Collects parameters; equal values share one placeholder. */
class Params {
  readonly values: (number | string)[] = [];
  readonly #seen = new Map<string, string>();
  constructor(readonly dialect: SqlDialect) {}

  double(v: number): string {
    return this.#add(v, "DOUBLE PRECISION");
  }

  bigint(v: number): string {
    return this.#add(v, "BIGINT");
  }

  text(v: string): string {
    return this.#add(v, "TEXT");
  }

  #add(v: number | string, type: string): string {
    const id = `${type}:${Object.is(v, -0) ? 0 : v}`;
    let text = this.#seen.get(id);
    if (text === undefined) {
      this.values.push(v);
      text = `CAST(${this.dialect.placeholder(this.values.length)} AS ${type})`;
      this.#seen.set(id, text);
    }
    return text;
  }
}

/** The fold hashes a query groups by: `hashes`, else `hash`. */
function groupedHashes(shape: SqlShape): readonly FoldHash[] {
  return shape.hashes ?? [shape.hash];
}

/** The fold expression: curbfit.fold-hash/1 of the key column with `hash`'s coefficients. */
function foldExpression(shape: SqlShape, params: Params, hash: FoldHash): string {
  const p = String(FOLD_HASH_PRIME);
  const [a0, a1, a2, a3] = hash.coefficients.map((a) => params.bigint(a));
  const key = `CAST(${quoteIdentifier(shape.dialect, shape.key)} AS BIGINT)`;
  const x = `((${key} % ${p}) + ${p}) % ${p}`;
  let h = `(((${a3} * (${x})) % ${p}) + ${a2}) % ${p}`;
  h = `((((${h}) * (${x})) % ${p}) + ${a1}) % ${p}`;
  h = `((((${h}) * (${x})) % ${p}) + ${a0}) % ${p}`;
  return `(${h}) % ${params.bigint(hash.k)}`;
}

/**
 * The fold columns of a query over the grouped hashes: `curbfit_fold` for one, else
 * `curbfit_fold_<repeat>` for each.
 */
function foldGroups(shape: SqlShape, params: Params): Group[] {
  const hashes = groupedHashes(shape);
  return hashes.map((hash) => ({
    expression: foldExpression(shape, params, hash),
    alias: hashes.length === 1 ? "curbfit_fold" : `curbfit_fold_${hash.repeat}`,
  }));
}

function fromClause(shape: SqlShape): string {
  if (shape.table !== null) {
    return shape.table.map((part) => quoteIdentifier(shape.dialect, part)).join(".");
  }
  return `(${shape.query}) AS curbfit_source`;
}

function whereClause(shape: SqlShape): string {
  if (shape.required.length === 0) return "";
  const tests = shape.required.map((c) => `${quoteIdentifier(shape.dialect, c)} IS NOT NULL`);
  return ` WHERE ${tests.join(" AND ")}`;
}

/** A grouping expression and its output name. */
interface Group {
  readonly expression: string;
  readonly alias: string;
}

/** SELECT groups AS aliases, partition columns, aggregates … GROUP BY the groups and partitions. */
function groupedQuery(
  shape: SqlShape,
  params: Params,
  aggregates: readonly string[],
  groups: readonly Group[],
): SqlQuery {
  const parts = shape.partitionBy.map((c) => quoteIdentifier(shape.dialect, c));
  const select = [...groups.map((g) => `${g.expression} AS ${g.alias}`), ...parts, ...aggregates];
  const by = [...groups.map((g) => g.expression), ...parts];
  const text = `SELECT ${select.join(", ")} FROM ${fromClause(shape)}${whereClause(shape)} ` +
    `GROUP BY ${by.join(", ")}`;
  return { text, params: params.values };
}

function asDouble(shape: SqlShape, column: string): string {
  return `CAST(${quoteIdentifier(shape.dialect, column)} AS DOUBLE PRECISION)`;
}

/** A category column's value as text (its levels are compared as text). */
function asText(shape: SqlShape, column: string): string {
  return `CAST(${quoteIdentifier(shape.dialect, column)} AS TEXT)`;
}

/**
 * The ranges query: per fold (and partition), COUNT(*), then per numeric column MIN and MAX,
 * per shifted column SUM, and per checked column COUNT(column) (non-null rows). With
 * `shape.hashes`, per combination of the repeats' folds: one fold column per repeat first.
 *
 * @example
 * ```ts
 * import { rangesQuery } from "./query.ts";
 * import { DUCKDB } from "./dialect.ts";
 * import { foldHash } from "../stream/hash.ts";
 * const shape = { dialect: DUCKDB, table: ["t"], query: null, key: "id", hash: foldHash(1, 5), partitionBy: [], required: [] };
 * console.log(rangesQuery(shape, ["x"], ["y"], ["x", "y", "id"]).text.startsWith("SELECT")); // true
 * ```
 */
export function rangesQuery(
  shape: SqlShape,
  ranged: readonly string[],
  summed: readonly string[],
  counted: readonly string[],
): SqlQuery {
  const params = new Params(shape.dialect);
  const folds = foldGroups(shape, params);
  return groupedQuery(shape, params, rangesAggregates(shape, ranged, summed, counted), folds);
}

/** The aggregates of the ranges query (after its fold and partition columns). */
function rangesAggregates(
  shape: SqlShape,
  ranged: readonly string[],
  summed: readonly string[],
  counted: readonly string[],
): string[] {
  return [
    "CAST(COUNT(*) AS DOUBLE PRECISION)",
    ...ranged.flatMap((c) => [`MIN(${asDouble(shape, c)})`, `MAX(${asDouble(shape, c)})`]),
    ...summed.map((c) => `SUM(${asDouble(shape, c)})`),
    ...counted.map((c) => `CAST(COUNT(${quoteIdentifier(shape.dialect, c)}) AS DOUBLE PRECISION)`),
  ];
}

/**
 * Most fold groups (per partition) one query of {@link repeatBatches} makes: 1000, i.e. 3
 * repeats of 10 folds, 4 of 5, 9 of 2. Measured (README.md of lib/sql): grouping 3 repeats of 10
 * folds in one scan took about the time of one repeat on PostgreSQL and DuckDB; 10 000 groups
 * were slower than two scans on DuckDB, where sending groups × sums to the client then costs
 * more than a scan.
 *
 * @example
 * ```ts
 * import { MAX_FOLD_GROUPS } from "./query.ts";
 * console.log(MAX_FOLD_GROUPS); // 1000
 * ```
 */
export const MAX_FOLD_GROUPS = 1000;

/**
 * Repeats 0 … repeats − 1 split into consecutive batches, each grouped by one query (one scan):
 * a batch of b repeats makes up to k^b fold groups (per partition), so each batch is as long as
 * keeps k^b within `groups` ({@link MAX_FOLD_GROUPS}), and at least one repeat.
 *
 * @example
 * ```ts
 * import { repeatBatches } from "./query.ts";
 * console.log(repeatBatches(3, 10)); // [ [ 0, 1, 2 ] ]: 1000 groups
 * console.log(repeatBatches(3, 20)); // [ [ 0, 1 ], [ 2 ] ]: 400 groups, then 20
 * ```
 */
export function repeatBatches(repeats: number, k: number, groups = MAX_FOLD_GROUPS): number[][] {
  let size = 1;
  while (size < repeats && k ** (size + 1) <= groups) size++;
  const batches: number[][] = [];
  for (let start = 0; start < repeats; start += size) {
    batches.push(Array.from({ length: Math.min(size, repeats - start) }, (_, i) => start + i));
  }
  return batches;
}

/**
 * A query counting all rows of the source (to report rows dropped for NULLs).
 *
 * @example
 * ```ts
 * import { countQuery } from "./query.ts";
 * import { POSTGRESQL } from "./dialect.ts";
 * import { foldHash } from "../stream/hash.ts";
 * const shape = { dialect: POSTGRESQL, table: ["s", "t"], query: null, key: "id", hash: foldHash(1, 5), partitionBy: [], required: [] };
 * console.log(countQuery(shape).text); // SELECT CAST(COUNT(*) AS DOUBLE PRECISION) FROM "s"."t"
 * ```
 */
export function countQuery(shape: SqlShape): SqlQuery {
  return {
    text: `SELECT CAST(COUNT(*) AS DOUBLE PRECISION) FROM ${fromClause(shape)}`,
    params: [],
  };
}

/**
 * The levels query of one category column: each distinct value as text (NULL for missing) and
 * its row count, grouped with the partition columns too, so that a sharded table is counted on
 * its shards (the client adds the counts up, {@link levelRows}).
 *
 * @example
 * ```ts
 * import { levelsQuery } from "./query.ts";
 * import { DUCKDB } from "./dialect.ts";
 * import { foldHash } from "../stream/hash.ts";
 * const shape = { dialect: DUCKDB, table: ["t"], query: null, key: "id", hash: foldHash(1, 5), partitionBy: [], required: [] };
 * console.log(levelsQuery(shape, "site").text);
 * // SELECT CAST("site" AS TEXT) AS curbfit_level, CAST(COUNT(*) AS DOUBLE PRECISION) FROM "t" GROUP BY CAST("site" AS TEXT)
 * ```
 */
export function levelsQuery(shape: SqlShape, column: string): SqlQuery {
  const params = new Params(shape.dialect);
  const count = "CAST(COUNT(*) AS DOUBLE PRECISION)";
  const level = { expression: asText(shape, column), alias: "curbfit_level" };
  return groupedQuery(shape, params, [count], [level]);
}

/**
 * Rows per level from the result of {@link levelsQuery} (NULL levels left out: the ranges query
 * reports NULLs).
 *
 * @example
 * ```ts
 * import { levelRows } from "./query.ts";
 * const result = { columns: ["curbfit_level", "n"], rows: [["b", 2], ["a", 5], [null, 1], ["b", 1]] };
 * console.log(levelRows(result, 0)); // Map(2) { "b" => 3, "a" => 5 }
 * ```
 */
export function levelRows(result: SqlRows, partitions: number): Map<string, number> {
  const rows = new Map<string, number>();
  for (const row of result.rows) {
    if (row[0] === null || row[0] === undefined) continue;
    const level = String(row[0]);
    rows.set(level, (rows.get(level) ?? 0) + Number(row[1 + partitions]));
  }
  return rows;
}

/**
 * A query reading no rows, to learn the source's column names.
 *
 * @example
 * ```ts
 * import { columnsQuery } from "./query.ts";
 * import { DUCKDB } from "./dialect.ts";
 * import { foldHash } from "../stream/hash.ts";
 * const shape = { dialect: DUCKDB, table: ["t"], query: null, key: "id", hash: foldHash(1, 5), partitionBy: [], required: [] };
 * console.log(columnsQuery(shape).text); // SELECT * FROM "t" WHERE 1 = 0
 * ```
 */
export function columnsQuery(shape: SqlShape): SqlQuery {
  return { text: `SELECT * FROM ${fromClause(shape)} WHERE 1 = 0`, params: [] };
}

/**
 * The SUM items of the moments query for these blocks, in a fixed order.
 *
 * @example
 * ```ts
 * import { sumItems } from "./query.ts";
 * console.log(sumItems([{ kind: "shifted", column: "y", shift: 0 }]).length); // 2: Σy, Σy²
 * ```
 */
export function sumItems(blocks: readonly FeatureBlock[]): SumItem[] {
  const items: SumItem[] = [];
  blocks.forEach((b, i) => {
    if (b.kind === "chebyshev") {
      for (let m = 1; m <= 2 * b.degree; m++) items.push({ kind: "chebyshev", block: i, m });
    } else if (b.kind === "levels") {
      items.push({ kind: "levels", block: i });
    } else {
      for (let index = 0; index < blockSize(b); index++) {
        items.push({ kind: "linear", block: i, index });
      }
    }
  });
  for (let left = 0; left < blocks.length; left++) {
    for (let right = left; right < blocks.length; right++) {
      if (left === right && blocks[left].kind === "chebyshev") continue;
      for (let leftIndex = 0; leftIndex < blockSize(blocks[left]); leftIndex++) {
        for (let rightIndex = 0; rightIndex < blockSize(blocks[right]); rightIndex++) {
          if (left === right && rightIndex < leftIndex) continue;
          items.push({ kind: "product", left, leftIndex, right, rightIndex });
        }
      }
    }
  }
  return items;
}

/**
 * Design columns of a block: Legendre degree, 1 for a shifted column, the factor columns, and
 * none for a levels check.
 *
 * @example
 * ```ts
 * import { blockSize } from "./query.ts";
 * console.log(blockSize({ kind: "levels", column: "site", levels: ["a", "b"] })); // 0
 * ```
 */
export function blockSize(b: FeatureBlock): number {
  switch (b.kind) {
    case "chebyshev":
      return b.degree;
    case "shifted":
      return 1;
    case "factors":
      return b.columns.length;
    case "levels":
      return 0;
  }
}

/** SQL of T_m(t) for a mapped column. */
function chebyshevSql(
  shape: SqlShape,
  params: Params,
  block: MappedColumn,
  m: number,
): string {
  const x = asDouble(shape, block.column);
  const lo = params.double(block.domain[0]);
  const hi = params.double(block.domain[1]);
  const t = `(((${x} - ${lo}) - (${hi} - ${x})) / (${hi} - ${lo}))`;
  const mm = `CAST(${m} AS DOUBLE PRECISION)`;
  // Inside [lo, hi] the mapped value is within [−1, 1] exactly (each rounding is monotone and
  // |(x − lo) − (hi − x)| ≤ hi − lo), so ACOS needs no clamp; CASE is only used when rows may
  // lie outside (PostgreSQL 15's postgres_fdw ships neither CASE nor LEAST/GREATEST).
  if (!block.outside) return `COS(${mm} * ACOS(${t}))`;
  const sign = m % 2 === 0 ? "" : "-";
  return `(CASE WHEN ${t} > 1.0 THEN COSH(${mm} * ACOSH(${t})) ` +
    `WHEN ${t} < -1.0 THEN ${sign}COSH(${mm} * ACOSH(-${t})) ` +
    `ELSE COS(${mm} * ACOS(${t})) END)`;
}

/**
 * SQL of P_n(t) as its Chebyshev sum Σ_m L[n, m] T_m(t) (lib/sql/chebyshev.ts; T_0 = 1), so that
 * a Legendre factor of a product needs no recurrence.
 */
function legendreSql(
  shape: SqlShape,
  params: Params,
  factor: Extract<Factor, { kind: "legendre" }>,
): string {
  const n = factor.order, w = n + 1;
  const l = legendreFromChebyshev(n);
  const parts: string[] = [];
  for (let m = 0; m <= n; m++) {
    const c = l[n * w + m];
    if (c === 0) continue;
    const coefficient = params.double(c);
    parts.push(
      m === 0 ? coefficient : `${coefficient} * ${chebyshevSql(shape, params, factor, m)}`,
    );
  }
  return `(${parts.join(" + ")})`;
}

function factorSql(shape: SqlShape, params: Params, factor: Factor): string {
  switch (factor.kind) {
    case "value":
      return asDouble(shape, factor.column);
    case "power":
      // Exponents are whole numbers 2 … 200 checked by power(); written into the text.
      return `POWER(${asDouble(shape, factor.column)}, ` +
        `CAST(${factor.exponent} AS DOUBLE PRECISION))`;
    case "level":
      // 0/1 without CASE (PostgreSQL 15's postgres_fdw would not ship CASE to the shards).
      return `CAST(CAST(${asText(shape, factor.column)} = ${params.text(factor.level)} ` +
        "AS INTEGER) AS DOUBLE PRECISION)";
    case "legendre":
      return legendreSql(shape, params, factor);
  }
}

function featureSql(shape: SqlShape, params: Params, block: FeatureBlock, index: number): string {
  switch (block.kind) {
    case "chebyshev":
      return chebyshevSql(shape, params, block, index + 1);
    case "shifted":
      return `(${asDouble(shape, block.column)} - ${params.double(block.shift)})`;
    case "factors": {
      const { factors, shift } = block.columns[index];
      const product = factors.map((f) => factorSql(shape, params, f)).join(" * ");
      return `(${product} - ${params.double(shift)})`;
    }
    case "levels":
      throw new RangeError("a levels block has no design columns");
  }
}

/** SQL counting rows whose level of the block's column is one of its levels. */
function knownLevelsSql(
  shape: SqlShape,
  params: Params,
  block: Extract<FeatureBlock, { kind: "levels" }>,
): string {
  const list = block.levels.map((level) => params.text(level)).join(", ");
  return `SUM(CAST(CAST(${asText(shape, block.column)} IN (${list}) AS INTEGER) ` +
    "AS DOUBLE PRECISION))";
}

function itemSql(
  shape: SqlShape,
  params: Params,
  blocks: readonly FeatureBlock[],
  item: SumItem,
): string {
  switch (item.kind) {
    case "chebyshev": {
      const b = blocks[item.block] as Extract<FeatureBlock, { kind: "chebyshev" }>;
      return `SUM(${chebyshevSql(shape, params, b, item.m)})`;
    }
    case "linear":
      return `SUM(${featureSql(shape, params, blocks[item.block], item.index)})`;
    case "levels":
      return knownLevelsSql(
        shape,
        params,
        blocks[item.block] as Extract<FeatureBlock, { kind: "levels" }>,
      );
    case "product":
      return `SUM(${featureSql(shape, params, blocks[item.left], item.leftIndex)} * ${
        featureSql(shape, params, blocks[item.right], item.rightIndex)
      })`;
  }
}

/**
 * The moments queries: per fold (and partition) COUNT(*) and the SUM items, split into
 * queries of at most `maxAggregates` sums (PostgreSQL allows 1664 output columns). With
 * `shape.hashes`, per combination of the repeats' folds (one fold column per repeat first).
 * `bucket` replaces the fold by (fold = f ? 1 : 0) of `shape.hash`, for re-reading one fold in
 * its own basis.
 *
 * @example
 * ```ts
 * import { momentsQueries, sumItems } from "./query.ts";
 * import { DUCKDB } from "./dialect.ts";
 * import { foldHash } from "../stream/hash.ts";
 * const shape = { dialect: DUCKDB, table: ["t"], query: null, key: "id", hash: foldHash(1, 5), partitionBy: [], required: [] };
 * const blocks = [{ kind: "shifted" as const, column: "y", shift: 2.5 }];
 * console.log(momentsQueries(shape, blocks, sumItems(blocks), 1000, null).length); // 1
 * ```
 */
export function momentsQueries(
  shape: SqlShape,
  blocks: readonly FeatureBlock[],
  items: readonly SumItem[],
  maxAggregates: number,
  bucket: number | null,
): SqlQuery[] {
  const queries: SqlQuery[] = [];
  for (let start = 0; start === 0 || start < items.length; start += maxAggregates) {
    const params = new Params(shape.dialect);
    const folds = bucket === null ? foldGroups(shape, params) : [{
      expression: `(CASE WHEN ${foldExpression(shape, params, shape.hash)} = ${
        params.bigint(bucket)
      } THEN 1 ELSE 0 END)`,
      alias: "curbfit_fold",
    }];
    const sums = items.slice(start, start + maxAggregates).map((it) =>
      itemSql(shape, params, blocks, it)
    );
    queries.push(
      groupedQuery(shape, params, ["CAST(COUNT(*) AS DOUBLE PRECISION)", ...sums], folds),
    );
  }
  return queries;
}

/**
 * The feature blocks of learned terms and the target, in design order (target last), then one
 * levels check per category column. Legendre terms become Chebyshev blocks; plain columns and
 * the target are shifted by `shifts` (their means from the ranges query); the columns of
 * `power`, `indicators` and `product` terms become factor columns, in the order and number of
 * the term's names, shifted by a guess at their mean: c^k for x^k (c the mean of x), a level's
 * share of the rows for its indicator, 0 for a Legendre polynomial, and the product of the
 * factors' shifts for a product. `outside` forces the |t| > 1 branch of every Legendre value
 * (for a fold's own basis, where rows of other folds may lie outside its domain).
 *
 * @example
 * ```ts
 * import { featureBlocks } from "./query.ts";
 * import { addLevelRows, addToRanges, emptyRanges, learnOnRanges } from "../stream/ranges.ts";
 * import { indicators, power } from "../design/mod.ts";
 * const ranges = emptyRanges(["x"], 2, ["site"]);
 * addToRanges(ranges, 0, new Map([["x", 1]]));
 * addToRanges(ranges, 1, new Map([["x", 3]]));
 * addLevelRows(ranges, "site", "a", 1);
 * addLevelRows(ranges, "site", "b", 1);
 * const terms = learnOnRanges([power("x", 2), indicators("site")], ranges, -1, "demo");
 * const blocks = featureBlocks(terms, "y", new Map([["x", 2], ["y", 0]]), ranges, false);
 * console.log(blocks.map((b) => b.kind)); // [ "factors", "factors", "shifted", "levels" ]
 * ```
 */
export function featureBlocks(
  terms: readonly LearnedTerm[],
  target: string,
  shifts: ReadonlyMap<string, number>,
  ranges: FoldRanges,
  outside: boolean,
): FeatureBlock[] {
  const rows = rowCount(ranges);
  const learnedLevels = new Map<string, readonly string[]>();
  const mapped = (column: string, domain: readonly [number, number]): MappedColumn => {
    const lo = Math.min(...ranges.min.get(column)!), hi = Math.max(...ranges.max.get(column)!);
    return { column, domain, outside: outside || lo < domain[0] || hi > domain[1] };
  };
  const factorColumns = (spec: Json, params: Json, label: string): FactorColumn[] => {
    const s = spec as { readonly [k: string]: Json };
    const column = s.column as string;
    switch (s.kind) {
      case "column":
      case "power":
        return Array.from({ length: s.kind === "column" ? 1 : s.degree as number }, (_, j) => ({
          factors: [
            j === 0
              ? { kind: "value" as const, column }
              : { kind: "power" as const, column, exponent: j + 1 },
          ],
          shift: (shifts.get(column) ?? 0) ** (j + 1),
        }));
      case "legendre": {
        const domain = (params as { domain: [number, number] }).domain;
        return Array.from({ length: s.degree as number }, (_, n) => ({
          factors: [{ kind: "legendre" as const, order: n + 1, ...mapped(column, domain) }],
          shift: 0,
        }));
      }
      case "indicators": {
        const levels = (params as { levels: string[] }).levels;
        learnedLevels.set(column, levels);
        return levels.slice(1).map((level) => ({
          factors: [{ kind: "level" as const, column, level }],
          shift: rows > 0 ? (ranges.levels.get(column)?.get(level) ?? 0) / rows : 0,
        }));
      }
      case "product": {
        const p = params as { left: Json; right: Json };
        const left = factorColumns(s.left, p.left, label);
        const right = factorColumns(s.right, p.right, label);
        return left.flatMap((a) =>
          right.map((b) => ({ factors: [...a.factors, ...b.factors], shift: a.shift * b.shift }))
        );
      }
      default:
        throw new CurbfitError(
          "BAD_OPTION",
          `the term ${label} has a spec that SQL sweeps cannot compute (kind ${
            JSON.stringify(s.kind)
          })`,
          "Use legendre, column, power, indicators and product terms, or sweep the table in memory",
          { option: "terms" },
        );
    }
  };
  const blocks: FeatureBlock[] = terms.map((t) => {
    const column = t.term.inputs[0];
    if (t.term.kind === "legendre") {
      const domain = (t.params as { domain: [number, number] }).domain;
      return { kind: "chebyshev", degree: t.names.length, ...mapped(column, domain) };
    }
    if (t.term.kind === "column") return { kind: "shifted", column, shift: shifts.get(column)! };
    const columns = factorColumns(t.term.spec, t.params, t.term.label);
    if (columns.length !== t.names.length) {
      throw new CurbfitError(
        "BAD_OPTION",
        `the term ${t.term.label} writes ${t.names.length} columns, but its spec describes ` +
          `${columns.length}`,
        "Use the term constructors of curbfit (legendre, column, power, indicators, product)",
        { option: "terms" },
      );
    }
    return { kind: "factors", columns };
  });
  blocks.push({ kind: "shifted", column: target, shift: shifts.get(target)! });
  for (const [column, levels] of learnedLevels) blocks.push({ kind: "levels", column, levels });
  return blocks;
}
