/**
 * The exact fit's two solvers reach the same solution. The co-moments path (refinement of the
 * normal equations with double-double gradients, lib/solve/seminormal.ts) is checked against the
 * QR path (Householder QR with Björck's augmented-system refinement, lib/solve/exact.ts), which
 * the NIST StRD tests (nist_test.ts) hold to certified values, and on the NIST sets themselves:
 * - on seeded invented problems built to stress it — a large column offset beside a small spread,
 *   large residuals, no intercept, a penalty, power terms with trailing parts — both agree to
 *   1e-13 relative in every coefficient (both solve the same problem to about full precision;
 *   the bound allows for the problems' condition numbers, up to about 10³);
 * - on the NIST sets (certified values), the co-moments path alone meets every certified
 *   coefficient to LRE ≥ 12 on the 10 sets within its condition limit, and declines Filip.
 */
import assert from "node:assert/strict";
import { column, power, readCsv, tableFromColumns } from "../mod.ts";
import { buildDesign, learnTerms } from "../lib/design/mod.ts";
import { SeededStream } from "../lib/folds/mod.ts";
import { allRowsMoments } from "../lib/fit/solver.ts";
import { decompose } from "../lib/sweep/spectrum.ts";
import { type LsProblem, solveRefined } from "../lib/solve/exact.ts";
import { solveSeminormal } from "../lib/solve/seminormal.ts";
import type { Term } from "../lib/design/types.ts";
import type { Table } from "../lib/table/types.ts";
import { normals } from "./helpers.ts";

interface Case {
  readonly name: string;
  readonly table: Table;
  readonly terms: readonly Term[];
  readonly intercept: boolean;
  readonly lambda: number;
}

/** Both solutions of one case at λ with equal weights, on standardized columns. */
function bothPaths(c: Case) {
  const design = buildDesign(learnTerms(c.terms, c.table), c.table);
  const y = (c.table.columns.get("y") as { values: Float64Array }).values;
  const moments = allRowsMoments(design.block, y);
  const p = design.p;
  const options = { gamma: new Float64Array(p).fill(1), standardize: true, intercept: c.intercept };
  const spectrum = decompose(moments, options);
  const problem: LsProblem = {
    ...design.block,
    y,
    intercept: c.intercept,
    penaltyRoot: spectrum.scales.map((s) => Math.sqrt(c.lambda) * s),
  };
  return { fast: solveSeminormal(problem, spectrum, c.lambda), qr: solveRefined(problem) };
}

function cases(): Case[] {
  const n = 400;
  const stream = new SeededStream(20261202);
  const u = normals(stream, n);
  const v = normals(stream, n);
  const noise = normals(stream, n);
  const offset = Array.from(u, (x) => 1e6 + x);
  const table = (y: ArrayLike<number>) =>
    tableFromColumns({ a: offset, u: Array.from(u), v: Array.from(v), y: Array.from(y) });
  const signal = Array.from(u, (x, i) => 3 + 2 * x - 0.5 * v[i]);
  return [
    {
      name: "offset column beside a small spread",
      table: table(signal.map((s, i) => s + 0.1 * noise[i])),
      terms: [column("a"), column("v")],
      intercept: true,
      lambda: 0,
    },
    {
      name: "large residuals",
      table: table(signal.map((s, i) => s + 1e6 * noise[i])),
      terms: [column("u"), column("v")],
      intercept: true,
      lambda: 0,
    },
    {
      name: "no intercept, with a penalty",
      table: table(signal.map((s, i) => s + noise[i])),
      terms: [column("u"), column("v")],
      intercept: false,
      lambda: 25,
    },
    {
      name: "powers with trailing parts, penalized",
      table: table(signal.map((s, i) => s + Math.sin(3 * u[i]) + 0.01 * noise[i])),
      terms: [power("u", 5), column("v")],
      intercept: true,
      lambda: 0.5,
    },
  ];
}

for (const c of cases()) {
  Deno.test(`co-moments and QR paths agree to 1e-13: ${c.name}`, () => {
    const { fast, qr } = bothPaths(c);
    assert.ok(fast !== undefined, "the co-moments path should converge on this problem");
    const scale = Math.max(...Array.from(qr.w, Math.abs), Math.abs(qr.intercept));
    const worst = Math.max(
      Math.abs(fast.intercept - qr.intercept),
      ...Array.from(fast.w, (w, q) => Math.abs(w - qr.w[q])),
    );
    assert.ok(worst <= 1e-13 * scale, `largest difference ${worst} against ${scale}`);
    fast.w.forEach((w, q) => {
      const rel = Math.abs(w - qr.w[q]) / Math.abs(qr.w[q]);
      assert.ok(rel <= 1e-13, `coefficient ${q}: relative difference ${rel}`);
    });
    assert.ok(Math.abs(fast.rss - qr.rss) <= 1e-13 * qr.rss, `RSS ${fast.rss} vs ${qr.rss}`);
  });
}

const nist = new URL("./fixtures/nist-strd/", import.meta.url);
const certified = JSON.parse(await Deno.readTextFile(new URL("certified.json", nist))).datasets;

Deno.test("NIST StRD (certified values): the co-moments path meets LRE ≥ 12 on 10 of 11 sets", async () => {
  const taken: string[] = [];
  for (const name of Object.keys(certified)) {
    const c = certified[name];
    const table = await readCsv(new URL(`${name}.csv`, nist));
    const terms = c.predictors.length === 1
      ? [power("x", c.degree)]
      : c.predictors.map((p: string) => column(p));
    const { fast } = bothPaths({ name, table, terms, intercept: c.intercept, lambda: 0 });
    if (fast === undefined) continue;
    taken.push(name);
    const estimates = c.intercept ? [fast.intercept, ...fast.w] : [...fast.w];
    c.coefficients.forEach((cc: { name: string; estimate: string }, k: number) => {
      const cert = Number(cc.estimate);
      const lre = estimates[k] === cert
        ? 15
        : -Math.log10(Math.abs(estimates[k] - cert) / Math.abs(cert));
      assert.ok(lre >= 12, `${name} ${cc.name}: LRE ${lre.toFixed(2)}`);
    });
  }
  // Filip (standardized condition about 4e9) is beyond the limit and left to the QR path.
  assert.deepEqual(taken, Object.keys(certified).filter((name) => name !== "Filip"));
});
