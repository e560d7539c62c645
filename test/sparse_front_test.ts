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
import { penaltyWeights } from "../lib/fit/penalty.ts";
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
      // γ resolved per design column from the fold design's orders, as the sweep resolves it
      { alphas: ALPHAS, tolerance: TIGHT, gamma: penaltyWeights(penalty, train.orders), ...read },
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

Deno.test("weighted sparse sweeps equal brute force per fold to 1e-8 (rising weights; a 0 weight)", () => {
  bruteForce(lasso({ weights: "rising", exponent: 1.5 }), 5, 15);
  bruteForce(elasticNet({ mix: 0.5, weights: [0, 1, 1, 2, 2, 3, 0.5, 1, 1] }), 4, 16);
  bruteForce(lasso({ weights: [1, 1, 1, 1, 1, 1, 0, 0.5, 2] }), 5, 17, { standardize: false });
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
  let worst = 0;
  for (let q = 0; q < p; q++) {
    // weighted: |g_q| ≤ αργ_q at w_q = 0, g_q = α(1 − ρ)γ_q w_q + αργ_q sign(w_q) otherwise
    const a = s.strength * mix * s.gamma[q], beta = s.strength * (1 - mix) * s.gamma[q];
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

// ---- per-column weights γ_q (ridge's option, for the sparse penalties) --------------------------

Deno.test("weights 'rising' resolve per design column from the polynomial orders, as for ridge", () => {
  const spec = { target: "y", terms: TERMS, folds: { k: 5, seed: 7 } };
  const ridgeSweep = sweep(COLS, {
    ...spec,
    penalty: ridge({ weights: "rising", exponent: 2 }),
    lambdas: { count: 5 },
  });
  const sparseSweep = sweep(COLS, {
    ...spec,
    penalty: lasso({ weights: "rising", exponent: 2 }),
    alphas: { count: 20 },
  });
  // Legendre P1…P6 have orders 1…6, plain columns order 1: γ_q = order_q² (common practice)
  assert.deepEqual(sparseSweep.gamma, [1, 4, 9, 16, 25, 36, 1, 1, 1]);
  assert.deepEqual(sparseSweep.gamma, ridgeSweep.gamma);
  assert.deepEqual(sparseSweep.fit.summary.gamma, sparseSweep.gamma);
  assert.deepEqual(sparseSweep.fit.summary.penalty, lasso({ weights: "rising", exponent: 2 }));
  assert.match(sparseSweep.fit.summary.objective, /α Σ_q γ_q \|w\*_q\|/);
  // the reported penalty value is Σ_q γ_q |w*_q| of each curve point's coefficients
  sparseSweep.curve.forEach((c) => {
    const byHand = c.path.reduce((t, w, q) => t + sparseSweep.gamma[q] * Math.abs(w), 0);
    assert.ok(Math.abs(c.budget - byHand) <= 1e-12 * Math.max(1, byHand));
  });
  // fit() at the chosen α: the same model, the same γ
  const direct = fit(COLS, {
    target: "y",
    terms: TERMS,
    penalty: lasso({ weights: "rising", exponent: 2 }),
    alpha: sparseSweep.chosen.strength,
  });
  assert.deepEqual(direct.summary.gamma, sparseSweep.gamma);
  const f = sparseSweep.fit.summary;
  const diff = Math.max(
    ...direct.summary.coefficients.map((w, q) => Math.abs(w - f.coefficients[q])),
  );
  assert.ok(diff < 1e-5, `coefficients differ by ${diff}`);
});

Deno.test("weighted sweeps: KKT holds for the final model; a 0-weight column is in at every α", () => {
  const weights = [0, 1, 1, 2, 2, 3, 0.5, 1, 1];
  for (
    const [penalty, mix] of [
      [lasso({ weights }), 1],
      [elasticNet({ mix: 0.5, weights }), 0.5],
    ] as const
  ) {
    const s = sweep(COLS, {
      target: "y",
      terms: TERMS,
      penalty,
      alphas: { count: 25 },
      folds: { k: 5, seed: 3 },
      rule: "one-se",
    });
    assert.deepEqual(s.gamma, weights);
    assert.ok(kktFromRows(s.fit, mix) < 1e-6, `KKT ${kktFromRows(s.fit, mix)}`);
    assert.ok(s.curve.every((c) => c.path[0] !== 0), "P1(x) unpenalized: in at every α");
    // at the largest α of the automatic path (α_max) only the unpenalized column is in
    assert.equal(s.curve.at(-1)!.nonzero, 1);
    assert.ok(s.fit.summary.descent!.gap >= -1e-12);
  }
});

Deno.test("equal weights: sweep, fit and record are those of no weights, bit for bit", () => {
  for (
    const [plain, equal] of [
      [lasso(), lasso({ weights: "equal" })],
      [elasticNet({ mix: 0.3 }), elasticNet({ mix: 0.3, weights: "equal" })],
    ]
  ) {
    const spec = { target: "y", terms: TERMS, alphas: { count: 15 }, folds: { k: 4, seed: 2 } };
    const a = sweep(COLS, { ...spec, penalty: plain });
    const b = sweep(COLS, { ...spec, penalty: equal });
    assert.deepEqual(b.curve, a.curve);
    assert.deepEqual(b.fit.summary, a.fit.summary);
    assert.equal(recordJson(b), recordJson(a));
    assert.doesNotMatch(recordJson(a), /"weights"|"gamma"/, "no weight keys without weights");
  }
});

Deno.test("a weighted lasso candidate is compared with the plain one on the same folds", () => {
  const c = compare(COLS, [
    { name: "plain", terms: TERMS, penalty: lasso(), alphas: { count: 15 } },
    {
      name: "rising",
      terms: TERMS,
      penalty: lasso({ weights: "rising", exponent: 2 }),
      alphas: { count: 15 },
    },
  ], { target: "y", folds: { k: 5, seed: 9 } });
  const [plain, rising] = c.candidates;
  assert.deepEqual(plain.sweep.folds.assignment, rising.sweep.folds.assignment);
  assert.deepEqual(plain.sweep.gamma, new Array(9).fill(1));
  assert.deepEqual(rising.sweep.gamma, [1, 4, 9, 16, 25, 36, 1, 1, 1]);
  // rising weights push the high orders out sooner: at the chosen α, no more high-order terms
  const high = (s: typeof plain.sweep) =>
    s.fit.summary.coefficients.slice(3, 6).filter((w) => w !== 0).length;
  assert.ok(high(rising.sweep) <= high(plain.sweep));
});

Deno.test("weights that do not fit the design are errors naming the option", () => {
  const cases: [string, () => unknown, RegExp][] = [
    [
      "penalty.weights",
      () =>
        fit(COLS, { target: "y", terms: TERMS, penalty: lasso({ weights: [1, 2] }), alpha: 0.1 }),
      /2 weights were given for 9 design columns/,
    ],
    [
      "penalty.weights[2]",
      () => sweep(COLS, { target: "y", terms: TERMS, penalty: lasso({ weights: [1, 1, -2] }) }),
      /weight 3 is -2/,
    ],
  ];
  for (const [option, run, words] of cases) {
    assert.throws(run, (e: unknown) => {
      assert.ok(e instanceof CurbfitError);
      assert.equal(e.code, "BAD_OPTION");
      assert.equal(e.place.option, option);
      assert.match(e.message, words);
      return true;
    });
  }
});
