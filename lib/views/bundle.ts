/**
 * One MIME bundle per result, so every notebook front end shows something good:
 *
 * | MIME type                            | who uses it                                          |
 * | ------------------------------------ | ---------------------------------------------------- |
 * | `application/vnd.vegalite.v5+json`   | JupyterLab / VS Code chart renderers (interactive)   |
 * | `image/svg+xml`                      | viewers that show images but run no JavaScript       |
 * | `text/html`                          | nbconvert, GitHub and JupyterLab: the SVG inline plus |
 * |                                      | a plain table or summary, no CSS, no scripts         |
 * | `text/markdown`                      | optional, Markdown-only consumers                    |
 * | `text/plain`                         | terminals, logs, headless runs: aligned, no ANSI     |
 *
 * A result class shows itself by returning the bundle from `[Symbol.for("Jupyter.display")]()`,
 * which Deno's kernel calls (and awaits) for a cell's last expression.
 *
 * @module
 */

import { escapeHtml, escapeMarkdown, showControls } from "./escape.ts";
import { renderSvg, type VegaLiteSpec } from "./render.ts";

/** The MIME types this module writes. */
export const MIME = {
  vegaLite: "application/vnd.vegalite.v5+json",
  svg: "image/svg+xml",
  html: "text/html",
  markdown: "text/markdown",
  plain: "text/plain",
} as const;

/** A Jupyter MIME bundle as Deno's kernel accepts it: MIME type → content. */
export interface MimeBundle {
  /** Title and body as plain text; control characters shown as visible escapes, no ANSI. */
  readonly "text/plain": string;
  /** One `<div>`: escaped title, the chart as inline SVG when there is one, then the body. */
  readonly "text/html": string;
  /** Bold escaped title, then the caller's Markdown body; absent when none was given. */
  readonly "text/markdown"?: string;
  /** The chart drawn as SVG; absent when the result has no chart. */
  readonly "image/svg+xml"?: string;
  /** The chart's Vega-Lite v5 spec, unchanged; absent when the result has no chart. */
  readonly "application/vnd.vegalite.v5+json"?: VegaLiteSpec;
}

/** What a result provides to be shown. */
export interface BundleParts {
  /** A Vega-Lite v5 chart; rendered to SVG for the `image/svg+xml` and `text/html` entries. */
  readonly spec?: VegaLiteSpec;
  /** Short heading, plain text (escaped here for each format). */
  readonly title: string;
  /** The text/plain body, e.g. from `formatTextTable`. Control characters are made visible. */
  readonly plain: string;
  /** Optional Markdown body, already escaped by the caller (see `escapeMarkdown`). */
  readonly markdown?: string;
  /**
   * Optional HTML body shown under the chart, already escaped by the caller (for example from
   * `formatHtmlTable`). Without it the plain text is shown in a `<pre>` block.
   */
  readonly htmlBody?: string;
}

/** Makes every control character visible except the line breaks that structure plain text. */
function cleanPlain(text: string): string {
  return text.split("\n").map(showControls).join("\n");
}

/**
 * Builds the MIME bundle for a result (see the module notes for the entries). The caller's spec
 * is passed through unchanged; hostile text in `title` shows as text in every format.
 *
 * @throws {CurbfitError} `RENDER_FAILED` when the chart cannot be drawn (see `renderSvg`).
 *
 * @example
 * ```ts
 * import { makeBundle } from "./bundle.ts";
 * import { formatHtmlTable, formatTextTable } from "./table.ts";
 *
 * class WeightTable {
 *   constructor(readonly rows: [string, number][]) {}
 *   [Symbol.for("Jupyter.display")]() {
 *     const table = { header: ["term", "weight"], rows: this.rows };
 *     return makeBundle({
 *       title: "Fitted weights",
 *       plain: formatTextTable(table),
 *       htmlBody: formatHtmlTable(table),
 *     });
 *   }
 * }
 * new WeightTable([["x", 1.5]]); // as a cell's last expression, shows the table
 * ```
 */
export async function makeBundle(parts: BundleParts): Promise<MimeBundle> {
  const svg = parts.spec === undefined ? undefined : await renderSvg(parts.spec);
  const plainBody = cleanPlain(parts.plain);
  const html = [
    `<div>`,
    `<p><strong>${escapeHtml(parts.title)}</strong></p>`,
    ...(svg === undefined ? [] : [`<div>${svg}</div>`]),
    parts.htmlBody ?? `<pre>${escapeHtml(plainBody)}</pre>`,
    `</div>`,
  ].join("\n");
  return {
    ...(parts.spec === undefined ? {} : { [MIME.vegaLite]: parts.spec }),
    ...(svg === undefined ? {} : { [MIME.svg]: svg }),
    [MIME.html]: html,
    ...(parts.markdown === undefined
      ? {}
      : { [MIME.markdown]: `**${escapeMarkdown(parts.title)}**\n\n${parts.markdown}` }),
    [MIME.plain]: `${showControls(parts.title)}\n\n${plainBody}`,
  };
}
