/**
 * From per-fold summaries to a result, shared by the streaming and the SQL sweep: each fold's
 * training and held-out summaries are mapped into the basis of terms learned on its training
 * rows (from ranges, lib/stream/ranges.ts), or recomputed by one more pass over the data when
 * that change of basis would amplify rounding (as the in-memory sweep re-reads rows); then the
 * summary-only engine (lib/sweep/engine.ts) scores the grid, the rule picks a strength, and the
 * chosen model comes from the all-rows summary (lib/fit/summary_fit.ts). Ridge scores a λ grid
 * through one eigendecomposition per training fold and fits the chosen λ from the co-moments;
 * lasso / elastic net run a coordinate-descent path over the α grid per training fold
 * (`crossValidateSparse`), and the chosen model is the all-rows path's solution at the chosen α —
 * both exactly as the in-memory `sweep` does on the same fold summaries. Repeated fold plans
 * (`folds.repeats`) give every repeat its own fold summaries and fold bases; the curve holds the
 * K·R fold errors, repeat-major, with SE = SD/√K as in memory.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { LearnedTerm, Term } from "../design/types.ts";
import type { Fit, FitSpec } from "../fit/fit.ts";
import { fitFromMoments, fitFromSparsePath } from "../fit/summary_fit.ts";
import {
  checkStrengthOptions,
  isSparse,
  penaltyWeights,
  ridge,
  strengthScale,
} from "../fit/penalty.ts";
import type { AlphaGrid } from "../sparse/mod.ts";
import { emptyMoments, mergeMoments, type Moments, removeMoments } from "../sweep/moments.ts";
import { basisChange, changeMoments } from "../sweep/basis.ts";
import {
  crossValidate,
  crossValidateSparse,
  curvePoints,
  type FoldSummarySource,
  sparseCurvePoints,
} from "../sweep/engine.ts";
import type { LambdaGrid } from "../sweep/grid.ts";
import { runStepsAsync } from "../common/steps.ts";
import { type Choice, chooseOnCurve, type SelectionRule } from "../sweep/select.ts";
import { type CurvePoint, type CurveResult, edgeNotes, type Progress } from "../sweep/sweep.ts";
import { checkHashRepeats, FOLD_HASH, type FoldHash, foldHashes } from "./hash.ts";
import { checkFoldsFilled, type FoldRanges, learnOnRanges } from "./ranges.ts";

/**
 * How folds are made when the rows are not in memory: the fold hash of a key, once or repeated
 * with independent hashes (`repeats`, as the in-memory `FoldRequest` names it).
 *
 * @example
 * ```ts
 * import type { HashFoldRequest } from "./finish.ts";
 * const folds: HashFoldRequest = { k: 10, seed: 7, key: "id" };
 * const repeated: HashFoldRequest = { k: 10, seed: 7, repeats: 3, key: "id" };
 * ```
 */
export interface HashFoldRequest {
  /** Number of folds (default 10). */
  readonly k?: number;
  /** Seed of the fold hash (default 1). */
  readonly seed?: number;
  /**
   * Repeats (default 1, at most 100): repeat r assigns folds by the hash of repeat r
   * (lib/stream/README.md), independent of the other repeats.
   */
  readonly repeats?: number;
  /**
   * Whole-number column hashed into folds. Streams default to the 0-based data record number;
   * SQL sources need a key.
   */
  readonly key?: string;
}

/**
 * What a sweep over data that is not in memory takes: a fit spec without a strength, plus the
 * grid, folds and rule. The penalty decides the grid: `ridge()` (default) sweeps `lambdas` (λ,
 * sum-of-squares units); `lasso()` / `elasticNet({ mix })` sweep `alphas` (α, the 1/(2N)
 * convention) and take `tolerance`. Options of the other convention are a `BAD_OPTION`.
 *
 * @example
 * ```ts
 * import type { ScaleSweepSpec } from "./finish.ts";
 * import { legendre } from "../design/mod.ts";
 * const spec: ScaleSweepSpec = { target: "y", terms: [legendre("x", 8)], folds: { key: "id" } };
 * ```
 */
export interface ScaleSweepSpec extends Omit<FitSpec, "lambda" | "budget" | "alpha"> {
  /**
   * Ridge only: λ values, or bounds/count of an automatic log-spaced grid (default 100 points).
   */
  readonly lambdas?: LambdaGrid;
  /**
   * Lasso / elastic net only: α values, or the length and depth of an automatic path from the
   * all-rows α_max down (default 100 values; lib/sparse/grid.ts).
   */
  readonly alphas?: AlphaGrid;
  /** Fold count, hash seed, repeats and key column (default 10 folds, seed 1, one repeat). */
  readonly folds?: HashFoldRequest;
  /** How to pick λ or α from the curve (default "min"). */
  readonly rule?: SelectionRule;
}

/**
 * A progress report with the rows read so far and the reading speed.
 *
 * @example
 * ```ts
 * import type { ScaleProgress } from "./finish.ts";
 * const line = (p: ScaleProgress) => `${p.stage}: ${p.rows} rows, ${Math.round(p.rowsPerSecond)} rows/s`;
 * ```
 */
export interface ScaleProgress {
  /** "domains": the first pass (ranges); "summaries": reading rows into fold summaries. */
  readonly stage: "domains" | Progress["stage"];
  /** Steps done of `total`: bytes while reading a stream, queries for SQL, folds, the fit. */
  readonly done: number;
  /** While reading: bytes read of the total (NaN when the total is unknown). */
  readonly total: number;
  /** Rows read into summaries so far in this stage. */
  readonly rows: number;
  /** Rows per second over this stage so far while reading; NaN in the later stages. */
  readonly rowsPerSecond: number;
}

/**
 * Receives progress reports; must return quickly.
 *
 * @example
 * ```ts
 * import type { ScaleProgressListener } from "./finish.ts";
 * const log: ScaleProgressListener = (p) => console.log(p.stage, p.rows);
 * ```
 */
export type ScaleProgressListener = (progress: ScaleProgress) => void;

/**
 * The hash folds a scale sweep used.
 *
 * @example
 * ```ts
 * import type { HashFolds } from "./finish.ts";
 * const smallest = (f: HashFolds) => Math.min(...f.sizes);
 * ```
 */
export interface HashFolds {
  /** `curbfit.fold-hash/1` (lib/stream/README.md). */
  readonly hash: string;
  /** Seed the hash coefficients were drawn with. */
  readonly seed: number;
  /** Number of folds in each repeat. */
  readonly k: number;
  /** Number of repeats; repeat r used the hash of repeat r. */
  readonly repeats: number;
  /** The key column, or null for data record numbers. */
  readonly key: string | null;
  /** Rows in each fold, repeat-major (repeat 0's K folds, then repeat 1's, …) as `foldMse`. */
  readonly sizes: readonly number[];
}

/**
 * Everything a scale sweep found. Frozen.
 *
 * @example
 * ```ts
 * import type { ScaleSweepResult } from "./finish.ts";
 * const best = (r: ScaleSweepResult) => r.curve[r.chosen.index].cvMean;
 * ```
 */
export interface ScaleSweepResult extends CurveResult {
  /**
   * Hash folds. `curve` is per λ or α (see `scale`) as in `sweep`, but closed-form
   * leave-one-out is not computed (`loo` is null), and `fit` comes from the all-rows summary
   * (lib/fit/summary_fit.ts): ridge solved from its co-moments, lasso / elastic net the
   * all-rows coordinate-descent solution at the chosen α.
   */
  readonly folds: HashFolds;
  /** Where the rows came from (file path, "stream", a SQL table). */
  readonly source: string;
  /** Passes over the data (reads or queries), including any fold re-read. */
  readonly passes: number;
  /** Plain cautions on reading the result (`CAUTIONS`: CV error, extrapolation, hash folds). */
  readonly cautions: readonly string[];
}

/**
 * Plain cautions carried by every result.
 *
 * @example
 * ```ts
 * import { CAUTIONS } from "./finish.ts";
 * console.log(CAUTIONS.length); // 3
 * ```
 */
export const CAUTIONS: readonly string[] = Object.freeze([
  "Cross-validation error estimates error on new rows like these; it is not a guarantee.",
  "Predictions outside the ranges seen in training (e.g. a Legendre domain) are extrapolation.",
  "Hash folds assume rows are exchangeable; rows in clusters or time order need other folds.",
]);

/**
 * Defaults of the hash folds.
 *
 * @example
 * ```ts
 * import { DEFAULT_HASH_FOLDS } from "./finish.ts";
 * console.log(DEFAULT_HASH_FOLDS.k, DEFAULT_HASH_FOLDS.seed); // 10 1
 * ```
 */
export const DEFAULT_HASH_FOLDS = { k: 10, seed: 1 } as const;

/**
 * The hash folds a spec asks for, with defaults filled in: fold count, seed, repeats, key column
 * (null: record numbers) and the fold hash of every repeat (`foldHashes`, which checks k, the
 * seed and the repeats).
 *
 * @example
 * ```ts
 * import { hashFoldsOf } from "./finish.ts";
 * const folds = hashFoldsOf({ k: 5, seed: 2, repeats: 3 });
 * console.log(folds.k, folds.repeats, folds.hashes.length, folds.key); // 5 3 3 null
 * ```
 */
export function hashFoldsOf(request: HashFoldRequest | undefined): {
  readonly k: number;
  readonly seed: number;
  readonly repeats: number;
  readonly key: string | null;
  readonly hashes: readonly FoldHash[];
} {
  const k = request?.k ?? DEFAULT_HASH_FOLDS.k;
  const seed = request?.seed ?? DEFAULT_HASH_FOLDS.seed;
  const hashes = foldHashes(seed, k, request?.repeats ?? 1);
  return { k, seed, repeats: hashes.length, key: request?.key ?? null, hashes };
}

/** The options of {@link HashFoldRequest}. */
const HASH_FOLD_OPTIONS = ["k", "seed", "repeats", "key"];

/**
 * Checks the parts of a spec that do not need the data: strength options that match the
 * penalty (lib/fit/penalty.ts `checkStrengthOptions`), target, terms (no column read both as
 * numbers and as categories), fold request (only the options of hash folds; `repeats` from 1
 * to 100). Returns the numeric input columns of the terms (`scaleColumns` also lists the
 * category ones).
 *
 * @example
 * ```ts
 * import { checkScaleSpec } from "./finish.ts";
 * import { legendre } from "../design/mod.ts";
 * console.log(checkScaleSpec({ target: "y", terms: [legendre("x", 3)] })); // [ "x" ]
 * ```
 */
export function checkScaleSpec(spec: ScaleSweepSpec): string[] {
  checkStrengthOptions(spec?.penalty ?? ridge(), { ...spec });
  if (typeof spec?.target !== "string" || spec.target === "") {
    throw new CurbfitError(
      "BAD_OPTION",
      "no target column was named",
      'Pass e.g. { target: "y" }',
      {
        option: "target",
      },
    );
  }
  if (!Array.isArray(spec.terms) || spec.terms.length === 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      "no terms were given",
      'Pass at least one term, e.g. terms: [legendre("x", 5)]',
      { option: "terms" },
    );
  }
  spec.terms.forEach((t: Term) => {
    if (t.inputs.includes(spec.target)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `the target ${JSON.stringify(spec.target)} is also an input of ${t.label}`,
        "Remove that term or choose another target",
        { option: "terms" },
      );
    }
  });
  const { numeric, categories } = scaleColumns(spec.terms);
  const both = categories.find((c) => numeric.includes(c));
  if (both !== undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      `column ${JSON.stringify(both)} is read as categories by indicators(${both}) and as ` +
        "numbers by another term",
      "A column is either numeric or a category: use one kind of term for it",
      { option: "terms", column: both },
    );
  }
  const folds = spec.folds ?? {};
  const other = Object.keys(folds).find((name) => !HASH_FOLD_OPTIONS.includes(name));
  if (other !== undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      `folds.${other} is not an option of hash folds, which take ${HASH_FOLD_OPTIONS.join(", ")}`,
      "Beyond memory, folds come from the hash of a key column (or the record number); for " +
        "grouped, hold-out or explicit folds load the rows and use sweep()",
      { option: `folds.${other}` },
    );
  }
  if (folds.repeats !== undefined) checkHashRepeats(folds.repeats);
  if (folds.key !== undefined && (typeof folds.key !== "string" || folds.key === "")) {
    throw new CurbfitError(
      "BAD_OPTION",
      "folds.key must be a column name",
      'Pass e.g. { key: "id" }',
      {
        option: "folds.key",
      },
    );
  }
  return numeric;
}

/**
 * Everything the finishing step needs.
 *
 * @example
 * ```ts
 * import type { FinishInput } from "./finish.ts";
 * const folds = (input: FinishInput) => input.k;
 * ```
 */
export interface FinishInput {
  readonly spec: ScaleSweepSpec;
  readonly k: number;
  readonly seed: number;
  readonly key: string | null;
  readonly source: string;
  /** Per-fold counts and column ranges over all rows used, for every repeat. */
  readonly ranges: FoldRanges;
  /** Terms learned on all rows, the basis of `buckets`. */
  readonly terms: readonly LearnedTerm[];
  /** Per repeat r: the summary of each fold (0 … k−1) in the basis of `terms` (`buckets[r][f]`). */
  readonly buckets: readonly (readonly Moments[])[];
  /**
   * Training and held-out summaries of fold f of repeat r in the basis of `foldTerms`, from the
   * rows.
   */
  readonly refetch: (
    r: number,
    f: number,
    foldTerms: readonly LearnedTerm[],
  ) => Promise<[Moments, Moments]>;
  readonly passes: number;
  readonly report: ScaleProgressListener;
}

/**
 * Scores the grid from fold summaries (λ for ridge, α for lasso / elastic net), chooses a
 * strength and makes the chosen model from the all-rows summary.
 *
 * @example
 * ```ts
 * import { finishSweep } from "./finish.ts";
 * // finishSweep({ spec, k, seed, key, source, ranges, terms, buckets, refetch, passes, report })
 * // is called by sweepStream and sweepSql once the fold summaries are in.
 * ```
 */
export async function finishSweep(input: FinishInput): Promise<ScaleSweepResult> {
  const { spec, k, ranges, terms, buckets } = input;
  const repeats = buckets.length;
  checkFoldsFilled(ranges, input.source);
  const names = terms.flatMap((t) => t.names);
  const orders = terms.flatMap((t) => t.orders);
  const d = names.length + 1;
  // Every repeat's folds cover all rows; repeat 0's merge is the all-rows summary, as in memory.
  const all = mergeMoments(buckets[0], d);
  let passes = input.passes;
  // Repeat-major, as the engine visits them: fold f of repeat r at r·k + f.
  const folds: { train: Moments; validation: Moments; where: string }[] = [];
  for (let r = 0; r < repeats; r++) {
    for (let f = 0; f < k; f++) {
      const foldTerms = learnOnRanges(spec.terms, ranges, f, input.source, r);
      const change = basisChange(terms, foldTerms);
      const where = `training rows of fold ${f + 1}` + (repeats > 1 ? ` (repeat ${r + 1})` : "");
      const held = buckets[r][f];
      if (change !== undefined) {
        const train = changeMoments(removeMoments(all, held), change);
        folds.push({ train, validation: changeMoments(held, change), where });
      } else {
        const [train, validation] = await input.refetch(r, f, foldTerms);
        passes++;
        folds.push({ train, validation, where });
      }
    }
  }
  const penalty = spec.penalty ?? ridge();
  const options = {
    gamma: penaltyWeights(penalty, orders),
    standardize: spec.standardize ?? true,
    intercept: spec.intercept ?? true,
  };
  const source: FoldSummarySource = {
    all,
    repeats,
    k,
    buckets: (r) => [...buckets[r], emptyMoments(d)],
    fold: (r, f) => folds[r * k + f],
  };
  const n = all.count;
  // The engine's own "summaries" step (building fold summaries from rows in memory) has no
  // counterpart here: the rows were already read.
  const report = (p: Progress) => {
    if (p.stage === "summaries") return;
    input.report({ stage: p.stage, done: p.done, total: p.total, rows: n, rowsPerSecond: NaN });
  };
  let curve: CurvePoint[];
  let finalModel: (chosen: Choice) => Fit;
  if (isSparse(penalty)) {
    const sparse = { penalty, ...options, tolerance: spec.tolerance };
    const cv = await runStepsAsync(crossValidateSparse(source, names, sparse, spec.alphas, report));
    curve = sparseCurvePoints(cv, k);
    // Curve index l is path solution L − 1 − l (the path runs in decreasing α).
    const last = curve.length - 1;
    finalModel = (c) => fitFromSparsePath(all, terms, spec, cv.full, last - c.index);
  } else {
    const cv = await runStepsAsync(crossValidate(source, names, options, spec.lambdas, report));
    curve = curvePoints(cv, k, null);
    finalModel = (c) => fitFromMoments(all, terms, { ...spec, lambda: c.strength });
  }
  const scale = strengthScale(penalty);
  const { minimum, chosen } = chooseOnCurve(curve, spec.rule);
  report({ stage: "refit", done: 0, total: 1 });
  const fit = finalModel(chosen);
  report({ stage: "refit", done: 1, total: 1 });
  return deepFreeze({
    target: spec.target,
    n,
    names,
    orders,
    gamma: Array.from(options.gamma),
    standardize: options.standardize,
    intercept: options.intercept,
    scale,
    folds: {
      hash: FOLD_HASH,
      seed: input.seed,
      k,
      repeats,
      key: input.key,
      sizes: Array.from(ranges.counts),
    },
    curve,
    minimum,
    chosen,
    notes: edgeNotes(minimum, curve.length, scale, scale === "alpha" ? spec.alphas : spec.lambdas),
    fit,
    source: input.source,
    passes,
    cautions: [...CAUTIONS],
  });
}

/**
 * The columns the terms read, split by kind: `categories` are the columns of `indicators` terms
 * (also inside products), `numeric` every other input. Found from each term's JSON `spec`; a
 * column may appear in both lists (checkScaleSpec refuses that).
 *
 * @example
 * ```ts
 * import { scaleColumns } from "./finish.ts";
 * import { column, indicators, product } from "../design/mod.ts";
 * console.log(scaleColumns([product(column("dose"), indicators("site"))]));
 * // { numeric: [ "dose" ], categories: [ "site" ] }
 * ```
 */
export function scaleColumns(
  terms: readonly Term[],
): { numeric: string[]; categories: string[] } {
  const numeric = new Set<string>();
  const categories = new Set<string>();
  const visit = (spec: unknown): void => {
    if (typeof spec !== "object" || spec === null) return;
    const s = spec as Record<string, unknown>;
    if (typeof s.column === "string") {
      (s.kind === "indicators" ? categories : numeric).add(s.column);
    }
    Object.values(s).forEach(visit);
  };
  terms.forEach((t) => visit(t.spec));
  for (const t of terms) for (const c of t.inputs) if (!categories.has(c)) numeric.add(c);
  return { numeric: [...numeric], categories: [...categories] };
}
