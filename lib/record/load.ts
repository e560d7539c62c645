/**
 * Loading a record back into usable models, without refitting.
 *
 * Terms are rebuilt from their recipes (`termFromSpec`) and learn their parameters from a
 * *witness table*: a few rows whose numeric columns span exactly the recorded [min, max] of
 * `data.columns` and whose category columns hold exactly the recorded levels. The all-rows
 * learning the sweep did depends on nothing else (Legendre domains and the ranges that count
 * extrapolation are min/max; indicator levels are the table's levels), and every rebuilt
 * term's params and outputs are then checked against the record, so a mismatch is an error,
 * never a silently different model. Coefficients come from the record as written.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { LearnedTerm } from "../design/types.ts";
import { learnTerms, termFromSpec } from "../design/mod.ts";
import type { Column, Table } from "../table/types.ts";
import { Fit, type FitSummary, type Prediction, type TableInput } from "../fit/fit.ts";
import { objectiveText, ridge } from "../fit/penalty.ts";
import type { ColumnSummary } from "./fingerprint.ts";
import { canonicalJson } from "./json.ts";
import { parseRecord } from "./parse.ts";
import {
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
  type SparseModelSection,
} from "./schema.ts";
import { elasticNet, lasso, type SparsePenalty } from "../sparse/mod.ts";

/**
 * One loaded model.
 *
 * @example
 * ```ts
 * import type { LoadedModel } from "./load.ts";
 * const label = (m: LoadedModel) => `${m.name ?? "model"}: λ = ${m.fit.summary.strength}`;
 * ```
 */
export interface LoadedModel {
  /** The candidate's name in a comparison; null for a single sweep. */
  readonly name: string | null;
  /** The chosen model, as the sweep's all-rows refit wrote it. */
  readonly fit: Fit;
}

/**
 * A record loaded back: the checked document and its models, ready to predict.
 *
 * @example
 * ```ts
 * import type { LoadedRecord } from "./load.ts";
 * const predictAt = (loaded: LoadedRecord, x: number) => loaded.predict({ x: [x] }).values[0];
 * ```
 */
export interface LoadedRecord {
  /** The checked, frozen record. */
  readonly record: ModelChoiceRecord;
  /** Every model in the record, in record order. */
  readonly models: readonly LoadedModel[];
  /** The chosen model of a sweep, or the best candidate of a comparison. */
  readonly fit: Fit;
  /** Predictions of `fit` for new rows, with rows outside the learned ranges counted. */
  predict(data: Table | TableInput): Prediction;
}

/**
 * Loads a record (JSON text or a parsed record) into models that predict without refitting.
 * Errors: BAD_RECORD for anything `parseRecord` refuses, or terms that do not rebuild to the
 * recorded parameters.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { recordJson } from "./json.ts";
 * import { loadRecord } from "./load.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => Math.exp(v) + 0.05 * Math.sin(9 * i)) }, {
 *   target: "y", terms: [legendre("x", 5)], folds: { k: 5, seed: 3 },
 * });
 * const loaded = loadRecord(recordJson(s));
 * console.log(loaded.predict({ x: [0.5] }).values[0] === s.fit.predict({ x: [0.5] }).values[0]); // true
 * ```
 */
export function loadRecord(input: unknown): LoadedRecord {
  const record = parseRecord(input);
  const witness = witnessTable(record.data.columns);
  const models = record.models.map((m, i) => ({
    name: m.name,
    fit: modelFit(record, m, witness, `record.models[${i}]`),
  }));
  const chosen = record.comparison === null
    ? models[0]
    : models.find((m) => m.name === record.comparison!.best);
  if (chosen === undefined) {
    throw new CurbfitError(
      "BAD_RECORD",
      `record field record.comparison.best names ${
        JSON.stringify(record.comparison!.best)
      }, which is not a model of the record`,
      "Use the record exactly as curbfit wrote it",
      { option: "record.comparison.best" },
    );
  }
  const fit = chosen.fit;
  return Object.freeze({
    record,
    models: Object.freeze(models.map((m) => Object.freeze(m))),
    fit,
    predict: (data: Table | TableInput) => fit.predict(data),
  });
}

function modelFit(
  record: ModelChoiceRecord,
  m: ModelSection,
  witness: Table,
  path: string,
): Fit {
  const terms = rebuildTerms(m, witness, path);
  const f = m.final;
  const common = {
    target: record.target,
    n: f.n,
    names: [...f.names],
    orders: m.terms.flatMap((t) => t.orders),
  };
  const scaled = {
    intercept: f.intercept,
    coefficients: [...f.coefficients],
    standardized: {
      intercept: f.standardized.intercept,
      coefficients: [...f.standardized.coefficients],
    },
    standardize: m.standardize,
    hasIntercept: m.intercept,
    means: [...f.means],
    sds: [...f.sds],
    trainMse: f.trainMse,
    residualSd: f.residualSd,
    condition: f.condition,
  };
  const summary: FitSummary = deepFreeze(
    isSparseModel(m) ? sparseSummary(m, path, common, scaled) : {
      ...common,
      penalty: asRecordError(
        `${path}.penalty`,
        () => ridge({ weights: m.penalty.weights, exponent: m.penalty.exponent }),
      ),
      scale: "lambda",
      objective: objectiveText(ridge()),
      gamma: [...m.penalty.gamma],
      strength: m.final.lambda,
      budget: m.final.budget,
      df: m.final.df,
      nonzero: f.coefficients.filter((v) => v !== 0).length,
      ...scaled,
      refinementSteps: m.final.refinementSteps,
      descent: null,
    },
  );
  return new Fit(summary, terms);
}

/** The summary fields of a recorded lasso / elastic-net model. */
function sparseSummary(
  m: SparseModelSection,
  path: string,
  common: Pick<FitSummary, "target" | "n" | "names" | "orders">,
  scaled: Omit<FitSummary, SummaryOwn | "target" | "n" | "names" | "orders">,
): FitSummary {
  const penalty = asRecordError(`${path}.penalty`, () => recordedSparsePenalty(m.penalty));
  const f = m.final;
  return {
    ...common,
    penalty,
    scale: "alpha",
    objective: objectiveText(penalty),
    gamma: m.penalty.gamma === undefined ? f.names.map(() => 1) : [...m.penalty.gamma],
    strength: f.alpha,
    budget: f.penaltyValue,
    df: recordedSparseDf(m),
    nonzero: f.nonzero,
    ...scaled,
    refinementSteps: 0,
    descent: { ...f.descent, tolerance: m.penalty.tolerance },
  };
}

/**
 * The penalty a sparse model section records, made again with `lasso` / `elasticNet` (its
 * `weights` and `exponent` when recorded; every γ_q = 1 without them).
 *
 * @example
 * ```ts
 * import { recordedSparsePenalty } from "./load.ts";
 * console.log(recordedSparsePenalty({ kind: "lasso", mix: 1, weights: "rising", exponent: 2, tolerance: 1e-7 }));
 * ```
 */
export function recordedSparsePenalty(p: SparseModelSection["penalty"]): SparsePenalty {
  const weights = p.weights === undefined ? {} : { weights: p.weights, exponent: p.exponent };
  return p.kind === "lasso" ? lasso(weights) : elasticNet({ mix: p.mix, ...weights });
}

/**
 * The effective df of a recorded sparse model, which the record does not hold as a field: the
 * nonzero count for the lasso (exact); for the elastic net recovered from
 * residualSd = √(n·trainMse / (n − intercept − df)) (lib/fit/sparse_fit.ts), exact up to a few
 * rounding errors of n − intercept − df (about 10⁻¹⁵ of it), NaN when residualSd is not a
 * positive finite number.
 */
function recordedSparseDf(m: SparseModelSection): number {
  const f = m.final;
  if (m.penalty.mix === 1) return f.nonzero;
  if (!(f.residualSd > 0 && Number.isFinite(f.residualSd))) return NaN;
  return f.n - (m.intercept ? 1 : 0) - (f.n * f.trainMse) / (f.residualSd * f.residualSd);
}

/** Summary fields that differ between ridge and sparse models. */
type SummaryOwn =
  | "penalty"
  | "scale"
  | "objective"
  | "gamma"
  | "strength"
  | "budget"
  | "df"
  | "nonzero"
  | "refinementSteps"
  | "descent";

/** Learned terms rebuilt on the witness table and checked against the record. */
function rebuildTerms(m: ModelSection, witness: Table, path: string): readonly LearnedTerm[] {
  const learned = asRecordError(`${path}.terms`, () => {
    const terms = m.terms.map((t, j) => termFromSpec(t.spec, `${path}.terms[${j}].spec`));
    return learnTerms(terms, witness);
  });
  learned.forEach((t, j) => {
    const recorded = m.terms[j];
    const same = canonicalJson(t.params) === canonicalJson(recorded.params) &&
      canonicalJson(t.names) === canonicalJson(recorded.outputs) &&
      t.term.label === recorded.label;
    if (!same) {
      throw new CurbfitError(
        "BAD_RECORD",
        `term ${recorded.label} of ${path} rebuilds with params ${canonicalJson(t.params)} ` +
          `and outputs ${t.names.join(", ")}, not the recorded ${
            canonicalJson(recorded.params)
          } and ${recorded.outputs.join(", ")}`,
        "Use the record exactly as curbfit wrote it; verify(record, data) names what changed",
        { option: `${path}.terms[${j}]` },
      );
    }
  });
  return learned;
}

/**
 * A table whose every column has exactly the recorded summary: numeric columns take their
 * min in row 0 and their max in every other row; category columns hold each level once (then
 * the first level), keeping the recorded level list.
 */
function witnessTable(summaries: readonly ColumnSummary[]): Table {
  const nRows = Math.max(2, ...summaries.map((c) => (c.kind === "category" ? c.levels.length : 0)));
  const columns = new Map<string, Column>(summaries.map((c) => [
    c.name,
    c.kind === "number"
      ? {
        kind: "number",
        name: c.name,
        values: Float64Array.from({ length: nRows }, (_, i) => (i === 0 ? c.min : c.max)),
      }
      : {
        kind: "category",
        name: c.name,
        levels: [...c.levels],
        codes: Int32Array.from({ length: nRows }, (_, i) => (i < c.levels.length ? i : 0)),
      },
  ]));
  return {
    nRows,
    names: summaries.map((c) => c.name),
    columns,
    source: "record",
    lineOfRow: Int32Array.from({ length: nRows }, (_, i) => i + 1),
    missing: { policy: "error", droppedLines: [] },
  };
}

/** Runs `make`, turning a CurbfitError into BAD_RECORD for the record field `path`. */
function asRecordError<T>(path: string, make: () => T): T {
  try {
    return make();
  } catch (e) {
    if (!(e instanceof CurbfitError)) throw e;
    throw new CurbfitError(
      "BAD_RECORD",
      `record field ${path} cannot be rebuilt: ${e.message}`,
      "Use the record exactly as curbfit wrote it; verify(record, data) names what changed",
      { option: path },
    );
  }
}
