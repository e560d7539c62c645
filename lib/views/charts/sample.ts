/**
 * Bounding the data a chart embeds. A chart carries its data inline in the Vega-Lite spec (and
 * the notebook stores that spec), so large inputs are thinned deterministically and the chart
 * says so.
 *
 * @module
 */

/**
 * Most points a scatter layer embeds; beyond it points are thinned and the chart says so.
 *
 * @example
 * ```ts
 * import { POINT_LIMIT } from "./sample.ts";
 * console.log(POINT_LIMIT); // 2000
 * ```
 */
export const POINT_LIMIT = 2000;

/**
 * Most rows any other layer embeds (λ grid × folds, λ grid × coefficients).
 *
 * @example
 * ```ts
 * import { ROW_LIMIT } from "./sample.ts";
 * console.log(ROW_LIMIT); // 5000
 * ```
 */
export const ROW_LIMIT = 5000;

/**
 * At most `limit` (≥ 2) indices of 0..n−1, evenly spread, first and last included, ascending;
 * every index in `keep` is included as well (so the result may be slightly longer). All indices
 * when n ≤ limit. Deterministic: index round(j·(n−1)/(limit−1)) for j = 0..limit−1.
 *
 * @example
 * ```ts
 * import { spreadIndices } from "./sample.ts";
 * console.log(spreadIndices(10, 4)); // [0, 3, 6, 9]
 * console.log(spreadIndices(10, 4, [5])); // [0, 3, 5, 6, 9]
 * ```
 */
export function spreadIndices(n: number, limit: number, keep: readonly number[] = []): number[] {
  if (n <= limit) return Array.from({ length: n }, (_, i) => i);
  const picked = new Set<number>(keep.filter((i) => i >= 0 && i < n));
  for (let j = 0; j < limit; j++) picked.add(Math.round((j * (n - 1)) / (limit - 1)));
  return [...picked].sort((a, b) => a - b);
}

/**
 * "showing 2000 of 50000 points (evenly spread by <order>)", or "" when nothing was dropped.
 *
 * @example
 * ```ts
 * import { thinningNote } from "./sample.ts";
 * console.log(thinningNote(2000, 50000, "points", "row order"));
 * // "Showing 2000 of 50000 points, evenly spread by row order."
 * ```
 */
export function thinningNote(shown: number, total: number, what: string, order: string): string {
  return shown >= total ? "" : `Showing ${shown} of ${total} ${what}, evenly spread by ${order}.`;
}
