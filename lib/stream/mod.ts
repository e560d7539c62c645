/**
 * Sweeps over rows that are not in memory: CSV or NDJSON files and streams read chunk by chunk
 * (`sweepStream`), with folds from a seeded hash of a row key (`curbfit.fold-hash/1`, stated in
 * README.md here), once or repeated (`folds.repeats`; `hashFoldPlan` gives the in-memory sweep the
 * same folds). The SQL sweep (lib/sql) shares the hash and the finishing step.
 *
 * @example
 * ```ts
 * import { foldHash, foldOfKey } from "./mod.ts";
 * console.log(foldOfKey(foldHash(1, 10), 12345)); // the fold of key 12345: 0…9
 * ```
 *
 * @module
 */
export {
  FOLD_HASH,
  type FoldHash,
  foldHash,
  foldHashes,
  foldOfKey,
  foldsOfKeys,
  hashFoldPlan,
} from "./hash.ts";
export {
  type HashFoldRequest,
  type HashFolds,
  type ScaleProgress,
  type ScaleProgressListener,
  type ScaleSweepResult,
  type ScaleSweepSpec,
} from "./finish.ts";
export { type StreamSweepResult, type StreamSweepSpec, sweepStream } from "./stream.ts";
export type { DroppedRecord, ReadStats, StreamFormat, StreamSource } from "./read.ts";
