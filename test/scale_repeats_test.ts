/**
 * Repeated hash fold plans on the scale paths (`sweepStream`, `sweepSql`). References:
 * - a BigInt transcription of the fold hash as stated in lib/stream/README.md, repeat r taking
 *   draws 4r … 4r + 3 of the coefficient stream;
 * - the in-memory `sweep` given the same per-repeat assignment (an explicit plan with R repeats,
 *   `hashFoldPlan`), to 1e-8 relative: CV means, SEs and every fold error per λ, the choice and
 *   the fitted model;
 * - for R = 1, the query texts and parameters of curbfit before repeats (commit 9968b75), pinned
 *   by their SHA-256;
 * - independence of repeats: counts of fold pairs between two repeats against the uniform
 *   expectation of independent uniform folds (Wegman & Carter 1981: polynomial hashes with
 *   independently drawn coefficients), within 5 binomial SDs (common practice).
 * Data is invented (test/helpers.ts). Missing DuckDB (no --allow-ffi) or PostgreSQL prints
 * `SKIP:`; under CI=true it fails.
 */
import assert from "node:assert/strict";
import { createHash } from "node:crypto";
import {
  column,
  CurbfitError,
  lasso,
  legendre,
  sweep,
  type SweepResult,
  tableFromColumns,
  type Term,
} from "../mod.ts";
import { SeededStream } from "../lib/folds/mod.ts";
import {
  checkHashRepeats,
  FOLD_HASH_PRIME,
  FOLD_HASH_STREAM,
  foldHash,
  foldHashes,
  foldOfKey,
  foldsOfKeys,
  hashFoldPlan,
} from "../lib/stream/hash.ts";
import { sweepStream } from "../lib/stream/stream.ts";
import type { ScaleSweepResult } from "../lib/stream/finish.ts";
import { sweepSql } from "../lib/sql/sweep.ts";
import { duckdbConnection, postgresConnection, type SqlConnection } from "../lib/sql/connection.ts";
import { DUCKDB, POSTGRESQL, quoteIdentifier } from "../lib/sql/dialect.ts";
import {
  momentsQueries,
  rangesQuery,
  repeatBatches,
  type SqlShape,
  sumItems,
} from "../lib/sql/query.ts";
import {
  ffiAllowed,
  partitionOverShards,
  postgresInstalled,
  type PostgresServer,
  requireTool,
  startPostgres,
  withDuckDB,
} from "./sql/servers.ts";
import { assertSameSweep, keyedRows } from "./sql/scale_helpers.ts";

const TOL = 1e-8;
const K = 5;
const SEED = 8;
const R = 3;
const ROWS = keyedRows(31, 3000);
const TERMS = [legendre("x", 10), column("z1"), column("z2")];

/** The hash of every repeat transcribed with BigInt, straight from lib/stream/README.md. */
function oracleFolds(seed: number, k: number, repeats: number, key: bigint): number[] {
  const p = 2147483647n;
  const s = new SeededStream(seed, 0x666f6c64);
  const draws = Array.from({ length: 4 * repeats }, () => BigInt(s.nextBelow(2147483647)));
  const x = ((key % p) + p) % p;
  return Array.from({ length: repeats }, (_, r) => {
    const [a0, a1, a2, a3] = draws.slice(4 * r, 4 * r + 4);
    const h = (((a3 * x + a2) % p * x + a1) % p * x + a0) % p;
    return Number(h % BigInt(k));
  });
}

/** The in-memory sweep on the same repeated hash folds. */
function memoryRepeated(
  columns: Record<string, number[]>,
  keys: readonly (number | string)[],
  terms: readonly Term[],
  folds: { k: number; seed: number; repeats: number },
  extra: { lambdas?: { count: number; min: number; max: number } } = {},
): SweepResult {
  return sweep(tableFromColumns(columns), {
    target: "y",
    terms,
    folds: hashFoldPlan(keys, folds),
    closedForm: false,
    ...extra,
  });
}

/** Checks of the plan a repeated scale sweep reports, beyond the shared curve comparison. */
function assertRepeatedPlan(got: ScaleSweepResult, want: SweepResult, k: number): void {
  assert.equal(got.folds.repeats, want.folds.repeats);
  assert.equal(got.folds.k, k);
  const sizes = want.folds.assignment.flatMap((a) =>
    Array.from({ length: k }, (_, f) => a.filter((v) => v === f).length)
  );
  assert.deepEqual(got.folds.sizes, sizes, "fold sizes, repeat-major");
  for (const point of got.curve) {
    assert.equal(point.foldMse.length, k * want.folds.repeats);
    // SE = SD/√K over the K·R fold errors (divisor K·R − 1), lib/sweep/sweep.ts's convention.
    const m = point.foldMse.reduce((s, v) => s + v, 0) / point.foldMse.length;
    const ss = point.foldMse.reduce((s, v) => s + (v - m) ** 2, 0);
    const se = Math.sqrt(ss / (point.foldMse.length - 1)) / Math.sqrt(k);
    assert.ok(Math.abs(point.cvSe - se) <= 1e-12 * se, `cvSe ${point.cvSe} vs ${se}`);
  }
}

function csvText(rows = ROWS, x = rows.columns.x): string {
  const c = rows.columns;
  const lines = rows.ids.map((id, i) => `${id},${x[i]},${c.z1[i]},${c.z2[i]},${c.y[i]}`);
  return ["id,x,z1,z2,y", ...lines].join("\n") + "\n";
}

Deno.test("fold hash repeats: pinned coefficients and folds (a breaking change if they move)", () => {
  assert.equal(FOLD_HASH_PRIME, 2 ** 31 - 1);
  assert.equal(FOLD_HASH_STREAM, 0x666f6c64);
  const keys = ["0", "1", "2", "-1", "2147483647", "9223372036854775807", "-9223372036854775808"];
  const pinned = [
    {
      seed: 1,
      coefficients: [
        [1150918400, 168643461, 111701657, 2070359801],
        [656618163, 90561368, 701891649, 1942258769],
        [1157223004, 1105760245, 1044709154, 176160088],
      ],
      folds: [[0, 2, 2, 2, 0, 2, 4], [3, 2, 1, 2, 3, 2, 3], [4, 4, 6, 5, 4, 4, 6]],
    },
    {
      seed: 42,
      coefficients: [
        [100439841, 1374354969, 1321634596, 1471668249],
        [1591548538, 1079898150, 584365674, 422383644],
        [1639544039, 1001268657, 946734847, 936315349],
      ],
      folds: [[1, 8, 2, 6, 1, 8, 0], [8, 9, 8, 8, 8, 9, 9], [9, 8, 1, 0, 9, 8, 5]],
    },
  ];
  for (const { seed, coefficients, folds } of pinned) {
    const hashes = foldHashes(seed, 10, 3);
    assert.deepEqual(hashes.map((h) => h.coefficients), coefficients);
    assert.deepEqual(hashes.map((h) => keys.map((key) => foldOfKey(h, key))), folds);
    assert.deepEqual(hashes.map((h) => h.repeat), [0, 1, 2]);
    // Repeat 0 is the single-repeat hash of curbfit.fold-hash/1; each repeat alone is the same.
    assert.deepEqual(foldHash(seed, 10), hashes[0]);
    hashes.forEach((h, r) => assert.deepEqual(foldHash(seed, 10, r), h));
  }
});

Deno.test("fold hash repeats: equal a BigInt transcription of the stated hash", () => {
  const draw = new SeededStream(17, 5);
  for (let i = 0; i < 1500; i++) {
    const magnitude = BigInt(draw.nextUint32()) * 2n ** 31n + BigInt(draw.nextUint32());
    const key = i % 2 === 0 ? magnitude : -magnitude;
    const seed = i % 7, k = 2 + (i % 11), repeats = 1 + (i % 4);
    const want = oracleFolds(seed, k, repeats, key);
    assert.deepEqual(foldHashes(seed, k, repeats).map((h) => foldOfKey(h, key)), want, `${key}`);
  }
});

Deno.test("repeats are reproducible (pinned first assignments) and independent of each other", () => {
  // Seed 3, 5 folds, 3 repeats: folds of record numbers 0 … 11 in each repeat.
  const first = [
    [4, 4, 4, 3, 1, 1, 0, 4, 3, 2, 4, 2],
    [2, 4, 3, 2, 0, 3, 4, 2, 3, 3, 3, 4],
    [0, 2, 2, 2, 0, 0, 0, 1, 4, 3, 1, 2],
  ];
  const records = Array.from({ length: 12 }, (_, i) => i);
  const again = () => foldHashes(3, 5, 3).map((h) => Array.from(foldsOfKeys(h, records)));
  assert.deepEqual(again(), first);
  assert.deepEqual(again(), first, "the same seed gives the same folds");
  const plan = hashFoldPlan(ROWS.ids, { k: K, seed: SEED, repeats: R });
  assert.equal(plan.scheme, "explicit");
  assert.equal(plan.repeats, R);
  plan.assignment.forEach((a, r) =>
    assert.deepEqual(a, foldsOfKeys(foldHash(SEED, K, r), ROWS.ids))
  );
  // Independence: each pair of repeats puts about n/K² keys in every pair of folds.
  const n = ROWS.n, expected = n / (K * K);
  const sd = Math.sqrt(n * (1 / (K * K)) * (1 - 1 / (K * K)));
  for (const [r, s] of [[0, 1], [0, 2], [1, 2]]) {
    const cells = new Array(K * K).fill(0);
    for (let i = 0; i < n; i++) cells[plan.assignment[r][i] * K + plan.assignment[s][i]]++;
    for (const c of cells) {
      assert.ok(Math.abs(c - expected) < 5 * sd, `repeats ${r}, ${s}: cells ${cells}`);
    }
    const same = cells.filter((_, j) => j % (K + 1) === 0).reduce((a, b) => a + b, 0);
    assert.ok(same < n / 2, `repeats ${r} and ${s} differ (${same} of ${n} keys agree)`);
  }
});

Deno.test("R = 1 is today's sweep: query texts pinned, stream results identical to leaving repeats out", async () => {
  // SHA-256 of the ranges, moments and re-read query (text and parameters) as curbfit made them
  // before repeats existed (commit 9968b75), for this shape.
  const shape: SqlShape = {
    dialect: DUCKDB,
    table: ["t"],
    query: null,
    key: "id",
    hash: foldHash(3, 5),
    partitionBy: ["s"],
    required: [],
  };
  const blocks = [{ kind: "shifted" as const, column: "y", shift: 2.5 }];
  const r = rangesQuery(shape, ["x"], ["y"], ["x", "y", "id"]);
  const [m] = momentsQueries(shape, blocks, sumItems(blocks), 1500, null);
  const [b] = momentsQueries(shape, blocks, sumItems(blocks), 1500, 2);
  const digest = createHash("sha256").update(JSON.stringify({ r, m, b })).digest("hex");
  assert.equal(digest, "d6e369f6c02af0809c7d3e23f5fa4aced941697bfd4ca9d1ab982505ecc9ad60");
  // The stream: repeats: 1 and no repeats give bit-identical results.
  const text = csvText();
  const run = (folds: { k: number; seed: number; key: string; repeats?: number }) =>
    sweepStream(() => ReadableStream.from([text]), { target: "y", terms: TERMS, folds });
  const plain = await run({ k: K, seed: SEED, key: "id" });
  const one = await run({ k: K, seed: SEED, key: "id", repeats: 1 });
  const strip = (s: ScaleSweepResult) =>
    JSON.stringify({ curve: s.curve, chosen: s.chosen, fit: s.fit.summary, folds: s.folds });
  assert.equal(strip(one), strip(plain));
  assert.equal(plain.folds.repeats, 1);
  assert.equal(plain.folds.sizes.length, K);
});

Deno.test("a bad folds.repeats is BAD_OPTION naming it; other fold options are refused, not ignored", async () => {
  const never: SqlConnection = {
    dialect: DUCKDB,
    run: () => Promise.reject(new Error("no query may run")),
  };
  const isRepeats = (e: unknown) => {
    assert.ok(e instanceof CurbfitError, String(e));
    assert.equal(e.code, "BAD_OPTION");
    assert.equal(e.place.option, "folds.repeats");
    assert.match(e.message, /folds\.repeats/);
    return true;
  };
  for (const repeats of [0, -1, 1.5, 101, Number.NaN, "3"]) {
    const folds = { k: K, seed: SEED, key: "id", repeats } as unknown as { repeats: number };
    const spec = { target: "y", terms: TERMS, folds };
    await assert.rejects(sweepStream(() => ReadableStream.from([csvText()]), spec), isRepeats);
    await assert.rejects(sweepSql(never, { ...spec, table: "t" }), isRepeats);
    assert.throws(() => checkHashRepeats(repeats), isRepeats);
  }
  assert.throws(() => foldHashes(1, 5, 0), isRepeats);
  assert.throws(() => hashFoldPlan([1, 2, 3], { k: 2, seed: 1, repeats: 200 }), isRepeats);
  await assert.rejects(
    sweepStream(() => ReadableStream.from([csvText()]), {
      target: "y",
      terms: TERMS,
      folds: { k: K, groups: "site" } as unknown as { k: number },
    }),
    (e) =>
      e instanceof CurbfitError && e.code === "BAD_OPTION" && e.place.option === "folds.groups",
  );
});

Deno.test("stream, R = 3 (CSV, learned domains, key column): equals the in-memory sweep on the same folds", async () => {
  const path = await Deno.makeTempFile({ prefix: "curbfit-repeats-", suffix: ".csv" });
  try {
    await Deno.writeTextFile(path, csvText());
    const got = await sweepStream(path, {
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id", repeats: R },
      chunkRows: 700,
    });
    const want = memoryRepeated(ROWS.columns, ROWS.ids, TERMS, { k: K, seed: SEED, repeats: R });
    const worst = assertSameSweep(got, want, TOL);
    console.log(`stream R = 3 vs in-memory: largest relative difference ${worst.toExponential(2)}`);
    assertRepeatedPlan(got, want, K);
    assert.equal(got.folds.seed, SEED);
    assert.equal(got.passes, 2);
    // R·K fold summaries of (p + 1)(p + 2) doubles: 13 design columns and the target.
    assert.equal(got.memory.summaryBytes, R * K * (13 + 13 * 13) * 8);
    const bundle = await (got as unknown as Record<symbol, () => Promise<Record<string, string>>>)[
      Symbol.for("Jupyter.display")
    ]();
    assert.match(bundle["text/plain"], /5-fold CV by key hash × 3 repeats, seed 8/);
  } finally {
    await Deno.remove(path);
  }
});

Deno.test("stream, R = 3: one-pass NDJSON by record number (ridge and lasso), and folds re-read in their own basis per repeat", async () => {
  const c = ROWS.columns;
  const lines = ROWS.ids.map((_, i) =>
    JSON.stringify({ x: c.x[i], z1: c.z1[i], z2: c.z2[i], y: c.y[i] })
  );
  const given = [legendre("x", 10, { domain: [-3.5, 5.5] }), column("z1"), column("z2")];
  const once = await sweepStream(ReadableStream.from([lines.join("\n")]), {
    target: "y",
    terms: given,
    format: "ndjson",
    folds: { k: 4, seed: 2, repeats: R },
  });
  assert.equal(once.passes, 1);
  const records = ROWS.ids.map((_, i) => i);
  const wantOnce = memoryRepeated(c, records, given, { k: 4, seed: 2, repeats: R });
  assertSameSweep(once, wantOnce, TOL);
  assertRepeatedPlan(once, wantOnce, 4);
  // Lasso over α: the coordinate-descent path per training fold of every repeat.
  const sparse = { penalty: lasso(), tolerance: 1e-10 };
  const lassoOnce = await sweepStream(ReadableStream.from([lines.join("\n")]), {
    target: "y",
    terms: given,
    format: "ndjson",
    folds: { k: 4, seed: 2, repeats: R },
    ...sparse,
  });
  const wantLasso = sweep(tableFromColumns(c), {
    target: "y",
    terms: given,
    folds: hashFoldPlan(records, { k: 4, seed: 2, repeats: R }),
    ...sparse,
  });
  assert.equal(lassoOnce.scale, "alpha");
  assertSameSweep(lassoOnce, wantLasso, TOL);
  assertRepeatedPlan(lassoOnce, wantLasso, 4);

  // One row far to the right: in every repeat the fold holding it learns a much narrower domain,
  // and its summaries are re-read in that basis (as the in-memory sweep rebuilds them from rows).
  const rows = keyedRows(5, 300);
  const x = rows.columns.x.map((v, i) => (i === 17 ? 9 : v));
  const terms = [legendre("x", 20)];
  const lambdas = { count: 20, min: 1e-3, max: 1e3 };
  const text = ["id,x,y", ...rows.ids.map((id, i) => `${id},${x[i]},${rows.columns.y[i]}`)];
  const got = await sweepStream(() => ReadableStream.from([text.join("\n")]), {
    target: "y",
    terms,
    folds: { k: 5, seed: 4, key: "id", repeats: R },
    lambdas,
  });
  assert.equal(got.passes, 2 + R, "two passes and one re-read per repeat");
  const want = memoryRepeated({ x, y: rows.columns.y }, rows.ids, terms, {
    k: 5,
    seed: 4,
    repeats: R,
  }, { lambdas });
  assertSameSweep(got, want, TOL);
  assertRepeatedPlan(got, want, 5);
});

Deno.test("SQL query text, R = 3: one fold column per repeat, all grouped in one scan, every value a parameter", () => {
  assert.deepEqual(repeatBatches(1, 10), [[0]]);
  assert.deepEqual(repeatBatches(3, 10), [[0, 1, 2]]);
  assert.deepEqual(repeatBatches(5, 10), [[0, 1, 2], [3, 4]]);
  assert.deepEqual(repeatBatches(3, 20), [[0, 1], [2]]);
  assert.deepEqual(repeatBatches(3, 50), [[0], [1], [2]]);
  assert.deepEqual(repeatBatches(12, 2), [[0, 1, 2, 3, 4, 5, 6, 7, 8], [9, 10, 11]]);
  const hashes = foldHashes(SEED, K, R);
  const shape: SqlShape = {
    dialect: POSTGRESQL,
    table: ["readings"],
    query: null,
    key: "id",
    hash: hashes[0],
    hashes,
    partitionBy: ["shard"],
    required: [],
  };
  const blocks = [{ kind: "shifted" as const, column: "y", shift: 0.5 }];
  const [q] = momentsQueries(shape, blocks, sumItems(blocks), 1500, null);
  const ranges = rangesQuery(shape, ["x"], ["y"], []);
  for (const text of [q.text, ranges.text]) {
    for (let r = 0; r < R; r++) assert.match(text, new RegExp(`AS curbfit_fold_${r},`));
    assert.match(text, /GROUP BY .*% CAST\(\$\d+ AS BIGINT\), .*"shard"$/);
    assert.ok(!/CASE/.test(text), "no CASE: PostgreSQL 15's postgres_fdw would not ship it");
  }
  for (const h of hashes) {
    for (const a of h.coefficients) {
      assert.ok(q.params.includes(a), `coefficient ${a} is a parameter`);
      assert.ok(!q.text.includes(String(a)));
    }
  }
});

/** Creates `table` in DuckDB with the keyed rows (x replaced when given). */
async function duckTable(
  con: import("@duckdb/node-api").DuckDBConnection,
  table: string,
  rows = ROWS,
  x = rows.columns.x,
): Promise<void> {
  await con.run(
    `CREATE TABLE ${table} (id BIGINT, shard INTEGER, x DOUBLE, z1 DOUBLE, z2 DOUBLE, y DOUBLE)`,
  );
  const app = await con.createAppender(table);
  for (let i = 0; i < rows.n; i++) {
    app.appendBigInt(BigInt(rows.ids[i]));
    app.appendInteger(rows.shard[i]);
    app.appendDouble(x[i]);
    for (const c of ["z1", "z2", "y"]) app.appendDouble(rows.columns[c][i]);
    app.endRow();
  }
  app.closeSync();
}

Deno.test("DuckDB, R = 3: equals the in-memory sweep on the same folds, in one scan or in batches", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    await duckTable(con, "readings");
    const sql = duckdbConnection(con);
    const folds = { k: K, seed: SEED, repeats: R };
    const got = await sweepSql(sql, {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { ...folds, key: "id" },
      partitionBy: ["shard"],
    });
    const want = memoryRepeated(ROWS.columns, ROWS.ids, TERMS, folds);
    const worst = assertSameSweep(got, want, TOL);
    console.log(`DuckDB R = 3 vs in-memory: largest relative difference ${worst.toExponential(2)}`);
    assertRepeatedPlan(got, want, K);
    // Columns, ranges, moments: every repeat from the same two scans.
    assert.equal(got.queries.length, 3);
    assert.match(got.queries[2].text, /curbfit_fold_2/);

    // 20 folds: 20³ groups exceed 1000, so repeats 0 and 1 share a scan and repeat 2 has its own.
    const wide = { k: 20, seed: SEED, repeats: R };
    const batched = await sweepSql(sql, {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { ...wide, key: "id" },
    });
    assert.equal(batched.queries.length, 5, "columns, 2 ranges, 2 moments");
    const wantWide = memoryRepeated(ROWS.columns, ROWS.ids, TERMS, wide);
    assertSameSweep(batched, wantWide, TOL);
    assertRepeatedPlan(batched, wantWide, 20);
  });
});

Deno.test("DuckDB, R = 3: a fold re-read in its own basis in every repeat matches memory", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    const rows = keyedRows(5, 400);
    const x = rows.columns.x.map((v, i) => (i === 17 ? 9 : v));
    await duckTable(con, "odd", rows, x);
    const terms = [legendre("x", 20)];
    const lambdas = { count: 20, min: 1e-3, max: 1e3 };
    const folds = { k: 5, seed: 4, repeats: R };
    const got = await sweepSql(duckdbConnection(con), {
      table: "odd",
      target: "y",
      terms,
      folds: { ...folds, key: "id" },
      lambdas,
    });
    assert.equal(got.passes, 3 + R, "columns, ranges, moments, one fold per repeat");
    const want = memoryRepeated({ x, y: rows.columns.y }, rows.ids, terms, folds, { lambdas });
    assertSameSweep(got, want, TOL);
    assertRepeatedPlan(got, want, 5);
  });
});

/** Loads the keyed rows into PostgreSQL table `table` (only rows whose shard is in `shards`). */
async function pgTable(
  client: import("pg").Client,
  table: string,
  shards: number[] = [1, 2],
): Promise<void> {
  const q = quoteIdentifier(POSTGRESQL, table);
  await client.query(
    `CREATE TABLE ${q} (id BIGINT, shard INTEGER, x DOUBLE PRECISION, z1 DOUBLE PRECISION, ` +
      "z2 DOUBLE PRECISION, y DOUBLE PRECISION)",
  );
  const rows = ROWS.ids.map((_, i) => i).filter((i) => shards.includes(ROWS.shard[i]));
  await client.query(
    `INSERT INTO ${q} SELECT * FROM unnest($1::bigint[], $2::int[], $3::float8[], ` +
      "$4::float8[], $5::float8[], $6::float8[])",
    [
      rows.map((i) => String(ROWS.ids[i])),
      rows.map((i) => ROWS.shard[i]),
      ...["x", "z1", "z2", "y"].map((c) => rows.map((i) => ROWS.columns[c][i])),
    ],
  );
}

Deno.test("PostgreSQL, R = 3: plain and sharded (postgres_fdw) equal memory; the grouped aggregate runs on the shards", async () => {
  if (!requireTool(postgresInstalled(), "PostgreSQL (Debian package postgresql)")) return;
  const servers: PostgresServer[] = [];
  try {
    for (let i = 0; i < 3; i++) servers.push(await startPostgres());
    const [coordinator, ...shards] = servers;
    for (const [i, shard] of shards.entries()) {
      const c = await shard.connect();
      await pgTable(c, `readings_${i + 1}`, [i + 1]);
      await c.end();
    }
    const client = await coordinator.connect();
    const sql = postgresConnection(client);
    const folds = { k: K, seed: SEED, repeats: R };
    const want = memoryRepeated(ROWS.columns, ROWS.ids, TERMS, folds);

    await pgTable(client, "local_readings");
    const plain = await sweepSql(sql, {
      table: "local_readings",
      target: "y",
      terms: TERMS,
      folds: { ...folds, key: "id" },
    });
    const worst = assertSameSweep(plain, want, TOL);
    console.log(
      `PostgreSQL R = 3 vs in-memory: largest relative difference ${worst.toExponential(2)}`,
    );
    assertRepeatedPlan(plain, want, K);

    await partitionOverShards(
      client,
      "readings",
      "id BIGINT, shard INTEGER, x DOUBLE PRECISION, z1 DOUBLE PRECISION, z2 DOUBLE PRECISION, y DOUBLE PRECISION",
      shards,
    );
    const sharded = await sweepSql(sql, {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { ...folds, key: "id" },
      partitionBy: ["shard"],
    });
    assertSameSweep(sharded, want, TOL);
    assertRepeatedPlan(sharded, want, K);
    // The moments query groups by three fold columns; EXPLAIN shows one foreign aggregate per
    // shard with the whole GROUP BY in its remote SQL, nothing aggregated on the coordinator.
    const moments = sharded.queries[sharded.queries.length - 1];
    assert.match(moments.text, /curbfit_fold_2/);
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
