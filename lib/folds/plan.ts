/**
 * The shape every fold planner returns: which validation fold each row falls in, for each
 * repeat, with everything needed to rebuild it (scheme, seed, generator).
 *
 * @module
 */

/** How a plan was made. See README.md in this folder for each scheme's exact algorithm. */
export type FoldScheme = "k-fold" | "grouped-k-fold" | "holdout" | "leave-one-out" | "explicit";

/**
 * A cross-validation fold plan. For repeat r and row i, `assignment[r][i]` is the validation
 * fold (0..k−1) that row i belongs to, or −1 when row i is never validated (it trains in every
 * fold; holdout's training rows). A row trains in every fold other than its own.
 * Plans are frozen; treat the Int32Arrays as read-only too.
 *
 * @example
 * ```ts
 * import { kFoldPlan } from "./schemes.ts";
 * const plan = kFoldPlan(10, { k: 3, seed: 1 });
 * plan.scheme; // "k-fold"
 * plan.assignment[0].length; // 10, one fold index per row
 * ```
 */
export interface FoldPlan {
  /** Which algorithm made the plan. */
  readonly scheme: FoldScheme;
  /** Number of rows the plan covers. */
  readonly nRows: number;
  /** Number of validation folds in each repeat (1 for holdout, nRows for leave-one-out). */
  readonly k: number;
  /** Number of repeats; repeat r was drawn from PCG32 stream r. */
  readonly repeats: number;
  /** The seed (PCG32 initstate), or null for schemes that draw nothing. */
  readonly seed: number | null;
  /** The generator used, or null for schemes that draw nothing. */
  readonly prng: "PCG32" | null;
  /** Holdout only: the fraction of rows asked for validation; otherwise null. */
  readonly fraction: number | null;
  /** Grouped k-fold only: the number of distinct groups; otherwise null. */
  readonly groupCount: number | null;
  /** One Int32Array per repeat: fold index per row, or −1 for never-validated rows. */
  readonly assignment: readonly Int32Array[];
}

/** The fields a planner fills in; the rest default to null. */
type PlanFields =
  & Pick<FoldPlan, "scheme" | "nRows" | "k" | "repeats" | "assignment">
  & Partial<Pick<FoldPlan, "seed" | "fraction" | "groupCount">>;

/** Builds a frozen FoldPlan with a fixed key order (so serialized plans compare byte-for-byte). */
export function makePlan(fields: PlanFields): FoldPlan {
  const seed = fields.seed ?? null;
  return Object.freeze({
    scheme: fields.scheme,
    nRows: fields.nRows,
    k: fields.k,
    repeats: fields.repeats,
    seed,
    prng: seed === null ? null : "PCG32",
    fraction: fields.fraction ?? null,
    groupCount: fields.groupCount ?? null,
    assignment: Object.freeze([...fields.assignment]),
  });
}
