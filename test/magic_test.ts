/**
 * The `curb` template: every statement form, errors with line, column, message and suggestion,
 * interpolation of tables, numbers and arrays, and the round trip to the printed API call
 * (running the printed code gives the same numbers as the template). Data: seeded, invented
 * (test/helpers.ts).
 */
import assert from "node:assert/strict";
import {
  column,
  compare,
  curb,
  CurbfitError,
  curbPlan,
  elasticNet,
  equivalentCall,
  indicators,
  kFoldPlan,
  lasso,
  legendre,
  MagicError,
  power,
  product,
  recordJson,
  ridge,
  sweep,
  tableFromColumns,
} from "../mod.ts";
import type { ApiCall, ComparisonResult, SweepResult } from "../mod.ts";
import { editDistance, nearestWord } from "../lib/magic/words.ts";
import { syntheticColumns } from "./helpers.ts";

const cols = syntheticColumns(5, 90, 2);
const site = cols.x.map((_, i) => ["north", "south", "east"][i % 3]);
const data = { ...cols, site };
const MOD_URL = new URL("../mod.ts", import.meta.url).href;

/** The sweep numbers that must agree between two runs. */
function numbers(s: SweepResult) {
  return {
    curve: s.curve,
    chosen: s.chosen,
    minimum: s.minimum,
    names: s.names,
    gamma: s.gamma,
    coefficients: s.fit.summary.coefficients,
    intercept: s.fit.summary.intercept,
  };
}

Deno.test("words: optimal-string-alignment distance and nearest-word suggestions", () => {
  assert.equal(editDistance("predcit", "predict"), 1, "a swap of neighbours costs 1");
  assert.equal(editDistance("", "abc"), 3);
  assert.equal(editDistance("kitten", "sitting"), 3, "the classic example (common practice)");
  assert.equal(nearestWord("LAMBDA", ["lambda", "folds"]), "lambda", "case is ignored");
  assert.equal(nearestWord("xyz", ["lambda", "folds"]), undefined, "no far-off guesses");
});

Deno.test("every statement and form parses into the API arguments it stands for", () => {
  const p = curbPlan`
    # a comment line, then a blank one

    data ${data}
    predict y                        # trailing comments too
    terms legendre x degree 6 over -3 to 5, power z1 degree 2
    terms column z2, column z1 times indicators site, ${legendre("z2", 2)}
    penalty ridge
    gamma rising 1.5
    lambda 12 points from 1e-3 to 1e3
    folds 4 seed 77 repeats 2
    rule one-se
    scale raw
    intercept no
    closed-form no
  `;
  assert.equal(p.job.kind, "sweep");
  if (p.job.kind !== "sweep") return;
  const spec = p.job.spec;
  assert.equal(spec.target, "y");
  assert.deepEqual(spec.terms.map((t) => t.spec), [
    legendre("x", 6, { domain: [-3, 5] }).spec,
    power("z1", 2).spec,
    column("z2").spec,
    product(column("z1"), indicators("site")).spec,
    legendre("z2", 2).spec,
  ]);
  assert.deepEqual(spec.penalty, ridge({ weights: "rising", exponent: 1.5 }));
  assert.deepEqual(spec.lambdas, { count: 12, min: 1e-3, max: 1e3 });
  assert.deepEqual(spec.folds, { k: 4, seed: 77, repeats: 2 });
  assert.equal(spec.rule, "one-se");
  assert.equal(spec.standardize, false);
  assert.equal(spec.intercept, false);
  assert.equal(spec.closedForm, false);
  assert.equal(p.program.target.spot.line, 5, "line 1 holds the opening backtick");
  assert.equal(p.program.target.spot.column, 13);
});

Deno.test("the other forms of gamma, lambda, folds, rule, scale, intercept and closed-form", () => {
  const plan = kFoldPlan(90, { k: 3, seed: 1 });
  const cases: [ReturnType<typeof curbPlan>, Record<string, unknown>][] = [
    [
      curbPlan`data ${data}
        predict y
        terms column x
        γ falling
        λ 0, 0.5, 2
        folds holdout 0.25 seed 3 repeats 4
        rule min
        scale standardized
        intercept yes
        closed-form auto`,
      {
        penalty: ridge({ weights: "falling" }),
        lambdas: [0, 0.5, 2],
        folds: { holdout: 0.25, seed: 3, repeats: 4 },
        rule: "min",
        standardize: true,
        intercept: true,
        closedForm: "auto",
      },
    ],
    [
      curbPlan`data ${data}
        predict y
        terms column x
        gamma ${[2, 3]}
        lambda ${[0.1, 1]}
        folds ${plan}
        closed-form yes`,
      { penalty: ridge({ weights: [2, 3] }), lambdas: [0.1, 1], folds: plan, closedForm: true },
    ],
    [
      curbPlan`data ${data}
        predict y
        terms column x
        gamma 1, 2.5
        lambda ${0.3}
        folds ${6} seed 2`,
      { penalty: ridge({ weights: [1, 2.5] }), lambdas: [0.3], folds: { k: 6, seed: 2 } },
    ],
    [
      curbPlan`data ${data}
        predict y
        terms column x
        gamma equal
        lambda from 0.01 to 10
        folds leave-one-out`,
      { penalty: ridge(), lambdas: { min: 0.01, max: 10 }, folds: { leaveOneOut: true } },
    ],
    [
      curbPlan`data ${data}
        predict y
        terms column x
        lambda 30 points
        folds seed 9 grouped by site`,
      { lambdas: { count: 30 }, folds: { seed: 9, groups: "site" } },
    ],
  ];
  for (const [p, expected] of cases) {
    assert.equal(p.job.kind, "sweep");
    if (p.job.kind !== "sweep") continue;
    for (const [key, value] of Object.entries(expected)) {
      assert.deepEqual((p.job.spec as unknown as Record<string, unknown>)[key], value, key);
    }
  }
});

Deno.test("data and names: tables, row objects, column arrays, quoted and interpolated names", () => {
  const table = tableFromColumns({ "dry mass": [1, 2, 3, 4], y: [2, 4, 7, 8] });
  const rows = [{ a: 1, y: 2 }, { a: 2, y: 3 }];
  const a = curbPlan`data ${table}
    predict ${"y"}
    terms column "dry mass"`;
  assert.equal(a.program.data.kind, "value");
  assert.equal((a.program.data as { value: unknown }).value, table, "the table itself, not a copy");
  assert.deepEqual(a.job.kind === "sweep" && a.job.spec.terms[0].spec, column("dry mass").spec);
  const b = curbPlan`data ${rows}
    predict "y"
    terms column a`;
  assert.equal((b.program.data as { value: unknown }).value, rows);
  const c = curbPlan`data "measurements.csv"
    predict y
    terms column a`;
  assert.deepEqual(c.program.data, {
    kind: "file",
    path: "measurements.csv",
    spot: { line: 1, column: 6, length: 18 },
  });
  const d = curbPlan`data ${"elsewhere/m.csv"}
    predict y
    terms column a`;
  assert.equal(d.program.data.kind === "file" && d.program.data.path, "elsewhere/m.csv");
});

Deno.test("candidates: shared settings are defaults, a candidate's own override them", () => {
  const p = curbPlan`
    data ${data}
    predict y
    folds 5 seed 3
    lambda 20 points
    rule one-se
    terms column x
    candidate straight line
      lambda 0
    candidate "degree 8, rising"
      terms legendre x degree 8, column z1
      gamma rising 2
      rule min
    candidate ${"with z2"}
      terms legendre x degree 8, column z1, column z2
  `;
  assert.equal(p.job.kind, "compare");
  if (p.job.kind !== "compare") return;
  assert.deepEqual(p.job.options, { target: "y", folds: { k: 5, seed: 3 }, rule: "one-se" });
  const [line, rising, withZ2] = p.job.candidates;
  assert.equal(line.name, "straight line");
  assert.deepEqual(line.lambdas, [0]);
  assert.equal(line.rule, undefined, "the shared rule goes to compare's options");
  assert.deepEqual(line.terms.map((t) => t.spec), [column("x").spec]);
  assert.equal(rising.name, "degree 8, rising");
  assert.deepEqual(rising.lambdas, { count: 20 }, "shared λ grid as default");
  assert.deepEqual(rising.penalty, ridge({ weights: "rising", exponent: 2 }));
  assert.equal(rising.rule, "min");
  assert.equal(rising.terms.length, 2, "a candidate's terms replace the shared terms");
  assert.equal(withZ2.name, "with z2");
  assert.equal(withZ2.terms.length, 3);
});

/** A bad template: where the error must point and what it must say. */
interface Bad {
  readonly make: () => unknown;
  readonly line: number;
  readonly column: number;
  readonly message: RegExp;
  readonly suggestion?: string;
  readonly code?: string;
}

const BAD: Record<string, Bad> = {
  "misspelt statement word": {
    make: () =>
      curbPlan`
  predcit y`,
    line: 2,
    column: 3,
    message: /expected a statement word, but found "predcit"\. Did you mean "predict"\?/,
    suggestion: "predict",
  },
  "an API option name instead of the statement": {
    make: () =>
      curbPlan`data ${data}
  target y`,
    line: 2,
    column: 3,
    message: /found "target"\. Did you mean "predict"\?/,
    suggestion: "predict",
  },
  "formula notation": {
    make: () =>
      curbPlan`data ${data}
  predict y ~ x`,
    line: 2,
    column: 13,
    message: /"~" has no meaning here\. curb has no formula notation/,
  },
  "misspelt term": {
    make: () =>
      curbPlan`data ${data}
  predict y
  terms legendr x degree 4`,
    line: 3,
    column: 9,
    message: /expected a term .*, but found "legendr"\. Did you mean "legendre"\?/,
    suggestion: "legendre",
  },
  "misspelt degree": {
    make: () =>
      curbPlan`data ${data}
  predict y
  terms legendre x degre 4`,
    line: 3,
    column: 20,
    message: /expected "degree", but found "degre"/,
    suggestion: "degree",
  },
  "degree out of range": {
    make: () =>
      curbPlan`data ${data}
  predict y
  terms power x degree 0`,
    line: 3,
    column: 24,
    message: /expected a whole number from 1 to 200, but found 0/,
  },
  "word for a number of folds": {
    make: () =>
      curbPlan`data ${data}
  predict y
  folds five`,
    line: 3,
    column: 9,
    message: /expected a number of folds, .*, but found "five"/,
  },
  "misspelt fold option": {
    make: () =>
      curbPlan`data ${data}
  folds 5 sed 3`,
    line: 2,
    column: 11,
    message:
      /expected "seed", "repeats", "grouped" or the end of the line, but found "sed"\. Did you mean "seed"\?/,
    suggestion: "seed",
  },
  "number glued to letters": {
    make: () =>
      curbPlan`data ${data}
  folds 5x`,
    line: 2,
    column: 9,
    message: /expected a number, but found "5x"/,
  },
  "misspelt rule": {
    make: () =>
      curbPlan`data ${data}
  rule one-sd`,
    line: 2,
    column: 8,
    message: /expected a rule \("min" or "one-se"\), but found "one-sd"\. Did you mean "one-se"\?/,
    suggestion: "one-se",
  },
  "negative λ": {
    make: () =>
      curbPlan`data ${data}
  lambda 0.1, -1, 2`,
    line: 2,
    column: 10,
    message: /λ value 2 is -1, but every λ must be a finite number >= 0/,
  },
  "grid bounds reversed": {
    make: () =>
      curbPlan`data ${data}
  lambda 50 points from 10 to 1`,
    line: 2,
    column: 31,
    message: /the grid runs from 10 to 1, but the upper end must be larger/,
  },
  "unclosed quote": {
    make: () => curbPlan`data "kiln.csv`,
    line: 1,
    column: 6,
    message: /this quote is not closed/,
  },
  "leftover words": {
    make: () =>
      curbPlan`data ${data}
  intercept yes please`,
    line: 2,
    column: 17,
    message: /expected the end of the line, but found "please"/,
  },
  "misspelt scale": {
    make: () =>
      curbPlan`data ${data}
  scale standardised`,
    line: 2,
    column: 9,
    message: /Did you mean "standardized"\?/,
    suggestion: "standardized",
  },
  "wrong interpolated type for a term": {
    make: () =>
      curbPlan`data ${data}
  predict y
  terms column x, ${42}`,
    line: 3,
    column: 19,
    message: /expected a term in \$\{…\}, but it holds a number/,
  },
  "wrong interpolated array element for γ": {
    make: () =>
      curbPlan`data ${data}
  gamma ${[1, "two"]}`,
    line: 2,
    column: 9,
    message: /element 1 of the \$\{…\} array is a string/,
  },
  "statement said twice": {
    make: () =>
      curbPlan`data ${data}
  lambda 1
  lambda 2`,
    line: 3,
    column: 3,
    message: /"lambda" was already set on line 2/,
  },
  "shared-only statement inside a candidate": {
    make: () =>
      curbPlan`data ${data}
  predict y
  candidate a
    terms column x
    folds 5`,
    line: 5,
    column: 5,
    message: /"folds" cannot be set for one candidate.*above line 3/,
  },
  "a single candidate": {
    make: () =>
      curbPlan`data ${data}
  predict y
  candidate only one
    terms column x`,
    line: 3,
    column: 13,
    message: /only one candidate, but a comparison needs at least two/,
  },
  "repeated candidate name": {
    make: () =>
      curbPlan`data ${data}
  predict y
  terms column x
  candidate a
  candidate a`,
    line: 5,
    column: 13,
    message: /the candidate name "a" is already used on line 4/,
  },
  "missing predict line": {
    make: () =>
      curbPlan`data ${data}
  terms column x
  `,
    line: 3,
    column: 1,
    message: /the template has no "predict" line/,
  },
  "misspelt separator word": {
    make: () =>
      curbPlan`data "runs.txt" separated by semicolin
  predict y
  terms column x`,
    line: 1,
    column: 30,
    message: /expected a separator \("comma", "semicolon", "tab", "bar" or "space", or one/,
    suggestion: "semicolon",
  },
  "misspelt separated": {
    make: () =>
      curbPlan`data "runs.txt" seperated by tab
  predict y
  terms column x`,
    line: 1,
    column: 17,
    message: /expected "separated by …" or the end of the line, but found "seperated"/,
    suggestion: "separated",
  },
  "a separator of two characters": {
    make: () =>
      curbPlan`data "runs.txt" separated by ";;"
  predict y
  terms column x`,
    line: 1,
    column: 30,
    message: /the separator is ";;", but it is 2 characters long; a separator is exactly one/,
  },
  "a separator after data in memory": {
    make: () =>
      curbPlan`data ${data} separated by tab
  predict y
  terms column x`,
    line: 1,
    column: 11,
    message: /a table, rows or columns in memory have no field separator/,
  },
  "bad domain, reported by the term at its place": {
    make: () =>
      curbPlan`data ${data}
  predict y
  terms legendre x degree 3 over 5 to 1`,
    line: 3,
    column: 9,
    message: /domain must be \[lo, hi\] with finite lo < hi/,
    code: "BAD_OPTION",
  },
};

for (const [name, bad] of Object.entries(BAD)) {
  Deno.test(`error: ${name}`, () => {
    let caught: unknown;
    try {
      bad.make();
    } catch (e) {
      caught = e;
    }
    assert.ok(caught instanceof MagicError, `expected a MagicError, got ${caught}`);
    assert.ok(caught instanceof CurbfitError);
    assert.equal(caught.code, bad.code ?? "MAGIC_SYNTAX");
    assert.equal(caught.line, bad.line, caught.message);
    assert.equal(caught.column, bad.column, caught.message);
    assert.match(caught.message, bad.message);
    assert.ok(
      caught.message.startsWith(`curb template, line ${bad.line}, column ${bad.column}: `),
      caught.message,
    );
    assert.equal(caught.suggestion, bad.suggestion);
    const [, excerptLine, caretLine] = caught.message.split("\n").slice(-3);
    assert.ok(excerptLine.startsWith(`  ${bad.line} | `), caught.message);
    const caretAt = caretLine.indexOf("^") - caretLine.indexOf("|") - 2;
    assert.equal(caretAt + 1, bad.column, `caret under column ${bad.column}:\n${caught.message}`);
  });
}

Deno.test("an unknown column rejects with its line, column and the nearest column name", async () => {
  await assert.rejects(
    () =>
      curbPlan`data ${data}
  predict y
  terms legendre xx degree 3`.run({ progress: null }),
    (e: unknown) => {
      assert.ok(e instanceof MagicError);
      assert.equal(e.code, "UNKNOWN_COLUMN");
      assert.equal(e.line, 3);
      assert.equal(e.column, 18);
      assert.equal(e.suggestion, "x");
      assert.match(e.message, /the data has no column "xx"\. Did you mean "x"\?/);
      return true;
    },
  );
});

Deno.test("curb returns exactly what sweep returns for the same arguments", async () => {
  const result = await curb`
    data ${data}
    predict y
    terms legendre x degree 8, column z1
    gamma rising 2
    lambda 25 points
    folds 5 seed 11
    rule one-se
  ` as SweepResult;
  const direct = sweep(data, {
    target: "y",
    terms: [legendre("x", 8), column("z1")],
    penalty: ridge({ weights: "rising", exponent: 2 }),
    lambdas: { count: 25 },
    folds: { k: 5, seed: 11 },
    rule: "one-se",
  });
  assert.deepEqual(numbers(result), numbers(direct));
  assert.ok(Object.isFrozen(result), "the API's frozen result, not a wrapper");
});

/** Runs printed API code in a module of its own; its free names become parameters. */
async function evaluate(call: ApiCall, args: Record<string, unknown>): Promise<unknown> {
  const [importLine, ...body] = call.code.split("\n");
  assert.match(importLine, /^import \{ [a-zA-Z, ]+ \} from "curbfit";$/);
  const source = [
    importLine.replace('"curbfit"', JSON.stringify(MOD_URL)),
    `export async function run(${call.freeNames.join(", ")}) {`,
    ...body,
    "  return result;",
    "}",
  ].join("\n");
  const dir = await Deno.makeTempDir({ prefix: "curbfit-call-" });
  try {
    const path = `${dir}/call.js`;
    await Deno.writeTextFile(path, source);
    const module = await import(new URL(`file://${path}`).href);
    return await module.run(...call.freeNames.map((name) => args[name]));
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

Deno.test("round trip: running the printed sweep call gives identical numbers", async () => {
  const result = await curb`
    data ${data}
    predict y
    terms legendre x degree 7 over -3 to 5, column z1 times indicators site, power z2 degree 2
    gamma ${[1, 2, 3, 4, 5, 6, 7, 1, 1, 1, 1]}
    lambda 0, 1e-4, 0.003, 0.1, 2.5, 40
    folds 6 seed 20240611 repeats 2
    rule one-se
    closed-form yes
  ` as SweepResult;
  const call = equivalentCall(result);
  assert.deepEqual(call.freeNames, ["data"]);
  const again = await evaluate(call, { data }) as SweepResult;
  assert.deepEqual(numbers(again), numbers(result));
  const display = (call as unknown as Record<symbol, () => Record<string, string>>)[
    Symbol.for("Jupyter.display")
  ]();
  assert.match(display["text/markdown"], /^```ts\nimport \{/);
  assert.ok(!display["text/html"].includes("<script"));
});

Deno.test("round trip: the printed compare call, with an interpolated fold plan", async () => {
  const plan = kFoldPlan(90, { k: 5, seed: 4 });
  const result = await curb`
    data ${data}
    predict y
    folds ${plan}
    lambda 15 points from 1e-3 to 1e3
    candidate straight
      terms column x, column z1, column z2
      lambda 0
    candidate curved
      terms legendre x degree 9, column z1, column z2
      gamma rising 2
      rule one-se
  ` as ComparisonResult;
  const call = equivalentCall(result);
  assert.deepEqual(call.freeNames, ["data", "plan"]);
  assert.match(call.code, /compare\(data, \[/);
  const again = await evaluate(call, { data, plan }) as ComparisonResult;
  assert.equal(again.best, result.best);
  assert.deepEqual(again.verdict, result.verdict);
  result.candidates.forEach((c, i) => {
    assert.deepEqual(numbers(again.candidates[i].sweep), numbers(c.sweep));
  });
  const direct = compare(data, [
    { name: "straight", terms: [column("x"), column("z1"), column("z2")], lambdas: [0] },
    {
      name: "curved",
      terms: [legendre("x", 9), column("z1"), column("z2")],
      penalty: ridge({ weights: "rising", exponent: 2 }),
      lambdas: { count: 15, min: 1e-3, max: 1e3 },
      rule: "one-se",
    },
  ], { target: "y", folds: plan });
  assert.deepEqual(direct.verdict, result.verdict);
});

Deno.test("a CSV path is read with readCsv, and the printed call reads it too", async () => {
  const dir = await Deno.makeTempDir({ prefix: "curbfit-csv-" });
  try {
    const path = `${dir}/runs.csv`;
    const lines = ["x,y", ...cols.x.map((x, i) => `${x},${cols.y[i]}`)];
    await Deno.writeTextFile(path, lines.join("\n") + "\n");
    const p = curbPlan`
      data ${path}
      predict y
      terms legendre x degree 5
      folds 3 seed 8
    `;
    const result = await p.run({ progress: null }) as SweepResult;
    assert.match(p.call.code, /const data = await readCsv\(".*runs\.csv"\);/);
    assert.deepEqual(p.call.freeNames, []);
    const again = await evaluate(p.call, {}) as SweepResult;
    assert.deepEqual(numbers(again), numbers(result));
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("curb shows progress through the sink and leaves the result in its place", async () => {
  const shown: { bundle: Record<string, unknown>; id: string; update: boolean }[] = [];
  const result = await curbPlan`
    data ${data}
    predict y
    terms legendre x degree 4
    folds 3 seed 2
  `.run({
    progress: (bundle, o) => {
      shown.push({ bundle: { ...bundle }, id: o.display_id, update: o.update });
      return Promise.resolve();
    },
  }) as SweepResult;
  assert.ok(shown.length >= 2);
  assert.equal(shown[0].update, false, "first shown");
  assert.match(
    String(shown[0].bundle["text/plain"]),
    /^curbfit: sweeping λ on 90 rows with 3 folds/,
  );
  assert.ok(shown.slice(1).every((s) => s.update && s.id === shown[0].id), "then updated in place");
  const last = shown[shown.length - 1].bundle;
  const own = (result as unknown as Record<symbol, unknown>)[Symbol.for("Jupyter.display")];
  if (typeof own === "function") {
    assert.deepEqual(last, await own.call(result), "the result's own display replaces progress");
  } else {
    assert.equal(
      last["text/plain"],
      `chosen λ = ${result.chosen.strength.toPrecision(4)} (rule min), CV error ` +
        `${result.curve[result.chosen.index].cvMean.toPrecision(4)} ± ` +
        `${result.curve[result.chosen.index].cvSe.toPrecision(2)}`,
      "a plain summary replaces progress while results have no display of their own",
    );
  }
});

Deno.test("equivalentCall refuses a result that did not come from curb", () => {
  const s = sweep(data, { target: "y", terms: [column("x")], folds: { k: 3, seed: 1 } });
  assert.throws(() => equivalentCall(s), (e: unknown) => {
    assert.ok(e instanceof CurbfitError);
    assert.equal(e.code, "BAD_OPTION");
    return true;
  });
});

Deno.test("sparse penalties: penalty lasso / elastic-net mix ρ and alpha lines run the API's sweep", async () => {
  const result = await curb`
    data ${data}
    predict y
    terms legendre x degree 6, column z1, column z2
    penalty elastic-net mix 0.3
    alpha 20 points ratio 1e-3
    folds 5 seed 11
    rule one-se
  ` as SweepResult;
  const direct = sweep(data, {
    target: "y",
    terms: [legendre("x", 6), column("z1"), column("z2")],
    penalty: elasticNet({ mix: 0.3 }),
    alphas: { count: 20, ratio: 1e-3 },
    folds: { k: 5, seed: 11 },
    rule: "one-se",
  });
  assert.equal(result.scale, "alpha");
  assert.deepEqual(numbers(result), numbers(direct));
  const call = equivalentCall(result);
  assert.match(call.code, /elasticNet\(\{ mix: 0\.3 \}\)/);
  assert.match(call.code, /alphas: \{ count: 20, ratio: 0\.001 \}/);
  const again = await evaluate(call, { data }) as SweepResult;
  assert.deepEqual(numbers(again), numbers(result));
  const lassoPlan = curbPlan`
    data ${data}
    predict y
    terms column z1, column z2
    penalty lasso
    α 0.001, 0.01, 0.1
  `;
  assert.match(lassoPlan.call.code, /penalty: lasso\(\)/);
  assert.match(lassoPlan.call.code, /alphas: \[0\.001, 0\.01, 0\.1\]/);
});

Deno.test("sparse penalties: λ with lasso, α with ridge, bad weights, a bad mix — errors at their line", () => {
  const cases: [string, RegExp, () => unknown][] = [
    ["lasso with lambda", /line 6.*a λ grid and a lasso penalty/s, () =>
      curbPlan`
    data ${data}
    predict y
    terms column z1
    penalty lasso
    lambda 0.1, 1
  `],
    [
      "lasso with all-zero weights",
      /line 5, column 11.*every weight of the lasso penalty is 0.*\^\^\^\^/s,
      () =>
        curbPlan`
    data ${data}
    predict y
    terms column z1, column z2
    gamma 0, 0
    penalty lasso
  `,
    ],
    [
      "ridge with a zero weight",
      /line 5, column 11.*weight 1 is 0, but every weight must be a finite number > 0/s,
      () =>
        curbPlan`
    data ${data}
    predict y
    terms column z1, column z2
    gamma 0, 1
  `,
    ],
    ["alpha with lambda", /line 6.*α grid and a λ grid/s, () =>
      curbPlan`
    data ${data}
    predict y
    terms column z1
    lambda 0.1, 1
    alpha 0.1
  `],
    ["mix out of range", /line 4.*mix is 1\.5/s, () =>
      curbPlan`
    data ${data}
    predict y
    penalty elastic-net mix 1.5
    terms column z1
  `],
    ["a misspelt penalty", /Did you mean "lasso"/, () =>
      curbPlan`
    data ${data}
    predict y
    penalty laso
    terms column z1
  `],
  ];
  for (const [what, message, run] of cases) {
    assert.throws(run, (e: unknown) => {
      assert.ok(e instanceof MagicError, what);
      assert.match((e as Error).message, message, what);
      return true;
    });
  }
});

Deno.test("data line: a CSV path names its separator; it runs, prints readCsv with it and round-trips", async () => {
  const forms: [string, ReturnType<typeof curbPlan>, string, number][] = [
    [
      "word",
      curbPlan`data "runs.txt" separated by semicolon
        predict y
        terms column x`,
      ";",
      30,
    ],
    [
      "plural",
      curbPlan`data "runs.txt" separated by tabs
        predict y
        terms column x`,
      "\t",
      30,
    ],
    [
      "quoted",
      curbPlan`data "runs.txt" separated by "^"
        predict y
        terms column x`,
      "^",
      30,
    ],
    [
      "interpolated",
      curbPlan`data "runs.txt" separated by ${"|"}
        predict y
        terms column x`,
      "|",
      30,
    ],
  ];
  for (const [form, plan, char, column] of forms) {
    const node = plan.program.data;
    assert.equal(node.kind, "file", form);
    if (node.kind !== "file") continue;
    assert.equal(node.fieldSeparator?.value, char, form);
    assert.equal(node.fieldSeparator?.spot.column, column, form);
    assert.ok(
      plan.call.code.includes(`readCsv("runs.txt", { fieldSeparator: ${JSON.stringify(char)} })`),
      plan.call.code,
    );
  }
  const plain = curbPlan`data "runs.txt"
    predict y
    terms column x`;
  assert.equal("fieldSeparator" in plain.program.data, false, "no separator named: none kept");
  assert.match(plain.call.code, /readCsv\("runs\.txt"\);/);

  const dir = await Deno.makeTempDir({ prefix: "curbfit-sep-" });
  try {
    const names = ["x", "z1", "y"];
    const rows = cols.x.map((_, i) => names.map((n) => String(cols[n][i])));
    const direct = sweep(cols, {
      target: "y",
      terms: [legendre("x", 5)],
      folds: { k: 3, seed: 8 },
    });
    // The word form for semicolons; an interpolated character for tabs.
    const plans: [string, string, (path: string) => ReturnType<typeof curbPlan>][] = [
      ["semicolon", ";", (path) =>
        curbPlan`
        data ${path} separated by semicolon
        predict y
        terms legendre x degree 5
        folds 3 seed 8
      `],
      ["tab", "\t", (path) =>
        curbPlan`
        data ${path} separated by ${"\t"}
        predict y
        terms legendre x degree 5
        folds 3 seed 8
      `],
    ];
    for (const [word, char, plan] of plans) {
      const path = `${dir}/runs_${word}.txt`;
      await Deno.writeTextFile(path, [names, ...rows].map((r) => r.join(char)).join("\n") + "\n");
      const p = plan(path);
      const result = await p.run({ progress: null }) as SweepResult;
      assert.deepEqual(numbers(result), numbers(direct), `${word}: the same rows, the same sweep`);
      assert.deepEqual(p.call.freeNames, []);
      assert.ok(p.call.code.includes(`{ fieldSeparator: ${JSON.stringify(char)} }`), p.call.code);
      const again = await evaluate(p.call, {}) as SweepResult;
      assert.deepEqual(numbers(again), numbers(result), `${word}: the printed call, same numbers`);
      assert.equal(JSON.parse(recordJson(result)).data.fieldSeparator, char, "kept in the record");
      // Without the separator the file stops at its header line, reported at the data line.
      await assert.rejects(
        () =>
          curbPlan`
        data ${path}
        predict y
        terms legendre x degree 5`.run({ progress: null }),
        (e: unknown) => {
          assert.ok(e instanceof MagicError, String(e));
          assert.equal(e.code, "BAD_OPTION");
          assert.equal(e.line, 2);
          assert.equal(e.column, 14);
          assert.match(e.message, /line 1: the header line is one column name/);
          assert.match(e.message, /Name the separator on the data line after the path/);
          assert.doesNotMatch(e.message, /option fieldSeparator/);
          return true;
        },
      );
      // A wrong separator named: the same error, at the separator word.
      await assert.rejects(
        () =>
          curbPlan`
        data ${path} separated by bar
        predict y
        terms legendre x degree 5`.run({ progress: null }),
        (e: unknown) => {
          assert.ok(e instanceof MagicError, String(e));
          assert.equal(e.code, "BAD_OPTION");
          assert.deepEqual([e.line, e.column], [2, 32]);
          assert.match(e.message, /read as separated by vertical bars\. Correct the separator/);
          return true;
        },
      );
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("gamma serves lasso and elastic net too: the API's weighted sweep, and the printed call round-trips", async () => {
  const result = await curb`
    data ${data}
    predict y
    terms legendre x degree 6, column z1, column z2
    penalty elastic-net mix 0.3
    gamma rising 2
    alpha 20 points ratio 1e-3
    folds 5 seed 11
  ` as SweepResult;
  const direct = sweep(data, {
    target: "y",
    terms: [legendre("x", 6), column("z1"), column("z2")],
    penalty: elasticNet({ mix: 0.3, weights: "rising", exponent: 2 }),
    alphas: { count: 20, ratio: 1e-3 },
    folds: { k: 5, seed: 11 },
  });
  assert.deepEqual(numbers(result), numbers(direct));
  assert.deepEqual(result.gamma, [1, 4, 9, 16, 25, 36, 1, 1]);
  const call = equivalentCall(result);
  assert.match(call.code, /elasticNet\(\{ mix: 0\.3, weights: "rising", exponent: 2 \}\)/);
  const again = await evaluate(call, { data }) as SweepResult;
  assert.deepEqual(numbers(again), numbers(result));
  const listed = curbPlan`
    data ${data}
    predict y
    terms column z1, column z2
    γ 0, 1
    penalty lasso
    α 0.001, 0.01
  `;
  assert.match(listed.call.code, /penalty: lasso\(\{ weights: \[0, 1\] \}\)/);
  const ran = await listed.run({ progress: null }) as SweepResult;
  assert.ok(ran.curve.every((c) => c.path[0] !== 0), "the 0-weight column is in at every α");
  const back = await evaluate(listed.call, { data }) as SweepResult;
  assert.deepEqual(numbers(back), numbers(ran));
});

Deno.test("a candidate's penalty line keeps the shared gamma line, and its gamma line the shared penalty", () => {
  const plan = curbPlan`
    data ${data}
    predict y
    terms legendre x degree 4
    penalty lasso
    gamma rising 2
    alpha 10 points
    candidate shared both
    candidate own penalty
      penalty elastic-net mix 0.5
    candidate own gamma
      gamma 0, 1, 1, 1
  `;
  assert.equal(plan.job.kind, "compare");
  if (plan.job.kind !== "compare") return;
  const [both, ownPenalty, ownGamma] = plan.job.candidates;
  assert.deepEqual(both.penalty, lasso({ weights: "rising", exponent: 2 }));
  assert.deepEqual(ownPenalty.penalty, elasticNet({ mix: 0.5, weights: "rising", exponent: 2 }));
  assert.deepEqual(ownGamma.penalty, lasso({ weights: [0, 1, 1, 1] }));
  assert.match(plan.call.code, /lasso\(\{ weights: \[0, 1, 1, 1\] \}\)/);
});
