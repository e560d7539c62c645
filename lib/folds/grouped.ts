/**
 * Grouped k-fold: rows that share a group value always land in the same fold.
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
import { type FoldPlan, makePlan } from "./plan.ts";
import { perRepeat } from "./schemes.ts";

/** Group labels, one per row: int32 codes (e.g. a category column's codes), strings or numbers. */
export type GroupLabels = Int32Array | readonly (string | number)[];

/** Options of {@link groupedKFoldPlan}. */
export interface GroupedKFoldOptions {
  /** One group label per row; rows with equal labels stay together. */
  readonly groups: GroupLabels;
  /** Number of folds, an integer from 2 to the number of distinct groups. */
  readonly k: number;
  /** Seed, an integer from 0 to 2^53−1; it is PCG32's initstate. */
  readonly seed: number;
  /** Independent repeats (default 1); repeat r uses PCG32 stream r. */
  readonly repeats?: number;
}

/**
 * Grouped k-fold plan. Groups are numbered 0..G−1 in order of first appearance in the rows
 * (labels compare with SameValueZero: the number 1 and the string "1" are different groups).
 * For each repeat r, the group numbers are shuffled with PCG32 (seed, stream r) exactly as rows
 * are in k-fold; then, in shuffled order, each group goes to the fold holding the fewest rows so
 * far, ties going to the lowest fold index. Every fold is non-empty (the first k groups fill the
 * k empty folds); sizes are balanced greedily, not exactly. Needs at least k groups.
 *
 * @example
 * ```ts
 * import { groupedKFoldPlan } from "./grouped.ts";
 * const plan = groupedKFoldPlan(6, { groups: ["a", "a", "b", "c", "c", "d"], k: 2, seed: 3 });
 * plan.groupCount; // 4
 * // rows 0 and 1 share a fold, as do rows 3 and 4
 * ```
 */
export function groupedKFoldPlan(nRows: number, options: GroupedKFoldOptions): FoldPlan {
  rejectUnknownOptions(options, ["groups", "k", "seed", "repeats"], "groupedKFoldPlan");
  const n = checkRowCount(nRows);
  const { codes, sizes } = numberGroups(options.groups, n);
  const groupCount = sizes.length;
  const k = checkFoldCount(options.k, groupCount, "distinct groups");
  const seed = checkSeed(options.seed);
  const repeats = checkRepeats(options.repeats);
  const assignment = perRepeat(repeats, seed, (stream) => {
    const foldOfGroup = fillSmallestFold(stream.permutation(groupCount), sizes, k);
    const folds = new Int32Array(n);
    for (let i = 0; i < n; i++) folds[i] = foldOfGroup[codes[i]];
    return folds;
  });
  return makePlan({ scheme: "grouped-k-fold", nRows: n, k, repeats, seed, groupCount, assignment });
}

/** Numbers groups 0..G−1 by first appearance; returns each row's group number and group sizes. */
function numberGroups(groups: unknown, nRows: number): { codes: Int32Array; sizes: number[] } {
  if (!(groups instanceof Int32Array) && !Array.isArray(groups)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option groups is ${showValue(groups)}, but it must be an Int32Array or an array`,
      "Pass one group label (string or number) per row",
      { option: "groups" },
    );
  }
  if (groups.length !== nRows) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option groups has ${groups.length} labels, but there are ${nRows} rows`,
      "Pass exactly one group label per row, in row order",
      { option: "groups" },
    );
  }
  const numberOf = new Map<unknown, number>();
  const codes = new Int32Array(nRows);
  const sizes: number[] = [];
  for (let i = 0; i < nRows; i++) {
    const label: unknown = groups[i];
    const isLabel = typeof label === "string" || (typeof label === "number" && isFinite(label));
    if (!isLabel) {
      throw new CurbfitError(
        "BAD_OPTION",
        `option groups[${i}] (row ${i}) is ${showValue(label)}, but a group label must be a ` +
          "string or a finite number",
        "Give every row a group label; put rows of unknown group in a group of their own",
        { option: `groups[${i}]` },
      );
    }
    let code = numberOf.get(label);
    if (code === undefined) {
      code = sizes.length;
      numberOf.set(label, code);
      sizes.push(0);
    }
    codes[i] = code;
    sizes[code]++;
  }
  return { codes, sizes };
}

/**
 * Visits groups in `order`; each goes to the fold with the fewest rows so far, ties to the
 * lowest fold index. A binary min-heap ordered by (rows, fold index) finds that fold in
 * O(log k). Returns the fold of each group.
 */
function fillSmallestFold(order: Int32Array, sizes: readonly number[], k: number): Int32Array {
  const foldRows = new Float64Array(k);
  const heap = new Int32Array(k);
  for (let f = 0; f < k; f++) heap[f] = f; // all folds empty: index order is a valid heap
  const before = (a: number, b: number) =>
    foldRows[a] < foldRows[b] || (foldRows[a] === foldRows[b] && a < b);
  const foldOfGroup = new Int32Array(order.length);
  for (const group of order) {
    const fold = heap[0];
    foldOfGroup[group] = fold;
    foldRows[fold] += sizes[group];
    let at = 0; // sift the grown root down
    for (;;) {
      const left = 2 * at + 1;
      if (left >= k) break;
      const right = left + 1;
      const child = right < k && before(heap[right], heap[left]) ? right : left;
      if (!before(heap[child], heap[at])) break;
      heap[at] = heap[child];
      heap[child] = fold;
      at = child;
    }
  }
  return foldOfGroup;
}
