/**
 * The cross-validation engine, from summaries alone. Whatever holds the rows — memory, a file
 * stream, a SQL engine — supplies per-fold summaries (lib/sweep/moments.ts); this module
 * decomposes each training fold once, scores every λ on the held-out summary, and assembles the
 * curve. It never sees a row.
 *
 * Two families share the fold loop: ridge (one eigendecomposition per training fold, every λ at
 * O(p²)) and lasso / elastic net (per training fold the Gram form of its summary and a
 * warm-started coordinate-descent path over the α grid of the all-rows problem; the held-out MSE
 * of each α from the held-out summary). Curves run in ascending strength for both.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Moments } from "./moments.ts";
import {
  decompose,
  heldOutErrors,
  solutionAt,
  type Spectrum,
  type SpectrumOptions,
  trainingRss,
} from "./spectrum.ts";
import { type LambdaGrid, lambdaGrid } from "./grid.ts";
import { generalizedCrossValidation } from "./loo.ts";
import type { CurvePoint, ProgressListener } from "./sweep.ts";
import type { Steps } from "../common/steps.ts";
import {
  type AlphaGrid,
  alphaGrid,
  columnWeights,
  gramProblem,
  solutionDf,
  type SparsePath,
  sparsePath,
  type SparsePenalty,
} from "../sparse/mod.ts";
import { penaltyValue } from "../fit/sparse_fit.ts";

/** Per-fold summaries of one data set under one fold plan. */
export interface FoldSummarySource {
  /** All rows, in the base basis (terms learned on all rows). */
  readonly all: Moments;
  readonly repeats: number;
  readonly k: number;
  /** Summaries of folds 0..k−1 of repeat r, plus never-validated rows at index k. */
  buckets(r: number): readonly Moments[];
  /** Training and held-out summaries of fold f, in the basis learned on its training rows. */
  fold(
    r: number,
    f: number,
    buckets: readonly Moments[],
  ): { train: Moments; validation: Moments; where: string };
}

/** Fold errors for every λ, and the all-rows spectrum. */
export interface CrossValidation {
  readonly lambdas: readonly number[];
  readonly full: Spectrum;
  /** One array per fold (repeat-major), one entry per λ. */
  readonly foldMse: readonly Float64Array[];
  readonly foldTrainMse: readonly Float64Array[];
}

/**
 * Runs every fold of every repeat through the ridge spectrum and scores the λ grid, yielding
 * after each fold (drive it with runSteps or runStepsAsync from lib/common/steps.ts).
 *
 * @example
 * ```ts
 * import { bucketMoments, removeMoments } from "./moments.ts";
 * import { crossValidate } from "./engine.ts";
 * import { runSteps } from "../common/steps.ts";
 * const x = Float64Array.of(0, 1, 2, 3, 4, 5), y = Float64Array.of(1, 2.9, 5.2, 7, 8.8, 11.1);
 * const fold = Int32Array.of(0, 1, 0, 1, 0, 1);
 * const all = bucketMoments(x, 1, y, new Int32Array(6), 1)[0];
 * const cv = runSteps(crossValidate({
 *   all, repeats: 1, k: 2,
 *   buckets: () => bucketMoments(x, 1, y, fold, 3),
 *   fold: (_r, f, b) => ({ train: removeMoments(all, b[f]), validation: b[f], where: `fold ${f + 1}` }),
 * }, ["x"], { gamma: Float64Array.of(1), standardize: true, intercept: true }, [0.1, 1], () => {}));
 * console.log(cv.foldMse.length); // 2
 * ```
 */
export function* crossValidate(
  source: FoldSummarySource,
  names: readonly string[],
  options: SpectrumOptions,
  grid: LambdaGrid | undefined,
  report: ProgressListener,
): Steps<CrossValidation> {
  const full = decompose(source.all, options);
  checkScales(full, names, "all rows");
  const lambdas = lambdaGrid(grid, full.e);
  const foldMse: Float64Array[] = [];
  const foldTrainMse: Float64Array[] = [];
  yield* eachFold(source, report, ({ train, validation, where }) => {
    const sp = decompose(train, options);
    checkScales(sp, names, where);
    foldMse.push(heldOutErrors(sp, validation, lambdas));
    foldTrainMse.push(Float64Array.from(lambdas, (l) => trainingRss(sp, l) / train.count));
  });
  return { lambdas, full, foldMse, foldTrainMse };
}

/** How a sparse sweep reads its summaries and solves. */
export interface SparseOptions {
  readonly penalty: SparsePenalty;
  /**
   * γ_q per design column, the penalty's weights resolved from the columns' orders
   * (`penaltyWeights(penalty, orders)`, lib/fit/penalty.ts; the same for every fold). Default:
   * the penalty's own — all 1 without weights; `"rising"` / `"falling"` weights need it.
   */
  readonly gamma?: ArrayLike<number>;
  readonly standardize: boolean;
  readonly intercept: boolean;
  /** Largest scaled KKT violation accepted (default 10⁻⁷; lib/sparse/descent.ts). */
  readonly tolerance?: number;
}

/** Fold errors for every α (ascending), and the all-rows path. */
export interface SparseCrossValidation {
  /** The α grid in ascending order (the curve's order). */
  readonly alphas: readonly number[];
  readonly penalty: SparsePenalty;
  /** The all-rows path; `solutions` are in decreasing α order, as solved. */
  readonly full: SparsePath;
  /** One array per fold (repeat-major), one entry per α, ascending. */
  readonly foldMse: readonly Float64Array[];
  readonly foldTrainMse: readonly Float64Array[];
}

/**
 * Runs every fold through the lasso / elastic-net path over the α grid of the all-rows problem
 * (its α_max, so every fold is scored at the same α values), yielding after each fold. Every
 * path uses the same γ_q (`options.gamma`).
 *
 * @example
 * ```ts
 * import { bucketMoments, removeMoments } from "./moments.ts";
 * import { crossValidateSparse } from "./engine.ts";
 * import { runSteps } from "../common/steps.ts";
 * import { lasso } from "../sparse/mod.ts";
 * const x = Float64Array.of(0, 1, 2, 3, 4, 5), y = Float64Array.of(1, 2.9, 5.2, 7, 8.8, 11.1);
 * const fold = Int32Array.of(0, 1, 0, 1, 0, 1);
 * const all = bucketMoments(x, 1, y, new Int32Array(6), 1)[0];
 * const cv = runSteps(crossValidateSparse({
 *   all, repeats: 1, k: 2,
 *   buckets: () => bucketMoments(x, 1, y, fold, 3),
 *   fold: (_r, f, b) => ({ train: removeMoments(all, b[f]), validation: b[f], where: `fold ${f + 1}` }),
 * }, ["x"], { penalty: lasso(), standardize: true, intercept: true }, [0.1, 1], () => {}));
 * console.log(cv.alphas, cv.foldMse.length); // [0.1, 1] 2
 * ```
 */
export function* crossValidateSparse(
  source: FoldSummarySource,
  names: readonly string[],
  options: SparseOptions,
  grid: AlphaGrid | undefined,
  report: ProgressListener,
): Steps<SparseCrossValidation> {
  const { penalty, tolerance } = options;
  const read = { standardize: options.standardize, intercept: options.intercept, names };
  const problem = gramProblem(source.all, { ...read, where: "rows" });
  const gamma = columnWeights(penalty, problem.p, options.gamma);
  const descending = alphaGrid(problem, penalty, grid, gamma);
  const full = sparsePath(problem, penalty, { alphas: descending, gamma, tolerance });
  const foldMse: Float64Array[] = [];
  const foldTrainMse: Float64Array[] = [];
  yield* eachFold(source, report, ({ train, validation, where }) => {
    const fold = gramProblem(train, { ...read, where });
    const path = sparsePath(fold, penalty, { alphas: descending, gamma, tolerance, validation });
    foldMse.push(Float64Array.from(path.solutions, (s) => s.heldOutMse as number).reverse());
    foldTrainMse.push(Float64Array.from(path.solutions, (s) => s.trainMse).reverse());
  });
  return {
    alphas: [...descending].reverse(),
    penalty: full.penalty,
    full,
    foldMse,
    foldTrainMse,
  };
}

/**
 * The sparse curve: per α (ascending) the fold errors, mean and SE, and from the all-rows path
 * the training MSE, effective df (tr[(G_AA + α(1 − ρ)Γ_A)⁻¹ G_AA] over the active Gram block,
 * lib/sparse/df.ts: the nonzero count for the lasso), the nonzero count,
 * Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] (as budget) and the standardized coefficients. GCV and
 * closed-form LOO are null: they are ridge identities.
 *
 * @example
 * ```ts
 * import { sparseCurvePoints } from "./engine.ts";
 * // given `cv` from crossValidateSparse with K folds:  sparseCurvePoints(cv, K)
 * ```
 */
export function sparseCurvePoints(cv: SparseCrossValidation, k: number): CurvePoint[] {
  const solutions = [...cv.full.solutions].reverse();
  return cv.alphas.map((alpha, l) => {
    const errs = cv.foldMse.map((e) => e[l]);
    const sol = solutions[l];
    return {
      strength: alpha,
      cvMean: mean(errs),
      cvSe: standardError(errs, k),
      foldMse: errs,
      trainMse: sol.trainMse,
      foldTrainMse: mean(cv.foldTrainMse.map((e) => e[l])),
      df: solutionDf(sol),
      nonzero: sol.nonzero,
      budget: penaltyValue(cv.penalty.mix, sol.standardized, cv.full.gamma),
      gcv: null,
      loo: null,
      path: [...sol.standardized],
    };
  });
}

/** Every fold of every repeat in order: summaries, `visit`, a progress report and a yield. */
function* eachFold(
  source: FoldSummarySource,
  report: ProgressListener,
  visit: (fold: { train: Moments; validation: Moments; where: string }) => void,
): Steps<void> {
  const total = source.repeats * source.k;
  for (let r = 0; r < source.repeats; r++) {
    report({ stage: "summaries", done: r, total: source.repeats });
    const buckets = source.buckets(r);
    for (let f = 0; f < source.k; f++) {
      visit(source.fold(r, f, buckets));
      report({ stage: "folds", done: r * source.k + f + 1, total });
      yield;
    }
  }
}

/**
 * The curve: per λ the fold errors, their mean and SE (SD/√K), all-rows training MSE, df, C,
 * GCV, closed-form LOO when given, and the standardized coefficient path.
 *
 * @example
 * ```ts
 * import { curvePoints } from "./engine.ts";
 * // given `cv` from crossValidate with K folds:  curvePoints(cv, K, null)
 * ```
 */
export function curvePoints(
  cv: CrossValidation,
  k: number,
  loo: Float64Array | null,
): CurvePoint[] {
  const { full, lambdas } = cv;
  const gcv = generalizedCrossValidation(full, lambdas);
  return lambdas.map((lambda, l) => {
    const errs = cv.foldMse.map((e) => e[l]);
    const sol = solutionAt(full, lambda);
    return {
      strength: lambda,
      cvMean: mean(errs),
      cvSe: standardError(errs, k),
      foldMse: errs,
      trainMse: sol.rss / full.count,
      foldTrainMse: mean(cv.foldTrainMse.map((e) => e[l])),
      df: sol.df,
      budget: sol.budget,
      nonzero: sol.w.filter((w) => w !== 0).length,
      gcv: gcv[l],
      loo: loo ? loo[l] : null,
      path: Array.from(sol.w, (w, q) => w * full.scales[q]),
    };
  });
}

function checkScales(sp: Spectrum, names: readonly string[], where: string): void {
  sp.scales.forEach((s, q) => {
    if (!(s > 0) || !Number.isFinite(s)) {
      throw new CurbfitError(
        "CONSTANT_COLUMN",
        `design column ${names[q]} is constant over the ${where}, so it cannot be standardized`,
        "Use grouped or more folds so every level and value range appears in training, or drop the term",
        { option: "folds" },
      );
    }
  });
}

function mean(v: readonly number[]): number {
  return v.reduce((s, x) => s + x, 0) / v.length;
}

/** SD (divisor m − 1) of the m fold errors, over √K. NaN for a single fold. */
function standardError(v: readonly number[], k: number): number {
  if (v.length < 2) return NaN;
  const m = mean(v);
  const ss = v.reduce((s, x) => s + (x - m) ** 2, 0);
  return Math.sqrt(ss / (v.length - 1)) / Math.sqrt(k);
}
