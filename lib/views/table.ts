/**
 * Small tables in two forms: aligned plain text (for `text/plain`) and a bare HTML `<table>`
 * (for `text/html`, readable with no CSS). Both take the same input.
 *
 * Numbers are written with `Number.prototype.toPrecision` (a fixed count of significant digits,
 * exponent form when the value needs more integer digits than that or is below 1e-6) and
 * trailing zeros dropped, so the same value always prints the same way and never shows digits
 * it does not have. A column
 * whose cells are all numbers (empty strings allowed) is right-aligned, header included; every
 * other column is left-aligned. Width is counted in code points, which is exact for Latin, Greek
 * and the usual math symbols but not for double-width (East Asian) characters.
 *
 * @module
 */

import { CurbfitError } from "../errors/error.ts";
import { escapeHtml, showControls } from "./escape.ts";

/**
 * One table cell: text, or a number formatted by the table.
 *
 * @example
 * ```ts
 * import type { Cell } from "./table.ts";
 * const row: Cell[] = ["degree 4", 0.0312];
 * ```
 */
export type Cell = string | number;

/**
 * A table to show: a header row and data rows of the same length.
 *
 * @example
 * ```ts
 * import type { CellTable } from "./table.ts";
 * const table: CellTable = { header: ["candidate", "CV error"], rows: [["degree 4", 0.0312]] };
 * ```
 */
export interface CellTable {
  /** Column headings. */
  readonly header: readonly string[];
  /** Data rows; each has `header.length` cells. */
  readonly rows: readonly (readonly Cell[])[];
}

/** How numbers are written. */
export interface NumberStyle {
  /** Significant digits for numbers (1–17). Default 6. */
  readonly digits?: number;
}

function checkDigits(digits: number): void {
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) {
    throw new CurbfitError(
      "BAD_OPTION",
      `digits is ${digits}, but it must be a whole number from 1 to 17`,
      "pass digits between 1 and 17 (6 is the default)",
      { option: "digits" },
    );
  }
}

/**
 * Writes one number with at most `digits` significant digits (`toPrecision`, then trailing
 * zeros dropped); `NaN` and infinities are written as `NaN`, `Inf` and `-Inf`.
 *
 * @example
 * ```ts
 * import { formatNumber } from "./table.ts";
 * formatNumber(2 / 3); // "0.666667"
 * formatNumber(1.5); // "1.5"
 * formatNumber(1234.5, 3); // "1.23e+3"
 * formatNumber(-Infinity); // "-Inf"
 * ```
 */
export function formatNumber(x: number, digits = 6): string {
  checkDigits(digits);
  if (Number.isNaN(x)) return "NaN";
  if (!Number.isFinite(x)) return x > 0 ? "Inf" : "-Inf";
  const [mantissa, exponent] = x.toPrecision(digits).split("e");
  const trimmed = mantissa.includes(".") ? mantissa.replace(/\.?0+$/, "") : mantissa;
  return exponent === undefined ? trimmed : `${trimmed}e${exponent}`;
}

function cellText(cell: Cell, digits: number): string {
  return typeof cell === "number" ? formatNumber(cell, digits) : cell;
}

function numericColumns(table: CellTable): boolean[] {
  return table.header.map((_, j) =>
    table.rows.every((row) => typeof row[j] === "number" || row[j] === "") &&
    table.rows.some((row) => typeof row[j] === "number")
  );
}

function checkTable(table: CellTable, digits: number): void {
  table.rows.forEach((row, i) => {
    if (row.length !== table.header.length) {
      throw new CurbfitError(
        "BAD_OPTION",
        `table row ${i + 1} has ${row.length} cells but the header has ${table.header.length}`,
        "give every row one cell per header column",
        { option: `rows[${i}]` },
      );
    }
  });
  checkDigits(digits);
}

function width(text: string): number {
  return [...text].length;
}

function pad(text: string, size: number, right: boolean): string {
  const fill = " ".repeat(size - width(text));
  return right ? fill + text : text + fill;
}

/**
 * Lays a table out as aligned plain text: columns separated by two spaces, a dashed rule under
 * the header, no trailing spaces, no colour codes (control characters in cells are shown as
 * visible escapes).
 *
 * @example
 * ```ts
 * import { formatTextTable } from "./table.ts";
 * formatTextTable({ header: ["term", "weight"], rows: [["x", 1.5], ["x^2", -0.25]] });
 * // "term  weight\n----  ------\nx        1.5\nx^2    -0.25"
 * ```
 */
export function formatTextTable(table: CellTable, style: NumberStyle = {}): string {
  const digits = style.digits ?? 6;
  checkTable(table, digits);
  const numeric = numericColumns(table);
  const header = table.header.map(showControls);
  const body = table.rows.map((row) => row.map((cell) => showControls(cellText(cell, digits))));
  const widths = header.map((h, j) => Math.max(width(h), ...body.map((row) => width(row[j]))));
  const line = (cells: readonly string[]) =>
    cells.map((c, j) => pad(c, widths[j], numeric[j])).join("  ").trimEnd();
  const rule = widths.map((w) => "-".repeat(w)).join("  ");
  return [line(header), rule, ...body.map(line)].join("\n");
}

/**
 * Builds a bare HTML table (`<table>`, `<thead>`, `<tbody>`, `<th>`, `<td>`) with every cell
 * escaped. Numeric columns carry the `align="right"` attribute, which static viewers honour even
 * when they drop CSS.
 *
 * @example
 * ```ts
 * import { formatHtmlTable } from "./table.ts";
 * formatHtmlTable({ header: ["term", "weight"], rows: [["<x>", 1.5]] });
 * // "<table>\n<thead><tr><th>term</th><th align=\"right\">weight</th></tr></thead>\n..."
 * ```
 */
export function formatHtmlTable(table: CellTable, style: NumberStyle = {}): string {
  const digits = style.digits ?? 6;
  checkTable(table, digits);
  const numeric = numericColumns(table);
  const cell = (tag: "th" | "td", text: string, j: number) =>
    `<${tag}${numeric[j] ? ' align="right"' : ""}>${escapeHtml(text)}</${tag}>`;
  const head = `<thead><tr>${table.header.map((h, j) => cell("th", h, j)).join("")}</tr></thead>`;
  const rows = table.rows.map((row) =>
    `<tr>${row.map((c, j) => cell("td", cellText(c, digits), j)).join("")}</tr>`
  );
  return ["<table>", head, "<tbody>", ...rows, "</tbody>", "</table>"].join("\n");
}
