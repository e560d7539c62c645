/**
 * Streaming sweeps and the fold hash. References: a BigInt transcription of the fold hash as
 * stated in lib/stream/README.md; the in-memory `sweep` on the same folds (explicitPlan from the
 * hash), to 1e-8 relative. Data is invented (test/helpers.ts).
 */
import assert from "node:assert/strict";
import { column, CurbfitError, explicitPlan, legendre, sweep } from "../mod.ts";
import { SeededStream } from "../lib/folds/mod.ts";
import {
  FOLD_HASH_PRIME,
  FOLD_HASH_STREAM,
  foldHash,
  foldOfKey,
  foldsOfKeys,
  reduceKey,
} from "../lib/stream/hash.ts";
import { sweepStream } from "../lib/stream/stream.ts";
import type { ScaleProgress } from "../lib/stream/finish.ts";
import { assertSameSweep, keyedRows, memorySweep } from "./sql/scale_helpers.ts";

const TOL = 1e-8;

/** The fold hash transcribed with BigInt, straight from lib/stream/README.md. */
function oracleFold(seed: number, k: number, key: bigint): number {
  const p = 2147483647n;
  const s = new SeededStream(seed, 0x666f6c64);
  const [a0, a1, a2, a3] = [0, 1, 2, 3].map(() => BigInt(s.nextBelow(2147483647)));
  const x = ((key % p) + p) % p;
  const h = (((a3 * x + a2) % p * x + a1) % p * x + a0) % p;
  return Number(h % BigInt(k));
}

Deno.test("fold hash: pinned vectors (a breaking change if they move)", () => {
  assert.equal(FOLD_HASH_PRIME, 2 ** 31 - 1);
  assert.equal(FOLD_HASH_STREAM, 1718578276);
  const keys = ["0", "1", "2", "-1", "2147483647", "9223372036854775807", "-9223372036854775808"];
  const h1 = foldHash(1, 10);
  assert.deepEqual(h1.coefficients, [1150918400, 168643461, 111701657, 2070359801]);
  assert.deepEqual(keys.map((k) => foldOfKey(h1, k)), [0, 2, 2, 2, 0, 2, 4]);
  const h42 = foldHash(42, 10);
  assert.deepEqual(h42.coefficients, [100439841, 1374354969, 1321634596, 1471668249]);
  assert.deepEqual(keys.map((k) => foldOfKey(h42, k)), [1, 8, 2, 6, 1, 8, 0]);
});

Deno.test("fold hash: equals a BigInt transcription for numbers, bigints and decimal text", () => {
  const draw = new SeededStream(7, 3);
  for (let i = 0; i < 3000; i++) {
    const magnitude = BigInt(draw.nextUint32()) * 2n ** 31n + BigInt(draw.nextUint32());
    const key = i % 2 === 0 ? magnitude : -magnitude;
    const seed = i % 5;
    const k = 2 + (i % 13);
    const want = oracleFold(seed, k, key);
    const h = foldHash(seed, k);
    assert.equal(foldOfKey(h, key), want, `key ${key}`);
    assert.equal(foldOfKey(h, key.toString()), want, `text ${key}`);
    if (key >= BigInt(Number.MIN_SAFE_INTEGER) && key <= BigInt(Number.MAX_SAFE_INTEGER)) {
      assert.equal(foldOfKey(h, Number(key)), want);
    }
  }
  assert.equal(reduceKey("  +000042 "), 42);
  assert.equal(reduceKey("-0"), 0);
  for (
    const bad of [
      "9223372036854775808",
      "-9223372036854775809",
      "1.5",
      "1e3",
      "",
      "x1",
      0.5,
      2 ** 60,
    ]
  ) {
    assert.ok(Number.isNaN(reduceKey(bad)), `refuses ${bad}`);
  }
});

Deno.test("fold hash: sequential keys spread evenly over folds (within 5 binomial SDs)", () => {
  const n = 100_000, k = 10;
  const counts = new Array(k).fill(0);
  const h = foldHash(3, k);
  for (let i = 0; i < n; i++) counts[foldOfKey(h, i)]++;
  const sd = Math.sqrt(n * (1 / k) * (1 - 1 / k));
  for (const c of counts) assert.ok(Math.abs(c - n / k) < 5 * sd, `counts ${counts}`);
});

const ROWS = keyedRows(31, 4000);
const TERMS = [legendre("x", 10), column("z1"), column("z2")];

function csvText(rows = ROWS, bad?: { at: number; line: string }): string {
  const lines = ["id,x,z1,z2,y"];
  for (let i = 0; i < rows.n; i++) {
    if (bad && i === bad.at) lines.push(bad.line);
    const c = rows.columns;
    lines.push(`${rows.ids[i]},${c.x[i]},${c.z1[i]},${c.z2[i]},${c.y[i]}`);
  }
  return lines.join("\n") + "\n";
}

async function tempFile(text: string, suffix: string): Promise<string> {
  const path = await Deno.makeTempFile({ prefix: "curbfit-stream-", suffix });
  await Deno.writeTextFile(path, text);
  return path;
}

Deno.test("CSV file, learned domains (two passes), key column: equals the in-memory sweep", async () => {
  const path = await tempFile(csvText(), ".csv");
  try {
    const reports: ScaleProgress[] = [];
    const got = await sweepStream(path, {
      target: "y",
      terms: TERMS,
      folds: { k: 5, seed: 8, key: "id" },
      chunkRows: 500,
      progress: (p) => reports.push(p),
    });
    const worst = assertSameSweep(got, memorySweep(ROWS.columns, ROWS.ids, TERMS, 5, 8), TOL);
    console.log(`stream vs in-memory: largest relative difference ${worst.toExponential(2)}`);
    assert.equal(got.passes, 2);
    assert.equal(got.rows.used, ROWS.n);
    assert.equal(got.source, path);
    const reading = reports.filter((r) => r.stage === "summaries" && r.rows > 0);
    assert.ok(reports.some((r) => r.stage === "domains"));
    assert.ok(reading.length >= 8, "a report per chunk of 500 rows");
    assert.ok(reading.every((r, i) => i === 0 || r.rows >= reading[i - 1].rows));
    assert.ok(reading.every((r) => r.rowsPerSecond > 0 && r.done <= r.total));
    assert.ok(reports.some((r) => r.stage === "folds") && reports.at(-1)!.stage === "refit");
    // In a notebook the result shows itself like an in-memory sweep, naming the hash folds.
    const bundle = await (got as unknown as Record<symbol, () => Promise<Record<string, string>>>)[
      Symbol.for("Jupyter.display")
    ]();
    assert.match(bundle["image/svg+xml"], /^<svg/);
    assert.match(bundle["text/plain"], /5-fold CV by key hash, seed 8/);
    assert.match(bundle["text/plain"], /folds from curbfit\.fold-hash\/1 of column id/);
    assert.ok(bundle["application/vnd.vegalite.v5+json"]);
  } finally {
    await Deno.remove(path);
  }
});

Deno.test("NDJSON stream read once, given domain, record numbers as keys: equals the in-memory sweep", async () => {
  const c = ROWS.columns;
  const lines = Array.from(
    { length: ROWS.n },
    (_, i) => JSON.stringify({ x: c.x[i], z1: c.z1[i], z2: c.z2[i], y: c.y[i], note: "ok" }),
  );
  const terms = [legendre("x", 10, { domain: [-3.5, 5.5] }), column("z1"), column("z2")];
  const bytes = new TextEncoder().encode(lines.join("\r\n"));
  // Pieces of 4099 bytes: lines, \r\n pairs and characters are cut anywhere.
  const pieces = Array.from(
    { length: Math.ceil(bytes.length / 4099) },
    (_, i) => bytes.slice(i * 4099, (i + 1) * 4099),
  );
  const got = await sweepStream(ReadableStream.from(pieces), {
    target: "y",
    terms,
    format: "ndjson",
    folds: { k: 4, seed: 2 },
  });
  assert.equal(got.passes, 1);
  assert.equal(got.folds.key, null);
  const keys = Array.from({ length: ROWS.n }, (_, i) => i);
  assertSameSweep(got, memorySweep(c, keys, terms, 4, 2), TOL);
});

Deno.test("a fold whose Legendre rebasing would amplify rounding is re-read, as in memory", async () => {
  // One row far to the right: the fold that holds it learns a much narrower domain.
  const rows = keyedRows(5, 300);
  const x = rows.columns.x.map((v, i) => (i === 17 ? 9 : v));
  const y = rows.columns.y;
  const terms = [legendre("x", 20)];
  const lambdas = { count: 20, min: 1e-3, max: 1e3 };
  const text = ["id,x,y", ...rows.ids.map((id, i) => `${id},${x[i]},${y[i]}`)].join("\n");
  const got = await sweepStream(() => ReadableStream.from([text]), {
    target: "y",
    terms,
    folds: { k: 5, seed: 4, key: "id" },
    lambdas,
  });
  assert.equal(got.passes, 3, "one fold was re-read");
  const plan = explicitPlan(300, { assignment: foldsOfKeys(foldHash(4, 5), rows.ids), k: 5 });
  const want = sweep({ x, y }, { target: "y", terms, folds: plan, lambdas, closedForm: false });
  assertSameSweep(got, want, TOL);
});

Deno.test("memory stays flat: 8× the rows, 80× the chunk, the same summary size", async () => {
  const sizes = [2_000, 16_000];
  const held: number[] = [];
  for (const n of sizes) {
    const rows = keyedRows(9, n);
    const path = await tempFile(csvText(rows), ".csv");
    try {
      const s = await sweepStream(path, {
        target: "y",
        terms: TERMS,
        folds: { k: 10, seed: 1, key: "id" },
        chunkRows: 200,
        lambdas: { count: 10 },
      });
      assert.equal(s.rows.used, n);
      assert.equal(s.memory.chunkRows, 200);
      held.push(s.memory.summaryBytes);
    } finally {
      await Deno.remove(path);
    }
  }
  // 10 folds × (13 means + 13² co-moments) doubles, whatever n is.
  assert.equal(held[0], 10 * (13 + 13 * 13) * 8);
  assert.equal(held[1], held[0]);
});

Deno.test("bad input at scale: the line is named and nothing is returned, or it is dropped and counted", async () => {
  const spec = { target: "y", terms: TERMS, folds: { k: 5, seed: 8, key: "id" } };
  // Record 2000 is on line 2002 (header on line 1, the bad line comes before row 2000).
  const badNumber = await tempFile(
    csvText(ROWS, { at: 2000, line: "77,0.5,1.2,oops,0.1" }),
    ".csv",
  );
  const ragged = await tempFile(csvText(ROWS, { at: 3000, line: "78,0.5,1.2" }), ".csv");
  try {
    await assert.rejects(sweepStream(badNumber, spec), (e) => {
      assert.ok(e instanceof CurbfitError);
      assert.equal(e.code, "BAD_NUMBER");
      assert.equal(e.place.line, 2002);
      assert.equal(e.place.column, "z2");
      assert.match(e.message, /line 2002/);
      return true;
    });
    const dropped = await sweepStream(badNumber, { ...spec, malformed: "drop" });
    assert.equal(dropped.rows.droppedMalformed, 1);
    assert.equal(dropped.rows.records, ROWS.n + 1);
    assert.deepEqual(dropped.rows.firstDropped.map((d) => d.line), [2002]);
    assertSameSweep(dropped, memorySweep(ROWS.columns, ROWS.ids, TERMS, 5, 8), TOL);
    await assert.rejects(
      sweepStream(ragged, spec),
      (e) => e instanceof CurbfitError && e.code === "RAGGED_ROW" && e.place.line === 3002,
    );
  } finally {
    await Deno.remove(badNumber);
    await Deno.remove(ragged);
  }
  const ndjson = [
    '{"x": 1, "y": 2}',
    '{"x": 2, "y": 3}',
    '{"x": 3, "y": ',
    '{"x": 4, "y": null}',
    '{"x": 5, "y": 1}',
  ]
    .join("\n");
  const one = {
    target: "y",
    terms: [column("x")],
    folds: { k: 2, seed: 1 },
    format: "ndjson" as const,
  };
  await assert.rejects(
    sweepStream(() => ReadableStream.from([ndjson]), one),
    (e) => e instanceof CurbfitError && e.code === "RAGGED_ROW" && e.place.line === 3,
  );
  await assert.rejects(
    sweepStream(() => ReadableStream.from([ndjson]), { ...one, malformed: "drop" }),
    (e) => e instanceof CurbfitError && e.code === "MISSING_VALUE" && e.place.line === 4,
  );
  // A stream that fails part way: a clear error, no partial result.
  const failing = () =>
    new ReadableStream<string>({
      start(controller) {
        controller.enqueue(csvText().slice(0, 50_000));
        controller.error(new Error("network went away"));
      },
    });
  await assert.rejects(sweepStream(failing, spec), (e) => {
    assert.ok(e instanceof CurbfitError);
    assert.equal(e.code, "READ_FAILED");
    assert.match(e.message, /network went away/);
    return true;
  });
  // One pass only, but a domain must be learned first.
  await assert.rejects(
    sweepStream(ReadableStream.from([csvText()]), spec),
    (e) => e instanceof CurbfitError && e.code === "BAD_OPTION" && e.place.option === "source",
  );
  await assert.rejects(
    sweepStream(() => ReadableStream.from([csvText()]), { ...spec, folds: { key: "nope" } }),
    (e) => e instanceof CurbfitError && e.code === "UNKNOWN_COLUMN",
  );
});
