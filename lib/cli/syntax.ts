/**
 * The command line's own small syntax for terms, penalties, number lists and candidates, with a
 * formatter for each that writes text the parser reads back to the same thing.
 *
 * Terms (one `--term` each; `*` multiplies two terms into every product of their columns):
 *
 * | text                              | API                                         |
 * | --------------------------------- | ------------------------------------------- |
 * | `legendre:COLUMN:DEGREE`          | `legendre(COLUMN, DEGREE)`                  |
 * | `legendre:COLUMN:DEGREE:LOW:HIGH` | `legendre(COLUMN, DEGREE, { domain: [LOW, HIGH] })` |
 * | `power:COLUMN:DEGREE`             | `power(COLUMN, DEGREE)`                     |
 * | `column:COLUMN`                   | `column(COLUMN)`                            |
 * | `indicators:COLUMN`               | `indicators(COLUMN)`                        |
 * | `TERM*TERM`                       | `product(TERM, TERM)`                       |
 *
 * A column name that holds `:`, `*`, `+`, `;`, `"`, `=` or spaces at its ends is written in
 * double quotes, with `""` for a quote inside: `column:"rate: mm/h"`.
 *
 * Penalties: `ridge` (γ = 1), `ridge:rising[:EXPONENT]`, `ridge:falling[:EXPONENT]`,
 * `ridge:W1,W2,…` (one γ per design column), `lasso[:WEIGHTS]`, `elastic-net[:MIX[:WEIGHTS]]`
 * (MIX the L1 share ρ; their strength is α in the 1/(2N) convention), WEIGHTS written as after
 * `ridge:` (`rising[:E]`, `falling[:E]`, `W1,W2,…`; a 0 leaves a column unpenalized).
 *
 * Candidates (`--candidate`, or one per line of a `--candidates` file): `key=value` pairs
 * separated by `;`, e.g. `name=degree 2; terms=legendre:x:2 + column:z; lambdas=0`. Keys are the
 * option names without dashes: `name` (required), `terms` (terms joined by `+`), `penalty`,
 * `lambdas`, `lambda-count`, `lambda-min`, `lambda-max`, `alphas`, `alpha-count`, `alpha-ratio`,
 * `tolerance`, `rule`, `scale`, `intercept`, `closed-form`.
 *
 * @module
 */
import { CurbfitError, describePlace, type ErrorCode } from "../errors/error.ts";
import type { Json, Term } from "../design/types.ts";
import { column, indicators, legendre, power, product } from "../design/mod.ts";
import { type Penalty, ridge, type RidgePenalty, type RidgeWeights } from "../fit/penalty.ts";
import { elasticNet, lasso } from "../sparse/mod.ts";
import { nearestWord } from "../magic/words.ts";

/** Characters that end an unquoted name. */
const NAME_STOP = /[:*+;"=]/;

/**
 * The term kinds, in the order help lists them.
 *
 * @example
 * ```ts
 * import { TERM_KINDS } from "./syntax.ts";
 * console.log(TERM_KINDS.includes("legendre")); // true
 * ```
 */
export const TERM_KINDS = ["legendre", "power", "column", "indicators"] as const;

/** Errors made by the command line itself, whose message already names the option as typed. */
const OWN_ERRORS = new WeakSet<CurbfitError>();

/**
 * A usage error for option `option` (as the user typed it, e.g. `--term` or `--candidate 2`),
 * whose message names the option itself; `code` defaults to BAD_OPTION.
 *
 * @example
 * ```ts
 * import { usageError } from "./syntax.ts";
 * console.log(usageError("--seed", "--seed is 1.5, but it must be a whole number", "Write e.g. --seed 7").message);
 * ```
 */
export function usageError(
  option: string,
  what: string,
  hint: string,
  code: ErrorCode = "BAD_OPTION",
): CurbfitError {
  const e = new CurbfitError(code, what, hint, { option });
  OWN_ERRORS.add(e);
  return e;
}

/**
 * Whether an error was made by `usageError` (its message names the option as typed, so the
 * place prefix can be left out when printing it).
 *
 * @example
 * ```ts
 * import { isUsageError, usageError } from "./syntax.ts";
 * console.log(isUsageError(usageError("--out", "x", "y"))); // true
 * ```
 */
export function isUsageError(e: unknown): boolean {
  return e instanceof CurbfitError && OWN_ERRORS.has(e);
}

/** Splits `text` at every `separator` that is outside double quotes. */
function splitOutsideQuotes(text: string, separator: string): string[] {
  const parts: string[] = [];
  let quoted = false;
  let start = 0;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    if (ch === '"') quoted = !quoted;
    else if (ch === separator && !quoted) {
      parts.push(text.slice(start, i));
      start = i + 1;
    }
  }
  parts.push(text.slice(start));
  return parts;
}

/**
 * Reads a name: `"quoted"` (with `""` for a quote) or unquoted text up to a stop character,
 * trimmed. Returns the name and the rest of the text.
 */
function readName(text: string, option: string, whole: string): { name: string; rest: string } {
  const t = text.trimStart();
  if (t.startsWith('"')) {
    let name = "";
    for (let i = 1; i < t.length; i++) {
      if (t[i] !== '"') {
        name += t[i];
        continue;
      }
      if (t[i + 1] === '"') {
        name += '"';
        i++;
        continue;
      }
      return { name, rest: t.slice(i + 1).trimStart() };
    }
    throw usageError(
      option,
      `${JSON.stringify(whole)} opens a quote that is never closed`,
      'Close the name with a double quote, writing "" for a quote inside it',
    );
  }
  const stop = t.search(NAME_STOP);
  const end = stop === -1 ? t.length : stop;
  return { name: t.slice(0, end).trim(), rest: t.slice(end) };
}

/**
 * Writes a name so that `readName` reads it back: bare when it is safe, else in double quotes.
 *
 * @example
 * ```ts
 * import { quoteName } from "./syntax.ts";
 * console.log(quoteName("days"), quoteName("rate: mm/h")); // days "rate: mm/h"
 * ```
 */
export function quoteName(name: string): string {
  const safe = name !== "" && name.trim() === name && !NAME_STOP.test(name);
  return safe ? name : `"${name.replaceAll('"', '""')}"`;
}

const DECIMAL = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?$/;

/**
 * A decimal number (`12`, `0.5`, `1e-4`, `-3`); anything else is a usage error naming `option`.
 *
 * @example
 * ```ts
 * import { parseNumber } from "./syntax.ts";
 * console.log(parseNumber("1e-4", "--lambda-min")); // 0.0001
 * ```
 */
export function parseNumber(text: string, option: string): number {
  const t = text.trim();
  const value = Number(t);
  if (!DECIMAL.test(t) || !Number.isFinite(value)) {
    throw usageError(
      option,
      `${option} is ${JSON.stringify(text)}, which is not a decimal number`,
      "Write a number such as 12, 0.5 or 1e-4",
    );
  }
  return value;
}

/**
 * A whole number written with digits only (`8`, `20240611`).
 *
 * @example
 * ```ts
 * import { parseWhole } from "./syntax.ts";
 * console.log(parseWhole("8", "--folds")); // 8
 * ```
 */
export function parseWhole(text: string, option: string): number {
  const t = text.trim();
  if (!/^\d+$/.test(t) || !Number.isSafeInteger(Number(t))) {
    throw usageError(
      option,
      `${option} is ${JSON.stringify(text)}, but it must be a whole number written with digits`,
      `Write e.g. ${option} 7`,
    );
  }
  return Number(t);
}

/**
 * A comma-separated list of λ values, each a decimal number ≥ 0.
 *
 * @example
 * ```ts
 * import { parseLambdas } from "./syntax.ts";
 * console.log(parseLambdas("0, 0.1, 10", "--lambdas")); // [ 0, 0.1, 10 ]
 * ```
 */
export function parseLambdas(text: string, option: string): number[] {
  return text.split(",").map((item) => {
    const value = parseNumber(item, option);
    if (value < 0) {
      throw usageError(
        option,
        `${option} holds ${item.trim()}, but every λ must be a number >= 0`,
        "Remove negative values; λ = 0 means no penalty",
      );
    }
    return value;
  });
}

/**
 * A comma-separated list of α values, each a decimal number > 0.
 *
 * @example
 * ```ts
 * import { parseAlphas } from "./syntax.ts";
 * console.log(parseAlphas("0.001, 0.01", "--alphas")); // [ 0.001, 0.01 ]
 * ```
 */
export function parseAlphas(text: string, option: string): number[] {
  return text.split(",").map((item) => {
    const value = parseNumber(item, option);
    if (!(value > 0)) {
      throw usageError(
        option,
        `${option} holds ${item.trim()}, but every α must be a number > 0`,
        "Remove zero and negative values; for an unpenalized model use lambdas=0 with ridge",
      );
    }
    return value;
  });
}

/**
 * A term written in the command-line syntax (see the module notes).
 *
 * @example
 * ```ts
 * import { parseTerm } from "./syntax.ts";
 * console.log(parseTerm("legendre:days:12", "--term").label); // legendre(days, 12)
 * console.log(parseTerm("column:shade*indicators:watering", "--term").label);
 * // product(column(shade), indicators(watering))
 * ```
 */
export function parseTerm(text: string, option: string): Term {
  const factors = splitOutsideQuotes(text, "*");
  const terms = factors.map((f) => parseFactor(f, option, text));
  return terms.reduce((left, right) => product(left, right));
}

function parseFactor(text: string, option: string, whole: string): Term {
  const colon = text.indexOf(":");
  const kind = (colon === -1 ? text : text.slice(0, colon)).trim();
  if (!(TERM_KINDS as readonly string[]).includes(kind)) {
    const near = nearestWord(kind, TERM_KINDS);
    throw usageError(
      option,
      `${option} ${JSON.stringify(whole)} starts with ${JSON.stringify(kind)}, which is not a ` +
        `term kind (${TERM_KINDS.join(", ")})`,
      near === undefined
        ? "Write e.g. legendre:COLUMN:DEGREE, column:COLUMN or indicators:COLUMN"
        : `Did you mean ${near}? Write e.g. ${near}:COLUMN${
          near === "legendre" || near === "power" ? ":DEGREE" : ""
        }`,
    );
  }
  const { name, rest } = readName(text.slice(colon + 1), option, whole);
  if (colon === -1 || name === "") {
    throw usageError(
      option,
      `${option} ${JSON.stringify(whole)} names no column`,
      `Write ${kind}:COLUMN${kind === "legendre" || kind === "power" ? ":DEGREE" : ""}`,
    );
  }
  const numbers = rest === "" ? [] : rest.replace(/^:/, "").split(":");
  if (rest !== "" && !rest.startsWith(":")) {
    throw usageError(
      option,
      `${option} ${JSON.stringify(whole)} has ${JSON.stringify(rest)} after the column name`,
      "Separate the parts with colons, and quote a name that holds : * + ; or =",
    );
  }
  const expect = (counts: readonly number[], form: string) => {
    if (!counts.includes(numbers.length)) {
      throw usageError(
        option,
        `${option} ${JSON.stringify(whole)} has ${numbers.length} number${
          numbers.length === 1 ? "" : "s"
        } after the column, but ${kind} takes the form ${form}`,
        `Write e.g. ${form}`,
      );
    }
  };
  const at = `${option} ${JSON.stringify(whole)}`;
  return asOption(option, whole, () => {
    switch (kind) {
      case "legendre": {
        expect([1, 3], "legendre:COLUMN:DEGREE or legendre:COLUMN:DEGREE:LOW:HIGH");
        const degree = parseWhole(numbers[0], `the degree in ${at}`);
        if (numbers.length === 1) return legendre(name, degree);
        const low = parseNumber(numbers[1], `the domain's low end in ${at}`);
        const high = parseNumber(numbers[2], `the domain's high end in ${at}`);
        return legendre(name, degree, { domain: [low, high] });
      }
      case "power":
        expect([1], "power:COLUMN:DEGREE");
        return power(name, parseWhole(numbers[0], `the degree in ${at}`));
      case "column":
        expect([0], "column:COLUMN");
        return column(name);
      default:
        expect([0], "indicators:COLUMN");
        return indicators(name);
    }
  });
}

/**
 * What a CurbfitError says is wrong, without its place prefix and its hint.
 *
 * @example
 * ```ts
 * import { CurbfitError, describePlace, type ErrorCode } from "../errors/error.ts";
 * import { whatOf } from "./syntax.ts";
 * const e = new CurbfitError("BAD_OPTION", "k is 1", "Use 2 or more", { option: "k" });
 * console.log(whatOf(e)); // "k is 1"
 * ```
 */
export function whatOf(e: CurbfitError): string {
  const body = e.message.slice(describePlace(e.place).length);
  const tail = `. ${e.hint}`;
  return body.endsWith(tail) ? body.slice(0, -tail.length) : body;
}

/** Runs `make`, re-labelling an API error with the option and text it came from. */
function asOption<T>(option: string, whole: string, make: () => T): T {
  try {
    return make();
  } catch (e) {
    if (!(e instanceof CurbfitError) || isUsageError(e)) throw e;
    throw usageError(option, `in ${option} ${JSON.stringify(whole)}: ${whatOf(e)}`, e.hint, e.code);
  }
}

/**
 * A term's JSON recipe (`Term.spec`) written in the command-line syntax.
 *
 * @example
 * ```ts
 * import { formatTerm, parseTerm } from "./syntax.ts";
 * const text = formatTerm(parseTerm('legendre:"a:b":3:0:10', "--term").spec);
 * console.log(text); // legendre:"a:b":3:0:10
 * ```
 */
export function formatTerm(spec: Json): string {
  const s = spec as Record<string, Json>;
  const name = () => quoteName(s.column as string);
  switch (s.kind) {
    case "legendre": {
      const domain = s.domain as number[] | undefined;
      return `legendre:${name()}:${s.degree}` + (domain ? `:${domain[0]}:${domain[1]}` : "");
    }
    case "power":
      return `power:${name()}:${s.degree}`;
    case "column":
      return `column:${name()}`;
    case "indicators":
      return `indicators:${name()}`;
    case "product":
      return `${formatTerm(s.left)}*${formatTerm(s.right)}`;
    default:
      throw new CurbfitError(
        "BAD_RECORD",
        `a term of kind ${JSON.stringify(s.kind)} has no command-line form`,
        "Use a record written by this curbfit",
        { option: "terms" },
      );
  }
}

/**
 * A penalty in the command-line syntax: `ridge`, `ridge:rising[:E]`, `ridge:falling[:E]`,
 * `ridge:W1,W2,…`; or `lasso[:WEIGHTS]`, `elastic-net[:MIX[:WEIGHTS]]` (MIX the L1 share ρ,
 * default 0.5), whose strength is α in the 1/(2N) convention, not λ. WEIGHTS are the γ weights
 * as ridge takes them — `rising[:E]`, `falling[:E]` or `W1,W2,…` — and may be 0 for the sparse
 * penalties (an unpenalized column); for the elastic net they follow the MIX.
 *
 * @example
 * ```ts
 * import { parsePenalty } from "./syntax.ts";
 * console.log(parsePenalty("ridge:rising:2", "--penalty")); // { kind: "ridge", weights: "rising", exponent: 2 }
 * console.log(parsePenalty("elastic-net:0.5:0,1,1", "--penalty").weights); // [0, 1, 1]
 * ```
 */
export function parsePenalty(text: string, option: string): Penalty {
  const [kind, ...rest] = text.trim().split(":").map((p) => p.trim());
  const read = (fields: string[], after: string) => parseWeights(fields, option, text, after);
  if (kind === "lasso") {
    const weights = read(rest, "lasso");
    return asOption(option, text, () => lasso(weights));
  }
  if (kind === "elastic-net") {
    if (rest.length === 0) return elasticNet();
    const mix = parseNumber(rest[0], `the L1 share in ${option}`);
    const weights = read(rest.slice(1), `elastic-net:${rest[0]}`);
    return asOption(option, text, () => elasticNet({ mix, ...weights }));
  }
  if (kind !== "ridge") {
    throw usageError(
      option,
      `${option} is ${JSON.stringify(text)}, which is not a penalty this version knows`,
      PENALTY_HINT,
    );
  }
  const weights = read(rest, "ridge");
  return asOption(option, text, () => ridge(weights));
}

const PENALTY_HINT =
  "Write ridge, ridge:rising:2, ridge:falling:1 or ridge:1,2,4 (one γ per design column), " +
  "lasso or lasso:rising:2, or elastic-net:0.5 (the L1 share), with weights after it as in " +
  "elastic-net:0.5:0,1,1 (0: unpenalized)";

/** The weight fields after a penalty's kind (and an elastic net's MIX): none means equal. */
function parseWeights(
  fields: readonly string[],
  option: string,
  text: string,
  after: string,
): { weights?: RidgeWeights; exponent?: number } {
  const [shape, exponent, ...extra] = fields;
  if (extra.length > 0) {
    throw usageError(
      option,
      `${option} is ${JSON.stringify(text)}, which is not a penalty this version knows`,
      PENALTY_HINT,
    );
  }
  if (shape === undefined || shape === "equal") {
    if (exponent !== undefined) {
      throw usageError(
        option,
        `${option} ${
          JSON.stringify(text)
        } has an exponent, which only rising and falling weights take`,
        PENALTY_HINT,
      );
    }
    return {};
  }
  if (shape === "rising" || shape === "falling") {
    return exponent === undefined
      ? { weights: shape }
      : { weights: shape, exponent: parseNumber(exponent, `the exponent in ${option}`) };
  }
  if (exponent !== undefined || !/^[\d.,eE+\s-]+$/.test(shape)) {
    throw usageError(
      option,
      `${option} is ${JSON.stringify(text)}: after ${after}: comes equal, rising, falling or a ` +
        "list of weights",
      PENALTY_HINT,
    );
  }
  return { weights: shape.split(",").map((w) => parseNumber(w, `a weight in ${option}`)) };
}

/**
 * A penalty written in the command-line syntax (ridge weights, or a sparse penalty's kind, L1
 * share and weights when it has any).
 *
 * @example
 * ```ts
 * import { formatPenalty } from "./syntax.ts";
 * console.log(formatPenalty({ weights: "rising", exponent: 2 })); // ridge:rising:2
 * console.log(formatPenalty({ kind: "lasso", mix: 1, weights: [0, 1] })); // lasso:0,1
 * ```
 */
export function formatPenalty(
  penalty:
    | { readonly weights: RidgePenalty["weights"]; readonly exponent: number }
    | {
      readonly kind: "lasso" | "elastic-net";
      readonly mix: number;
      readonly weights?: RidgePenalty["weights"];
      readonly exponent?: number;
    },
): string {
  if ("mix" in penalty) {
    const head = penalty.kind === "lasso" ? "lasso" : `elastic-net:${penalty.mix}`;
    const weights = penalty.weights === undefined
      ? ""
      : formatWeights(penalty.weights, penalty.exponent ?? 1);
    return weights === "" ? head : `${head}:${weights}`;
  }
  const weights = formatWeights(penalty.weights, penalty.exponent);
  return weights === "" ? "ridge" : `ridge:${weights}`;
}

/** Weights as they follow a penalty's kind: "" for equal weights. */
function formatWeights(weights: RidgeWeights, exponent: number): string {
  if (typeof weights !== "string") return weights.join(",");
  if (weights === "equal") return "";
  return `${weights}:${exponent}`;
}

/**
 * The keys a candidate may set, in the order the formatter writes them.
 *
 * @example
 * ```ts
 * import { CANDIDATE_KEYS } from "./syntax.ts";
 * console.log(CANDIDATE_KEYS[0]); // name
 * ```
 */
export const CANDIDATE_KEYS = [
  "name",
  "terms",
  "penalty",
  "lambdas",
  "lambda-count",
  "lambda-min",
  "lambda-max",
  "alphas",
  "alpha-count",
  "alpha-ratio",
  "tolerance",
  "rule",
  "scale",
  "intercept",
  "closed-form",
] as const;

/**
 * A candidate key.
 *
 * @example
 * ```ts
 * import type { CandidateKey } from "./syntax.ts";
 * const key: CandidateKey = "lambdas";
 * ```
 */
export type CandidateKey = typeof CANDIDATE_KEYS[number];

/**
 * A candidate's text split into its settings (values still text; `name` unquoted).
 *
 * @example
 * ```ts
 * import { parseCandidate } from "./syntax.ts";
 * const c = parseCandidate('name="a; b"; terms=column:x; lambdas=0', "--candidate 1");
 * console.log(c.get("name"), c.get("lambdas")); // a; b 0
 * ```
 */
export function parseCandidate(text: string, option: string): Map<CandidateKey, string> {
  const settings = new Map<CandidateKey, string>();
  for (const part of splitOutsideQuotes(text, ";")) {
    if (part.trim() === "") continue;
    const eq = part.indexOf("=");
    const key = (eq === -1 ? part : part.slice(0, eq)).trim();
    if (eq === -1 || !(CANDIDATE_KEYS as readonly string[]).includes(key)) {
      const near = nearestWord(key, CANDIDATE_KEYS);
      throw usageError(
        option,
        `${option} has ${JSON.stringify(part.trim())}, but a candidate is written as key=value ` +
          `pairs separated by ; with keys ${CANDIDATE_KEYS.join(", ")}`,
        near !== undefined && near !== key
          ? `Did you mean ${near}=…?`
          : 'Write e.g. "name=degree 2; terms=legendre:x:2; lambdas=0"',
      );
    }
    if (settings.has(key as CandidateKey)) {
      throw usageError(option, `${option} sets ${key} twice`, `Keep one ${key}=…`);
    }
    const value = part.slice(eq + 1).trim();
    settings.set(key as CandidateKey, key === "name" ? readWholeName(value, option) : value);
  }
  if (!settings.has("name")) {
    throw usageError(option, `${option} has no name`, "Start it with name=…, e.g. name=degree 2");
  }
  return settings;
}

function readWholeName(value: string, option: string): string {
  const { name, rest } = value.startsWith('"')
    ? readName(value, option, value)
    : { name: value, rest: "" };
  if (name === "" || rest !== "") {
    throw usageError(
      option,
      `${option} has the name ${JSON.stringify(value)}`,
      'Give a non-empty name; quote it as name="…" when it holds ; or quotes',
    );
  }
  return name;
}

/**
 * The terms of a candidate's `terms=` setting: terms joined by `+`.
 *
 * @example
 * ```ts
 * import { parseTermList } from "./syntax.ts";
 * console.log(parseTermList("legendre:x:2 + column:z", "--candidate 1").length); // 2
 * ```
 */
export function parseTermList(text: string, option: string): Term[] {
  return splitOutsideQuotes(text, "+").map((t) => parseTerm(t, option));
}

/**
 * A candidate written in the command-line syntax from its settings (already formatted text,
 * keys in `CANDIDATE_KEYS` order; the name quoted when needed).
 *
 * @example
 * ```ts
 * import { formatCandidate } from "./syntax.ts";
 * console.log(formatCandidate([["name", "a; b"], ["lambdas", "0"]])); // name="a; b"; lambdas=0
 * ```
 */
export function formatCandidate(settings: readonly (readonly [CandidateKey, string])[]): string {
  return settings.map(([key, value]) => `${key}=${key === "name" ? quoteName(value) : value}`)
    .join("; ");
}
