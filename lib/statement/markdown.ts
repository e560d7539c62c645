/**
 * Blocks → CommonMark (with GitHub's pipe tables). Every piece of text is escaped with
 * `escapeMarkdown` (lib/views/escape.ts), so a column name such as `<script>` or `[x](y)` shows
 * as those characters, never as markup or a link; code blocks and code spans use a backtick
 * fence longer than any backtick run inside them, so their content cannot close them early.
 * Charts cannot be drawn in Markdown: their caption is shown with a pointer to the HTML form.
 *
 * @module
 */
import { escapeMarkdown, showControls } from "../views/escape.ts";
import { formatNumber } from "../views/table.ts";
import type { Block, Inline } from "./blocks.ts";

/**
 * Renders blocks as Markdown text ending in one line feed.
 *
 * @example
 * ```ts
 * import { renderMarkdown } from "./markdown.ts";
 * const md = renderMarkdown([
 *   { kind: "heading", level: 2, text: "Data" },
 *   { kind: "paragraph", parts: ["Rows of ", { code: "a<b>.csv" }] },
 * ]);
 * console.log(md); // "## Data\n\nRows of `a<b>.csv`\n"
 * ```
 */
export function renderMarkdown(blocks: readonly Block[]): string {
  return blocks.map(block).join("\n\n") + "\n";
}

function block(b: Block): string {
  switch (b.kind) {
    case "heading":
      return `${"#".repeat(b.level)} ${escapeMarkdown(b.text)}`;
    case "paragraph":
      return inline(b.parts);
    case "list":
      return b.items.map((item) => `- ${inline(item)}`).join("\n");
    case "table":
      return table(b.table.header, b.table.rows, b.digits);
    case "code":
      return codeBlock(b.lines);
    case "chart":
      return `${escapeMarkdown(`Chart (drawn in the HTML form of this statement): ${b.caption}`)}`;
    case "details":
      return escapeMarkdown(b.elsewhere);
  }
}

function inline(parts: readonly Inline[]): string {
  return parts.map((p) => {
    if (typeof p === "string") return escapeMarkdown(p);
    if ("code" in p) return codeSpan(p.code);
    return `**${escapeMarkdown(p.strong)}**`;
  }).join("");
}

/** Longest run of backticks in `text`. */
function longestBacktickRun(text: string): number {
  return Math.max(0, ...(text.match(/`+/g) ?? []).map((run) => run.length));
}

function codeSpan(code: string): string {
  const text = showControls(code);
  const fence = "`".repeat(longestBacktickRun(text) + 1);
  const pad = /^[` ]|[` ]$/.test(text) ? " " : "";
  return `${fence}${pad}${text}${pad}${fence}`;
}

function codeBlock(lines: readonly string[]): string {
  const body = lines.map(showControls);
  const fence = "`".repeat(Math.max(3, longestBacktickRun(body.join("\n")) + 1));
  return [fence, ...body, fence].join("\n");
}

function table(
  header: readonly string[],
  rows: readonly (readonly (string | number)[])[],
  digits = 6,
): string {
  const numeric = header.map((_, j) =>
    rows.every((r) => typeof r[j] === "number" || r[j] === "") &&
    rows.some((r) => typeof r[j] === "number")
  );
  const cell = (c: string | number) =>
    escapeMarkdown(typeof c === "number" ? formatNumber(c, digits) : c);
  const line = (cells: readonly string[]) => `| ${cells.join(" | ")} |`;
  return [
    line(header.map(escapeMarkdown)),
    line(numeric.map((n) => (n ? "---:" : "---"))),
    ...rows.map((r) => line(r.map(cell))),
  ].join("\n");
}
