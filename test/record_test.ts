/**
 * Model-choice records: schema, determinism, verify and loading. Data: seeded, invented.
 * Outside references: SHA-256 (FIPS 180-4) through Web Crypto, an implementation independent of
 * node:crypto; shortest round-trip number text as ECMA-262 Number::toString specifies it; the
 * fold-assignment bytes as lib/folds/README.md states them.
 */
import assert from "node:assert/strict";
import {
  column,
  compare,
  CurbfitError,
  elasticNet,
  explicitPlan,
  groupedKFoldPlan,
  indicators,
  lasso,
  legendre,
  power,
  product,
  readCsv,
  readRecordedData,
  ridge,
  sweep,
  type SweepResult,
  type Table,
  tableFromColumns,
  tableFromRows,
} from "../mod.ts";
import {
  loadRecord,
  type ModelChoiceRecord,
  parseRecord,
  recordJson,
  recordOf,
  rowsDigest,
  SCHEMA,
  verify,
  type VerifyReport,
} from "../lib/record/mod.ts";
import { canonicalJson } from "../lib/record/json.ts";
import { syntheticColumns } from "./helpers.ts";

const COLS = syntheticColumns(41, 90, 1);

function run(
  cols: Table | Record<string, readonly (number | string)[]> = COLS,
  folds: { k: number; seed: number } = { k: 5, seed: 17 },
): SweepResult {
  return sweep(cols, {
    target: "y",
    terms: [legendre("x", 7), column("z1")],
    lambdas: { count: 15 },
    folds,
    rule: "one-se",
  });
}

/** The record as a mutable plain object (what a hand edit of the file produces). */
// deno-lint-ignore no-explicit-any
function editable(json: string): Record<string, any> {
  return JSON.parse(json);
}

function failed(report: VerifyReport): string[] {
  return report.failures.map((f) => f.field);
}

const JSON_TEXT = recordJson(run());

Deno.test("record: fixed top-level schema and key order, byte-identical across runs", () => {
  const again = recordJson(run());
  assert.equal(again, JSON_TEXT, "two independent sweeps give byte-identical JSON");
  const doc = JSON.parse(JSON_TEXT);
  assert.deepEqual(Object.keys(doc), [
    "schema",
    "kind",
    "created",
    "software",
    "target",
    "data",
    "folds",
    "models",
    "comparison",
    "cautions",
  ]);
  assert.equal(doc.schema, SCHEMA);
  assert.equal(doc.schema, "curbfit.model-choice/1");
  assert.equal(doc.created, null, "no clock is read unless asked");
  assert.equal(doc.folds.prng, "PCG32");
  assert.equal(doc.folds.seed, 17);
  assert.equal(doc.folds.k, 5);
  assert.deepEqual(doc.data.columns.map((c: { name: string }) => c.name), ["x", "y", "z1"]);
  const m = doc.models[0];
  assert.deepEqual(m.terms[0].params.domain, [Math.min(...COLS.x), Math.max(...COLS.x)]);
  assert.equal(m.grid.values.length, 15);
  assert.equal(m.cv.foldMse[0].length, 5);
  assert.equal(m.choice.rule, "one-se");
  assert.equal(m.final.coefficients.length, 8);
  assert.equal(m.final.standardized.coefficients.length, 8);
  assert.match(m.objective[0], /λ Σ_q γ_q \(s_q w_q\)²/);
  assert.ok(JSON_TEXT.endsWith("}\n"));
});

Deno.test("record: parse then write reproduces the bytes; createdAt only when given", () => {
  assert.equal(recordJson(parseRecord(JSON_TEXT)), JSON_TEXT);
  const when = new Date(Date.UTC(2031, 4, 6, 7, 8, 9));
  const dated = JSON.parse(recordJson(run(), { createdAt: when }));
  assert.equal(dated.created, "2031-05-06T07:08:09.000Z");
  assert.throws(
    () => recordOf(run(), { createdAt: new Date("not a date") }),
    (e) => e instanceof CurbfitError && e.code === "BAD_OPTION",
  );
});

Deno.test("record: numbers in shortest round-trip form, non-finite as strings (ECMA-262 Number::toString)", () => {
  // ECMA-262 Number::toString: the shortest digit string that reads back as the same double.
  assert.equal(
    canonicalJson([0.1, 1e21, 5e-324, -0, 1 / 3]),
    "[0.1, 1e+21, 5e-324, 0, 0.3333333333333333]",
  );
  assert.equal(canonicalJson([NaN, Infinity, -Infinity]), '["NaN", "Infinity", "-Infinity"]');
  const doc = editable(JSON_TEXT);
  for (const v of doc.models[0].cv.cvMean) assert.equal(Number(String(v)), v);
  // A holdout plan has one fold, so cvSe is NaN: written "NaN", read back as NaN.
  const s = sweep(COLS, {
    target: "y",
    terms: [legendre("x", 3)],
    lambdas: [0.1, 1],
    folds: { holdout: 0.25, seed: 5 },
  });
  const json = recordJson(s);
  assert.deepEqual(JSON.parse(json).models[0].cv.cvSe, ["NaN", "NaN"]);
  assert.ok(Number.isNaN(parseRecord(json).models[0].cv.cvSe[0]));
  assert.equal(verify(json, COLS).ok, true);
});

/** SHA-256 by Web Crypto of the "curbfit.rows/1" bytes, written by hand from lib/record/README.md. */
async function referenceDigest(
  columns: readonly { name: string; kind: "N" | "C"; values: readonly (number | string)[] }[],
  nRows: number,
): Promise<string> {
  const parts: number[] = [...new TextEncoder().encode("curbfit.rows/1\n")];
  const u32 = (v: number) => parts.push(v & 255, (v >>> 8) & 255, (v >>> 16) & 255, v >>> 24);
  const text = (s: string) => {
    const b = new TextEncoder().encode(s);
    u32(b.length);
    for (const x of b) parts.push(x);
  };
  const f64 = (v: number) => {
    const b = new Uint8Array(8);
    new DataView(b.buffer).setFloat64(0, v, true);
    for (const x of b) parts.push(x);
  };
  u32(nRows), u32(0); // row count as uint64 (below 2^32 here)
  u32(columns.length);
  for (const c of columns) text(c.name), parts.push(c.kind.charCodeAt(0));
  for (let i = 0; i < nRows; i++) {
    for (const c of columns) {
      if (c.kind === "N") f64(c.values[i] as number);
      else text(c.values[i] as string);
    }
  }
  const digest = await crypto.subtle.digest("SHA-256", new Uint8Array(parts));
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, "0")).join("");
}

Deno.test("record: data fingerprint equals SHA-256 (Web Crypto) of the documented byte layout", async () => {
  const x = [1.5, -0, 2];
  const site = ["b", "é", "b"];
  const mixed = tableFromColumns({ x, site });
  assert.equal(
    rowsDigest(3, [mixed.columns.get("site")!, mixed.columns.get("x")!]),
    await referenceDigest([{ name: "site", kind: "C", values: site }, {
      name: "x",
      kind: "N",
      values: x,
    }], 3),
  );
  // All-numeric rows take a blocked path; 5000 rows × 2 columns span several 64 KiB blocks.
  const a = Array.from({ length: 5000 }, (_, i) => Math.sin(i) * 1e3);
  const b = Array.from({ length: 5000 }, (_, i) => i / 7);
  const numeric = tableFromColumns({ a, b });
  assert.equal(
    rowsDigest(5000, [numeric.columns.get("a")!, numeric.columns.get("b")!]),
    await referenceDigest([{ name: "a", kind: "N", values: a }, {
      name: "b",
      kind: "N",
      values: b,
    }], 5000),
  );
});

Deno.test("verify: an untouched record matches, with every tolerance stated", () => {
  const report = verify(JSON_TEXT, COLS);
  assert.equal(report.ok, true, report.text());
  assert.ok(report.entries.length > 40);
  const byField = new Map(report.entries.map((e) => [e.field, e]));
  assert.equal(byField.get("data.sha256")!.tolerance, "exact");
  assert.equal(byField.get("folds.assignmentSha256")!.tolerance, "exact");
  assert.equal(byField.get("models[0].cv.cvMean")!.tolerance, "relative 1e-9 (each value)");
  assert.match(byField.get("models[0].final.coefficients")!.tolerance, /relative 1e-9/);
  assert.match(report.text(), /^Record check: MATCH/);
  assert.ok(Object.isFrozen(report) && Object.isFrozen(report.entries));
  const display = (report as unknown as Record<symbol, () => Record<string, string>>)[
    Symbol.for("Jupyter.display")
  ]();
  assert.equal(display["text/plain"], report.text());
});

Deno.test("verify: a hand-edited coefficient is named and nothing else fails", () => {
  const doc = editable(JSON_TEXT);
  doc.models[0].final.coefficients[2] *= 1 + 1e-6;
  const report = verify(doc, COLS);
  assert.deepEqual(failed(report), ["models[0].final.coefficients"]);
  assert.match(report.failures[0].where ?? "", /P3\(x\)/);
  assert.match(report.text(), /MISMATCH \(1 of/);
});

Deno.test("verify: an edited chosen λ, or an edited grid λ, is detected", () => {
  const chosen = editable(JSON_TEXT);
  chosen.models[0].choice.lambda *= 2;
  assert.deepEqual(failed(verify(chosen, COLS)), ["models[0].choice.lambda"]);

  const grid = editable(JSON_TEXT);
  grid.models[0].grid.values[4] *= 1.01; // an automatic grid: regenerated from its ends
  const fields = failed(verify(grid, COLS));
  assert.ok(fields.includes("models[0].grid.values"), fields.join());

  const explicit = recordJson(
    sweep(COLS, {
      target: "y",
      terms: [legendre("x", 7)],
      lambdas: [0.01, 0.1, 1, 10],
      folds: { k: 5, seed: 17 },
    }),
  );
  const edited = editable(explicit);
  edited.models[0].grid.values[1] = 0.2;
  const named = failed(verify(edited, COLS));
  assert.ok(
    named.includes("models[0].cv.lambda") && named.includes("models[0].cv.cvMean"),
    named.join(),
  );
});

Deno.test("verify: a changed seed or k shows in the rebuilt fold assignment", () => {
  const seed = editable(JSON_TEXT);
  seed.folds.seed = 18;
  const bySeed = verify(seed, COLS);
  assert.ok(failed(bySeed).includes("folds.assignmentSha256"), failed(bySeed).join());
  const entry = bySeed.failures.find((f) => f.field === "folds.assignmentSha256")!;
  assert.match(entry.where ?? "", /PCG32 seed 18, k 5/);

  const k = editable(JSON_TEXT);
  k.folds.k = 6;
  const byK = failed(verify(k, COLS));
  assert.ok(byK.includes("folds.assignmentSha256"), byK.join());
  assert.ok(byK.includes("models[0].cv.foldMse"), byK.join());
});

Deno.test("verify: one changed data value or one removed row is detected", () => {
  const changed = { ...COLS, z1: [...COLS.z1] };
  changed.z1[37] += 1e-9;
  const byValue = failed(verify(JSON_TEXT, changed));
  assert.ok(byValue.includes("data.sha256"), byValue.join());

  const removed = Object.fromEntries(
    Object.entries(COLS).map(([k, v]) => [k, v.filter((_, i) => i !== 50)]),
  );
  const byRow = failed(verify(JSON_TEXT, removed));
  for (const f of ["data.rows", "data.sha256", "folds.rows", "folds.assignmentSha256"]) {
    assert.ok(byRow.includes(f), `${f} in ${byRow.join()}`);
  }
});

Deno.test("verify: a missing column is a mismatch, not a crash", () => {
  const { z1: _dropped, ...rest } = COLS;
  const report = verify(JSON_TEXT, rest);
  assert.ok(failed(report).includes("data.columns[2]"));
  assert.ok(failed(report).includes("rerun"));
});

Deno.test("records from a newer schema, malformed JSON or edited structure are BAD_RECORD", () => {
  const isBad = (pattern: RegExp, option?: string) => (e: unknown) =>
    e instanceof CurbfitError && e.code === "BAD_RECORD" && pattern.test(e.message) &&
    (option === undefined || e.place.option === option);
  const newer = editable(JSON_TEXT);
  newer.schema = "curbfit.model-choice/2";
  assert.throws(() => verify(JSON.stringify(newer), COLS), isBad(/newer than this curbfit/));
  assert.throws(() => loadRecord(JSON_TEXT.slice(0, 500)), isBad(/not valid JSON/));
  assert.throws(() => parseRecord('{"schema": "something-else/1"}'), isBad(/not a curbfit/));
  const missing = editable(JSON_TEXT);
  delete missing.models[0].final.sds;
  assert.throws(() => parseRecord(missing), isBad(/is missing/, "record.models[0].final.sds"));
  const extra = editable(JSON_TEXT);
  extra.folds.note = "hand-added";
  assert.throws(() => parseRecord(extra), isBad(/not a field/, "record.folds.note"));
  const typed = editable(JSON_TEXT);
  typed.models[0].cv.cvMean[3] = "0.5";
  assert.throws(() => parseRecord(typed), isBad(/not a number/, "record.models[0].cv.cvMean[3]"));
  const short = editable(JSON_TEXT);
  short.models[0].final.coefficients.pop();
  assert.throws(() => loadRecord(short), isBad(/entries for 8 design columns/));
});

Deno.test("loadRecord: predictions equal the original fit's without refitting", () => {
  const s = run();
  const loaded = loadRecord(recordJson(s));
  const fresh = syntheticColumns(99, 30, 1); // new rows, some outside the training range of x
  const a = s.fit.predict(fresh);
  const b = loaded.predict(fresh);
  a.values.forEach((v, i) =>
    assert.ok(Math.abs(b.values[i] - v) <= 1e-12 * Math.max(1, Math.abs(v)))
  );
  assert.deepEqual(b.outside, a.outside, "extrapolation counts come from the recorded ranges");
  assert.deepEqual(loaded.fit.summary.coefficients, s.fit.summary.coefficients);
  assert.equal(loaded.fit.summary.strength, s.chosen.strength);
});

Deno.test("loadRecord: categories, products and powers rebuild from the recorded summaries", () => {
  const n = 72;
  const rows = Array.from({ length: n }, (_, i) => {
    const x = COLS.x[i];
    const site = ["north", "east", "west"][i % 3];
    return { x, site, y: COLS.y[i] + (site === "east" ? 0.4 : 0) + 0.1 * x * (i % 3) };
  });
  const s = sweep(tableFromRows(rows), {
    target: "y",
    terms: [power("x", 2), indicators("site"), product(legendre("x", 2), indicators("site"))],
    penalty: ridge({ weights: "rising", exponent: 2 }),
    lambdas: [0.01, 0.1, 1],
    folds: { k: 4, seed: 8 },
  });
  const json = recordJson(s);
  const loaded = loadRecord(json);
  const probe = rows.slice(0, 9);
  const a = s.fit.predict(probe).values;
  const b = loaded.predict(probe).values;
  a.forEach((v, i) => assert.ok(Math.abs(b[i] - v) <= 1e-12 * Math.max(1, Math.abs(v))));
  assert.equal(verify(json, rows).ok, true);
});

Deno.test("grouped (by column and by labels) and explicit folds verify; grouped-by-column replays", () => {
  const n = COLS.x.length;
  const site = Array.from({ length: n }, (_, i) => `s${i % 9}`);
  const data = { ...COLS, site };
  const terms = [legendre("x", 4), column("z1")];
  const byColumn = recordJson(
    sweep(data, {
      target: "y",
      terms,
      lambdas: [0.1, 1],
      folds: { k: 3, seed: 2, groups: "site" },
    }),
  );
  const doc = JSON.parse(byColumn);
  assert.equal(doc.folds.groupColumn, "site");
  assert.equal(doc.folds.assignment, null, "rebuilt from the column, so not stored");
  assert.ok(doc.data.columns.some((c: { name: string }) => c.name === "site"));
  assert.equal(verify(byColumn, data).ok, true);

  const labels = groupedKFoldPlan(n, { groups: site, k: 3, seed: 2 });
  const byLabels = recordJson(
    sweep(COLS, { target: "y", terms, lambdas: [0.1, 1], folds: labels }),
  );
  assert.equal(
    JSON.parse(byLabels).folds.assignment.length,
    1,
    "labels are not in the data: stored",
  );
  assert.equal(verify(byLabels, COLS).ok, true);

  const years = explicitPlan(n, { assignment: Array.from({ length: n }, (_, i) => i % 4) });
  const explicit = recordJson(sweep(COLS, { target: "y", terms, lambdas: [0.1, 1], folds: years }));
  assert.equal(verify(explicit, COLS).ok, true);
  const moved = editable(explicit);
  moved.folds.assignment[0][0] = 1;
  assert.ok(failed(verify(moved, COLS)).includes("folds.assignmentSha256"));
});

Deno.test("comparison records hold every candidate, verify, and load the best", () => {
  const c = compare(COLS, [
    { name: "line", terms: [column("x"), column("z1")], lambdas: [0] },
    { name: "degree 7", terms: [legendre("x", 7), column("z1")], lambdas: { count: 8 } },
  ], { target: "y", folds: { k: 5, seed: 23 } });
  const json = recordJson(c);
  const record: ModelChoiceRecord = parseRecord(json);
  assert.equal(record.kind, "comparison");
  assert.deepEqual(record.models.map((m) => m.name), ["line", "degree 7"]);
  assert.equal(record.comparison!.best, c.best);
  assert.equal(verify(json, COLS).ok, true);
  const loaded = loadRecord(json);
  assert.equal(loaded.fit, loaded.models.find((m) => m.name === c.best)!.fit);
  const best = c.candidates.find((o) => o.name === c.best)!.sweep.fit;
  assert.deepEqual(loaded.predict(COLS).values, best.predict(COLS).values);
  const edited = editable(json);
  edited.comparison.candidates[0].cvMean *= 1.001;
  assert.deepEqual(failed(verify(edited, COLS)), ["comparison.candidates[0].cvMean"]);
});

Deno.test("a record never freezes or keeps the caller's objects", () => {
  const grid = [0.5, 0.05, 5];
  const term = legendre("x", 3);
  const s = sweep(COLS, { target: "y", terms: [term], lambdas: grid, folds: { k: 4, seed: 1 } });
  recordOf(s);
  assert.equal(Object.isFrozen(grid), false);
  assert.equal(Object.isFrozen(term.spec), false);
  assert.deepEqual(grid, [0.5, 0.05, 5]);
});

// ---- lasso / elastic-net models (keys `alpha`) -------------------------------------------------
// The numbers themselves are checked against brute force and the KKT conditions in
// test/sparse_front_test.ts; these tests pin the record's shape, its replay and its loading.

function sparseRun(): SweepResult {
  return sweep(COLS, {
    target: "y",
    terms: [legendre("x", 7), column("z1")],
    penalty: lasso(),
    alphas: { count: 12 },
    folds: { k: 5, seed: 17 },
    rule: "one-se",
  });
}

const SPARSE_TEXT = recordJson(sparseRun());

/** Every numeric entry of a report matched bit for bit (no element differed at all). */
function bitIdentical(report: VerifyReport): string[] {
  return report.entries
    .filter((e) => e.tolerance !== "exact" && (e.where !== null || e.expected !== e.actual))
    .map((e) => e.field);
}

Deno.test("sparse record: α keys, penalty with tolerance, objective in the 1/(2N) convention, KKT report", () => {
  assert.equal(recordJson(sparseRun()), SPARSE_TEXT, "byte-identical across runs");
  const doc = editable(SPARSE_TEXT);
  assert.equal(doc.schema, SCHEMA);
  const m = doc.models[0];
  assert.doesNotMatch(JSON.stringify(m), /"lambda"|"gcv"|"loo"|"closedForm"|"budget"/);
  assert.deepEqual(Object.keys(m), [
    "name",
    "terms",
    "standardize",
    "intercept",
    "penalty",
    "objective",
    "grid",
    "cv",
    "choice",
    "final",
  ]);
  assert.deepEqual(m.penalty, { kind: "lasso", mix: 1, tolerance: 1e-7 });
  assert.match(m.objective[0], /^minimize \(1\/\(2N\)\)/);
  assert.deepEqual(m.grid.request, { count: 12, ratio: null });
  assert.deepEqual(m.cv.alpha, m.grid.values);
  // nonzero per α is the count of nonzero entries of that α's all-rows path row.
  assert.deepEqual(
    m.cv.nonzero,
    m.cv.path.map((w: number[]) => w.filter((v) => v !== 0).length),
  );
  assert.equal(m.choice.alpha, m.grid.values[m.choice.index]);
  const f = m.final;
  assert.equal(f.alpha, m.choice.alpha);
  assert.deepEqual(Object.keys(f.descent), ["passes", "converged", "violation", "gap"]);
  assert.equal(f.descent.converged, true);
  assert.ok(f.descent.violation <= m.penalty.tolerance);
  assert.ok(f.descent.gap >= -1e-12, "a duality gap is not negative (up to rounding)");
  assert.equal(f.nonzero, f.coefficients.filter((v: number) => v !== 0).length);
  // Standardized and original coefficients: w*_q = s_q w_q (lib/record/README.md).
  f.coefficients.forEach((w: number, q: number) => {
    const ws = f.standardized.coefficients[q];
    assert.ok(Math.abs(w * f.sds[q] - ws) <= 1e-12 * Math.max(1, Math.abs(ws)));
  });
  assert.equal(recordJson(parseRecord(SPARSE_TEXT)), SPARSE_TEXT, "parse then write: same bytes");
});

Deno.test("sparse record: verify replays it bit for bit; an edited α or coefficient fails", () => {
  const report = verify(SPARSE_TEXT, COLS);
  assert.equal(report.ok, true, report.text());
  // Replays are deterministic on one curbfit and Deno version, so the solver's own tolerance
  // (1e-7 on the scaled KKT violation) never enters: every number matches exactly.
  assert.deepEqual(bitIdentical(report), []);
  const doc = editable(SPARSE_TEXT);
  doc.models[0].grid.values[3] *= 1.001;
  assert.ok(failed(verify(JSON.stringify(doc), COLS)).includes("models[0].grid.values"));
  const chosen = editable(SPARSE_TEXT);
  chosen.models[0].choice.alpha *= 1.001;
  assert.deepEqual(failed(verify(JSON.stringify(chosen), COLS)), ["models[0].choice.alpha"]);
  const coefficient = editable(SPARSE_TEXT);
  const w = coefficient.models[0].final.coefficients;
  const q = w.findIndex((v: number) => v !== 0);
  w[q] *= 1.0001;
  assert.deepEqual(failed(verify(JSON.stringify(coefficient), COLS)), [
    "models[0].final.coefficients",
  ]);
});

Deno.test("sparse record: an explicit α grid reruns as listed; an edited grid α changes the CV columns", () => {
  const s = sweep(COLS, {
    target: "y",
    terms: [legendre("x", 5)],
    penalty: elasticNet({ mix: 0.4 }),
    alphas: [0.3, 0.01, 0.1, 0.03],
    folds: { k: 4, seed: 5 },
  });
  const text = recordJson(s);
  const doc = editable(text);
  assert.equal(doc.models[0].grid.kind, "explicit");
  assert.deepEqual(doc.models[0].grid.values, [0.01, 0.03, 0.1, 0.3]);
  assert.deepEqual(doc.models[0].penalty, { kind: "elastic-net", mix: 0.4, tolerance: 1e-7 });
  assert.equal(verify(text, COLS).ok, true);
  doc.models[0].grid.values[1] = 0.05;
  doc.models[0].cv.alpha[1] = 0.05;
  const fields = failed(verify(JSON.stringify(doc), COLS));
  assert.ok(fields.includes("models[0].cv.cvMean"), fields.join(", "));
});

Deno.test("sparse record: loadRecord predicts exactly as the sweep's model, on the α scale", () => {
  const s = sparseRun();
  const loaded = loadRecord(SPARSE_TEXT);
  const rows = { x: [0.05, 0.5, 0.93], z1: [0.2, -1, 1.4] };
  assert.deepEqual(loaded.predict(rows).values, s.fit.predict(rows).values);
  const summary = loaded.fit.summary;
  assert.equal(summary.scale, "alpha");
  assert.equal(summary.strength, s.chosen.strength);
  assert.deepEqual(summary.penalty, { kind: "lasso", mix: 1 });
  assert.equal(summary.objective, s.fit.summary.objective);
  assert.deepEqual(summary.descent, s.fit.summary.descent);
});

Deno.test("sparse record: a comparison of ridge, lasso and elastic net verifies; each candidate on its own key", () => {
  const c = compare(COLS, [
    { name: "ridge", terms: [legendre("x", 6), column("z1")], lambdas: { count: 10 } },
    {
      name: "lasso",
      terms: [legendre("x", 8), column("z1")],
      penalty: lasso(),
      alphas: { count: 10, ratio: 0.01 },
    },
    {
      name: "elastic net",
      terms: [legendre("x", 8), column("z1")],
      penalty: elasticNet({ mix: 0.5 }),
      alphas: [0.001, 0.01, 0.1],
      rule: "one-se",
    },
  ], { target: "y", folds: { k: 5, seed: 9 } });
  const text = recordJson(c);
  const doc = editable(text);
  const keys = doc.comparison.candidates.map((x: Record<string, unknown>) => Object.keys(x)[1]);
  assert.deepEqual(keys, ["lambda", "alpha", "alpha"]);
  assert.match(doc.comparison.criterion, /λ for ridge, α for lasso/);
  assert.deepEqual(doc.models[1].grid.request, { count: 10, ratio: 0.01 });
  const report = verify(text, COLS);
  assert.equal(report.ok, true, report.text());
  assert.deepEqual(bitIdentical(report), []);
  const loaded = loadRecord(text);
  assert.deepEqual(loaded.models.map((m) => m.fit.summary.scale), ["lambda", "alpha", "alpha"]);
  const edited = editable(text);
  edited.comparison.candidates[1].alpha *= 1.01;
  assert.deepEqual(failed(verify(JSON.stringify(edited), COLS)), [
    "comparison.candidates[1].alpha",
  ]);
  const swapped = editable(text);
  swapped.comparison.candidates[1].lambda = swapped.comparison.candidates[1].alpha;
  delete swapped.comparison.candidates[1].alpha;
  assert.throws(
    () => parseRecord(JSON.stringify(swapped)),
    (e: unknown) =>
      e instanceof CurbfitError && e.code === "BAD_RECORD" &&
      e.place.option === "record.comparison.candidates[1]",
  );
});

// ---- field separator --------------------------------------------------------------------------

/** COLS written as CSV with `separator` between fields (numbers in shortest round-trip form). */
function csvText(separator: string): string {
  const names = Object.keys(COLS);
  const rows = COLS.x.map((_, i) => names.map((n) => String(COLS[n][i])).join(separator));
  return [names.join(separator), ...rows].join("\n") + "\n";
}

/** Writes COLS as CSV with each separator into a temporary folder; returns the paths. */
async function writeSeparated(dir: string): Promise<Record<string, string>> {
  const paths: Record<string, string> = {};
  for (const [name, separator] of [["comma", ","], ["semicolon", ";"], ["tab", "\t"]]) {
    paths[name] = `${dir}/cols_${name}.txt`;
    await Deno.writeTextFile(paths[name], csvText(separator));
  }
  return paths;
}

Deno.test("record: data.fieldSeparator is absent for comma CSV and rows in memory (same bytes), and follows source otherwise", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const paths = await writeSeparated(dir);
    const sourceLine = (label: string) => `"source": ${JSON.stringify(label)},`;
    const comma = recordJson(run(await readCsv(paths.comma)));
    assert.ok(!comma.includes("fieldSeparator"), "no key for a comma file");
    assert.equal(
      comma,
      JSON_TEXT.replace(sourceLine("columns"), sourceLine(paths.comma)),
      "a comma file's record is the in-memory record byte for byte, apart from the source label",
    );
    assert.ok(!JSON_TEXT.includes("fieldSeparator"), "no key for columns in memory");
    const rows = recordJson(run(tableFromRows(COLS.x.map((_, i) => ({
      x: COLS.x[i],
      z1: COLS.z1[i],
      y: COLS.y[i],
    })))));
    assert.ok(!rows.includes("fieldSeparator"), "no key for rows in memory");
    for (
      const [name, separator, written] of [
        ["semicolon", ";", '";"'],
        ["tab", "\t", '"\\t"'],
      ]
    ) {
      const table = await readCsv(paths[name], { fieldSeparator: separator });
      assert.equal(table.fieldSeparator, separator, "the table keeps its separator");
      const text = recordJson(run(table));
      assert.equal(
        text,
        comma.replace(
          sourceLine(paths.comma),
          `${sourceLine(paths[name])}\n    "fieldSeparator": ${written},`,
        ),
        `${name}: the comma file's record with the key added after source, nothing else`,
      );
      const doc = JSON.parse(text);
      assert.deepEqual(Object.keys(doc.data), [
        "source",
        "fieldSeparator",
        "rows",
        "columns",
        "missing",
        "encoding",
        "sha256",
      ]);
      assert.equal(doc.data.fieldSeparator, separator);
      assert.equal(recordJson(parseRecord(text)), text, "parse then write keeps the bytes");
      assert.equal(parseRecord(text).data.fieldSeparator, separator);
    }
    const explicitComma = await readCsv(paths.comma, { fieldSeparator: "," });
    assert.equal(explicitComma.fieldSeparator, undefined, "a comma given explicitly is a comma");
    assert.equal(recordJson(run(explicitComma)), comma);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("record: an edited data.fieldSeparator is BAD_RECORD naming the field", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const paths = await writeSeparated(dir);
    const text = recordJson(run(await readCsv(paths.semicolon, { fieldSeparator: ";" })));
    for (
      const [value, pattern] of [
        [",", /a comma is written by leaving fieldSeparator out/],
        [";;", /exactly one character/],
        ['"', /double quote/],
        [59, /not text/],
      ] as const
    ) {
      const edited = editable(text);
      edited.data.fieldSeparator = value;
      assert.throws(
        () => parseRecord(JSON.stringify(edited)),
        (e: unknown) =>
          e instanceof CurbfitError && e.code === "BAD_RECORD" &&
          e.place.option === "record.data.fieldSeparator" && pattern.test(e.message),
        JSON.stringify(value),
      );
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("verify: readRecordedData reads the recorded separator; another one is noted or stops at the header", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const paths = await writeSeparated(dir);
    for (
      const [name, separator, plural] of [
        ["semicolon", ";", "semicolons"],
        ["tab", "\t", "tabs"],
      ]
    ) {
      const json = recordJson(run(await readCsv(paths[name], { fieldSeparator: separator })));
      // Read back with the recorded separator: every check matches, no separator note.
      const table = await readRecordedData(json, paths[name]);
      assert.equal(table.fieldSeparator, separator);
      const report = verify(json, table);
      assert.equal(report.ok, true, report.text());
      assert.ok(!report.notes.some((n) => n.includes("separator")), report.notes.join("\n"));
      // The same rows in memory match too; the notes say they were not read with the separator.
      const inMemory = verify(json, COLS);
      assert.equal(inMemory.ok, true);
      assert.ok(
        inMemory.notes.some((n) =>
          n.includes(`read with ${plural} between fields; these rows were not`)
        ),
        inMemory.notes.join("\n"),
      );
      // A wrong override: the header line holds the recorded separator and does not split, so
      // the loader stops there (an error, not a mismatch: no rows are read).
      const wrong = separator === ";" ? "\t" : ";";
      await assert.rejects(
        () => readRecordedData(json, paths[name], { fieldSeparator: wrong }),
        (e: unknown) =>
          e instanceof CurbfitError && e.code === "BAD_OPTION" &&
          e.place.option === "fieldSeparator" && e.place.line === 1 &&
          e.message.includes(`probably separated by ${plural}`),
      );
    }
    // A comma record checked against the same rows in a semicolon file, by override: a match,
    // and a note that the separators differ (the rows, not the separator, are compared).
    const commaJson = recordJson(run(await readCsv(paths.comma)));
    await assert.rejects(() => readRecordedData(commaJson, paths.semicolon), CurbfitError);
    const semi = await readRecordedData(commaJson, paths.semicolon, { fieldSeparator: ";" });
    const report = verify(commaJson, semi);
    assert.equal(report.ok, true, report.text());
    assert.ok(
      report.notes.some((n) =>
        n.startsWith("The record names no field separator") &&
        n.includes("these rows were read with semicolons")
      ),
      report.notes.join("\n"),
    );
    assert.match(report.text(), /Notes:[^]*names no field separator/);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

// ---- sparse models with per-column weights (additive keys of schema /1) -------------------------

function weightedRun(): SweepResult {
  return sweep(COLS, {
    target: "y",
    terms: [legendre("x", 7), column("z1")],
    penalty: elasticNet({ mix: 0.6, weights: "rising", exponent: 1.5 }),
    alphas: { count: 12 },
    folds: { k: 5, seed: 17 },
    rule: "one-se",
  });
}

const WEIGHTED_TEXT = recordJson(weightedRun());

Deno.test("weighted sparse record: weights, exponent and γ between mix and tolerance; γ in the objective", () => {
  assert.equal(recordJson(weightedRun()), WEIGHTED_TEXT, "byte-identical across runs");
  const m = editable(WEIGHTED_TEXT).models[0];
  assert.deepEqual(Object.keys(m.penalty), [
    "kind",
    "mix",
    "weights",
    "exponent",
    "gamma",
    "tolerance",
  ]);
  const orders = [1, 2, 3, 4, 5, 6, 7, 1];
  assert.deepEqual(m.penalty.gamma, orders.map((k) => k ** 1.5));
  assert.equal(m.penalty.weights, "rising");
  assert.match(m.objective[0], /α Σ_q γ_q \[ρ \|s_q w_q\| \+ \(\(1 − ρ\)\/2\) \(s_q w_q\)²\]/);
  assert.ok(m.objective.some((l: string) => /^γ_q = order_q\^1\.5 \(penalty\.gamma\)/.test(l)));
  assert.match(m.cv.definitions[3], /Σ_q γ_q/);
  // penaltyValue is Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] of each path row
  m.cv.path.forEach((w: number[], l: number) => {
    const byHand = w.reduce(
      (t, v, q) => t + m.penalty.gamma[q] * (0.6 * Math.abs(v) + 0.2 * v * v),
      0,
    );
    assert.ok(Math.abs(m.cv.penaltyValue[l] - byHand) <= 1e-12 * Math.max(1, byHand));
  });
  assert.equal(recordJson(parseRecord(WEIGHTED_TEXT)), WEIGHTED_TEXT, "parse then write");
  // unweighted sparse records keep their old shape: no weight keys at all
  assert.deepEqual(Object.keys(editable(SPARSE_TEXT).models[0].penalty), [
    "kind",
    "mix",
    "tolerance",
  ]);
});

Deno.test("weighted sparse record: verify replays it; an edited weight or γ fails; loadRecord predicts", () => {
  const report = verify(WEIGHTED_TEXT, COLS);
  assert.equal(report.ok, true, report.text());
  assert.deepEqual(bitIdentical(report), []);
  assert.ok(report.entries.some((e) => e.field === "models[0].penalty.gamma" && e.ok));
  // an edited γ: the rerun resolves γ from weights and orders again, so penalty.gamma differs
  const gamma = editable(WEIGHTED_TEXT);
  gamma.models[0].penalty.gamma[2] *= 1.01;
  assert.deepEqual(failed(verify(JSON.stringify(gamma), COLS)), ["models[0].penalty.gamma"]);
  // an edited exponent: the rerun uses it, so γ and the numbers that depend on it differ
  const exponent = editable(WEIGHTED_TEXT);
  exponent.models[0].penalty.exponent = 1;
  const fields = failed(verify(JSON.stringify(exponent), COLS));
  assert.ok(fields.includes("models[0].penalty.gamma"), fields.join(", "));
  assert.ok(fields.includes("models[0].cv.cvMean"), fields.join(", "));
  // loading: the same penalty, γ and predictions
  const s = weightedRun();
  const loaded = loadRecord(WEIGHTED_TEXT);
  const rows = { x: [0.05, 0.5, 0.93], z1: [0.2, -1, 1.4] };
  assert.deepEqual(loaded.predict(rows).values, s.fit.predict(rows).values);
  assert.deepEqual(loaded.fit.summary.penalty, s.fit.summary.penalty);
  assert.deepEqual(loaded.fit.summary.gamma, s.gamma);
  assert.equal(loaded.fit.summary.objective, s.fit.summary.objective);
  // a 0 weight (an unpenalized column) round-trips and verifies too
  const listed = sweep(COLS, {
    target: "y",
    terms: [legendre("x", 4), column("z1")],
    penalty: lasso({ weights: [0, 1, 2, 2, 1] }),
    alphas: [0.003, 0.03, 0.3],
    folds: { k: 4, seed: 3 },
  });
  const text = recordJson(listed);
  assert.deepEqual(editable(text).models[0].penalty.weights, [0, 1, 2, 2, 1]);
  assert.equal(verify(text, COLS).ok, true);
  const edited = editable(text);
  edited.models[0].penalty.weights[0] = 1;
  edited.models[0].penalty.gamma[0] = 1;
  const changed = failed(verify(JSON.stringify(edited), COLS));
  assert.ok(changed.includes("models[0].cv.cvMean"), changed.join(", "));
});

Deno.test("weighted sparse record: incomplete or equal weight keys are BAD_RECORD naming the field", () => {
  // deno-lint-ignore no-explicit-any
  const cases: [string, (m: Record<string, any>) => void][] = [
    ["record.models[0].penalty.gamma", (m) => delete m.penalty.gamma],
    ["record.models[0].penalty.weights", (m) => (m.penalty.weights = "equal")],
    ["record.models[0].penalty.exponent", (m) => (m.penalty.exponent = "two")],
    ["record.models[0].penalty.gamma", (m) => m.penalty.gamma.pop()],
  ];
  for (const [option, edit] of cases) {
    const doc = editable(WEIGHTED_TEXT);
    edit(doc.models[0]);
    assert.throws(
      () => parseRecord(JSON.stringify(doc)),
      (e: unknown) => {
        assert.ok(e instanceof CurbfitError, String(e));
        assert.equal(e.code, "BAD_RECORD");
        assert.equal(e.place.option, option);
        return true;
      },
    );
  }
  // γ without weights in an unweighted record: not a field of the schema
  const stray = editable(SPARSE_TEXT);
  stray.models[0].penalty = { kind: "lasso", mix: 1, gamma: [1], tolerance: 1e-7 };
  assert.throws(
    () => parseRecord(JSON.stringify(stray)),
    (e: unknown) =>
      e instanceof CurbfitError && e.code === "BAD_RECORD" &&
      e.place.option === "record.models[0].penalty.gamma",
  );
});
