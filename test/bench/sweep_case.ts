/**
 * One configuration of the sweep benchmark, meant to run in a fresh Deno process (run.ts starts
 * it). It generates seeded synthetic data (invented, for benchmarking only), times one job and
 * prints a single JSON line: the times in seconds and the peak resident memory (VmHWM from
 * /proc/self/status, Linux only) at the end.
 *
 * Data: n rows of p columns x1..xp, each uniform on [−1, 1), and y = Σ_j x_j / j + 0.5·u with u
 * uniform on [−1, 1). Everything is drawn from one PCG32 stream (SeededStream, seed 20250611), so
 * every run sees the same numbers. The table is assembled directly from the Float64Arrays (the
 * same shape the loaders return), so the loaders' row-by-row copy is not part of the job or of
 * its memory.
 *
 * Jobs (`--job=`):
 * - `sweep`: `sweep(table, { terms: column(x1..xp), folds: { k, seed 1 }, lambdas: { count },
 *   closedForm: false })`, the public API call being benchmarked. The progress listener
 *   timestamps the stages, giving the split: design and all-rows summary, folds, LOO/GCV and
 *   curve, exact refit of the chosen λ, finishing.
 * - `summaries`: the lower bound the sweep is compared with: one fold plan (kFoldPlan), the
 *   terms learned and the design built once (learnTerms + buildDesign), and the k per-fold
 *   co-moment summaries in one pass (bucketMoments from lib/sweep/moments.ts).
 *
 * `--repeat=R` runs the job R times in this process and reports each time (the first includes
 * compiling the code; later ones are warm).
 *
 * Run: deno run --allow-read test/bench/sweep_case.ts --job=sweep --n=100000 --p=50
 *
 * @module
 */
import { column, kFoldPlan, sweep, type Table } from "../../mod.ts";
import { SeededStream } from "../../lib/folds/mod.ts";
import { buildDesign, learnTerms } from "../../lib/design/mod.ts";
import { bucketMoments } from "../../lib/sweep/moments.ts";

/**
 * What one configuration asks for.
 *
 * @example
 * ```ts
 * import type { CaseOptions } from "./sweep_case.ts";
 * const options: CaseOptions = { job: "sweep", n: 100_000, p: 50, k: 10, lambdas: 100, repeat: 1 };
 * ```
 */
export interface CaseOptions {
  readonly job: "sweep" | "summaries";
  readonly n: number;
  readonly p: number;
  readonly k: number;
  readonly lambdas: number;
  readonly repeat: number;
}

/**
 * What one process reports.
 *
 * @example
 * ```ts
 * import { type CaseReport, runCase } from "./sweep_case.ts";
 * const report: CaseReport = runCase({ job: "summaries", n: 1000, p: 5, k: 10, lambdas: 100, repeat: 1 });
 * console.log(report.seconds.length, report.peakMb); // 1 and the process's peak MB
 * ```
 */
export interface CaseReport {
  readonly options: CaseOptions;
  /** Seconds for each repetition of the job. */
  readonly seconds: readonly number[];
  /** Seconds per stage of the first repetition (by stage name, in order). */
  readonly stages: Readonly<Record<string, number>>;
  /** Seconds spent generating the data (not part of the job). */
  readonly dataSeconds: number;
  /** Peak resident set size of the whole process, MB (10⁶ bytes); NaN off Linux. */
  readonly peakMb: number;
  /** The chosen λ (sweep) or a checksum of the summaries, so the work cannot be skipped. */
  readonly check: number;
}

const DATA_SEED = 20250611;
const FOLD_SEED = 1;

/**
 * The seeded synthetic table with columns x1..xp and y.
 *
 * @example
 * ```ts
 * import { syntheticTable } from "./sweep_case.ts";
 * const table = syntheticTable(1000, 5);
 * console.log(table.nRows, table.names); // 1000 [ "x1", "x2", "x3", "x4", "x5", "y" ]
 * ```
 */
export function syntheticTable(n: number, p: number): Table {
  const stream = new SeededStream(DATA_SEED);
  const names = Array.from({ length: p }, (_, j) => `x${j + 1}`);
  const y = new Float64Array(n);
  const columns = names.map((name, j) => {
    const values = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      values[i] = 2 * stream.nextDouble() - 1;
      y[i] += values[i] / (j + 1);
    }
    return [name, { kind: "number" as const, name, values }] as const;
  });
  for (let i = 0; i < n; i++) y[i] += stream.nextDouble() - 0.5;
  return {
    nRows: n,
    names: [...names, "y"],
    columns: new Map([...columns, ["y", { kind: "number", name: "y", values: y }]]),
    source: "synthetic",
    lineOfRow: Int32Array.from({ length: n }, (_, i) => i + 1),
    missing: { policy: "error", droppedLines: [] },
  };
}

/** Runs the sweep once; returns the chosen λ and the stage times. */
function runSweep(table: Table, o: CaseOptions): { check: number; stages: Record<string, number> } {
  const terms = table.names.slice(0, o.p).map((name) => column(name));
  const stages: Record<string, number> = {};
  const start = performance.now();
  let last = start;
  const mark = (stage: string) => {
    const now = performance.now();
    stages[stage] = (stages[stage] ?? 0) + (now - last) / 1000;
    last = now;
  };
  const result = sweep(table, {
    target: "y",
    terms,
    folds: { k: o.k, seed: FOLD_SEED },
    lambdas: { count: o.lambdas },
    closedForm: false,
    progress: ({ stage, done }) => {
      if (stage === "summaries" && done === 0) mark("design + all-rows summary + grid");
      else if (stage === "folds") mark("fold summaries + per-fold eigen + λ loop");
      else if (stage === "refit" && done === 0) mark("GCV + curve");
      else if (stage === "refit") mark("exact refit (refinement)");
    },
  });
  mark("finish (freeze result)");
  return { check: result.chosen.strength, stages };
}

/** The design and its per-fold summaries, once; returns a checksum and the stage times. */
function runSummaries(
  table: Table,
  o: CaseOptions,
): { check: number; stages: Record<string, number> } {
  const terms = table.names.slice(0, o.p).map((name) => column(name));
  const y = (table.columns.get("y") as { values: Float64Array }).values;
  const t0 = performance.now();
  const plan = kFoldPlan(table.nRows, { k: o.k, seed: FOLD_SEED });
  const t1 = performance.now();
  const design = buildDesign(learnTerms(terms, table), table);
  const t2 = performance.now();
  const parts = bucketMoments(design.block.hi, design.p, y, plan.assignment[0], o.k);
  const t3 = performance.now();
  return {
    check: parts.reduce((s, m) => s + m.cross[m.cross.length - 1], 0),
    stages: {
      "fold plan": (t1 - t0) / 1000,
      "learnTerms + buildDesign": (t2 - t1) / 1000,
      "bucketMoments (k folds)": (t3 - t2) / 1000,
    },
  };
}

/**
 * Peak resident set size in MB (VmHWM), or NaN where /proc/self/status cannot be read (not Linux,
 * or Deno run without --allow-all, which Deno 2 requires for /proc/self).
 */
function peakResidentMb(): number {
  try {
    const status = Deno.readTextFileSync("/proc/self/status");
    const kb = Number(/VmHWM:\s+(\d+)\s+kB/.exec(status)?.[1]);
    return kb * 1024 / 1e6;
  } catch {
    return NaN;
  }
}

/**
 * Runs one configuration and returns its report.
 *
 * @example
 * ```ts
 * import { runCase } from "./sweep_case.ts";
 * const report = runCase({ job: "summaries", n: 1000, p: 5, k: 10, lambdas: 100, repeat: 1 });
 * console.log(report.seconds[0] > 0);
 * ```
 */
export function runCase(o: CaseOptions): CaseReport {
  const d0 = performance.now();
  const table = syntheticTable(o.n, o.p);
  const dataSeconds = (performance.now() - d0) / 1000;
  const seconds: number[] = [];
  let stages: Record<string, number> = {};
  let check = NaN;
  for (let r = 0; r < o.repeat; r++) {
    const t0 = performance.now();
    const out = o.job === "sweep" ? runSweep(table, o) : runSummaries(table, o);
    seconds.push((performance.now() - t0) / 1000);
    if (r === 0) stages = out.stages;
    check = out.check;
  }
  return { options: o, seconds, stages, dataSeconds, peakMb: peakResidentMb(), check };
}

/** Reads `--name=value` arguments into CaseOptions (defaults: k 10, 100 λ, 1 repetition). */
function parseArgs(args: readonly string[]): CaseOptions {
  const get = (name: string) => args.find((a) => a.startsWith(`--${name}=`))?.split("=")[1];
  const num = (name: string, fallback?: number) => {
    const v = Number(get(name) ?? fallback);
    if (!Number.isInteger(v) || v < 1) throw new Error(`--${name} must be a positive integer`);
    return v;
  };
  const job = get("job") ?? "sweep";
  if (job !== "sweep" && job !== "summaries") throw new Error("--job must be sweep or summaries");
  return {
    job,
    n: num("n"),
    p: num("p"),
    k: num("k", 10),
    lambdas: num("lambdas", 100),
    repeat: num("repeat", 1),
  };
}

if (import.meta.main) console.log(JSON.stringify(runCase(parseArgs(Deno.args))));
