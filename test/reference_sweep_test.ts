/**
 * Outside reference for cross-validated ridge: scikit-learn 1.2.1 (Debian python3-sklearn
 * 1.2.1+dfsg-1), Pipeline(StandardScaler(), Ridge(alpha = λ, solver = "svd")) fitted per fold,
 * on the diabetes data bundled in that package (Efron, Hastie, Johnstone & Tibshirani 2004;
 * test/reference/README.md). The numbers were computed once by
 * test/reference/ridge_cv_sklearn.py on curbfit's own 10-fold plan
 * (test/reference/diabetes_folds.json) and committed in test/reference/diabetes_ridge_cv.json;
 * that script's header shows why its objective equals curbfit's with γ = 1. The script also
 * recomputed every number in 50-digit arithmetic (mpmath): scikit-learn agrees with that to
 * about 2e-15, so the 1e-8 tolerance here measures curbfit, not the reference.
 */
import assert from "node:assert/strict";
import { column, kFoldPlan, power, readCsv, sweep, type SweepResult, type Term } from "../mod.ts";
import { assignmentDigest } from "../lib/folds/mod.ts";
import { buildDesign, learnTerms } from "../lib/design/mod.ts";
import { REFERENCE_FOLDS } from "./reference/diabetes_folds.ts";
import { relErr } from "./helpers.ts";

const dir = new URL("./reference/", import.meta.url);
const readJson = async (name: string) => JSON.parse(await Deno.readTextFile(new URL(name, dir)));
const reference = await readJson("diabetes_ridge_cv.json");
const committedFolds = await readJson("diabetes_folds.json");
const table = await readCsv(new URL("diabetes.csv", dir));
const plain = ["age", "sex", "bmi", "bp", "s1", "s2", "s3", "s4", "s5", "s6"];

/** Relative tolerance asked of curbfit against scikit-learn (issue requirement). */
const TOLERANCE = 1e-8;

/** The curbfit terms of each reference model (names as in the JSON "columns"). */
const models: Record<string, Term[]> = {
  columns: plain.map((name) => column(name)),
  bmi_cubed: plain.map((name) => name === "bmi" ? power("bmi", 3) : column(name)),
};

interface ReferenceModel {
  columns: string[];
  foldMse: number[][];
  cvMean: number[];
}

function runSweep(terms: Term[]): SweepResult {
  const folds = kFoldPlan(table.nRows, REFERENCE_FOLDS);
  return sweep(table, {
    target: reference.target,
    terms,
    lambdas: reference.lambdas,
    folds,
    closedForm: false,
  });
}

Deno.test("reference folds: kFoldPlan(442, k 10, seed 20250611) is the plan scikit-learn used", () => {
  const plan = kFoldPlan(table.nRows, REFERENCE_FOLDS);
  assert.deepEqual(Array.from(plan.assignment[0]), committedFolds.assignment);
  assert.equal(assignmentDigest(plan), reference.folds.digest);
});

Deno.test("reference design: power(bmi, 3) gives the once-rounded powers the reference used", () => {
  const design = buildDesign(learnTerms(models.bmi_cubed, table), table);
  assert.deepEqual(design.names, reference.models.bmi_cubed.columns);
  for (const name of ["bmi^2", "bmi^3"]) {
    const q = design.names.indexOf(name);
    const ours = Array.from({ length: design.n }, (_, i) => design.block.hi[i * design.p + q]);
    assert.deepEqual(ours, reference.powers[name], name);
  }
});

for (const [name, terms] of Object.entries(models)) {
  Deno.test(`scikit-learn reference, diabetes ${name}: per-fold MSE and CV mean per λ to 1e-8`, () => {
    const ref: ReferenceModel = reference.models[name];
    const result = runSweep(terms);
    assert.deepEqual(result.names, ref.columns);
    assert.deepEqual(result.curve.map((c) => c.strength), reference.lambdas);
    result.curve.forEach((point, l) => {
      // Source: scikit-learn 1.2.1 (Debian python3-sklearn), diabetes_ridge_cv.json.
      const cv = relErr(point.cvMean, ref.cvMean[l]);
      assert.ok(
        cv <= TOLERANCE,
        `${name} λ=${point.strength}: CV mean off by ${cv.toExponential(2)}`,
      );
      point.foldMse.forEach((mse, f) => {
        const e = relErr(mse, ref.foldMse[f][l]);
        assert.ok(
          e <= TOLERANCE,
          `${name} λ=${point.strength} fold ${f}: off by ${e.toExponential(2)}`,
        );
      });
    });
  });
}
