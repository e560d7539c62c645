/**
 * The one thing curbfit asks of a SQL engine: run a parameterized query and return its rows as
 * arrays. Adapters wrap a connection the caller opened (and closes) — DuckDB's
 * `@duckdb/node-api` and PostgreSQL's `pg` — by their shape only, so curbfit itself imports
 * neither driver.
 *
 * @module
 */
import { DUCKDB, POSTGRESQL, type SqlDialect } from "./dialect.ts";
import type { SqlQuery } from "./query.ts";

/**
 * Rows as arrays, and the column names.
 *
 * @example
 * ```ts
 * import type { SqlRows } from "./connection.ts";
 * const r: SqlRows = { columns: ["n"], rows: [[3]] };
 * ```
 */
export interface SqlRows {
  /** Result column names, in SELECT order. */
  readonly columns: readonly string[];
  /** One array per result row, values in `columns` order, typed as the driver returns them. */
  readonly rows: readonly (readonly unknown[])[];
}

/**
 * A connection curbfit can query.
 *
 * @example
 * ```ts
 * import type { SqlConnection } from "./connection.ts";
 * import { DUCKDB } from "./dialect.ts";
 * const canned: SqlConnection = { dialect: DUCKDB, run: () => Promise.resolve({ columns: [], rows: [] }) };
 * ```
 */
export interface SqlConnection {
  /** The engine's identifier quoting, identifier length limit and parameter syntax. */
  readonly dialect: SqlDialect;
  /** Runs one parameterized query and resolves to all of its rows; rejects on a driver error. */
  run(query: SqlQuery): Promise<SqlRows>;
}

/**
 * The part of a `@duckdb/node-api` DuckDBConnection that curbfit uses.
 *
 * @example
 * ```ts
 * import type { DuckDBConnectionLike } from "./connection.ts";
 * const fake: DuckDBConnectionLike = {
 *   runAndReadAll: () => Promise.resolve({ columnNames: () => ["a"], getRows: () => [[1]] }),
 * };
 * ```
 */
export interface DuckDBConnectionLike {
  /** Runs `sql` with positional `values` for `$1`, `$2`, … and reads the whole result. */
  runAndReadAll(
    sql: string,
    values?: (number | string)[],
  ): Promise<{ columnNames(): string[]; getRows(): unknown[][] }>;
}

/**
 * The part of a `pg` Client or Pool that curbfit uses.
 *
 * @example
 * ```ts
 * import type { PgClientLike } from "./connection.ts";
 * const fake: PgClientLike = { query: () => Promise.resolve({ fields: [{ name: "a" }], rows: [[1]] }) };
 * ```
 */
export interface PgClientLike {
  /** Runs a parameterized query; `rowMode: "array"` makes each row an array, not an object. */
  query(config: { text: string; values: unknown[]; rowMode: "array" }): Promise<{
    fields: { name: string }[];
    rows: unknown[][];
  }>;
}

/**
 * Wraps a DuckDB connection (`@duckdb/node-api`; Deno needs --allow-ffi to load it).
 *
 * @example
 * ```ts ignore
 * import { DuckDBInstance } from "@duckdb/node-api";
 * import { duckdbConnection } from "./connection.ts";
 * const db = await DuckDBInstance.create(":memory:");
 * const sql = duckdbConnection(await db.connect());
 * console.log((await sql.run({ text: "SELECT 1", params: [] })).rows); // [ [ 1 ] ]
 * ```
 */
export function duckdbConnection(connection: DuckDBConnectionLike): SqlConnection {
  return {
    dialect: DUCKDB,
    async run(query) {
      // The driver binds a whole-number JavaScript number as INTEGER or BIGINT and fails beyond
      // the BIGINT range (e.g. the double 1e20, a shift of x^10 for x near 100); such a value is
      // sent as its shortest round-trip text, which the query's CAST reads back exactly.
      const values = query.params.map((v) =>
        typeof v === "number" && Number.isInteger(v) && !Number.isSafeInteger(v) ? String(v) : v
      );
      const reader = await connection.runAndReadAll(query.text, values);
      return { columns: reader.columnNames(), rows: reader.getRows() };
    },
  };
}

/**
 * Wraps a PostgreSQL client or pool (`pg`).
 *
 * @example
 * ```ts ignore
 * import pg from "pg";
 * import { postgresConnection } from "./connection.ts";
 * const client = new pg.Client({ host: "127.0.0.1", port: 5432, user: "me", database: "lab" });
 * await client.connect();
 * const sql = postgresConnection(client);
 * console.log((await sql.run({ text: "SELECT $1::int + 1", params: [1] })).rows); // [ [ 2 ] ]
 * await client.end();
 * ```
 */
export function postgresConnection(client: PgClientLike): SqlConnection {
  return {
    dialect: POSTGRESQL,
    async run(query) {
      const result = await client.query({
        text: query.text,
        values: query.params.map((v) => (typeof v === "number" ? String(v) : v)),
        rowMode: "array",
      });
      return { columns: result.fields.map((f) => f.name), rows: result.rows };
    },
  };
}
