/**
 * Building a model-choice record from a sweep or a comparison. Every object is written
 * literally, key by key, so the key order is fixed by construction.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { SparsePenalty } from "../sparse/mod.ts";
import { isSparse } from "../fit/penalty.ts";
import type { FitSummary } from "../fit/fit.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { Json } from "../design/types.ts";
import { assignmentDigest, type FoldPlan } from "../folds/mod.ts";
import type { SweepResult } from "../sweep/sweep.ts";
import type { ComparisonResult } from "../sweep/compare.ts";
import type { DataSummary } from "./fingerprint.ts";
import {
  type ComparisonSection,
  type CvSection,
  type DataSection,
  type FinalSection,
  type FoldsSection,
  type GridSection,
  type ModelChoiceRecord,
  type ModelSection,
  type RidgeModelSection,
  SCHEMA,
  type SoftwareSection,
  type SparseModelSection,
} from "./schema.ts";
import {
  CAUTIONS,
  COMPARISON_CRITERION,
  CV_DEFINITIONS,
  objectiveLines,
  ruleDefinition,
  SPARSE_COMPARISON_CRITERION,
  sparseCvDefinitions,
  sparseObjectiveLines,
} from "./texts.ts";
import config from "../../deno.json" with { type: "json" };
import { recordBundle, withDisplay } from "../views/display.ts";

/** Options of `recordOf`. */
export interface RecordOptions {
  /** Write this creation time (ISO 8601, UTC) into `created`; by default `created` is null. */
  readonly createdAt?: Date;
}

/**
 * The model-choice record of a sweep or a comparison: a frozen plain object in schema
 * `curbfit.model-choice/1` (lib/record/README.md). The same result gives a record whose
 * `recordJson` text is byte-identical; no clock is read unless `createdAt` is given.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { recordOf } from "./build.ts";
 * import { modelStrengths } from "./schema.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const y = x.map((v, i) => Math.sin(3 * v) + 0.05 * Math.cos(7 * i));
 * const s = sweep({ x, y }, { target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 4 } });
 * const record = recordOf(s);
 * console.log(record.schema, record.folds.seed, modelStrengths(record.models[0]).chosen === s.chosen.strength);
 * ```
 */
export function recordOf(
  result: SweepResult | ComparisonResult,
  options: RecordOptions = {},
): ModelChoiceRecord {
  const comparison = isComparison(result) ? result : null;
  const sweeps = comparison ? comparison.candidates.map((c) => c.sweep) : [result as SweepResult];
  const names = comparison ? comparison.candidates.map((c) => c.name) : [null];
  const first = sweeps[0];
  return deepFreeze(withDisplay({
    schema: SCHEMA,
    kind: comparison ? "comparison" : "sweep",
    created: createdField(options.createdAt),
    software: softwareSection(),
    target: first.target,
    data: dataSection(first.provenance.data),
    folds: foldsSection(first.folds, first.provenance),
    models: sweeps.map((s, i) => modelSection(s, names[i])),
    comparison: comparison ? comparisonSection(comparison) : null,
    cautions: [...CAUTIONS],
  }, recordBundle));
}

function isComparison(result: SweepResult | ComparisonResult): result is ComparisonResult {
  return "candidates" in result && Array.isArray(result.candidates);
}

function createdField(createdAt: Date | undefined): string | null {
  if (createdAt === undefined) return null;
  if (!(createdAt instanceof Date) || Number.isNaN(createdAt.getTime())) {
    throw new CurbfitError(
      "BAD_OPTION",
      `createdAt is ${String(createdAt)}, not a valid Date`,
      "Pass createdAt: new Date(), or leave it out for a record without a creation time",
      { option: "createdAt" },
    );
  }
  return createdAt.toISOString();
}

/**
 * The library and runtime versions of this process.
 *
 * @example
 * ```ts
 * import { softwareSection } from "./build.ts";
 * console.log(softwareSection().library); // curbfit
 * ```
 */
export function softwareSection(): SoftwareSection {
  const deno = (globalThis as { Deno?: { version?: Record<string, string> } }).Deno?.version;
  return {
    library: config.name,
    version: config.version,
    runtime: deno ? "deno" : "unknown",
    runtimeVersion: deno?.deno ?? "unknown",
    v8: deno?.v8 ?? "unknown",
    typescript: deno?.typescript ?? "unknown",
  };
}

/**
 * The data section from a data summary (copied, key order fixed).
 *
 * @example
 * ```ts
 * import { dataSection } from "./build.ts";
 * import { summarizeData } from "./fingerprint.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * console.log(dataSection(summarizeData(tableFromColumns({ y: [1, 2] }), ["y"])).rows); // 2
 * ```
 */
export function dataSection(data: DataSummary): DataSection {
  return {
    source: data.source,
    ...(data.fieldSeparator === undefined ? {} : { fieldSeparator: data.fieldSeparator }),
    rows: data.rows,
    columns: data.columns.map((c) =>
      c.kind === "number"
        ? { name: c.name, kind: c.kind, min: c.min, max: c.max }
        : { name: c.name, kind: c.kind, levels: [...c.levels] }
    ),
    missing: { policy: data.missing.policy, droppedLines: [...data.missing.droppedLines] },
    encoding: data.encoding,
    sha256: data.sha256,
  };
}

/**
 * The folds section of a plan; `groups` names the column a grouped plan was made from.
 *
 * @example
 * ```ts
 * import { foldsSection } from "./build.ts";
 * import { kFoldPlan } from "../folds/mod.ts";
 * console.log(foldsSection(kFoldPlan(10, { k: 5, seed: 9 }), { groups: null }).seed); // 9
 * ```
 */
export function foldsSection(
  plan: FoldPlan,
  provenance: { readonly groups: string | null },
): FoldsSection {
  const groupColumn = plan.scheme === "grouped-k-fold" ? provenance.groups : null;
  const rebuildable = plan.scheme !== "explicit" &&
    !(plan.scheme === "grouped-k-fold" && groupColumn === null);
  return {
    scheme: plan.scheme,
    prng: plan.prng,
    seed: plan.seed,
    k: plan.k,
    repeats: plan.repeats,
    fraction: plan.fraction,
    groupColumn,
    groupCount: plan.groupCount,
    rows: plan.nRows,
    assignmentSha256: assignmentDigest(plan),
    assignment: rebuildable ? null : plan.assignment.map((a) => Array.from(a)),
  };
}

/**
 * The section of one swept model (`name` null for a single sweep).
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { modelSection } from "./build.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v * v + (v % 3)) }, { target: "y", terms: [legendre("x", 3)], folds: { k: 4, seed: 2 } });
 * console.log(modelSection(s, null).final.names); // [ "P1(x)", "P2(x)", "P3(x)" ]
 * ```
 */
export function modelSection(s: SweepResult, name: string | null): ModelSection {
  const penalty = s.fit.summary.penalty;
  if (isSparse(penalty)) return sparseModelSection(s, name, penalty);
  return {
    name,
    terms: termSections(s),
    standardize: s.standardize,
    intercept: s.intercept,
    penalty: {
      kind: penalty.kind,
      weights: typeof penalty.weights === "string" ? penalty.weights : [...penalty.weights],
      exponent: penalty.exponent,
      gamma: [...s.gamma],
    },
    objective: objectiveLines(penalty, s.standardize, s.intercept),
    grid: gridSection(s),
    closedForm: s.curve[0].loo !== null,
    cv: cvSection(s),
    choice: {
      rule: s.chosen.rule,
      definition: ruleDefinition(s.chosen.rule),
      index: s.chosen.index,
      lambda: s.chosen.strength,
      minimum: { index: s.minimum.index, lambda: s.minimum.strength },
      notes: [...s.notes],
    },
    final: finalSection(s),
  } satisfies RidgeModelSection;
}

function termSections(s: SweepResult): ModelSection["terms"] {
  return s.fit.terms.map((t) => ({
    label: t.term.label,
    spec: copyJson(t.term.spec),
    params: copyJson(t.params),
    outputs: [...t.names],
    orders: [...t.orders],
  }));
}

/** The section of a lasso / elastic-net sweep: keys `alpha`, no ridge-only columns. */
function sparseModelSection(
  s: SweepResult,
  name: string | null,
  penalty: SparsePenalty,
): SparseModelSection {
  const f = s.fit.summary;
  const descent = f.descent;
  if (descent === null) {
    throw new CurbfitError(
      "BAD_OPTION",
      `${name === null ? "the sweep" : `candidate ${name}`} has a ${penalty.kind} penalty but ` +
        "no coordinate-descent report",
      "Record the result of sweep or compare as it was returned",
      { option: "penalty" },
    );
  }
  const request = s.provenance.alphas;
  const column = (pick: (c: SweepResult["curve"][number]) => number) => s.curve.map(pick);
  return {
    name,
    terms: termSections(s),
    standardize: s.standardize,
    intercept: s.intercept,
    penalty: {
      kind: penalty.kind,
      mix: penalty.mix,
      ...(penalty.weights === undefined || penalty.weights === "equal" ? {} : {
        weights: typeof penalty.weights === "string" ? penalty.weights : [...penalty.weights],
        exponent: penalty.exponent ?? 1,
        gamma: [...s.gamma],
      }),
      tolerance: descent.tolerance,
    },
    objective: sparseObjectiveLines(penalty, s.standardize, s.intercept),
    grid: {
      kind: Array.isArray(request) ? "explicit" : "automatic",
      request: Array.isArray(request) ? null : {
        count: (request as { count?: number } | null)?.count ?? null,
        ratio: (request as { ratio?: number } | null)?.ratio ?? null,
      },
      values: column((c) => c.strength),
    },
    cv: {
      definitions: sparseCvDefinitions(penalty),
      alpha: column((c) => c.strength),
      cvMean: column((c) => c.cvMean),
      cvSe: column((c) => c.cvSe),
      trainMse: column((c) => c.trainMse),
      foldTrainMse: column((c) => c.foldTrainMse),
      nonzero: column((c) => c.nonzero),
      penaltyValue: column((c) => c.budget),
      foldMse: s.curve.map((c) => [...c.foldMse]),
      path: s.curve.map((c) => [...c.path]),
    },
    choice: {
      rule: s.chosen.rule,
      definition: ruleDefinition(s.chosen.rule, "alpha"),
      index: s.chosen.index,
      alpha: s.chosen.strength,
      minimum: { index: s.minimum.index, alpha: s.minimum.strength },
      notes: [...s.notes],
    },
    final: {
      n: f.n,
      alpha: f.strength,
      penaltyValue: f.budget,
      nonzero: f.nonzero,
      ...fittedNumbers(f),
      descent: {
        passes: descent.passes,
        converged: descent.converged,
        violation: descent.violation,
        gap: descent.gap,
      },
    },
  };
}

function gridSection(s: SweepResult): GridSection {
  const request = s.provenance.lambdas;
  const values = s.curve.map((c) => c.strength);
  if (Array.isArray(request)) return { kind: "explicit", request: null, values };
  const auto = (request ?? {}) as { count?: number; min?: number; max?: number };
  return {
    kind: "automatic",
    request: { count: auto.count ?? null, min: auto.min ?? null, max: auto.max ?? null },
    values,
  };
}

function cvSection(s: SweepResult): CvSection {
  const column = (pick: (c: SweepResult["curve"][number]) => number) => s.curve.map(pick);
  return {
    definitions: [...CV_DEFINITIONS],
    lambda: column((c) => c.strength),
    cvMean: column((c) => c.cvMean),
    cvSe: column((c) => c.cvSe),
    trainMse: column((c) => c.trainMse),
    foldTrainMse: column((c) => c.foldTrainMse),
    df: column((c) => c.df),
    budget: column((c) => c.budget),
    gcv: column((c) => c.gcv as number), /* ridge sweeps: always a number */
    loo: s.curve[0].loo === null ? null : column((c) => c.loo as number),
    foldMse: s.curve.map((c) => [...c.foldMse]),
    path: s.curve.map((c) => [...c.path]),
  };
}

function finalSection(s: SweepResult): FinalSection {
  const f = s.fit.summary;
  return {
    n: f.n,
    lambda: f.strength,
    budget: f.budget,
    df: f.df,
    ...fittedNumbers(f),
    refinementSteps: f.refinementSteps,
  };
}

/**
 * The fitted numbers every final section holds, in record key order (the caller puts the strength
 * and size keys before them and the solver's report after).
 */
function fittedNumbers(f: FitSummary) {
  return {
    names: [...f.names],
    intercept: f.intercept,
    coefficients: [...f.coefficients],
    standardized: {
      intercept: f.standardized.intercept,
      coefficients: [...f.standardized.coefficients],
    },
    means: [...f.means],
    sds: [...f.sds],
    trainMse: f.trainMse,
    residualSd: f.residualSd,
    condition: f.condition,
  };
}

/**
 * The comparison section of a comparison result.
 *
 * @example
 * ```ts
 * import { compare, legendre } from "../../mod.ts";
 * import { comparisonSection } from "./build.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const y = x.map((v, i) => v * v + 0.05 * Math.sin(11 * i));
 * const c = compare({ x, y }, [
 *   { name: "line", terms: [legendre("x", 1)], lambdas: [0] },
 *   { name: "cubic", terms: [legendre("x", 3)], lambdas: [0, 1] },
 * ], { target: "y", folds: { k: 5, seed: 1 } });
 * console.log(comparisonSection(c).best === c.best); // true
 * ```
 */
export function comparisonSection(c: ComparisonResult): ComparisonSection {
  const sparse = c.candidates.some((o) => o.sweep.scale === "alpha");
  return {
    best: c.best,
    criterion: sparse ? SPARSE_COMPARISON_CRITERION : COMPARISON_CRITERION,
    candidates: c.candidates.map((o) => ({
      name: o.name,
      ...(o.sweep.scale === "alpha" ? { alpha: o.strength } : { lambda: o.strength }),
      cvMean: o.cvMean,
      cvSe: o.cvSe,
      versusBest: o.versusBest === null ? null : {
        mean: o.versusBest.mean,
        se: o.versusBest.se,
        indistinguishable: o.versusBest.indistinguishable,
      },
    })),
    verdict: [...c.verdict],
  };
}

/** A deep copy of a JSON value (insertion order kept), so freezing never reaches caller objects. */
function copyJson(value: Json): Json {
  if (Array.isArray(value)) return value.map(copyJson);
  if (value !== null && typeof value === "object") {
    const out: Record<string, Json> = {};
    for (const [k, v] of Object.entries(value)) out[k] = copyJson(v as Json);
    return out;
  }
  return value;
}
