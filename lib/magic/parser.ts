/**
 * The `curb` template language: one statement per line, read into a `CurbProgram`. The
 * vocabulary is documented in README.md beside this file; this module is its only reader.
 *
 * Lines before the first `candidate` line are shared: `data`, `predict` and `folds` may only
 * appear there, and model settings there apply to every candidate that does not set its own.
 * No candidate lines: one model is swept. Two or more: they are compared on the same folds.
 *
 * @module
 */
import type { Term } from "../design/types.ts";
import { column, indicators, legendre, MAX_DEGREE, power, product } from "../design/mod.ts";
import { type Penalty, ridge, type RidgeWeights } from "../fit/penalty.ts";
import { type AlphaGrid, elasticNet, lasso } from "../sparse/mod.ts";
import type { FoldPlan } from "../folds/mod.ts";
import type { LambdaGrid } from "../sweep/grid.ts";
import type { SelectionRule } from "../sweep/select.ts";
import { type FoldRequest, isFoldPlan } from "../sweep/folds.ts";
import { MagicError, type Spot } from "./error.ts";
import { lexTemplate, type SourceLine } from "./lexer.ts";
import { buildAt, Cursor, describeValue, type Named, spanOf } from "./cursor.ts";
import { listWords, nearestWord } from "./words.ts";
import { separatorProblem } from "../table/separator.ts";

/** The statement words, in the order README.md documents them. */
export const STATEMENTS = [
  "data",
  "predict",
  "terms",
  "penalty",
  "gamma",
  "lambda",
  "alpha",
  "folds",
  "rule",
  "scale",
  "intercept",
  "closed-form",
  "candidate",
] as const;

/** A statement word. */
export type Statement = typeof STATEMENTS[number];

/** Symbols accepted in place of a statement word. */
const SYMBOLS: Readonly<Record<string, Statement>> = { "γ": "gamma", "λ": "lambda", "α": "alpha" };

/** Words from the programming interface and elsewhere, mapped to the statement that says it. */
const INSTEAD: Readonly<Record<string, Statement>> = {
  target: "predict",
  response: "predict",
  lambdas: "lambda",
  alphas: "alpha",
  mix: "penalty",
  weights: "gamma",
  standardize: "scale",
  seed: "folds",
  repeats: "folds",
  groups: "folds",
  term: "terms",
  fold: "folds",
  candidates: "candidate",
  model: "candidate",
};

/** Statements allowed only before the first candidate. */
const SHARED_ONLY: readonly Statement[] = ["data", "predict", "folds"];

/**
 * Where the rows come from: an interpolated value (table, rows, columns) or a CSV file path,
 * with the spot of the value or path on the `data` line; a path may name its field separator
 * (`data "plots.txt" separated by semicolon`), kept with the spot where it was named.
 *
 * @example
 * ```ts
 * import type { DataNode } from "./parser.ts";
 * const file: DataNode = { kind: "file", path: "orchard.csv", spot: { line: 2, column: 8, length: 13 } };
 * const tabs: DataNode = {
 *   kind: "file",
 *   path: "orchard.tsv",
 *   spot: { line: 2, column: 8, length: 13 },
 *   fieldSeparator: { value: "\t", spot: { line: 2, column: 35, length: 3 } },
 * };
 * ```
 */
export type DataNode =
  | { readonly kind: "value"; readonly value: unknown; readonly spot: Spot }
  | {
    readonly kind: "file";
    readonly path: string;
    readonly spot: Spot;
    /** The character after `separated by`; absent when the line names none (a comma). */
    readonly fieldSeparator?: { readonly value: string; readonly spot: Spot };
  };

/**
 * One term with the columns it names (for checking them against the data).
 *
 * @example
 * ```ts
 * import type { TermNode } from "./parser.ts";
 * import { legendre } from "../design/mod.ts";
 * const node: TermNode = {
 *   term: legendre("hours", 4),
 *   columns: [{ name: "hours", spot: { line: 4, column: 18, length: 5 } }],
 *   spot: { line: 4, column: 9, length: 23 },
 * };
 * ```
 */
export interface TermNode {
  /** The term the words (or the interpolated term) stand for. */
  readonly term: Term;
  /** Data columns the term reads, each with where it was named (an interpolation's spot). */
  readonly columns: readonly Named[];
  /** The term's text, from its first word to its last (a product spans both factors). */
  readonly spot: Spot;
}

/**
 * The folds: a request, or an interpolated plan; `groups` is the grouping column if named.
 *
 * @example
 * ```ts
 * import type { FoldsNode } from "./parser.ts";
 * // folds 5 seed 3 grouped by site
 * const node: FoldsNode = {
 *   request: { k: 5, seed: 3, groups: "site" },
 *   groups: { name: "site", spot: { line: 5, column: 29, length: 4 } },
 *   spot: { line: 5, column: 9, length: 1 },
 * };
 * ```
 */
export interface FoldsNode {
  /** An interpolated fold plan as given, or the request the words describe. */
  readonly request: FoldPlan | FoldRequest;
  /** The column after `grouped by`, with where it was written; undefined when not grouped. */
  readonly groups?: Named;
  /** Where the fold description starts after the word `folds`, for errors about it. */
  readonly spot: Spot;
}

/**
 * Model settings of one section (shared, or one candidate). Absent means "not said here".
 *
 * @example
 * ```ts
 * import type { Settings } from "./parser.ts";
 * import { ridge } from "../fit/penalty.ts";
 * // gamma rising 2
 * // rule one-se
 * const said: Settings = { penalty: ridge({ weights: "rising", exponent: 2 }), rule: "one-se" };
 * ```
 */
export interface Settings {
  /** Terms from every `terms` line of the section, in order. */
  readonly terms?: readonly TermNode[];
  /**
   * From the `penalty` and `gamma` lines: ridge, lasso or elastic net with its γ weights. In a
   * candidate, a `penalty` line alone keeps the shared `gamma` line and a `gamma` line alone
   * keeps the shared penalty.
   */
  readonly penalty?: Penalty;
  /** The ridge λ grid of the `lambda` line. */
  readonly lambdas?: LambdaGrid;
  /** The sparse α grid of the `alpha` line. */
  readonly alphas?: AlphaGrid;
  /** The selection rule of the `rule` line. */
  readonly rule?: SelectionRule;
  /** `scale standardized` (true) or `scale raw` (false). */
  readonly standardize?: boolean;
  /** `intercept yes` (true) or `intercept no` (false). */
  readonly intercept?: boolean;
  /** The `closed-form` line: yes (true), no (false) or auto. */
  readonly closedForm?: boolean | "auto";
}

/**
 * A candidate: its name and its own settings.
 *
 * @example
 * ```ts
 * import type { CandidateNode } from "./parser.ts";
 * // candidate plain ridge
 * // rule min
 * const node: CandidateNode = {
 *   name: "plain ridge",
 *   spot: { line: 7, column: 13, length: 11 },
 *   settings: { rule: "min" },
 * };
 * ```
 */
export interface CandidateNode {
  /** The name after `candidate`: quoted or interpolated text, else the rest of the line as written. */
  readonly name: string;
  /** Where the name was written. */
  readonly spot: Spot;
  /** What the candidate's own lines say; `jobOf` fills the gaps from the shared settings. */
  readonly settings: Settings;
}

/**
 * A parsed template: everything it said, with where it said it.
 *
 * @example
 * ```ts
 * import { parseTemplate } from "./parser.ts";
 * const tag = (s: TemplateStringsArray, ...v: unknown[]) => parseTemplate(s, v);
 * const program = tag`
 *   data ${{ x: [1, 2, 3, 4], y: [1, 4, 9, 16] }}
 *   predict y
 *   terms legendre x degree 2
 *   folds 2 seed 1
 * `;
 * console.log(program.target.name, program.candidates.length); // y 0
 * ```
 */
export interface CurbProgram {
  /** Every line of the template, blank and comment-only ones included (line 1 first). */
  readonly lines: readonly SourceLine[];
  /** What the `data` line gave: an interpolated value or a CSV file path. */
  readonly data: DataNode;
  /** The column named on the `predict` line. */
  readonly target: Named;
  /** The `folds` line; undefined when the template has none (the sweep default applies). */
  readonly folds?: FoldsNode;
  /** Settings written before the first `candidate` line; candidates inherit the ones they omit. */
  readonly shared: Settings;
  /** The candidates in template order: empty for one swept model, otherwise two or more. */
  readonly candidates: readonly CandidateNode[];
}

/** A section being read: what it has said so far and on which line. */
interface Section {
  readonly seen: Map<Statement, number>;
  terms?: TermNode[];
  penaltyNamed?: { readonly kind: Penalty["kind"]; readonly mix?: number; readonly spot: Spot };
  gamma?: {
    readonly weights: RidgeWeights;
    readonly exponent?: number;
    readonly spot: Spot;
    /** The text of the gamma line, for errors found once the penalty is known. */
    readonly text: string;
  };
  lambdas?: LambdaGrid;
  alphas?: AlphaGrid;
  rule?: SelectionRule;
  standardize?: boolean;
  intercept?: boolean;
  closedForm?: boolean | "auto";
  readonly candidate?: { readonly name: string; readonly spot: Spot };
}

/**
 * Reads a tagged template's strings and values into a program.
 *
 * @throws {MagicError} `MAGIC_SYNTAX` with line, column, caret, what was expected and the
 * nearest valid word; option checks of the terms and penalty are reported at their place too.
 *
 * @example
 * ```ts
 * import { parseTemplate } from "./parser.ts";
 * try {
 *   parseTemplate(["predcit y"], []);
 * } catch (e) {
 *   console.log((e as Error).message); // … line 1, column 1: … Did you mean "predict"? …
 * }
 * ```
 */
export function parseTemplate(
  strings: readonly string[],
  values: readonly unknown[],
): CurbProgram {
  const lines = lexTemplate(strings, values);
  const shared: Section = { seen: new Map() };
  const sections: Section[] = [shared];
  let data: DataNode | undefined;
  let target: Named | undefined;
  let folds: FoldsNode | undefined;
  for (const line of lines) {
    if (line.tokens.length === 0) continue;
    const c = new Cursor(line);
    const statement = statementWord(c);
    const section = sections[sections.length - 1];
    checkPlacement(c, statement, section, sections);
    switch (statement) {
      case "data":
        data = readData(c);
        break;
      case "predict":
        target = c.name(
          "the name of the column to predict",
          'Name one numeric column, e.g. "predict moisture"; quote names with spaces',
        );
        break;
      case "terms":
        section.terms = [...(section.terms ?? []), ...readTerms(c)];
        break;
      case "penalty":
        section.penaltyNamed = readPenalty(c);
        break;
      case "gamma":
        section.gamma = readGamma(c);
        break;
      case "lambda":
        section.lambdas = readLambda(c);
        break;
      case "alpha":
        section.alphas = readAlpha(c);
        break;
      case "folds":
        folds = readFolds(c);
        break;
      case "rule":
        section.rule = c.word(
          ["min", "one-se"],
          'a rule ("min" or "one-se")',
          '"min" takes the λ with the smallest CV error; "one-se" the largest λ within one ' +
            "standard error of it",
        ) as SelectionRule;
        break;
      case "scale":
        section.standardize = c.word(
          ["standardized", "raw"],
          '"standardized" or "raw"',
          '"standardized" (the default) penalizes coefficients of columns scaled to SD 1',
        ) === "standardized";
        break;
      case "intercept":
        section.intercept = c.word(
          ["yes", "no"],
          '"yes" or "no"',
          'Write "intercept no" to fit without an intercept',
        ) === "yes";
        break;
      case "closed-form": {
        const w = c.word(
          ["yes", "no", "auto"],
          '"yes", "no" or "auto"',
          "Closed-form leave-one-out errors are computed for up to 100 000 rows on auto",
        );
        section.closedForm = w === "auto" ? "auto" : w === "yes";
        break;
      }
      case "candidate":
        sections.push({ seen: new Map(), candidate: readCandidateName(c, sections) });
        break;
    }
    if (["penalty", "gamma", "lambda", "alpha"].includes(statement)) {
      checkPairing(c, section, line.tokens[0].spot);
    }
    c.end(statement);
    if (statement !== "candidate") sections[sections.length - 1].seen.set(statement, line.number);
  }
  const last = lines[lines.length - 1];
  const endSpot: Spot = { line: last.number, column: 1, length: 1 };
  if (data === undefined) {
    throw missing(last, endSpot, "data", 'Add a line such as "data ${table}" or "data "file.csv""');
  }
  if (target === undefined) {
    throw missing(last, endSpot, "predict", 'Add a line such as "predict moisture"');
  }
  const candidates = sections.slice(1);
  checkCandidates(lines, shared, candidates, endSpot);
  return {
    lines,
    data,
    target,
    ...(folds === undefined ? {} : { folds }),
    shared: settingsOf(shared),
    candidates: candidates.map((s) => ({
      name: s.candidate!.name,
      spot: s.candidate!.spot,
      settings: settingsOf(s, shared),
    })),
  };
}

/** The statement word that starts a line. */
function statementWord(c: Cursor): Statement {
  const first = c.line.tokens[0];
  const text = first.kind === "word" ? first.text : "";
  if ((STATEMENTS as readonly string[]).includes(text)) return text as Statement;
  if (text in SYMBOLS) return SYMBOLS[text];
  const near = first.kind === "word"
    ? (INSTEAD[text.toLowerCase()] ?? nearestWord(text, STATEMENTS))
    : undefined;
  const found = first.kind === "word" || first.kind === "string"
    ? `"${first.text.replace(/^"|"$/g, "")}"`
    : first.kind === "value"
    ? "${…}"
    : first.text;
  throw c.error(
    `expected a statement word, but found ${found}`,
    (near === undefined ? "" : `Did you mean "${near}"? `) +
      `A line starts with one of ${listWords(STATEMENTS)}`,
    first.spot,
    near,
  );
}

/** Rejects a statement said twice in one section, or a shared-only one inside a candidate. */
function checkPlacement(
  c: Cursor,
  statement: Statement,
  section: Section,
  sections: readonly Section[],
): void {
  const head = c.line.tokens[0].spot;
  if (section.candidate !== undefined && SHARED_ONLY.includes(statement)) {
    throw c.error(
      `"${statement}" cannot be set for one candidate`,
      `Every candidate uses the same data, target and folds; move this line above line ${
        sections[1].candidate!.spot.line
      }, the first candidate`,
      head,
    );
  }
  const before = section.seen.get(statement);
  if (before !== undefined && statement !== "terms") {
    throw c.error(
      `"${statement}" was already set on line ${before}`,
      section.candidate === undefined
        ? `Keep one "${statement}" line; to try other settings, add "candidate" lines`
        : `Keep one "${statement}" line per candidate`,
      head,
    );
  }
}

/** The words `separated by` takes, each with the character it stands for. */
const SEPARATOR_WORDS: Readonly<Record<string, string>> = {
  comma: ",",
  semicolon: ";",
  tab: "\t",
  bar: "|",
  space: " ",
};
const SEPARATOR_NAMES = Object.keys(SEPARATOR_WORDS);
/** The names and their plurals (`separated by semicolons` reads as well). */
const SEPARATOR_ACCEPTED = [...SEPARATOR_NAMES, ...SEPARATOR_NAMES.map((w) => `${w}s`)];
const SEPARATOR_HINT = 'Write e.g. data "plots.txt" separated by semicolon; any other ' +
  'character goes in quotes, e.g. separated by "^"';

/** `data …`, then `separated by SEPARATOR` after a CSV path. */
function readData(c: Cursor): DataNode {
  const node = readDataSource(c);
  if (c.peek() === undefined) return node;
  const start = c.here();
  c.word(["separated"], '"separated by …" or the end of the line', SEPARATOR_HINT);
  if (node.kind !== "file") {
    throw c.error(
      "a table, rows or columns in memory have no field separator",
      'Name a separator only after a CSV path, e.g. data "plots.txt" separated by semicolon',
      start,
    );
  }
  c.word(["by"], '"by"', SEPARATOR_HINT);
  return { ...node, fieldSeparator: readSeparator(c) };
}

/** A separator word (`semicolon`, `tabs`, …), or one character in quotes or in `${…}`. */
function readSeparator(c: Cursor): { value: string; spot: Spot } {
  const t = c.peek();
  if (t?.kind === "string" || (t?.kind === "value" && typeof t.value === "string")) {
    c.take();
    const value = t.value as string;
    const problem = separatorProblem(value);
    if (problem !== undefined) {
      throw c.error(
        `the separator is ${JSON.stringify(value)}, but ${problem}`,
        SEPARATOR_HINT,
        t.spot,
      );
    }
    return { value, spot: t.spot };
  }
  const spot = c.here();
  const word = c.word(
    SEPARATOR_ACCEPTED,
    `a separator (${listWords(SEPARATOR_NAMES)}, or one character in quotes)`,
    SEPARATOR_HINT,
  );
  return { value: SEPARATOR_WORDS[word.replace(/s$/, "")], spot };
}

function readDataSource(c: Cursor): DataNode {
  const t = c.peek();
  if (t?.kind === "string") {
    c.take();
    return { kind: "file", path: t.value, spot: t.spot };
  }
  if (t?.kind === "value") {
    const v = t.value;
    if (typeof v === "string") {
      c.take();
      return { kind: "file", path: v, spot: t.spot };
    }
    if (typeof v === "object" && v !== null) {
      c.take();
      return { kind: "value", value: v, spot: t.spot };
    }
    throw c.error(
      `expected a table, rows, columns or a CSV path in \${…}, but it holds ${describeValue(v)}`,
      "Interpolate a table (e.g. from readCsv), an array of row objects, an object of columns, " +
        "or a file path",
      t.spot,
    );
  }
  return c.fail(
    "${…} holding the data, or a quoted CSV path",
    'Write "data ${table}" or "data "measurements.csv""',
  );
}

const TERM_WORDS = ["legendre", "power", "column", "indicators"];
const TERM_EXPECTED = `a term (${listWords(TERM_WORDS)} or \${…})`;
const TERM_HINT =
  'Write terms as words separated by commas, e.g. "terms legendre x degree 8, column z"';

function readTerms(c: Cursor): TermNode[] {
  const terms = [readProduct(c)];
  while (c.comma()) terms.push(readProduct(c));
  return terms;
}

/** A term, or several joined by "times" into a product (left to right). */
function readProduct(c: Cursor): TermNode {
  let left = readTerm(c);
  while (c.isWord("times")) {
    c.take();
    const right = readTerm(c);
    const spot = spanOf(left.spot, right.spot);
    left = {
      term: c.build(spot, () => product(left.term, right.term)),
      columns: [...left.columns, ...right.columns],
      spot,
    };
  }
  return left;
}

function readTerm(c: Cursor): TermNode {
  const t = c.peek();
  if (t?.kind === "value") {
    c.take();
    if (!isTerm(t.value)) {
      throw c.error(
        `expected a term in \${…}, but it holds ${describeValue(t.value)}`,
        'Interpolate a term made by the API, e.g. ${legendre("x", 4)}',
        t.spot,
      );
    }
    return {
      term: t.value,
      columns: t.value.inputs.map((name) => ({ name, spot: t.spot })),
      spot: t.spot,
    };
  }
  const kind = c.word(TERM_WORDS, TERM_EXPECTED, TERM_HINT);
  const name = c.name(`the column for "${kind}"`, `Write e.g. "${kind} x"`);
  let end = name.spot;
  let term: Term;
  if (kind === "legendre" || kind === "power") {
    c.word(["degree"], '"degree"', `Write e.g. "${kind} ${name.name} degree 4"`);
    const degree = c.integer(
      `a whole number from 1 to ${MAX_DEGREE}`,
      1,
      MAX_DEGREE,
      `Write e.g. "${kind} ${name.name} degree 4"`,
    );
    end = degree.spot;
    let domain: [number, number] | undefined;
    if (kind === "legendre" && c.isWord("over")) {
      c.take();
      const hint = `Write e.g. "legendre ${name.name} degree ${degree.value} over 0 to 40"`;
      const lo = c.number("the lower end of the domain", hint);
      c.word(["to"], '"to"', hint);
      const hi = c.number("the upper end of the domain", hint);
      domain = [lo.value, hi.value];
      end = hi.spot;
    }
    const spot = spanOf(t!.spot, end);
    term = c.build(
      spot,
      () =>
        kind === "power"
          ? power(name.name, degree.value)
          : legendre(name.name, degree.value, domain === undefined ? {} : { domain }),
    );
  } else {
    term = c.build(
      spanOf(t!.spot, end),
      () => (kind === "column" ? column(name.name) : indicators(name.name)),
    );
  }
  return { term, columns: [name], spot: spanOf(t!.spot, end) };
}

function isTerm(value: unknown): value is Term {
  return typeof value === "object" && value !== null &&
    typeof (value as Term).learn === "function" && "spec" in value && "inputs" in value;
}

const GAMMA_WORDS = ["equal", "rising", "falling"];
const GAMMA_HINT = 'Write e.g. "gamma rising 2" (γ_q = order^2) or "gamma 1, 2, 4"';

function readGamma(c: Cursor): NonNullable<Section["gamma"]> {
  const t = c.peek();
  const start = c.here();
  let weights: RidgeWeights;
  let exponent: number | undefined;
  let spot = start;
  if (t?.kind === "word") {
    weights = c.word(
      GAMMA_WORDS,
      `${listWords(GAMMA_WORDS)}, numbers or \${…}`,
      GAMMA_HINT,
    ) as RidgeWeights;
    if (weights !== "equal" && c.peek() !== undefined) {
      const e = c.number("an exponent", GAMMA_HINT);
      exponent = e.value;
      spot = spanOf(start, e.spot);
    }
  } else {
    const list = c.numbers(`${listWords(GAMMA_WORDS)}, numbers or \${…}`, GAMMA_HINT);
    weights = list.values;
    spot = list.spot;
  }
  // Checked once the section's penalty is known (penaltyOf): ridge takes weights > 0, the
  // sparse penalties weights >= 0; errors still point here.
  return { weights, ...(exponent === undefined ? {} : { exponent }), spot, text: c.line.text };
}

/**
 * Within one section: λ belongs to ridge, α to lasso / elastic net (γ weights serve both). A mix
 * is an error at the line that makes it (across sections, the API reports it naming the option).
 */
function checkPairing(c: Cursor, s: Section, spot: Spot): void {
  const kind = s.penaltyNamed?.kind;
  if ((kind === "lasso" || kind === "elastic-net") && s.lambdas !== undefined) {
    throw c.error(
      `a λ grid and a ${kind} penalty are in the same section, but λ belongs to ridge`,
      'Give the sparse strength on an "alpha" line (1/(2N) convention), or use "penalty ridge"',
      spot,
    );
  }
  if (s.alphas !== undefined && (s.lambdas !== undefined || kind === "ridge")) {
    const ridgeSide = s.lambdas !== undefined ? "a λ grid" : "a ridge penalty";
    throw c.error(
      `an α grid and ${ridgeSide} are in the same section, but α belongs to lasso and elastic ` +
        "net",
      'Write "penalty lasso" or "penalty elastic-net mix 0.5" with the "alpha" line, or use ' +
        '"lambda" for ridge',
      spot,
    );
  }
}

const PENALTY_HINT = '"ridge" (λ Σ γ_q w*_q², sum-of-squares units), "lasso" or ' +
  '"elastic-net [mix ρ]" (α-scaled, 1/(2N) convention; strength on an "alpha" line); γ ' +
  'weights for any of them on a "gamma" line';

function readPenalty(c: Cursor): NonNullable<Section["penaltyNamed"]> {
  const spot = c.peek()?.spot;
  const kind = c.word(
    ["ridge", "lasso", "elastic-net"],
    'a penalty ("ridge", "lasso" or "elastic-net")',
    PENALTY_HINT,
  ) as Penalty["kind"];
  if (kind !== "elastic-net" || !c.isWord("mix")) return { kind, spot: spot! };
  c.take();
  const mix = c.number('the L1 share ρ after "mix" (a number > 0 and <= 1)', PENALTY_HINT);
  c.build(mix.spot, () => elasticNet({ mix: mix.value }));
  return { kind, mix: mix.value, spot: spot! };
}

const ALPHA_HINT = 'Write values ("alpha 0.001, 0.01, 0.1"), an automatic path ("alpha 50 points ' +
  'ratio 1e-3": from the largest useful α down to 1e-3 of it) or ${…}';

function readAlpha(c: Cursor): AlphaGrid {
  const t = c.peek();
  if (t?.kind === "number" && c.peek(1)?.kind === "word" && c.peek(1)?.text === "points") {
    const count = c.integer("a whole number of points from 2 to 10000", 2, 10000, ALPHA_HINT);
    c.take();
    if (!c.isWord("ratio")) return { count: count.value };
    c.take();
    const ratio = c.number('the smallest α as a share of the largest, after "ratio"', ALPHA_HINT);
    if (!(ratio.value > 0 && ratio.value < 1)) {
      throw c.error(
        `the ratio is ${ratio.value}, but it must be > 0 and < 1`,
        ALPHA_HINT,
        ratio.spot,
      );
    }
    return { count: count.value, ratio: ratio.value };
  }
  const list = c.numbers('α values, a count of "points", or ${…}', ALPHA_HINT);
  const bad = list.values.findIndex((v) => !(Number.isFinite(v) && v > 0));
  if (bad >= 0) {
    throw c.error(
      `α value ${bad + 1} is ${list.values[bad]}, but every α must be a finite number > 0`,
      "Remove zero, negative or infinite values",
      list.spot,
    );
  }
  return list.values;
}

const LAMBDA_HINT =
  'Write values ("lambda 0, 0.1, 1, 10"), a log-spaced grid ("lambda 50 points from 1e-4 to ' +
  '100") or ${…}';

function readLambda(c: Cursor): LambdaGrid {
  const t = c.peek();
  const ahead = c.peek(1);
  if (t?.kind === "number" && ahead?.kind === "word" && ahead.text === "points") {
    const count = c.integer("a whole number of points from 2 to 10000", 2, 10000, LAMBDA_HINT);
    c.take();
    return { count: count.value, ...readBounds(c) };
  }
  if (t?.kind === "word") {
    const bounds = readBounds(c);
    if (Object.keys(bounds).length === 0) {
      c.fail('λ values, a count of "points", "from" or "to"', LAMBDA_HINT, [
        "from",
        "to",
        "points",
      ]);
    }
    return bounds;
  }
  const list = c.numbers('λ values, a count of "points", or ${…}', LAMBDA_HINT);
  const bad = list.values.findIndex((v) => !(Number.isFinite(v) && v >= 0));
  if (bad >= 0) {
    throw c.error(
      `λ value ${bad + 1} is ${list.values[bad]}, but every λ must be a finite number >= 0`,
      "Remove negative or infinite values",
      list.spot,
    );
  }
  return list.values;
}

/** Optional "from a" and "to b" of a log-spaced grid (both > 0, b > a). */
function readBounds(c: Cursor): { min?: number; max?: number } {
  const out: { min?: number; max?: number } = {};
  for (const [word, key] of [["from", "min"], ["to", "max"]] as const) {
    if (!c.isWord(word)) continue;
    c.take();
    const v = c.number(`a λ > 0 after "${word}"`, LAMBDA_HINT);
    if (!(Number.isFinite(v.value) && v.value > 0)) {
      throw c.error(
        `the grid bound after "${word}" is ${v.value}, but it must be > 0`,
        LAMBDA_HINT,
        v.spot,
      );
    }
    if (key === "max" && out.min !== undefined && !(v.value > out.min)) {
      throw c.error(
        `the grid runs from ${out.min} to ${v.value}, but the upper end must be larger`,
        "Swap or widen the bounds",
        v.spot,
      );
    }
    out[key] = v.value;
  }
  return out;
}

const FOLDS_HINT =
  'Write e.g. "folds 5 seed 42", "folds holdout 0.2 seed 7" or "folds leave-one-out"';
const FOLD_OPTIONS = ["seed", "repeats", "grouped"];

function readFolds(c: Cursor): FoldsNode {
  const t = c.peek();
  const start = c.here();
  if (t?.kind === "value") {
    c.take();
    if (isFoldPlan(t.value)) return { request: t.value, spot: t.spot };
    if (!(typeof t.value === "number" && Number.isInteger(t.value) && t.value >= 2)) {
      throw c.error(
        `expected a fold plan or a whole number of folds (at least 2) in \${…}, but it holds ${
          describeValue(t.value)
        }`,
        FOLDS_HINT,
        t.spot,
      );
    }
    const options = readFoldOptions(c, true);
    return {
      request: { k: t.value, ...options.request },
      ...(options.groups === undefined ? {} : { groups: options.groups }),
      spot: t.spot,
    };
  }
  if (c.isWord("leave-one-out")) {
    c.take();
    return { request: { leaveOneOut: true }, spot: start };
  }
  if (c.isWord("holdout")) {
    c.take();
    const f = c.number("the fraction of rows held out, e.g. 0.2", FOLDS_HINT);
    if (!(f.value > 0 && f.value < 1)) {
      throw c.error(
        `the held-out fraction is ${f.value}, but it must lie between 0 and 1`,
        FOLDS_HINT,
        f.spot,
      );
    }
    const options = readFoldOptions(c, false);
    return { request: { holdout: f.value, ...options.request }, spot: spanOf(start, c.here()) };
  }
  let k: number | undefined;
  if (t?.kind === "number") {
    k = c.integer("a whole number of folds, at least 2", 2, Number.MAX_SAFE_INTEGER, FOLDS_HINT)
      .value;
  } else if (!(t?.kind === "word" && FOLD_OPTIONS.includes(t.text))) {
    c.fail(
      `a number of folds, ${listWords(["holdout", "leave-one-out", ...FOLD_OPTIONS, "${…}"])}`,
      FOLDS_HINT,
      ["holdout", "leave-one-out", ...FOLD_OPTIONS],
    );
  }
  const options = readFoldOptions(c, true);
  return {
    request: { ...(k === undefined ? {} : { k }), ...options.request },
    ...(options.groups === undefined ? {} : { groups: options.groups }),
    spot: start,
  };
}

/** "seed N", "repeats N" and (for K-fold) "grouped by NAME", in any order, each at most once. */
function readFoldOptions(
  c: Cursor,
  grouping: boolean,
): { request: { seed?: number; repeats?: number; groups?: string }; groups?: Named } {
  const request: { seed?: number; repeats?: number; groups?: string } = {};
  let groups: Named | undefined;
  const accepted = grouping ? FOLD_OPTIONS : ["seed", "repeats"];
  while (c.peek() !== undefined) {
    const spot = c.here();
    const expected = `${accepted.map((w) => `"${w}"`).join(", ")} or the end of the line`;
    const word = c.word(accepted, expected, FOLDS_HINT);
    const key = word === "grouped" ? "groups" : word as "seed" | "repeats";
    if (request[key] !== undefined) {
      throw c.error(`"${word}" is given twice`, "Give each fold option once", spot);
    }
    if (word === "grouped") {
      c.word(["by"], '"by"', 'Write e.g. "folds 5 seed 1 grouped by site"');
      groups = c.name("the column whose rows stay together", 'Write e.g. "grouped by site"');
      request.groups = groups.name;
    } else if (word === "seed") {
      request.seed =
        c.integer("a whole-number seed from 0 to 2^53-1", 0, Number.MAX_SAFE_INTEGER, FOLDS_HINT)
          .value;
    } else {
      request.repeats =
        c.integer("a whole number of repeats, at least 1", 1, 10000, FOLDS_HINT).value;
    }
  }
  return { request, ...(groups === undefined ? {} : { groups }) };
}

function readCandidateName(c: Cursor, sections: readonly Section[]): { name: string; spot: Spot } {
  const t = c.peek();
  let name: string;
  let spot: Spot;
  if (t?.kind === "string" || (t?.kind === "value" && typeof t.value === "string")) {
    c.take();
    name = t.kind === "string" ? t.value : t.value as string;
    spot = t.spot;
  } else {
    const rest: typeof c.line.tokens[number][] = [];
    while (c.peek() !== undefined && c.peek()!.kind !== "value") rest.push(c.take());
    if (rest.length === 0) {
      c.fail("a name for the candidate", 'Write e.g. "candidate degree 12, rising gamma"');
    }
    spot = spanOf(rest[0].spot, rest[rest.length - 1].spot);
    name = [...c.line.text].slice(spot.column - 1, spot.column - 1 + spot.length).join("");
  }
  if (name.trim() === "") {
    throw c.error("the candidate name is blank", "Give every candidate a distinct name", spot);
  }
  const same = sections.find((s) => s.candidate?.name === name);
  if (same !== undefined) {
    throw c.error(
      `the candidate name "${name}" is already used on line ${same.candidate!.spot.line}`,
      "Give every candidate a distinct name",
      spot,
    );
  }
  return { name, spot };
}

function checkCandidates(
  lines: readonly SourceLine[],
  shared: Section,
  candidates: readonly Section[],
  endSpot: Spot,
): void {
  const lineOf = (n: number) => lines[n - 1];
  if (candidates.length === 1) {
    const spot = candidates[0].candidate!.spot;
    throw new MagicError(
      "MAGIC_SYNTAX",
      "there is only one candidate, but a comparison needs at least two",
      'Add another "candidate" block, or remove the "candidate" line to sweep one model',
      spot,
      lineOf(spot.line).text,
    );
  }
  if (shared.terms !== undefined) return;
  if (candidates.length === 0) {
    throw missing(
      lines[lines.length - 1],
      endSpot,
      "terms",
      'Add e.g. "terms legendre x degree 8"',
    );
  }
  for (const s of candidates) {
    if (s.terms === undefined) {
      const spot = s.candidate!.spot;
      throw new MagicError(
        "MAGIC_SYNTAX",
        `candidate "${s.candidate!.name}" has no terms`,
        'Add a "terms" line under it, or one shared "terms" line above the first candidate',
        spot,
        lineOf(spot.line).text,
      );
    }
  }
}

function missing(last: SourceLine, spot: Spot, statement: Statement, hint: string): MagicError {
  return new MagicError(
    "MAGIC_SYNTAX",
    `the template has no "${statement}" line`,
    hint,
    spot,
    last.text,
  );
}

/**
 * The settings a section says. A candidate's penalty is put together line by line: its own
 * `penalty` and `gamma` lines, each missing one taken from the shared section (so a candidate's
 * `penalty lasso` keeps a shared `gamma` line, and its `gamma` line keeps a shared penalty).
 */
function settingsOf(s: Section, shared?: Section): Settings {
  const own = s.penaltyNamed !== undefined || s.gamma !== undefined;
  const named = s.penaltyNamed ?? (own ? shared?.penaltyNamed : undefined);
  const gamma = s.gamma ?? (own ? shared?.gamma : undefined);
  const penalty = own ? penaltyOf(named, gamma) : undefined;
  const out: Record<string, unknown> = {
    terms: s.terms,
    penalty,
    lambdas: s.lambdas,
    alphas: s.alphas,
    rule: s.rule,
    standardize: s.standardize,
    intercept: s.intercept,
    closedForm: s.closedForm,
  };
  for (const key of Object.keys(out)) if (out[key] === undefined) delete out[key];
  return out as Settings;
}

/** The penalty of a `penalty` line and a `gamma` line (either may be absent; ridge by default). */
function penaltyOf(named: Section["penaltyNamed"], gamma: Section["gamma"]): Penalty {
  const weights = gamma === undefined
    ? {}
    : gamma.exponent === undefined
    ? { weights: gamma.weights }
    : { weights: gamma.weights, exponent: gamma.exponent };
  const make = () =>
    named?.kind === "lasso"
      ? lasso(weights)
      : named?.kind === "elastic-net"
      ? elasticNet({ ...(named.mix === undefined ? {} : { mix: named.mix }), ...weights })
      : ridge(weights);
  return gamma === undefined ? make() : buildAt(gamma.spot, gamma.text, make);
}
