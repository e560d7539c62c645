/**
 * `sweep`: cross-validated choice of λ for one model.
 *
 * Rows are read once: the design is built with terms learned on all rows, and each fold's rows
 * are summarized (count, means, centered co-moments). For fold f the training summary is the
 * whole minus fold f, mapped into the basis of terms learned on the training rows only
 * (Legendre domains, standardization — no leakage); one eigendecomposition per training fold
 * then serves every λ at O(p²) each, and the held-out error comes from the held-out summary.
 * The chosen λ is refit on all rows with the exact solver.
 *
 * With `penalty: lasso()` or `elasticNet({ mix })` the sweep runs over α (`alphas`, the 1/(2N)
 * convention; lib/sparse) instead of λ: per training fold a warm-started coordinate-descent
 * path over the α grid of the all-rows problem, scored on the held-out summary. The chosen model
 * is the all-rows path's solution at the chosen α (no exact refit: the exact refinement is for
 * quadratic penalties). GCV and closed-form leave-one-out are ridge identities and are null.
 * Every result says its `scale` ("lambda" or "alpha"); `strength` holds the λ or α value.
 *
 * Reported per λ: per-fold validation MSE, their mean, and the standard error
 * SE = SD/√K (SD over the K·R fold errors with divisor K·R − 1; with R repeats this treats the
 * R·K errors as one K-fold's spread — common practice); all-rows training MSE, df(λ), C(λ);
 * closed-form leave-one-out and GCV when computed.
 *
 * @module
 */
import { deepFreeze } from "../common/freeze.ts";
import { runSteps, runStepsAsync, type Steps } from "../common/steps.ts";
import type { Design, LearnedTerm } from "../design/types.ts";
import { buildDesign, learnsFromRows, learnTerms } from "../design/mod.ts";
import type { Table } from "../table/types.ts";
import { toTable } from "../table/mod.ts";
import { type FoldPlan, foldRows } from "../folds/mod.ts";
import { CurbfitError } from "../errors/error.ts";
import { type Fit, fitPrepared, type FitSpec, prepare, type TableInput } from "../fit/fit.ts";
import type { AlphaGrid } from "../sparse/mod.ts";
import {
  checkStrengthOptions,
  isSparse,
  penaltyWeights,
  ridge,
  type StrengthScale,
  strengthScale,
  strengthSymbol,
} from "../fit/penalty.ts";
import { bucketMoments, mergeMoments, type Moments, removeMoments } from "./moments.ts";
import { basisChange, changeMoments } from "./basis.ts";
import type { LambdaGrid } from "./grid.ts";
import { type Choice, chooseOnCurve, type SelectionRule } from "./select.ts";
import { type FoldRequest, planFolds } from "./folds.ts";
import { leaveOneOutErrors } from "./loo.ts";
import {
  crossValidate,
  crossValidateSparse,
  curvePoints,
  type FoldSummarySource,
  sparseCurvePoints,
} from "./engine.ts";
import {
  type SweepProvenance,
  sweepProvenance,
  type SweepSource,
  sweepSource,
} from "../record/provenance.ts";
import { sweepBundle, withDisplay } from "../views/display.ts";

/** A progress report: `done` of `total` steps of `stage`. */
export interface Progress {
  /**
   * What is running: reading rows into summaries, scoring folds, or refitting the chosen model
   * on all rows.
   */
  readonly stage: "summaries" | "folds" | "refit";
  /** Steps of this stage finished so far (0 when it starts). */
  readonly done: number;
  /** Steps in this stage (folds × repeats for "folds"; 1 otherwise). */
  readonly total: number;
  /** Candidate name, during `compare`. */
  readonly candidate?: string;
}

/** Receives progress reports; must return quickly. */
export type ProgressListener = (progress: Progress) => void;

/** Largest row count for which closed-form leave-one-out is computed by default. */
export const CLOSED_FORM_DEFAULT_ROWS = 100_000;

/** What to sweep: a fit spec without a strength, plus the grid, folds and rule. */
export interface SweepSpec extends Omit<FitSpec, "lambda" | "budget" | "alpha"> {
  /**
   * Ridge only: λ values, or bounds/count of an automatic log-spaced grid (default 100 points).
   */
  readonly lambdas?: LambdaGrid;
  /**
   * Lasso / elastic net only: α values, or the length and depth of an automatic path from the
   * all-rows α_max down (default 100 values; lib/sparse/grid.ts).
   */
  readonly alphas?: AlphaGrid;
  /** A fold plan, or how to make one (default 10-fold, seed 1). */
  readonly folds?: FoldPlan | FoldRequest;
  /** How to pick λ from the curve (default "min"). */
  readonly rule?: SelectionRule;
  /**
   * Closed-form leave-one-out error (O(n p (p + L))): true, false, or "auto" (default: when
   * n ≤ 100 000). GCV is always computed.
   */
  readonly closedForm?: boolean | "auto";
  /** Called as the sweep moves through its stages (see `Progress`); must return quickly. */
  readonly progress?: ProgressListener;
}

/** One grid point of the curve. */
export interface CurvePoint {
  /** Grid coordinate: ridge λ or sparse α (the result's `scale` says which). */
  readonly strength: number;
  /** Mean validation MSE over all folds (and repeats). */
  readonly cvMean: number;
  /** SD of the fold errors / √K. */
  readonly cvSe: number;
  /** Validation MSE of each fold, repeat-major (repeat 0 folds 0..K−1, then repeat 1, …). */
  readonly foldMse: readonly number[];
  /** Training MSE of the all-rows fit. */
  readonly trainMse: number;
  /** Mean training MSE over the folds' training sets. */
  readonly foldTrainMse: number;
  /**
   * Effective degrees of freedom of the all-rows fit, intercept not counted. Ridge:
   * Σ e_j/(e_j + λ). Sparse: Σ_j μ_j/(μ_j + α(1 − ρ)) over the eigenvalues μ_j of the active
   * block of the (standardized) Gram matrix (lib/sparse/df.ts) — the nonzero count for the lasso,
   * below it for the elastic net.
   */
  readonly df: number;
  /** Number of nonzero coefficients of the all-rows fit (every one, for ridge). */
  readonly nonzero: number;
  /** Ridge: C(λ) = Σ γ_q w*_q². Sparse: Σ γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] of the all-rows fit. */
  readonly budget: number;
  /** Generalized cross-validation error; null for sparse penalties (not computed). */
  readonly gcv: number | null;
  /** Closed-form leave-one-out MSE, or null when not computed (always null for sparse). */
  readonly loo: number | null;
  /** Standardized coefficients s_q·w_q of the all-rows fit (the shrinkage path). */
  readonly path: readonly number[];
}

/**
 * What every cross-validated sweep reports, wherever its rows live (memory, a stream, SQL).
 *
 * @example
 * ```ts
 * import type { CurveResult } from "./sweep.ts";
 * const chosenError = (r: CurveResult) => r.curve[r.chosen.index].cvMean;
 * ```
 */
export interface CurveResult {
  /** Name of the predicted column. */
  readonly target: string;
  /** Rows used (all folds together). */
  readonly n: number;
  /** Design column names, in coefficient order. */
  readonly names: readonly string[];
  /** Polynomial order of each design column. */
  readonly orders: readonly number[];
  /** Penalty weight γ_q of each design column (all 1 for sparse penalties). */
  readonly gamma: readonly number[];
  /** Whether columns were standardized with each training fold's own statistics. */
  readonly standardize: boolean;
  /** Whether an unpenalized intercept was fitted. */
  readonly intercept: boolean;
  /** Which convention `strength` values are on: ridge λ ("lambda") or sparse α ("alpha"). */
  readonly scale: StrengthScale;
  /** One point per grid value, in ascending strength. */
  readonly curve: readonly CurvePoint[];
  /** The grid point with the smallest mean CV error. */
  readonly minimum: Choice;
  /** The grid point the rule chose. */
  readonly chosen: Choice;
  /** Plain-language notes, e.g. the minimum sitting on an edge of the grid. */
  readonly notes: readonly string[];
  /**
   * The chosen model on all rows (ridge: refit with the exact solver; lasso / elastic net: the
   * all-rows coordinate-descent solution).
   */
  readonly fit: Fit;
}

/**
 * Everything an in-memory sweep found. Frozen. `fit` is refit on all rows with the exact
 * solver. In a notebook it shows its validation curve (a non-enumerable
 * `[Symbol.for("Jupyter.display")]` method; see lib/views/display.ts).
 */
export interface SweepResult extends CurveResult {
  /** The fold plan every grid point was scored on (its assignment is exposed for reuse). */
  readonly folds: FoldPlan;
  /** Data fingerprint and requests as given, for the model-choice record (lib/record). */
  readonly provenance: SweepProvenance;
}

/**
 * Sweeps λ over a grid with seeded cross-validation and refits the chosen model.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const y = x.map((v, i) => Math.cos(4 * v) + 0.1 * Math.sin(17 * i));
 * const s = sweep({ x, y }, { target: "y", terms: [legendre("x", 12)], folds: { k: 5, seed: 3 }, rule: "one-se" });
 * console.log(s.chosen.strength, s.fit.summary.df);
 * ```
 */
export function sweep(data: Table | TableInput, spec: SweepSpec): SweepResult {
  return runSteps(sweepSteps(data, spec));
}

/**
 * The same sweep, pausing on the event loop after each fold so progress reports can reach a
 * notebook while it runs. Numbers are identical to `sweep`.
 *
 * @example
 * ```ts
 * import { legendre, sweepAsync } from "../../mod.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = await sweepAsync({ x, y: x.map((v) => v * v) }, {
 *   target: "y", terms: [legendre("x", 4)], folds: { k: 3, seed: 1 }, progress: (p) => console.log(p),
 * });
 * ```
 */
export function sweepAsync(data: Table | TableInput, spec: SweepSpec): Promise<SweepResult> {
  return runStepsAsync(sweepSteps(data, spec));
}

function* sweepSteps(data: Table | TableInput, spec: SweepSpec): Steps<SweepResult> {
  const table = toTable(data);
  const plan = planFolds(table, spec.folds);
  checkSweepOptions(spec);
  const { y, terms, design } = prepare(table, spec);
  const source = sweepSource(table, spec.target, [spec.terms], spec.folds);
  return yield* sweepPrepared(table, spec, plan, terms, design, y, source);
}

/** The sweep on an already prepared design and plan (shared with `compare`), in steps. */
export function* sweepPrepared(
  table: Table,
  spec: SweepSpec,
  plan: FoldPlan,
  terms: readonly LearnedTerm[],
  design: Design,
  y: Float64Array,
  data: SweepSource,
): Steps<SweepResult> {
  const penalty = spec.penalty ?? ridge();
  const options = {
    gamma: penaltyWeights(penalty, design.orders),
    standardize: spec.standardize ?? true,
    intercept: spec.intercept ?? true,
  };
  const report = spec.progress ?? (() => {});
  const { n, p, hi } = design.block;
  const bucketsOf = (r: number) =>
    bucketMoments(hi, p, y, bucketOf(plan.assignment[r], plan.k), plan.k + 1);
  // Repeat 0's fold summaries also give the all-rows summary (Chan et al.'s merge), so rows are
  // read once per repeat and never once more.
  const first = bucketsOf(0);
  const all = mergeMoments(first, p + 1);
  const relearn = spec.terms.some(learnsFromRows);
  const source: FoldSummarySource = {
    all,
    repeats: plan.repeats,
    k: plan.k,
    buckets: (r) => (r === 0 ? first : bucketsOf(r)),
    fold: (r, f, buckets) =>
      relearn
        ? foldSummaries(table, spec, terms, all, buckets, plan, r, f)
        : sameBasisSummaries(all, buckets, plan, r, f),
  };
  let curve: CurvePoint[];
  let finalModel: (chosen: Choice) => Fit;
  if (isSparse(penalty)) {
    const sparse = { penalty, ...options, tolerance: spec.tolerance };
    const cv = yield* crossValidateSparse(source, design.names, sparse, spec.alphas, report);
    curve = sparseCurvePoints(cv, plan.k);
    // Curve index l is path solution L − 1 − l (the path runs in decreasing α).
    const last = curve.length - 1;
    finalModel = (c) =>
      fitPrepared({ ...spec, alpha: c.strength }, terms, design, y, {
        moments: all,
        sparse: { path: cv.full, index: last - c.index },
      });
  } else {
    const cv = yield* crossValidate(source, design.names, options, spec.lambdas, report);
    const closed = wantClosedForm(spec.closedForm, n);
    const loo = closed ? leaveOneOutErrors(cv.full, hi, y, cv.lambdas) : null;
    curve = curvePoints(cv, plan.k, loo);
    finalModel = (c) =>
      fitPrepared({ ...spec, lambda: c.strength }, terms, design, y, {
        moments: all,
        spectrum: cv.full,
      });
  }
  const scale = strengthScale(penalty);
  const { minimum, chosen } = chooseOnCurve(curve, spec.rule);
  report({ stage: "refit", done: 0, total: 1 });
  const model = finalModel(chosen);
  report({ stage: "refit", done: 1, total: 1 });
  return deepFreeze(withDisplay({
    target: spec.target,
    n,
    names: [...design.names],
    orders: [...design.orders],
    gamma: Array.from(options.gamma),
    standardize: options.standardize,
    intercept: options.intercept,
    scale,
    folds: plan,
    curve,
    minimum,
    chosen,
    notes: edgeNotes(minimum, curve.length, scale, scale === "alpha" ? spec.alphas : spec.lambdas),
    fit: model,
    provenance: sweepProvenance(data, spec.lambdas, spec.alphas),
  }, sweepBundle));
}

/**
 * Fold index per row, with never-validated rows (−1) in the extra bucket k; the assignment itself
 * when every row is validated.
 */
function bucketOf(assignment: Int32Array, k: number): Int32Array {
  if (assignment.every((f) => f >= 0)) return assignment;
  return assignment.map((f) => (f < 0 ? k : f));
}

/** Fold f's summaries when no term learns from rows: the all-rows basis is every fold's basis. */
function sameBasisSummaries(
  all: Moments,
  buckets: readonly Moments[],
  plan: FoldPlan,
  r: number,
  f: number,
): { train: Moments; validation: Moments; where: string } {
  return {
    train: removeMoments(all, buckets[f]),
    validation: buckets[f],
    where: foldWhere(plan, r, f),
  };
}

function foldWhere(plan: FoldPlan, r: number, f: number): string {
  return `training rows of fold ${f + 1}` + (plan.repeats > 1 ? ` (repeat ${r + 1})` : "");
}

/** Training and held-out summaries of fold f, in the basis of terms learned on its training rows. */
function foldSummaries(
  table: Table,
  spec: SweepSpec,
  terms: readonly LearnedTerm[],
  all: Moments,
  buckets: readonly Moments[],
  plan: FoldPlan,
  r: number,
  f: number,
): { train: Moments; validation: Moments; where: string } {
  const where = foldWhere(plan, r, f);
  const rows = foldRows(plan, r, f);
  const foldTerms = learnTerms(spec.terms, table, rows.training);
  const change = basisChange(terms, foldTerms);
  if (change !== undefined) {
    return {
      train: changeMoments(removeMoments(all, buckets[f]), change),
      validation: changeMoments(buckets[f], change),
      where,
    };
  }
  const rebuilt = buildDesign(foldTerms, table);
  const side = new Int32Array(table.nRows);
  side.fill(1);
  for (const i of rows.training) side[i] = 0;
  const target = (table.columns.get(spec.target) as { values: Float64Array }).values;
  const [train, validation] = bucketMoments(rebuilt.block.hi, rebuilt.p, target, side, 2);
  return { train, validation, where };
}

function wantClosedForm(option: boolean | "auto" | undefined, n: number): boolean {
  if (option === undefined || option === "auto") return n <= CLOSED_FORM_DEFAULT_ROWS;
  return option;
}

/**
 * A note when the smallest CV error sits on an end of the grid (shared with the stream and SQL
 * sweeps): which option widens the grid, or, at the top of an automatic α path, that every
 * coefficient is zero there.
 *
 * @example
 * ```ts
 * import { edgeNotes } from "./sweep.ts";
 * const minimum = { rule: "min" as const, index: 0, strength: 0.001 };
 * console.log(edgeNotes(minimum, 10, "lambda", undefined)); // [ "… lower lambdas.min …" ]
 * ```
 */
export function edgeNotes(
  minimum: Choice,
  count: number,
  scale: StrengthScale,
  grid: LambdaGrid | AlphaGrid | undefined,
): string[] {
  if (count < 2) return [];
  const explicit = Array.isArray(grid);
  const at = `${strengthSymbol(scale)} on the grid (${minimum.strength.toPrecision(3)})`;
  if (minimum.index === 0) {
    const widen = explicit
      ? "add smaller values"
      : scale === "alpha"
      ? "lower alphas.ratio"
      : "lower lambdas.min";
    return [
      `The smallest CV error is at the smallest ${at}; ${widen} to see whether it keeps falling.`,
    ];
  }
  if (minimum.index === count - 1) {
    if (scale === "alpha" && !explicit) {
      return [
        `The smallest CV error is at the largest ${at}, where every coefficient is zero: ` +
        "the terms do not predict better than the mean on these folds.",
      ];
    }
    const widen = explicit ? "add larger values" : "raise lambdas.max";
    return [
      `The smallest CV error is at the largest ${at}; ${widen} to see whether it keeps falling.`,
    ];
  }
  return [];
}

/**
 * Rejects what a sweep cannot honour, naming the option (with `prefix`, e.g. `candidates[1].`):
 * a fixed strength (`lambda`, `budget`, `alpha` — a sweep chooses it), strength options of the
 * other convention, and closed-form leave-one-out with a sparse penalty.
 *
 * @example
 * ```ts
 * import { checkSweepOptions } from "./sweep.ts";
 * import { column } from "../design/mod.ts";
 * try {
 *   checkSweepOptions({ target: "y", terms: [column("x")], lambda: 2 } as never);
 * } catch (e) {
 *   console.log((e as Error).message); // lambda fixes the strength, but a sweep chooses it …
 * }
 * ```
 */
export function checkSweepOptions(spec: SweepSpec, prefix = ""): void {
  const penalty = spec.penalty ?? ridge();
  const given = spec as unknown as Record<string, unknown>;
  checkStrengthOptions(penalty, given, prefix);
  const grid = isSparse(penalty) ? "alphas" : "lambdas";
  for (const option of ["lambda", "budget", "alpha"]) {
    if (given[option] === undefined) continue;
    throw new CurbfitError(
      "BAD_OPTION",
      `${option} fixes the strength, but a sweep chooses it by cross-validation`,
      option === "budget"
        ? "A sweep scores λ values (lambdas); to fit for a budget C use fit() with budget"
        : `To score given values pass ${grid}: [${String(given[option])}, …]; to fit at one ` +
          "strength use fit()",
      { option: prefix + option },
    );
  }
  if (isSparse(penalty) && spec.closedForm === true) {
    throw new CurbfitError(
      "BAD_OPTION",
      `closedForm was asked for with a ${penalty.kind} penalty, but closed-form leave-one-out ` +
        "is a ridge identity",
      "Leave closedForm out; the sparse curve reports K-fold errors only",
      { option: prefix + "closedForm" },
    );
  }
}
