/**
 * `sweepStream`: the cross-validated sweep — λ for ridge, α for lasso / elastic net — over a CSV
 * or NDJSON file or stream that need not fit in memory. Rows are read in chunks; each row's fold
 * (one per repeat) comes from the fold hash of a key column or of its record number
 * (lib/stream/hash.ts); per-fold summaries are merged chunk by chunk (lib/stream/accumulate.ts),
 * so memory is O(R·K·p²) plus one chunk, whatever the row count.
 *
 * Passes: one when every Legendre term has a given domain and no term reads categories;
 * otherwise a first pass finds the per-fold ranges (domains) and the category levels, and a
 * second builds the summaries — so the source must be
 * re-readable (a path, or a function returning a fresh stream). A fold whose change of Legendre
 * basis would amplify rounding is re-read once more (rare: only when a fold holds an extreme
 * value of a high-degree term's column).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import { scaleSweepBundle, withDisplay } from "../views/display.ts";
import type { LearnedTerm } from "../design/types.ts";
import { learnsFromRows } from "../design/mod.ts";
import type { Moments } from "../sweep/moments.ts";
import { FoldAccumulator } from "./accumulate.ts";
import {
  checkScaleSpec,
  finishSweep,
  hashFoldsOf,
  scaleColumns,
  type ScaleProgressListener,
  type ScaleSweepResult,
  type ScaleSweepSpec,
} from "./finish.ts";
import { checkFieldSeparator } from "../table/options.ts";
import {
  addChunkToRanges,
  addToRanges,
  emptyRanges,
  type FoldRanges,
  learnOnRanges,
} from "./ranges.ts";
import {
  readChunks,
  type ReadPlan,
  type ReadStats,
  type StreamFormat,
  type StreamSource,
} from "./read.ts";

/**
 * A streaming sweep: the scale sweep spec plus how to read the source.
 *
 * @example
 * ```ts
 * import type { StreamSweepSpec } from "./stream.ts";
 * import { legendre } from "../design/mod.ts";
 * const spec: StreamSweepSpec = { target: "y", terms: [legendre("x", 8)], format: "ndjson", missing: "drop" };
 * ```
 */
export interface StreamSweepSpec extends ScaleSweepSpec {
  /** "csv" or "ndjson"; default from a path's extension (.ndjson, .jsonl), else "csv". */
  readonly format?: StreamFormat;
  /** Records with a missing value: stop with an error (default) or drop and count them. */
  readonly missing?: "error" | "drop";
  /** Malformed records (bad number, wrong field count, bad JSON): stop (default) or drop. */
  readonly malformed?: "error" | "drop";
  /** Rows summarized at a time (default 8192). */
  readonly chunkRows?: number;
  /** Label for messages; default the path, or "stream". */
  readonly label?: string;
  /**
   * CSV only: the one character between fields (default `","`), as in `readCsv`
   * (lib/table/README.md); never guessed.
   */
  readonly fieldSeparator?: string;
  /** Receives reports while each pass reads (`done`/`total` in bytes), per fold, and at the fit. */
  readonly progress?: ScaleProgressListener;
}

/**
 * A streaming sweep's result: the scale result plus what was read and held.
 *
 * @example
 * ```ts
 * import type { StreamSweepResult } from "./stream.ts";
 * const dropped = (r: StreamSweepResult) => r.rows.droppedMissing + r.rows.droppedMalformed;
 * ```
 */
export interface StreamSweepResult extends ScaleSweepResult {
  /** Records read, used and dropped (with the first dropped lines and why). */
  readonly rows: ReadStats;
  /** Bytes of the fold summaries kept (does not grow with rows), and the chunk size. */
  readonly memory: { readonly summaryBytes: number; readonly chunkRows: number };
  /** Wall-clock seconds of the whole sweep: every pass, the scoring and the fit. */
  readonly seconds: number;
  /** Rows summarized (over every summaries pass, re-reads included) per second of `seconds`. */
  readonly rowsPerSecond: number;
}

const DEFAULT_CHUNK_ROWS = 8192;

/**
 * Sweeps λ (ridge, the default) or α (`penalty: lasso()` / `elasticNet({ mix })`, with
 * `alphas`) over rows read from `source` with hash folds; the result's `scale` says which.
 *
 * @example
 * ```ts
 * import { legendre, sweepStream } from "../../mod.ts";
 * const lines = ["x,y", ...Array.from({ length: 200 }, (_, i) => `${i / 199},${Math.sin(6 * i / 199)}`)];
 * const result = await sweepStream(() => ReadableStream.from([lines.join("\n")]), {
 *   target: "y",
 *   terms: [legendre("x", 6)],
 *   folds: { k: 5, seed: 3 },
 * });
 * console.log(result.chosen.strength, result.rows.used); // λ, 200
 * ```
 */
export async function sweepStream(
  source: StreamSource,
  spec: StreamSweepSpec,
): Promise<StreamSweepResult> {
  const inputs = checkScaleSpec(spec);
  const { categories } = scaleColumns(spec.terms);
  const { k, seed, repeats, key, hashes } = hashFoldsOf(spec.folds);
  const label = spec.label ?? sourceLabel(source);
  const chunkRows = checkChunkRows(spec.chunkRows);
  const plan: ReadPlan = {
    format: spec.format ?? formatOf(source),
    columns: [...new Set([spec.target, ...inputs])],
    categories,
    key,
    hashes,
    missing: policy(spec.missing, "missing"),
    malformed: policy(spec.malformed, "malformed"),
    chunkRows,
    label,
    fieldSeparator: csvSeparator(spec.fieldSeparator, spec.format ?? formatOf(source)),
  };
  const rereadable = !(source instanceof ReadableStream);
  const twoPass = spec.terms.some(learnsFromRows) || categories.length > 0;
  if (twoPass && !rereadable) {
    throw new CurbfitError(
      "BAD_OPTION",
      "a stream can be read once, but a Legendre term without a domain or an indicators term " +
        "needs a first pass to find the domain or the levels",
      "Give each legendre term { domain: [lo, hi] }, or pass a file path or a function that " +
        "returns a fresh stream",
      { option: "source" },
    );
  }
  const report = spec.progress ?? (() => {});
  const started = performance.now();
  let passes = 0;
  let summarized = 0;
  const read = async (
    stage: "domains" | "summaries",
    onChunk: Parameters<typeof readChunks>[2],
  ): Promise<ReadStats> => {
    const t0 = performance.now();
    const stats = await readChunks(source, plan, onChunk, (p) =>
      report({
        stage,
        done: p.bytes,
        total: p.totalBytes,
        rows: p.rows,
        rowsPerSecond: p.rows / Math.max((performance.now() - t0) / 1000, 1e-9),
      }));
    passes++;
    if (stage === "summaries") summarized += stats.used;
    return stats;
  };

  let ranges = emptyRanges(inputs, k, categories, repeats);
  let firstStats: ReadStats | undefined;
  if (twoPass) {
    firstStats = await read("domains", (chunk) => addChunkToRanges(ranges, chunk));
  }
  const terms = twoPass
    ? learnOnRanges(spec.terms, ranges, -1, label)
    : learnOnRanges(spec.terms, unitRanges(inputs, k), -1, label);
  const accumulator = new FoldAccumulator(terms, spec.target, k, label, repeats);
  const collected = emptyRanges(inputs, k, [], repeats);
  const stats = await read("summaries", (chunk) => {
    if (!twoPass) addChunkToRanges(collected, chunk);
    accumulator.add(chunk);
  });
  if (firstStats !== undefined && firstStats.used !== stats.used) {
    throw new CurbfitError(
      "READ_FAILED",
      `the source gave ${firstStats.used} rows on the first pass and ${stats.used} on the second`,
      "Do not change the data while it is being read; no result was produced",
      { source: label },
    );
  }
  if (!twoPass) ranges = collected;
  const refetch = async (r: number, f: number, foldTerms: readonly LearnedTerm[]) => {
    const side = new FoldAccumulator(foldTerms, spec.target, 2, label);
    await read("summaries", (chunk) => {
      const bucket = chunk.buckets[r].map((b) => (b === f ? 1 : 0));
      side.add({ ...chunk, buckets: [bucket] });
    });
    return side.totals() as [Moments, Moments];
  };
  const result = await finishSweep({
    spec,
    k,
    seed,
    key,
    source: label,
    ranges,
    // Terms for the fit and the fold bases: learned on the ranges of all rows.
    terms: twoPass ? terms : learnOnRanges(spec.terms, ranges, -1, label),
    buckets: Array.from({ length: repeats }, (_, r) => accumulator.totals(r)),
    refetch,
    passes: 0,
    report,
  });
  const seconds = (performance.now() - started) / 1000;
  return deepFreeze(withDisplay({
    ...result,
    passes,
    rows: stats,
    memory: { summaryBytes: accumulator.bytes(), chunkRows },
    seconds,
    rowsPerSecond: summarized / seconds,
  }, scaleSweepBundle));
}

/** Ranges [0, 1] for every column: enough to learn terms whose values do not depend on data. */
function unitRanges(columns: readonly string[], k: number): FoldRanges {
  const r = emptyRanges(columns, k);
  addToRanges(r, 0, new Map(columns.map((c) => [c, 0])));
  addToRanges(r, 1 % k, new Map(columns.map((c) => [c, 1])));
  return r;
}

function sourceLabel(source: StreamSource): string {
  if (typeof source === "string") return source;
  if (source instanceof URL) {
    return source.protocol === "file:" ? decodeURIComponent(source.pathname) : source.href;
  }
  return "stream";
}

function formatOf(source: StreamSource): StreamFormat {
  const name = typeof source === "string" ? source : source instanceof URL ? source.pathname : "";
  return /\.(ndjson|jsonl)$/i.test(name) ? "ndjson" : "csv";
}

function policy(value: unknown, option: string): "error" | "drop" {
  if (value === undefined) return "error";
  if (value === "error" || value === "drop") return value;
  throw new CurbfitError(
    "BAD_OPTION",
    `${option} is ${JSON.stringify(value)}, but it must be "error" or "drop"`,
    `Pass ${option}: "drop" to leave such records out (they are counted), or leave it out`,
    { option },
  );
}

/** The checked field separator; giving one for NDJSON is an error, not ignored. */
function csvSeparator(value: unknown, format: StreamFormat): string {
  if (format === "csv" || value === undefined) return checkFieldSeparator(value);
  throw new CurbfitError(
    "BAD_OPTION",
    `fieldSeparator is given, but the format is ${JSON.stringify(format)}, which has no separator`,
    'Leave fieldSeparator out for NDJSON, or pass format: "csv"',
    { option: "fieldSeparator" },
  );
}

function checkChunkRows(value: number | undefined): number {
  if (value === undefined) return DEFAULT_CHUNK_ROWS;
  if (Number.isInteger(value) && value >= 1 && value <= 1 << 20) return value;
  throw new CurbfitError(
    "BAD_OPTION",
    `chunkRows is ${value}, but it must be a whole number from 1 to 1048576`,
    "Leave it out for 8192",
    { option: "chunkRows" },
  );
}
