/**
 * Term kinds at scale: `power`, `product` and `indicators` terms in streamed and SQL sweeps.
 *
 * References, each named again beside its check:
 * - the in-memory `sweep` on the same hash folds (explicitPlan from the fold hash of the same
 *   keys), to 1e-8 relative in every curve column and in the chosen fit (assertSameSweep, as in
 *   test/stream_test.ts and test/sql_test.ts);
 * - for the per-fold sums of SQL design columns, the in-memory design itself (lib/design: powers
 *   and products in double-double) summarized by lib/sweep/moments.ts, to 1e-12 relative;
 * - level order and indicator names: lib/table's documented rule (levels sorted by UTF-16 code
 *   units, the first one the reference), as the in-memory table applies it.
 * Data is invented and seeded (SeededStream). DuckDB needs --allow-ffi and PostgreSQL the Debian
 * package postgresql: when one is missing its test prints `SKIP:`; under CI=true it fails.
 */
import assert from "node:assert/strict";
import {
  column,
  CurbfitError,
  explicitPlan,
  indicators,
  legendre,
  power,
  product,
  sweep,
  type SweepResult,
  tableFromColumns,
  type Term,
} from "../mod.ts";
import { SeededStream } from "../lib/folds/mod.ts";
import { buildDesign, learnTerms } from "../lib/design/mod.ts";
import { bucketMoments, type Moments } from "../lib/sweep/moments.ts";
import { foldHash, foldsOfKeys } from "../lib/stream/hash.ts";
import { sweepStream } from "../lib/stream/stream.ts";
import { addLevelRows, addToRanges, emptyRanges, learnOnRanges } from "../lib/stream/ranges.ts";
import { duckdbConnection, postgresConnection, type SqlConnection } from "../lib/sql/connection.ts";
import { DUCKDB, POSTGRESQL, quoteIdentifier, type SqlDialect } from "../lib/sql/dialect.ts";
import {
  featureBlocks,
  levelsQuery,
  momentsQueries,
  type SqlShape,
  sumItems,
} from "../lib/sql/query.ts";
import { momentsFromSums } from "../lib/sql/sums.ts";
import { sweepSql } from "../lib/sql/sweep.ts";
import {
  ffiAllowed,
  partitionOverShards,
  postgresInstalled,
  type PostgresServer,
  requireTool,
  startPostgres,
  withDuckDB,
} from "./sql/servers.ts";
import { assertSameSweep } from "./sql/scale_helpers.ts";
import { normals } from "./helpers.ts";

const TOL = 1e-8;
const K = 5;
const SEED = 13;

/**
 * Levels that test the order (" east" < "10" < "9" < "B" < "O'Brien" < "a,b" < "north" < … by
 * UTF-16 code units), CSV quoting, and SQL quoting (they must stay parameters).
 */
const LEVELS = [
  "north",
  " east",
  "B",
  "a,b",
  'x"; DROP TABLE keep; --',
  "O'Brien'); DELETE FROM keep; --",
  "10",
  "9",
  "ünï",
];

/** Invented plots: keys beyond 2^31, a shard 1 or 2, x, z, w (far from 0), site, grade, y. */
interface Plots {
  readonly n: number;
  readonly ids: number[];
  readonly shard: number[];
  readonly x: number[];
  readonly z: number[];
  readonly w: number[];
  readonly site: string[];
  readonly grade: number[];
  readonly y: number[];
}

function plots(seed: number, n: number): Plots {
  const s = new SeededStream(seed);
  const x = Array.from({ length: n }, () => -3 + 8 * s.nextDouble());
  const z = Array.from(normals(s, n), (v) => 1 + v);
  const w = Array.from({ length: n }, () => 100 + s.nextDouble());
  const site = Array.from({ length: n }, () => LEVELS[s.nextBelow(LEVELS.length)]);
  const grade = Array.from({ length: n }, () => [1.5, 2, 10][s.nextBelow(3)]);
  const noise = normals(s, n);
  const y = x.map((v, i) =>
    Math.sin(v) + 0.2 * v + 0.5 * z[i] + 0.1 * LEVELS.indexOf(site[i]) +
    (site[i] === "north" ? 0.4 * z[i] : 0) + 0.3 * noise[i]
  );
  return {
    n,
    ids: Array.from({ length: n }, (_, i) => 10_000_000_000 + 7919 * i),
    shard: Array.from({ length: n }, (_, i) => 1 + (i % 2)),
    x,
    z,
    w,
    site,
    grade,
    y,
  };
}

const ROWS = plots(17, 3000);

/** The in-memory table of some rows (site and grade as categories, as lib/table reads them). */
function memoryTable(rows: Plots, keep?: number[]) {
  const pick = <T>(v: T[]) => (keep === undefined ? v : keep.map((i) => v[i]));
  return tableFromColumns(
    {
      x: pick(rows.x),
      z: pick(rows.z),
      w: pick(rows.w),
      site: pick(rows.site),
      grade: pick(rows.grade),
      y: pick(rows.y),
    },
    { types: { site: "category", grade: "category" } },
  );
}

/** Reference: the in-memory sweep on the same folds (explicitPlan from the same fold hash). */
function memorySweep(
  terms: readonly Term[],
  keys: readonly number[] = ROWS.ids,
  keep?: number[],
  lambdas?: { count: number },
): SweepResult {
  const plan = explicitPlan(keys.length, {
    assignment: foldsOfKeys(foldHash(SEED, K), keys),
    k: K,
  });
  return sweep(memoryTable(ROWS, keep), {
    target: "y",
    terms,
    folds: plan,
    closedForm: false,
    ...(lambdas === undefined ? {} : { lambdas }),
  });
}

function csvField(v: string | number): string {
  const t = String(v);
  return /[",\n\r]/.test(t) ? `"${t.replaceAll('"', '""')}"` : t;
}

function csvText(rows: Plots, level = (i: number) => rows.site[i]): string {
  const lines = ["id,x,z,w,site,grade,y"];
  for (let i = 0; i < rows.n; i++) {
    lines.push(
      [rows.ids[i], rows.x[i], rows.z[i], rows.w[i], level(i), rows.grade[i], rows.y[i]]
        .map(csvField).join(","),
    );
  }
  return lines.join("\n") + "\n";
}

/**
 * Folds re-read in their own basis for a product with a learned Legendre domain: those whose
 * training rows miss the smallest or the largest x (their domain differs from all rows').
 */
function foldsAtEnds(): number {
  const folds = foldsOfKeys(foldHash(SEED, K), ROWS.ids);
  const at = (v: number) => folds[ROWS.x.indexOf(v)];
  return new Set([at(Math.min(...ROWS.x)), at(Math.max(...ROWS.x))]).size;
}

/** The term sets every path is checked on. */
const TERM_SETS: Record<string, Term[]> = {
  "power and column": [power("x", 4), column("z")],
  "indicators beside Legendre": [legendre("x", 6), indicators("site")],
  "products of power, column and indicators": [
    power("x", 3),
    indicators("site"),
    product(column("z"), indicators("site")),
    product(power("x", 2), column("z")),
  ],
  "product with a learned Legendre domain (re-read per fold)": [
    product(legendre("x", 3), indicators("site")),
  ],
};

Deno.test("stream (CSV file, key column): power, product and indicators equal the in-memory sweep", async () => {
  const path = await Deno.makeTempFile({ prefix: "curbfit-terms-", suffix: ".csv" });
  try {
    await Deno.writeTextFile(path, csvText(ROWS));
    let worst = 0;
    for (const [what, terms] of Object.entries(TERM_SETS)) {
      const got = await sweepStream(path, {
        target: "y",
        terms,
        folds: { k: K, seed: SEED, key: "id" },
        chunkRows: 700,
      });
      const want = memorySweep(terms);
      // Reference: the in-memory sweep on the same folds; names and their order included.
      worst = Math.max(worst, assertSameSweep(got, want, TOL));
      assert.equal(got.rows.used, ROWS.n, what);
      // Levels come from a first pass: two passes, plus one per fold re-read in its own basis.
      const firstPass = terms.some((t) => /legendre|indicators/.test(JSON.stringify(t.spec)));
      const reread = what.includes("re-read") ? foldsAtEnds() : 0;
      assert.equal(got.passes, (firstPass ? 2 : 1) + reread, what);
    }
    console.log(`stream vs in-memory, all term sets: largest relative difference ${worst}`);
    // lib/table's order (UTF-16 code units); the first level is the reference.
    const names = (await sweepStream(path, {
      target: "y",
      terms: [indicators("site")],
      folds: { k: K, seed: SEED, key: "id" },
      lambdas: { count: 3 },
    })).names;
    assert.deepEqual(names, [...LEVELS].sort().slice(1).map((l) => `site=${l}`));
    assert.equal([...LEVELS].sort()[0], " east");
  } finally {
    await Deno.remove(path);
  }
});

Deno.test("stream (NDJSON, record numbers as keys): JSON numbers as levels read as lib/table reads them", async () => {
  const lines = Array.from({ length: ROWS.n }, (_, i) =>
    JSON.stringify({
      x: ROWS.x[i],
      z: ROWS.z[i],
      site: ROWS.site[i],
      grade: ROWS.grade[i],
      y: ROWS.y[i],
    }));
  const text = lines.join("\n");
  const terms = [
    legendre("x", 5, { domain: [-3, 5] }),
    indicators("grade"),
    product(power("z", 2), indicators("grade")),
  ];
  const got = await sweepStream(() => ReadableStream.from([text]), {
    target: "y",
    terms,
    format: "ndjson",
    folds: { k: K, seed: SEED },
  });
  const keys = Array.from({ length: ROWS.n }, (_, i) => i);
  // Reference: the in-memory sweep, grade as categories ("1.5", "10", "2", as String(value)).
  assertSameSweep(got, memorySweep(terms, keys), TOL);
  assert.deepEqual(got.names.slice(5, 7), ["grade=10", "grade=2"]);
});

Deno.test("stream: missing, unknown, single and malformed levels are clear errors naming the line", async () => {
  const spec = {
    target: "y",
    terms: [column("x"), indicators("site")],
    folds: { k: K, seed: SEED, key: "id" },
    lambdas: { count: 5 },
  };
  // A category column needs a first pass: one stream cannot do.
  await assert.rejects(
    sweepStream(ReadableStream.from([csvText(ROWS)]), spec),
    (e) => e instanceof CurbfitError && e.code === "BAD_OPTION" && e.place.option === "source",
  );
  // "NA" is a missing value (lib/table's tokens); record 40 is on line 42.
  const gappy = csvText(ROWS, (i) => (i === 40 || i === 900 ? "NA" : ROWS.site[i]));
  await assert.rejects(sweepStream(() => ReadableStream.from([gappy]), spec), (e) => {
    assert.ok(e instanceof CurbfitError);
    assert.equal(e.code, "MISSING_VALUE");
    assert.equal(e.place.line, 42);
    assert.equal(e.place.column, "site");
    return true;
  });
  const dropped = await sweepStream(() => ReadableStream.from([gappy]), {
    ...spec,
    missing: "drop",
  });
  assert.equal(dropped.rows.droppedMissing, 2);
  const keep = ROWS.ids.map((_, i) => i).filter((i) => i !== 40 && i !== 900);
  // Reference: the in-memory sweep of the kept rows on the same folds.
  assertSameSweep(
    dropped,
    memorySweep(spec.terms, keep.map((i) => ROWS.ids[i]), keep, spec.lambdas),
    TOL,
  );
  // A level that appears only on the second pass (the data changed) is UNKNOWN_LEVEL, as in
  // memory when a learned term meets a level it did not learn.
  let calls = 0;
  const changing = () =>
    ReadableStream.from([
      calls++ === 0 ? csvText(ROWS) : csvText(ROWS, (i) => (i === 1234 ? "late" : ROWS.site[i])),
    ]);
  await assert.rejects(sweepStream(changing, spec), (e) => {
    assert.ok(e instanceof CurbfitError);
    assert.equal(e.code, "UNKNOWN_LEVEL");
    assert.equal(e.place.line, 1236);
    assert.equal(e.place.column, "site");
    assert.match(e.message, /level "late" was not among the learned levels/);
    return true;
  });
  const single = csvText(ROWS, () => "north");
  await assert.rejects(
    sweepStream(() => ReadableStream.from([single]), spec),
    (e) => e instanceof CurbfitError && e.code === "CONSTANT_COLUMN" && e.place.column === "site",
  );
  const json = '{"x": 1, "site": "a", "y": 2}\n{"x": 2, "site": true, "y": 3}\n';
  await assert.rejects(
    sweepStream(() => ReadableStream.from([json]), {
      ...spec,
      format: "ndjson" as const,
      folds: { k: 2, seed: 1 },
    }),
    (e) =>
      e instanceof CurbfitError && e.code === "BAD_NUMBER" && e.place.line === 2 &&
      e.place.column === "site",
  );
  // One column cannot be both numbers and categories.
  await assert.rejects(
    sweepStream(() => ReadableStream.from([csvText(ROWS)]), {
      ...spec,
      terms: [column("site"), indicators("site")],
    }),
    (e) => e instanceof CurbfitError && e.code === "BAD_OPTION" && e.place.column === "site",
  );
});

function shapeFor(dialect: SqlDialect, table: string, partitionBy: string[] = []): SqlShape {
  return {
    dialect,
    table: [table],
    query: null,
    key: "id",
    hash: foldHash(SEED, K),
    partitionBy,
    required: [],
  };
}

Deno.test("query text: levels and powers are parameters or fixed numbers, names quoted identifiers", () => {
  const shape = { ...shapeFor(POSTGRESQL, 'lab"; DROP TABLE keep; --'), key: "order" };
  const ranges = emptyRanges(['x"y'], 2, ['s"; DELETE']);
  addToRanges(ranges, 0, new Map([['x"y', -1]]));
  addToRanges(ranges, 1, new Map([['x"y', 2]]));
  for (const level of LEVELS) addLevelRows(ranges, 's"; DELETE', level, 3);
  const terms = learnOnRanges(
    [power('x"y', 3), product(legendre('x"y', 2), indicators('s"; DELETE'))],
    ranges,
    -1,
    "test",
  );
  const blocks = featureBlocks(terms, "y", new Map([['x"y', 0.5], ["y", 0]]), ranges, false);
  const [q] = momentsQueries(shape, blocks, sumItems(blocks), 1500, null);
  const l = levelsQuery(shape, 's"; DELETE');
  for (const text of [q.text, l.text]) {
    assert.ok(text.includes('FROM "lab""; DROP TABLE keep; --"'));
    assert.ok(text.includes('CAST("s""; DELETE" AS TEXT)'));
  }
  assert.ok(
    q.text.includes('POWER(CAST("x""y" AS DOUBLE PRECISION), CAST(3 AS DOUBLE PRECISION))'),
  );
  for (const level of LEVELS) {
    assert.ok(q.params.includes(level), `level ${JSON.stringify(level)} is a parameter`);
    if (level.length > 3) assert.ok(!q.text.includes(level), `level ${level} is not in the text`);
  }
  // Every learned level, the reference too, is checked (rows with other levels are refused).
  assert.match(q.text, /IN \((CAST\(\$\d+ AS TEXT\)(, )?){9}\) AS INTEGER\)/);
  assert.ok(!/CASE/.test(q.text), "no CASE: PostgreSQL 15's postgres_fdw would not ship it");
});

/**
 * Per-fold summaries computed by the engine (the moments query and lib/sql/sums.ts) for learned
 * terms, next to those of the in-memory design.
 */
async function engineAndMemoryMoments(
  sql: SqlConnection,
  table: string,
  terms: readonly Term[],
): Promise<{ engine: Moments[]; memory: Moments[] }> {
  const assignment = foldsOfKeys(foldHash(SEED, K), ROWS.ids);
  const ranges = emptyRanges(["x", "z", "w"], K, ["site"]);
  ROWS.ids.forEach((_, i) => {
    addToRanges(
      ranges,
      assignment[i],
      new Map([["x", ROWS.x[i]], ["z", ROWS.z[i]], ["w", ROWS.w[i]]]),
    );
    addLevelRows(ranges, "site", ROWS.site[i], 1);
  });
  const learned = learnOnRanges(terms, ranges, -1, table);
  const mean = (v: number[]) => v.reduce((s, a) => s + a, 0) / v.length;
  const shifts = new Map([["x", mean(ROWS.x)], ["z", mean(ROWS.z)], ["w", mean(ROWS.w)], [
    "y",
    mean(ROWS.y),
  ]]);
  const blocks = featureBlocks(learned, "y", shifts, ranges, false);
  const items = sumItems(blocks);
  const counts = new Float64Array(K);
  const sums = Array.from({ length: K }, () => new Float64Array(items.length));
  let start = 0;
  for (const q of momentsQueries(shapeFor(sql.dialect, table), blocks, items, 400, null)) {
    const rows = (await sql.run(q)).rows;
    const width = rows[0].length - 2;
    for (const row of rows) {
      const f = Number(row[0]);
      if (start === 0) counts[f] = Number(row[1]);
      for (let i = 0; i < width; i++) sums[f][start + i] = Number(row[2 + i]);
    }
    start += width;
  }
  const engine = sums.map((s, f) => momentsFromSums(blocks, items, counts[f], s, table));
  const memoryDesign = buildDesign(learnTerms(terms, memoryTable(ROWS)), memoryTable(ROWS));
  const memory = bucketMoments(
    memoryDesign.block.hi,
    memoryDesign.p,
    Float64Array.from(ROWS.y),
    Int32Array.from(assignment),
    K,
  );
  return { engine, memory };
}

/** Largest relative difference: means against max(|mean|, SD), co-moments against √(CᵢᵢCⱼⱼ). */
function momentsDifference(got: Moments[], want: Moments[]): number {
  let worst = 0;
  want.forEach((w, f) => {
    const g = got[f];
    assert.equal(g.count, w.count);
    const d = w.d;
    for (let i = 0; i < d; i++) {
      const sd = Math.sqrt(w.cross[i * d + i] / w.count);
      const r = Math.abs(g.mean[i] - w.mean[i]) / Math.max(Math.abs(w.mean[i]), sd);
      worst = Math.max(worst, r);
      for (let j = 0; j < d; j++) {
        const scale = Math.sqrt(w.cross[i * d + i] * w.cross[j * d + j]);
        worst = Math.max(worst, Math.abs(g.cross[i * d + j] - w.cross[i * d + j]) / scale);
      }
    }
  });
  return worst;
}

/**
 * Largest difference, in units in the last place, between the engine's POWER of x and w and the
 * in-memory design's powers (double-double, rounded once: lib/design/power.ts).
 */
async function powerUlps(sql: SqlConnection, table: string): Promise<number> {
  const q = (n: string) => quoteIdentifier(sql.dialect, n);
  const powers = [["x", 5], ["w", 3]] as const;
  const columns = powers.flatMap(([c, k]) =>
    Array.from({ length: k - 1 }, (_, j) => `POWER(${q(c)}, CAST(${j + 2} AS DOUBLE PRECISION))`)
  );
  const rows = (await sql.run({
    text: `SELECT ${columns.join(", ")} FROM ${q(table)} ORDER BY ${q("id")}`,
    params: [],
  })).rows;
  const table0 = memoryTable(ROWS);
  const design = buildDesign(learnTerms(powers.map(([c, k]) => power(c, k)), table0), table0);
  const inDesign = [1, 2, 3, 4, 6, 7]; // x^2 … x^5, w^2, w^3 (design columns 0 and 5: x, w)
  const ulp = (v: number) => 2 ** (Math.floor(Math.log2(Math.abs(v))) - 52);
  let worst = 0;
  rows.forEach((row, i) => {
    inDesign.forEach((at, j) => {
      const want = design.block.hi[i * design.p + at];
      worst = Math.max(worst, Math.abs(Number(row[j]) - want) / ulp(want));
    });
  });
  return worst;
}

/** The sums check: raw powers of w ∈ [100, 101] too, whose sweep is badly conditioned. */
const SUMS_TERMS = [
  power("x", 5),
  power("w", 3),
  indicators("site"),
  product(power("x", 2), indicators("site")),
  product(legendre("x", 4), column("z")),
];

/** Column names of a test table (plain or hostile). */
interface Names {
  readonly id: string;
  readonly shard: string;
  readonly x: string;
  readonly z: string;
  readonly w: string;
  readonly site: string;
  readonly y: string;
}

const PLAIN: Names = { id: "id", shard: "shard", x: "x", z: "z", w: "w", site: "site", y: "y" };
const HOSTILE: Names = {
  id: "order",
  shard: "from",
  x: 'x"; DELETE FROM keep; --',
  z: "select",
  w: "w",
  site: 'site"); DROP TABLE keep; --',
  y: "y",
};
const HOSTILE_TABLE = 'plots"; DROP TABLE keep; --';

function createSql(dialect: SqlDialect, table: string, names: Names): string {
  const q = (n: string) => quoteIdentifier(dialect, n);
  const double = dialect === DUCKDB ? "DOUBLE" : "DOUBLE PRECISION";
  return `CREATE TABLE ${q(table)} (${q(names.id)} BIGINT, ${q(names.shard)} INTEGER, ` +
    `${q(names.x)} ${double}, ${q(names.z)} ${double}, ${q(names.w)} ${double}, ` +
    `${q(names.site)} TEXT, ${q(names.y)} ${double})`;
}

async function duckTable(
  con: import("@duckdb/node-api").DuckDBConnection,
  table: string,
  names: Names,
  nullAt: number[] = [],
): Promise<void> {
  await con.run(createSql(DUCKDB, table, names));
  const app = await con.createAppender(table);
  for (let i = 0; i < ROWS.n; i++) {
    app.appendBigInt(BigInt(ROWS.ids[i]));
    app.appendInteger(ROWS.shard[i]);
    for (const v of [ROWS.x[i], ROWS.z[i], ROWS.w[i]]) app.appendDouble(v);
    if (nullAt.includes(i)) app.appendNull();
    else app.appendVarchar(ROWS.site[i]);
    app.appendDouble(ROWS.y[i]);
    app.endRow();
  }
  app.closeSync();
}

/** Terms of a term set over renamed columns. */
function renamedTerms(names: Names): Term[] {
  return [
    power(names.x, 3),
    indicators(names.site),
    product(column(names.z), indicators(names.site)),
  ];
}

/** The in-memory reference over renamed columns. */
function renamedMemorySweep(names: Names): SweepResult {
  const plan = explicitPlan(ROWS.n, { assignment: foldsOfKeys(foldHash(SEED, K), ROWS.ids), k: K });
  const table = tableFromColumns(
    { [names.x]: ROWS.x, [names.z]: ROWS.z, [names.site]: ROWS.site, y: ROWS.y },
    { types: { [names.site]: "category" } },
  );
  return sweep(table, { target: "y", terms: renamedTerms(names), folds: plan, closedForm: false });
}

Deno.test("DuckDB: per-fold sums of power, product and indicator columns match the in-memory design (1e-12)", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    await duckTable(con, "plots", PLAIN);
    const { engine, memory } = await engineAndMemoryMoments(
      duckdbConnection(con),
      "plots",
      SUMS_TERMS,
    );
    // Reference: the in-memory design (double-double powers and products) summarized two-pass.
    const worst = momentsDifference(engine, memory);
    console.log(`DuckDB per-fold sums vs in-memory design: largest relative difference ${worst}`);
    assert.ok(worst <= 1e-12, `largest relative difference ${worst}`);
    // Reference: the in-memory design's powers, value by value.
    const ulps = await powerUlps(duckdbConnection(con), "plots");
    console.log(`DuckDB POWER vs in-memory powers: at most ${ulps} units in the last place`);
    assert.ok(ulps <= 2, `${ulps} ulps`);
  });
});

Deno.test("DuckDB: power, product and indicators equal the in-memory sweep (1e-8)", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    await duckTable(con, "plots", PLAIN);
    const sql = duckdbConnection(con);
    let worst = 0;
    for (const [what, terms] of Object.entries(TERM_SETS)) {
      const got = await sweepSql(sql, {
        table: "plots",
        target: "y",
        terms,
        folds: { k: K, seed: SEED, key: "id" },
      });
      // Reference: the in-memory sweep on the same folds; names and their order included.
      worst = Math.max(worst, assertSameSweep(got, memorySweep(terms), TOL));
      // columns, ranges, one levels query per category column, moments, fold re-reads
      const levelQueries = terms.some((t) => JSON.stringify(t.spec).includes("indicators")) ? 1 : 0;
      const reread = what.includes("re-read") ? foldsAtEnds() : 0;
      assert.equal(got.passes, 3 + levelQueries + reread, what);
    }
    console.log(`DuckDB vs in-memory, all term sets: largest relative difference ${worst}`);
  });
});

Deno.test("DuckDB: raw powers of a column far from 0 agree with memory as well as memory agrees with itself", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  // w, w², w³ with w on [100, 101] are nearly collinear (standardized condition about 2e6), so
  // rounding-level changes of the sums move the small-λ end of the curve by far more than 1e-8.
  // Reference for how far: the in-memory sweep of the same rows in reverse order (same folds),
  // which changes only the order of its additions.
  await withDuckDB(async (con) => {
    await duckTable(con, "plots", PLAIN);
    const terms = [power("w", 3), column("x")];
    const got = await sweepSql(duckdbConnection(con), {
      table: "plots",
      target: "y",
      terms,
      folds: { k: K, seed: SEED, key: "id" },
    });
    const want = memorySweep(terms);
    const back = [...ROWS.ids.keys()].reverse();
    const reversed = memorySweep(terms, back.map((i) => ROWS.ids[i]), back);
    const sql = assertSameSweep(got, want, 1e-4);
    const memory = assertSameSweep(reversed as unknown as typeof got, want, 1e-4);
    console.log(`power(w, 3), w on [100, 101]: SQL vs memory ${sql}, memory reversed ${memory}`);
    assert.ok(memory > 1e-9, "the case is as ill-conditioned as intended");
    assert.ok(sql <= 10 * memory, `SQL ${sql} vs memory's own ${memory}`);
  });
});

Deno.test("DuckDB: hostile names and levels stay quoted; NULL and unlearned levels are clear errors", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    await con.run("CREATE TABLE keep (v INTEGER)");
    await con.run("INSERT INTO keep VALUES (1)");
    await duckTable(con, HOSTILE_TABLE, HOSTILE);
    const sql = duckdbConnection(con);
    const got = await sweepSql(sql, {
      table: HOSTILE_TABLE,
      target: "y",
      terms: renamedTerms(HOSTILE),
      folds: { k: K, seed: SEED, key: HOSTILE.id },
      partitionBy: [HOSTILE.shard],
    });
    // Reference: the in-memory sweep on the same folds.
    assertSameSweep(got, renamedMemorySweep(HOSTILE), TOL);
    assert.equal(Number((await con.runAndReadAll("SELECT COUNT(*) FROM keep")).getRows()[0][0]), 1);

    const nullAt = [7, 2500];
    await duckTable(con, "gappy", PLAIN, nullAt);
    const spec = {
      table: "gappy",
      target: "y",
      terms: TERM_SETS["products of power, column and indicators"],
      folds: { k: K, seed: SEED, key: "id" },
    };
    await assert.rejects(sweepSql(sql, spec), (e) => {
      assert.ok(e instanceof CurbfitError);
      assert.equal(e.code, "MISSING_VALUE");
      assert.match(e.message, /2 rows have a NULL in column "site"/);
      return true;
    });
    const dropped = await sweepSql(sql, { ...spec, missing: "drop" });
    assert.equal(dropped.dropped, 2);
    const keep = ROWS.ids.map((_, i) => i).filter((i) => !nullAt.includes(i));
    // Reference: the in-memory sweep of the kept rows on the same folds.
    assertSameSweep(dropped, memorySweep(spec.terms, keep.map((i) => ROWS.ids[i]), keep), TOL);

    // The table changes after the levels were learned: a new level must not pass silently as
    // the reference level.
    let inserted = false;
    const changing: SqlConnection = {
      dialect: sql.dialect,
      async run(q) {
        const result = await sql.run(q);
        if (!inserted && q.text.includes("curbfit_level")) {
          inserted = true;
          await con.run("INSERT INTO plots2 VALUES (5, 1, 0.5, 1, 100.5, 'late', 0.25)");
        }
        return result;
      },
    };
    await duckTable(con, "plots", PLAIN);
    await con.run("CREATE TABLE plots2 AS SELECT * FROM plots");
    await assert.rejects(
      sweepSql(changing, { ...spec, table: "plots2" }),
      (e) => {
        assert.ok(e instanceof CurbfitError, String(e));
        assert.equal(e.code, "UNKNOWN_LEVEL");
        assert.equal(e.place.column, "site");
        assert.match(e.message, /1 rows have a level of column "site" that was not among/);
        return true;
      },
    );
    await con.run("CREATE TABLE single AS SELECT id, x, 'only' AS site, y FROM plots");
    await assert.rejects(
      sweepSql(sql, { ...spec, table: "single", terms: [column("x"), indicators("site")] }),
      (e) => e instanceof CurbfitError && e.code === "CONSTANT_COLUMN" && e.place.column === "site",
    );
  });
});

Deno.test("overflowing powers are NOT_FINITE on every path, as in memory; huge doubles bind exactly", async () => {
  // x³ of 1e120 is beyond float64 (about 1.8e308); every other value is small.
  const n = 60;
  const x = Array.from({ length: n }, (_, i) => (i === 17 ? 1e120 : i / 7));
  const y = x.map((_, i) => (i % 5) / 3);
  const terms = [power("x", 3)];
  const isOverflow = (e: unknown) => e instanceof CurbfitError && e.code === "NOT_FINITE";
  // Reference: the in-memory sweep refuses the same design.
  assert.throws(
    () => sweep({ x, y }, { target: "y", terms, folds: { k: 3, seed: 1 }, closedForm: false }),
    isOverflow,
  );
  const text = ["id,x,y", ...x.map((v, i) => `${i},${v},${y[i]}`)].join("\n");
  await assert.rejects(
    sweepStream(() => ReadableStream.from([text]), {
      target: "y",
      terms,
      folds: { k: 3, seed: 1, key: "id" },
    }),
    (e) => isOverflow(e) && (e as CurbfitError).place.line === 19,
  );
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (con) => {
    const sql = duckdbConnection(con);
    // Whole-number doubles beyond the BIGINT range (shifts such as c^10) reach the engine intact.
    const values = [1e20, -(2 ** 70), 2 ** 53 + 2];
    const echo = await sql.run({
      text: "SELECT CAST($1 AS DOUBLE PRECISION), CAST($2 AS DOUBLE PRECISION), CAST($3 AS BIGINT)",
      params: values,
    });
    assert.deepEqual(echo.rows[0].map(Number), values);
    await con.run("CREATE TABLE big (id BIGINT, x DOUBLE, y DOUBLE)");
    const app = await con.createAppender("big");
    x.forEach((v, i) => {
      app.appendBigInt(BigInt(i));
      app.appendDouble(v);
      app.appendDouble(y[i]);
      app.endRow();
    });
    app.closeSync();
    await assert.rejects(
      sweepSql(sql, { table: "big", target: "y", terms, folds: { k: 3, seed: 1, key: "id" } }),
      isOverflow,
    );
  });
});

async function pgTable(
  client: import("pg").Client,
  table: string,
  names: Names,
  shards: number[] = [1, 2],
): Promise<void> {
  await client.query(createSql(POSTGRESQL, table, names));
  const rows = ROWS.ids.map((_, i) => i).filter((i) => shards.includes(ROWS.shard[i]));
  await client.query(
    `INSERT INTO ${quoteIdentifier(POSTGRESQL, table)} SELECT * FROM unnest($1::bigint[], ` +
      "$2::int[], $3::float8[], $4::float8[], $5::float8[], $6::text[], $7::float8[])",
    [
      rows.map((i) => String(ROWS.ids[i])),
      rows.map((i) => ROWS.shard[i]),
      rows.map((i) => ROWS.x[i]),
      rows.map((i) => ROWS.z[i]),
      rows.map((i) => ROWS.w[i]),
      rows.map((i) => ROWS.site[i]),
      rows.map((i) => ROWS.y[i]),
    ],
  );
}

Deno.test("PostgreSQL: per-fold sums, every term set and hostile names and levels equal the in-memory results", async () => {
  if (!requireTool(postgresInstalled(), "PostgreSQL (Debian package postgresql)")) return;
  const server = await startPostgres();
  try {
    const client = await server.connect();
    await client.query("SET jit = off"); // as lib/sql/README.md advises for wide aggregates
    await client.query("CREATE TABLE keep (v INTEGER)");
    await client.query("INSERT INTO keep VALUES (1)");
    await pgTable(client, "plots", PLAIN);
    const sql = postgresConnection(client);
    const { engine, memory } = await engineAndMemoryMoments(sql, "plots", SUMS_TERMS);
    // Reference: the in-memory design (double-double powers and products) summarized two-pass.
    const sums = momentsDifference(engine, memory);
    console.log(
      `PostgreSQL per-fold sums vs in-memory design: largest relative difference ${sums}`,
    );
    assert.ok(sums <= 1e-12, `largest relative difference ${sums}`);
    // Reference: the in-memory design's powers, value by value.
    const ulps = await powerUlps(sql, "plots");
    console.log(`PostgreSQL POWER vs in-memory powers: at most ${ulps} units in the last place`);
    assert.ok(ulps <= 2, `${ulps} ulps`);
    let worst = 0;
    for (const terms of Object.values(TERM_SETS)) {
      const got = await sweepSql(sql, {
        table: "plots",
        target: "y",
        terms,
        folds: { k: K, seed: SEED, key: "id" },
      });
      // Reference: the in-memory sweep on the same folds.
      worst = Math.max(worst, assertSameSweep(got, memorySweep(terms), TOL));
    }
    console.log(`PostgreSQL vs in-memory, all term sets: largest relative difference ${worst}`);
    await pgTable(client, HOSTILE_TABLE, HOSTILE);
    const hostile = await sweepSql(sql, {
      table: ["public", HOSTILE_TABLE],
      target: "y",
      terms: renamedTerms(HOSTILE),
      folds: { k: K, seed: SEED, key: HOSTILE.id },
    });
    assertSameSweep(hostile, renamedMemorySweep(HOSTILE), TOL);
    assert.equal(Number((await client.query("SELECT COUNT(*) FROM keep")).rows[0].count), 1);
    await client.end();
  } finally {
    await server.stop();
  }
});

Deno.test("PostgreSQL sharded with postgres_fdw: power, level and product sums run on the shards", async () => {
  if (!requireTool(postgresInstalled(), "PostgreSQL (Debian package postgresql)")) return;
  const servers: PostgresServer[] = [];
  try {
    for (let i = 0; i < 3; i++) servers.push(await startPostgres());
    const [coordinator, ...shards] = servers;
    for (const [i, shard] of shards.entries()) {
      const c = await shard.connect();
      await pgTable(c, `plots_${i + 1}`, PLAIN, [i + 1]);
      await c.end();
    }
    const client = await coordinator.connect();
    // Whether to ship an aggregate is the planner's cost-based choice. With postgres_fdw's
    // default fdw_tuple_cost (0.01 per row) it kept this query's ~280 sums on the coordinator
    // (correct, but every row crosses the wire); at 0.2 (PostgreSQL 17's new default, recalled
    // from memory) it ships them, as it already does for the smaller Legendre query.
    await partitionOverShards(
      client,
      "plots",
      "id BIGINT, shard INTEGER, x DOUBLE PRECISION, z DOUBLE PRECISION, w DOUBLE PRECISION, site TEXT, y DOUBLE PRECISION",
      shards,
      { fdw_tuple_cost: "0.2" },
    );
    await client.query("SET jit = off");
    const terms = TERM_SETS["products of power, column and indicators"];
    const got = await sweepSql(postgresConnection(client), {
      table: "plots",
      target: "y",
      terms,
      folds: { k: K, seed: SEED, key: "id" },
      partitionBy: ["shard"],
    });
    // Reference: the in-memory sweep on the same folds.
    assertSameSweep(got, memorySweep(terms), TOL);
    // Both the levels query and the moments query: one foreign aggregate per shard.
    const levels = got.queries.find((q) => q.text.includes("curbfit_level"))!;
    const moments = got.queries[got.queries.length - 1];
    assert.match(moments.text, /POWER\(/);
    for (const q of [levels, moments]) {
      const plan = (await client.query({
        text: `EXPLAIN (VERBOSE, COSTS OFF) ${q.text}`,
        values: q.params.map(String),
      })).rows.map((r: { "QUERY PLAN": string }) => r["QUERY PLAN"]).join("\n");
      const pushed = plan.match(/Relations: Aggregate on \(public\.plots_\d plots(_\d)?\)/g) ?? [];
      assert.equal(pushed.length, 2, plan);
      assert.ok(!/Partial|HashAggregate|GroupAggregate/.test(plan), plan);
    }
    await client.end();
  } finally {
    for (const s of servers) await s.stop();
  }
});
