/**
 * The `curb` cell template: a short, line-oriented description of an analysis that runs the
 * public API and returns its result objects. Vocabulary: README.md in this folder.
 *
 * @example
 * ```ts
 * import { curb, equivalentCall } from "./mod.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const found = await curb`
 *   data ${{ x, y: x.map((v, i) => Math.sin(3 * v) + 0.05 * Math.cos(17 * i)) }}
 *   predict y
 *   terms legendre x degree 8
 *   folds 5 seed 1
 * `;
 * console.log(equivalentCall(found).code);
 * ```
 *
 * @module
 */
export { curb, type CurbPlan, curbPlan, equivalentCall } from "./curb.ts";
export { ApiCall } from "./code.ts";
export { MagicError, type Spot } from "./error.ts";
export type { CurbResult, RunOptions } from "./run.ts";
export type {
  CandidateNode,
  CurbProgram,
  DataNode,
  FoldsNode,
  Settings,
  TermNode,
} from "./parser.ts";
export type { Job } from "./job.ts";
export type { SourceLine, Token } from "./lexer.ts";
export type { Named } from "./cursor.ts";
