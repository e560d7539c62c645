/**
 * From a parsed `curb` program to the arguments of one public API call: `sweep` when the
 * template names no candidates, `compare` when it names two or more. Candidate settings
 * override the shared ones; a candidate's `terms` replace the shared terms entirely.
 *
 * @module
 */
import type { SweepSpec } from "../sweep/sweep.ts";
import type { Candidate, CompareOptions } from "../sweep/compare.ts";
import type { CurbProgram, Settings } from "./parser.ts";

/**
 * The API call a program stands for (without the data, which `run` loads, and without a
 * progress listener, which the notebook display adds).
 *
 * @example
 * ```ts
 * import type { Job } from "./job.ts";
 * function describe(job: Job): string {
 *   return job.kind === "sweep" ? `sweep of ${job.spec.target}` : `${job.candidates.length} candidates`;
 * }
 * ```
 */
export type Job =
  | { readonly kind: "sweep"; readonly spec: SweepSpec }
  | {
    readonly kind: "compare";
    readonly candidates: readonly Candidate[];
    readonly options: CompareOptions;
  };

/**
 * The job of a program.
 *
 * @example
 * ```ts
 * import { jobOf } from "./job.ts";
 * import { parseTemplate } from "./parser.ts";
 * const tag = (s: TemplateStringsArray, ...v: unknown[]) => parseTemplate(s, v);
 * const job = jobOf(tag`
 *   data ${{ x: [1, 2, 3, 4], y: [2, 4, 5, 8] }}
 *   predict y
 *   terms column x
 *   folds 2 seed 9
 * `);
 * console.log(job.kind); // sweep
 * ```
 */
export function jobOf(program: CurbProgram): Job {
  const target = program.target.name;
  const folds = program.folds === undefined ? {} : { folds: program.folds.request };
  if (program.candidates.length === 0) {
    return { kind: "sweep", spec: { target, ...modelOf(program.shared), ...folds } };
  }
  const { rule: sharedRule, ...defaults } = program.shared;
  const candidates = program.candidates.map((c) => ({
    name: c.name,
    ...modelOf({ ...defaults, ...c.settings }),
  }));
  return {
    kind: "compare",
    candidates,
    options: { target, ...folds, ...(sharedRule === undefined ? {} : { rule: sharedRule }) },
  };
}

/** The sweep-spec fields of some settings, in the order the API documents them. */
function modelOf(s: Settings): Omit<SweepSpec, "target"> & { terms: SweepSpec["terms"] } {
  const out: Record<string, unknown> = {
    terms: (s.terms ?? []).map((t) => t.term),
    penalty: s.penalty,
    lambdas: s.lambdas,
    alphas: s.alphas,
    rule: s.rule,
    standardize: s.standardize,
    intercept: s.intercept,
    closedForm: s.closedForm,
  };
  for (const key of Object.keys(out)) if (out[key] === undefined) delete out[key];
  return out as Omit<SweepSpec, "target"> & { terms: SweepSpec["terms"] };
}
