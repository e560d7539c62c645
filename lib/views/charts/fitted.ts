/**
 * The fitted curve of a one-input model: the data as dots and the fitted curves at three λ of a
 * sweep — the chosen λ, the λ of the smallest CV error and the smallest λ on the grid (nearly
 * unregularized) — over the input's range and a margin on each side, with the margins outside
 * the data's range shaded: a curve there is extrapolation.
 *
 * Curves are exact refits on all rows of the data given (`fit`, the exact solver), evaluated at
 * 241 evenly spaced inputs. This module imports the fitting code at run time; nothing in the
 * fitting or sweeping code imports it, so the module graph stays one-directional.
 *
 * @module
 */
import { CurbfitError } from "../../errors/error.ts";
import { fit, type TableInput } from "../../fit/fit.ts";
import { strengthSymbol } from "../../fit/penalty.ts";
import type { SweepResult } from "../../sweep/sweep.ts";
import { toTable } from "../../table/mod.ts";
import type { Table } from "../../table/types.ts";
import type { VegaLiteSpec } from "../render.ts";
import { POINT_LIMIT, spreadIndices, thinningNote } from "./sample.ts";
import { showChart } from "./show.ts";
import {
  COLORS,
  CONFIG,
  foldWords,
  num,
  ruleWords,
  SCHEMA_URL,
  SIZE,
  subtitle,
  title,
} from "./theme.ts";

/** Inputs at which each curve is evaluated. */
const CURVE_POINTS = 241;

/** Margin drawn on each side of the data's range, as a fraction of the range. */
const MARGIN = 0.08;

/**
 * The fitted-curve chart of a sweep whose terms all read one numeric input (a Vega-Lite v5 spec
 * that also displays itself in a notebook). Pass the data the sweep was run on.
 *
 * @throws {CurbfitError} `BAD_OPTION` when the model reads more than one input column or a
 * category column (use `residualChart` for those), `UNKNOWN_COLUMN` when the data lacks the
 * input or the target.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../../mod.ts";
 * import { fittedCurveChart } from "./fitted.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const data = { x, y: x.map((v, i) => Math.cos(4 * v) + 0.1 * Math.sin(17 * i)) };
 * const s = sweep(data, { target: "y", terms: [legendre("x", 10)], folds: { k: 5, seed: 3 } });
 * const spec = fittedCurveChart(s, data); // dots, three curves, shaded margins
 * ```
 */
export function fittedCurveChart(result: SweepResult, data: Table | TableInput): VegaLiteSpec {
  const table = toTable(data);
  const input = singleInput(result);
  const xs = numericColumn(table, input, "input");
  const ys = numericColumn(table, result.target, "target");
  const lo = Math.min(...xs);
  const hi = Math.max(...xs);
  const pad = (hi - lo) * MARGIN || 1;
  const grid = Array.from(
    { length: CURVE_POINTS },
    (_, i) => lo - pad + ((hi - lo + 2 * pad) * i) / (CURVE_POINTS - 1),
  );
  const curves = chosenCurves(result).map((c) => ({
    ...c,
    values: c.strength === result.chosen.strength
      ? result.fit.predict({ [input]: grid }).values
      : refit(result, table, c.strength).predict({ [input]: grid }).values,
  }));
  const yMin = Math.min(...ys);
  const yMax = Math.max(...ys);
  const yPad = 0.25 * (yMax - yMin || 1);
  const yDomain = [yMin - yPad, yMax + yPad];
  const notes: string[] = [];
  const off = (v: number) => v < yDomain[0] || v > yDomain[1];
  for (const c of curves) {
    const inside = Array.from(c.values).filter((_, i) => grid[i] >= lo && grid[i] <= hi);
    if (inside.some(off)) {
      notes.push(
        `Within the data's range the ${c.short} curve leaves the plot ` +
          `(it spans ${num(Math.min(...inside))} to ${num(Math.max(...inside))}).`,
      );
    }
  }
  const all = curves.flatMap((c) => Array.from(c.values));
  if (all.some(off)) {
    notes.push(
      `Beyond the data's range curves run off the plot (from ${num(Math.min(...all))} ` +
        `to ${num(Math.max(...all))}).`,
    );
  }
  const picked = spreadIndices(xs.length, POINT_LIMIT);
  const thinned = thinningNote(picked.length, xs.length, "data points", "row order");
  if (thinned) notes.push(thinned);
  const domain = curves.map((c) => c.label);
  const legend = {
    title: null,
    orient: "bottom",
    direction: "vertical",
    symbolType: "stroke",
    labelLimit: 480,
  };
  const x = {
    field: "x",
    type: "quantitative",
    scale: { domain: [lo - pad, hi + pad], nice: false },
  };
  const y = { field: "y", type: "quantitative", scale: { domain: yDomain, nice: false } };
  const sym = strengthSymbol(result.scale);
  const spec = {
    $schema: SCHEMA_URL,
    title: {
      text: title(
        `${result.target} against ${input} at the chosen ${sym} = ` +
          num(result.chosen.strength),
      ),
      subtitle: subtitle([
        `Dots: the ${xs.length} rows. Curves: ${
          result.scale === "alpha" ? "all-rows coordinate-descent fits" : "exact all-rows refits"
        } at three ${sym}; the chosen ` +
        `one by ${ruleWords(result.chosen.rule)} (${foldWords(result.folds)}).`,
        `Shaded: outside the data's range of ${input}, [${num(lo)}, ${num(hi)}]: extrapolation.`,
        ...notes,
      ]),
    },
    width: SIZE.wide,
    height: SIZE.tall,
    layer: [
      {
        data: { values: [{ from: lo - pad, to: lo }, { from: hi, to: hi + pad }] },
        mark: { type: "rect", color: COLORS.outside },
        encoding: { x: { ...x, field: "from" }, x2: { field: "to" } },
      },
      {
        data: {
          values: [{ x: lo - pad / 2, label: "outside" }, { x: hi + pad / 2, label: "outside" }],
        },
        mark: {
          type: "text",
          baseline: "top",
          fontSize: 10,
          color: COLORS.muted,
          angle: 270,
          align: "right",
        },
        encoding: { x, y: { value: 6 }, text: { field: "label" } },
      },
      {
        data: { values: picked.map((i) => ({ x: xs[i], y: ys[i] })) },
        mark: { type: "point", filled: true, size: 30, opacity: 0.75, color: COLORS.point },
        encoding: {
          x: { ...x, axis: { title: input } },
          y: { ...y, axis: { title: result.target } },
        },
      },
      {
        data: {
          values: curves.flatMap((c) =>
            grid.map((gx, i) => ({ x: gx, y: c.values[i], curve: c.label }))
          ),
        },
        mark: { type: "line", clip: true },
        encoding: {
          x,
          y,
          color: {
            field: "curve",
            type: "nominal",
            sort: domain,
            scale: { domain, range: curves.map((c) => c.color) },
            legend,
          },
          strokeDash: {
            field: "curve",
            type: "nominal",
            sort: domain,
            scale: { domain, range: curves.map((c) => c.dash) },
            legend,
          },
          strokeWidth: { value: 2 },
        },
      },
    ],
    config: CONFIG,
  } as VegaLiteSpec;
  return showChart(spec, { heading: `Fitted curve: ${result.target}` });
}

interface CurveChoice {
  readonly strength: number;
  readonly label: string;
  readonly short: string;
  readonly color: string;
  readonly dash: number[];
}

/** The chosen λ, the minimum and the smallest grid λ, without repeats. */
function chosenCurves(result: SweepResult): CurveChoice[] {
  const { curve, chosen, minimum } = result;
  const df = (i: number) =>
    result.scale === "alpha"
      ? `${curve[i].nonzero} of ${curve[i].path.length} nonzero`
      : `df ${num(curve[i].df)} of ${curve[i].path.length}`;
  const s = strengthSymbol(result.scale);
  const lam = (l: number) => `${s} = ${l === 0 ? "0 (no penalty)" : num(l)}`;
  const picks: (CurveChoice & { index: number })[] = [
    {
      index: chosen.index,
      strength: chosen.strength,
      label: `chosen: ${lam(chosen.strength)}, ${df(chosen.index)}`,
      short: `chosen-${s}`,
      color: COLORS.chosen,
      dash: [1, 0],
    },
    {
      index: minimum.index,
      strength: minimum.strength,
      label: `smallest CV error: ${lam(minimum.strength)}, ${df(minimum.index)}`,
      short: "smallest-CV-error",
      color: COLORS.minimum,
      dash: [6, 3],
    },
    {
      index: 0,
      strength: curve[0].strength,
      label: `smallest grid ${lam(curve[0].strength)}, ${df(0)}`,
      short: `smallest-${s}`,
      color: COLORS.train,
      dash: [2, 2],
    },
  ];
  return picks.filter((p, i) => picks.findIndex((q) => q.index === p.index) === i);
}

/** The all-rows fit of the sweep's model at another strength (λ or α, as the sweep's scale). */
function refit(result: SweepResult, table: Table, strength: number) {
  return fit(table, {
    target: result.target,
    terms: result.fit.terms.map((t) => t.term),
    penalty: result.fit.summary.penalty,
    standardize: result.standardize,
    intercept: result.intercept,
    ...(result.scale === "alpha" ? { alpha: strength } : { lambda: strength }),
  });
}

function singleInput(result: SweepResult): string {
  const inputs = [...new Set(result.fit.terms.flatMap((t) => t.term.inputs))];
  if (inputs.length !== 1) {
    throw new CurbfitError(
      "BAD_OPTION",
      `fittedCurveChart draws models of one input column, but this model reads ${inputs.length}: ${
        inputs.map((n) => JSON.stringify(n)).join(", ")
      }`,
      "Use residualChart(result.fit, data) to look at a model with several inputs",
      { option: "result" },
    );
  }
  return inputs[0];
}

function numericColumn(table: Table, name: string, role: string): Float64Array {
  const column = table.columns.get(name);
  if (column === undefined) {
    throw new CurbfitError(
      "UNKNOWN_COLUMN",
      `the ${role} column ${JSON.stringify(name)} is not in the data`,
      "Pass the data the sweep was run on",
      { source: table.source, option: "data" },
    );
  }
  if (column.kind !== "number") {
    throw new CurbfitError(
      "BAD_OPTION",
      `the ${role} column ${JSON.stringify(name)} holds categories, so it has no curve to draw`,
      "Use residualChart(result.fit, data) for models of category columns",
      { source: table.source, option: "result" },
    );
  }
  return column.values;
}
