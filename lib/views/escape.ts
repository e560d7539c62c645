/**
 * Escaping for the three text forms a result is shown in: HTML, Markdown and plain text.
 * Whatever a user puts in a column name or a title must show as the same characters it was,
 * never as markup, a link, a table break or a terminal control sequence.
 *
 * @module
 */

/** Control characters (Unicode category Cc: U+0000–U+001F, U+007F–U+009F). */
const CONTROL = /\p{Cc}/gu;
/** The same set without tab, line feed and carriage return (whitespace HTML keeps as text). */
const CONTROL_BUT_WHITESPACE = /(?![\t\n\r])\p{Cc}/gu;

const NAMED_ESCAPES: Readonly<Record<string, string>> = { "\n": "\\n", "\r": "\\r", "\t": "\\t" };

function visibleControl(ch: string): string {
  return NAMED_ESCAPES[ch] ??
    `\\u${ch.charCodeAt(0).toString(16).padStart(4, "0")}`;
}

/**
 * Replaces every control character (ANSI escape, bell, NUL, line break, tab, …) with a visible
 * escape such as `\u001b` or `\n`, so the text can never move the cursor, colour a terminal or
 * break a one-line layout. Other characters are kept as they are.
 *
 * @example
 * ```ts
 * import { showControls } from "./escape.ts";
 * showControls("red\u001b[31m\nx"); // "red\\u001b[31m\\nx"
 * ```
 */
export function showControls(text: string): string {
  return text.replace(CONTROL, visibleControl);
}

const HTML_ENTITIES: Readonly<Record<string, string>> = {
  "&": "&amp;",
  "<": "&lt;",
  ">": "&gt;",
  '"': "&quot;",
  "'": "&#39;",
};

/**
 * Escapes text for HTML element content and quoted attribute values: `& < > " '` become
 * entities and control characters other than tab/line breaks become visible escapes.
 *
 * @example
 * ```ts
 * import { escapeHtml } from "./escape.ts";
 * escapeHtml(`<script>alert("x")</script> & co`);
 * // "&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; co"
 * ```
 */
export function escapeHtml(text: string): string {
  return text.replace(CONTROL_BUT_WHITESPACE, visibleControl).replace(
    /[&<>"']/g,
    (ch) => HTML_ENTITIES[ch],
  );
}

/**
 * Escapes text for inline Markdown (a paragraph or a table cell). Every character that can
 * start markup inline is backslash-escaped — emphasis and strike (`*`, `_`, `~`), code
 * (backticks), links and images (`[`, `]`, `!`), raw HTML and autolinks (`<`, `>`), entities
 * (`&`), table cells (`|`) and the backslash itself — and so is a leading character that could
 * open a block (`#`, `+`, `-`, `=`, or the `.` or `)` after a leading number). Other punctuation is
 * left as it is, so the raw Markdown stays readable. Control characters, line breaks
 * included, become visible escapes first, so the result is always one line.
 *
 * @example
 * ```ts
 * import { escapeMarkdown } from "./escape.ts";
 * escapeMarkdown("a|b *c* [d](e) <f>"); // "a\\|b \\*c\\* \\[d\\](e) \\<f\\>"
 * ```
 */
export function escapeMarkdown(text: string): string {
  return showControls(text)
    .replace(/[\\`*_~[\]!<>&|]/g, (ch) => `\\${ch}`)
    .replace(/^[#+=-]/, (lead) => `\\${lead}`)
    .replace(/^(\d+)([.)])/, (_, digits, mark) => `${digits}\\${mark}`);
}
