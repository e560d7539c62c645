/**
 * Writes diabetes_folds.json: curbfit's 10-fold plan (PCG32, seed 20250611) for the 442 rows of
 * diabetes.csv, which ridge_cv_sklearn.py reads so that both sides of the reference check use
 * the same rows in the same folds. The file also carries the plan's SHA-256 assignment digest
 * (lib/folds/digest.ts), which the Python script recomputes as a check.
 *
 * Run from the repository root: deno run --allow-read --allow-write test/reference/diabetes_folds.ts
 *
 * @module
 */
import { assignmentDigest, kFoldPlan } from "../../lib/folds/mod.ts";
import { readCsv } from "../../mod.ts";

/**
 * The seed and fold count of the reference plan.
 *
 * @example
 * ```ts
 * import { kFoldPlan } from "../../lib/folds/mod.ts";
 * import { REFERENCE_FOLDS } from "./diabetes_folds.ts";
 * const plan = kFoldPlan(442, REFERENCE_FOLDS); // the plan in diabetes_folds.json
 * ```
 */
export const REFERENCE_FOLDS = { k: 10, seed: 20250611 } as const;

if (import.meta.main) {
  const here = new URL("./", import.meta.url);
  const table = await readCsv(new URL("diabetes.csv", here));
  const plan = kFoldPlan(table.nRows, REFERENCE_FOLDS);
  const doc = {
    source: "curbfit kFoldPlan (lib/folds/schemes.ts), written by test/reference/diabetes_folds.ts",
    data: "diabetes.csv",
    scheme: plan.scheme,
    prng: plan.prng,
    k: plan.k,
    seed: plan.seed,
    nRows: plan.nRows,
    digest: assignmentDigest(plan),
    assignment: Array.from(plan.assignment[0]),
  };
  await Deno.writeTextFile(new URL("diabetes_folds.json", here), JSON.stringify(doc) + "\n");
}
