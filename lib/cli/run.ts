/**
 * `runCli(argv)`: the `curbfit` command line. Runs a command, prints a short summary on stdout,
 * progress on stderr for long runs, and returns the exit code: 0 success, 1 `verify` found a
 * mismatch, 2 a usage or input error (one line on stderr naming the problem, no stack trace),
 * 3 an internal failure (a bug; also one line).
 *
 * @module
 */
import { join } from "node:path";
import { CurbfitError, describePlace } from "../errors/error.ts";
import { readCsv } from "../table/mod.ts";
import { separatorName } from "../table/separator.ts";
import { strengthSymbol } from "../fit/penalty.ts";
import type { Table } from "../table/mod.ts";
import { fit } from "../fit/fit.ts";
import { sweep } from "../sweep/sweep.ts";
import { compare } from "../sweep/compare.ts";
import {
  type ModelChoiceRecord,
  parseRecord,
  readRecordedData,
  recordedSeparator,
  recordJson,
  verify,
} from "../record/mod.ts";
import { showControls } from "../views/escape.ts";
import { formatTextTable } from "../views/table.ts";
import { statement } from "../statement/mod.ts";
import { htmlPage, renderHtml } from "../statement/html.ts";
import { renderMarkdown } from "../statement/markdown.ts";
import type { Block } from "../statement/blocks.ts";
import config from "../../deno.json" with { type: "json" };
import { optionValue, parseArgs, type ParsedArgs } from "./args.ts";
import { commandNamed, COMMANDS, helpText } from "./commands.ts";
import {
  candidateLines,
  compareCandidates,
  compareSettings,
  dataRequest,
  fieldSeparatorOf,
  fitSpec,
  sweepSpec,
} from "./spec.ts";
import { isUsageError, usageError, whatOf } from "./syntax.ts";
import { fitBlocks } from "./fit_report.ts";
import { progressReporter, type ProgressSink } from "./progress.ts";
import { choiceSummary, type OutputFile, writeChoice, writeFiles, wroteLines } from "./output.ts";

/**
 * Exit codes of the command line.
 *
 * @example
 * ```ts
 * import { EXIT, runCli } from "./run.ts";
 * console.log((await runCli(["help"])) === EXIT.ok); // true
 * ```
 */
export const EXIT = { ok: 0, mismatch: 1, usage: 2, internal: 3 } as const;

/**
 * Where the command line writes (a test passes its own).
 *
 * @example
 * ```ts
 * import { type CliIo, runCli } from "./run.ts";
 * const lines: string[] = [];
 * const io: CliIo = { out: (t) => lines.push(t), err: (t) => lines.push(t), errTerminal: false, now: () => 0 };
 * await runCli(["--version"], io);
 * console.log(lines); // [ "curbfit 0.1.0\n" ]
 * ```
 */
export interface CliIo {
  /** Writes text to stdout as it is. */
  out(text: string): void;
  /** Writes text to stderr as it is. */
  err(text: string): void;
  /** Whether stderr is a terminal. */
  readonly errTerminal: boolean;
  /** Milliseconds from a fixed origin (for progress). */
  now(): number;
}

function writeAll(file: { writeSync(p: Uint8Array): number }, text: string): void {
  let bytes = new TextEncoder().encode(text);
  while (bytes.length > 0) bytes = bytes.subarray(file.writeSync(bytes));
}

/**
 * The process's own stdout and stderr.
 *
 * @example
 * ```ts
 * import { processIo } from "./run.ts";
 * processIo().out("hello\n");
 * ```
 */
export function processIo(): CliIo {
  return {
    out: (text) => writeAll(Deno.stdout, text),
    err: (text) => writeAll(Deno.stderr, text),
    errTerminal: Deno.stderr.isTerminal(),
    now: () => performance.now(),
  };
}

/**
 * Runs the command line on `argv` (the words after the program name) and returns the exit
 * code. Never throws: every failure becomes one line on stderr and exit code 2 (usage or
 * input) or 3 (internal).
 *
 * @example
 * ```ts
 * import { runCli } from "./run.ts";
 * const code = await runCli(["verify", "no-such-record.json"]);
 * console.log(code); // 2, after "curbfit verify: …" on stderr
 * ```
 */
export async function runCli(argv: readonly string[], io: CliIo = processIo()): Promise<number> {
  const [name, ...rest] = argv;
  try {
    if (name === undefined) {
      throw usageError("command", "no command given", 'Run "curbfit help" for the commands');
    }
    if (name === "help" || name === "--help" || name === "-h") {
      const topic = rest[0] === undefined ? undefined : knownCommand(rest[0]);
      io.out(helpText(topic) + "\n");
      return EXIT.ok;
    }
    if (name === "--version" || name === "version") {
      io.out(`${config.name} ${config.version}\n`);
      return EXIT.ok;
    }
    const parsed = parseArgs(knownCommand(name), rest);
    if (parsed.help) {
      io.out(helpText(parsed.command) + "\n");
      return EXIT.ok;
    }
    return await RUNNERS[parsed.command.name](parsed, io);
  } catch (e) {
    io.err(errorLine(name, e) + "\n");
    return e instanceof CurbfitError || isDenoError(e) ? EXIT.usage : EXIT.internal;
  }
}

function knownCommand(name: string) {
  const command = commandNamed(name);
  if (command !== undefined) return command;
  throw usageError(
    "command",
    `there is no command ${JSON.stringify(name)} (commands: ${
      COMMANDS.map((c) => c.name).join(", ")
    }, help)`,
    'Run "curbfit help" for what each does',
  );
}

/** Command-line flags for the API options an error may name. */
const FLAG_OF: Readonly<Record<string, string>> = {
  k: "--folds",
  seed: "--seed",
  repeats: "--repeats",
  fraction: "--holdout",
  groups: "--groups",
  "folds.groups": "--groups",
  target: "--target",
  lambda: "--lambda",
  budget: "--budget",
  alpha: "--alpha",
  rule: "--rule",
  lambdas: "--lambdas",
  "lambdas.count": "--lambda-count",
  "lambdas.min": "--lambda-min",
  "lambdas.max": "--lambda-max",
  alphas: "--alphas",
  "alphas.count": "--alpha-count",
  "alphas.ratio": "--alpha-ratio",
  tolerance: "--tolerance",
  closedForm: "--closed-form",
  fieldSeparator: "--field-separator",
};

function flagOf(option: string): string | undefined {
  if (option.startsWith("lambdas[")) return "--lambdas";
  if (option.startsWith("alphas[")) return "--alphas";
  if (option.startsWith("penalty")) return "--penalty";
  if (option.startsWith("terms")) return "--term";
  return FLAG_OF[option];
}

/**
 * The one line an error prints: `curbfit COMMAND: where: what. What to do.` Options the API
 * names are given their command-line flag; options of the command line itself are already
 * named in the message.
 */
function errorLine(command: string | undefined, e: unknown): string {
  const head = command !== undefined && commandNamed(command)
    ? `curbfit ${command}: `
    : "curbfit: ";
  return head + showControls(errorMessage(e));
}

function errorMessage(e: unknown): string {
  if (e instanceof CurbfitError) {
    const option = e.place.option;
    if (option === undefined) return e.message;
    const body = e.message.slice(describePlace(e.place).length);
    const where = describePlace({ ...e.place, option: undefined });
    if (isUsageError(e) || option === "record") return where + body;
    if (option.startsWith("record.")) return `${where}field ${option}: ${body}`;
    const flag = flagOf(option);
    return flag === undefined ? e.message : `${where}${flag}: ${body}`;
  }
  if (isDenoError(e)) {
    return `${e.message}. Run it through "deno task curbfit", which grants reading and writing files`;
  }
  const text = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
  return `internal error (${
    text.split("\n")[0]
  }). This is a bug; please report it with the command line`;
}

/** Permission refusals from Deno (the process was started without --allow-read/--allow-write). */
function isDenoError(e: unknown): e is Error {
  return e instanceof Deno.errors.NotCapable || e instanceof Deno.errors.PermissionDenied;
}

// ---- reading ---------------------------------------------------------------------------------

async function readText(path: string, what: string): Promise<string> {
  try {
    return await Deno.readTextFile(path);
  } catch (e) {
    if (isDenoError(e) && !(e instanceof Deno.errors.PermissionDenied)) throw e;
    throw new CurbfitError(
      "READ_FAILED",
      `the ${what} ${JSON.stringify(path)} cannot be read (${(e as Error).message})`,
      "Check the path; it is read relative to the current folder",
      {},
    );
  }
}

/** Reads and checks a record file; a record that cannot be read names the file and field. */
async function readRecord(path: string): Promise<ModelChoiceRecord> {
  const text = await readText(path, "record");
  try {
    return parseRecord(text);
  } catch (e) {
    if (!(e instanceof CurbfitError)) throw e;
    throw new CurbfitError(e.code, whatOf(e), e.hint, { ...e.place, source: path });
  }
}

// ---- commands ----------------------------------------------------------------------------------

type Runner = (parsed: ParsedArgs, io: CliIo) => Promise<number>;

async function loadData(parsed: ParsedArgs): Promise<{ path: string; table: Table }> {
  const { path, load } = dataRequest(parsed);
  return { path, table: await readCsv(path, load) };
}

function progressSink(io: CliIo): ProgressSink {
  return { write: io.err, terminal: io.errTerminal, now: io.now };
}

/** Writes a record's statement files and the record, and prints the summary. */
async function finishChoice(
  parsed: ParsedArgs,
  io: CliIo,
  json: string,
  dataPath: string,
): Promise<number> {
  io.out(await writeChoice(outDir(parsed), json, dataPath, parsed.command.name) + "\n");
  return EXIT.ok;
}

function outDir(parsed: ParsedArgs): string {
  return optionValue(parsed, "out") ?? join("out", parsed.command.name);
}

const RUNNERS: Readonly<Record<string, Runner>> = {
  async sweep(parsed, io) {
    const spec = sweepSpec(parsed);
    const { path, table } = await loadData(parsed);
    const progress = parsed.values.has("quiet")
      ? undefined
      : progressReporter(progressSink(io), []);
    try {
      const result = sweep(table, { ...spec, progress: progress?.listener });
      return await finishChoice(parsed, io, recordJson(result), path);
    } finally {
      progress?.done();
    }
  },

  async compare(parsed, io) {
    const file = optionValue(parsed, "candidates");
    const lines = file === undefined
      ? []
      : candidateLines(await readText(file, "candidates file"), file);
    const candidates = compareCandidates(parsed, lines);
    const shared = compareSettings(parsed);
    const { path, table } = await loadData(parsed);
    const progress = parsed.values.has("quiet")
      ? undefined
      : progressReporter(progressSink(io), candidates.map((c) => c.name));
    try {
      const result = compare(table, candidates, { ...shared, progress: progress?.listener });
      return await finishChoice(parsed, io, recordJson(result), path);
    } finally {
      progress?.done();
    }
  },

  async fit(parsed, io) {
    const spec = fitSpec(parsed);
    const { table } = await loadData(parsed);
    const model = fit(table, spec);
    const blocks: Block[] = fitBlocks(model, table);
    const files: OutputFile[] = [
      {
        name: "report.html",
        text: htmlPage(`Fitted model: ${spec.target}`, await renderHtml(blocks)),
        about: "the fitted model; opens offline",
      },
      { name: "statement.md", text: renderMarkdown(blocks), about: "the same as Markdown" },
    ];
    const paths = await writeFiles(outDir(parsed), files);
    const s = model.summary;
    io.out(
      showControls(
        `curbfit fit: ${s.target} from ${table.source}, ${s.n} rows, ` +
          `${strengthSymbol(s.scale)} = ${s.strength}`,
      ) +
        `\n\n${formatTextTable(coefficients(s), { digits: 6 })}\n\n` +
        `training MSE ${s.trainMse.toPrecision(4)}, ` +
        (s.descent === null ? `df ${s.df.toPrecision(4)}` : `${s.nonzero} nonzero coefficients`) +
        "\n\n" +
        wroteLines(paths, files) + "\n" +
        "Caution: no cross-validation was run, so the training error understates the error on new " +
        "rows; predictions outside the data's ranges are extrapolation.\n",
    );
    return EXIT.ok;
  },

  async verify(parsed, io) {
    const path = parsed.positional;
    if (path === undefined) {
      throw usageError(
        "RECORD",
        "the record file to check is missing",
        "Write curbfit verify out/demo/record.json",
      );
    }
    const separator = fieldSeparatorOf(parsed);
    const record = await readRecord(path);
    const dataPath = optionValue(parsed, "data") ?? recordedDataPath(record);
    const table = await readVerifyData(record, dataPath, separator);
    const report = verify(record, table);
    io.out(report.text() + "\n");
    if (report.ok) return EXIT.ok;
    const fields = report.failures.map((f) => f.field);
    io.err(
      showControls(
        `curbfit verify: MISMATCH in ${fields.length} of ${report.entries.length} checks: ` +
          `${fields.slice(0, 4).join(", ")}${fields.length > 4 ? ", …" : ""} (details on stdout)`,
      ) + "\n",
    );
    return EXIT.mismatch;
  },

  async report(parsed, io) {
    const path = parsed.positional;
    if (path === undefined) {
      throw usageError(
        "RECORD",
        "the record file to render is missing",
        "Write curbfit report out/demo/record.json",
      );
    }
    const st = statement(await readRecord(path), { recordPath: path });
    const files: OutputFile[] = [
      {
        name: "report.html",
        text: await st.page(),
        about: "the statement with its chart; opens offline",
      },
      { name: "statement.md", text: st.markdown(), about: "the statement as Markdown" },
    ];
    const paths = await writeFiles(outDir(parsed), files);
    io.out(choiceSummary(st.record, "report") + "\n\n" + wroteLines(paths, files) + "\n");
    return EXIT.ok;
  },
};

function coefficients(
  s: { names: readonly string[]; intercept: number; coefficients: readonly number[] },
) {
  return {
    header: ["design column", "coefficient"],
    rows: [["(intercept)", s.intercept], ...s.names.map((n, q) => [n, s.coefficients[q]])],
  };
}

/** Where the record says its data came from, when that names a file. */
function recordedDataPath(record: ModelChoiceRecord): string {
  const source = record.data.source;
  if (["CSV text", "stream", "rows", "columns"].includes(source)) {
    throw usageError(
      "--data",
      `the record's data came from ${JSON.stringify(source)}, not a file`,
      "Save those rows as CSV and pass --data FILE",
    );
  }
  return source;
}

/**
 * Reads the data for `verify` as the record read it (`readRecordedData`), with the separator of
 * `--field-separator` when given. An error about the separator also says which one the record
 * names, and that leaving out `--field-separator` reads with it.
 */
async function readVerifyData(
  record: ModelChoiceRecord,
  path: string,
  separator: string | undefined,
): Promise<Table> {
  try {
    return await readRecordedData(record, path, { fieldSeparator: separator });
  } catch (e) {
    if (!(e instanceof CurbfitError) || e.place.option !== "fieldSeparator") throw e;
    const recorded = recordedSeparator(record);
    const names = record.data.fieldSeparator === undefined
      ? "names no field separator (commas, or rows in memory)"
      : `says its data was read with ${separatorName(recorded, true)}`;
    const leaveOut = separator !== undefined && separator !== recorded
      ? "; leave out --field-separator to read it so"
      : "";
    throw new CurbfitError(e.code, whatOf(e), `${e.hint}. The record ${names}${leaveOut}`, e.place);
  }
}
