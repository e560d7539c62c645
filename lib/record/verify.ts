/**
 * `verify(record, data)`: recomputes everything a record claims from the data and the record's
 * own settings, and reports each field as a match or a mismatch with its tolerance.
 *
 * 1. Data: the fingerprint, row count, column summaries and missing-value report of the
 *    recorded columns in `data` (exact).
 * 2. Folds: the plan rebuilt from the recorded scheme, seed, k, repeats, fraction and group
 *    column (or the recorded assignment, for plans that cannot be rebuilt), and its
 *    assignment SHA-256 (exact).
 * 3. Models: the sweep (or comparison) run again on `data` with the recorded terms, penalty,
 *    standardization, intercept, grid, rule and rebuilt folds (lasso / elastic net: ρ, the
 *    recorded weights and the solver tolerance too; γ, present only with weights, is compared
 *    as numbers); every computed field compared (numbers at relative 1e-9, integers
 *    and text exactly). Sparse replays are bit-identical on the same software (the solver's
 *    passes repeat exactly), so 1e-9 holds for them too (lib/record/README.md).
 *
 * Settings (term recipes, penalty, grid, rule, seed, k, …) are inputs: an edited setting shows
 * up through what it changes (an edited seed gives another assignment hash; an edited λ gives
 * other CV numbers or another choice).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Table } from "../table/types.ts";
import { toTable } from "../table/mod.ts";
import { separatorName } from "../table/separator.ts";
import { termFromSpec } from "../design/mod.ts";
import type { TableInput } from "../fit/fit.ts";
import { ridge } from "../fit/penalty.ts";
import {
  assignmentDigest,
  explicitPlan,
  type FoldPlan,
  holdoutPlan,
  kFoldPlan,
  leaveOneOutPlan,
} from "../folds/mod.ts";
import { makePlan } from "../folds/plan.ts";
import { sweep, type SweepSpec } from "../sweep/sweep.ts";
import { compare } from "../sweep/compare.ts";
import { planFolds } from "../sweep/folds.ts";
import type { LambdaGrid } from "../sweep/grid.ts";
import { ROW_ENCODING, summarizeData } from "./fingerprint.ts";
import { comparisonSection, dataSection, modelSection, softwareSection } from "./build.ts";
import { parseRecord } from "./parse.ts";
import {
  type ComparisonSection,
  type DataSection,
  type FoldsSection,
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
  modelStrengths,
  type RidgeModelSection,
  type SparsePenaltySection,
  standingStrength,
} from "./schema.ts";
import { recordedSparsePenalty } from "./load.ts";
import { CAUTIONS } from "./texts.ts";
import { Checks, type VerifyEntry } from "./checks.ts";
import { type VerifyReport, verifyReport } from "./report.ts";

/**
 * Checks a record against data: recomputes the fingerprint, rebuilds the folds, reruns the
 * sweep or comparison, and compares field by field. Never throws for a mismatch — the report
 * says what differs; throws BAD_RECORD only when the record itself cannot be read.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { recordJson } from "./json.ts";
 * import { verify } from "./verify.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const data = { x, y: x.map((v, i) => Math.cos(3 * v) + 0.05 * Math.sin(7 * i)) };
 * const s = sweep(data, { target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 21 } });
 * const report = verify(recordJson(s), data);
 * console.log(report.ok); // true
 * ```
 */
export function verify(record: unknown, data: Table | TableInput): VerifyReport {
  const rec = parseRecord(record);
  const table = toTable(data);
  const checks = new Checks();
  checkData(checks, rec.data, table);
  const plan = checkFolds(checks, rec.folds, table);
  if (plan !== null) checkModels(checks, rec, table, plan);
  checks.exact("cautions", rec.cautions, CAUTIONS);
  return verifyReport(checks.entries, notes(rec, table));
}

// ---- data ----------------------------------------------------------------------------------

function checkData(checks: Checks, recorded: DataSection, table: Table): void {
  const names = recorded.columns.map((c) => c.name);
  const now = dataSection(summarizeData(table, names));
  checks.exact("data.rows", recorded.rows, now.rows);
  recorded.columns.forEach((column, i) => {
    const found = now.columns.find((c) => c.name === column.name);
    checks.exact(
      `data.columns[${i}]`,
      column,
      found ?? `no column ${JSON.stringify(column.name)} in the data`,
      column.name,
    );
  });
  checks.exact("data.missing.policy", recorded.missing.policy, now.missing.policy);
  checks.exact(
    "data.missing.droppedLines",
    recorded.missing.droppedLines,
    now.missing.droppedLines,
  );
  checks.exact("data.encoding", recorded.encoding, ROW_ENCODING);
  checks.exact("data.sha256", recorded.sha256, now.sha256, `columns ${names.join(", ")}`);
}

// ---- folds ---------------------------------------------------------------------------------

function checkFolds(checks: Checks, f: FoldsSection, table: Table): FoldPlan | null {
  const settings = describeFolds(f);
  let plan: FoldPlan;
  try {
    plan = rebuildPlan(f, table);
  } catch (e) {
    if (!(e instanceof CurbfitError)) throw e;
    checks.fail("folds", `a plan from ${settings}`, `cannot be rebuilt: ${e.message}`, settings);
    return null;
  }
  checks.exact("folds.rows", f.rows, plan.nRows);
  checks.exact("folds.groupCount", f.groupCount, plan.groupCount, settings);
  checks.exact("folds.assignmentSha256", f.assignmentSha256, assignmentDigest(plan), settings);
  return plan;
}

/** The plan the recorded settings make for this table (the recorded assignment if needed). */
function rebuildPlan(f: FoldsSection, table: Table): FoldPlan {
  const n = table.nRows;
  const drawn = { k: f.k, seed: f.seed as number, repeats: f.repeats };
  switch (f.scheme) {
    case "k-fold":
      return kFoldPlan(n, drawn);
    case "holdout":
      return holdoutPlan(n, {
        fraction: f.fraction as number,
        seed: drawn.seed,
        repeats: f.repeats,
      });
    case "leave-one-out":
      return leaveOneOutPlan(n);
    case "explicit":
      return explicitPlan(n, { assignment: recordedAssignment(f, n)[0], k: f.k });
    case "grouped-k-fold":
      if (f.groupColumn !== null) return planFolds(table, { ...drawn, groups: f.groupColumn });
      return makePlan({
        scheme: f.scheme,
        nRows: n,
        k: f.k,
        repeats: f.repeats,
        seed: f.seed ?? undefined,
        groupCount: f.groupCount ?? undefined,
        assignment: recordedAssignment(f, n).map((a) => Int32Array.from(a)),
      });
  }
}

function recordedAssignment(f: FoldsSection, n: number): readonly (readonly number[])[] {
  if (f.assignment === null || f.assignment.some((a) => a.length !== n)) {
    throw new CurbfitError(
      "BAD_OPTION",
      f.assignment === null
        ? `a ${f.scheme} plan needs the recorded assignment, and the record has none`
        : `the recorded assignment covers ${f.rows} rows, but the data has ${n}`,
      "Verify against the data the record was made from",
      { option: "folds.assignment" },
    );
  }
  return f.assignment;
}

function describeFolds(f: FoldsSection): string {
  const parts: string[] = [f.scheme];
  if (f.prng !== null) parts.push(`${f.prng} seed ${f.seed}`);
  parts.push(`k ${f.k}`, `${f.repeats} repeat${f.repeats === 1 ? "" : "s"}`);
  if (f.fraction !== null) parts.push(`fraction ${f.fraction}`);
  if (f.groupColumn !== null) parts.push(`groups from column ${JSON.stringify(f.groupColumn)}`);
  if (f.assignment !== null) parts.push("recorded assignment");
  return parts.join(", ");
}

// ---- models --------------------------------------------------------------------------------

function checkModels(checks: Checks, rec: ModelChoiceRecord, table: Table, plan: FoldPlan): void {
  let fresh: { models: ModelSection[]; comparison: ComparisonSection | null };
  try {
    fresh = rerun(rec, table, plan);
  } catch (e) {
    if (!(e instanceof CurbfitError)) throw e;
    checks.fail("rerun", `the ${rec.kind} runs on the data`, e.message);
    return;
  }
  rec.models.forEach((m, i) => checkModel(checks, `models[${i}]`, m, fresh.models[i]));
  if (rec.comparison !== null && fresh.comparison !== null) {
    checkComparison(checks, rec.comparison, fresh.comparison);
  }
}

/** The record's sweep or comparison run again on `table` with the rebuilt plan. */
function rerun(
  rec: ModelChoiceRecord,
  table: Table,
  plan: FoldPlan,
): { models: ModelSection[]; comparison: ComparisonSection | null } {
  const specs = rec.models.map((m) => modelSpec(m, rec.target));
  if (rec.comparison === null) {
    return {
      models: [modelSection(sweep(table, { ...specs[0], folds: plan }), null)],
      comparison: null,
    };
  }
  const candidates = specs.map((s, i) => ({ ...s, name: rec.models[i].name as string }));
  const c = compare(table, candidates, { target: rec.target, folds: plan });
  return {
    models: c.candidates.map((o) => modelSection(o.sweep, o.name)),
    comparison: comparisonSection(c),
  };
}

/** The sweep settings a model section records. */
function modelSpec(m: ModelSection, target: string): SweepSpec {
  const terms = m.terms.map((t, j) => termFromSpec(t.spec, `terms[${j}]`));
  if (isSparseModel(m)) {
    const v = m.grid.values;
    return {
      target,
      terms,
      penalty: recordedSparsePenalty(m.penalty),
      tolerance: m.penalty.tolerance,
      standardize: m.standardize,
      intercept: m.intercept,
      alphas: m.grid.kind === "explicit" ? [...v] : {
        count: v.length,
        ...(m.grid.request?.ratio == null ? {} : { ratio: m.grid.request.ratio }),
      },
      rule: m.choice.rule,
    };
  }
  return {
    target,
    terms,
    penalty: ridge({ weights: m.penalty.weights, exponent: m.penalty.exponent }),
    standardize: m.standardize,
    intercept: m.intercept,
    lambdas: gridRequest(m),
    rule: m.choice.rule,
    closedForm: m.closedForm,
  };
}

/**
 * The grid to rerun with: an explicit grid as listed; an automatic grid as a request with the
 * recorded count and ends, which regenerates the same log-spaced values and the same notes.
 */
function gridRequest(m: RidgeModelSection): LambdaGrid {
  const v = m.grid.values;
  if (m.grid.kind === "explicit") return [...v];
  return { count: v.length, min: v[0], max: v[v.length - 1] };
}

function checkModel(checks: Checks, at: string, rec: ModelSection, now: ModelSection): void {
  const recorded = modelStrengths(rec);
  const fresh = modelStrengths(now);
  const symbol = recorded.scale === "alpha" ? "α" : "λ";
  const strengthAt = (l: number) => `${symbol} index ${l} (${symbol} = ${rec.grid.values[l]})`;
  const column = (q: number) => `column ${q} (${rec.final.names[q] ?? "?"})`;
  const key = recorded.scale;
  rec.terms.forEach((t, j) => {
    const n = now.terms[j];
    checks.exact(`${at}.terms[${j}].label`, t.label, n?.label);
    checks.exact(`${at}.terms[${j}].params`, t.params, n?.params);
    checks.exact(`${at}.terms[${j}].outputs`, t.outputs, n?.outputs);
    checks.exact(`${at}.terms[${j}].orders`, t.orders, n?.orders);
  });
  if (!isSparseModel(rec) && !isSparseModel(now)) {
    checks.numbers(`${at}.penalty.gamma`, rec.penalty.gamma, now.penalty.gamma, "each", column);
  } else {
    // the settings exactly; recorded weights γ (present only with weights) as numbers, like ridge's
    const { gamma: recGamma, ...recSettings } = rec.penalty as SparsePenaltySection;
    const { gamma: nowGamma, ...nowSettings } = now.penalty as SparsePenaltySection;
    checks.exact(`${at}.penalty`, recSettings, nowSettings);
    if (recGamma !== undefined || nowGamma !== undefined) {
      checks.numbers(`${at}.penalty.gamma`, recGamma ?? [], nowGamma ?? [], "each", column);
    }
  }
  checks.exact(`${at}.objective`, rec.objective, now.objective);
  checks.numbers(`${at}.grid.values`, rec.grid.values, now.grid.values, "each", strengthAt);
  checks.exact(`${at}.cv.definitions`, rec.cv.definitions, now.cv.definitions);
  checks.numbers(`${at}.cv.${key}`, recorded.grid, fresh.grid, "each", strengthAt);
  for (const k of ["cvMean", "cvSe", "trainMse", "foldTrainMse"] as const) {
    checks.numbers(`${at}.cv.${k}`, rec.cv[k], now.cv[k], "each", strengthAt);
  }
  if (isSparseModel(rec) && isSparseModel(now)) {
    checks.exact(`${at}.cv.nonzero`, rec.cv.nonzero, now.cv.nonzero);
    checks.numbers(
      `${at}.cv.penaltyValue`,
      rec.cv.penaltyValue,
      now.cv.penaltyValue,
      "each",
      strengthAt,
    );
  } else if (!isSparseModel(rec) && !isSparseModel(now)) {
    for (const k of ["df", "budget", "gcv"] as const) {
      checks.numbers(`${at}.cv.${k}`, rec.cv[k], now.cv[k], "each", strengthAt);
    }
    if (rec.cv.loo === null || now.cv.loo === null) {
      checks.exact(`${at}.cv.loo`, rec.cv.loo, now.cv.loo);
    } else checks.numbers(`${at}.cv.loo`, rec.cv.loo, now.cv.loo, "each", strengthAt);
  }
  checks.rows(
    `${at}.cv.foldMse`,
    rec.cv.foldMse,
    now.cv.foldMse,
    "each",
    (l, f) => `${strengthAt(l)}, fold ${f}`,
  );
  checks.rows(
    `${at}.cv.path`,
    rec.cv.path,
    now.cv.path,
    "vector",
    (l, q) => `${strengthAt(l)}, ${column(q)}`,
  );
  checks.exact(`${at}.choice.definition`, rec.choice.definition, now.choice.definition);
  checks.exact(`${at}.choice.index`, rec.choice.index, now.choice.index);
  checks.number(`${at}.choice.${key}`, recorded.chosen, fresh.chosen);
  checks.exact(`${at}.choice.minimum.index`, rec.choice.minimum.index, now.choice.minimum.index);
  checks.number(`${at}.choice.minimum.${key}`, recorded.minimum, fresh.minimum);
  checks.exact(`${at}.choice.notes`, rec.choice.notes, now.choice.notes);
  checkFinal(checks, `${at}.final`, rec, now, column);
}

function checkFinal(
  checks: Checks,
  at: string,
  recModel: ModelSection,
  nowModel: ModelSection,
  column: (q: number) => string,
): void {
  const rec = recModel.final;
  const now = nowModel.final;
  checks.exact(`${at}.n`, rec.n, now.n);
  if (isSparseModel(recModel) && isSparseModel(nowModel)) {
    const r = recModel.final;
    const n = nowModel.final;
    checks.number(`${at}.alpha`, r.alpha, n.alpha);
    checks.number(`${at}.penaltyValue`, r.penaltyValue, n.penaltyValue);
    checks.exact(`${at}.nonzero`, r.nonzero, n.nonzero);
  } else if (!isSparseModel(recModel) && !isSparseModel(nowModel)) {
    const r = recModel.final;
    const n = nowModel.final;
    for (const key of ["lambda", "budget", "df"] as const) {
      checks.number(`${at}.${key}`, r[key], n[key]);
    }
  }
  checks.exact(`${at}.names`, rec.names, now.names);
  checks.number(`${at}.intercept`, rec.intercept, now.intercept);
  checks.numbers(`${at}.coefficients`, rec.coefficients, now.coefficients, "vector", column);
  checks.number(
    `${at}.standardized.intercept`,
    rec.standardized.intercept,
    now.standardized.intercept,
  );
  checks.numbers(
    `${at}.standardized.coefficients`,
    rec.standardized.coefficients,
    now.standardized.coefficients,
    "vector",
    column,
  );
  checks.numbers(`${at}.means`, rec.means, now.means, "each", column);
  checks.numbers(`${at}.sds`, rec.sds, now.sds, "each", column);
  for (const key of ["trainMse", "residualSd", "condition"] as const) {
    checks.number(`${at}.${key}`, rec[key], now[key]);
  }
  if (isSparseModel(recModel) && isSparseModel(nowModel)) {
    const r = recModel.final.descent;
    const n = nowModel.final.descent;
    checks.exact(`${at}.descent.passes`, r.passes, n.passes);
    checks.exact(`${at}.descent.converged`, r.converged, n.converged);
    checks.number(`${at}.descent.violation`, r.violation, n.violation);
    checks.number(`${at}.descent.gap`, r.gap, n.gap);
  } else if (!isSparseModel(recModel) && !isSparseModel(nowModel)) {
    checks.exact(
      `${at}.refinementSteps`,
      recModel.final.refinementSteps,
      nowModel.final.refinementSteps,
    );
  }
}

function checkComparison(checks: Checks, rec: ComparisonSection, now: ComparisonSection): void {
  checks.exact("comparison.best", rec.best, now.best);
  checks.exact("comparison.criterion", rec.criterion, now.criterion);
  rec.candidates.forEach((c, i) => {
    const n = now.candidates[i];
    const at = `comparison.candidates[${i}]`;
    checks.exact(`${at}.name`, c.name, n.name);
    checks.number(
      `${at}.${"alpha" in c ? "alpha" : "lambda"}`,
      standingStrength(c),
      standingStrength(n),
    );
    for (const key of ["cvMean", "cvSe"] as const) {
      checks.number(`${at}.${key}`, c[key], n[key]);
    }
    if (c.versusBest === null || n.versusBest === null) {
      checks.exact(`${at}.versusBest`, c.versusBest, n.versusBest);
      return;
    }
    checks.numbers(
      `${at}.versusBest`,
      [c.versusBest.mean, c.versusBest.se],
      [n.versusBest.mean, n.versusBest.se],
      "vector",
      (i) => (i === 0 ? "mean" : "se"),
    );
    checks.exact(
      `${at}.versusBest.indistinguishable`,
      c.versusBest.indistinguishable,
      n.versusBest.indistinguishable,
    );
  });
  checks.exact("comparison.verdict", rec.verdict, now.verdict);
}

// ---- notes ---------------------------------------------------------------------------------

/**
 * Context that is not compared: who wrote the record, when, from which source, and a field
 * separator that differs from the record's.
 */
function notes(rec: ModelChoiceRecord, table: Table): string[] {
  const then = rec.software;
  const now = softwareSection();
  const describe = (s: typeof then) =>
    `${s.library} ${s.version} on ${s.runtime} ${s.runtimeVersion} (V8 ${s.v8})`;
  const out = [`Recorded with ${describe(then)}; verified with ${describe(now)}.`];
  if (describe(then) !== describe(now)) {
    out.push(
      "The software differs: numbers may differ in their last digits; the tolerances above apply.",
    );
    if (rec.models.some(isSparseModel)) {
      out.push(
        "Lasso / elastic-net numbers come from an iterative solver stopped at a scaled KKT " +
          "violation ≤ penalty.tolerance: on other software they may move by that much, more " +
          "than the 1e-9 tolerance.",
      );
    }
  }
  if (rec.created !== null) out.push(`Record created ${rec.created}.`);
  const separatorNote = separatorDifference(rec.data.fieldSeparator, table.fieldSeparator);
  if (separatorNote !== undefined) out.push(separatorNote);
  if (rec.data.source !== table.source) {
    out.push(
      `The record's data came from ${JSON.stringify(rec.data.source)}; these rows from ` +
        `${JSON.stringify(table.source)} (the fingerprint, not the source name, is compared).`,
    );
  }
  return out;
}

/**
 * A note when the rows were read with another field separator than the record's data (not
 * compared: the fingerprint of the parsed rows is). Undefined means a comma, or rows in memory.
 */
function separatorDifference(
  recorded: string | undefined,
  now: string | undefined,
): string | undefined {
  if (recorded === now) return undefined;
  const then = recorded === undefined
    ? "The record names no field separator (its data was comma-separated CSV, or rows in memory)"
    : `The record's data was read with ${separatorName(recorded, true)} between fields`;
  const these = now === undefined
    ? "these rows were not (commas, or rows in memory)"
    : `these rows were read with ${separatorName(now, true)}`;
  return `${then}; ${these}. The fingerprint of the rows, not the separator, is compared.`;
}

export type { VerifyEntry, VerifyReport };
