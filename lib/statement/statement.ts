/**
 * `statement(record)`: a model-choice record as a one-page statement a reviewer reads —
 * question, data, candidates, evidence chart, decision and rule, cautions, and how to reproduce
 * it — in Markdown, HTML (a fragment or a standalone page), plain text, and through the Jupyter
 * display protocol.
 *
 * Everything is rendered from the record alone (the record is the source of truth); a sweep or
 * comparison result is accepted too and turned into its record first.
 *
 * @module
 */
import type { ComparisonResult } from "../sweep/compare.ts";
import type { SweepResult } from "../sweep/sweep.ts";
import { type ModelChoiceRecord, parseRecord, recordOf } from "../record/mod.ts";
import { MIME } from "../views/bundle.ts";
import type { VegaLiteSpec } from "../views/render.ts";
import type { Block } from "./blocks.ts";
import { htmlPage, renderHtml } from "./html.ts";
import { renderMarkdown } from "./markdown.ts";
import { renderText } from "./text.ts";
import { evidenceSpec } from "./chart.ts";
import {
  candidateBlocks,
  cautionBlocks,
  dataBlocks,
  decisionBlocks,
  evidenceBlocks,
  questionBlocks,
  reproduceBlocks,
  titleBlocks,
} from "./sections.ts";

/**
 * Options of `statement`: what the record cannot know about where its reader finds files.
 *
 * @example
 * ```ts
 * import type { StatementOptions } from "./statement.ts";
 * const options: StatementOptions = { recordPath: "out/demo/record.json" };
 * ```
 */
export interface StatementOptions {
  /** The record file as the reader will find it, for the commands shown (default "record.json"). */
  readonly recordPath?: string;
  /**
   * The data file as the reader will find it, for the commands shown (default: the record's
   * `data.source` when it names a file, else "DATA.csv").
   */
  readonly dataPath?: string;
}

/** Source labels of tables that did not come from a file (lib/table). */
const NOT_A_FILE = ["CSV text", "stream", "rows", "columns"];

const JUPYTER_DISPLAY = Symbol.for("Jupyter.display");

/**
 * A model-choice statement; frozen. Its renderings are pure functions of the record and options.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { statement } from "./statement.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => Math.sin(3 * v) + 0.05 * Math.cos(7 * i)) }, {
 *   target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 4 },
 * });
 * const st = statement(s);
 * console.log(st.markdown().split("\n")[0]); // # Model\-choice statement: y
 * ```
 */
export class Statement {
  /** The checked, frozen record the statement is rendered from. */
  readonly record: ModelChoiceRecord;
  /** The sections as blocks, in reading order. */
  readonly blocks: readonly Block[];

  /**
   * Lays out the sections of an already parsed record; use `statement()` to start from JSON
   * text or a result.
   *
   * @param record a record as returned by `parseRecord` or `recordOf` (kept, not copied)
   * @param options where the reader finds the record and data files, for the commands shown
   */
  constructor(record: ModelChoiceRecord, options: StatementOptions = {}) {
    this.record = record;
    const source = record.data.source;
    const paths = {
      recordPath: options.recordPath ?? "record.json",
      dataPath: options.dataPath ?? (NOT_A_FILE.includes(source) ? "DATA.csv" : source),
    };
    this.blocks = Object.freeze([
      ...titleBlocks(record),
      ...questionBlocks(record),
      ...dataBlocks(record),
      ...candidateBlocks(record),
      ...evidenceBlocks(record),
      ...decisionBlocks(record),
      ...cautionBlocks(record),
      ...reproduceBlocks(record, paths),
    ]);
    Object.freeze(this);
  }

  /** The statement as Markdown (CommonMark with pipe tables; every name escaped). */
  markdown(): string {
    return renderMarkdown(this.blocks);
  }

  /** The statement as plain text, control characters shown as visible escapes. */
  text(): string {
    return renderText(this.blocks);
  }

  /** The statement as an HTML fragment with the chart as inline SVG; no script, no link. */
  html(): Promise<string> {
    return renderHtml(this.blocks);
  }

  /** The statement as a standalone HTML page that opens offline. */
  async page(): Promise<string> {
    return htmlPage(`Model-choice statement: ${this.record.target}`, await this.html());
  }

  /** The evidence chart as a Vega-Lite v5 spec (inline data). */
  chart(): VegaLiteSpec {
    return evidenceSpec(this.record);
  }

  /**
   * Jupyter display: HTML (with the chart inline), Markdown and plain text, each complete on
   * its own. The chart alone is not offered as its own entry, since a front end that preferred
   * it would show the chart without the statement.
   */
  async [JUPYTER_DISPLAY](): Promise<Record<string, string>> {
    return {
      [MIME.html]: `<div>\n${await this.html()}</div>`,
      [MIME.markdown]: this.markdown(),
      [MIME.plain]: this.text(),
    };
  }
}

/** Whether `value` is a sweep or comparison result rather than a record. */
function isResult(value: unknown): value is SweepResult | ComparisonResult {
  if (typeof value !== "object" || value === null || "schema" in value) return false;
  return ("curve" in value && "fit" in value) || ("candidates" in value && "best" in value);
}

/**
 * The statement of a record (JSON text or a parsed record), or of a sweep or comparison
 * result (whose record is made first).
 *
 * @throws {CurbfitError} `BAD_RECORD` when the record cannot be read (see `parseRecord`).
 *
 * @example
 * ```ts
 * import { compare, legendre, recordJson } from "../../mod.ts";
 * import { statement } from "./statement.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const c = compare({ x, y: x.map((v, i) => v * v + 0.05 * Math.sin(11 * i)) }, [
 *   { name: "line", terms: [legendre("x", 1)], lambdas: [0] },
 *   { name: "degree 6", terms: [legendre("x", 6)], rule: "one-se" },
 * ], { target: "y", folds: { k: 5, seed: 1 } });
 * const st = statement(recordJson(c), { recordPath: "out/record.json", dataPath: "data.csv" });
 * console.log(st.text().includes("How to reproduce")); // true
 * ```
 */
export function statement(source: unknown, options: StatementOptions = {}): Statement {
  const record = isResult(source) ? recordOf(source) : parseRecord(source);
  return new Statement(record, options);
}
