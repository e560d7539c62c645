/**
 * What differs between SQL engines for curbfit's queries: how identifiers are quoted and how
 * long they may be, and how parameters are written. Everything else the queries use is
 * portable (README.md, "Scale").
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

/**
 * One engine's rules.
 *
 * @example
 * ```ts
 * import type { SqlDialect } from "./dialect.ts";
 * const other: SqlDialect = { name: "other", maxIdentifierBytes: 128, placeholder: (i) => `$${i}` };
 * ```
 */
export interface SqlDialect {
  /** "postgresql", "duckdb", … (for messages). */
  readonly name: string;
  /** Longest identifier in UTF-8 bytes the engine keeps whole (PostgreSQL truncates at 63). */
  readonly maxIdentifierBytes: number;
  /** The text of parameter i (1-based). */
  placeholder(i: number): string;
}

/**
 * PostgreSQL: `"…"` identifiers up to NAMEDATALEN − 1 = 63 bytes (longer ones are silently
 * truncated by the server, so curbfit refuses them), `$1` parameters.
 *
 * @example
 * ```ts
 * import { POSTGRESQL, quoteIdentifier } from "./dialect.ts";
 * console.log(quoteIdentifier(POSTGRESQL, 'a"b')); // "a""b"
 * ```
 */
export const POSTGRESQL: SqlDialect = Object.freeze({
  name: "postgresql",
  maxIdentifierBytes: 63,
  placeholder: (i: number) => `$${i}`,
});

/**
 * DuckDB: `"…"` identifiers (no length limit that matters here), `$1` parameters.
 *
 * @example
 * ```ts
 * import { DUCKDB } from "./dialect.ts";
 * console.log(DUCKDB.placeholder(2)); // $2
 * ```
 */
export const DUCKDB: SqlDialect = Object.freeze({
  name: "duckdb",
  maxIdentifierBytes: 65535,
  placeholder: (i: number) => `$${i}`,
});

/**
 * A name as a delimited identifier (SQL standard: double quotes, a `"` inside written `""`),
 * after refusing what no engine can hold: empty names, NUL characters, names longer than the
 * dialect keeps. Whatever the name holds — quotes, semicolons, keywords — it stays one name.
 *
 * @example
 * ```ts
 * import { DUCKDB, quoteIdentifier } from "./dialect.ts";
 * console.log(quoteIdentifier(DUCKDB, "select; drop table t")); // "select; drop table t"
 * ```
 */
export function quoteIdentifier(dialect: SqlDialect, name: string): string {
  const bytes = new TextEncoder().encode(name).length;
  if (typeof name !== "string" || name === "" || name.includes("\0")) {
    throw new CurbfitError(
      "BAD_OPTION",
      `the SQL name ${JSON.stringify(name)} is empty or holds a NUL character`,
      "Name an existing table or column",
      { option: "table" },
    );
  }
  if (bytes > dialect.maxIdentifierBytes) {
    throw new CurbfitError(
      "BAD_OPTION",
      `the SQL name ${JSON.stringify(name.slice(0, 40))}… is ${bytes} bytes long, but ` +
        `${dialect.name} keeps only ${dialect.maxIdentifierBytes}`,
      "Rename the table or column, or select it under a shorter alias in a query",
      { option: "table" },
    );
  }
  return `"${name.replaceAll('"', '""')}"`;
}
