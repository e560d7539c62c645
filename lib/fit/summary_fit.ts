/**
 * A `Fit` from an all-rows summary, for data that is not in memory (a file stream, a SQL
 * table). Same objectives and conventions as `fit` (lib/fit/fit.ts).
 *
 * Ridge (`fitFromMoments`): minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q (s_q w_q)², s_q the SD
 * (divisor n) of design column q when standardizing, else 1; b never penalized. It is solved
 * from the summary's centered co-moments through one symmetric eigendecomposition
 * (lib/sweep/spectrum.ts) instead of QR with refinement on the rows, so it carries the summary's
 * rounding: agreement with the row-based exact fit is about cond² · 1e-16 relative (measured in
 * test/stream_test.ts), and `refinementSteps` is 0.
 *
 * Lasso / elastic net (`fitFromSparsePath`): minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² +
 * α [ρ Σ_q |w*_q| + ((1 − ρ)/2) Σ_q w*_q²]; the model is a solution of the all-rows
 * coordinate-descent path a sweep already solved from the summary, reported exactly as the
 * in-memory sweep reports its final model (lib/fit/sparse_fit.ts), `scale` "alpha".
 *
 * Both report the condition number from the co-moments' eigenvalues (unit weights), whose
 * relative accuracy is about cond² · 1e-16; the in-memory fit takes it from a QR of the rows
 * when it exceeds 10⁵.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { LearnedTerm } from "../design/types.ts";
import type { Moments } from "../sweep/moments.ts";
import { decompose, solutionAt } from "../sweep/spectrum.ts";
import type { SparsePath } from "../sparse/mod.ts";
import { Fit, type FitSpec, type FitSummary } from "./fit.ts";
import {
  isSparse,
  objectiveText,
  type Penalty,
  penaltyWeights,
  ridge,
  type RidgePenalty,
} from "./penalty.ts";
import { sparseSummary } from "./sparse_fit.ts";

/** Largest condition number accepted at λ = 0 (as the row-based fit). */
const RANK_LIMIT = 1e15;

/** `fitFromMoments` solves ridge only; a sparse model comes from its sweep's path. */
function ridgeOnly(penalty: Penalty | undefined): RidgePenalty {
  const chosen = penalty ?? ridge();
  if (!isSparse(chosen)) return chosen;
  throw new CurbfitError(
    "BAD_OPTION",
    `a fit at lambda from summaries takes a ridge penalty, not ${chosen.kind}`,
    "Sweep the sparse penalty over alphas (sweepStream, sweepSql), or load the rows into a " +
      "table and use fit with alpha",
    { option: "penalty" },
  );
}

/**
 * Fits ridge at `spec.lambda` from `all`, the summary of all rows over the design of `terms`
 * (design columns first, the target last).
 *
 * @example
 * ```ts
 * import { fitFromMoments } from "./summary_fit.ts";
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { learnTerms, legendre } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const x = [0, 1, 2, 3, 4], y = [1, 3.1, 4.9, 7.2, 9];
 * const terms = learnTerms([legendre("x", 1)], tableFromColumns({ x }));
 * const t = Float64Array.from(x, (v) => (v - 2) / 2);
 * const [all] = bucketMoments(t, 1, Float64Array.from(y), new Int32Array(5), 1);
 * const f = fitFromMoments(all, terms, { target: "y", terms: terms.map((l) => l.term), lambda: 0 });
 * console.log(f.summary.coefficients); // [ 4.02 ] (slope 2.01 per unit of x, on P1 = (x − 2)/2)
 * ```
 */
export function fitFromMoments(
  all: Moments,
  terms: readonly LearnedTerm[],
  spec: FitSpec,
): Fit {
  const names = terms.flatMap((t) => t.names);
  const orders = terms.flatMap((t) => t.orders);
  const p = names.length;
  const n = all.count;
  const standardize = spec.standardize ?? true;
  const intercept = spec.intercept ?? true;
  const penalty = ridgeOnly(spec.penalty);
  const gamma = penaltyWeights(penalty, orders);
  const lambda = spec.lambda ?? 0;
  if (spec.budget !== undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      "a fit from summaries takes lambda, not budget",
      "Give lambda; the sweep reports the budget C(λ) of every grid point",
      { option: "budget" },
    );
  }
  const sp = decompose(all, { gamma, standardize, intercept });
  sp.scales.forEach((s, q) => {
    if (!(s > 0) || !Number.isFinite(s)) {
      throw new CurbfitError(
        "CONSTANT_COLUMN",
        `design column ${names[q]} is constant over the ${n} rows, so it cannot be standardized`,
        "Remove the term that makes it, or check the data",
        { option: "terms" },
      );
    }
  });
  const condition = momentsCondition(all, p, standardize, intercept);
  if (lambda === 0 && (condition > RANK_LIMIT || n < p + (intercept ? 1 : 0))) {
    throw new CurbfitError(
      "RANK_DEFICIENT",
      `the design is rank deficient or too small at λ = 0 (condition number ${
        condition.toPrecision(3)
      }, ${n} rows, ${p} columns)`,
      "Use a penalty (lambda > 0), fewer terms or more rows",
      { option: "lambda" },
    );
  }
  const sol = solutionAt(sp, lambda);
  const w = Array.from(sol.w);
  const sds = Array.from(sp.scales);
  const means = standardize ? Array.from(all.mean.subarray(0, p)) : new Array<number>(p).fill(0);
  const residualDf = n - (intercept ? 1 : 0) - sol.df;
  const summary: FitSummary = deepFreeze({
    target: spec.target,
    n,
    names,
    orders,
    penalty,
    scale: "lambda",
    objective: objectiveText(penalty),
    gamma: Array.from(gamma),
    strength: lambda,
    budget: sol.budget,
    df: sol.df,
    nonzero: w.filter((v) => v !== 0).length,
    intercept: sol.intercept,
    coefficients: w,
    standardized: {
      intercept: sol.intercept + w.reduce((s, v, q) => s + v * means[q], 0),
      coefficients: w.map((v, q) => v * sds[q]),
    },
    standardize,
    hasIntercept: intercept,
    means,
    sds,
    trainMse: sol.rss / n,
    residualSd: residualDf > 0 ? Math.sqrt(sol.rss / residualDf) : NaN,
    condition,
    refinementSteps: 0,
    descent: null,
  });
  return new Fit(summary, terms);
}

/**
 * The final model of a lasso / elastic-net sweep from summaries: solution `index` of `path`,
 * the all-rows coordinate-descent path the sweep solved from `all` (the summary of all rows over
 * the design of `terms`). Its summary says `scale: "alpha"`; `descent` reports the solver's
 * KKT violation and duality gap at that α.
 *
 * @example
 * ```ts
 * import { fitFromSparsePath } from "./summary_fit.ts";
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem, lasso, sparsePath } from "../sparse/mod.ts";
 * import { learnTerms, legendre } from "../design/mod.ts";
 * import { tableFromColumns } from "../table/mod.ts";
 * const x = [0, 1, 2, 3, 4], y = [1, 3.1, 4.9, 7.2, 9];
 * const terms = learnTerms([legendre("x", 1)], tableFromColumns({ x }));
 * const t = Float64Array.from(x, (v) => (v - 2) / 2);
 * const [all] = bucketMoments(t, 1, Float64Array.from(y), new Int32Array(5), 1);
 * const path = sparsePath(gramProblem(all), lasso(), { alphas: [0.5] });
 * const f = fitFromSparsePath(all, terms, { target: "y" }, path, 0);
 * console.log(f.summary.scale, f.summary.strength, f.summary.nonzero); // "alpha" 0.5 1
 * ```
 */
export function fitFromSparsePath(
  all: Moments,
  terms: readonly LearnedTerm[],
  spec: Pick<FitSpec, "target">,
  path: SparsePath,
  index: number,
): Fit {
  const names = terms.flatMap((t) => t.names);
  const orders = terms.flatMap((t) => t.orders);
  const summary = sparseSummary(path, path.solutions[index], {
    target: spec.target,
    design: { names, orders },
    penalty: path.penalty,
    condition: momentsCondition(all, names.length, path.standardize, path.intercept),
  });
  return new Fit(summary, terms);
}

/**
 * √(e_max/e_min) of the standardized (or raw) centered co-moment matrix with unit weights: the
 * 2-norm condition number of the design, ∞ when singular, 1 without columns.
 */
function momentsCondition(
  all: Moments,
  p: number,
  standardize: boolean,
  intercept: boolean,
): number {
  if (p === 0) return 1;
  const unit = decompose(all, { gamma: new Float64Array(p).fill(1), standardize, intercept });
  const eMax = unit.e.reduce((m, e) => Math.max(m, e), 0);
  const eMin = unit.e.reduce((m, e) => Math.min(m, e), Infinity);
  return eMin > 0 ? Math.sqrt(eMax / eMin) : Infinity;
}
