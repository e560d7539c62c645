/**
 * Model-choice records: a versioned, deterministic JSON document of everything a sweep or a
 * comparison decided and why (data fingerprint, terms and learned parameters, penalty and
 * objective, λ grid, folds, CV table, rule and choice, final coefficients, software versions),
 * `verify` to replay it against data, and `loadRecord` to predict from it without refitting.
 * README.md in this folder documents the schema.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { loadRecord, recordJson, verify } from "./mod.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const data = { x, y: x.map((v, i) => Math.sin(4 * v) + 0.05 * Math.cos(9 * i)) };
 * const s = sweep(data, { target: "y", terms: [legendre("x", 8)], folds: { k: 5, seed: 12 } });
 * const json = recordJson(s);
 * console.log(verify(json, data).ok, loadRecord(json).predict({ x: [0.25] }).values);
 * ```
 *
 * @module
 */
export { recordOf, type RecordOptions } from "./build.ts";
export { recordJson } from "./json.ts";
export { parseRecord } from "./parse.ts";
export { type LoadedModel, type LoadedRecord, loadRecord } from "./load.ts";
export { verify } from "./verify.ts";
export { readRecordedData, type RecordedReadOptions, recordedSeparator } from "./read.ts";
export type { VerifyReport } from "./report.ts";
export { RELATIVE_TOLERANCE, type Shown, TOLERANCE, type VerifyEntry } from "./checks.ts";
export {
  type CategoryColumnSummary,
  type ColumnSummary,
  type DataSummary,
  type NumberColumnSummary,
  ROW_ENCODING,
  rowsDigest,
  summarizeData,
} from "./fingerprint.ts";
export type { SweepProvenance, SweepSource } from "./provenance.ts";
export {
  type CandidateStanding,
  type ChoiceSection,
  type ComparisonSection,
  type CvSection,
  type DataSection,
  type FinalSection,
  type FoldsSection,
  type GridSection,
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
  modelStrengths,
  type PenaltySection,
  type RidgeModelSection,
  type RidgeStanding,
  SCHEMA,
  SCHEMA_NAME,
  SCHEMA_VERSION,
  type SoftwareSection,
  type SparseChoiceSection,
  type SparseCvSection,
  type SparseFinalSection,
  type SparseGridSection,
  type SparseModelSection,
  type SparsePenaltySection,
  type SparseStanding,
  type StandingCommon,
  standingStrength,
  type TermSection,
} from "./schema.ts";
