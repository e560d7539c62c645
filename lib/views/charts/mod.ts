/**
 * curbfit's charts: pure functions from results to Vega-Lite v5 specs. Every returned spec also
 * shows itself as a chart when it is a notebook cell's last expression (`showChart`).
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../../mod.ts";
 * import { shrinkagePathChart, validationCurveChart } from "./mod.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const s = sweep({ x, y: x.map((v, i) => Math.cos(4 * v) + 0.1 * Math.sin(17 * i)) }, {
 *   target: "y", terms: [legendre("x", 8)], folds: { k: 5, seed: 3 },
 * });
 * const charts = [validationCurveChart(s), shrinkagePathChart(s)];
 * ```
 *
 * @module
 */
export { type CurveSource, validationCurveChart, type ValidationOptions } from "./validation.ts";
export { type PathSource, shrinkagePathChart } from "./path.ts";
export { fittedCurveChart } from "./fitted.ts";
export { comparisonChart, type ComparisonSource } from "./comparison.ts";
export { residualChart } from "./residuals.ts";
export { coefficientChart } from "./coefficients.ts";
export { chartBundle, type ChartText, showChart, type ShownBundle } from "./show.ts";
export { normalQuantile } from "./normal.ts";
