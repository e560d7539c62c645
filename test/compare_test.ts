/**
 * Selection rules and paired comparison. The one-SE rule follows Breiman et al. (1984) and
 * Hastie, Tibshirani & Friedman, ESL 2nd ed. §7.10: the largest λ whose mean CV error is within
 * one standard error of the minimum. Data: seeded, invented.
 */
import assert from "node:assert/strict";
import { column, compare, CurbfitError, kFoldPlan, lasso, legendre, ridge, sweep } from "../mod.ts";
import { choose } from "../lib/sweep/select.ts";
import { pairedDifference } from "../lib/sweep/compare.ts";
import { syntheticColumns } from "./helpers.ts";

Deno.test("min rule takes the first smallest mean; one-SE takes the largest λ within one SE", () => {
  const lambdas = [0.01, 0.1, 1, 10, 100];
  const mean = [2.0, 1.5, 1.2, 1.28, 1.9];
  const se = [0.1, 0.1, 0.1, 0.1, 0.1];
  assert.deepEqual(choose("min", lambdas, mean, se), { rule: "min", index: 2, strength: 1 });
  assert.deepEqual(choose("one-se", lambdas, mean, se), { rule: "one-se", index: 3, strength: 10 });
  assert.equal(choose("one-se", lambdas, [1, 1, 1, 1, 1], se).strength, 100, "ties: largest λ");
  assert.equal(choose("min", lambdas, [1, 1, 1, 1, 1], se).strength, 0.01, "ties: first");
  assert.throws(() => choose("median" as "min", lambdas, mean, se), CurbfitError);
});

Deno.test("paired differences: mean and SE of per-fold differences (SD/√K)", () => {
  const d = pairedDifference([3, 4, 5, 6], [1, 1, 1, 1], 4);
  assert.equal(d.mean, 3.5);
  assert.ok(Math.abs(d.se - Math.sqrt(5 / 3) / 2) < 1e-15);
  assert.equal(d.indistinguishable, false);
  assert.equal(pairedDifference([1, 2, 1, 2], [2, 1, 2, 1], 4).indistinguishable, true);
});

Deno.test("compare sweeps every candidate on the identical folds and pairs their errors", () => {
  const cols = syntheticColumns(31, 120, 1);
  const plan = kFoldPlan(120, { k: 6, seed: 77 });
  const c = compare(cols, [
    { name: "straight line, no penalty", terms: [column("x"), column("z1")], lambdas: [0] },
    { name: "degree 12, weight decay", terms: [legendre("x", 12), column("z1")], rule: "one-se" },
    {
      name: "degree 12, rising weights",
      terms: [legendre("x", 12), column("z1")],
      penalty: ridge({ weights: "rising", exponent: 2 }),
    },
  ], { target: "y", folds: plan });
  assert.equal(c.candidates.length, 3);
  for (const cand of c.candidates) assert.equal(cand.sweep.folds, plan);
  // Each candidate's numbers are exactly its own sweep on the same plan.
  const alone = sweep(cols, {
    target: "y",
    terms: [legendre("x", 12), column("z1")],
    rule: "one-se",
    folds: plan,
  });
  assert.deepEqual(c.candidates[1].sweep.curve, alone.curve);
  // The data are a sine: the straight line is clearly worse than the best.
  const best = c.candidates.find((x) => x.versusBest === null)!;
  assert.equal(best.name, c.best);
  assert.notEqual(c.best, "straight line, no penalty");
  const line = c.candidates[0];
  assert.ok(line.versusBest!.mean > 0 && !line.versusBest!.indistinguishable);
  assert.match(c.verdict[0], /worse than .* \(more than 2 SE\)/);
  const manual = pairedDifference(line.foldMse, best.foldMse, 6);
  assert.deepEqual(line.versusBest, manual);
});

Deno.test("compare rejects fewer than two candidates and repeated names", () => {
  const cols = syntheticColumns(1, 30, 1);
  assert.throws(
    () => compare(cols, [{ name: "a", terms: [column("x")] }], { target: "y" }),
    /at least two candidates/,
  );
  assert.throws(
    () =>
      compare(cols, [{ name: "a", terms: [column("x")] }, { name: "a", terms: [column("z1")] }], {
        target: "y",
      }),
    /option candidates\[1\]\.name/,
  );
});

Deno.test("sweep and compare refuse a fixed strength instead of ignoring it, naming the option", () => {
  const cols = syntheticColumns(1, 30, 1);
  const terms = [column("x")];
  const refused = (run: () => unknown, option: RegExp) =>
    assert.throws(
      run,
      (e) => e instanceof CurbfitError && e.code === "BAD_OPTION" && option.test(e.message),
    );
  refused(
    () => sweep(cols, { target: "y", terms, lambda: 2 } as never),
    /option lambda: .*lambdas: \[2/,
  );
  refused(
    () => sweep(cols, { target: "y", terms, budget: 1 } as never),
    /option budget: .*fit\(\)/,
  );
  refused(
    () => sweep(cols, { target: "y", terms, penalty: lasso(), alpha: 0.1 } as never),
    /option alpha: .*alphas: \[0\.1/,
  );
  refused(
    () =>
      compare(cols, [
        { name: "a", terms },
        { name: "b", terms, penalty: lasso(), lambdas: [1] } as never,
      ], { target: "y" }),
    /option candidates\[1\]\.lambdas/,
  );
});

Deno.test("progress is reported for every fold and the refit", () => {
  const cols = syntheticColumns(2, 50, 1);
  const seen: string[] = [];
  sweep(cols, {
    target: "y",
    terms: [column("x")],
    folds: { k: 5, seed: 1 },
    progress: (p) => seen.push(`${p.stage}:${p.done}/${p.total}`),
  });
  assert.deepEqual(seen.filter((s) => s.startsWith("folds")), [
    "folds:1/5",
    "folds:2/5",
    "folds:3/5",
    "folds:4/5",
    "folds:5/5",
  ]);
  assert.equal(seen.at(-1), "refit:1/1");
});

Deno.test("sweepAsync and compareAsync yield to the event loop between folds and give identical numbers", async () => {
  const { sweepAsync, compareAsync } = await import("../mod.ts");
  const cols = syntheticColumns(12, 60, 1);
  const spec = { target: "y", terms: [legendre("x", 6)], folds: { k: 4, seed: 5 } };
  let ticks = 0;
  const timer = setInterval(() => ticks++, 0);
  const a = await sweepAsync(cols, spec);
  clearInterval(timer);
  assert.ok(ticks >= 2, `timer callbacks ran during the sweep: ${ticks}`);
  assert.deepEqual(a.curve, sweep(cols, spec).curve);
  const candidates = [
    { name: "line", terms: [column("x")] },
    { name: "curve", terms: [legendre("x", 6)] },
  ];
  const options = { target: "y", folds: { k: 4, seed: 5 } };
  assert.deepEqual(
    (await compareAsync(cols, candidates, options)).verdict,
    compare(cols, candidates, options).verdict,
  );
});
