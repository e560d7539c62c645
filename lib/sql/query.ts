/**
 * The SQL text of curbfit's two aggregates, with every value (seeded hash coefficients, fold
 * count, Legendre domains, shifts) passed as a parameter and every name quoted.
 *
 * 1. The ranges query: per fold, the row count, each input's MIN and MAX (Legendre domains
 *    of every training fold), each shifted column's SUM (its shift) and non-null counts.
 * 2. The moments query: per fold, COUNT(*) and SUMs of the features u and their products,
 *    where u is T_1 … T_d (Chebyshev, lib/sql/chebyshev.ts) of each Legendre term's mapped
 *    column and (value − shift) for plain columns and the target. Within one Legendre term only
 *    the sums of T_m (m ≤ 2d) are needed. The client turns these raw sums into centered
 *    co-moments in the Legendre basis (lib/sql/sums.ts).
 *
 * The fold of a row is the fold hash `curbfit.fold-hash/1` (lib/stream/README.md) in BIGINT
 * arithmetic: every product is below 2^62, so nothing overflows.
 *
 * @module
 */
import { quoteIdentifier, type SqlDialect } from "./dialect.ts";
import { FOLD_HASH_PRIME, type FoldHash } from "../stream/hash.ts";

/**
 * One block of features: a Legendre term (as Chebyshev columns) or one shifted column.
 *
 * @example
 * ```ts
 * import type { FeatureBlock } from "./query.ts";
 * const y: FeatureBlock = { kind: "shifted", column: "y", shift: 1.5 };
 * ```
 */
export type FeatureBlock =
  | {
    readonly kind: "chebyshev";
    readonly column: string;
    readonly degree: number;
    readonly domain: readonly [number, number];
    /** Whether some rows may lie outside the domain (then |t| > 1 is handled). */
    readonly outside: boolean;
  }
  | { readonly kind: "shifted"; readonly column: string; readonly shift: number };

/**
 * What one SUM adds up, for rebuilding the moment matrix.
 *
 * @example
 * ```ts
 * import type { SumItem } from "./query.ts";
 * const item: SumItem = { kind: "chebyshev", block: 0, m: 3 }; // SUM(T_3(t))
 * ```
 */
export type SumItem =
  | { readonly kind: "chebyshev"; readonly block: number; readonly m: number }
  | { readonly kind: "linear"; readonly block: number }
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
  readonly hash: FoldHash;
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

  #add(v: number, type: string): string {
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

/** The fold expression: curbfit.fold-hash/1 of the key column. */
function foldExpression(shape: SqlShape, params: Params): string {
  const p = String(FOLD_HASH_PRIME);
  const [a0, a1, a2, a3] = shape.hash.coefficients.map((a) => params.bigint(a));
  const key = `CAST(${quoteIdentifier(shape.dialect, shape.key)} AS BIGINT)`;
  const x = `((${key} % ${p}) + ${p}) % ${p}`;
  let h = `(((${a3} * (${x})) % ${p}) + ${a2}) % ${p}`;
  h = `((((${h}) * (${x})) % ${p}) + ${a1}) % ${p}`;
  h = `((((${h}) * (${x})) % ${p}) + ${a0}) % ${p}`;
  return `(${h}) % ${params.bigint(shape.hash.k)}`;
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

/** SELECT fold, partition columns, aggregates … GROUP BY the same. */
function groupedQuery(
  shape: SqlShape,
  params: Params,
  aggregates: readonly string[],
  fold: string,
): SqlQuery {
  const parts = shape.partitionBy.map((c) => quoteIdentifier(shape.dialect, c));
  const select = [`${fold} AS curbfit_fold`, ...parts, ...aggregates];
  const text = `SELECT ${select.join(", ")} FROM ${fromClause(shape)}${whereClause(shape)} ` +
    `GROUP BY ${[fold, ...parts].join(", ")}`;
  return { text, params: params.values };
}

function asDouble(shape: SqlShape, column: string): string {
  return `CAST(${quoteIdentifier(shape.dialect, column)} AS DOUBLE PRECISION)`;
}

/**
 * The ranges query: per fold (and partition), COUNT(*), then per numeric column MIN and MAX,
 * per shifted column SUM, and per checked column COUNT(column) (non-null rows).
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
  const fold = foldExpression(shape, params);
  const aggregates = [
    "CAST(COUNT(*) AS DOUBLE PRECISION)",
    ...ranged.flatMap((c) => [`MIN(${asDouble(shape, c)})`, `MAX(${asDouble(shape, c)})`]),
    ...summed.map((c) => `SUM(${asDouble(shape, c)})`),
    ...counted.map((c) => `CAST(COUNT(${quoteIdentifier(shape.dialect, c)}) AS DOUBLE PRECISION)`),
  ];
  return groupedQuery(shape, params, aggregates, fold);
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
    } else {
      items.push({ kind: "linear", block: i });
    }
  });
  const size = (b: FeatureBlock) => (b.kind === "chebyshev" ? b.degree : 1);
  for (let left = 0; left < blocks.length; left++) {
    for (let right = left; right < blocks.length; right++) {
      if (left === right && blocks[left].kind === "chebyshev") continue;
      for (let leftIndex = 0; leftIndex < size(blocks[left]); leftIndex++) {
        for (let rightIndex = 0; rightIndex < size(blocks[right]); rightIndex++) {
          if (left === right && rightIndex < leftIndex) continue;
          items.push({ kind: "product", left, leftIndex, right, rightIndex });
        }
      }
    }
  }
  return items;
}

/** SQL of T_m(t) for the block's mapped column. */
function chebyshevSql(
  shape: SqlShape,
  params: Params,
  block: Extract<FeatureBlock, { kind: "chebyshev" }>,
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

function featureSql(shape: SqlShape, params: Params, block: FeatureBlock, index: number): string {
  if (block.kind === "chebyshev") return chebyshevSql(shape, params, block, index + 1);
  return `(${asDouble(shape, block.column)} - ${params.double(block.shift)})`;
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
      return `SUM(${featureSql(shape, params, blocks[item.block], 0)})`;
    case "product":
      return `SUM(${featureSql(shape, params, blocks[item.left], item.leftIndex)} * ${
        featureSql(shape, params, blocks[item.right], item.rightIndex)
      })`;
  }
}

/**
 * The moments queries: per fold (and partition) COUNT(*) and the SUM items, split into
 * queries of at most `maxAggregates` sums (PostgreSQL allows 1664 output columns). `bucket`
 * replaces the fold by (fold = f ? 1 : 0) for re-reading one fold in its own basis.
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
    const hashed = foldExpression(shape, params);
    const fold = bucket === null
      ? hashed
      : `(CASE WHEN ${hashed} = ${params.bigint(bucket)} THEN 1 ELSE 0 END)`;
    const sums = items.slice(start, start + maxAggregates).map((it) =>
      itemSql(shape, params, blocks, it)
    );
    queries.push(
      groupedQuery(shape, params, ["CAST(COUNT(*) AS DOUBLE PRECISION)", ...sums], fold),
    );
  }
  return queries;
}
