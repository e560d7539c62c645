/**
 * The comparison chart: each candidate's CV error ± SE at its chosen λ; the paired per-fold
 * differences to the best candidate (mean, ±1 SE and ±2 SE, the screen `compare` uses); and
 * every candidate's validation curve on one log λ axis. A candidate swept only at λ = 0 (no
 * penalty) has no place on that axis: it is drawn as a dashed level line at its CV error, and
 * the chart says so.
 *
 * @module
 */
import type { PairedDifference } from "../../sweep/compare.ts";
import type { VegaLiteSpec } from "../render.ts";
import { showChart } from "./show.ts";
import {
  COLORS,
  CONFIG,
  foldWords,
  logTicks,
  num,
  type PlanWords,
  SCHEMA_URL,
  SERIES,
  SIZE,
  subtitle,
  title,
} from "./theme.ts";
import type { CurveSource } from "./validation.ts";
import { type StrengthScale, strengthSymbol } from "../../fit/penalty.ts";

/**
 * What the comparison chart reads (a `ComparisonResult` has all of it; so does a recorded
 * comparison, through lib/views/display.ts).
 *
 * @example
 * ```ts
 * import type { ComparisonSource } from "./comparison.ts";
 * const names = (c: ComparisonSource) => c.candidates.map((d) => d.name);
 * ```
 */
export interface ComparisonSource {
  /** Response column name, shown in the heading. */
  readonly target: string;
  /** The one fold plan all candidates share, described in the subtitle. */
  readonly folds: PlanWords;
  /** Name of the candidate with the lowest CV error; the paired differences are against it. */
  readonly best: string;
  /** One entry per candidate, drawn top to bottom in this order. */
  readonly candidates: readonly {
    /** Candidate name (row label and legend entry). */
    readonly name: string;
    /** The chosen strength on the candidate's own scale (ridge λ or sparse α). */
    readonly strength: number;
    /** Mean validation MSE at `strength`. */
    readonly cvMean: number;
    /** Standard error of `cvMean`. */
    readonly cvSe: number;
    /** Paired per-fold difference to the best candidate; null for the best itself. */
    readonly versusBest: PairedDifference | null;
    /** The candidate's sweep, for its validation curve. */
    readonly sweep: CurveSource;
  }[];
}

/** Height of one candidate's row in the two interval panels. */
const ROW = 40;

/**
 * The comparison chart of a `compare` result (a Vega-Lite v5 spec that also displays itself in
 * a notebook). The title names the best candidate and its CV error; the subtitle says which
 * candidates the paired screen cannot tell apart from it.
 *
 * @example
 * ```ts
 * import { compare, legendre } from "../../../mod.ts";
 * import { comparisonChart } from "./comparison.ts";
 * const x = Array.from({ length: 60 }, (_, i) => i / 59);
 * const y = x.map((v, i) => v * v + 0.05 * Math.sin(31 * i));
 * const c = compare({ x, y }, [
 *   { name: "quadratic, no penalty", terms: [legendre("x", 2)], lambdas: [0] },
 *   { name: "degree 10, weight decay", terms: [legendre("x", 10)], rule: "one-se" },
 * ], { target: "y", folds: { k: 5, seed: 11 } });
 * const spec = comparisonChart(c);
 * ```
 */
export function comparisonChart(result: ComparisonSource): VegaLiteSpec {
  const names = result.candidates.map((c) => c.name);
  const colors = names.map((_, i) => SERIES[i % SERIES.length]);
  const best = result.candidates.find((c) => c.name === result.best) ?? result.candidates[0];
  const tied = result.candidates.filter((c) => c.versusBest?.indistinguishable);
  const worse = result.candidates.filter((c) => c.versusBest && !c.versusBest.indistinguishable);
  const zeroOnly = result.candidates.filter((c) => c.sweep.curve.every((p) => p.strength === 0));
  const scales = [...new Set(result.candidates.map((c) => c.sweep.scale))];
  const notes = [
    `${foldWords(result.folds)}; the same folds for all ${names.length} candidates, ` +
    (scales.length > 1
      ? "each at its own chosen strength: λ for ridge (sum-of-squares units), α for lasso / " +
        "elastic net (1/(2N) convention); the two are not comparable numbers."
      : `each at its own chosen ${strengthSymbol(scales[0])}.`),
    tied.length > 0
      ? `Within 2 SE of the best (paired): ${tied.map((c) => c.name).join("; ")}.`
      : "No other candidate is within 2 SE of the best (paired).",
    ...(worse.length > 0
      ? [`Worse by more than 2 SE: ${worse.map((c) => c.name).join("; ")}.`]
      : []),
    ...(zeroOnly.length > 0
      ? [
        `Swept only at λ = 0 (no penalty), so not on the log λ axis: ${
          zeroOnly.map((c) => c.name).join("; ")
        }; drawn as a dashed level line at its CV error.`,
      ]
      : []),
  ];
  const color = {
    field: "name",
    type: "nominal",
    scale: { domain: names, range: colors },
    legend: null,
  };
  const spec = {
    $schema: SCHEMA_URL,
    title: {
      text: title(
        `Best: ${best.name}, CV error ${num(best.cvMean)} ± ${num(best.cvSe)} at ` +
          strengthWords(best.sweep.scale, best.strength),
      ),
      subtitle: subtitle(notes),
    },
    vconcat: [
      errorPanel(result, color),
      differencePanel(result, color),
      ...scales.map((scale) =>
        curvesPanel(
          result.candidates.filter((c) => c.sweep.scale === scale),
          color,
          scale,
          scales.length > 1,
        )
      ),
    ],
    spacing: 18,
    config: CONFIG,
  } as VegaLiteSpec;
  return showChart(spec, { heading: `Comparison: ${result.target}` });
}

/** "λ = 0.1", "λ = 0 (no penalty)" or "α = 0.01". */
function strengthWords(scale: StrengthScale, strength: number): string {
  return `${strengthSymbol(scale)} = ${strength === 0 ? "0 (no penalty)" : num(strength)}`;
}

/** Candidate rows: the name written above its interval, in the candidate's colour. */
function rowLayers(
  names: readonly string[],
  color: object,
  values: readonly object[],
  x: object,
): unknown[] {
  const y = {
    field: "name",
    type: "nominal",
    sort: names,
    scale: { domain: names, paddingInner: 0.1, paddingOuter: 0.1 },
    axis: null,
  };
  return [
    {
      data: { values },
      mark: { type: "text", align: "left", baseline: "bottom", dy: -7, fontSize: 11 },
      encoding: { x: { value: 0 }, y, text: { field: "label" }, color },
    },
    {
      data: { values },
      mark: { type: "rule", strokeWidth: 1.2 },
      encoding: { x: { ...x, field: "lo2" }, x2: { field: "hi2" }, y, color },
    },
    {
      data: { values },
      mark: { type: "rule", strokeWidth: 4, opacity: 0.55 },
      encoding: { x: { ...x, field: "lo" }, x2: { field: "hi" }, y, color },
    },
    {
      data: { values },
      mark: { type: "point", filled: true, size: 70, opacity: 1 },
      encoding: { x: { ...x, field: "mid" }, y, color },
    },
  ];
}

/** CV error ± SE (thick) per candidate; the thin line is ±2 SE. */
function errorPanel(result: ComparisonSource, color: object): unknown {
  const names = result.candidates.map((c) => c.name);
  const values = result.candidates.map((c) => {
    const se = Number.isFinite(c.cvSe) ? c.cvSe : 0;
    return {
      name: c.name,
      label: `${c.name}: ${num(c.cvMean)} ± ${num(c.cvSe)} at ` +
        strengthWords(c.sweep.scale, c.strength),
      mid: c.cvMean,
      lo: c.cvMean - se,
      hi: c.cvMean + se,
      lo2: c.cvMean - 2 * se,
      hi2: c.cvMean + 2 * se,
    };
  });
  const x = {
    type: "quantitative",
    scale: { zero: false },
    axis: { title: "CV error at the chosen λ: mean, ±1 SE (thick), ±2 SE (thin)" },
  };
  return {
    width: SIZE.wide,
    height: ROW * names.length,
    layer: rowLayers(names, color, values, x),
  };
}

/** Paired per-fold difference to the best: mean, ±1 SE (thick), ±2 SE (thin); 0 marked. */
function differencePanel(result: ComparisonSource, color: object): unknown {
  const names = result.candidates.map((c) => c.name);
  const values = result.candidates.map((c) => {
    const d = c.versusBest ?? { mean: 0, se: 0, indistinguishable: true };
    const verdict = c.versusBest === null
      ? "the best (reference)"
      : d.indistinguishable
      ? `${num(d.mean)} ± ${num(d.se)}: within 2 SE`
      : `${num(d.mean)} ± ${num(d.se)}: worse by more than 2 SE`;
    return {
      name: c.name,
      label: `${c.name}: ${verdict}`,
      mid: d.mean,
      lo: d.mean - d.se,
      hi: d.mean + d.se,
      lo2: d.mean - 2 * d.se,
      hi2: d.mean + 2 * d.se,
    };
  });
  const x = {
    type: "quantitative",
    axis: { title: `paired difference to ${clip(result.best, 40)}, per fold (CV error)` },
  };
  return {
    width: SIZE.wide,
    height: ROW * names.length,
    layer: [
      {
        data: { values: [{ zero: 0 }] },
        mark: { type: "rule", color: COLORS.muted, strokeDash: [4, 3] },
        encoding: { x: { field: "zero", type: "quantitative" } },
      },
      ...rowLayers(names, color, values, x),
    ],
  };
}

/** Text cut to `n` characters with an ellipsis (for axis titles, where names repeat). */
function clip(text: string, n: number): string {
  return text.length <= n ? text : `${text.slice(0, n - 1)}…`;
}

/**
 * The validation curves of the candidates on one strength scale, on one log axis; λ = 0-only
 * candidates as levels. Ridge (λ) and sparse (α) candidates get separate panels: their
 * strengths are in different units.
 */
function curvesPanel(
  candidates: ComparisonSource["candidates"],
  color: object,
  scale: StrengthScale,
  mixed: boolean,
): unknown {
  const s = strengthSymbol(scale);
  const withCurve = candidates.filter((c) => c.sweep.curve.some((p) => p.strength > 0));
  const levels = candidates.filter((c) => !c.sweep.curve.some((p) => p.strength > 0));
  const rows = withCurve.flatMap((c) =>
    c.sweep.curve.filter((p) => p.strength > 0).map((p) => ({
      name: c.name,
      strength: p.strength,
      cv: p.cvMean,
    }))
  );
  const bestCv = Math.min(...candidates.map((c) => c.cvMean));
  const top = 1.04 * Math.min(
    Math.max(...rows.map((r) => r.cv), ...levels.map((c) => c.cvMean)),
    Math.max(3 * bestCv, ...levels.map((c) => c.cvMean), ...candidates.map((c) => c.cvMean)),
  );
  const chosen = withCurve.filter((c) => c.strength > 0).map((c) => ({
    name: c.name,
    strength: c.strength,
    cv: c.cvMean,
  }));
  const y = {
    field: "cv",
    type: "quantitative",
    scale: { domain: [0, top], nice: false },
    axis: { title: "mean CV error" },
  };
  const layers: unknown[] = [];
  if (rows.length > 0) {
    const lo = Math.min(...rows.map((r) => r.strength));
    const hi = Math.max(...rows.map((r) => r.strength));
    const x = {
      field: "strength",
      type: "quantitative",
      scale: { type: "log", domain: [lo, hi], nice: false },
    };
    layers.push(
      {
        data: { values: rows },
        mark: { type: "line", strokeWidth: 2, clip: true },
        encoding: {
          x: {
            ...x,
            axis: {
              title: scale === "alpha" ? "α, 1/(2N) convention (log scale)" : "λ (log scale)",
              values: logTicks(lo, hi),
              format: "~g",
            },
          },
          y,
          color,
        },
      },
      {
        data: { values: chosen },
        mark: { type: "point", filled: true, size: 60, opacity: 1, clip: true },
        encoding: { x, y, color },
      },
    );
  }
  if (levels.length > 0) {
    const values = levels.map((c) => ({
      name: c.name,
      cv: c.cvMean,
      label: `${clip(c.name, 40)} (${s} = 0)`,
    }));
    layers.push(
      {
        data: { values },
        mark: { type: "rule", strokeDash: [5, 4], strokeWidth: 1.6 },
        encoding: { y, color },
      },
      {
        data: { values },
        mark: { type: "text", align: "right", baseline: "bottom", dy: -3, fontSize: 11 },
        encoding: { x: { value: SIZE.wide - 2 }, y, text: { field: "label" }, color },
      },
    );
  }
  return {
    width: SIZE.wide,
    height: SIZE.tall - 80,
    title: {
      text: mixed
        ? `Validation curves over ${s}, ${scale === "alpha" ? "lasso / elastic net" : "ridge"} ` +
          `candidates (dots: each candidate's chosen ${s})`
        : `Validation curves (dots: each candidate's chosen ${s})`,
      fontSize: 12,
      fontWeight: "normal",
      color: COLORS.ink,
    },
    layer: layers,
  };
}
