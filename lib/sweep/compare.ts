/**
 * `compare`: several candidate models swept on the identical fold plan, so their fold errors are
 * paired. Each candidate is reported at its own chosen λ with CV error ± SE, and against the
 * best candidate by the paired per-fold differences d_f = err_f(candidate) − err_f(best):
 * mean ± SE (SE = SD(d)/√K, the sweep's convention). Two candidates are called
 * indistinguishable when |mean d| ≤ 2·SE(d) (a rough 95% band; common practice, and fold errors
 * are correlated, so treat it as a screen, not a test).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import { runSteps, runStepsAsync, type Steps } from "../common/steps.ts";
import type { Table } from "../table/types.ts";
import { toTable } from "../table/mod.ts";
import type { FoldPlan } from "../folds/mod.ts";
import { prepare, type TableInput } from "../fit/fit.ts";
import {
  checkSweepOptions,
  type ProgressListener,
  sweepPrepared,
  type SweepResult,
  type SweepSpec,
} from "./sweep.ts";
import { type FoldRequest, planFolds } from "./folds.ts";
import type { SelectionRule } from "./select.ts";
import { sweepSource } from "../record/provenance.ts";
import { comparisonBundle, withDisplay } from "../views/display.ts";
import { strengthSymbol } from "../fit/penalty.ts";

/** A candidate: a name and the parts of a sweep spec that differ between candidates. */
export interface Candidate extends Omit<SweepSpec, "target" | "folds" | "progress"> {
  /** Label used in verdicts, charts and the record; non-blank and distinct among candidates. */
  readonly name: string;
}

/** Settings shared by every candidate. */
export interface CompareOptions {
  /** Name of the response column, the same for every candidate. */
  readonly target: string;
  /** One plan for all candidates (default 10-fold, seed 1). */
  readonly folds?: FoldPlan | FoldRequest;
  /** Rule for candidates that do not set their own (default "min"). */
  readonly rule?: SelectionRule;
  /** Receives progress reports, each tagged with the `candidate` being swept. */
  readonly progress?: ProgressListener;
}

/** Paired per-fold difference to the best candidate. */
export interface PairedDifference {
  /** Mean over all folds (and repeats) of d_f = err_f(candidate) − err_f(best); MSE units. */
  readonly mean: number;
  /** SD(d)/√K, K the fold count of the plan (the sweep's SE convention). */
  readonly se: number;
  /** |mean| ≤ 2·se. */
  readonly indistinguishable: boolean;
}

/** One candidate's outcome. */
export interface CandidateOutcome {
  /** The candidate's `name`, as given. */
  readonly name: string;
  /** The candidate's full sweep on the shared fold plan. */
  readonly sweep: SweepResult;
  /** The chosen strength, on this candidate's own scale (`sweep.scale`: ridge λ or sparse α). */
  readonly strength: number;
  /** Mean validation MSE over all folds (and repeats) at the chosen strength. */
  readonly cvMean: number;
  /** Standard error of `cvMean`: SD of the fold errors / √K. */
  readonly cvSe: number;
  /** Fold errors at the chosen strength, repeat-major. */
  readonly foldMse: readonly number[];
  /** Against the best candidate; null for the best itself. */
  readonly versusBest: PairedDifference | null;
}

/**
 * The comparison. Frozen. In a notebook it shows the comparison chart (a non-enumerable
 * `[Symbol.for("Jupyter.display")]` method; see lib/views/display.ts).
 */
export interface ComparisonResult {
  /** Name of the response column. */
  readonly target: string;
  /** The one fold plan every candidate was scored on. */
  readonly folds: FoldPlan;
  /** One outcome per candidate, in the order the candidates were given. */
  readonly candidates: readonly CandidateOutcome[];
  /** Name of the candidate with the lowest CV error at its chosen λ. */
  readonly best: string;
  /** One plain sentence per candidate. */
  readonly verdict: readonly string[];
}

/**
 * Sweeps every candidate on the same folds and compares them pairwise with the best.
 *
 * @example
 * ```ts
 * import { compare, legendre, ridge } from "../../mod.ts";
 * const x = Array.from({ length: 60 }, (_, i) => i / 59);
 * const y = x.map((v, i) => v * v + 0.05 * Math.sin(31 * i));
 * const c = compare({ x, y }, [
 *   { name: "quadratic, no penalty", terms: [legendre("x", 2)], lambdas: [0] },
 *   { name: "degree 10, weight decay", terms: [legendre("x", 10)], rule: "one-se" },
 * ], { target: "y", folds: { k: 5, seed: 11 } });
 * console.log(c.best, c.verdict);
 * ```
 */
export function compare(
  data: Table | TableInput,
  candidates: readonly Candidate[],
  options: CompareOptions,
): ComparisonResult {
  return runSteps(compareSteps(data, candidates, options));
}

/**
 * The same comparison, pausing on the event loop after each fold so progress reports can reach a
 * notebook while it runs. Numbers are identical to `compare`.
 *
 * @example
 * ```ts
 * import { column, compareAsync } from "../../mod.ts";
 * const data = { x: [1, 2, 3, 4, 5, 6], z: [2, 1, 2, 1, 2, 1], y: [1.2, 1.9, 3.2, 3.8, 5.1, 6.2] };
 * const c = await compareAsync(data, [
 *   { name: "x", terms: [column("x")] }, { name: "z", terms: [column("z")] },
 * ], { target: "y", folds: { k: 3, seed: 1 } });
 * ```
 */
export function compareAsync(
  data: Table | TableInput,
  candidates: readonly Candidate[],
  options: CompareOptions,
): Promise<ComparisonResult> {
  return runStepsAsync(compareSteps(data, candidates, options));
}

function* compareSteps(
  data: Table | TableInput,
  candidates: readonly Candidate[],
  options: CompareOptions,
): Steps<ComparisonResult> {
  checkCandidates(candidates);
  candidates.forEach((c, i) =>
    checkSweepOptions({ ...c, target: options.target }, `candidates[${i}].`)
  );
  const table = toTable(data);
  const plan = planFolds(table, options.folds);
  const source = sweepSource(table, options.target, candidates.map((c) => c.terms), options.folds);
  const sweeps: SweepResult[] = [];
  for (const c of candidates) {
    const spec: SweepSpec = {
      ...c,
      target: options.target,
      rule: c.rule ?? options.rule,
      progress: options.progress && ((p) => options.progress!({ ...p, candidate: c.name })),
    };
    const { y, terms, design } = prepare(table, spec);
    sweeps.push(yield* sweepPrepared(table, spec, plan, terms, design, y, source));
  }
  const outcomes = sweeps.map((s, i) => {
    const point = s.curve[s.chosen.index];
    return { name: candidates[i].name, sweep: s, point };
  });
  const bestIndex = outcomes.reduce(
    (b, o, i) => (o.point.cvMean < outcomes[b].point.cvMean ? i : b),
    0,
  );
  const best = outcomes[bestIndex];
  const results: CandidateOutcome[] = outcomes.map((o, i) => ({
    name: o.name,
    sweep: o.sweep,
    strength: o.point.strength,
    cvMean: o.point.cvMean,
    cvSe: o.point.cvSe,
    foldMse: o.point.foldMse,
    versusBest: i === bestIndex
      ? null
      : pairedDifference(o.point.foldMse, best.point.foldMse, plan.k),
  }));
  return deepFreeze(withDisplay({
    target: options.target,
    folds: plan,
    candidates: results,
    best: best.name,
    verdict: results.map((r) => verdictLine(r, best.name)),
  }, comparisonBundle));
}

/** Mean and SE of per-fold differences a − b. */
export function pairedDifference(
  a: readonly number[],
  b: readonly number[],
  k: number,
): PairedDifference {
  const d = a.map((x, i) => x - b[i]);
  const mean = d.reduce((s, x) => s + x, 0) / d.length;
  const sd = Math.sqrt(d.reduce((s, x) => s + (x - mean) ** 2, 0) / Math.max(d.length - 1, 1));
  const se = sd / Math.sqrt(k);
  return { mean, se, indistinguishable: Math.abs(mean) <= 2 * se };
}

function verdictLine(r: CandidateOutcome, best: string): string {
  const fmt = (v: number) => String(Number(v.toPrecision(3)));
  const symbol = strengthSymbol(r.sweep.scale);
  const at = `CV error ${fmt(r.cvMean)} ± ${fmt(r.cvSe)} at ${symbol} = ${fmt(r.strength)}`;
  if (r.versusBest === null) return `${r.name}: lowest ${at}.`;
  const d = r.versusBest;
  const diff = `${fmt(d.mean)} ± ${fmt(d.se)}`;
  return d.indistinguishable
    ? `${r.name}: ${at}; indistinguishable from ${best} (paired difference ${diff}, within 2 SE).`
    : `${r.name}: ${at}; worse than ${best} by ${diff} (more than 2 SE).`;
}

function checkCandidates(candidates: readonly Candidate[]): void {
  if (!Array.isArray(candidates) || candidates.length < 2) {
    throw new CurbfitError(
      "BAD_OPTION",
      "compare needs at least two candidates",
      'Pass a list like [{ name: "a", terms: [...] }, { name: "b", terms: [...] }]',
      { option: "candidates" },
    );
  }
  const seen = new Set<string>();
  candidates.forEach((c, i) => {
    if (typeof c.name !== "string" || c.name.trim() === "" || seen.has(c.name)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `candidate ${i + 1} has ${seen.has(c.name) ? "a repeated" : "no"} name`,
        "Give every candidate a distinct name",
        { option: `candidates[${i}].name` },
      );
    }
    seen.add(c.name);
  });
}
