/**
 * Model-choice statements: a record rendered as one page a reviewer reads (question, data,
 * candidates, evidence chart, decision and rule, cautions, how to reproduce), in Markdown,
 * HTML, plain text and through the Jupyter display protocol.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { statement } from "./mod.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => Math.exp(v) + 0.05 * Math.sin(9 * i)) }, {
 *   target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 2 },
 * });
 * const page = await statement(s).page(); // a standalone HTML page, opens offline
 * console.log(page.startsWith("<!DOCTYPE html>")); // true
 * ```
 *
 * @module
 */
export { Statement, statement, type StatementOptions } from "./statement.ts";
export { evidenceCaption, evidenceSpec } from "./chart.ts";
export type { Block, Inline } from "./blocks.ts";
