/**
 * The statement as a small document tree: headings, paragraphs, lists, tables, code and a
 * chart. Section builders produce blocks; one renderer per format (Markdown, HTML, plain text)
 * turns them into text, so every format says the same thing and escaping lives in one place
 * per format.
 *
 * Text inside blocks is the user's text as it is (column names, file names, candidate names);
 * renderers escape it.
 *
 * @module
 */
import type { VegaLiteSpec } from "../views/render.ts";
import type { CellTable } from "../views/table.ts";

/**
 * A piece of running text: plain, a code span, or strong emphasis.
 *
 * @example
 * ```ts
 * import type { Inline } from "./blocks.ts";
 * const parts: Inline[] = ["Target ", { strong: "brix" }, " from ", { code: "orchard.csv" }];
 * ```
 */
export type Inline = string | { readonly code: string } | { readonly strong: string };

/**
 * One block of the statement.
 *
 * - `heading`: a section title (level 1 is the statement's title);
 * - `paragraph`: running text;
 * - `list`: bulleted items of running text;
 * - `table`: a small table (numbers formatted by lib/views/table.ts, `digits` significant digits);
 * - `code`: lines shown verbatim in a code block (commands, the objective);
 * - `chart`: a Vega-Lite spec, drawn only where a format can hold a drawing (HTML), with a
 *   caption every format shows;
 * - `details`: blocks HTML folds away under a summary line; Markdown and plain text show only
 *   the `elsewhere` sentence instead, to stay one page.
 *
 * @example
 * ```ts
 * import type { Block } from "./blocks.ts";
 * const blocks: Block[] = [
 *   { kind: "heading", level: 2, text: "Data" },
 *   { kind: "paragraph", parts: ["36 rows."] },
 * ];
 * ```
 */
export type Block =
  | { readonly kind: "heading"; readonly level: 1 | 2 | 3; readonly text: string }
  | { readonly kind: "paragraph"; readonly parts: readonly Inline[] }
  | { readonly kind: "list"; readonly items: readonly (readonly Inline[])[] }
  | { readonly kind: "table"; readonly table: CellTable; readonly digits?: number }
  | { readonly kind: "code"; readonly lines: readonly string[] }
  | { readonly kind: "chart"; readonly spec: VegaLiteSpec; readonly caption: string }
  | {
    readonly kind: "details";
    readonly summary: string;
    readonly blocks: readonly Block[];
    readonly elsewhere: string;
  };

/**
 * The plain characters of running text (code spans and emphasis unmarked).
 *
 * @example
 * ```ts
 * import { plainInline } from "./blocks.ts";
 * console.log(plainInline(["a ", { code: "b" }, { strong: "c" }])); // "a bc"
 * ```
 */
export function plainInline(parts: readonly Inline[]): string {
  return parts.map((p) => (typeof p === "string" ? p : "code" in p ? p.code : p.strong)).join("");
}
