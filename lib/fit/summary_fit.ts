/**
 * A `Fit` from an all-rows summary, for data that is not in memory (a file stream, a SQL
 * table). Same objective and conventions as `fit` (lib/fit/fit.ts):
 *   minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q (s_q w_q)²,
 * s_q the SD (divisor n) of design column q when standardizing, else 1; b never penalized.
 * It is solved from the summary's centered co-moments through one symmetric eigendecomposition
 * (lib/sweep/spectrum.ts) instead of QR with refinement on the rows, so it carries the summary's
 * rounding: agreement with the row-based exact fit is about cond² · 1e-16 relative (measured in
 * test/stream_test.ts), and `refinementSteps` is 0.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { LearnedTerm } from "../design/types.ts";
import type { Moments } from "../sweep/moments.ts";
import { decompose, solutionAt } from "../sweep/spectrum.ts";
import { Fit, type FitSpec, type FitSummary } from "./fit.ts";
import {
  isSparse,
  objectiveText,
  type Penalty,
  penaltyWeights,
  ridge,
  type RidgePenalty,
} from "./penalty.ts";

/** Largest condition number accepted at λ = 0 (as the row-based fit). */
const RANK_LIMIT = 1e15;

/**
 * The penalty of a fit or sweep from summaries (streams, SQL): ridge only for now; a lasso or
 * elastic net gets a clear error before any work is done.
 *
 * @example
 * ```ts
 * import { summaryPenalty } from "./summary_fit.ts";
 * console.log(summaryPenalty(undefined).kind); // "ridge"
 * ```
 */
export function summaryPenalty(penalty: Penalty | undefined): RidgePenalty {
  const chosen = penalty ?? ridge();
  if (!isSparse(chosen)) return chosen;
  throw new CurbfitError(
    "BAD_OPTION",
    `a sweep or fit from summaries (streams, SQL) takes a ridge penalty, not ${chosen.kind}`,
    "Load the rows into a table and use fit or sweep with lasso() / elasticNet() and alpha",
    { option: "penalty" },
  );
}

/**
 * Fits at `spec.lambda` from `all`, the summary of all rows over the design of `terms`
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
  const penalty = summaryPenalty(spec.penalty);
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
  const unit = decompose(all, { gamma: new Float64Array(p).fill(1), standardize, intercept });
  const eMax = unit.e.reduce((m, e) => Math.max(m, e), 0);
  const eMin = unit.e.reduce((m, e) => Math.min(m, e), Infinity);
  const condition = p === 0 ? 1 : eMin > 0 ? Math.sqrt(eMax / eMin) : Infinity;
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
