/**
 * Seeded randomness and cross-validation fold plans. One generator (PCG32), explicit seeds, and
 * a reproducibility contract: the same seed and row count give the same folds on every machine
 * and in every later version. README.md in this folder states each algorithm exactly.
 *
 * @example
 * ```ts
 * import { assignmentDigest, foldRows, kFoldPlan } from "./mod.ts";
 * const plan = kFoldPlan(100, { k: 5, seed: 20240611 });
 * const { training, validation } = foldRows(plan, 0, 0); // 80 and 20 row indices
 * const fingerprint = assignmentDigest(plan); // keep it with the results
 * ```
 *
 * @module
 */

export { SeededStream } from "./pcg32.ts";
export type { FoldPlan, FoldScheme } from "./plan.ts";
export { holdoutPlan, kFoldPlan, leaveOneOutPlan } from "./schemes.ts";
export type { HoldoutOptions, KFoldOptions } from "./schemes.ts";
export { groupedKFoldPlan } from "./grouped.ts";
export type { GroupedKFoldOptions, GroupLabels } from "./grouped.ts";
export { explicitPlan } from "./explicit.ts";
export type { ExplicitOptions } from "./explicit.ts";
export { foldRows } from "./rows.ts";
export type { FoldRows } from "./rows.ts";
export { assignmentDigest } from "./digest.ts";
