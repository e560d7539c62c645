/**
 * Lasso and elastic net through the front doors (fit, sweep, compare, display, charts):
 * - the sparse sweep against brute force: every fold's design rebuilt from its training rows
 *   (terms and standardization learned there), solved by `sparsePathFromRows` at the same α
 *   values, held-out MSE computed from the held-out rows; agreement to 1e-8 relative;
 * - the final model satisfies the lasso / elastic-net optimality (KKT) conditions, recomputed
 *   here from the rows (Friedman, Hastie & Tibshirani 2010, J. Stat. Softw. 33, eq. 5);
 * - the one-SE rule picks the largest α within one SE of the minimum (Hastie, Tibshirani &
 *   Friedman, Elements of Statistical Learning 2nd ed., §7.10);
 * - ridge and lasso candidates compared on identical folds, with paired per-fold differences;
 * - the two strength conventions cannot be mixed up: λ options with a sparse penalty and α
 *   options with ridge are errors naming the option;
 * - the reported df: the nonzero count for the lasso (Zou, Hastie & Tibshirani 2007, Ann.
 *   Statist. 35), tr[Z_A (Z_AᵀZ_A + N·α·(1 − ρ)·I)⁻¹ Z_Aᵀ] for the elastic net (Zou & Hastie
 *   2005, J. R. Statist. Soc. B 67, recalled from memory; test/sparse_test.ts checks the value
 *   against rows) in the fit, the curve, the residual SD and a model loaded back from its record.
 * Data: seeded synthetic columns (invented, test/helpers.ts).
 */
import assert from "node:assert/strict";
import {
  column,
  compare,
  CurbfitError,
  elasticNet,
  fit,
  foldRowsOf,
  lasso,
  legendre,
  ridge,
  sweep,
  sweepAsync,
  tableFromColumns,
} from "./sweep_imports.ts";
import { buildDesign, learnTerms } from "../lib/design/mod.ts";
import { sparsePathFromRows, type SparsePenalty } from "../lib/sparse/mod.ts";
import {
  comparisonChart,
  fittedCurveChart,
  loadRecord,
  recordJson,
  shrinkagePathChart,
  validationCurveChart,
} from "../mod.ts";
import { assertValidVegaLite } from "./vl_assert.ts";
import { relErr, subsetColumns, syntheticColumns } from "./helpers.ts";

const COLS = syntheticColumns(41, 90, 3);
const TERMS = [legendre("x", 6), column("z1"), column("z2"), column("z3")];
const ALPHAS = [0.003, 0.01, 0.03, 0.1, 0.3];
const TIGHT = 1e-12;

/** Held-out MSE per fold and α, from rows: fold terms, fold design, sparsePathFromRows. */
function bruteForce(
  penalty: SparsePenalty,
  k: number,
  seed: number,
  read: { standardize?: boolean; intercept?: boolean } = {},
): number[][] {
  const table = tableFromColumns(COLS);
  const s = sweep(table, {
    target: "y",
    terms: TERMS,
    penalty,
    alphas: ALPHAS,
    folds: { k, seed },
    tolerance: TIGHT,
    ...read,
  });
  const y = (table.columns.get("y") as { values: Float64Array }).values;
  const perFold: number[][] = [];
  for (let f = 0; f < k; f++) {
    const { training, validation } = foldRowsOf(s.folds, 0, f);
    const terms = learnTerms(TERMS, table, training);
    const train = buildDesign(terms, subsetColumns(COLS, training));
    const held = buildDesign(terms, subsetColumns(COLS, validation));
    const path = sparsePathFromRows(
      train.block.hi,
      train.p,
      Float64Array.from(training, (i) => y[i]),
      penalty,
      { alphas: ALPHAS, tolerance: TIGHT, ...read },
    );
    // path.solutions run in decreasing α; the curve in increasing α.
    perFold.push(
      [...path.solutions].reverse().map((sol) => {
        let sse = 0;
        Array.from(validation).forEach((row, i) => {
          let fitted = sol.intercept;
          for (let q = 0; q < held.p; q++) {
            fitted += held.block.hi[i * held.p + q] * sol.coefficients[q];
          }
          sse += (y[row] - fitted) ** 2;
        });
        return sse / validation.length;
      }),
    );
  }
  s.curve.forEach((point, l) => {
    assert.equal(point.strength, ALPHAS[l]);
    point.foldMse.forEach((mse, f) => {
      assert.ok(
        relErr(mse, perFold[f][l]) < 1e-8,
        `fold ${f + 1} α ${ALPHAS[l]}: ${mse} vs ${perFold[f][l]}`,
      );
    });
  });
  return perFold;
}

Deno.test("sparse sweep equals brute force per fold (lasso and elastic net) to 1e-8", () => {
  bruteForce(lasso(), 5, 11);
  bruteForce(elasticNet({ mix: 0.4 }), 4, 12);
  bruteForce(lasso(), 5, 13, { standardize: false });
  bruteForce(elasticNet({ mix: 0.7 }), 3, 14, { intercept: false });
});

Deno.test("sweepAsync gives the sparse sweep's numbers exactly", async () => {
  const spec = {
    target: "y",
    terms: TERMS,
    penalty: lasso(),
    alphas: { count: 15 },
    folds: { k: 4, seed: 8 },
  };
  const a = sweep(COLS, spec);
  const b = await sweepAsync(COLS, spec);
  assert.deepEqual(b.curve, a.curve);
  assert.deepEqual(b.chosen, a.chosen);
  assert.deepEqual(b.fit.summary, a.fit.summary);
});

/** Largest scaled KKT violation of a fit's solution, recomputed from all rows. */
function kktFromRows(m: ReturnType<typeof fit>, mix: number): number {
  const table = tableFromColumns(COLS);
  const design = buildDesign(m.terms, table);
  const s = m.summary;
  const y = (table.columns.get("y") as { values: Float64Array }).values;
  const n = y.length, p = design.p;
  const r = Float64Array.from(y, (v, i) => {
    let fitted = s.intercept;
    for (let q = 0; q < p; q++) fitted += design.block.hi[i * p + q] * s.coefficients[q];
    return v - fitted;
  });
  const ybar = y.reduce((t, v) => t + v, 0) / n;
  const vy = y.reduce((t, v) => t + (v - ybar) ** 2, 0) / n;
  const a = s.strength * mix, beta = s.strength * (1 - mix);
  let worst = 0;
  for (let q = 0; q < p; q++) {
    let g = 0;
    for (let i = 0; i < n; i++) g += ((design.block.hi[i * p + q] - s.means[q]) / s.sds[q]) * r[i];
    g /= n;
    const w = s.standardized.coefficients[q];
    const raw = w === 0 ? Math.max(Math.abs(g) - a, 0) : Math.abs(g - beta * w - Math.sign(w) * a);
    worst = Math.max(worst, raw / Math.sqrt(vy));
  }
  return worst;
}

Deno.test("the final model of a sparse sweep is the all-rows solution at the chosen α; KKT holds", () => {
  for (const [penalty, mix] of [[lasso(), 1], [elasticNet({ mix: 0.5 }), 0.5]] as const) {
    const s = sweep(COLS, {
      target: "y",
      terms: TERMS,
      penalty,
      alphas: { count: 25 },
      folds: { k: 5, seed: 3 },
      rule: "one-se",
    });
    assert.equal(s.scale, "alpha");
    const f = s.fit.summary;
    assert.equal(f.scale, "alpha");
    assert.equal(f.strength, s.chosen.strength);
    assert.match(f.objective, /1\/\(2N\)/);
    assert.ok(f.descent !== null && f.descent.converged);
    assert.ok(kktFromRows(s.fit, mix) < 1e-6, `KKT ${kktFromRows(s.fit, mix)}`);
    assert.deepEqual([...s.curve[s.chosen.index].path], [...f.standardized.coefficients]);
    assert.equal(f.nonzero, s.curve[s.chosen.index].nonzero);
    assert.ok(s.curve.every((c) => c.gcv === null && c.loo === null), "GCV/LOO are ridge-only");
    // One-SE: the largest α whose mean is within one SE of the minimum.
    const min = s.curve[s.minimum.index];
    const within = s.curve.filter((c) => c.cvMean <= min.cvMean + min.cvSe);
    assert.equal(s.chosen.strength, Math.max(...within.map((c) => c.strength)));
    // Ascending α, nonzero counts fall (weakly) as α grows on the all-rows path of the lasso.
    assert.ok(s.curve.every((c, i) => i === 0 || c.strength > s.curve[i - 1].strength));
    if (mix === 1) assert.ok(s.curve.at(-1)!.nonzero === 0, "α_max: every coefficient zero");
    // fit() at the chosen α gives the same model, and predicts with it.
    const direct = fit(COLS, { target: "y", terms: TERMS, penalty, alpha: s.chosen.strength });
    const diff = Math.max(
      ...direct.summary.coefficients.map((w, q) => Math.abs(w - f.coefficients[q])),
    );
    assert.ok(diff < 1e-5, `coefficients differ by ${diff}`);
    const pred = direct.predict({ x: [0.5], z1: [1], z2: [0], z3: [-1] }).values[0];
    const rows = buildDesign(
      direct.terms,
      tableFromColumns({ x: [0.5], z1: [1], z2: [0], z3: [-1] }),
    );
    const byHand = direct.summary.coefficients.reduce(
      (t, w, q) => t + w * rows.block.hi[q],
      direct.summary.intercept,
    );
    assert.ok(Math.abs(pred - byHand) < 1e-12);
  }
});

Deno.test("λ and α options cannot be mixed up: each wrong pairing names the option", () => {
  const cases: [string, () => unknown][] = [
    ["lambda", () => fit(COLS, { target: "y", terms: TERMS, penalty: lasso(), lambda: 1 })],
    ["budget", () => fit(COLS, { target: "y", terms: TERMS, penalty: elasticNet(), budget: 1 })],
    ["alpha", () => fit(COLS, { target: "y", terms: TERMS, alpha: 0.1 })],
    ["alpha", () => fit(COLS, { target: "y", terms: TERMS, penalty: lasso() })],
    ["alphas", () => sweep(COLS, { target: "y", terms: TERMS, penalty: ridge(), alphas: [1] })],
    [
      "lambdas",
      () => sweep(COLS, { target: "y", terms: TERMS, penalty: lasso(), lambdas: [1] }),
    ],
    [
      "closedForm",
      () => sweep(COLS, { target: "y", terms: TERMS, penalty: lasso(), closedForm: true }),
    ],
  ];
  for (const [option, run] of cases) {
    assert.throws(run, (e: unknown) => {
      assert.ok(e instanceof CurbfitError);
      assert.equal(e.code, "BAD_OPTION");
      assert.equal(e.place.option, option);
      return true;
    });
  }
});

Deno.test("compare: ridge and lasso on the same folds, paired per fold, each with its own symbol", async () => {
  const c = compare(COLS, [
    { name: "ridge", terms: TERMS, lambdas: { count: 20 } },
    { name: "lasso", terms: TERMS, penalty: lasso(), alphas: { count: 20 } },
  ], { target: "y", folds: { k: 5, seed: 9 } });
  const [r, l] = c.candidates;
  assert.equal(r.sweep.scale, "lambda");
  assert.equal(l.sweep.scale, "alpha");
  assert.deepEqual(r.sweep.folds.assignment, l.sweep.folds.assignment);
  const other = c.best === "ridge" ? l : r;
  const best = c.best === "ridge" ? r : l;
  const d = other.foldMse.map((v, f) => v - best.foldMse[f]);
  const mean = d.reduce((t, v) => t + v, 0) / d.length;
  assert.ok(Math.abs(other.versusBest!.mean - mean) < 1e-15);
  assert.match(c.verdict[0], /at λ = /);
  assert.match(c.verdict[1], /at α = /);
  const spec = comparisonChart(c) as { vconcat: unknown[] };
  await assertValidVegaLite(spec);
  assert.equal(spec.vconcat.length, 4, "errors, differences, and one curves panel per scale");
  const text = (await (c as unknown as Record<symbol, () => Promise<Record<string, string>>>)
    [Symbol.for("Jupyter.display")]())["text/plain"];
  assert.match(text, /chosen λ or α/);
});

Deno.test("charts of a sparse sweep: α on the axes, nonzero counts on top, entry dots; valid Vega-Lite", async () => {
  const s = sweep(COLS, {
    target: "y",
    terms: TERMS,
    penalty: lasso(),
    folds: { k: 5, seed: 3 },
    alphas: { count: 30 },
  });
  const validation = validationCurveChart(s);
  await assertValidVegaLite(validation);
  const json = JSON.stringify(validation);
  assert.match(json, /Chosen α = /);
  assert.match(json, /nonzero coefficients of 9/);
  assert.doesNotMatch(json, /λ/, "no λ anywhere on a sparse chart");
  const path = shrinkagePathChart(s);
  await assertValidVegaLite(path);
  const pathJson = JSON.stringify(path);
  const title = path.title as { text: string[]; subtitle: string[] };
  assert.match(title.text.join(" "), /keeps \d+ of 9 coefficients in the model/);
  assert.match(title.subtitle.join(" "), /coefficients enter the model/);
  const dots = (path as unknown as { vconcat: { layer: { mark: { type: string } }[] }[] })
    .vconcat[0].layer.filter((l) => l.mark.type === "point");
  assert.equal(dots.length, 1, "one layer of entry dots");
  assert.doesNotMatch(pathJson, /λ/);
  const text = (await (s as unknown as Record<symbol, () => Promise<Record<string, string>>>)
    [Symbol.for("Jupyter.display")]())["text/plain"];
  assert.match(text, /no exact refit/);
  assert.match(text, /α = /);
  const shown = (await (s.fit as unknown as Record<symbol, () => Promise<Record<string, string>>>)
    [Symbol.for("Jupyter.display")]())["text/plain"];
  assert.match(shown, /Objective: minimize \(1\/\(2N\)\)/);
});

Deno.test("fitted curve of a one-input lasso sweep: curves at three α, each an all-rows sparse fit", async () => {
  const one = { x: COLS.x, y: COLS.y };
  const s = sweep(one, {
    target: "y",
    terms: [legendre("x", 8)],
    penalty: lasso(),
    alphas: { count: 20 },
    folds: { k: 5, seed: 4 },
    rule: "one-se",
  });
  const spec = fittedCurveChart(s, one);
  await assertValidVegaLite(spec);
  const json = JSON.stringify(spec);
  assert.match(json, /chosen α = /);
  const sub = (spec.title as { subtitle: string[] }).subtitle.join(" ");
  assert.match(sub, /all-rows coordinate-descent fits at three α/);
  assert.doesNotMatch(json, /λ/);
});

Deno.test("sparse df in fit, curve, residual SD and a loaded record: the count for the lasso, the shrunken trace for the elastic net", () => {
  const table = tableFromColumns(COLS);
  const y = (table.columns.get("y") as { values: Float64Array }).values;
  for (const penalty of [lasso(), elasticNet({ mix: 0.3 })]) {
    const s = sweep(COLS, {
      target: "y",
      terms: TERMS,
      penalty,
      alphas: ALPHAS,
      folds: { k: 5, seed: 6 },
      tolerance: TIGHT,
    });
    // the all-rows path solved again from the rows of the design: same df per α
    const design = buildDesign(s.fit.terms, table);
    const path = sparsePathFromRows(design.block.hi, design.p, y, penalty, {
      alphas: ALPHAS,
      tolerance: TIGHT,
    });
    const fromRows = [...path.solutions].reverse();
    s.curve.forEach((c, l) => {
      const sol = fromRows[l];
      assert.equal(c.nonzero, sol.nonzero);
      if (penalty.kind === "lasso") assert.equal(c.df, c.nonzero);
      else assert.ok(c.nonzero === 0 ? c.df === 0 : c.df < c.nonzero, `α ${c.strength}: ${c.df}`);
      assert.ok(relErr(c.df, sol.df as number) < 1e-9, `α ${c.strength}`); // measured: equal
    });
    const f = s.fit.summary;
    const chosen = s.curve[s.chosen.index];
    assert.equal(f.df, chosen.df);
    assert.equal(f.nonzero, chosen.nonzero);
    // residual SD = √(RSS / (n − intercept − df)) with the same df (FitSummary's convention)
    const rsd = Math.sqrt((f.trainMse * f.n) / (f.n - 1 - f.df));
    assert.ok(relErr(f.residualSd, rsd) < 1e-15, `${f.residualSd} vs ${rsd}`);
    // fit() at the chosen α reports the same df
    const direct = fit(COLS, { target: "y", terms: TERMS, penalty, alpha: s.chosen.strength });
    assert.ok(relErr(direct.summary.df, f.df) < 1e-6); // measured: equal
    // a model loaded back from its record: the count exactly for the lasso; for the elastic net
    // recovered from residualSd, trainMse and n (a few rounding errors of n − 1 − df ≈ 80;
    // measured 3.6e-15)
    const loaded = loadRecord(recordJson(s)).fit.summary;
    if (penalty.kind === "lasso") assert.equal(loaded.df, f.df);
    else assert.ok(Math.abs(loaded.df - f.df) < 1e-12, `${loaded.df} vs ${f.df}`);
    assert.equal(loaded.nonzero, f.nonzero);
  }
});
