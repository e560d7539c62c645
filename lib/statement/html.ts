/**
 * Blocks → HTML. The fragment uses plain elements only (headings, paragraphs, lists, tables,
 * `pre`, `figure`, `details`) with no script, no style attribute and no link, so it reads the
 * same in a notebook, in nbconvert output and on GitHub; charts are inline SVG drawn by
 * lib/views/render.ts. `htmlPage` wraps a fragment into a standalone page whose only styling is
 * one inline style sheet with no external reference.
 *
 * All text is escaped with `escapeHtml`; Vega escapes the text it writes into SVG.
 *
 * @module
 */
import { escapeHtml } from "../views/escape.ts";
import { renderSvg } from "../views/render.ts";
import { formatHtmlTable } from "../views/table.ts";
import type { Block, Inline } from "./blocks.ts";

/**
 * Renders blocks as an HTML fragment (charts drawn to inline SVG).
 *
 * @throws {CurbfitError} `RENDER_FAILED` when a chart cannot be drawn.
 *
 * @example
 * ```ts
 * import { renderHtml } from "./html.ts";
 * const html = await renderHtml([{ kind: "paragraph", parts: ["rows of ", { code: "<a>.csv" }] }]);
 * console.log(html); // "<p>rows of <code>&lt;a&gt;.csv</code></p>\n"
 * ```
 */
export async function renderHtml(blocks: readonly Block[]): Promise<string> {
  const parts: string[] = [];
  for (const b of blocks) parts.push(await block(b));
  return parts.join("\n") + "\n";
}

async function block(b: Block): Promise<string> {
  switch (b.kind) {
    case "heading":
      return `<h${b.level}>${escapeHtml(b.text)}</h${b.level}>`;
    case "paragraph":
      return `<p>${inline(b.parts)}</p>`;
    case "list":
      return `<ul>\n${b.items.map((item) => `<li>${inline(item)}</li>`).join("\n")}\n</ul>`;
    case "table":
      return formatHtmlTable(b.table, { digits: b.digits ?? 6 });
    case "code":
      return `<pre><code>${escapeHtml(b.lines.join("\n"))}</code></pre>`;
    case "chart":
      return `<figure>\n${await renderSvg(b.spec)}\n<figcaption>${
        escapeHtml(b.caption)
      }</figcaption>\n</figure>`;
    case "details":
      return `<details>\n<summary>${escapeHtml(b.summary)}</summary>\n${await renderHtml(
        b.blocks,
      )}</details>`;
  }
}

function inline(parts: readonly Inline[]): string {
  return parts.map((p) => {
    if (typeof p === "string") return escapeHtml(p);
    if ("code" in p) return `<code>${escapeHtml(p.code)}</code>`;
    return `<strong>${escapeHtml(p.strong)}</strong>`;
  }).join("");
}

/** The page's style sheet: layout and table rules only; no fonts, images or other files. */
const PAGE_STYLE = [
  "body { font-family: sans-serif; max-width: 60rem; margin: 2rem auto; padding: 0 1rem; " +
  "line-height: 1.45; color: #1d2430; }",
  "table { border-collapse: collapse; margin: 0.5rem 0; }",
  "th, td { border-bottom: 1px solid #c9ced6; padding: 0.2rem 0.6rem; vertical-align: top; }",
  "pre { background: #f2f4f7; padding: 0.6rem; overflow-x: auto; }",
  "figure { margin: 1rem 0; } figcaption { font-size: 0.9rem; color: #4a5260; }",
  "details { margin: 0.5rem 0; }",
].join("\n");

/**
 * A standalone HTML page around a fragment: UTF-8, a title, one inline style sheet, no
 * scripts and no reference to any other file or address, so it opens offline.
 *
 * @example
 * ```ts
 * import { htmlPage } from "./html.ts";
 * const page = htmlPage("Statement <1>", "<p>body</p>\n");
 * console.log(page.includes("<title>Statement &lt;1&gt;</title>")); // true
 * ```
 */
export function htmlPage(title: string, fragment: string): string {
  return [
    "<!DOCTYPE html>",
    '<html lang="en">',
    "<head>",
    '<meta charset="utf-8">',
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    `<title>${escapeHtml(title)}</title>`,
    `<style>\n${PAGE_STYLE}\n</style>`,
    "</head>",
    "<body>",
    fragment.trimEnd(),
    "</body>",
    "</html>",
    "",
  ].join("\n");
}
