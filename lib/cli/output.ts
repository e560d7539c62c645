/**
 * Writing a run's files (report.html, statement.md, record.json) and the short text summary
 * printed after it. Shared by the command line and the demo.
 *
 * @module
 */
import { join } from "node:path";
import { type ModelChoiceRecord, modelStrengths } from "../record/mod.ts";
import { strengthSymbol } from "../fit/penalty.ts";
import { statement } from "../statement/mod.ts";
import { describeFolds, standingTable } from "../statement/sections.ts";
import { showControls } from "../views/escape.ts";
import { formatNumber, formatTextTable } from "../views/table.ts";
import { shellCommand, verifyCommand } from "./rerun.ts";
import { usageError } from "./syntax.ts";

/**
 * One file to write: its name in the output folder, its text, and a few words about it.
 *
 * @example
 * ```ts
 * import type { OutputFile } from "./output.ts";
 * const note: OutputFile = { name: "note.txt", text: "hello\n", about: "a note" };
 * ```
 */
export interface OutputFile {
  readonly name: string;
  readonly text: string;
  readonly about: string;
}

/**
 * Writes files into `dir` (made if needed), replacing files of the same name; returns their
 * paths. A folder that cannot be written is a usage error naming `--out`.
 *
 * @example
 * ```ts
 * import { writeFiles } from "./output.ts";
 * const dir = await Deno.makeTempDir();
 * console.log(await writeFiles(dir, [{ name: "a.txt", text: "hi\n", about: "a greeting" }]));
 * ```
 */
export async function writeFiles(dir: string, files: readonly OutputFile[]): Promise<string[]> {
  const paths: string[] = [];
  try {
    await Deno.mkdir(dir, { recursive: true });
    for (const f of files) {
      const path = join(dir, f.name);
      await Deno.writeTextFile(path, f.text);
      paths.push(path);
    }
  } catch (e) {
    if (e instanceof Deno.errors.NotCapable) throw e;
    throw usageError(
      "--out",
      `cannot write into the folder ${JSON.stringify(dir)} (${(e as Error).message})`,
      "Choose a folder you can write with --out DIR",
    );
  }
  return paths;
}

/**
 * "Wrote:" and one line per written file.
 *
 * @example
 * ```ts
 * import { wroteLines } from "./output.ts";
 * console.log(wroteLines(["out/a.txt"], [{ name: "a.txt", text: "", about: "a greeting" }]));
 * // Wrote:
 * //   out/a.txt  a greeting
 * ```
 */
export function wroteLines(paths: readonly string[], files: readonly OutputFile[]): string {
  const width = Math.max(...paths.map((p) => p.length));
  return [
    "Wrote:",
    ...paths.map((p, i) => `  ${showControls(p).padEnd(width)}  ${files[i].about}`),
  ].join("\n");
}

/**
 * The caution every summary ends with.
 *
 * @example
 * ```ts
 * import { CAUTION_LINE } from "./output.ts";
 * console.log(CAUTION_LINE.startsWith("Caution:")); // true
 * ```
 */
export const CAUTION_LINE = "Caution: a cross-validation error is an estimate, not a guarantee; " +
  "predictions outside the data's ranges are extrapolation.";

/**
 * The short text summary of a record: what was run, the standings, what was chosen.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { choiceSummary } from "./output.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(choiceSummary(recordOf(s), "sweep"));
 * ```
 */
export function choiceSummary(record: ModelChoiceRecord, command: string): string {
  const best = record.comparison?.best;
  const model = record.models.find((m) => best === undefined || m.name === best) ??
    record.models[0];
  const st = modelStrengths(model);
  const at = `${strengthSymbol(st.scale)} = ${formatNumber(st.chosen, 4)}`;
  const chosen = best === undefined
    ? `Chosen: ${at} (${model.choice.rule} rule).`
    : `Chosen: ${best} at ${at} (lowest mean CV error at its chosen ${strengthSymbol(st.scale)}).`;
  return [
    showControls(
      `curbfit ${command}: ${record.target} from ${record.data.source}, ${record.data.rows} ` +
        `rows, ${describeFolds(record.folds)}`,
    ),
    "",
    formatTextTable(standingTable(record), { digits: 4 }),
    "",
    showControls(chosen),
  ].join("\n");
}

/**
 * Writes report.html, statement.md and record.json for a record's JSON text into `dir`, and
 * returns the summary to print: standings, choice, the files, the verify command and the
 * caution. The statement is rendered from the JSON text itself.
 *
 * @example
 * ```ts
 * import { legendre, recordJson, sweep } from "../../mod.ts";
 * import { writeChoice } from "./output.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(await writeChoice(await Deno.makeTempDir(), recordJson(s), "data.csv", "sweep"));
 * ```
 */
export async function writeChoice(
  dir: string,
  json: string,
  dataPath: string,
  command: string,
): Promise<string> {
  const recordPath = join(dir, "record.json");
  const st = statement(json, { recordPath, dataPath });
  const files: OutputFile[] = [
    {
      name: "report.html",
      text: await st.page(),
      about: "the statement with its chart; opens offline",
    },
    { name: "statement.md", text: st.markdown(), about: "the statement as Markdown" },
    { name: "record.json", text: json, about: "the model-choice record" },
  ];
  const paths = await writeFiles(dir, files);
  return [
    choiceSummary(st.record, command),
    "",
    wroteLines(paths, files),
    `Check it: ${showControls(shellCommand(verifyCommand(recordPath, dataPath)))}`,
    CAUTION_LINE,
  ].join("\n");
}
