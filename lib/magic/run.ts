/**
 * Running a parsed `curb` program: load the data, check every column it names (pointing at
 * the template line when one is missing), call `sweep` or `compare`, and keep the notebook's
 * progress output up to date until the result replaces it.
 *
 * @module
 */
import { readCsv, toTable } from "../table/mod.ts";
import type { Table } from "../table/types.ts";
import { sweepAsync, type SweepResult } from "../sweep/sweep.ts";
import { compareAsync, type ComparisonResult } from "../sweep/compare.ts";
import { isFoldPlan } from "../sweep/folds.ts";
import { type Bundle, type DisplaySink, progressDisplay } from "../kernel/progress.ts";
import { CurbfitError, describePlace } from "../errors/error.ts";
import { MagicError } from "./error.ts";
import type { Named } from "./cursor.ts";
import type { Job } from "./job.ts";
import type { CurbProgram, DataNode } from "./parser.ts";
import { nearestWord } from "./words.ts";
import { ridge, strengthScale, strengthSymbol } from "../fit/penalty.ts";

/** What a `curb` template returns: the very objects `sweep` and `compare` return. */
export type CurbResult = SweepResult | ComparisonResult;

/** Options of `runJob`. */
export interface RunOptions {
  /** Where progress goes: default the notebook (when in Deno's kernel); null for none. */
  readonly progress?: DisplaySink | null;
}

/**
 * Loads the data of a program and runs its job.
 *
 * @throws {MagicError} `UNKNOWN_COLUMN` at the template spot naming a column the data lacks,
 * with the nearest column name; errors of the API itself pass through unchanged.
 *
 * @example
 * ```ts
 * import { runJob } from "./run.ts";
 * import { jobOf } from "./job.ts";
 * import { parseTemplate } from "./parser.ts";
 * const tag = (s: TemplateStringsArray, ...v: unknown[]) => parseTemplate(s, v);
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const program = tag`
 *   data ${{ x, y: x.map((v) => v * v) }}
 *   predict y
 *   terms legendre x degree 3
 *   folds 3 seed 5
 * `;
 * const result = await runJob(program, jobOf(program));
 * ```
 */
export async function runJob(
  program: CurbProgram,
  job: Job,
  options: RunOptions = {},
): Promise<CurbResult> {
  const table = await loadData(program.data, program);
  checkColumns(program, table);
  const display = progressDisplay({
    title: titleOf(job, table),
    ...(job.kind === "compare" ? { candidates: job.candidates.map((c) => c.name) } : {}),
    ...(options.progress === undefined ? {} : { sink: options.progress }),
  });
  await display.start();
  let result: CurbResult;
  try {
    result = job.kind === "sweep"
      ? await sweepAsync(table, { ...job.spec, progress: display.listener })
      : await compareAsync(table, job.candidates, { ...job.options, progress: display.listener });
  } catch (e) {
    await display.fail(e);
    throw e;
  }
  await display.finish(await resultBundle(result));
  return result;
}

async function loadData(node: DataNode, program: CurbProgram): Promise<Table> {
  if (node.kind === "file") return await readFile(node, program);
  const value = await node.value;
  if (typeof value !== "object" || value === null) {
    throw new MagicError(
      "MAGIC_SYNTAX",
      "the data value resolved to something that is not a table",
      "Interpolate a table, an array of row objects or an object of column arrays",
      node.spot,
      program.lines[node.spot.line - 1].text,
    );
  }
  return toTable(value as Parameters<typeof toTable>[0]);
}

/**
 * Reads a CSV path with the separator the data line names. A file that seems to use another
 * separator is reported at the data line, with how to name it there.
 */
async function readFile(
  node: Extract<DataNode, { kind: "file" }>,
  program: CurbProgram,
): Promise<Table> {
  const separator = node.fieldSeparator;
  try {
    return await readCsv(node.path, { fieldSeparator: separator?.value });
  } catch (e) {
    if (!(e instanceof CurbfitError) || e.place.option !== "fieldSeparator") throw e;
    const spot = separator?.spot ?? node.spot;
    const where = describePlace({ ...e.place, option: undefined });
    const what = where + e.message.slice(describePlace(e.place).length, -(e.hint.length + 2));
    throw new MagicError(
      e.code,
      what,
      `${separator === undefined ? "Name" : "Correct"} the separator on the data line after ` +
        "the path, e.g. separated by semicolon (or tab, bar, space, or one character in quotes); " +
        "if this really is one column, write its name in double quotes",
      spot,
      program.lines[spot.line - 1].text,
    );
  }
}

/** Every column named in the template must be in the data. */
function checkColumns(program: CurbProgram, table: Table): void {
  const named: Named[] = [program.target];
  const settings = [program.shared, ...program.candidates.map((c) => c.settings)];
  for (const s of settings) for (const t of s.terms ?? []) named.push(...t.columns);
  if (program.folds?.groups !== undefined) named.push(program.folds.groups);
  for (const n of named) {
    if (table.columns.has(n.name)) continue;
    const near = nearestWord(n.name, table.names);
    throw new MagicError(
      "UNKNOWN_COLUMN",
      `the data has no column ${JSON.stringify(n.name)}`,
      (near === undefined ? "" : `Did you mean "${near}"? `) +
        `The columns are: ${table.names.join(", ")}`,
      n.spot,
      program.lines[n.spot.line - 1].text,
      near,
    );
  }
}

function titleOf(job: Job, table: Table): string {
  const folds = job.kind === "sweep" ? job.spec.folds : job.options.folds;
  const split = folds === undefined
    ? "10 folds"
    : isFoldPlan(folds)
    ? `${folds.k} folds`
    : folds.leaveOneOut
    ? "leave-one-out folds"
    : folds.holdout !== undefined
    ? "a held-out split"
    : `${folds.k ?? Math.min(10, table.nRows)} folds`;
  const what = job.kind === "sweep"
    ? `sweeping ${strengthSymbol(strengthScale(job.spec.penalty ?? ridge()))}`
    : `comparing ${job.candidates.length} models`;
  return `${what} on ${table.nRows} rows with ${split}`;
}

/** The result's own display bundle, or a plain summary while results have none. */
async function resultBundle(result: CurbResult): Promise<Bundle> {
  const show = (result as unknown as Record<symbol, unknown>)[Symbol.for("Jupyter.display")];
  if (typeof show === "function") return await show.call(result) as Bundle;
  const lines = "candidates" in result ? result.verdict : [
    `chosen ${strengthSymbol(result.scale)} = ${result.chosen.strength.toPrecision(4)} ` +
    `(rule ${result.chosen.rule}), ` +
    `CV error ${result.curve[result.chosen.index].cvMean.toPrecision(4)} ± ` +
    `${result.curve[result.chosen.index].cvSe.toPrecision(2)}`,
    ...result.notes,
  ];
  const text = lines.join("\n");
  return { "text/plain": text, "text/html": `<pre>${escapeText(text)}</pre>` };
}

function escapeText(text: string): string {
  return text.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;");
}
