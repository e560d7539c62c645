/**
 * Blocks → plain text for terminals, logs and `text/plain`: underlined headings, aligned tables
 * (lib/views/table.ts), indented code. Every control character (ANSI escapes included) is shown
 * as a visible escape, so no name in the data can colour or move a terminal.
 *
 * @module
 */
import { showControls } from "../views/escape.ts";
import { formatTextTable } from "../views/table.ts";
import { type Block, plainInline } from "./blocks.ts";

/**
 * Renders blocks as plain text ending in one line feed.
 *
 * @example
 * ```ts
 * import { renderText } from "./text.ts";
 * console.log(renderText([{ kind: "heading", level: 2, text: "Data" }, { kind: "paragraph", parts: ["36 rows."] }]));
 * // Data
 * // ----
 * //
 * // 36 rows.
 * ```
 */
export function renderText(blocks: readonly Block[]): string {
  return blocks.map(block).join("\n\n") + "\n";
}

function block(b: Block): string {
  switch (b.kind) {
    case "heading": {
      const text = showControls(b.text);
      if (b.level === 3) return text;
      return `${text}\n${(b.level === 1 ? "=" : "-").repeat([...text].length)}`;
    }
    case "paragraph":
      return showControls(plainInline(b.parts));
    case "list":
      return b.items.map((item) => `- ${showControls(plainInline(item))}`).join("\n");
    case "table":
      return formatTextTable(b.table, { digits: b.digits ?? 6 });
    case "code":
      return b.lines.map((line) => `    ${showControls(line)}`).join("\n");
    case "chart":
      return showControls(`Chart (drawn in the HTML form of this statement): ${b.caption}`);
    case "details":
      return showControls(b.elsewhere);
  }
}
