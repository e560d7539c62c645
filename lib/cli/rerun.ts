/**
 * The command lines that reproduce a record: `verify` (check it against the data) and the
 * `sweep` / `compare` command that makes it again from scratch. Both are written from the
 * record's own settings, in the command-line syntax of syntax.ts, and shown in the statement.
 *
 * @module
 */
import {
  type FoldsSection,
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
} from "../record/mod.ts";
import { DEFAULT_TOLERANCE } from "../sparse/mod.ts";
import { CLOSED_FORM_DEFAULT_ROWS } from "../sweep/sweep.ts";
import { type CandidateKey, formatCandidate, formatPenalty, formatTerm } from "./syntax.ts";
import { fieldSeparatorWord } from "./spec.ts";

/**
 * One option of a command line: its name (with dashes) and value (absent for flags).
 *
 * @example
 * ```ts
 * import type { Word } from "./rerun.ts";
 * const words: Word[] = [["--folds", "8"], ["--leave-one-out"]];
 * ```
 */
export type Word = readonly [option: string, value?: string];

/**
 * A command line: the command and its options, one per entry.
 *
 * @example
 * ```ts
 * import type { CommandLine } from "./rerun.ts";
 * const line: CommandLine = { command: "verify", positional: "record.json", options: [["--data", "a.csv"]] };
 * ```
 */
export interface CommandLine {
  readonly command: string;
  readonly positional?: string;
  readonly options: readonly Word[];
}

/** The settings of one model, keyed like a candidate's `key=value` pairs. */
function modelSettings(m: ModelSection, rows: number): [CandidateKey, string][] {
  const out: [CandidateKey, string][] = [];
  for (const t of m.terms) out.push(["terms", formatTerm(t.spec)]);
  const penalty = formatPenalty(m.penalty);
  if (penalty !== "ridge") out.push(["penalty", penalty]);
  if (isSparseModel(m)) {
    if (m.grid.kind === "explicit") out.push(["alphas", m.grid.values.join(",")]);
    else {
      const r = m.grid.request;
      if (r?.count != null) out.push(["alpha-count", String(r.count)]);
      if (r?.ratio != null) out.push(["alpha-ratio", String(r.ratio)]);
    }
    if (m.penalty.tolerance !== DEFAULT_TOLERANCE) {
      out.push(["tolerance", String(m.penalty.tolerance)]);
    }
    out.push(["rule", m.choice.rule]);
    if (!m.standardize) out.push(["scale", "raw"]);
    if (!m.intercept) out.push(["intercept", "no"]);
    return out;
  }
  if (m.grid.kind === "explicit") out.push(["lambdas", m.grid.values.join(",")]);
  else {
    const r = m.grid.request;
    if (r?.count != null) out.push(["lambda-count", String(r.count)]);
    if (r?.min != null) out.push(["lambda-min", String(r.min)]);
    if (r?.max != null) out.push(["lambda-max", String(r.max)]);
  }
  out.push(["rule", m.choice.rule]);
  if (!m.standardize) out.push(["scale", "raw"]);
  if (!m.intercept) out.push(["intercept", "no"]);
  if (m.closedForm !== rows <= CLOSED_FORM_DEFAULT_ROWS) {
    out.push(["closed-form", m.closedForm ? "yes" : "no"]);
  }
  return out;
}

/** Fold options that rebuild the plan, or null when only the recorded assignment can. */
function foldWords(f: FoldsSection): Word[] | null {
  const repeats: Word[] = f.repeats > 1 ? [["--repeats", String(f.repeats)]] : [];
  switch (f.scheme) {
    case "k-fold":
      return [["--folds", String(f.k)], ["--seed", String(f.seed)], ...repeats];
    case "grouped-k-fold":
      if (f.groupColumn === null) return null;
      return [
        ["--folds", String(f.k)],
        ["--seed", String(f.seed)],
        ["--groups", f.groupColumn],
        ...repeats,
      ];
    case "holdout":
      return [["--holdout", String(f.fraction)], ["--seed", String(f.seed)], ...repeats];
    case "leave-one-out":
      return [["--leave-one-out"]];
    case "explicit":
      return null;
  }
}

/** `--field-separator` when the record's data was read with another separator than a comma. */
function separatorWords(record: ModelChoiceRecord): Word[] {
  const separator = record.data.fieldSeparator;
  return separator === undefined ? [] : [["--field-separator", fieldSeparatorWord(separator)]];
}

/** Whether a level would read as a number in a CSV file (so the column needs --category). */
function looksNumeric(level: string): boolean {
  return /^\s*[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?\s*$/.test(level);
}

/**
 * The command that makes the record again, or null when its folds cannot be rebuilt from
 * settings (explicit folds; `verify` still checks such a record with its recorded assignment).
 * A record whose data was read with another field separator than the comma gets
 * `--field-separator` (the word `tab` for a tab).
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { rerunCommand } from "./rerun.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => v * v + 0.1 * Math.sin(9 * i)) }, {
 *   target: "y", terms: [legendre("x", 5)], folds: { k: 5, seed: 3 },
 * });
 * console.log(rerunCommand(recordOf(s), "data.csv")?.options);
 * ```
 */
export function rerunCommand(record: ModelChoiceRecord, dataPath: string): CommandLine | null {
  const folds = foldWords(record.folds);
  if (folds === null) return null;
  const data: Word[] = [["--data", dataPath], ...separatorWords(record), [
    "--target",
    record.target,
  ]];
  for (const c of record.data.columns) {
    if (c.kind === "category" && c.levels.some(looksNumeric)) data.push(["--category", c.name]);
  }
  if (record.data.missing.policy === "drop") data.push(["--missing", "drop"]);
  const rows = record.data.rows;
  if (record.kind === "sweep") {
    const settings = modelSettings(record.models[0], rows);
    const words = settings.map((
      [key, value],
    ): Word => [key === "terms" ? "--term" : `--${key}`, value]);
    return { command: "sweep", options: [...data, ...folds, ...words] };
  }
  const candidates = record.models.map((m): Word => {
    const settings = modelSettings(m, rows);
    const terms = settings.filter(([k]) => k === "terms").map(([, v]) => v).join(" + ");
    const rest = settings.filter(([k]) => k !== "terms");
    return ["--candidate", formatCandidate([["name", m.name ?? ""], ["terms", terms], ...rest])];
  });
  return { command: "compare", options: [...data, ...folds, ...candidates] };
}

/**
 * The command that checks the record against its data.
 *
 * @example
 * ```ts
 * import { verifyCommand } from "./rerun.ts";
 * console.log(verifyCommand("out/demo/record.json", "examples/data/orchard.csv"));
 * ```
 */
export function verifyCommand(recordPath: string, dataPath: string): CommandLine {
  return { command: "verify", positional: recordPath, options: [["--data", dataPath]] };
}

const SHELL_SAFE = /^[A-Za-z0-9_@%+=:,./-]+$/;

/**
 * One word quoted for a POSIX shell: as it is when safe, else in single quotes.
 *
 * @example
 * ```ts
 * import { shellWord } from "./rerun.ts";
 * console.log(shellWord("a.csv"), shellWord("it's here")); // a.csv 'it'\''s here'
 * ```
 */
export function shellWord(word: string): string {
  return SHELL_SAFE.test(word) ? word : `'${word.replaceAll("'", `'\\''`)}'`;
}

/**
 * A command line as shell text, one option per line joined by backslash continuations, run
 * through the checkout's `deno task curbfit`.
 *
 * @example
 * ```ts
 * import { shellLines, verifyCommand } from "./rerun.ts";
 * console.log(shellLines(verifyCommand("record.json", "data.csv")).join("\n"));
 * // deno task curbfit verify record.json \
 * //   --data data.csv
 * ```
 */
export function shellLines(line: CommandLine): string[] {
  const head = [
    "deno task curbfit",
    line.command,
    ...(line.positional ? [shellWord(line.positional)] : []),
  ]
    .join(" ");
  const parts = [
    head,
    ...line.options.map(([o, v]) => `  ${o}${v === undefined ? "" : ` ${shellWord(v)}`}`),
  ];
  return parts.map((p, i) => (i < parts.length - 1 ? `${p} \\` : p));
}

/**
 * A command line as one line of shell text, run through the checkout's `deno task curbfit`.
 *
 * @example
 * ```ts
 * import { shellCommand, verifyCommand } from "./rerun.ts";
 * console.log(shellCommand(verifyCommand("record.json", "my data.csv")));
 * // deno task curbfit verify record.json --data 'my data.csv'
 * ```
 */
export function shellCommand(line: CommandLine): string {
  return ["deno task curbfit", ...argvOf(line).map(shellWord)].join(" ");
}

/**
 * A command line as the argument list a program receives (for running it from code and tests).
 *
 * @example
 * ```ts
 * import { argvOf, verifyCommand } from "./rerun.ts";
 * console.log(argvOf(verifyCommand("record.json", "data.csv"))); // [ "verify", "record.json", "--data", "data.csv" ]
 * ```
 */
export function argvOf(line: CommandLine): string[] {
  return [
    line.command,
    ...(line.positional ? [line.positional] : []),
    ...line.options.flatMap(([o, v]) => (v === undefined ? [o] : [o, v])),
  ];
}
