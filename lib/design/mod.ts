/**
 * Model terms and the design matrix: `legendre`, `power`, `column`, `indicators` and `product`
 * terms learn their parameters from training rows only (`learnTerms`) and write double-double
 * design columns for any rows (`buildDesign`), counting rows outside what they learned.
 *
 * Caution: a row outside a learned domain or range is extrapolation; the design still computes
 * it, but a model's predictions there are guesses, and polynomial terms grow fast outside.
 *
 * @example
 * ```ts
 * import { buildDesign, indicators, learnTerms, legendre } from "./mod.ts";
 * const table = {
 *   nRows: 4, names: ["x", "site"],
 *   columns: new Map<string, import("../table/types.ts").Column>([
 *     ["x", { kind: "number", name: "x", values: Float64Array.of(0, 2, 4, 6) }],
 *     ["site", { kind: "category", name: "site", levels: ["a", "b"], codes: Int32Array.of(0, 1, 0, 1) }],
 *   ]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2, 3, 4), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = learnTerms([legendre("x", 2), indicators("site")], table);
 * const design = buildDesign(learned, table);
 * console.log(design.names); // [ "P1(x)", "P2(x)", "site=b" ]
 * ```
 *
 * @module
 */
export type {
  Design,
  DesignBlock,
  Json,
  LearnedTerm,
  OutsideCount,
  Term,
  TermKind,
} from "./types.ts";
export { legendre, legendreRebase, legendreValues } from "./legendre.ts";
export type { LegendreOptions } from "./legendre.ts";
export { column, power } from "./power.ts";
export { indicators } from "./indicators.ts";
export { product } from "./product.ts";
export { buildDesign, learnsFromRows, learnTerms } from "./design.ts";
export { termFromSpec } from "./spec.ts";
export { MAX_DEGREE } from "./checks.ts";
