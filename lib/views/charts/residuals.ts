/**
 * Residual diagnostics of a fit on data: residuals against fitted values (with ±2 residual SD
 * guides) and a normal quantile plot of the residuals scaled by their SD (Blom plotting
 * positions, AS 241 quantiles; points on the diagonal mean normal-looking residuals).
 *
 * Residuals are y − prediction of the fit on the rows given; the fit's `predict` does the work,
 * so this module imports no fitting code.
 *
 * @module
 */
import { CurbfitError } from "../../errors/error.ts";
import type { Fit, TableInput } from "../../fit/fit.ts";
import { strengthSymbol } from "../../fit/penalty.ts";
import { toTable } from "../../table/mod.ts";
import type { Table } from "../../table/types.ts";
import type { VegaLiteSpec } from "../render.ts";
import { normalScores } from "./normal.ts";
import { POINT_LIMIT, spreadIndices, thinningNote } from "./sample.ts";
import { showChart } from "./show.ts";
import { COLORS, CONFIG, num, SCHEMA_URL, SIZE, subtitle, title } from "./theme.ts";

/**
 * The residual-diagnostics chart of a fit on data (a Vega-Lite v5 spec that also displays itself
 * in a notebook): residuals against fitted values, and their normal quantile plot. The title
 * gives the residual SD and the largest residual with its source line.
 *
 * @throws {CurbfitError} `UNKNOWN_COLUMN` when the data lacks the target or an input.
 *
 * @example
 * ```ts
 * import { fit, legendre } from "../../../mod.ts";
 * import { residualChart } from "./residuals.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const data = { x, y: x.map((v, i) => Math.cos(4 * v) + 0.1 * Math.sin(17 * i)) };
 * const spec = residualChart(fit(data, { target: "y", terms: [legendre("x", 6)], lambda: 1 }), data);
 * ```
 */
export function residualChart(model: Fit, data: Table | TableInput): VegaLiteSpec {
  const table = toTable(data);
  const target = model.summary.target;
  const column = table.columns.get(target);
  if (column === undefined || column.kind !== "number") {
    throw new CurbfitError(
      "UNKNOWN_COLUMN",
      `the data has no numeric target column ${JSON.stringify(target)}`,
      "Pass the data the model was fitted on (or new data with the same columns)",
      { source: table.source, option: "data" },
    );
  }
  const fitted = model.predict(table).values;
  const y = column.values;
  const n = y.length;
  const residual = Array.from(y, (v, i) => v - fitted[i]);
  // The fit's convention (FitSummary.residualSd): RSS / (n − intercept − df), so on the training
  // rows the SD here is the fit's residual SD.
  const dof = n - (model.summary.hasIntercept ? 1 : 0) - model.summary.df;
  const sd = Math.sqrt(residual.reduce((s, r) => s + r * r, 0) / Math.max(dof, 1));
  const worst = residual.reduce((w, r, i) => (Math.abs(r) > Math.abs(residual[w]) ? i : w), 0);
  const notes: string[] = [];
  const scatter = spreadIndices(n, POINT_LIMIT);
  const thinned = thinningNote(scatter.length, n, "rows", "row order");
  const order = residual.map((_, i) => i).sort((a, b) => residual[a] - residual[b] || a - b);
  const scores = normalScores(n);
  const ranks = spreadIndices(n, POINT_LIMIT);
  if (thinned) {
    notes.push(
      thinned.replace("row order", "row order (left) and by rank (right, both ends kept)"),
    );
  }
  const strength = `${strengthSymbol(model.summary.scale)} = ${num(model.summary.strength)}`;
  const line = table.lineOfRow[worst];
  const where = table.source === "rows" || table.source === "columns" ? "row" : "line";
  const scatterRows = scatter.map((i) => ({ fitted: fitted[i], residual: residual[i] }));
  const qqRows = ranks.map((k) => ({ theory: scores[k], sample: residual[order[k]] / (sd || 1) }));
  const reach = Math.max(3, ...qqRows.map((r) => Math.abs(r.sample)), Math.abs(scores[0]));
  const spec = {
    $schema: SCHEMA_URL,
    title: {
      text: title(
        `Residuals at ${strength}: SD ${num(sd)}, largest ${num(residual[worst])} ` +
          `(${where} ${line})`,
      ),
      subtitle: subtitle([
        `${target} minus the fit's prediction on ${n} rows of ${table.source}; ` +
        "SD = √(Σ residual² / (n − 1 − df)). " +
        "Left: against the fitted value, with ±2 SD guides. Right: sorted residuals / SD " +
        "against normal quantiles; near the diagonal means normal-looking residuals.",
        ...notes,
      ]),
    },
    hconcat: [
      {
        width: SIZE.half + 20,
        height: SIZE.half,
        layer: [
          {
            data: { values: [{ r: 0 }] },
            mark: { type: "rule", color: COLORS.muted },
            encoding: { y: { field: "r", type: "quantitative" } },
          },
          {
            data: { values: [{ r: -2 * sd }, { r: 2 * sd }] },
            mark: { type: "rule", color: COLORS.muted, strokeDash: [4, 3] },
            encoding: { y: { field: "r", type: "quantitative" } },
          },
          {
            data: { values: scatterRows },
            mark: { type: "point", filled: true, size: 28, opacity: 0.75, color: COLORS.cv },
            encoding: {
              x: {
                field: "fitted",
                type: "quantitative",
                scale: { zero: false },
                axis: { title: `fitted ${target}` },
              },
              y: { field: "residual", type: "quantitative", axis: { title: "residual" } },
            },
          },
        ],
      },
      {
        width: SIZE.half - 30,
        height: SIZE.half,
        layer: [
          {
            data: { values: [{ a: -reach, b: -reach }, { a: reach, b: reach }] },
            mark: { type: "line", color: COLORS.muted, strokeDash: [4, 3], clip: true },
            encoding: {
              x: { field: "a", type: "quantitative", scale: { domain: [-reach, reach] } },
              y: { field: "b", type: "quantitative", scale: { domain: [-reach, reach] } },
            },
          },
          {
            data: { values: qqRows },
            mark: { type: "point", filled: true, size: 28, opacity: 0.75, color: COLORS.train },
            encoding: {
              x: { field: "theory", type: "quantitative", axis: { title: "normal quantile" } },
              y: { field: "sample", type: "quantitative", axis: { title: "residual / SD" } },
            },
          },
        ],
      },
    ],
    spacing: 24,
    config: CONFIG,
  } as VegaLiteSpec;
  return showChart(spec, { heading: `Residuals: ${target}` });
}
