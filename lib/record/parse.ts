/**
 * Reading a record back: JSON text (or an already parsed object) checked field by field against
 * schema `curbfit.model-choice/1`. Anything else — invalid JSON, another schema, a newer
 * version, a missing, extra or mistyped field, arrays of inconsistent lengths — is a BAD_RECORD
 * error naming the field (as `option`, e.g. `record.models[0].final.coefficients`).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { Json } from "../design/types.ts";
import type { FoldScheme } from "../folds/mod.ts";
import type { ColumnSummary } from "./fingerprint.ts";
import { DEFAULT_SEPARATOR, separatorProblem } from "../table/separator.ts";
import { recordBundle, withDisplay } from "../views/display.ts";
import {
  type ChoiceSection,
  type ComparisonSection,
  type CvSection,
  type DataSection,
  type FinalSection,
  type FoldsSection,
  type GridSection,
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
  type PenaltySection,
  type RidgeModelSection,
  SCHEMA,
  SCHEMA_NAME,
  SCHEMA_VERSION,
  type SoftwareSection,
  type SparseModelSection,
  type TermSection,
} from "./schema.ts";

const EDITED_HINT =
  "Use the record exactly as curbfit wrote it (recordJson); if it was edited, write it again " +
  "from the sweep";

/**
 * Parses and checks a record. Returns a frozen record whose `recordJson` text equals the
 * canonical text it was read from.
 *
 * @example
 * ```ts
 * import { CurbfitError } from "../errors/error.ts";
 * import { parseRecord } from "./parse.ts";
 * try {
 *   parseRecord('{ "schema": "curbfit.model-choice/9" }');
 * } catch (e) {
 *   if (e instanceof CurbfitError) console.log(e.code); // BAD_RECORD
 * }
 * ```
 */
export function parseRecord(input: unknown): ModelChoiceRecord {
  const value = typeof input === "string" ? parseText(input) : input;
  checkSchema(value);
  const r = fields(value, "record", [
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
  const kind = oneOf(r.kind, "record.kind", ["sweep", "comparison"] as const);
  const record: ModelChoiceRecord = {
    schema: SCHEMA,
    kind,
    created: nullable(r.created, "record.created", text),
    software: software(r.software, "record.software"),
    target: text(r.target, "record.target"),
    data: data(r.data, "record.data"),
    folds: folds(r.folds, "record.folds"),
    models: list(r.models, "record.models", model),
    comparison: nullable(r.comparison, "record.comparison", comparison),
    cautions: list(r.cautions, "record.cautions", text),
  };
  checkConsistent(record);
  return deepFreeze(withDisplay(record, recordBundle));
}

function parseText(input: string): unknown {
  try {
    return JSON.parse(input);
  } catch (e) {
    throw new CurbfitError(
      "BAD_RECORD",
      `the record is not valid JSON (${(e as Error).message})`,
      "Pass the text of a record file written by recordJson, unchanged",
      { option: "record" },
    );
  }
}

function checkSchema(value: unknown): void {
  const schema = isObject(value) ? value.schema : undefined;
  const match = typeof schema === "string" ? /^(.+)\/(\d+)$/.exec(schema) : null;
  if (match === null || match[1] !== SCHEMA_NAME) {
    throw new CurbfitError(
      "BAD_RECORD",
      `this is not a curbfit model-choice record (its schema field is ${show(schema)}, ` +
        `expected ${JSON.stringify(SCHEMA)})`,
      "Pass a record written by recordJson",
      { option: "record.schema" },
    );
  }
  const version = Number(match[2]);
  if (version > SCHEMA_VERSION) {
    throw new CurbfitError(
      "BAD_RECORD",
      `the record uses schema version ${version} (${schema}), newer than this curbfit reads ` +
        `(version ${SCHEMA_VERSION})`,
      "Update curbfit to a version that reads it",
      { option: "record.schema" },
    );
  }
  if (version !== SCHEMA_VERSION) {
    throw new CurbfitError(
      "BAD_RECORD",
      `the record uses schema version ${version} (${schema}), which this curbfit does not read`,
      `Write the record again with this curbfit (schema ${SCHEMA})`,
      { option: "record.schema" },
    );
  }
}

function software(v: unknown, path: string): SoftwareSection {
  const o = fields(v, path, [
    "library",
    "version",
    "runtime",
    "runtimeVersion",
    "v8",
    "typescript",
  ]);
  return {
    library: text(o.library, `${path}.library`),
    version: text(o.version, `${path}.version`),
    runtime: text(o.runtime, `${path}.runtime`),
    runtimeVersion: text(o.runtimeVersion, `${path}.runtimeVersion`),
    v8: text(o.v8, `${path}.v8`),
    typescript: text(o.typescript, `${path}.typescript`),
  };
}

const DATA_KEYS = ["source", "rows", "columns", "missing", "encoding", "sha256"];

function data(v: unknown, path: string): DataSection {
  const separated = isObject(v) && "fieldSeparator" in v;
  const o = fields(v, path, separated ? ["fieldSeparator", ...DATA_KEYS] : DATA_KEYS);
  const m = fields(o.missing, `${path}.missing`, ["policy", "droppedLines"]);
  return {
    source: text(o.source, `${path}.source`),
    ...(separated
      ? { fieldSeparator: fieldSeparator(o.fieldSeparator, `${path}.fieldSeparator`) }
      : {}),
    rows: whole(o.rows, `${path}.rows`),
    columns: list(o.columns, `${path}.columns`, columnSummary),
    missing: {
      policy: oneOf(m.policy, `${path}.missing.policy`, ["error", "drop"] as const),
      droppedLines: list(m.droppedLines, `${path}.missing.droppedLines`, whole),
    },
    encoding: text(o.encoding, `${path}.encoding`),
    sha256: digest(o.sha256, `${path}.sha256`),
  };
}

/** A field separator other than the comma (a comma is written by leaving the key out). */
function fieldSeparator(v: unknown, path: string): string {
  const s = text(v, path);
  if (s === DEFAULT_SEPARATOR) {
    throw bad(path, 'is ",", but a comma is written by leaving fieldSeparator out');
  }
  const problem = separatorProblem(s);
  if (problem !== undefined) throw bad(path, `is ${show(s)}, but ${problem}`);
  return s;
}

function columnSummary(v: unknown, path: string): ColumnSummary {
  const kind = isObject(v) ? v.kind : undefined;
  if (kind === "category") {
    const o = fields(v, path, ["name", "kind", "levels"]);
    return {
      name: text(o.name, `${path}.name`),
      kind,
      levels: list(o.levels, `${path}.levels`, text),
    };
  }
  const o = fields(v, path, ["name", "kind", "min", "max"]);
  oneOf(o.kind, `${path}.kind`, ["number", "category"] as const);
  return {
    name: text(o.name, `${path}.name`),
    kind: "number",
    min: num(o.min, `${path}.min`),
    max: num(o.max, `${path}.max`),
  };
}

const SCHEMES = ["k-fold", "grouped-k-fold", "holdout", "leave-one-out", "explicit"] as const;

function folds(v: unknown, path: string): FoldsSection {
  const o = fields(v, path, [
    "scheme",
    "prng",
    "seed",
    "k",
    "repeats",
    "fraction",
    "groupColumn",
    "groupCount",
    "rows",
    "assignmentSha256",
    "assignment",
  ]);
  return {
    scheme: oneOf(o.scheme, `${path}.scheme`, SCHEMES) as FoldScheme,
    prng: nullable(o.prng, `${path}.prng`, (x, p) => oneOf(x, p, ["PCG32"] as const)),
    seed: nullable(o.seed, `${path}.seed`, whole),
    k: whole(o.k, `${path}.k`),
    repeats: whole(o.repeats, `${path}.repeats`),
    fraction: nullable(o.fraction, `${path}.fraction`, num),
    groupColumn: nullable(o.groupColumn, `${path}.groupColumn`, text),
    groupCount: nullable(o.groupCount, `${path}.groupCount`, whole),
    rows: whole(o.rows, `${path}.rows`),
    assignmentSha256: digest(o.assignmentSha256, `${path}.assignmentSha256`),
    assignment: nullable(
      o.assignment,
      `${path}.assignment`,
      (x, p) => list(x, p, (y, q) => list(y, q, integer)),
    ),
  };
}

const SPARSE_KINDS = ["lasso", "elastic-net"] as const;

/** A model section: lasso / elastic net when its penalty says so (keys `alpha`), else ridge. */
function model(v: unknown, path: string): ModelSection {
  const kind = isObject(v) && isObject(v.penalty) ? v.penalty.kind : undefined;
  return (SPARSE_KINDS as readonly unknown[]).includes(kind)
    ? sparseModel(v, path)
    : ridgeModel(v, path);
}

function ridgeModel(v: unknown, path: string): RidgeModelSection {
  const o = fields(v, path, [
    "name",
    "terms",
    "standardize",
    "intercept",
    "penalty",
    "objective",
    "grid",
    "closedForm",
    "cv",
    "choice",
    "final",
  ]);
  return {
    name: nullable(o.name, `${path}.name`, text),
    terms: list(o.terms, `${path}.terms`, term),
    standardize: flag(o.standardize, `${path}.standardize`),
    intercept: flag(o.intercept, `${path}.intercept`),
    penalty: penalty(o.penalty, `${path}.penalty`),
    objective: list(o.objective, `${path}.objective`, text),
    grid: grid(o.grid, `${path}.grid`),
    closedForm: flag(o.closedForm, `${path}.closedForm`),
    cv: cv(o.cv, `${path}.cv`),
    choice: choice(o.choice, `${path}.choice`),
    final: final(o.final, `${path}.final`),
  };
}

function sparseModel(v: unknown, path: string): SparseModelSection {
  const o = fields(v, path, [
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
  const g = fields(o.grid, `${path}.grid`, ["kind", "request", "values"]);
  return {
    name: nullable(o.name, `${path}.name`, text),
    terms: list(o.terms, `${path}.terms`, term),
    standardize: flag(o.standardize, `${path}.standardize`),
    intercept: flag(o.intercept, `${path}.intercept`),
    penalty: sparsePenalty(o.penalty, `${path}.penalty`),
    objective: list(o.objective, `${path}.objective`, text),
    grid: {
      kind: oneOf(g.kind, `${path}.grid.kind`, ["automatic", "explicit"] as const),
      request: nullable(g.request, `${path}.grid.request`, (x, q) => {
        const r = fields(x, q, ["count", "ratio"]);
        return {
          count: nullable(r.count, `${q}.count`, whole),
          ratio: nullable(r.ratio, `${q}.ratio`, num),
        };
      }),
      values: list(g.values, `${path}.grid.values`, num),
    },
    cv: sparseCv(o.cv, `${path}.cv`),
    choice: sparseChoice(o.choice, `${path}.choice`),
    final: sparseFinal(o.final, `${path}.final`),
  };
}

/**
 * A sparse penalty section: kind, mix, then `weights`, `exponent` and `gamma` together when the
 * weights are not all 1 (absent in records of unweighted penalties), then tolerance.
 */
function sparsePenalty(v: unknown, path: string): SparseModelSection["penalty"] {
  const weighted = isObject(v) && "weights" in v;
  const o = fields(
    v,
    path,
    weighted
      ? ["kind", "mix", "weights", "exponent", "gamma", "tolerance"]
      : ["kind", "mix", "tolerance"],
  );
  const kind = oneOf(o.kind, `${path}.kind`, SPARSE_KINDS);
  const mix = num(o.mix, `${path}.mix`);
  const tolerance = num(o.tolerance, `${path}.tolerance`);
  if (!weighted) return { kind, mix, tolerance };
  if (o.weights === "equal") {
    throw bad(
      `${path}.weights`,
      'is "equal", but equal weights are written by leaving weights out',
    );
  }
  return {
    kind,
    mix,
    weights: Array.isArray(o.weights)
      ? list(o.weights, `${path}.weights`, num)
      : oneOf(o.weights, `${path}.weights`, ["rising", "falling"] as const),
    exponent: num(o.exponent, `${path}.exponent`),
    gamma: list(o.gamma, `${path}.gamma`, num),
    tolerance,
  };
}

const SPARSE_CV_COLUMNS = [
  "alpha",
  "cvMean",
  "cvSe",
  "trainMse",
  "foldTrainMse",
  "nonzero",
  "penaltyValue",
] as const;

function sparseCv(v: unknown, path: string): SparseModelSection["cv"] {
  const o = fields(v, path, ["definitions", ...SPARSE_CV_COLUMNS, "foldMse", "path"]);
  const column = (key: typeof SPARSE_CV_COLUMNS[number]) => list(o[key], `${path}.${key}`, num);
  const rows = (key: "foldMse" | "path") =>
    list(o[key], `${path}.${key}`, (x, p) => list(x, p, num));
  return {
    definitions: list(o.definitions, `${path}.definitions`, text),
    alpha: column("alpha"),
    cvMean: column("cvMean"),
    cvSe: column("cvSe"),
    trainMse: column("trainMse"),
    foldTrainMse: column("foldTrainMse"),
    nonzero: list(o.nonzero, `${path}.nonzero`, whole),
    penaltyValue: column("penaltyValue"),
    foldMse: rows("foldMse"),
    path: rows("path"),
  };
}

function sparseChoice(v: unknown, path: string): SparseModelSection["choice"] {
  return choiceOn(v, path, "alpha") as unknown as SparseModelSection["choice"];
}

function sparseFinal(v: unknown, path: string): SparseModelSection["final"] {
  const o = fields(v, path, [
    "n",
    "alpha",
    "penaltyValue",
    "nonzero",
    "names",
    "intercept",
    "coefficients",
    "standardized",
    "means",
    "sds",
    "trainMse",
    "residualSd",
    "condition",
    "descent",
  ]);
  const d = fields(o.descent, `${path}.descent`, ["passes", "converged", "violation", "gap"]);
  return {
    n: whole(o.n, `${path}.n`),
    alpha: num(o.alpha, `${path}.alpha`),
    penaltyValue: num(o.penaltyValue, `${path}.penaltyValue`),
    nonzero: whole(o.nonzero, `${path}.nonzero`),
    ...finalNumbers(o, path),
    descent: {
      passes: whole(d.passes, `${path}.descent.passes`),
      converged: flag(d.converged, `${path}.descent.converged`),
      violation: num(d.violation, `${path}.descent.violation`),
      gap: num(d.gap, `${path}.descent.gap`),
    },
  };
}

function term(v: unknown, path: string): TermSection {
  const o = fields(v, path, ["label", "spec", "params", "outputs", "orders"]);
  return {
    label: text(o.label, `${path}.label`),
    spec: json(o.spec, `${path}.spec`),
    params: json(o.params, `${path}.params`),
    outputs: list(o.outputs, `${path}.outputs`, text),
    orders: list(o.orders, `${path}.orders`, whole),
  };
}

function penalty(v: unknown, path: string): PenaltySection {
  const o = fields(v, path, ["kind", "weights", "exponent", "gamma"]);
  return {
    kind: oneOf(o.kind, `${path}.kind`, ["ridge"] as const),
    weights: Array.isArray(o.weights)
      ? list(o.weights, `${path}.weights`, num)
      : oneOf(o.weights, `${path}.weights`, ["equal", "rising", "falling"] as const),
    exponent: num(o.exponent, `${path}.exponent`),
    gamma: list(o.gamma, `${path}.gamma`, num),
  };
}

function grid(v: unknown, path: string): GridSection {
  const o = fields(v, path, ["kind", "request", "values"]);
  return {
    kind: oneOf(o.kind, `${path}.kind`, ["automatic", "explicit"] as const),
    request: nullable(o.request, `${path}.request`, (x, p) => {
      const r = fields(x, p, ["count", "min", "max"]);
      return {
        count: nullable(r.count, `${p}.count`, whole),
        min: nullable(r.min, `${p}.min`, num),
        max: nullable(r.max, `${p}.max`, num),
      };
    }),
    values: list(o.values, `${path}.values`, num),
  };
}

const CV_NUMBER_COLUMNS = [
  "lambda",
  "cvMean",
  "cvSe",
  "trainMse",
  "foldTrainMse",
  "df",
  "budget",
  "gcv",
] as const;

function cv(v: unknown, path: string): CvSection {
  const o = fields(v, path, ["definitions", ...CV_NUMBER_COLUMNS, "loo", "foldMse", "path"]);
  const column = (key: typeof CV_NUMBER_COLUMNS[number]) => list(o[key], `${path}.${key}`, num);
  const rows = (key: "foldMse" | "path") =>
    list(o[key], `${path}.${key}`, (x, p) => list(x, p, num));
  return {
    definitions: list(o.definitions, `${path}.definitions`, text),
    lambda: column("lambda"),
    cvMean: column("cvMean"),
    cvSe: column("cvSe"),
    trainMse: column("trainMse"),
    foldTrainMse: column("foldTrainMse"),
    df: column("df"),
    budget: column("budget"),
    gcv: column("gcv"),
    loo: nullable(o.loo, `${path}.loo`, (x, p) => list(x, p, num)),
    foldMse: rows("foldMse"),
    path: rows("path"),
  };
}

function choice(v: unknown, path: string): ChoiceSection {
  return choiceOn(v, path, "lambda") as unknown as ChoiceSection;
}

/** A choice section whose strength keys are `key` ("lambda" for ridge, "alpha" for sparse). */
function choiceOn(v: unknown, path: string, key: "lambda" | "alpha"): Record<string, unknown> {
  const o = fields(v, path, ["rule", "definition", "index", key, "minimum", "notes"]);
  const m = fields(o.minimum, `${path}.minimum`, ["index", key]);
  return {
    rule: oneOf(o.rule, `${path}.rule`, ["min", "one-se"] as const),
    definition: text(o.definition, `${path}.definition`),
    index: whole(o.index, `${path}.index`),
    [key]: num(o[key], `${path}.${key}`),
    minimum: {
      index: whole(m.index, `${path}.minimum.index`),
      [key]: num(m[key], `${path}.minimum.${key}`),
    },
    notes: list(o.notes, `${path}.notes`, text),
  };
}

function final(v: unknown, path: string): FinalSection {
  const o = fields(v, path, [
    "n",
    "lambda",
    "budget",
    "df",
    "names",
    "intercept",
    "coefficients",
    "standardized",
    "means",
    "sds",
    "trainMse",
    "residualSd",
    "condition",
    "refinementSteps",
  ]);
  return {
    n: whole(o.n, `${path}.n`),
    lambda: num(o.lambda, `${path}.lambda`),
    budget: num(o.budget, `${path}.budget`),
    df: num(o.df, `${path}.df`),
    ...finalNumbers(o, path),
    refinementSteps: whole(o.refinementSteps, `${path}.refinementSteps`),
  };
}

/** The fields every final-model section shares, in record order. */
function finalNumbers(o: Record<string, unknown>, path: string) {
  const s = fields(o.standardized, `${path}.standardized`, ["intercept", "coefficients"]);
  return {
    names: list(o.names, `${path}.names`, text),
    intercept: num(o.intercept, `${path}.intercept`),
    coefficients: list(o.coefficients, `${path}.coefficients`, num),
    standardized: {
      intercept: num(s.intercept, `${path}.standardized.intercept`),
      coefficients: list(s.coefficients, `${path}.standardized.coefficients`, num),
    },
    means: list(o.means, `${path}.means`, num),
    sds: list(o.sds, `${path}.sds`, num),
    trainMse: num(o.trainMse, `${path}.trainMse`),
    residualSd: num(o.residualSd, `${path}.residualSd`),
    condition: num(o.condition, `${path}.condition`),
  };
}

function comparison(v: unknown, path: string): ComparisonSection {
  const o = fields(v, path, ["best", "criterion", "candidates", "verdict"]);
  return {
    best: text(o.best, `${path}.best`),
    criterion: text(o.criterion, `${path}.criterion`),
    candidates: list(o.candidates, `${path}.candidates`, (x, p) => {
      const key = isObject(x) && "alpha" in x ? "alpha" : "lambda";
      const c = fields(x, p, ["name", key, "cvMean", "cvSe", "versusBest"]);
      const strength = num(c[key], `${p}.${key}`);
      return {
        name: text(c.name, `${p}.name`),
        ...(key === "alpha" ? { alpha: strength } : { lambda: strength }),
        cvMean: num(c.cvMean, `${p}.cvMean`),
        cvSe: num(c.cvSe, `${p}.cvSe`),
        versusBest: nullable(c.versusBest, `${p}.versusBest`, (y, q) => {
          const d = fields(y, q, ["mean", "se", "indistinguishable"]);
          return {
            mean: num(d.mean, `${q}.mean`),
            se: num(d.se, `${q}.se`),
            indistinguishable: flag(d.indistinguishable, `${q}.indistinguishable`),
          };
        }),
      };
    }),
    verdict: list(o.verdict, `${path}.verdict`, text),
  };
}

/** Cross-field checks: the shapes a loaded model and `verify` rely on. */
function checkConsistent(r: ModelChoiceRecord): void {
  const single = r.kind === "sweep";
  if (single ? r.models.length !== 1 : r.models.length < 2) {
    throw bad("record.models", `holds ${r.models.length} models for a ${r.kind} record`);
  }
  if (single !== (r.comparison === null)) {
    throw bad("record.comparison", single ? "is set in a sweep record" : "is missing");
  }
  if (r.folds.assignment !== null) {
    if (r.folds.assignment.length !== r.folds.repeats) {
      throw bad("record.folds.assignment", `holds ${r.folds.assignment.length} repeats`);
    }
    r.folds.assignment.forEach((a, i) => {
      if (a.length !== r.folds.rows) {
        throw bad(`record.folds.assignment[${i}]`, `has ${a.length} rows, not ${r.folds.rows}`);
      }
    });
  }
  r.models.forEach((m, i) => checkModel(m, `record.models[${i}]`, single));
  r.comparison?.candidates.forEach((c, i) => {
    const m = r.models[i];
    if (m !== undefined && ("alpha" in c) !== isSparseModel(m)) {
      throw bad(
        `record.comparison.candidates[${i}]`,
        `gives a ${"alpha" in c ? "α" : "λ"} for a ${m.penalty.kind} model`,
      );
    }
  });
}

function checkModel(m: ModelSection, path: string, single: boolean): void {
  if (single !== (m.name === null)) {
    throw bad(`${path}.name`, single ? "is set in a sweep record" : "is missing");
  }
  const outputs = m.terms.flatMap((t) => t.outputs);
  const orders = m.terms.flatMap((t) => t.orders);
  sameLength(`${path}.terms`, outputs.length, orders.length, "output orders");
  if (outputs.join("\u0000") !== m.final.names.join("\u0000")) {
    throw bad(`${path}.final.names`, "differ from the terms' outputs");
  }
  const p = outputs.length;
  for (
    const [key, v] of [
      ...(m.penalty.gamma === undefined ? [] : [["penalty.gamma", m.penalty.gamma] as const]),
      ["final.coefficients", m.final.coefficients],
      ["final.standardized.coefficients", m.final.standardized.coefficients],
      ["final.means", m.final.means],
      ["final.sds", m.final.sds],
    ] as const
  ) sameLength(`${path}.${key}`, v.length, p, "design columns");
  const count = m.grid.values.length;
  if (count === 0) throw bad(`${path}.grid.values`, "is empty");
  if (isSparseModel(m)) {
    for (const key of SPARSE_CV_COLUMNS) {
      sameLength(`${path}.cv.${key}`, m.cv[key].length, count, "grid values");
    }
  } else {
    for (const key of CV_NUMBER_COLUMNS) {
      sameLength(`${path}.cv.${key}`, m.cv[key].length, count, "grid values");
    }
    if ((m.cv.loo !== null) !== m.closedForm) {
      throw bad(`${path}.cv.loo`, m.closedForm ? "is missing" : "is set without closedForm");
    }
    if (m.cv.loo !== null) sameLength(`${path}.cv.loo`, m.cv.loo.length, count, "grid values");
  }
  sameLength(`${path}.cv.foldMse`, m.cv.foldMse.length, count, "grid values");
  sameLength(`${path}.cv.path`, m.cv.path.length, count, "grid values");
  m.cv.foldMse.forEach((f, l) =>
    sameLength(`${path}.cv.foldMse[${l}]`, f.length, m.cv.foldMse[0].length, "folds")
  );
  m.cv.path.forEach((w, l) => sameLength(`${path}.cv.path[${l}]`, w.length, p, "design columns"));
  for (
    const [key, index] of [["index", m.choice.index], ["minimum.index", m.choice.minimum.index]]
  ) {
    if ((index as number) >= count) {
      throw bad(`${path}.choice.${key}`, `is ${index}, beyond the ${count} grid values`);
    }
  }
}

function sameLength(path: string, actual: number, expected: number, what: string): void {
  if (actual !== expected) throw bad(path, `has ${actual} entries for ${expected} ${what}`);
}

// ---- field readers -------------------------------------------------------------------------

function bad(path: string, what: string): CurbfitError {
  return new CurbfitError("BAD_RECORD", `record field ${path} ${what}`, EDITED_HINT, {
    option: path,
  });
}

function isObject(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

/** The object at `path`, holding exactly `keys`. */
function fields(v: unknown, path: string, keys: readonly string[]): Record<string, unknown> {
  if (!isObject(v)) throw bad(path, `is ${show(v)}, not an object`);
  for (const key of keys) {
    if (!(key in v)) throw bad(`${path}.${key}`, "is missing");
  }
  for (const key of Object.keys(v)) {
    if (!keys.includes(key)) {
      throw bad(`${path}.${key}`, `is not a field of schema ${SCHEMA}`);
    }
  }
  return v;
}

function text(v: unknown, path: string): string {
  if (typeof v !== "string") throw bad(path, `is ${show(v)}, not text`);
  return v;
}

function flag(v: unknown, path: string): boolean {
  if (typeof v !== "boolean") throw bad(path, `is ${show(v)}, not true or false`);
  return v;
}

const NON_FINITE: Readonly<Record<string, number>> = {
  NaN: NaN,
  Infinity: Infinity,
  "-Infinity": -Infinity,
};

/** A number, or one of the strings "NaN", "Infinity", "-Infinity". */
function num(v: unknown, path: string): number {
  if (typeof v === "number") return v;
  if (typeof v === "string" && v in NON_FINITE) return NON_FINITE[v];
  throw bad(path, `is ${show(v)}, not a number`);
}

function integer(v: unknown, path: string): number {
  if (typeof v !== "number" || !Number.isSafeInteger(v)) {
    throw bad(path, `is ${show(v)}, not a whole number`);
  }
  return v;
}

function whole(v: unknown, path: string): number {
  const n = integer(v, path);
  if (n < 0) throw bad(path, `is ${n}, not a whole number >= 0`);
  return n;
}

function digest(v: unknown, path: string): string {
  const s = text(v, path);
  if (!/^[0-9a-f]{64}$/.test(s)) throw bad(path, `is ${show(s)}, not 64 lowercase hex digits`);
  return s;
}

function oneOf<T extends string>(v: unknown, path: string, options: readonly T[]): T {
  if (typeof v === "string" && (options as readonly string[]).includes(v)) return v as T;
  throw bad(path, `is ${show(v)}, not one of ${options.map((o) => JSON.stringify(o)).join(", ")}`);
}

function list<T>(v: unknown, path: string, item: (x: unknown, path: string) => T): T[] {
  if (!Array.isArray(v)) throw bad(path, `is ${show(v)}, not a list`);
  return v.map((x, i) => item(x, `${path}[${i}]`));
}

function nullable<T>(v: unknown, path: string, item: (x: unknown, path: string) => T): T | null {
  return v === null ? null : item(v, path);
}

/** Any JSON value (finite numbers only), copied. */
function json(v: unknown, path: string): Json {
  if (v === null || typeof v === "string" || typeof v === "boolean") return v;
  if (typeof v === "number" && Number.isFinite(v)) return v;
  if (Array.isArray(v)) return list(v, path, json);
  if (isObject(v)) {
    const out: Record<string, Json> = {};
    for (const [k, x] of Object.entries(v)) out[k] = json(x, `${path}.${k}`);
    return out;
  }
  throw bad(path, `is ${show(v)}, not a JSON value`);
}

function show(v: unknown): string {
  if (v === undefined) return "missing";
  const s = JSON.stringify(v) ?? String(v);
  return s.length > 40 ? `${s.slice(0, 37)}...` : s;
}
