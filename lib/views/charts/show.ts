/**
 * How charts and results show themselves in a notebook: the Jupyter display method, attached as
 * a non-enumerable property (so JSON, structural equality and schema checks never see it), and
 * the MIME bundle of a chart.
 *
 * Every chart bundle carries the Vega-Lite spec, the SVG drawn in-process, HTML with that SVG
 * inline, a clean text/plain and a PNG (`image/png`, for viewers that show only images). The
 * PNG needs the rasterizer's files (lib/views/png.ts: a local checkout with read permission on
 * Deno's npm cache); when they cannot be read the bundle is sent without it, since SVG and HTML
 * already carry the picture.
 *
 * @module
 */
import { Buffer } from "node:buffer";
import { CurbfitError } from "../../errors/error.ts";
import { makeBundle, type MimeBundle } from "../bundle.ts";
import { showControls } from "../escape.ts";
import { svgToPng } from "../png.ts";
import type { VegaLiteSpec } from "../render.ts";

/**
 * The key Deno's Jupyter kernel calls to display a value.
 *
 * @example
 * ```ts
 * import { JUPYTER_DISPLAY } from "./show.ts";
 * console.log(JUPYTER_DISPLAY === Symbol.for("Jupyter.display")); // true
 * ```
 */
export const JUPYTER_DISPLAY: unique symbol = Symbol.for("Jupyter.display") as never;

/**
 * A MIME bundle, possibly with a PNG (base64, as the Jupyter protocol carries binary data).
 *
 * @example
 * ```ts
 * import type { ShownBundle } from "./show.ts";
 * const hasImage = (b: ShownBundle) => "image/png" in b || "image/svg+xml" in b;
 * ```
 */
export type ShownBundle = MimeBundle & { readonly "image/png"?: string };

/**
 * Attaches `[Symbol.for("Jupyter.display")]()` to an object as a non-enumerable, read-only
 * property (call before freezing) and returns the object.
 *
 * @example
 * ```ts
 * import { JUPYTER_DISPLAY, withDisplay } from "./show.ts";
 * const value = withDisplay({ a: 1 }, (v) => ({ "text/plain": `a = ${v.a}` }));
 * console.log(Object.keys(value), typeof value[JUPYTER_DISPLAY]); // [ "a" ] function
 * ```
 */
export function withDisplay<T extends object, B>(
  value: T,
  show: (value: T) => B,
): T & { readonly [JUPYTER_DISPLAY]: () => B } {
  Object.defineProperty(value, JUPYTER_DISPLAY, {
    value: () => show(value),
    enumerable: false,
    writable: false,
    configurable: false,
  });
  return value as T & { readonly [JUPYTER_DISPLAY]: () => B };
}

/** Title lines of a spec (text, then subtitle), as plain strings. */
export function titleLines(spec: VegaLiteSpec): { text: string[]; subtitle: string[] } {
  const title = (spec as { title?: unknown }).title;
  const lines = (v: unknown): string[] =>
    v === undefined || v === null ? [] : Array.isArray(v) ? v.map(String) : [String(v)];
  if (typeof title === "string" || Array.isArray(title)) {
    return { text: lines(title), subtitle: [] };
  }
  if (typeof title === "object" && title !== null) {
    const t = title as { text?: unknown; subtitle?: unknown };
    return { text: lines(t.text), subtitle: lines(t.subtitle) };
  }
  return { text: [], subtitle: [] };
}

/** What a chart's bundle says besides the picture. */
export interface ChartText {
  /** Short heading above the chart in HTML and on top of the plain text (e.g. "Validation curve"). */
  readonly heading: string;
  /** Extra plain text under the chart's title lines (a small table, notes). */
  readonly plain?: string;
  /** Extra HTML under the chart, already escaped. */
  readonly html?: string;
  /** Markdown, already escaped. */
  readonly markdown?: string;
}

/**
 * The MIME bundle of a chart: spec, SVG, HTML (heading, inline SVG, then `text.html` if given),
 * text/plain (heading, the chart's title and subtitle lines, then `text.plain`) and a PNG.
 *
 * @example
 * ```ts
 * import { chartBundle } from "./show.ts";
 * const spec = {
 *   title: "Two points",
 *   data: { values: [{ x: 1, y: 2 }, { x: 2, y: 3 }] },
 *   mark: "point" as const,
 *   encoding: { x: { field: "x", type: "quantitative" as const }, y: { field: "y", type: "quantitative" as const } },
 * };
 * const bundle = await chartBundle(spec, { heading: "Example" });
 * console.log(Object.keys(bundle));
 * ```
 */
export async function chartBundle(spec: VegaLiteSpec, text: ChartText): Promise<ShownBundle> {
  const { text: title, subtitle } = titleLines(spec);
  const plain = [...title, ...subtitle, ...(text.plain ? ["", text.plain] : [])].join("\n");
  const bundle = await makeBundle({
    spec,
    title: text.heading,
    plain,
    // The chart's title is in the SVG already; without extra HTML the body stays empty.
    htmlBody: text.html ?? "",
    markdown: text.markdown,
  });
  const png = await pngOf(bundle["image/svg+xml"]);
  return png === undefined ? bundle : { ...bundle, "image/png": png };
}

/** PNG scale: 1 pixel per SVG unit (about 70 KB per chart; 2 would double it). The PNG is the
 * fallback for viewers that show only images; SVG and HTML carry the sharp picture. */
const PNG_SCALE = 1;

async function pngOf(svg: string | undefined): Promise<string | undefined> {
  if (svg === undefined) return undefined;
  try {
    return Buffer.from(await svgToPng(svg, { scale: PNG_SCALE })).toString("base64");
  } catch (e) {
    if (e instanceof CurbfitError && e.code === "READ_FAILED") return undefined;
    throw e;
  }
}

/**
 * Makes a chart spec display itself as a chart in a notebook (a non-enumerable display method;
 * the returned spec is a shallow copy, otherwise unchanged plain Vega-Lite JSON). Every chart
 * function of curbfit returns its spec through this; use it on a spec you edited.
 *
 * @example
 * ```ts
 * import { showChart } from "./show.ts";
 * const spec = showChart({
 *   title: "λ against error",
 *   data: { values: [{ l: 1, e: 2 }] },
 *   mark: "point",
 *   encoding: { x: { field: "l", type: "quantitative" }, y: { field: "e", type: "quantitative" } },
 * });
 * spec; // as a cell's last expression: the chart
 * ```
 */
export function showChart<T extends VegaLiteSpec>(spec: T, text?: ChartText): T {
  const heading = text?.heading ?? "Chart";
  // A copy: the caller's object is left alone, and a spec that already displays itself (its
  // display property cannot be redefined) can be shown with new text.
  return withDisplay(visibleControls(spec), (s) => chartBundle(s, { ...text, heading }));
}

/**
 * A deep copy of JSON-like data with every control character in every string (keys included)
 * made visible (`showControls`). Column names and category levels reach chart titles, labels and
 * data; a raw control character would make the SVG ill-formed XML (XML 1.0 forbids most of
 * them) or move a terminal's cursor.
 *
 * @example
 * ```ts
 * import { visibleControls } from "./show.ts";
 * console.log(visibleControls({ title: "a\u0007b" })); // { title: "a\\u0007b" }
 * ```
 */
export function visibleControls<T>(value: T): T {
  if (typeof value === "string") return showControls(value) as T;
  if (Array.isArray(value)) return value.map(visibleControls) as T;
  if (value !== null && typeof value === "object") {
    return Object.fromEntries(
      Object.entries(value).map(([k, v]) => [showControls(k), visibleControls(v)]),
    ) as T;
  }
  return value;
}
