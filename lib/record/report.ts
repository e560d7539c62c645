/**
 * The report `verify` returns: every comparison, an overall verdict, and a plain-text
 * rendering (no ANSI codes) that notebooks show as the cell's output.
 *
 * @module
 */
import { deepFreeze } from "../common/freeze.ts";
import { RELATIVE_TOLERANCE, type Shown, TOLERANCE, type VerifyEntry } from "./checks.ts";
import { verifyBundle } from "../views/display.ts";

/** What `verify` found. Frozen. */
export interface VerifyReport {
  /** True when every entry matched within its tolerance. */
  readonly ok: boolean;
  /** Every comparison, in record order. */
  readonly entries: readonly VerifyEntry[];
  /** The entries that did not match. */
  readonly failures: readonly VerifyEntry[];
  /** Context that is not compared (software versions, creation time, source names). */
  readonly notes: readonly string[];
  /** The report as plain text. */
  text(): string;
  /** Jupyter display: the plain-text rendering (text/plain), with HTML and Markdown forms. */
  [display: symbol]: unknown;
}

const JUPYTER_DISPLAY = Symbol.for("Jupyter.display");

/**
 * Builds the frozen report from entries and notes.
 *
 * @example
 * ```ts
 * import { verifyReport } from "./report.ts";
 * const r = verifyReport([
 *   { field: "data.rows", ok: true, expected: 3, actual: 3, tolerance: "exact", where: null },
 * ], []);
 * console.log(r.ok, r.text().split("\n")[0]); // true Record check: MATCH (1 of 1 checks pass)
 * ```
 */
export function verifyReport(
  entries: readonly VerifyEntry[],
  notes: readonly string[],
): VerifyReport {
  const failures = entries.filter((e) => !e.ok);
  const ok = failures.length === 0;
  const text = () => renderText(entries, failures, notes);
  return deepFreeze({
    ok,
    entries: [...entries],
    failures,
    notes: [...notes],
    text,
    [JUPYTER_DISPLAY]: () => verifyBundle({ text, entries, failures, notes }),
  });
}

function renderText(
  entries: readonly VerifyEntry[],
  failures: readonly VerifyEntry[],
  notes: readonly string[],
): string {
  const passed = entries.length - failures.length;
  const lines = [
    failures.length === 0
      ? `Record check: MATCH (${passed} of ${entries.length} checks pass)`
      : `Record check: MISMATCH (${failures.length} of ${entries.length} checks fail)`,
  ];
  if (failures.length > 0) {
    lines.push("", "Mismatches:");
    for (const f of failures) {
      lines.push(`  ${f.field}${f.where === null ? "" : ` — ${f.where}`} [${f.tolerance}]`);
      lines.push(`      recorded:   ${shown(f.expected)}`);
      lines.push(`      recomputed: ${shown(f.actual)}`);
    }
  }
  lines.push("", "Matched:", ...wrap(entries.filter((e) => e.ok).map((e) => e.field), 96));
  lines.push(
    "",
    "Tolerances:",
    `  ${TOLERANCE.exact}: identical text, integers, hashes and lists of them`,
    `  ${TOLERANCE.each}: |recomputed − recorded| ≤ ${RELATIVE_TOLERANCE} · max(|recomputed|, |recorded|)`,
    `  ${TOLERANCE.vector}: the same bound with the largest magnitude in the vector`,
  );
  if (notes.length > 0) lines.push("", "Notes:", ...notes.map((n) => `  ${n}`));
  lines.push(
    "",
    "A match means the record is what this data and these settings produce; it does not make",
    "the validation error a guarantee, nor predictions outside the data's ranges reliable.",
  );
  return lines.join("\n");
}

function shown(v: Shown): string {
  return typeof v === "string" ? v : JSON.stringify(v);
}

/** Comma-separated items in lines of at most `width` characters, indented by two spaces. */
function wrap(items: readonly string[], width: number): string[] {
  if (items.length === 0) return ["  (none)"];
  const lines: string[] = [];
  let line = "";
  for (const item of items) {
    const next = line === "" ? item : `${line}, ${item}`;
    if (next.length + 2 > width && line !== "") {
      lines.push(`  ${line},`);
      line = item;
    } else line = next;
  }
  lines.push(`  ${line}`);
  return lines;
}
