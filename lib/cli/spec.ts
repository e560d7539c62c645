/**
 * From command-line options to the API's inputs: load options, sweep and fit specs, fold
 * requests and compare candidates. Every value is checked for its syntax here (so the message
 * names the option as typed); ranges that depend on the data (k against the row count, a
 * column's existence) are checked by the API.
 *
 * @module
 */
import type { CsvOptions } from "../table/mod.ts";
import { separatorProblem } from "../table/separator.ts";
import type { Term } from "../design/types.ts";
import { isSparse, type Penalty } from "../fit/penalty.ts";
import type { AlphaGrid } from "../sparse/mod.ts";
import type { FitSpec } from "../fit/fit.ts";
import type { SweepSpec } from "../sweep/sweep.ts";
import type { Candidate } from "../sweep/compare.ts";
import type { FoldRequest } from "../sweep/folds.ts";
import type { LambdaGrid } from "../sweep/grid.ts";
import type { SelectionRule } from "../sweep/select.ts";
import { hasOption, optionValue, optionValues, type ParsedArgs } from "./args.ts";
import {
  type CandidateKey,
  parseAlphas,
  parseCandidate,
  parseLambdas,
  parseNumber,
  parsePenalty,
  parseTerm,
  parseTermList,
  parseWhole,
  usageError,
} from "./syntax.ts";

/**
 * The data file and how to read it.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { dataRequest } from "./spec.ts";
 * const r = dataRequest(parseArgs(commandNamed("sweep")!, ["--data", "a.csv", "--category", "zip"]));
 * console.log(r.path, r.load.types); // a.csv { zip: "category" }
 * const t = dataRequest(parseArgs(commandNamed("fit")!, ["--data", "a.tsv", "--field-separator", "tab"]));
 * console.log(t.load.fieldSeparator === "\t"); // true
 * ```
 */
export function dataRequest(parsed: ParsedArgs): { path: string; load: CsvOptions } {
  const path = optionValue(parsed, "data");
  if (path === undefined || path === "") {
    throw usageError(
      "--data",
      "--data FILE is missing: the CSV file to read",
      "Write e.g. --data examples/data/orchard.csv",
    );
  }
  const types: Record<string, "category"> = {};
  for (const name of optionValues(parsed, "category")) types[name] = "category";
  const missing = optionValue(parsed, "missing") as "error" | "drop" | undefined;
  const separator = fieldSeparatorOf(parsed);
  return {
    path,
    load: {
      source: path,
      types,
      ...(missing ? { missing } : {}),
      ...(separator !== undefined ? { fieldSeparator: separator } : {}),
    },
  };
}

/** How a tab is written after `--field-separator` (a tab character is hard to type in a shell). */
const TAB_WORD = "tab";

/**
 * The `--field-separator` character: one character as typed, or the word `tab`; undefined when
 * the option was not given.
 *
 * @throws {CurbfitError} `BAD_OPTION` naming `--field-separator` for a value that cannot
 * separate fields.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { fieldSeparatorOf } from "./spec.ts";
 * const parsed = parseArgs(commandNamed("verify")!, ["r.json", "--field-separator", "tab"]);
 * console.log(fieldSeparatorOf(parsed) === "\t"); // true
 * ```
 */
export function fieldSeparatorOf(parsed: ParsedArgs): string | undefined {
  const text = optionValue(parsed, "field-separator");
  if (text === undefined) return undefined;
  const separator = text === TAB_WORD ? "\t" : text;
  const problem = separatorProblem(separator);
  if (problem === undefined) return separator;
  throw usageError(
    "--field-separator",
    `--field-separator is ${JSON.stringify(text)}, but ${problem}`,
    "Write one character in quotes, e.g. --field-separator ';', or --field-separator tab",
  );
}

/**
 * A field separator as the value of `--field-separator`: the word `tab` for a tab, else the
 * character itself (a shell still has to quote most of them; see `shellWord` in rerun.ts).
 *
 * @example
 * ```ts
 * import { fieldSeparatorWord } from "./spec.ts";
 * console.log(fieldSeparatorWord("\t"), fieldSeparatorWord(";")); // tab ;
 * ```
 */
export function fieldSeparatorWord(separator: string): string {
  return separator === "\t" ? TAB_WORD : separator;
}

/** The target column (required). */
function targetOf(parsed: ParsedArgs): string {
  const target = optionValue(parsed, "target");
  if (target === undefined || target === "") {
    throw usageError(
      "--target",
      "--target COLUMN is missing: the column to predict",
      "Write e.g. --target brix",
    );
  }
  return target;
}

/** Settings of one model, read either from options or from a candidate's key=value pairs. */
interface ModelSettings {
  readonly terms?: readonly Term[];
  readonly penalty?: Penalty;
  readonly standardize?: boolean;
  readonly intercept?: boolean;
  readonly lambdas?: LambdaGrid;
  readonly alphas?: AlphaGrid;
  readonly tolerance?: number;
  readonly rule?: SelectionRule;
  readonly closedForm?: boolean | "auto";
}

/** Reads one setting by key: from `--key` options, or a candidate's `key=` text. */
type Lookup = (key: CandidateKey) => string | undefined;

function modelSettings(
  lookup: Lookup,
  label: (key: CandidateKey) => string,
  terms?: readonly Term[],
): ModelSettings {
  const text = (key: CandidateKey) => lookup(key);
  const choice = <T extends string>(key: CandidateKey, allowed: readonly T[]): T | undefined => {
    const v = text(key);
    if (v === undefined || (allowed as readonly string[]).includes(v)) return v as T | undefined;
    throw usageError(
      label(key),
      `${label(key)} is ${JSON.stringify(v)}, but it must be one of ${allowed.join(", ")}`,
      `Write ${key}=${allowed[0]}`,
    );
  };
  const penalty = text("penalty");
  const scale = choice("scale", ["standardized", "raw"] as const);
  const intercept = choice("intercept", ["yes", "no"] as const);
  const closed = choice("closed-form", ["auto", "yes", "no"] as const);
  const rule = choice("rule", ["min", "one-se"] as const);
  const tolerance = text("tolerance");
  return {
    ...(terms !== undefined ? { terms } : {}),
    ...(penalty !== undefined ? { penalty: parsePenalty(penalty, label("penalty")) } : {}),
    ...(scale !== undefined ? { standardize: scale === "standardized" } : {}),
    ...(intercept !== undefined ? { intercept: intercept === "yes" } : {}),
    ...lambdaSettings(lookup, label),
    ...alphaSettings(lookup, label),
    ...(tolerance !== undefined ? { tolerance: parseNumber(tolerance, label("tolerance")) } : {}),
    ...(rule !== undefined ? { rule } : {}),
    ...(closed !== undefined ? { closedForm: closed === "auto" ? "auto" : closed === "yes" } : {}),
  };
}

function lambdaSettings(
  lookup: Lookup,
  label: (key: CandidateKey) => string,
): { lambdas?: LambdaGrid } {
  const list = lookup("lambdas");
  const count = lookup("lambda-count");
  const min = lookup("lambda-min");
  const max = lookup("lambda-max");
  const automatic = [count, min, max].some((v) => v !== undefined);
  if (list !== undefined && automatic) {
    throw usageError(
      label("lambdas"),
      `${label("lambdas")} lists the λ values, so ${label("lambda-count")}, ${
        label("lambda-min")
      } ` +
        `and ${label("lambda-max")} cannot be given with it`,
      "Give either a list of λ values or the automatic grid's count and ends",
    );
  }
  if (list !== undefined) return { lambdas: parseLambdas(list, label("lambdas")) };
  if (!automatic) return {};
  return {
    lambdas: {
      ...(count !== undefined ? { count: parseWhole(count, label("lambda-count")) } : {}),
      ...(min !== undefined ? { min: parseNumber(min, label("lambda-min")) } : {}),
      ...(max !== undefined ? { max: parseNumber(max, label("lambda-max")) } : {}),
    },
  };
}

function alphaSettings(
  lookup: Lookup,
  label: (key: CandidateKey) => string,
): { alphas?: AlphaGrid } {
  const list = lookup("alphas");
  const count = lookup("alpha-count");
  const ratio = lookup("alpha-ratio");
  const automatic = count !== undefined || ratio !== undefined;
  if (list !== undefined && automatic) {
    throw usageError(
      label("alphas"),
      `${label("alphas")} lists the α values, so ${label("alpha-count")} and ` +
        `${label("alpha-ratio")} cannot be given with it`,
      "Give either a list of α values or the automatic path's count and ratio",
    );
  }
  if (list !== undefined) return { alphas: parseAlphas(list, label("alphas")) };
  if (!automatic) return {};
  return {
    alphas: {
      ...(count !== undefined ? { count: parseWhole(count, label("alpha-count")) } : {}),
      ...(ratio !== undefined ? { ratio: parseNumber(ratio, label("alpha-ratio")) } : {}),
    },
  };
}

/** Settings of the ridge λ scale (`lambdas`, `lambda-…`, `closed-form`). */
const RIDGE_ONLY = ["lambdas", "closedForm"] as const;
/** Settings of the sparse α scale (`alphas`, `alpha-…`, `tolerance`). */
const SPARSE_ONLY = ["alphas", "tolerance"] as const;

/** The keys (for messages) of each scale-specific setting. */
const KEYS_OF: Readonly<Record<string, CandidateKey>> = {
  lambdas: "lambdas",
  closedForm: "closed-form",
  alphas: "alphas",
  tolerance: "tolerance",
};

/** What to do instead of a setting of the other scale. */
const FOREIGN_HINT: Readonly<Record<string, string>> = {
  lambdas: "Give the α grid with alphas, alpha-count or alpha-ratio (1/(2N) convention)",
  closedForm: "Leave closed-form out: closed-form leave-one-out is a ridge identity",
  alphas: "Give the λ grid with lambdas, lambda-count, lambda-min or lambda-max, or set the " +
    "penalty to lasso or elastic-net[:MIX]",
  tolerance: "Leave tolerance out for ridge (its solver is direct), or set the penalty to " +
    "lasso or elastic-net[:MIX]",
};

/**
 * One model's settings with its penalty's scale checked: λ settings (and closed-form
 * leave-one-out) belong to ridge, α settings (and the solver tolerance) to lasso / elastic net.
 * The model's own settings of the other scale are a usage error; shared settings (the options
 * of `compare`) of the other scale are left out, since they are for the other candidates.
 */
function scaleChecked(
  own: ModelSettings,
  shared: ModelSettings,
  label: (key: CandidateKey) => string,
): ModelSettings {
  const penalty = own.penalty ?? shared.penalty;
  const sparse = penalty !== undefined && isSparse(penalty);
  const foreign = sparse ? RIDGE_ONLY : SPARSE_ONLY;
  for (const key of foreign) {
    if (own[key] === undefined) continue;
    throw usageError(
      label(KEYS_OF[key]),
      `${label(KEYS_OF[key])} was given for a ${sparse ? (penalty as Penalty).kind : "ridge"} ` +
        `model, but it belongs to ${sparse ? "ridge (λ)" : "lasso and elastic net (α)"}`,
      FOREIGN_HINT[key],
    );
  }
  const merged: Record<string, unknown> = { ...shared, ...own };
  for (const key of foreign) delete merged[key];
  return merged as ModelSettings;
}

/** The options' own settings (`--penalty`, `--lambdas`, …). */
function optionSettings(parsed: ParsedArgs): ModelSettings {
  const terms = optionValues(parsed, "term").map((t) => parseTerm(t, "--term"));
  return modelSettings(
    (key) => optionValue(parsed, key),
    (key) => `--${key}`,
    terms.length > 0 ? terms : undefined,
  );
}

/**
 * How to split rows into folds.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { foldRequest } from "./spec.ts";
 * console.log(foldRequest(parseArgs(commandNamed("sweep")!, ["--folds", "8", "--seed", "7"])));
 * // { k: 8, seed: 7 }
 * ```
 */
export function foldRequest(parsed: ParsedArgs): FoldRequest {
  const whole = (name: string) => {
    const v = optionValue(parsed, name);
    return v === undefined ? undefined : parseWhole(v, `--${name}`);
  };
  const holdout = optionValue(parsed, "holdout");
  const schemes = ["folds", "holdout", "leave-one-out"].filter((n) => hasOption(parsed, n));
  if (schemes.length > 1) {
    throw usageError(
      `--${schemes[1]}`,
      `--${schemes[0]} and --${schemes[1]} choose different ways to split the rows`,
      "Give only one of --folds, --holdout and --leave-one-out",
    );
  }
  const request = {
    k: whole("folds"),
    seed: whole("seed"),
    repeats: whole("repeats"),
    groups: optionValue(parsed, "groups"),
    holdout: holdout === undefined ? undefined : parseNumber(holdout, "--holdout"),
    leaveOneOut: hasOption(parsed, "leave-one-out") ? true : undefined,
  };
  return Object.fromEntries(Object.entries(request).filter(([, v]) => v !== undefined));
}

function requireTerms(
  terms: readonly Term[] | undefined,
  where: string,
  hint: string,
): readonly Term[] {
  if (terms === undefined || terms.length === 0) {
    throw usageError(where, `${where} has no terms`, hint);
  }
  return terms;
}

/**
 * The sweep spec of `curbfit sweep`.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { sweepSpec } from "./spec.ts";
 * const spec = sweepSpec(parseArgs(commandNamed("sweep")!, ["--target", "y", "--term", "legendre:x:5", "--rule", "one-se"]));
 * console.log(spec.terms.length, spec.rule); // 1 one-se
 * ```
 */
export function sweepSpec(parsed: ParsedArgs): SweepSpec {
  const settings = scaleChecked(optionSettings(parsed), {}, (key) => `--${key}`);
  return {
    ...settings,
    target: targetOf(parsed),
    terms: requireTerms(
      settings.terms,
      "the model",
      "Add at least one --term, e.g. --term legendre:x:6",
    ),
    folds: foldRequest(parsed),
  };
}

/**
 * The fit spec of `curbfit fit`.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { fitSpec } from "./spec.ts";
 * console.log(fitSpec(parseArgs(commandNamed("fit")!, ["--target", "y", "--term", "column:x", "--lambda", "2"])).lambda); // 2
 * ```
 */
export function fitSpec(parsed: ParsedArgs): FitSpec {
  const settings = optionSettings(parsed);
  const lambda = optionValue(parsed, "lambda");
  const budget = optionValue(parsed, "budget");
  const alpha = optionValue(parsed, "alpha");
  if (lambda !== undefined && budget !== undefined) {
    throw usageError(
      "--budget",
      "--lambda and --budget both set the penalty strength",
      "Give only one of them",
    );
  }
  const lambdaValue = lambda === undefined ? undefined : parseNumber(lambda, "--lambda");
  if (lambdaValue !== undefined && lambdaValue < 0) {
    throw usageError(
      "--lambda",
      `--lambda is ${lambda}, but λ must be >= 0`,
      "λ = 0 means no penalty",
    );
  }
  return {
    target: targetOf(parsed),
    terms: requireTerms(
      settings.terms,
      "the model",
      "Add at least one --term, e.g. --term legendre:x:6",
    ),
    ...(settings.penalty ? { penalty: settings.penalty } : {}),
    ...(settings.standardize !== undefined ? { standardize: settings.standardize } : {}),
    ...(settings.intercept !== undefined ? { intercept: settings.intercept } : {}),
    ...(lambdaValue !== undefined ? { lambda: lambdaValue } : {}),
    ...(budget !== undefined ? { budget: parseNumber(budget, "--budget") } : {}),
    ...(alpha !== undefined ? { alpha: parseNumber(alpha, "--alpha") } : {}),
  };
}

/**
 * What `curbfit compare` shares across candidates: the target and the folds.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { compareSettings } from "./spec.ts";
 * console.log(compareSettings(parseArgs(commandNamed("compare")!, ["--target", "y", "--folds", "5"])));
 * // { target: "y", folds: { k: 5 } }
 * ```
 */
export function compareSettings(parsed: ParsedArgs): { target: string; folds: FoldRequest } {
  return { target: targetOf(parsed), folds: foldRequest(parsed) };
}

/**
 * The candidates of `curbfit compare`: each `--candidate`, then each line of the
 * `--candidates` file (already read, given as `fileLines`), with the shared options as defaults.
 *
 * @example
 * ```ts
 * import { commandNamed } from "./commands.ts";
 * import { parseArgs } from "./args.ts";
 * import { compareCandidates } from "./spec.ts";
 * const parsed = parseArgs(commandNamed("compare")!, [
 *   "--term", "column:z",
 *   "--candidate", "name=line; terms=column:x + column:z; lambdas=0",
 *   "--candidate", "name=curve; terms=legendre:x:6 + column:z; rule=one-se",
 * ]);
 * console.log(compareCandidates(parsed, []).map((c) => c.name)); // [ "line", "curve" ]
 * ```
 */
export function compareCandidates(
  parsed: ParsedArgs,
  fileLines: readonly { readonly text: string; readonly where: string }[],
): Candidate[] {
  const shared = optionSettings(parsed);
  const texts = [
    ...optionValues(parsed, "candidate").map((text, i) => ({
      text,
      where: `--candidate ${i + 1}`,
    })),
    ...fileLines,
  ];
  const candidates = texts.map(({ text, where }) => {
    const settings = parseCandidate(text, where);
    const termsText = settings.get("terms");
    const terms = termsText === undefined ? shared.terms : parseTermList(termsText, where);
    const label = (key: CandidateKey) => `${key}= in ${where}`;
    const own = scaleChecked(
      modelSettings((key) => settings.get(key), label, terms),
      shared,
      label,
    );
    return {
      ...own,
      name: settings.get("name") as string,
      terms: requireTerms(
        own.terms,
        where,
        "Give it terms=… or give shared --term options",
      ),
    };
  });
  if (texts.length < 2) {
    throw usageError(
      "--candidate",
      `a comparison needs at least two candidates, but there ${
        texts.length === 1 ? "is 1" : "are 0"
      }`,
      'Give --candidate "name=…; terms=…" twice or more, or --candidates FILE',
    );
  }
  return candidates;
}

/**
 * The candidates in a `--candidates` file's text: one per line; blank lines and lines starting
 * with `#` are skipped.
 *
 * @example
 * ```ts
 * import { candidateLines } from "./spec.ts";
 * console.log(candidateLines("# two\nname=a; terms=column:x\n\nname=b; terms=column:z\n", "c.txt"));
 * // [ { text: "name=a; terms=column:x", where: "c.txt line 2" }, { text: "name=b; …", where: "c.txt line 4" } ]
 * ```
 */
export function candidateLines(text: string, path: string): { text: string; where: string }[] {
  return text.split(/\r?\n/).flatMap((line, i) =>
    line.trim() === "" || line.trim().startsWith("#")
      ? []
      : [{ text: line.trim(), where: `${path} line ${i + 1}` }]
  );
}
