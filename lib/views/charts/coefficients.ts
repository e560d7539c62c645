/**
 * The coefficients of one fit on the standardized scale (w* = s·w, comparable across design
 * columns), one bar per column. This is the chart a `Fit` shows by itself; with data at hand,
 * `residualChart` shows how the fit does on the rows.
 *
 * @module
 */
import type { FitSummary } from "../../fit/fit.ts";
import type { VegaLiteSpec } from "../render.ts";
import { showChart } from "./show.ts";
import { COLORS, compactNames, CONFIG, num, SCHEMA_URL, SIZE, subtitle, title } from "./theme.ts";

/** Most columns drawn; beyond it the largest |w*| are kept and the chart says so. */
export const COEFFICIENT_LIMIT = 40;

/**
 * The coefficient chart of a fit (a Vega-Lite v5 spec that also displays itself in a notebook).
 * Takes the fit's summary (`fit.summary`), or a fit itself.
 *
 * @example
 * ```ts
 * import { fit, legendre } from "../../../mod.ts";
 * import { coefficientChart } from "./coefficients.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const m = fit({ x, y: x.map((v) => Math.sin(3 * v)) }, { target: "y", terms: [legendre("x", 5)], lambda: 0.1 });
 * const spec = coefficientChart(m.summary); // bars for P1(x) … P5(x)
 * ```
 */
export function coefficientChart(
  summary: FitSummary | { readonly summary: FitSummary },
): VegaLiteSpec {
  const s = "summary" in summary ? summary.summary : summary;
  const w = s.standardized.coefficients;
  const { labels, input } = compactNames(s.names);
  const all = w.map((_, q) => q);
  const shown = all.length <= COEFFICIENT_LIMIT
    ? all
    : all.sort((a, b) => Math.abs(w[b]) - Math.abs(w[a]) || a - b)
      .slice(0, COEFFICIENT_LIMIT).sort((a, b) => a - b);
  const rows = shown.map((q) => ({ column: labels[q], w: w[q] }));
  const order = rows.map((r) => r.column);
  const lambda = s.strength === 0 ? "0 (no penalty)" : num(s.strength);
  const notes = [
    ...(input === null ? [] : [`Rows: the design columns ${listed(labels)} of ${input}.`]),
    `Coefficients on the standardized scale (w* = s·w), so sizes compare across columns; ` +
    `intercept ${num(s.intercept)} on the data's scale. Budget C = ${num(s.budget)}, ` +
    `training MSE ${num(s.trainMse)}, ${s.n} rows.`,
    ...(shown.length < w.length
      ? [`Showing the ${shown.length} of ${w.length} coefficients largest in size.`]
      : []),
  ];
  const y = {
    field: "column",
    type: "nominal",
    sort: order,
    axis: { title: null },
  };
  const spec = {
    $schema: SCHEMA_URL,
    title: {
      text: title(`${s.target} fit at λ = ${lambda}: ${num(s.df)} effective df of ${w.length}`),
      subtitle: subtitle(notes),
    },
    width: SIZE.half + 120,
    height: { step: 18 },
    layer: [
      {
        data: { values: [{ w: 0 }] },
        mark: { type: "rule", color: COLORS.muted },
        encoding: { x: { field: "w", type: "quantitative" } },
      },
      {
        data: { values: rows },
        mark: { type: "bar", color: COLORS.cv, height: 10 },
        encoding: {
          x: { field: "w", type: "quantitative", axis: { title: "standardized coefficient w*" } },
          y,
        },
      },
    ],
    config: CONFIG,
  } as VegaLiteSpec;
  return showChart(spec, { heading: `Coefficients: ${s.target}` });
}

/** "P1, P2" for up to three labels, "P1…P12" for more. */
function listed(labels: readonly string[]): string {
  return labels.length <= 3 ? labels.join(", ") : `${labels[0]}…${labels[labels.length - 1]}`;
}
