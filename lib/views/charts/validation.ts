/**
 * The validation curve: mean CV error against λ on a log axis, with its ±1 SE band, faint
 * single-fold curves, the training error, the minimum and the chosen λ marked and labelled, the
 * two sides of the curve named (small λ: too little penalty, overfitting; large λ: too much,
 * underfitting), and a second reading of λ along the top as effective degrees of freedom.
 *
 * λ = 0 (no penalty) has no place on a log axis; a grid point at λ = 0 is drawn as a dashed
 * level line across the plot, and a sweep with a single λ is drawn as its fold errors instead.
 *
 * @module
 */
import type { CurvePoint } from "../../sweep/sweep.ts";
import type { Choice } from "../../sweep/select.ts";
import { type StrengthScale, strengthSymbol } from "../../fit/penalty.ts";
import type { VegaLiteSpec } from "../render.ts";
import { ROW_LIMIT, spreadIndices, thinningNote } from "./sample.ts";
import { showChart } from "./show.ts";
import {
  COLORS,
  CONFIG,
  foldWords,
  haloText,
  logTicks,
  num,
  type PlanWords,
  ruleWords,
  SCHEMA_URL,
  SIZE,
  subtitle,
  textWidth,
  title,
} from "./theme.ts";

/**
 * What the validation curve reads from a sweep (a `SweepResult` has all of it; so does a
 * recorded sweep, through `recordCurveSource` in lib/views/display.ts).
 *
 * @example
 * ```ts
 * import type { CurveSource } from "./validation.ts";
 * const chosenError = (s: CurveSource) => s.curve[s.chosen.index].cvMean;
 * ```
 */
export interface CurveSource {
  /** Response column name, used in the heading and the y-axis title. */
  readonly target: string;
  /** Number of rows the sweep used, quoted in the subtitle. */
  readonly n: number;
  /** The grid points in ascending strength. */
  readonly curve: readonly CurvePoint[];
  /** The point with the smallest mean CV error (marked on the chart). */
  readonly minimum: Choice;
  /** The point the selection rule picked (marked, and named in the title). */
  readonly chosen: Choice;
  /** The sweep's plain-language notes, added to the curve's subtitle. */
  readonly notes: readonly string[];
  /** How the rows were split, described in the title or subtitle. */
  readonly folds: PlanWords;
  /** Which convention the curve's strengths are on: ridge λ or sparse α. */
  readonly scale: StrengthScale;
}

/** Options of {@link validationCurveChart}. */
export interface ValidationOptions {
  /** Draw every fold's validation curve faintly (default: when there are at most 20 folds). */
  readonly folds?: boolean;
}

/** Most folds drawn one by one by default. */
const FOLD_CURVES_DEFAULT_LIMIT = 20;

/**
 * The validation-curve chart of a sweep (a Vega-Lite v5 spec that also displays itself in a
 * notebook). The title states the chosen λ, the rule, the folds and the seed.
 *
 * The y axis starts at 0. It reaches up far enough to show the whole large-λ side and at least
 * three times the smallest CV error; where the small-λ side climbs higher it is cut at the top
 * edge and the subtitle gives the largest value.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../../mod.ts";
 * import { validationCurveChart } from "./validation.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const y = x.map((v, i) => Math.cos(4 * v) + 0.1 * Math.sin(17 * i));
 * const s = sweep({ x, y }, { target: "y", terms: [legendre("x", 10)], folds: { k: 5, seed: 3 } });
 * const spec = validationCurveChart(s);
 * console.log(spec.title); // { text: "Chosen λ = … by the smallest CV error (5-fold CV, seed 3)", … }
 * ```
 */
export function validationCurveChart(
  result: CurveSource,
  options: ValidationOptions = {},
): VegaLiteSpec {
  const positive = result.curve.flatMap((p, index) => (p.strength > 0 ? [{ p, index }] : []));
  const spec = positive.length < 2
    ? singleLambdaSpec(result)
    : curveSpec(result, positive, options);
  return showChart(spec, { heading: `Validation curve: ${result.target}` });
}

/** The title line: the chosen λ, how and on which folds. */
function headline(result: CurveSource): string {
  const s = strengthSymbol(result.scale);
  const lambda = result.chosen.strength === 0
    ? `${s} = 0 (no penalty)`
    : `${s} = ${num(result.chosen.strength)}`;
  return `Chosen ${lambda} by ${ruleWords(result.chosen.rule)} (${foldWords(result.folds)})`;
}

/** Sentences with the numbers behind the choice. */
function numbersSentences(result: CurveSource): string[] {
  const min = result.curve[result.minimum.index];
  const chosen = result.curve[result.chosen.index];
  const at = (p: CurvePoint) => `${num(p.cvMean)} ± ${num(p.cvSe)}`;
  const lam = (l: number) => (l === 0 ? "0 (no penalty)" : num(l));
  const s = strengthSymbol(result.scale);
  const df = result.scale === "alpha"
    ? `${chosen.nonzero} nonzero coefficients`
    : `${num(chosen.df)} effective df`;
  const first = `Smallest CV error ${at(min)} (mean ± SE) at ${s} = ${lam(min.strength)}.`;
  const second = result.chosen.index === result.minimum.index
    ? `There: ${df}; ${result.target}, ${result.n} rows.`
    : `At the chosen ${s}: ${at(chosen)}, ${df} (${result.n} rows).`;
  return [first, second];
}

interface Indexed {
  readonly p: CurvePoint;
  readonly index: number;
}

function curveSpec(
  result: CurveSource,
  positive: readonly Indexed[],
  options: ValidationOptions,
): VegaLiteSpec {
  const width = SIZE.wide;
  const height = SIZE.tall;
  const lo = positive[0].p.strength;
  const hi = positive[positive.length - 1].p.strength;
  const zero = result.curve.find((p) => p.strength === 0);
  const foldCount = result.curve[0].foldMse.length;
  const showFolds = options.folds ?? foldCount <= FOLD_CURVES_DEFAULT_LIMIT;
  const yTop = yDomainTop(result, positive, zero);
  const notes: string[] = [...result.notes];
  const clipped = clipNote(positive, yTop, showFolds, result.scale);
  if (clipped) notes.push(clipped);
  if (zero) {
    notes.push(
      `λ = 0 (no penalty) cannot sit on a log axis: its CV error, ${num(zero.cvMean)}, ` +
        "is the dashed level line.",
    );
  }
  const x = (axis: unknown = null) => ({
    field: "strength",
    type: "quantitative",
    scale: { type: "log", domain: [lo, hi], nice: false },
    axis,
  });
  const y = { type: "quantitative", scale: { domain: [0, yTop], nice: false } };
  const curveRows = positive.map(({ p }) => ({
    strength: p.strength,
    cv: p.cvMean,
    lo: p.cvMean - (Number.isFinite(p.cvSe) ? p.cvSe : 0),
    hi: p.cvMean + (Number.isFinite(p.cvSe) ? p.cvSe : 0),
    train: p.trainMse,
    df: p.df,
  }));
  const series = seriesScale(foldCount, showFolds);
  const layers: unknown[] = [
    {
      data: { values: curveRows },
      mark: { type: "area", color: COLORS.band, opacity: 0.7, clip: true },
      encoding: {
        x: x(bottomAxis(lo, hi, result.scale)),
        y: {
          ...y,
          field: "lo",
          axis: { title: `mean squared error of ${result.target}`, grid: true },
        },
        y2: { field: "hi" },
      },
    },
  ];
  if (showFolds) {
    const { rows, note } = foldRows(positive, result, series.domain[2]);
    if (note) notes.push(note);
    layers.push({
      data: { values: rows },
      mark: { type: "line", strokeWidth: 0.8, opacity: 0.5, clip: true },
      encoding: {
        x: x(),
        y: { ...y, field: "mse" },
        detail: { field: "fold", type: "nominal" },
        color: series.color,
        strokeDash: series.dash,
      },
    });
  }
  // Training error first, so the CV error line is drawn over it; the top axis rides on the latter.
  const line = (name: string, field: "train" | "cv", strokeWidth: number, axis?: unknown) => ({
    data: { values: curveRows.map((r) => ({ strength: r.strength, series: name, mse: r[field] })) },
    mark: { type: "line", strokeWidth, clip: true },
    encoding: {
      x: x(axis ?? null),
      y: { ...y, field: "mse" },
      color: series.color,
      strokeDash: series.dash,
    },
  });
  layers.push(
    line(series.domain[1], "train", 1.8),
    line(
      series.domain[0],
      "cv",
      2.4,
      result.scale === "alpha"
        ? nonzeroAxis(positive, lo, hi, width)
        : dfAxis(positive, lo, hi, width, result.curve),
    ),
  );
  if (zero) layers.push(...zeroLayers(zero, width));
  layers.push(...choiceLayers(result, x, [lo, hi, width]));
  layers.push(...sideLabels(width, height));
  return {
    $schema: SCHEMA_URL,
    title: {
      text: title(headline(result)),
      subtitle: subtitle([...numbersSentences(result), ...notes]),
    },
    width,
    height,
    layer: layers,
    config: CONFIG,
  } as VegaLiteSpec;
}

/** The legend: three line kinds, one colour and dash each. */
function seriesScale(foldCount: number, showFolds: boolean) {
  const domain = [
    "CV error ± 1 SE",
    "training error",
    `single folds (${foldCount})`,
  ];
  const shown = showFolds ? domain : domain.slice(0, 2);
  const range = [COLORS.cv, COLORS.train, COLORS.fold].slice(0, shown.length);
  const dashes = [[1, 0], [6, 3], [1, 0]].slice(0, shown.length);
  const legend = {
    title: null,
    orient: "bottom",
    direction: "horizontal",
    symbolType: "stroke",
    symbolStrokeWidth: 2.4,
    offset: 34,
  };
  return {
    domain,
    color: {
      field: "series",
      type: "nominal",
      scale: { domain: shown, range },
      legend,
    },
    dash: {
      field: "series",
      type: "nominal",
      scale: { domain: shown, range: dashes },
      legend,
    },
  };
}

/** λ (or α) ticks at powers of ten along the bottom. */
function bottomAxis(lo: number, hi: number, scale: StrengthScale) {
  return {
    orient: "bottom",
    title: scale === "alpha"
      ? "α, sparse penalty strength, 1/(2N) convention (log scale)"
      : "λ, penalty strength (log scale)",
    values: logTicks(lo, hi),
    format: "~g",
    grid: true,
  };
}

/** Effective degrees of freedom at which the top axis is labelled, if inside the curve's range. */
const DF_MARKS = [0.5, 1, 2, 3, 4, 5, 6, 8, 10, 12, 15, 20, 30, 40, 50, 75, 100, 150, 200, 300];

/** Least horizontal distance between two labels of the df axis, in pixels. */
const DF_LABEL_GAP = 36;

/**
 * The top axis: λ positions where the effective degrees of freedom reach round values (found by
 * linear interpolation in log λ between grid points; df falls as λ grows).
 */
function dfAxis(
  positive: readonly Indexed[],
  lo: number,
  hi: number,
  width: number,
  curve: readonly CurvePoint[],
) {
  const pixel = (l: number) => (width * Math.log(l / lo)) / Math.log(hi / lo);
  const ticks: { strength: number; df: number }[] = [];
  for (const df of DF_MARKS) {
    const lambda = lambdaAtDf(positive, df);
    if (lambda === undefined) continue;
    if (ticks.every((t) => Math.abs(pixel(t.strength) - pixel(lambda)) >= DF_LABEL_GAP)) {
      ticks.push({ strength: lambda, df });
    }
  }
  const p = curve.length > 0 ? Math.round(curve[0].path.length) : 0;
  return {
    orient: "top",
    title: `effective degrees of freedom (${p} penalized columns)`,
    values: ticks.map((t) => t.strength),
    labelExpr: `[${ticks.map((t) => JSON.stringify(String(t.df))).join(",")}][indexof([${
      ticks.map((t) => String(t.strength)).join(",")
    }], datum.value)]`,
    grid: false,
    labelColor: COLORS.muted,
    titleColor: COLORS.muted,
  };
}

/**
 * The top axis of a sparse curve: at each α where the all-rows solution's nonzero count changes
 * (the largest α with that count, where the next coefficient has entered), that count.
 */
function nonzeroAxis(positive: readonly Indexed[], lo: number, hi: number, width: number) {
  const pixel = (a: number) => (width * Math.log(a / lo)) / Math.log(hi / lo);
  const ticks: { strength: number; count: number }[] = [];
  for (let i = positive.length - 1; i >= 0; i--) {
    const { p } = positive[i];
    const above = i + 1 < positive.length ? positive[i + 1].p.nonzero : -1;
    if (p.nonzero === above) continue;
    if (ticks.every((t) => Math.abs(pixel(t.strength) - pixel(p.strength)) >= DF_LABEL_GAP)) {
      ticks.push({ strength: p.strength, count: p.nonzero });
    }
  }
  const p = positive[0].p.path.length;
  return {
    orient: "top",
    title: `nonzero coefficients of ${p} (all-rows fit; each count at the largest α with it)`,
    values: ticks.map((t) => t.strength),
    labelExpr: `[${ticks.map((t) => JSON.stringify(String(t.count))).join(",")}][indexof([${
      ticks.map((t) => String(t.strength)).join(",")
    }], datum.value)]`,
    grid: false,
    labelColor: COLORS.muted,
    titleColor: COLORS.muted,
  };
}

function lambdaAtDf(positive: readonly Indexed[], df: number): number | undefined {
  for (let i = 1; i < positive.length; i++) {
    const a = positive[i - 1].p;
    const b = positive[i].p;
    if (a.df >= df && b.df <= df && a.df !== b.df) {
      const t = (a.df - df) / (a.df - b.df);
      return Math.exp(Math.log(a.strength) + t * Math.log(b.strength / a.strength));
    }
  }
  return undefined;
}

/**
 * Top of the y axis: everything on the large-λ side of the minimum (mean + SE), the training
 * error, the λ = 0 level line, and at least 3 × the smallest CV error; never more than the data
 * need.
 */
function yDomainTop(
  result: CurveSource,
  positive: readonly Indexed[],
  zero: CurvePoint | undefined,
): number {
  const upper = (p: CurvePoint) => p.cvMean + (Number.isFinite(p.cvSe) ? p.cvSe : 0);
  const all = Math.max(...positive.map(({ p }) => Math.max(upper(p), p.trainMse)));
  const right = Math.max(
    ...positive.filter(({ index }) => index >= result.minimum.index).map(({ p }) => upper(p)),
    ...positive.map(({ p }) => p.trainMse),
    zero ? zero.cvMean : 0,
    3 * result.curve[result.minimum.index].cvMean,
  );
  return 1.04 * Math.min(Math.max(all, zero ? zero.cvMean : 0), right);
}

function clipNote(
  positive: readonly Indexed[],
  top: number,
  showFolds: boolean,
  scale: StrengthScale,
): string {
  const above = positive.filter(({ p }) => p.cvMean > top);
  if (above.length > 0) {
    const s = strengthSymbol(scale);
    const worst = above.reduce((a, b) => (b.p.cvMean > a.p.cvMean ? b : a));
    const edge = above[above.length - 1].p.strength;
    return `For ${s} ≤ ${num(edge)} the mean CV error runs above the top edge ` +
      `(up to ${num(worst.p.cvMean)} at ${s} = ${num(worst.p.strength)}).`;
  }
  const cut = positive.some(({ p }) =>
    p.cvMean + p.cvSe > top || (showFolds && p.foldMse.some((e) => e > top))
  );
  return cut ? "Parts of the band and of single-fold curves are cut at the top edge." : "";
}

/** Single-fold validation errors as rows, thinned along λ if there are too many. */
function foldRows(positive: readonly Indexed[], result: CurveSource, series: string) {
  const folds = positive[0].p.foldMse.length;
  const limit = Math.max(2, Math.floor(ROW_LIMIT / folds));
  const keep = positive.flatMap(({ index }, i) =>
    index === result.minimum.index || index === result.chosen.index ? [i] : []
  );
  const picked = spreadIndices(positive.length, limit, keep);
  const rows = picked.flatMap((i) =>
    positive[i].p.foldMse.map((mse, fold) => ({
      strength: positive[i].p.strength,
      fold,
      mse,
      series,
    }))
  );
  const s = strengthSymbol(result.scale);
  const note = thinningNote(picked.length, positive.length, `${s} values of the fold curves`, s);
  return { rows, note };
}

/** λ = 0 as a dashed level line with its label at the right end. */
function zeroLayers(zero: CurvePoint, width: number): unknown[] {
  const label = `λ = 0: ${num(zero.cvMean)}`;
  return [
    {
      data: { values: [{ cv: zero.cvMean }] },
      mark: { type: "rule", color: COLORS.muted, strokeDash: [4, 4], strokeWidth: 1.4 },
      encoding: { y: { field: "cv", type: "quantitative" } },
    },
    ...haloText([{ cv: zero.cvMean, label }], {
      mark: { align: "right", baseline: "bottom", dy: -3, fontSize: 11, color: COLORS.muted },
      encoding: {
        x: { value: width - 2 },
        y: { field: "cv", type: "quantitative" },
        text: { field: "label" },
      },
    }),
  ];
}

/** Rules, points and labels for the minimum and the chosen λ, and the one-SE threshold. */
function choiceLayers(
  result: CurveSource,
  x: (axis?: unknown) => object,
  [lo, hi, width]: readonly [number, number, number],
): unknown[] {
  const min = result.curve[result.minimum.index];
  const chosen = result.curve[result.chosen.index];
  const same = result.minimum.index === result.chosen.index;
  const s = strengthSymbol(result.scale);
  const marks = same
    ? [{
      strength: chosen.strength,
      cv: chosen.cvMean,
      label: `chosen = minimum, ${s} = ${num(chosen.strength)}`,
      kind: "chosen",
    }]
    : [
      {
        strength: chosen.strength,
        cv: chosen.cvMean,
        label: `chosen, ${s} = ${num(chosen.strength)}`,
        kind: "chosen",
      },
      {
        strength: min.strength,
        cv: min.cvMean,
        label: `minimum, ${s} = ${num(min.strength)}`,
        kind: "minimum",
      },
    ];
  const onAxis = marks.filter((m) => m.strength > 0);
  const layers: unknown[] = [];
  if (result.chosen.rule === "one-se" && !same && min.strength > 0 && chosen.strength > 0) {
    const limit = min.cvMean + min.cvSe;
    layers.push(
      {
        data: { values: [{ strength: min.strength, to: chosen.strength, cv: limit }] },
        mark: { type: "rule", color: COLORS.chosen, strokeDash: [2, 3], strokeWidth: 1.4 },
        encoding: { x: x(), x2: { field: "to" }, y: { field: "cv", type: "quantitative" } },
      },
      // Centred over the threshold segment (at the geometric middle of its two λ), so the label
      // stays inside the plot even when the chosen λ is at the right edge.
      ...haloText([{
        strength: Math.sqrt(min.strength * chosen.strength),
        cv: limit,
        label: "min + 1 SE",
      }], {
        mark: {
          align: "center",
          baseline: "bottom",
          dy: -3,
          fontSize: 10,
          color: COLORS.chosen,
        },
        encoding: { x: x(), y: { field: "cv", type: "quantitative" }, text: { field: "label" } },
      }),
    );
  }
  // Labels in two rows at the top (chosen λ first), each on the side of its rule where it fits
  // (preferred: chosen to the right, minimum to the left), so they never overlap.
  const span = Math.log(hi / lo);
  onAxis.forEach((m, row) => {
    const isMin = m.kind === "minimum";
    const color = isMin ? COLORS.minimum : COLORS.chosen;
    const at = (width * Math.log(m.strength / lo)) / span;
    const room = textWidth(m.label, 11) + 8;
    const right = isMin ? at < room : at + room <= width;
    layers.push(
      {
        data: { values: [m] },
        mark: { type: "rule", strokeWidth: 1.4, color, strokeDash: isMin ? [3, 3] : [1, 0] },
        encoding: { x: x() },
      },
      {
        data: { values: [m] },
        mark: { type: "point", filled: true, size: 60, opacity: 1, color, clip: true },
        encoding: { x: x(), y: { field: "cv", type: "quantitative" } },
      },
      ...haloText([m], {
        mark: {
          align: right ? "left" : "right",
          baseline: "top",
          dx: right ? 5 : -5,
          fontSize: 11,
          fontWeight: "bold",
          color,
        },
        encoding: { x: x(), y: { value: 4 + 16 * row }, text: { field: "label" } },
      }),
    );
  });
  return layers;
}

/** Below the λ axis: which side of the curve is which. */
function sideLabels(width: number, height: number): unknown[] {
  const side = (x: number, align: "left" | "right", label: string) => ({
    data: { values: [{ label }] },
    mark: {
      type: "text",
      align,
      baseline: "top",
      fontSize: 11,
      fontStyle: "italic",
      color: COLORS.muted,
    },
    encoding: { x: { value: x }, y: { value: height + 36 }, text: { field: "label" } },
  });
  return [
    side(0, "left", "← less penalty: overfitting side"),
    side(width, "right", "more penalty: underfitting side →"),
  ];
}

/** A sweep of a single λ: its fold errors with their mean and ±1 SE. */
function singleLambdaSpec(result: CurveSource): VegaLiteSpec {
  const point = result.curve[result.chosen.index];
  const rows = point.foldMse.map((mse, fold) => ({ fold: fold + 1, mse }));
  const se = Number.isFinite(point.cvSe) ? point.cvSe : 0;
  const stats = [{ mean: point.cvMean, lo: point.cvMean - se, hi: point.cvMean + se }];
  const s = strengthSymbol(result.scale);
  const lambdaWords = point.strength === 0
    ? `No penalty (${s} = 0)`
    : `One ${s} = ${num(point.strength)}`;
  const foldAxis = {
    field: "fold",
    type: "ordinal",
    axis: { title: "validation fold", labelAngle: 0 },
  };
  return {
    $schema: SCHEMA_URL,
    title: {
      text: `${lambdaWords}: CV error ${num(point.cvMean)} ± ${num(point.cvSe)}`,
      subtitle: subtitle([
        `${foldWords(result.folds)}; ${result.target}, ${result.n} rows.`,
        `Only one ${s} was swept, so there is no curve: each dot is one fold's validation ` +
        "error, the line their mean and the band ±1 SE.",
      ]),
    },
    width: Math.min(SIZE.wide, Math.max(160, 28 * rows.length)),
    height: SIZE.strip + 60,
    layer: [
      {
        data: { values: stats },
        mark: { type: "rect", color: COLORS.band, opacity: 0.7 },
        encoding: {
          y: {
            field: "lo",
            type: "quantitative",
            axis: { title: "validation mean squared error" },
          },
          y2: { field: "hi" },
        },
      },
      {
        data: { values: stats },
        mark: { type: "rule", color: COLORS.cv, strokeWidth: 2 },
        encoding: { y: { field: "mean", type: "quantitative" } },
      },
      {
        data: { values: rows },
        mark: { type: "point", filled: true, size: 50, color: COLORS.point },
        encoding: { x: foldAxis, y: { field: "mse", type: "quantitative" } },
      },
    ],
    config: CONFIG,
  } as VegaLiteSpec;
}
