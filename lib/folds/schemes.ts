/**
 * Row-level fold planners: k-fold (optionally repeated), holdout and leave-one-out.
 * Grouped and user-supplied plans live in grouped.ts and explicit.ts.
 *
 * @module
 */

import { CurbfitError } from "../errors/error.ts";
import {
  checkFoldCount,
  checkRepeats,
  checkRowCount,
  checkSeed,
  rejectUnknownOptions,
  showValue,
} from "./options.ts";
import { SeededStream } from "./pcg32.ts";
import { type FoldPlan, makePlan } from "./plan.ts";

/** Options of {@link kFoldPlan}. */
export interface KFoldOptions {
  /** Number of folds, an integer from 2 to the row count. */
  readonly k: number;
  /** Seed, an integer from 0 to 2^53−1; it is PCG32's initstate. */
  readonly seed: number;
  /** Independent repeats (default 1); repeat r uses PCG32 stream r. */
  readonly repeats?: number;
}

/** Options of {@link holdoutPlan}. */
export interface HoldoutOptions {
  /** Fraction of rows to validate on, strictly between 0 and 1. */
  readonly fraction: number;
  /** Seed, an integer from 0 to 2^53−1; it is PCG32's initstate. */
  readonly seed: number;
  /** Independent repeats (default 1); repeat r uses PCG32 stream r. */
  readonly repeats?: number;
}

/**
 * K-fold plan: for each repeat r, shuffle the row indices with PCG32 (seed, stream r), then cut
 * the shuffled order into k contiguous blocks; with n = q·k + e (0 ≤ e < k), folds 0..e−1 take
 * q+1 rows and the rest q, so fold sizes differ by at most one. repeats > 1 is repeated k-fold.
 *
 * @example
 * ```ts
 * import { kFoldPlan } from "./schemes.ts";
 * const plan = kFoldPlan(10, { k: 3, seed: 1 });
 * plan.assignment[0]; // Int32Array of 10 fold indices in 0..2; fold sizes 4, 3, 3
 * const repeated = kFoldPlan(10, { k: 3, seed: 1, repeats: 5 }); // 5 different shuffles
 * ```
 */
export function kFoldPlan(nRows: number, options: KFoldOptions): FoldPlan {
  rejectUnknownOptions(options, ["k", "seed", "repeats"], "kFoldPlan");
  const n = checkRowCount(nRows);
  const k = checkFoldCount(options.k, n, "rows");
  const seed = checkSeed(options.seed);
  const repeats = checkRepeats(options.repeats);
  const assignment = perRepeat(repeats, seed, (stream) => {
    const order = stream.permutation(n);
    const folds = new Int32Array(n);
    const base = Math.floor(n / k);
    const extra = n % k;
    let position = 0;
    for (let fold = 0; fold < k; fold++) {
      const end = position + base + (fold < extra ? 1 : 0);
      for (; position < end; position++) folds[order[position]] = fold;
    }
    return folds;
  });
  return makePlan({ scheme: "k-fold", nRows: n, k, repeats, seed, assignment });
}

/**
 * Holdout plan: for each repeat r, shuffle the row indices with PCG32 (seed, stream r); the
 * first m rows of the shuffled order form the validation fold 0 and the rest are −1 (training
 * only), where m = Math.round(fraction · nRows) in IEEE-754 double arithmetic (halves round up).
 * m must come out between 1 and nRows − 1.
 *
 * @example
 * ```ts
 * import { holdoutPlan } from "./schemes.ts";
 * const plan = holdoutPlan(10, { fraction: 0.3, seed: 7 });
 * plan.k; // 1: three rows have fold 0 (validation), seven have -1 (training)
 * ```
 */
export function holdoutPlan(nRows: number, options: HoldoutOptions): FoldPlan {
  rejectUnknownOptions(options, ["fraction", "seed", "repeats"], "holdoutPlan");
  const n = checkRowCount(nRows);
  const fraction = options.fraction;
  if (typeof fraction !== "number" || !(fraction > 0 && fraction < 1)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option fraction is ${showValue(fraction)}, but it must be a number strictly between 0 and 1`,
      "Pass the share of rows to hold out for validation, for example fraction: 0.2",
      { option: "fraction" },
    );
  }
  const validationCount = Math.round(fraction * n);
  if (validationCount < 1 || validationCount > n - 1) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option fraction is ${fraction}, which holds out ${validationCount} of ${n} rows; ` +
        "both the validation and the training part need at least one row",
      `Pass a fraction from about ${(1 / n).toPrecision(4)} to ${((n - 1) / n).toPrecision(4)}`,
      { option: "fraction" },
    );
  }
  const seed = checkSeed(options.seed);
  const repeats = checkRepeats(options.repeats);
  const assignment = perRepeat(repeats, seed, (stream) => {
    const order = stream.permutation(n);
    const folds = new Int32Array(n).fill(-1);
    for (let position = 0; position < validationCount; position++) folds[order[position]] = 0;
    return folds;
  });
  return makePlan({ scheme: "holdout", nRows: n, k: 1, repeats, seed, fraction, assignment });
}

/**
 * Leave-one-out plan: row i is validation fold i, so k = nRows; one repeat; nothing is drawn
 * (seed and prng are null).
 *
 * @example
 * ```ts
 * import { leaveOneOutPlan } from "./schemes.ts";
 * leaveOneOutPlan(4).assignment[0]; // Int32Array [0, 1, 2, 3]
 * ```
 */
export function leaveOneOutPlan(nRows: number): FoldPlan {
  const n = checkRowCount(nRows);
  const folds = new Int32Array(n);
  for (let i = 0; i < n; i++) folds[i] = i;
  return makePlan({ scheme: "leave-one-out", nRows: n, k: n, repeats: 1, assignment: [folds] });
}

/** Runs `draw` once per repeat r with a fresh PCG32 stream (seed, r). */
export function perRepeat(
  repeats: number,
  seed: number,
  draw: (stream: SeededStream) => Int32Array,
): Int32Array[] {
  const out: Int32Array[] = [];
  for (let r = 0; r < repeats; r++) out.push(draw(new SeededStream(seed, r)));
  return out;
}
