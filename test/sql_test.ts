/**
 * SQL pushdown: the fold hash and the aggregates computed by DuckDB (embedded, npm
 * @duckdb/node-api) and by real PostgreSQL servers (Debian package postgresql, started on
 * loopback ports in temporary folders and stopped afterwards), one of them sharded over two
 * more with postgres_fdw. Reference: the in-memory sweep on the same folds (explicitPlan from
 * the same hash), to 1e-8 relative. Data is invented (test/helpers.ts).
 * Missing DuckDB (no --allow-ffi) or PostgreSQL prints `SKIP:`; under CI=true it fails.
 */
import assert from "node:assert/strict";
import { column, CurbfitError, explicitPlan, legendre, sweep } from "../mod.ts";
import { legendreValues } from "../lib/design/legendre.ts";
import { duckdbConnection, postgresConnection, type SqlConnection } from "../lib/sql/connection.ts";
import { DUCKDB, POSTGRESQL, quoteIdentifier } from "../lib/sql/dialect.ts";
import { momentsQueries, rangesQuery, sumItems } from "../lib/sql/query.ts";
import { sweepSql } from "../lib/sql/sweep.ts";
import { chebyshevValues, legendreFromChebyshev } from "../lib/sql/chebyshev.ts";
import { foldHash, foldOfKey, foldsOfKeys } from "../lib/stream/hash.ts";
import {
  ffiAllowed,
  partitionOverShards,
  postgresInstalled,
  type PostgresServer,
  requireTool,
  startPostgres,
  withDuckDB,
} from "./sql/servers.ts";
import { assertSameSweep, keyedRows, memorySweep } from "./sql/scale_helpers.ts";

const TOL = 1e-8;
const K = 5;
const SEED = 11;
const TERMS = [legendre("x", 12), column("z1"), column("z2")];
const ROWS = keyedRows(21, 3000);

/** Keys that exercise the BIGINT range and the reduction modulo 2^31 − 1. */
const EDGE_KEYS = [
  "0",
  "1",
  "-1",
  "2147483646",
  "2147483647",
  "2147483648",
  "-2147483648",
  "4294967296",
  "9007199254740993",
  "9223372036854775807",
  "-9223372036854775808",
  "123456789012345678",
];

Deno.test("Chebyshev → Legendre coefficients reproduce Bonnet's recurrence to 1e-14 (degree ≤ 60)", () => {
  // Reference: the recurrence of lib/design/legendre.ts (Abramowitz & Stegun 22.7.10).
  for (const d of [1, 2, 7, 25, 60]) {
    const l = legendreFromChebyshev(d);
    for (const t of [-1, -0.999, -0.5, 0, 0.3, 0.77, 0.99999, 1]) {
      const tm = chebyshevValues(t, d + 1);
      const p = legendreValues(t, d);
      for (let n = 0; n <= d; n++) {
        let s = 0;
        for (let m = 0; m <= d; m++) s += l[n * (d + 1) + m] * tm[m];
        assert.ok(
          Math.abs(s - p[n]) <= 1e-14 * d * d + 1e-15,
          `d ${d} n ${n} t ${t}: ${s} vs ${p[n]}`,
        );
      }
    }
    // every row of coefficients is positive and sums to P_n(1) = 1
    for (let n = 0; n <= d; n++) {
      const row = l.slice(n * (d + 1), (n + 1) * (d + 1));
      assert.ok(row.every((v) => v >= 0));
      assert.ok(Math.abs(row.reduce((s, v) => s + v, 0) - 1) < 1e-14);
    }
  }
});

Deno.test("query text: hostile names are quoted identifiers and every value is a parameter", () => {
  const table = 'lab"; DROP TABLE keep; --';
  const shape = {
    dialect: POSTGRESQL,
    table: ["my schema", table],
    query: null,
    key: "order",
    hash: foldHash(SEED, K),
    partitionBy: ["from"],
    required: ["select", "order"],
  };
  const blocks = [
    {
      kind: "chebyshev" as const,
      column: "x; DELETE",
      degree: 3,
      domain: [-2.75, 4.125] as const,
      outside: true,
    },
    { kind: "shifted" as const, column: 'a"b', shift: 0.123456789 },
  ];
  const [q] = momentsQueries(shape, blocks, sumItems(blocks), 1500, null);
  const r = rangesQuery(shape, ["x; DELETE"], ['a"b'], ["order"]);
  for (const text of [q.text, r.text]) {
    assert.ok(text.includes(`FROM "my schema"."lab""; DROP TABLE keep; --"`));
    assert.ok(text.includes('"order"') && text.includes('"from"'));
    assert.ok(!text.includes('DROP TABLE keep; --""'), "quote must not end early");
    for (const a of shape.hash.coefficients) assert.ok(!text.includes(String(a)));
  }
  assert.ok(q.text.includes('"x; DELETE"') && q.text.includes('"a""b"'));
  assert.ok(q.text.includes('WHERE "select" IS NOT NULL AND "order" IS NOT NULL'));
  for (const v of [-2.75, 4.125, 0.123456789, ...shape.hash.coefficients, K]) {
    assert.ok(q.params.includes(v), `parameter ${v}`);
    assert.ok(!q.text.includes(String(v).replace("-", "")) || String(v).length < 2);
  }
  assert.throws(
    () => quoteIdentifier(POSTGRESQL, "a".repeat(64)),
    (e) => e instanceof CurbfitError,
  );
  assert.equal(quoteIdentifier(DUCKDB, "a".repeat(64)).length, 66);
  assert.throws(() => quoteIdentifier(DUCKDB, "a\0b"), (e) => e instanceof CurbfitError);
});

/** Folds computed by the engine for EDGE_KEYS, via the ranges query grouped by the key. */
async function engineFolds(sql: SqlConnection, table: string): Promise<Map<string, number>> {
  const shape = {
    dialect: sql.dialect,
    table: [table],
    query: null,
    key: "id",
    hash: foldHash(SEED, 7),
    partitionBy: ["id"],
    required: [],
  };
  const rows = (await sql.run(rangesQuery(shape, [], [], []))).rows;
  return new Map(rows.map((r) => [String(r[1]), Number(r[0])]));
}

function checkEngineFolds(folds: Map<string, number>): void {
  const hash = foldHash(SEED, 7);
  for (const key of EDGE_KEYS) {
    assert.equal(folds.get(key), foldOfKey(hash, key), `key ${key}`);
  }
}

/** Creates `table` in DuckDB with the keyed rows under the given column names. */
async function duckTable(
  con: import("@duckdb/node-api").DuckDBConnection,
  table: string,
  names: Record<string, string>,
  nullAt: number[] = [],
): Promise<void> {
  const q = (n: string) => quoteIdentifier(DUCKDB, n);
  await con.run(
    `CREATE TABLE ${q(table)} (${q(names.id)} BIGINT, ${q(names.shard)} INTEGER, ` +
      ["x", "z1", "z2", "y"].map((c) => `${q(names[c])} DOUBLE`).join(", ") + ")",
  );
  const app = await con.createAppender(table);
  for (let i = 0; i < ROWS.n; i++) {
    app.appendBigInt(BigInt(ROWS.ids[i]));
    app.appendInteger(ROWS.shard[i]);
    for (const c of ["x", "z1", "z2"]) app.appendDouble(ROWS.columns[c][i]);
    if (nullAt.includes(i)) app.appendNull();
    else app.appendDouble(ROWS.columns.y[i]);
    app.endRow();
  }
  app.closeSync();
}

const PLAIN = { id: "id", shard: "shard", x: "x", z1: "z1", z2: "z2", y: "y" };
const HOSTILE = {
  id: "order",
  shard: "from",
  x: 'x"; DELETE FROM keep; --',
  z1: "select",
  z2: "z2; DROP TABLE keep",
  y: 'y"',
};
const HOSTILE_TABLE = 'lab"; DROP TABLE keep; --';

/** Terms over renamed columns. */
function termsFor(names: Record<string, string>) {
  return [legendre(names.x, 12), column(names.z1), column(names.z2)];
}

function renamed(names: Record<string, string>): Record<string, number[]> {
  return {
    [names.x]: ROWS.columns.x,
    [names.z1]: ROWS.columns.z1,
    [names.z2]: ROWS.columns.z2,
    y: ROWS.columns.y,
  };
}

Deno.test("DuckDB: the sweep equals the in-memory sweep on the same hash folds (1e-8)", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    await duckTable(con, "readings", PLAIN);
    await con.run("CREATE TABLE edge (id BIGINT)");
    await con.run(`INSERT INTO edge VALUES ${EDGE_KEYS.map((k) => `(${k})`).join(", ")}`);
    const sql = duckdbConnection(con);
    checkEngineFolds(await engineFolds(sql, "edge"));
    const got = await sweepSql(sql, {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
    });
    const want = memorySweep(ROWS.columns, ROWS.ids, TERMS, K, SEED);
    const worst = assertSameSweep(got, want, TOL);
    console.log(`DuckDB vs in-memory: largest relative difference ${worst.toExponential(2)}`);
    assert.equal(got.engine, "duckdb");
    assert.deepEqual(
      got.folds.sizes,
      [0, 1, 2, 3, 4].map((f) => want.folds.assignment[0].filter((a) => a === f).length),
    );
    // a query source gives the same answer
    const viaQuery = await sweepSql(sql, {
      query: "SELECT * FROM readings",
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
    });
    // DuckDB sums in parallel, in no fixed order: equal to rounding, not bit for bit.
    assertSameSweep(viaQuery, want, TOL);
  });
});

Deno.test("DuckDB: hostile table and column names work and cannot alter the query", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    await con.run("CREATE TABLE keep (v INTEGER)");
    await con.run("INSERT INTO keep VALUES (1)");
    await duckTable(con, HOSTILE_TABLE, { ...HOSTILE, y: "y" });
    const got = await sweepSql(duckdbConnection(con), {
      table: HOSTILE_TABLE,
      target: "y",
      terms: termsFor(HOSTILE),
      folds: { k: K, seed: SEED, key: HOSTILE.id },
      partitionBy: [HOSTILE.shard],
    });
    const want = memorySweep(renamed(HOSTILE), ROWS.ids, termsFor(HOSTILE), K, SEED);
    assertSameSweep(got, want, TOL);
    const keep = await con.runAndReadAll("SELECT COUNT(*) FROM keep");
    assert.equal(Number(keep.getRows()[0][0]), 1);
    const rows = await con.runAndReadAll(
      `SELECT COUNT(*) FROM ${quoteIdentifier(DUCKDB, HOSTILE_TABLE)}`,
    );
    assert.equal(Number(rows.getRows()[0][0]), ROWS.n);
  });
});

Deno.test("DuckDB: NULLs stop with MISSING_VALUE or are dropped and counted; SQL errors are CurbfitErrors", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    const nullAt = [5, 700, 2999];
    await duckTable(con, "gappy", PLAIN, nullAt);
    const sql = duckdbConnection(con);
    const spec = {
      table: "gappy",
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
    };
    await assert.rejects(sweepSql(sql, spec), (e) => {
      assert.ok(e instanceof CurbfitError);
      assert.equal(e.code, "MISSING_VALUE");
      assert.match(e.message, /3 rows have a NULL in column "y"/);
      return true;
    });
    const dropped = await sweepSql(sql, { ...spec, missing: "drop" });
    assert.equal(dropped.dropped, 3);
    assert.equal(dropped.n, ROWS.n - 3);
    const kept = ROWS.ids.map((_, i) => i).filter((i) => !nullAt.includes(i));
    const cols = Object.fromEntries(
      Object.entries(ROWS.columns).map(([c, v]) => [c, kept.map((i) => v[i])]),
    );
    assertSameSweep(dropped, memorySweep(cols, kept.map((i) => ROWS.ids[i]), TERMS, K, SEED), TOL);
    await assert.rejects(sweepSql(sql, { ...spec, table: "no_such_table" }), (e) => {
      assert.ok(e instanceof CurbfitError);
      assert.equal(e.code, "READ_FAILED");
      assert.match(e.message, /duckdb query failed/);
      assert.ok(!e.message.includes("\n    at "), "no stack trace in the message");
      return true;
    });
    await assert.rejects(
      sweepSql(sql, { ...spec, terms: [legendre("nope", 3)] }),
      (e) => e instanceof CurbfitError && e.code === "UNKNOWN_COLUMN",
    );
    await assert.rejects(
      sweepSql(sql, { ...spec, folds: { k: K, seed: SEED } }),
      (e) => e instanceof CurbfitError && e.code === "BAD_OPTION",
    );
  });
});

Deno.test("DuckDB: rows outside a given domain, and a fold re-read in its own basis, match memory", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    // One row far to the right: the fold holding it learns a much narrower domain (re-read);
    // a given domain [−3, 4] leaves rows outside it (|t| > 1 in SQL).
    const n = 400;
    const x = ROWS.columns.x.slice(0, n).map((v, i) => (i === 17 ? 9 : v));
    const y = ROWS.columns.y.slice(0, n);
    await con.run("CREATE TABLE odd (id BIGINT, x DOUBLE, y DOUBLE)");
    const app = await con.createAppender("odd");
    for (let i = 0; i < n; i++) {
      app.appendBigInt(BigInt(ROWS.ids[i]));
      app.appendDouble(x[i]);
      app.appendDouble(y[i]);
      app.endRow();
    }
    app.closeSync();
    const lambdas = { count: 20, min: 1e-3, max: 1e3 };
    for (const terms of [[legendre("x", 20)], [legendre("x", 6, { domain: [-3, 4] })]]) {
      const got = await sweepSql(duckdbConnection(con), {
        table: "odd",
        target: "y",
        terms,
        folds: { k: 5, seed: 4, key: "id" },
        lambdas,
      });
      const plan = explicitPlan(n, {
        assignment: foldsOfKeys(foldHash(4, 5), ROWS.ids.slice(0, n)),
        k: 5,
      });
      const want = sweep({ x, y }, { target: "y", terms, folds: plan, lambdas, closedForm: false });
      assertSameSweep(got, want, TOL);
      if (terms[0].label === "legendre(x, 20)") {
        assert.equal(got.passes, 4, "columns, ranges, moments, one fold");
      }
    }
  });
});

/** Loads the keyed rows into PostgreSQL table `table` (only rows whose shard is in `shards`). */
async function pgTable(
  client: import("pg").Client,
  table: string,
  names: Record<string, string>,
  shards: number[] = [1, 2],
): Promise<void> {
  const q = (n: string) => quoteIdentifier(POSTGRESQL, n);
  await client.query(
    `CREATE TABLE ${q(table)} (${q(names.id)} BIGINT, ${q(names.shard)} INTEGER, ` +
      ["x", "z1", "z2", "y"].map((c) => `${q(names[c])} DOUBLE PRECISION`).join(", ") + ")",
  );
  const rows = ROWS.ids.map((_, i) => i).filter((i) => shards.includes(ROWS.shard[i]));
  await client.query(
    `INSERT INTO ${q(table)} SELECT * FROM unnest($1::bigint[], $2::int[], $3::float8[], ` +
      "$4::float8[], $5::float8[], $6::float8[])",
    [
      rows.map((i) => String(ROWS.ids[i])),
      rows.map((i) => ROWS.shard[i]),
      ...["x", "z1", "z2", "y"].map((c) => rows.map((i) => ROWS.columns[c][i])),
    ],
  );
}

Deno.test("PostgreSQL: same answer as in memory, hostile names, a dropped connection is a CurbfitError", async () => {
  if (!requireTool(postgresInstalled(), "PostgreSQL (Debian package postgresql)")) return;
  const server = await startPostgres();
  try {
    const client = await server.connect();
    await client.query("CREATE TABLE keep (v INTEGER)");
    await client.query("INSERT INTO keep VALUES (1)");
    await pgTable(client, "readings", PLAIN);
    await client.query("CREATE TABLE edge (id BIGINT)");
    await client.query(`INSERT INTO edge VALUES ${EDGE_KEYS.map((k) => `(${k})`).join(", ")}`);
    const sql = postgresConnection(client);
    checkEngineFolds(await engineFolds(sql, "edge"));
    const got = await sweepSql(sql, {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
    });
    const worst = assertSameSweep(got, memorySweep(ROWS.columns, ROWS.ids, TERMS, K, SEED), TOL);
    console.log(`PostgreSQL vs in-memory: largest relative difference ${worst.toExponential(2)}`);

    await pgTable(client, HOSTILE_TABLE, { ...HOSTILE, y: "y" });
    const hostile = await sweepSql(sql, {
      table: ["public", HOSTILE_TABLE],
      target: "y",
      terms: termsFor(HOSTILE),
      folds: { k: K, seed: SEED, key: HOSTILE.id },
    });
    assertSameSweep(
      hostile,
      memorySweep(renamed(HOSTILE), ROWS.ids, termsFor(HOSTILE), K, SEED),
      TOL,
    );
    assert.equal(Number((await client.query("SELECT COUNT(*) FROM keep")).rows[0].count), 1);

    // The server ends this session mid-work: the next query fails, and so must the sweep.
    const victim = await server.connect();
    victim.on("error", () => {});
    const pid = (await victim.query("SELECT pg_backend_pid() AS pid")).rows[0].pid;
    await client.query("SELECT pg_terminate_backend($1)", [pid]);
    await assert.rejects(
      sweepSql(postgresConnection(victim), {
        table: "readings",
        target: "y",
        terms: TERMS,
        folds: { k: K, seed: SEED, key: "id" },
      }),
      (e) => {
        assert.ok(e instanceof CurbfitError, String(e));
        assert.equal(e.code, "READ_FAILED");
        assert.match(e.message, /postgresql query failed/);
        return true;
      },
    );
    await victim.end().catch(() => {});
    await client.end();
  } finally {
    await server.stop();
  }
});

Deno.test("PostgreSQL sharded with postgres_fdw: partition-wise aggregation runs on the shards, same answer", async () => {
  if (!requireTool(postgresInstalled(), "PostgreSQL (Debian package postgresql)")) return;
  const servers: PostgresServer[] = [];
  try {
    for (let i = 0; i < 3; i++) servers.push(await startPostgres());
    const [coordinator, ...shards] = servers;
    for (const [i, shard] of shards.entries()) {
      const c = await shard.connect();
      await pgTable(c, `readings_${i + 1}`, PLAIN, [i + 1]);
      await c.end();
    }
    const client = await coordinator.connect();
    await partitionOverShards(
      client,
      "readings",
      "id BIGINT, shard INTEGER, x DOUBLE PRECISION, z1 DOUBLE PRECISION, z2 DOUBLE PRECISION, y DOUBLE PRECISION",
      shards,
    );
    const spec = {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
      partitionBy: ["shard"],
    };
    const got = await sweepSql(postgresConnection(client), spec);
    assertSameSweep(got, memorySweep(ROWS.columns, ROWS.ids, TERMS, K, SEED), TOL);

    // The plan of the moments query: one foreign aggregate per shard, nothing aggregated here.
    const moments = got.queries[got.queries.length - 1];
    assert.match(moments.text, /COS\(/);
    const plan = (await client.query({
      text: `EXPLAIN (VERBOSE, COSTS OFF) ${moments.text}`,
      values: moments.params.map(String),
    })).rows.map((r: { "QUERY PLAN": string }) => r["QUERY PLAN"]).join("\n");
    const pushed = plan.match(/Relations: Aggregate on \(public\.readings_\d readings(_\d)?\)/g) ??
      [];
    assert.equal(pushed.length, 2, plan);
    assert.equal((plan.match(/Remote SQL: SELECT .* GROUP BY/g) ?? []).length, 2, plan);
    assert.ok(!/Partial|HashAggregate|GroupAggregate/.test(plan), plan);
    await client.end();
  } finally {
    for (const s of servers) await s.stop();
  }
});
