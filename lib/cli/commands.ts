/**
 * The commands and options of the `curbfit` command line: one table that drives parsing, the
 * help text and (checked by a test) the README's "Command line" section.
 *
 * @module
 */

/**
 * One option, written `--name VALUE` or `--name=VALUE` (flags take no value).
 *
 * @example
 * ```ts
 * import type { OptionSpec } from "./commands.ts";
 * const seed: OptionSpec = { name: "seed", value: "N", help: "seed of the fold shuffle" };
 * ```
 */
export interface OptionSpec {
  /** The name without dashes. */
  readonly name: string;
  /** The placeholder shown in help; absent for a flag. */
  readonly value?: string;
  /** May be given more than once. */
  readonly repeat?: boolean;
  /** The accepted values, when there is a fixed list. */
  readonly choices?: readonly string[];
  /** One line of help. */
  readonly help: string;
}

/**
 * One command.
 *
 * @example
 * ```ts
 * import type { CommandSpec } from "./commands.ts";
 * const usage = (c: CommandSpec) => `curbfit ${c.name}${c.positional ? ` ${c.positional.name}` : ""}`;
 * ```
 */
export interface CommandSpec {
  readonly name: string;
  /** One line: what the command does. */
  readonly summary: string;
  /** A positional argument (a record file), when the command takes one. */
  readonly positional?: { readonly name: string; readonly help: string };
  readonly options: readonly OptionSpec[];
}

const data: OptionSpec = {
  name: "data",
  value: "FILE",
  help: "CSV file to read (header line first; fields separated by commas unless " +
    "--field-separator says otherwise)",
};
const fieldSeparator: OptionSpec = {
  name: "field-separator",
  value: "CHAR",
  help: "the character between fields: one character such as ';' or '|', or the word tab " +
    "(default: comma; line ends CRLF, LF or CR are found on their own)",
};
const target: OptionSpec = { name: "target", value: "COLUMN", help: "the column to predict" };
const missing: OptionSpec = {
  name: "missing",
  value: "POLICY",
  choices: ["error", "drop"],
  help: "a missing value (empty, NA, NaN, null) stops the run (error, default) or drops its row",
};
const category: OptionSpec = {
  name: "category",
  value: "COLUMN",
  repeat: true,
  help: "read COLUMN as categories even when its values look like numbers",
};
const term: OptionSpec = {
  name: "term",
  value: "TERM",
  repeat: true,
  help: "a model term: legendre:COL:DEG[:LOW:HIGH], power:COL:DEG, column:COL, " +
    "indicators:COL, or TERM*TERM",
};
const penalty: OptionSpec = {
  name: "penalty",
  value: "PENALTY",
  help: "ridge (γ = 1, default), ridge:rising[:E], ridge:falling[:E], ridge:W1,W2,…, " +
    "lasso[:WEIGHTS], or elastic-net[:MIX[:WEIGHTS]] (L1 share, default 0.5; swept over α, " +
    "--alphas); WEIGHTS as after ridge:, 0 for an unpenalized column",
};
const fitPenalty: OptionSpec = {
  name: "penalty",
  value: "PENALTY",
  help: "ridge (γ = 1, default), ridge:rising[:E], ridge:falling[:E], ridge:W1,W2,…, " +
    "lasso[:WEIGHTS], or elastic-net[:MIX[:WEIGHTS]] (L1 share, default 0.5; strength " +
    "--alpha); WEIGHTS as after ridge:, 0 for an unpenalized column",
};
const scale: OptionSpec = {
  name: "scale",
  value: "SCALE",
  choices: ["standardized", "raw"],
  help: "penalize standardized coefficients (default) or raw ones",
};
const intercept: OptionSpec = {
  name: "intercept",
  value: "YESNO",
  choices: ["yes", "no"],
  help: "fit an unpenalized intercept (yes, default) or none",
};
const gridOptions: readonly OptionSpec[] = [
  { name: "lambdas", value: "LIST", help: "λ values to try, comma-separated (e.g. 0,0.1,1,10)" },
  {
    name: "lambda-count",
    value: "N",
    help: "points of the automatic log-spaced λ grid (default 100)",
  },
  { name: "lambda-min", value: "X", help: "smallest λ of the automatic grid (> 0)" },
  { name: "lambda-max", value: "X", help: "largest λ of the automatic grid" },
  {
    name: "alphas",
    value: "LIST",
    help: "lasso / elastic net: α values to try (> 0, 1/(2N) convention), comma-separated",
  },
  {
    name: "alpha-count",
    value: "N",
    help: "lasso / elastic net: values of the automatic α path from α_max down (default 100)",
  },
  {
    name: "alpha-ratio",
    value: "X",
    help: "lasso / elastic net: smallest α of the path as a share of α_max (default 0.001, " +
      "or 0.01 when columns outnumber rows)",
  },
  {
    name: "tolerance",
    value: "X",
    help: "lasso / elastic net: largest scaled KKT violation the solver accepts (default 1e-7)",
  },
];
const selection: readonly OptionSpec[] = [
  {
    name: "rule",
    value: "RULE",
    choices: ["min", "one-se"],
    help: "pick the λ (or α) with the smallest CV error (min, default) or the largest one " +
      "within one standard error of it (one-se)",
  },
  {
    name: "closed-form",
    value: "WHEN",
    choices: ["auto", "yes", "no"],
    help: "ridge: also compute closed-form leave-one-out errors (auto: up to 100 000 rows)",
  },
];
const foldOptions: readonly OptionSpec[] = [
  {
    name: "folds",
    value: "K",
    help: "number of cross-validation folds (default 10, or the row count if smaller)",
  },
  { name: "seed", value: "N", help: "seed of the fold shuffle, a whole number (default 1)" },
  {
    name: "repeats",
    value: "R",
    help: "repeat the K-fold split R times with fresh shuffles (default 1)",
  },
  { name: "groups", value: "COLUMN", help: "keep rows with the same value of COLUMN in one fold" },
  {
    name: "holdout",
    value: "FRACTION",
    help: "validate on one held-out share of the rows instead of K folds",
  },
  { name: "leave-one-out", help: "every row is its own fold" },
];
const out: OptionSpec = {
  name: "out",
  value: "DIR",
  help: "folder for report.html, statement.md and record.json (default out/COMMAND; files " +
    "there are replaced)",
};
const quiet: OptionSpec = { name: "quiet", help: "no progress lines on stderr" };

/**
 * Every command of the command line.
 *
 * @example
 * ```ts
 * import { COMMANDS } from "./commands.ts";
 * console.log(COMMANDS.map((c) => c.name)); // [ "sweep", "compare", "fit", "verify", "report" ]
 * ```
 */
export const COMMANDS: readonly CommandSpec[] = [
  {
    name: "sweep",
    summary: "choose λ (ridge) or α (lasso / elastic net) for one model by seeded " +
      "cross-validation; write the report and record",
    options: [
      data,
      fieldSeparator,
      target,
      missing,
      category,
      term,
      penalty,
      scale,
      intercept,
      ...gridOptions,
      ...selection,
      ...foldOptions,
      out,
      quiet,
    ],
  },
  {
    name: "compare",
    summary: "sweep several candidate models on the same folds and compare them",
    options: [
      data,
      fieldSeparator,
      target,
      missing,
      category,
      {
        name: "candidate",
        value: "TEXT",
        repeat: true,
        help: 'one candidate: "name=…; terms=T1 + T2; penalty=…; lambdas=…; rule=…"',
      },
      {
        name: "candidates",
        value: "FILE",
        help: "a text file with one candidate per line (# starts a comment)",
      },
      { ...term, help: "a term every candidate without terms=… uses" },
      {
        ...penalty,
        help: "the penalty of candidates without penalty=… (default ridge; lasso[:WEIGHTS], " +
          "elastic-net[:MIX[:WEIGHTS]])",
      },
      scale,
      intercept,
      ...gridOptions,
      ...selection,
      ...foldOptions,
      out,
      quiet,
    ],
  },
  {
    name: "fit",
    summary:
      "fit one model at a given λ (or budget), or lasso / elastic net at an α, on all rows; " +
      "write the report",
    options: [
      data,
      fieldSeparator,
      target,
      missing,
      category,
      term,
      fitPenalty,
      scale,
      intercept,
      {
        name: "lambda",
        value: "X",
        help: "ridge strength λ >= 0, sum-of-squares units (default 0)",
      },
      {
        name: "budget",
        value: "C",
        help: "instead of λ: the penalty budget Σ γ_q w*_q² <= C to meet",
      },
      {
        name: "alpha",
        value: "A",
        help: "lasso / elastic-net strength α > 0, 1/(2N) convention (not λ); required with them",
      },
      out,
    ],
  },
  {
    name: "verify",
    summary: "recompute a record from the data and compare it field by field",
    positional: { name: "RECORD", help: "the record.json file to check" },
    options: [
      {
        ...data,
        help: "the CSV file the record was made from (default: the file the record names), " +
          "read with the field separator the record names (comma when it names none)",
      },
      {
        ...fieldSeparator,
        help: "read --data with this separator instead of the record's: one character such as " +
          "';' or '|', or the word tab (the report notes when it differs from the record's)",
      },
    ],
  },
  {
    name: "report",
    summary: "write report.html and statement.md for a record (no data needed)",
    positional: { name: "RECORD", help: "the record.json file to render" },
    options: [{ ...out, help: "folder for report.html and statement.md (default out/report)" }],
  },
];

/**
 * The command named `name`, if there is one.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * console.log(commandNamed("verify")?.positional?.name); // RECORD
 * ```
 */
export function commandNamed(name: string): CommandSpec | undefined {
  return COMMANDS.find((c) => c.name === name);
}

/**
 * Help text for the whole tool, or for one command.
 *
 * @example
 * ```ts
 * import { commandNamed, helpText } from "./commands.ts";
 * console.log(helpText(commandNamed("verify")));
 * ```
 */
export function helpText(command?: CommandSpec): string {
  if (command === undefined) {
    const width = Math.max(...COMMANDS.map((c) => c.name.length));
    return [
      "curbfit — choose and check regularized linear models from the command line",
      "",
      "usage: curbfit COMMAND [options]      (in a checkout: deno task curbfit COMMAND …)",
      "",
      "commands:",
      ...COMMANDS.map((c) => `  ${c.name.padEnd(width)}  ${c.summary}`),
      `  ${"help".padEnd(width)}  help [COMMAND] shows the options of a command`,
      "",
      "exit codes: 0 success, 1 verify found a mismatch, 2 usage or input error",
      "Caution: a cross-validation error is an estimate, not a guarantee; predictions outside",
      "the data's ranges are extrapolation.",
    ].join("\n");
  }
  const shown = command.options.map((o) =>
    `--${o.name}${o.value === undefined ? "" : ` ${o.value}`}`
  );
  const width = Math.max(...shown.map((s) => s.length));
  return [
    `usage: curbfit ${command.name}${
      command.positional ? ` ${command.positional.name}` : ""
    } [options]`,
    "",
    command.summary,
    ...(command.positional ? ["", `  ${command.positional.name}  ${command.positional.help}`] : []),
    "",
    "options:",
    ...command.options.map((o, i) =>
      `  ${shown[i].padEnd(width)}  ${o.help}${o.repeat ? " (repeatable)" : ""}${
        o.choices ? ` [${o.choices.join("|")}]` : ""
      }`
    ),
  ].join("\n");
}
