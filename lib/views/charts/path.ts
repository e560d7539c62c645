/**
 * The shrinkage path: every standardized coefficient of the all-rows fit against λ (log axis),
 * one line per design column labelled by its name, the chosen λ marked; under it, on the same λ
 * axis, the constraint reading of the same fits — the budget C(λ) = Σ γ_q w*_q² that each fit
 * meets (the fits minimize training error subject to Σ γ_q w*_q² ≤ C(λ)).
 *
 * @module
 */
import type { VegaLiteSpec } from "../render.ts";
import { ROW_LIMIT, spreadIndices, thinningNote } from "./sample.ts";
import { showChart } from "./show.ts";
import {
  COLORS,
  compactNames,
  CONFIG,
  DASHES,
  foldWords,
  haloText,
  logTicks,
  num,
  SCHEMA_URL,
  SERIES,
  SIZE,
  subtitle,
  textWidth,
  title,
} from "./theme.ts";
import type { CurveSource } from "./validation.ts";
import { type StrengthScale, strengthSymbol } from "../../fit/penalty.ts";

/**
 * What the shrinkage path reads from a sweep (a `SweepResult` has all of it).
 *
 * @example
 * ```ts
 * import type { PathSource } from "./path.ts";
 * const columns = (s: PathSource) => s.names.length;
 * ```
 */
export interface PathSource extends CurveSource {
  /** Design column names, in coefficient order. */
  readonly names: readonly string[];
}

/** Widest legend in pixels (Vega's estimate); longer column names end in "…" there. */
const LEGEND_LIMIT = 260;

/** Most coefficient lines drawn; beyond it the largest (at the smallest λ) are kept. */
export const PATH_LINE_LIMIT = 24;

/**
 * The shrinkage-path chart of a sweep, with the budget C(λ) under it (a Vega-Lite v5 spec that
 * also displays itself in a notebook). λ = 0 has no place on the log axis and is left out (the
 * chart says so).
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../../mod.ts";
 * import { shrinkagePathChart } from "./path.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const y = x.map((v, i) => Math.cos(4 * v) + 0.1 * Math.sin(17 * i));
 * const s = sweep({ x, y }, { target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 3 } });
 * const spec = shrinkagePathChart(s); // one line per P1(x) … P6(x), and C(λ) below
 * ```
 */
export function shrinkagePathChart(result: PathSource): VegaLiteSpec {
  const positive = result.curve.flatMap((p, index) => (p.strength > 0 ? [index] : []));
  const notes: string[] = [];
  if (positive.length < result.curve.length) {
    notes.push("λ = 0 (no penalty) has no place on a log axis and is left out.");
  }
  const spec = positive.length < 2 ? singlePointSpec(result) : pathSpec(result, positive, notes);
  return showChart(spec, { heading: `Shrinkage path: ${result.target}` });
}

function headline(result: PathSource): string {
  const c = result.curve[result.chosen.index];
  const rule = result.chosen.rule === "one-se" ? "one-SE rule" : "smallest CV error";
  const s = strengthSymbol(result.scale);
  const keeps = result.scale === "alpha"
    ? `${c.nonzero} of ${c.path.length} coefficients in the model`
    : `a budget C = ${num(c.budget)}`;
  return `Chosen ${s} = ${num(result.chosen.strength)} (${rule}) keeps ${keeps}`;
}

/** How the bottom panel's quantity is named: the ridge budget C(λ), or the sparse P(w*). */
function budgetWords(scale: StrengthScale) {
  return scale === "alpha"
    ? {
      axis: "P(w*) = Σ γ [ρ|w*| + ((1 − ρ)/2) w*²]",
      short: "P",
      reading: "Bottom: the penalty's size P(w*) = Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] of the " +
        "same fits (Σ_q γ_q |w*_q| for the lasso; every γ_q = 1 unless weights were given).",
    }
    : {
      axis: "budget C(λ)",
      short: "C",
      reading: "Bottom, the constraint reading: the same fits minimize training error subject " +
        "to Σ γ w*² ≤ C(λ).",
    };
}

/**
 * Sparse paths: for each shown coefficient, the largest α at which it is nonzero — where it
 * enters the model as α falls — as a dot on the zero line.
 */
function entryRows(
  curve: PathSource["curve"],
  positive: readonly number[],
  shown: readonly number[],
  labels: readonly string[],
) {
  return shown.flatMap((q) => {
    const top = [...positive].reverse().find((l) => curve[l].path[q] !== 0);
    return top === undefined ? [] : [{ strength: curve[top].strength, term: labels[q], w: 0 }];
  });
}

/** The columns with the largest |coefficient| at the chosen λ, as "name (value)". */
function largest(result: PathSource, labels: readonly string[], count: number): string {
  const w = result.curve[result.chosen.index].path;
  const order = w.map((_, q) => q).sort((a, b) => Math.abs(w[b]) - Math.abs(w[a]) || a - b);
  return order.slice(0, count).map((q) => `${labels[q]} (${num(w[q])})`).join(", ");
}

function pathSpec(result: PathSource, positive: readonly number[], notes: string[]): VegaLiteSpec {
  const curve = result.curve;
  const lo = curve[positive[0]].strength;
  const hi = curve[positive[positive.length - 1]].strength;
  const p = result.names.length;
  const shown = linesShown(result, positive[0]);
  if (shown.length < p) {
    notes.push(
      `Showing the ${shown.length} of ${p} coefficients largest in size at the smallest ` +
        `${strengthSymbol(result.scale)}.`,
    );
  }
  const picked = spreadIndices(
    positive.length,
    Math.max(2, Math.floor(ROW_LIMIT / Math.max(shown.length, 1))),
    positive.flatMap((index, i) => (index === result.chosen.index ? [i] : [])),
  ).map((i) => positive[i]);
  const sym = strengthSymbol(result.scale);
  const words = budgetWords(result.scale);
  const thinned = thinningNote(picked.length, positive.length, `${sym} values`, sym);
  if (thinned) notes.push(thinned);
  const { labels, input } = compactNames(result.names);
  const legendTitle = input === null ? ["design column"] : ["design column", `of ${input}`];
  const legendWidth = Math.min(
    LEGEND_LIMIT,
    Math.max(...[...labels, ...legendTitle].map((t) => textWidth(t, 11))) + 30,
  );
  const width = Math.max(280, Math.min(SIZE.wide, 540 - legendWidth));
  const pathRows = picked.flatMap((l) =>
    shown.map((q) => ({ strength: curve[l].strength, term: labels[q], w: curve[l].path[q] }))
  );
  const budgetRows = picked.filter((l) => curve[l].budget > 0).map((l) => ({
    strength: curve[l].strength,
    budget: curve[l].budget,
  }));
  // Only the line layers carry an axis; the other layers leave theirs unset, so they merge.
  const x = (axis?: unknown) => ({
    field: "strength",
    type: "quantitative",
    scale: { type: "log", domain: [lo, hi], nice: false },
    ...(axis === undefined ? {} : { axis }),
  });
  const lambdaAxis = {
    title: result.scale === "alpha"
      ? "α, sparse penalty strength, 1/(2N) convention (log scale)"
      : "λ, penalty strength (log scale)",
    values: logTicks(lo, hi),
    format: "~g",
    grid: true,
  };
  const chosen = curve[result.chosen.index];
  const chosenRows = chosen.strength > 0
    ? [{
      strength: chosen.strength,
      budget: chosen.budget,
      label: `chosen ${sym} = ${num(chosen.strength)}`,
    }]
    : [];
  // Labels go right of the chosen λ's rule, or left of it when they would leave the plot.
  const at = (width * Math.log(chosen.strength / lo)) / Math.log(hi / lo);
  const right = chosen.strength > 0 &&
    at + textWidth(`chosen ${sym} = ${num(chosen.strength)}`, 11) + 8 <= width;
  const side = { align: right ? "left" : "right", dx: right ? 5 : -5 };
  const chosenRule = {
    data: { values: chosenRows },
    mark: { type: "rule", color: COLORS.chosen, strokeWidth: 1.4 },
    encoding: { x: x() },
  };
  const names = shown.map((q) => labels[q]);
  const legend = {
    title: legendTitle,
    orient: "right",
    symbolType: "stroke",
    titleLimit: legendWidth,
    labelLimit: legendWidth - 20,
  };
  const termColor = {
    field: "term",
    type: "nominal",
    sort: names,
    scale: { domain: names, range: names.map((_, i) => SERIES[i % SERIES.length]) },
    legend,
  };
  const top = {
    width,
    height: SIZE.tall - 20,
    layer: [
      {
        data: { values: [{ w: 0 }] },
        mark: { type: "rule", color: COLORS.muted, strokeWidth: 1 },
        encoding: { y: { field: "w", type: "quantitative" } },
      },
      chosenRule,
      {
        data: { values: pathRows },
        mark: { type: "line", strokeWidth: 1.8, clip: true },
        encoding: {
          x: x({ ...lambdaAxis, title: null }),
          y: {
            field: "w",
            type: "quantitative",
            axis: { title: "standardized coefficient w*" },
          },
          color: termColor,
          strokeDash: {
            field: "term",
            type: "nominal",
            sort: names,
            scale: {
              domain: names,
              range: names.map((_, i) => [...DASHES[Math.floor(i / SERIES.length) % 4]]),
            },
            legend,
          },
        },
      },
      ...(result.scale === "alpha"
        ? [{
          data: { values: entryRows(curve, positive, shown, labels) },
          mark: { type: "point", filled: true, size: 36, opacity: 0.9 },
          encoding: {
            x: x(),
            y: { field: "w", type: "quantitative" },
            color: termColor,
          },
        }]
        : []),
      {
        data: { values: chosenRows },
        mark: {
          type: "text",
          ...side,
          baseline: "top",
          fontSize: 11,
          fontWeight: "bold",
          color: COLORS.chosen,
        },
        encoding: { x: x(), y: { value: 2 }, text: { field: "label" } },
      },
    ],
  };
  const bottom = {
    width,
    height: SIZE.strip,
    layer: [
      chosenRule,
      {
        data: { values: budgetRows },
        mark: { type: "line", color: COLORS.cv, strokeWidth: 2 },
        encoding: {
          x: x(lambdaAxis),
          y: {
            field: "budget",
            type: "quantitative",
            scale: { type: "log" },
            axis: { title: words.axis, format: "~g", tickCount: 4 },
          },
        },
      },
      {
        data: {
          values: chosenRows.map((r) => ({ ...r, label: `${words.short} = ${num(r.budget)}` })),
        },
        mark: { type: "point", filled: true, size: 50, color: COLORS.chosen },
        encoding: { x: x(), y: { field: "budget", type: "quantitative" } },
      },
      ...haloText(chosenRows.map((r) => ({ ...r, label: `${words.short} = ${num(r.budget)}` })), {
        mark: { ...side, baseline: "bottom", dy: -4, fontSize: 11, color: COLORS.chosen },
        encoding: {
          x: x(),
          y: { field: "budget", type: "quantitative" },
          text: { field: "label" },
        },
      }),
    ],
  };
  return {
    $schema: SCHEMA_URL,
    title: {
      text: title(headline(result)),
      subtitle: subtitle([
        "Top: each coefficient of the all-rows fit on the standardized scale (w* = s·w).",
        ...(result.scale === "alpha"
          ? [
            "Read right to left: as α falls, coefficients enter the model one by one; a dot " +
            "marks the largest α at which each is nonzero.",
          ]
          : []),
        words.reading,
        `Largest at the chosen ${sym}: ${largest(result, labels, 3)}; ` +
        `${foldWords(result.folds)}.`,
        ...notes,
      ]),
    },
    vconcat: [top, bottom],
    spacing: 8,
    config: CONFIG,
  } as VegaLiteSpec;
}

/** Indices of the coefficient lines to draw: all, or the largest |w*| at the smallest λ. */
function linesShown(result: PathSource, first: number): number[] {
  const w = result.curve[first].path;
  const all = w.map((_, q) => q);
  if (all.length <= PATH_LINE_LIMIT) return all;
  return all.sort((a, b) => Math.abs(w[b]) - Math.abs(w[a]) || a - b)
    .slice(0, PATH_LINE_LIMIT).sort((a, b) => a - b);
}

/** One λ only: the standardized coefficients at that λ, as dots. */
function singlePointSpec(result: PathSource): VegaLiteSpec {
  const point = result.curve[result.chosen.index];
  const rows = point.path.map((w, q) => ({ term: result.names[q], w }));
  const s = strengthSymbol(result.scale);
  const short = budgetWords(result.scale).short;
  return {
    $schema: SCHEMA_URL,
    title: {
      text: `One ${s} = ${num(point.strength)}: ${short} = ${num(point.budget)}`,
      subtitle: subtitle([
        `Only one ${s} was swept, so there is no path: the standardized coefficients w*_q of ` +
        `the all-rows fit at that ${s} (${foldWords(result.folds)}).`,
      ]),
    },
    width: SIZE.half + 100,
    height: { step: 18 },
    layer: [
      {
        data: { values: [{ w: 0 }] },
        mark: { type: "rule", color: COLORS.muted },
        encoding: { x: { field: "w", type: "quantitative" } },
      },
      {
        data: { values: rows },
        mark: { type: "point", filled: true, size: 50, color: COLORS.cv },
        encoding: {
          x: { field: "w", type: "quantitative", axis: { title: "standardized coefficient w*" } },
          y: { field: "term", type: "nominal", sort: null, axis: { title: null } },
        },
      },
    ],
    config: CONFIG,
  } as VegaLiteSpec;
}
