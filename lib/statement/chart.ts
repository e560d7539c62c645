/**
 * The statement's evidence chart, drawn from the record alone with curbfit's own charts
 * (lib/views/charts): the validation curve of a sweep, or the comparison chart of a comparison,
 * each fed the record's CV tables through `recordCurveSource` (lib/views/display.ts).
 *
 * @module
 */
import { type ModelChoiceRecord, modelStrengths } from "../record/mod.ts";
import { strengthSymbol } from "../fit/penalty.ts";
import type { VegaLiteSpec } from "../views/render.ts";
import { recordComparisonSource, recordCurveSource } from "../views/display.ts";
import { comparisonChart } from "../views/charts/comparison.ts";
import { validationCurveChart } from "../views/charts/validation.ts";

/**
 * The evidence chart of a record as a Vega-Lite v5 spec (inline data only): the validation
 * curve of a sweep, or the comparison chart of a comparison.
 *
 * @example
 * ```ts
 * import { compare, legendre, recordOf } from "../../mod.ts";
 * import { evidenceSpec } from "./chart.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const y = x.map((v, i) => v * v + 0.05 * Math.sin(11 * i));
 * const c = compare({ x, y }, [
 *   { name: "line", terms: [legendre("x", 1)], lambdas: [0] },
 *   { name: "degree 8", terms: [legendre("x", 8)] },
 * ], { target: "y", folds: { k: 5, seed: 1 } });
 * const spec = evidenceSpec(recordOf(c));
 * console.log("vconcat" in spec); // true
 * ```
 */
export function evidenceSpec(record: ModelChoiceRecord): VegaLiteSpec {
  const comparison = recordComparisonSource(record);
  return comparison === null
    ? validationCurveChart(recordCurveSource(record.models[0], record))
    : comparisonChart(comparison);
}

/**
 * The chart's caption in words (every format shows it; Markdown and text show only it).
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { evidenceCaption } from "./chart.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => v + 0.1 * Math.cos(7 * i)) }, {
 *   target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 2 },
 * });
 * console.log(evidenceCaption(recordOf(s)));
 * ```
 */
export function evidenceCaption(record: ModelChoiceRecord): string {
  const symbol = [...new Set(record.models.map((m) => strengthSymbol(modelStrengths(m).scale)))]
    .join(" or ");
  const what = record.comparison === null
    ? `The validation curve: mean CV error at each ${symbol} with a band of ± 1 standard ` +
      `error, the minimum and the chosen ${symbol} marked`
    : `Each candidate's CV error at its chosen ${symbol}, the paired per-fold differences to the best, ` +
      "and every candidate's validation curve";
  return `${what}; redrawn from the record's CV tables. Lower is better on these rows; it is ` +
    "an estimate, not a promise for new data.";
}
