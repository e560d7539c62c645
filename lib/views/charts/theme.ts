/**
 * The look of curbfit charts, in one place: palette, type sizes, axis style and the wording
 * helpers every chart shares (numbers, fold plans, rules). The palette and layout are curbfit's
 * own: ink-blue text on white, a deep teal for validation error, burnt orange for training error,
 * plum for the chosen λ and indigo for the minimum.
 *
 * @module
 */
import type { FoldPlan } from "../../folds/plan.ts";
import type { SelectionRule } from "../../sweep/select.ts";
import { formatNumber } from "../table.ts";
import type { VegaLiteSpec } from "../render.ts";

/** The config block of a Vega-Lite spec. */
type Config = NonNullable<VegaLiteSpec["config"]>;

/**
 * Named colours of curbfit charts.
 *
 * @example
 * ```ts
 * import { COLORS } from "./theme.ts";
 * console.log(COLORS.chosen); // "#a3195b"
 * ```
 */
export const COLORS = {
  /** Text, axis lines. */
  ink: "#1f2d3a",
  /** Secondary text: subtitles, notes, side labels. */
  muted: "#5d6b76",
  /** Grid lines. */
  grid: "#e3e7ea",
  /** Mean CV error. */
  cv: "#17697a",
  /** ±1 SE band around the mean CV error. */
  band: "#b3dbe0",
  /** Single-fold validation curves. */
  fold: "#97a6ae",
  /** Training error. */
  train: "#c0631a",
  /** The chosen λ. */
  chosen: "#a3195b",
  /** The λ of the smallest CV error. */
  minimum: "#36489a",
  /** Data points. */
  point: "#4a5866",
  /** Shading outside the training domain. */
  outside: "#efe9dc",
} as const;

/**
 * Categorical colours for terms and candidates, in order of use (curbfit's own set; after the
 * last one, colours repeat with a dashed stroke).
 *
 * @example
 * ```ts
 * import { SERIES } from "./theme.ts";
 * console.log(SERIES.length); // 12
 * ```
 */
export const SERIES: readonly string[] = [
  "#17697a",
  "#c0631a",
  "#6a4c93",
  "#4d8b31",
  "#b8325a",
  "#2f5597",
  "#a8841a",
  "#5f6b73",
  "#cf6fa3",
  "#3a9e98",
  "#8c3b1e",
  "#7f9c2e",
];

/**
 * Stroke dash patterns that tell repeated colours apart: series i uses
 * `SERIES[i % 12]` with `DASHES[floor(i / 12) % 4]`.
 *
 * @example
 * ```ts
 * import { DASHES } from "./theme.ts";
 * console.log(DASHES[0]); // [] (solid)
 * ```
 */
export const DASHES: readonly (readonly number[])[] = [[], [6, 3], [2, 2], [8, 3, 2, 3]];

/**
 * Plot sizes in pixels, chosen so a chart with its axes, legend and margins fits a notebook
 * column of about 700 px.
 *
 * @example
 * ```ts
 * import { SIZE } from "./theme.ts";
 * console.log(SIZE.wide); // 520
 * ```
 */
export const SIZE = {
  /** Width of a single full-width plot. */
  wide: 520,
  /** Width of each of two plots side by side. */
  half: 250,
  /** Height of a main plot. */
  tall: 280,
  /** Height of a secondary strip. */
  strip: 120,
} as const;

/**
 * The shared Vega-Lite config: fonts, sizes, colours, no frame around plots.
 *
 * @example
 * ```ts
 * import { CONFIG } from "./theme.ts";
 * console.log(CONFIG.font); // "sans-serif"
 * ```
 */
export const CONFIG: Config = {
  font: "sans-serif",
  background: "#ffffff",
  padding: 8,
  view: { stroke: null },
  axis: {
    labelColor: COLORS.ink,
    titleColor: COLORS.ink,
    domainColor: COLORS.muted,
    tickColor: COLORS.muted,
    gridColor: COLORS.grid,
    labelFontSize: 11,
    titleFontSize: 12,
    titleFontWeight: "normal",
    labelLimit: 220,
  },
  legend: {
    labelColor: COLORS.ink,
    titleColor: COLORS.ink,
    labelFontSize: 11,
    titleFontSize: 11,
    titleFontWeight: "normal",
    labelLimit: 240,
  },
  title: {
    anchor: "start",
    color: COLORS.ink,
    fontSize: 14,
    fontWeight: "bold",
    subtitleColor: COLORS.muted,
    subtitleFontSize: 12,
    subtitlePadding: 4,
    offset: 12,
  },
  header: { labelColor: COLORS.ink, titleColor: COLORS.ink },
};

/**
 * The `$schema` URL of Vega-Lite v5 specs (a name; nothing loads it).
 *
 * @example
 * ```ts
 * import { SCHEMA_URL } from "./theme.ts";
 * console.log(SCHEMA_URL.endsWith("v5.json")); // true
 * ```
 */
export const SCHEMA_URL = "https://vega.github.io/schema/vega-lite/v5.json";

/**
 * A number for titles and labels: three significant digits (`formatNumber`), with a true
 * minus sign.
 *
 * @example
 * ```ts
 * import { num } from "./theme.ts";
 * console.log(num(217.7597), num(-0.01234)); // "218" "−0.0123"
 * ```
 */
export function num(x: number, digits = 3): string {
  return formatNumber(x, digits).replace(/^-/, "−");
}

/**
 * The fold-plan fields a chart title uses. Scheme "key-hash" is the fold hash of a key used when
 * rows are streamed or stay in a SQL engine (lib/stream/README.md).
 */
export type PlanWords = Pick<FoldPlan, "k" | "repeats" | "seed"> & {
  readonly scheme: FoldPlan["scheme"] | "key-hash";
  readonly fraction?: number | null;
  readonly groupCount?: number | null;
};

/**
 * How the rows were split, in a few words: "6-fold CV, seed 7".
 *
 * @example
 * ```ts
 * import { foldWords } from "./theme.ts";
 * console.log(foldWords({ scheme: "k-fold", k: 6, repeats: 1, seed: 7 })); // "6-fold CV, seed 7"
 * ```
 */
export function foldWords(plan: PlanWords): string {
  const repeats = plan.repeats > 1 ? ` × ${plan.repeats} repeats` : "";
  const seed = plan.seed === null ? "" : `, seed ${plan.seed}`;
  switch (plan.scheme) {
    case "k-fold":
      return `${plan.k}-fold CV${repeats}${seed}`;
    case "grouped-k-fold":
      return `${plan.k}-fold CV by group${
        plan.groupCount ? ` (${plan.groupCount} groups)` : ""
      }${repeats}${seed}`;
    case "holdout":
      return `one hold-out split${
        plan.fraction ? ` (${num(100 * plan.fraction)}% held out)` : ""
      }${seed}`;
    case "leave-one-out":
      return `leave-one-out CV (${plan.k} folds)`;
    case "explicit":
      return `${plan.k} given folds${repeats}`;
    case "key-hash":
      return `${plan.k}-fold CV by key hash${repeats}${seed}`;
  }
}

/**
 * A selection rule in words: "the one-SE rule" or "the smallest CV error".
 *
 * @example
 * ```ts
 * import { ruleWords } from "./theme.ts";
 * console.log(ruleWords("one-se")); // "the one-SE rule"
 * ```
 */
export function ruleWords(rule: SelectionRule): string {
  return rule === "one-se" ? "the one-SE rule" : "the smallest CV error";
}

/**
 * Splits text into lines of at most `width` characters at spaces (a longer word stays whole).
 * Chart subtitles use it so long notes stay inside a notebook column.
 *
 * @example
 * ```ts
 * import { wrapWords } from "./theme.ts";
 * console.log(wrapWords("one two three four", 9)); // ["one two", "three", "four"]
 * ```
 */
export function wrapWords(text: string, width: number): string[] {
  const lines: string[] = [];
  let line = "";
  for (const word of text.split(/\s+/).filter((w) => w !== "")) {
    if (line !== "" && line.length + 1 + word.length > width) {
      lines.push(line);
      line = word;
    } else line = line === "" ? word : `${line} ${word}`;
  }
  if (line !== "") lines.push(line);
  return lines;
}

/**
 * Subtitle line width in characters. Vega sizes a chart from estimated text widths (0.8 em per
 * character without a canvas package, about 45% more than a typical sans-serif needs), so 66
 * characters at 12 px keep the drawing within a 700 px notebook column.
 */
export const SUBTITLE_WIDTH = 66;

/** Title line width in characters: 56 at 14 px bold stay within a notebook column (see above). */
export const TITLE_WIDTH = 56;

/**
 * Title lines: the sentence wrapped to {@link TITLE_WIDTH} (one line when it fits).
 *
 * @example
 * ```ts
 * import { title } from "./theme.ts";
 * console.log(title("Chosen λ = 10 by the one-SE rule")); // ["Chosen λ = 10 by the one-SE rule"]
 * ```
 */
export function title(sentence: string): string[] {
  return wrapWords(sentence, TITLE_WIDTH);
}

/**
 * Subtitle lines from sentences: each wrapped to {@link SUBTITLE_WIDTH}.
 *
 * @example
 * ```ts
 * import { subtitle } from "./theme.ts";
 * console.log(subtitle(["short one", "another"])); // ["short one", "another"]
 * ```
 */
export function subtitle(sentences: readonly string[]): string[] {
  return sentences.flatMap((s) => wrapWords(s, SUBTITLE_WIDTH));
}

/**
 * Tick values for a log axis over [lo, hi] (lo > 0): powers of ten, or 1-2-5 steps when the
 * range spans less than two decades.
 *
 * @example
 * ```ts
 * import { logTicks } from "./theme.ts";
 * console.log(logTicks(0.01, 900)); // [0.01, 0.1, 1, 10, 100]
 * ```
 */
export function logTicks(lo: number, hi: number): number[] {
  const first = Math.floor(Math.log10(lo));
  const last = Math.ceil(Math.log10(hi));
  const steps = last - first < 3 ? [1, 2, 5] : [1];
  const ticks: number[] = [];
  for (let e = first; e <= last; e++) {
    for (const s of steps) {
      const v = Number(`${s}e${e}`);
      if (v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12)) ticks.push(v);
    }
  }
  return ticks;
}

/**
 * The width Vega assumes for a text when it lays a chart out without a canvas package:
 * 0.8 × font size per character (vega-scenegraph's estimate). Charts use it to decide where a
 * label fits.
 *
 * @example
 * ```ts
 * import { textWidth } from "./theme.ts";
 * console.log(textWidth("λ = 10", 10)); // 48
 * ```
 */
export function textWidth(text: string, fontSize: number): number {
  return Math.floor(0.8 * text.length * fontSize);
}

/**
 * Shorter labels for design columns that all read one input: when every name has the form
 * `label(input)` with the same input, the labels drop `(input)` and `input` is returned for the
 * legend title; otherwise the names stay as they are and `input` is null.
 *
 * @example
 * ```ts
 * import { compactNames } from "./theme.ts";
 * console.log(compactNames(["P1(days)", "P2(days)"])); // { labels: ["P1", "P2"], input: "days" }
 * ```
 */
export function compactNames(
  names: readonly string[],
): { labels: string[]; input: string | null } {
  const parts = names.map((n) => /^([^()]+)\((.+)\)$/.exec(n));
  const inner = parts[0]?.[2];
  const labels = parts.map((m) => m?.[1]);
  if (
    inner === undefined || parts.some((m) => m === null || m[2] !== inner) ||
    new Set(labels).size !== names.length
  ) {
    return { labels: [...names], input: null };
  }
  return { labels: labels as string[], input: inner };
}

/**
 * Text layers drawn twice, first with a thick white outline, so a label stays legible where it
 * crosses lines. `layer.mark` must not set `type`.
 *
 * @example
 * ```ts
 * import { haloText } from "./theme.ts";
 * const layers = haloText([{ label: "here" }], {
 *   mark: { align: "left" },
 *   encoding: { x: { value: 10 }, y: { value: 10 }, text: { field: "label" } },
 * });
 * console.log(layers.length); // 2
 * ```
 */
export function haloText(
  values: readonly object[],
  layer: { readonly mark: object; readonly encoding: object },
): unknown[] {
  return [
    {
      data: { values },
      mark: { type: "text", ...layer.mark, color: "#ffffff", stroke: "#ffffff", strokeWidth: 4 },
      encoding: layer.encoding,
    },
    { data: { values }, mark: { type: "text", ...layer.mark }, encoding: layer.encoding },
  ];
}
