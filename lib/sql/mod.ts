/**
 * The sweep pushed down into SQL engines (`sweepSql`): two portable GROUP BY aggregates return
 * per-fold sums, curbfit solves from them. Adapters wrap a DuckDB (`@duckdb/node-api`) or
 * PostgreSQL (`pg`) connection the caller opened. README.md at the repository root, "Scale",
 * lists the SQL features the queries need.
 *
 * @example
 * ```ts
 * import { DUCKDB, quoteIdentifier } from "./mod.ts";
 * console.log(quoteIdentifier(DUCKDB, 'odd "name"')); // "odd ""name"""
 * ```
 *
 * @module
 */
export {
  duckdbConnection,
  type DuckDBConnectionLike,
  type PgClientLike,
  postgresConnection,
  type SqlConnection,
  type SqlRows,
} from "./connection.ts";
export { DUCKDB, POSTGRESQL, quoteIdentifier, type SqlDialect } from "./dialect.ts";
export type { SqlQuery } from "./query.ts";
export { type SqlSweepResult, type SqlSweepSpec, sweepSql } from "./sweep.ts";
