/**
 * `curb`: a tagged template that describes an analysis in a few plain lines and runs it with
 * the public API, returning exactly what `sweep` or `compare` returns. The vocabulary is in
 * README.md beside this file.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { type ApiCall, apiCallOf } from "./code.ts";
import { type Job, jobOf } from "./job.ts";
import { type CurbProgram, parseTemplate } from "./parser.ts";
import { type CurbResult, runJob, type RunOptions } from "./run.ts";

/** The API call behind each result a template returned (results are frozen, so kept aside). */
const calls = new WeakMap<object, ApiCall>();

/**
 * A template read but not yet run: what it said, the API call it stands for, and `run`.
 *
 * @example
 * ```ts
 * import { curbPlan } from "./curb.ts";
 * const x = [0, 1, 2, 3, 4, 5, 6, 7];
 * const plan = curbPlan`
 *   data ${{ x, y: x.map((v) => 2 * v + 1) }}
 *   predict y
 *   terms column x
 *   folds 4 seed 3
 * `;
 * console.log(plan.call.code);
 * ```
 */
export interface CurbPlan {
  /** The parsed template, with the line and column of everything in it. */
  readonly program: CurbProgram;
  /** The `sweep` or `compare` arguments it stands for. */
  readonly job: Job;
  /** The equivalent API call as TypeScript. */
  readonly call: ApiCall;
  /** Runs it (progress goes to the notebook unless `progress: null`). */
  run(options?: RunOptions): Promise<CurbResult>;
}

/**
 * Reads a template without running it.
 *
 * @throws {MagicError} `MAGIC_SYNTAX` with line, column, a caret and the nearest valid word.
 *
 * @example
 * ```ts
 * import { curbPlan } from "./curb.ts";
 * const plan = curbPlan`
 *   data "measurements.csv"
 *   predict moisture
 *   terms legendre hours degree 10
 *   lambda 40 points from 1e-4 to 1e3
 *   folds 5 seed 11
 * `;
 * console.log(plan.job.kind); // sweep
 * ```
 */
export function curbPlan(strings: TemplateStringsArray, ...values: unknown[]): CurbPlan {
  const program = parseTemplate(strings.map((s, i) => s ?? strings.raw[i]), values);
  const job = jobOf(program);
  const call = apiCallOf(program, job);
  return Object.freeze({
    program,
    job,
    call,
    async run(options?: RunOptions) {
      const result = await runJob(program, job, options);
      calls.set(result, call);
      return result;
    },
  });
}

/**
 * Describes an analysis in plain lines and runs it: `sweep` when it names no candidates,
 * `compare` when it names two or more. Resolves to the same result object the API returns.
 * In Deno's Jupyter kernel a progress line is shown and then replaced by the result, so assign
 * the result (`const found = await curb…`) rather than ending the cell with it, which would
 * show it twice.
 *
 * @throws {MagicError} `MAGIC_SYNTAX` (rejects) for a template it cannot read, pointing at the
 * line and column; `UNKNOWN_COLUMN` for a column the data lacks; API errors as the API throws them.
 *
 * @example
 * ```ts
 * import { curb } from "./curb.ts";
 * const hours = Array.from({ length: 60 }, (_, i) => (i * 7) % 60 / 3);
 * const moisture = hours.map((h, i) => 30 * Math.exp(-h / 6) + 4 + 0.5 * Math.sin(5 * i));
 * const found = await curb`
 *   data ${{ hours, moisture }}
 *   predict moisture
 *   terms legendre hours degree 8
 *   gamma rising 2
 *   lambda 30 points
 *   folds 5 seed 7
 *   rule one-se
 * `;
 * ```
 */
export async function curb(
  strings: TemplateStringsArray,
  ...values: unknown[]
): Promise<CurbResult> {
  return await curbPlan(strings, ...values).run();
}

/**
 * The API call that produced a result returned by `curb`, to move from the template to code.
 * Shown in a notebook as a TypeScript code block.
 *
 * @throws {CurbfitError} `BAD_OPTION` when the result did not come from `curb`.
 *
 * @example
 * ```ts
 * import { curb, equivalentCall } from "./curb.ts";
 * const x = [0, 1, 2, 3, 4, 5, 6, 7];
 * const found = await curb`
 *   data ${{ x, y: x.map((v) => 2 * v + 1 + (v % 2) / 10) }}
 *   predict y
 *   terms column x
 *   folds 4 seed 3
 * `;
 * console.log(equivalentCall(found).code);
 * ```
 */
export function equivalentCall(result: CurbResult): ApiCall {
  const call = typeof result === "object" && result !== null ? calls.get(result) : undefined;
  if (call === undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      "this result did not come from a curb template, so there is no template call to show",
      "Pass the value a curb`…` template resolved to",
      { option: "result" },
    );
  }
  return call;
}
