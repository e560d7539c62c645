/**
 * Lasso and elastic net beyond memory: `sweepStream` (a CSV file) and `sweepSql` (DuckDB,
 * embedded via npm @duckdb/node-api; PostgreSQL when its Debian package is installed) against
 * the in-memory `sweep` on the same hash folds (explicitPlan from `curbfit.fold-hash/1` of the
 * same keys, lib/stream/README.md).
 *
 * Reference and tolerance: the in-memory sweep is this project's own sparse sweep, itself
 * checked against brute force from rows and the KKT conditions of Friedman, Hastie & Tibshirani
 * (2010, J. Stat. Softw. 33, eq. 5) in test/sparse_front_test.ts. Here every CV mean, SE and
 * fold error per α, the α grid itself, the coefficient path and the final coefficients must agree
 * to 1e-8 relative (coefficients relative to the largest one). Why 1e-8: the fold summaries of a
 * stream (Chan, Golub & LeVeque 1979 pairwise merges of chunk summaries) or of a SQL engine
 * (shifted sums, in an engine-chosen order) differ from the in-memory summaries in the last bits
 * (about 1e-13 relative, measured in test/stream_test.ts and test/sql_test.ts); coordinate
 * descent then stops on the same KKT test (scaled violation ≤ `tolerance`) on both sides, so the
 * two solutions agree to that rounding unless a stopping decision flips, which would still leave
 * both within the solver's tolerance. Most sweeps here use `tolerance: 1e-10`, so that such a
 * flip moves a coefficient by about that much on these near-orthogonal designs (standardized
 * condition number 1.15, measured), far below 1e-8; the elastic-net stream case keeps the
 * default 1e-7. 1e-8 is the tolerance every scale test in this project uses.
 *
 * Also pinned: options of the other strength convention are a BAD_OPTION naming the option
 * (lambdas with a sparse penalty; alphas / tolerance with ridge), as in the in-memory sweep; the
 * curve reports nonzero counts; the notebook display shows α and the nonzero count.
 * Data: seeded invented rows (test/sql/scale_helpers.ts → test/helpers.ts, PCG32 SeededStream).
 */
import assert from "node:assert/strict";
import {
  column,
  CurbfitError,
  elasticNet,
  explicitPlan,
  lasso,
  legendre,
  ridge,
  sweep,
  type SweepResult,
  tableFromColumns,
} from "../mod.ts";
import type { SparsePenalty } from "../lib/sparse/mod.ts";
import type { AlphaGrid } from "../lib/sparse/grid.ts";
import { sweepStream } from "../lib/stream/stream.ts";
import { sweepSql } from "../lib/sql/sweep.ts";
import { duckdbConnection, postgresConnection, type SqlConnection } from "../lib/sql/connection.ts";
import { DUCKDB } from "../lib/sql/dialect.ts";
import { foldHash, foldsOfKeys } from "../lib/stream/hash.ts";
import type { ScaleSweepResult } from "../lib/stream/finish.ts";
import { ffiAllowed, postgresInstalled, requireTool, startPostgres } from "./sql/servers.ts";
import { assertSameSweep, keyedRows } from "./sql/scale_helpers.ts";

const TOL = 1e-8;
const TIGHT = 1e-10;
const K = 5;
const SEED = 13;
const ROWS = keyedRows(47, 2500);
const TERMS = [legendre("x", 10), column("z1"), column("z2")];
const EXPLICIT_ALPHAS = [0.0005, 0.002, 0.008, 0.03, 0.1, 0.4];

interface SparseCase {
  readonly penalty: SparsePenalty;
  readonly alphas?: AlphaGrid;
  readonly tolerance?: number;
  readonly rule?: "min" | "one-se";
}

/** The in-memory sweep on the same hash folds, same penalty and grid. */
function memorySparse(c: SparseCase): SweepResult {
  const plan = explicitPlan(ROWS.n, {
    assignment: foldsOfKeys(foldHash(SEED, K), ROWS.ids),
    k: K,
  });
  return sweep(tableFromColumns(ROWS.columns), {
    target: "y",
    terms: TERMS,
    folds: plan,
    ...c,
  });
}

/** Scale-specific checks beyond the shared curve comparison; returns the worst difference. */
function assertSparseSame(got: ScaleSweepResult, want: SweepResult, c: SparseCase): number {
  const worst = assertSameSweep(got, want, TOL);
  assert.equal(got.scale, "alpha");
  assert.equal(got.fit.summary.scale, "alpha");
  assert.equal(got.fit.summary.penalty.kind, c.penalty.kind);
  assert.equal(got.fit.summary.objective, want.fit.summary.objective);
  assert.equal(got.fit.summary.strength, got.chosen.strength);
  assert.ok(got.fit.summary.descent?.converged, "the final model's descent converged");
  assert.deepEqual(got.curve.map((p) => p.nonzero), want.curve.map((p) => p.nonzero));
  // The same coefficients are exactly zero (the sparsity pattern, not only small values).
  const zeros = (r: { fit: { summary: { coefficients: readonly number[] } } }) =>
    r.fit.summary.coefficients.map((v) => v === 0);
  assert.deepEqual(zeros(got), zeros(want));
  assert.deepEqual(got.curve.map((p) => p.gcv), got.curve.map(() => null));
  assert.equal(got.chosen.rule, c.rule ?? "min");
  assert.deepEqual(got.notes, want.notes);
  // The curve reports nonzero counts: whole numbers, shrinking toward zero as α grows.
  const counts = got.curve.map((p) => p.nonzero);
  assert.ok(counts.every((m) => Number.isInteger(m) && m >= 0 && m <= got.names.length));
  assert.ok(counts[0] > counts[counts.length - 1], `nonzero counts ${counts}`);
  assert.equal(got.fit.summary.nonzero, counts[got.chosen.index]);
  return worst;
}

function csvText(): string {
  const c = ROWS.columns;
  const lines = ROWS.ids.map((id, i) => `${id},${c.x[i]},${c.z1[i]},${c.z2[i]},${c.y[i]}`);
  return ["id,x,z1,z2,y", ...lines].join("\n") + "\n";
}

async function withCsv(body: (path: string) => Promise<void>): Promise<void> {
  const path = await Deno.makeTempFile({ prefix: "curbfit-sparse-", suffix: ".csv" });
  try {
    await Deno.writeTextFile(path, csvText());
    await body(path);
  } finally {
    await Deno.remove(path);
  }
}

const LASSO: SparseCase = { penalty: lasso(), tolerance: TIGHT };
/** On these rows the one-SE rule picks a model with a coefficient exactly zero (11 of 12). */
const NET: SparseCase = {
  penalty: elasticNet({ mix: 0.4 }),
  alphas: EXPLICIT_ALPHAS,
  rule: "one-se",
};

Deno.test("sweepStream (CSV): lasso and elastic net equal the in-memory sweep on the same hash folds (1e-8)", async () => {
  await withCsv(async (path) => {
    for (const [name, c] of [["lasso", LASSO], ["elastic net", NET]] as const) {
      const got = await sweepStream(path, {
        target: "y",
        terms: TERMS,
        folds: { k: K, seed: SEED, key: "id" },
        chunkRows: 700,
        ...c,
      });
      const worst = assertSparseSame(got, memorySparse(c), c);
      console.log(
        `stream ${name} vs in-memory: largest relative difference ${worst.toExponential(2)}`,
      );
      assert.equal(got.passes, 2);
      if (c === NET) assert.ok(got.fit.summary.nonzero < got.names.length, "a sparse final model");
    }
  });
});

Deno.test("sweepStream: a sparse result shows itself in a notebook with α and nonzero counts", async () => {
  await withCsv(async (path) => {
    const got = await sweepStream(path, {
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
      ...LASSO,
      alphas: { count: 30 },
    });
    const show = (got as unknown as Record<symbol, () => Promise<Record<string, unknown>>>)[
      Symbol.for("Jupyter.display")
    ];
    const bundle = await show.call(got);
    const plain = bundle["text/plain"] as string;
    assert.match(bundle["image/svg+xml"] as string, /^<svg/);
    assert.ok(bundle["application/vnd.vegalite.v5+json"]);
    assert.match(plain, /30 α values/);
    assert.match(plain, /coordinate-descent solution/);
    assert.match(plain, new RegExp(`${got.fit.summary.nonzero} of 12 coefficients nonzero`));
    assert.match(plain, /folds from curbfit\.fold-hash\/1 of column id/);
    assert.doesNotMatch(plain, /λ values/);
  });
});

async function withDuckDB(body: (sql: SqlConnection) => Promise<void>): Promise<void> {
  const { DuckDBInstance } = await import("@duckdb/node-api");
  const db = await DuckDBInstance.create(":memory:");
  const con = await db.connect();
  try {
    await con.run("CREATE TABLE readings (id BIGINT, x DOUBLE, z1 DOUBLE, z2 DOUBLE, y DOUBLE)");
    const app = await con.createAppender("readings");
    for (let i = 0; i < ROWS.n; i++) {
      app.appendBigInt(BigInt(ROWS.ids[i]));
      for (const c of ["x", "z1", "z2", "y"]) app.appendDouble(ROWS.columns[c][i]);
      app.endRow();
    }
    app.closeSync();
    await body(duckdbConnection(con));
  } finally {
    con.closeSync();
    db.closeSync();
  }
}

Deno.test("sweepSql (DuckDB): lasso and elastic net equal the in-memory sweep on the same hash folds (1e-8)", async () => {
  if (!requireTool(ffiAllowed(), "DuckDB (@duckdb/node-api needs --allow-ffi)")) return;
  await withDuckDB(async (sql) => {
    const net: SparseCase = { ...NET, tolerance: TIGHT };
    for (const [name, c] of [["lasso", LASSO], ["elastic net", net]] as const) {
      const got = await sweepSql(sql, {
        table: "readings",
        target: "y",
        terms: TERMS,
        folds: { k: K, seed: SEED, key: "id" },
        ...c,
      });
      const worst = assertSparseSame(got, memorySparse(c), c);
      console.log(
        `DuckDB ${name} vs in-memory: largest relative difference ${worst.toExponential(2)}`,
      );
      assert.equal(got.engine, "duckdb");
    }
  });
});

Deno.test("PostgreSQL: a lasso sweep equals the in-memory sweep on the same hash folds (1e-8)", async () => {
  if (!requireTool(postgresInstalled(), "PostgreSQL (Debian package postgresql)")) return;
  const server = await startPostgres();
  try {
    const client = await server.connect();
    await client.query(
      "CREATE TABLE readings (id BIGINT, x DOUBLE PRECISION, z1 DOUBLE PRECISION, " +
        "z2 DOUBLE PRECISION, y DOUBLE PRECISION)",
    );
    await client.query(
      "INSERT INTO readings SELECT * FROM unnest($1::bigint[], $2::float8[], $3::float8[], " +
        "$4::float8[], $5::float8[])",
      [ROWS.ids.map(String), ...["x", "z1", "z2", "y"].map((c) => ROWS.columns[c])],
    );
    const got = await sweepSql(postgresConnection(client), {
      table: "readings",
      target: "y",
      terms: TERMS,
      folds: { k: K, seed: SEED, key: "id" },
      ...LASSO,
    });
    const worst = assertSparseSame(got, memorySparse(LASSO), LASSO);
    console.log(
      `PostgreSQL lasso vs in-memory: largest relative difference ${worst.toExponential(2)}`,
    );
    await client.end();
  } finally {
    await server.stop();
  }
});

/** Asserts a BAD_OPTION naming `option`. */
function badOption(option: string): (e: unknown) => boolean {
  return (e) => {
    assert.ok(e instanceof CurbfitError, String(e));
    assert.equal(e.code, "BAD_OPTION");
    assert.equal(e.place.option, option);
    assert.ok(e.message.includes(option), e.message);
    return true;
  };
}

Deno.test("the wrong strength options are a BAD_OPTION naming the option, before any row is read", async () => {
  const base = { target: "y", terms: TERMS, folds: { k: K, seed: SEED, key: "id" } };
  const wrong = [
    [{ penalty: lasso(), lambdas: [0.1, 1] }, "lambdas"],
    [{ penalty: elasticNet({ mix: 0.5 }), lambdas: { count: 10 } }, "lambdas"],
    [{ penalty: ridge(), alphas: [0.1] }, "alphas"],
    [{ alphas: { count: 5 } }, "alphas"],
    [{ tolerance: 1e-9 }, "tolerance"],
  ] as const;
  // No such file and a connection that must never be asked: the check comes first.
  const missing = "/nonexistent/curbfit-sparse.csv";
  const untouchable: SqlConnection = {
    dialect: DUCKDB,
    run: () => Promise.reject(new Error("the connection was used")),
  };
  for (const [options, option] of wrong) {
    const spec = { ...base, ...options } as Parameters<typeof sweepStream>[1];
    await assert.rejects(sweepStream(missing, spec), badOption(option));
    await assert.rejects(sweepSql(untouchable, { ...spec, table: "readings" }), badOption(option));
    // The in-memory sweep refuses the same pairing the same way.
    assert.throws(
      () => sweep(tableFromColumns(ROWS.columns), spec as Parameters<typeof sweep>[1]),
      badOption(option),
    );
  }
});
