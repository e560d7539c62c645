/**
 * The API call a `curb` template stands for, printed as TypeScript a user can paste into a
 * notebook cell or a module and edit from there. The call is printed from the same job the
 * template runs, so running the printed code on the same data gives the same numbers.
 *
 * Free names in the printed code: `data` (the value interpolated on the `data` line; when the
 * template names a CSV file, the code reads it itself, with the `fieldSeparator` the data line
 * names) and `plan` (a fold plan interpolated on the `folds` line). Everything else — terms, γ,
 * λ grid, seeds — is written out literally; numbers are printed with JavaScript's shortest
 * round-trip form, so they parse back exactly.
 *
 * @module
 */
import type { Json, Term } from "../design/types.ts";
import { isSparse, type Penalty, type RidgeWeights } from "../fit/penalty.ts";
import { escapeHtml } from "../views/escape.ts";
import { isFoldPlan } from "../sweep/folds.ts";
import type { Job } from "./job.ts";
import type { CurbProgram } from "./parser.ts";

/** The key Deno's Jupyter kernel calls to display an object. */
const JUPYTER_DISPLAY: unique symbol = Symbol.for("Jupyter.display") as never;

/** Where printed code imports curbfit from (the name a scaffolded analysis folder maps). */
export const IMPORT_NAME = "curbfit";

/** Longest line the printer keeps on one line before breaking an array or object. */
const WIDTH = 96;

/**
 * TypeScript for one API call, shown in notebooks as a code block.
 *
 * @example
 * ```ts
 * import { ApiCall } from "./code.ts";
 * const call = new ApiCall('import { sweep } from "curbfit";\n', ["data"]);
 * console.log(String(call), call.freeNames); // the code, [ "data" ]
 * ```
 */
export class ApiCall {
  /** The code: an import line, then statements ending in `const result = …;`. */
  readonly code: string;
  /** Names the code expects the surrounding cell to define (`data`, `plan`). */
  readonly freeNames: readonly string[];

  /**
   * Wraps generated code; the instance and a copy of `freeNames` are frozen.
   *
   * @param code the TypeScript source of the call
   * @param freeNames names the code uses but does not define
   */
  constructor(code: string, freeNames: readonly string[]) {
    this.code = code;
    this.freeNames = Object.freeze([...freeNames]);
    Object.freeze(this);
  }

  /** The code. */
  toString(): string {
    return this.code;
  }

  /** Jupyter display: the code as plain text, Markdown and HTML. */
  [JUPYTER_DISPLAY](): Record<string, string> {
    return {
      "text/plain": this.code,
      "text/markdown": "```ts\n" + this.code + "\n```",
      "text/html": `<pre><code>${escapeHtml(this.code)}</code></pre>`,
    };
  }
}

/** Printed verbatim by `literal`. */
class Raw {
  constructor(readonly text: string) {}
}

/**
 * The equivalent API call of a program and its job.
 *
 * @example
 * ```ts
 * import { apiCallOf } from "./code.ts";
 * import { jobOf } from "./job.ts";
 * import { parseTemplate } from "./parser.ts";
 * const tag = (s: TemplateStringsArray, ...v: unknown[]) => parseTemplate(s, v);
 * const program = tag`
 *   data ${{ x: [1, 2, 3, 4], y: [2, 4, 5, 8] }}
 *   predict y
 *   terms legendre x degree 2
 *   folds 2 seed 9
 * `;
 * console.log(apiCallOf(program, jobOf(program)).code);
 * // import { legendre, sweep } from "curbfit";
 * // …
 * // const result = sweep(data, { target: "y", terms: [legendre("x", 2)], folds: { k: 2, seed: 9 } });
 * ```
 */
export function apiCallOf(program: CurbProgram, job: Job): ApiCall {
  const uses = new Set<string>([job.kind]);
  const free: string[] = [];
  const preamble: string[] = [];
  if (program.data.kind === "file") {
    uses.add("readCsv");
    const separator = program.data.fieldSeparator;
    const options = separator === undefined
      ? ""
      : `, ${literal({ fieldSeparator: separator.value }, 0)}`;
    preamble.push(`const data = await readCsv(${JSON.stringify(program.data.path)}${options});`);
  } else {
    free.push("data");
    preamble.push(
      `// data: the value interpolated as \${…} on line ${program.data.spot.line} of the template.`,
    );
  }
  const folds = program.folds;
  if (folds !== undefined && isFoldPlan(folds.request)) {
    free.push("plan");
    preamble.push(
      `// plan: the fold plan interpolated as \${…} on line ${folds.spot.line} of the template.`,
    );
  }
  const call = job.kind === "sweep"
    ? `${job.kind}(data, ${literal(asCode(job.spec, uses), 0)})`
    : `${job.kind}(data, ${literal(job.candidates.map((c) => asCode(c, uses)), 0)}, ${
      literal(asCode(job.options, uses), 0)
    })`;
  const imports = [...uses].sort();
  const code = [
    `import { ${imports.join(", ")} } from ${JSON.stringify(IMPORT_NAME)};`,
    "",
    ...preamble,
    `const result = ${call};`,
  ].join("\n");
  return new ApiCall(code, free);
}

/** A copy of a spec object with terms, penalties and fold plans replaced by code. */
function asCode(spec: object, uses: Set<string>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [key, value] of Object.entries(spec)) {
    if (value === undefined) continue;
    if (key === "terms") out[key] = (value as Term[]).map((t) => new Raw(termCode(t.spec, uses)));
    else if (key === "penalty") out[key] = new Raw(penaltyCode(value as Penalty, uses));
    else if (key === "folds" && isFoldPlan(value)) out[key] = new Raw("plan");
    else out[key] = value;
  }
  return out;
}

/** `legendre("x", 4)` … from a term's JSON spec (see `termFromSpec`). */
function termCode(spec: Json, uses: Set<string>): string {
  const s = spec as Record<string, Json>;
  const kind = s.kind as string;
  uses.add(kind);
  const name = JSON.stringify(s.column);
  switch (kind) {
    case "legendre":
      return s.domain === undefined
        ? `legendre(${name}, ${s.degree})`
        : `legendre(${name}, ${s.degree}, { domain: ${literal(s.domain, 0)} })`;
    case "power":
      return `power(${name}, ${s.degree})`;
    case "product":
      return `product(${termCode(s.left, uses)}, ${termCode(s.right, uses)})`;
    default:
      return `${kind}(${name})`;
  }
}

function penaltyCode(p: Penalty, uses: Set<string>): string {
  const weights = weightsCode(p.weights ?? "equal", p.exponent ?? 1);
  if (isSparse(p)) {
    const name = p.kind === "lasso" ? "lasso" : "elasticNet";
    uses.add(name);
    const fields = [...(p.kind === "lasso" ? [] : [`mix: ${p.mix}`]), ...weights];
    return fields.length === 0 ? `${name}()` : `${name}({ ${fields.join(", ")} })`;
  }
  uses.add("ridge");
  return weights.length === 0 ? "ridge()" : `ridge({ ${weights.join(", ")} })`;
}

/** The `weights` (and `exponent`, when not 1) fields of a penalty call; none for equal weights. */
function weightsCode(weights: RidgeWeights, exponent: number): string[] {
  if (typeof weights !== "string") return [`weights: ${literal(weights, 0)}`];
  if (weights === "equal") return [];
  return [
    `weights: ${JSON.stringify(weights)}`,
    ...(exponent === 1 ? [] : [`exponent: ${exponent}`]),
  ];
}

/** A JavaScript literal, on one line when it fits within WIDTH at `indent`, else broken. */
function literal(value: unknown, indent: number): string {
  if (value instanceof Raw) return value.text;
  if (typeof value === "number") return String(value);
  if (typeof value !== "object" || value === null) return JSON.stringify(value);
  const isArray = Array.isArray(value);
  const entries = isArray
    ? (value as unknown[]).map((v) => (i: number) => literal(v, i))
    : Object.entries(value).map(([k, v]) => (i: number) => `${k}: ${literal(v, i)}`);
  const [open, close] = isArray ? ["[", "]"] : ["{ ", " }"];
  if (entries.length === 0) return isArray ? "[]" : "{}";
  const flat = `${open}${entries.map((e) => e(indent)).join(", ")}${close}`;
  if (indent + flat.length <= WIDTH && !flat.includes("\n")) return flat;
  const pad = "  ".repeat(indent / 2 + 1);
  const inner = entries.map((e) => `${pad}${e(indent + 2)},`).join("\n");
  return `${open.trim()}\n${inner}\n${"  ".repeat(indent / 2)}${close.trim()}`;
}
