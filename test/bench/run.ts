/**
 * Sweep benchmark (`deno task bench`), not a test. For each n ∈ {10⁴, 10⁵, 10⁶} and each
 * p ∈ {10, 50, 200} it runs sweep_case.ts in fresh Deno processes, on seeded synthetic data with
 * 10 folds, 100 λ and closedForm: false. Two jobs are timed:
 * - **sweep**: the whole public `sweep` call;
 * - **summaries**: one pass that only builds the design and its fold summaries (kFoldPlan,
 *   learnTerms + buildDesign, bucketMoments).
 * Their ratio says how much the sweep costs beyond reading the rows once.
 *
 * Each job first runs once in a fresh process. That run gives the "cold" time, which includes
 * compiling the code the way a notebook's first call does, and the peak resident memory (VmHWM)
 * of that process. For n ≤ 10⁵ a second fresh process repeats the job 3 times and reports the
 * fastest repeat after the first ("warm"). The ratio uses warm times when there are any.
 * Wall-clock times depend on the machine and on whatever else it runs, so they are
 * measurements, not pass/fail checks.
 *
 * Targets reported against: ratio ≤ 1.5 at n = 10⁶, p = 50; and n = 10⁵, p = 50 (10 folds ×
 * 100 λ) in under 0.5 s.
 *
 * Options: --n=10000,100000 and --p=10,50 pick sizes; --rounds=R runs each cold job in R fresh
 * processes and keeps the fastest (default 1; use 3 on a busy machine); --timeout=SECONDS for
 * each process (default 3600); --json=PATH also writes the raw reports. A configuration whose
 * estimated memory exceeds 80 % of the available memory (Deno.systemMemoryInfo) is skipped and
 * noted. Each case process runs with --allow-all, which Deno 2 requires for /proc/self/status.
 *
 * Run: deno task bench [--n=100000 --p=50 --rounds=3]
 *
 * @module
 */
import type { CaseOptions, CaseReport } from "./sweep_case.ts";

const CASE_SCRIPT = new URL("./sweep_case.ts", import.meta.url);
const DEFAULT_N = [10_000, 100_000, 1_000_000];
const DEFAULT_P = [10, 50, 200];
const WARM_REPEATS = 3;
const WARM_LIMIT_N = 100_000;

/** Outcome of one process: a report, or why there is none. */
type Outcome = { readonly report: CaseReport } | { readonly failure: string };

/** One row of the results: cold runs (one per round) and the optional warm run of each job. */
interface Row {
  readonly n: number;
  readonly p: number;
  readonly sweepCold: readonly Outcome[];
  readonly summariesCold: readonly Outcome[];
  readonly sweepWarm?: Outcome;
  readonly summariesWarm?: Outcome;
}

function option(name: string): string | undefined {
  return Deno.args.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3);
}

function sizes(name: string, fallback: number[]): number[] {
  const given = option(name);
  return given === undefined ? fallback : given.split(",").map((v) => Number(v));
}

/**
 * Bytes the sweep may need, from the buffers it allocates: the data (n·(p+1) doubles), the
 * design (n·p, and as much again for trailing parts when a term writes them), a per-fold rebuilt
 * design when a term needs one (2·n·p), and, only for a design too ill-conditioned for the
 * co-moments path, the QR refit's column copies (3 to 4·n·(p+1)). This (8·n·(9p+1)) errs on the
 * safe side. A rough guard, not a prediction.
 */
function estimatedBytes(n: number, p: number): number {
  return 8 * n * (p + 1 + 8 * p);
}

/** The machine's 1, 5 and 15 minute load averages (other work skews wall times). */
function loadAverage(): string {
  return Deno.loadavg().map((v) => v.toFixed(2)).join(", ");
}

/** Memory the system can give a new process, in bytes. */
function availableBytes(): number {
  return Deno.systemMemoryInfo().available;
}

/** Runs one job in a fresh process (with all permissions: VmHWM needs them in Deno 2). */
async function runProcess(o: CaseOptions, timeoutSeconds: number): Promise<Outcome> {
  const args = Object.entries(o).map(([k, v]) => `--${k}=${v}`);
  const command = new Deno.Command(Deno.execPath(), {
    args: ["run", "--allow-all", CASE_SCRIPT.pathname, ...args],
    stdout: "piped",
    stderr: "piped",
    signal: AbortSignal.timeout(timeoutSeconds * 1000),
  });
  try {
    const out = await command.output();
    if (!out.success) {
      const err = new TextDecoder().decode(out.stderr).trim().split("\n").slice(-1)[0] ?? "";
      return { failure: `exit ${out.code}${out.signal ? ` (${out.signal})` : ""} ${err}`.trim() };
    }
    return { report: JSON.parse(new TextDecoder().decode(out.stdout)) };
  } catch (e) {
    if (e instanceof Error && e.name === "TimeoutError") {
      return { failure: `timed out after ${timeoutSeconds} s` };
    }
    throw e;
  }
}

function reports(outcomes: readonly (Outcome | undefined)[]): CaseReport[] {
  return outcomes.flatMap((o) => (o !== undefined && "report" in o ? [o.report] : []));
}

/** The smallest value, or NaN when there is none. */
function least(values: readonly number[]): number {
  return values.length > 0 ? Math.min(...values) : NaN;
}

/** Fastest first-call time over the cold rounds. */
function coldSeconds(outcomes: readonly Outcome[]): number {
  return least(reports(outcomes).map((r) => r.seconds[0]));
}

/** Fastest repeat after the first, in the warm run. */
function warmSeconds(o: Outcome | undefined): number {
  return least(reports([o]).flatMap((r) => r.seconds.slice(1)));
}

/** Largest peak resident memory over the cold rounds. */
function peak(outcomes: readonly Outcome[]): string {
  const mb = reports(outcomes).map((r) => r.peakMb);
  return mb.length > 0 ? Math.max(...mb).toFixed(0) : "—";
}

function show(x: number, digits = 3): string {
  return Number.isFinite(x) ? x.toPrecision(digits) : "—";
}

function notes(row: Row): string {
  return [...row.sweepCold, ...row.summariesCold, row.sweepWarm, row.summariesWarm]
    .flatMap((o) => (o !== undefined && "failure" in o ? [o.failure] : []))
    .join("; ");
}

/** The results as a Markdown table. */
function table(rows: readonly Row[]): string {
  const lines = [
    "| n | p | sweep cold s | sweep warm s | summaries cold s | summaries warm s | ratio | " +
    "peak MB sweep | peak MB summaries | notes |",
    "|---:|---:|---:|---:|---:|---:|---:|---:|---:|---|",
  ];
  for (const row of rows) {
    const sweepWarm = warmSeconds(row.sweepWarm);
    const summariesWarm = warmSeconds(row.summariesWarm);
    const ratio = Number.isFinite(sweepWarm) && Number.isFinite(summariesWarm)
      ? sweepWarm / summariesWarm
      : coldSeconds(row.sweepCold) / coldSeconds(row.summariesCold);
    lines.push(
      `| ${row.n} | ${row.p} | ${show(coldSeconds(row.sweepCold))} | ${show(sweepWarm)} | ` +
        `${show(coldSeconds(row.summariesCold))} | ${show(summariesWarm)} | ${show(ratio, 3)} | ` +
        `${peak(row.sweepCold)} | ${peak(row.summariesCold)} | ${notes(row)} |`,
    );
  }
  return lines.join("\n");
}

/** Where the sweep's fastest cold run spent its time, by stage. */
function stageTable(rows: readonly Row[]): string {
  const fastest = rows.flatMap((row) => {
    const runs = reports(row.sweepCold).sort((a, b) => a.seconds[0] - b.seconds[0]);
    return runs.length > 0 ? [runs[0]] : [];
  });
  if (fastest.length === 0) return "";
  const stages = Object.keys(fastest[0].stages);
  const lines = [
    `| n | p | ${stages.join(" | ")} |`,
    `|---:|---:|${stages.map(() => "---:").join("|")}|`,
  ];
  for (const r of fastest) {
    const cells = stages.map((s) => show(r.stages[s] ?? NaN));
    lines.push(`| ${r.options.n} | ${r.options.p} | ${cells.join(" | ")} |`);
  }
  return lines.join("\n");
}

/** The commit benchmarked, and whether lib/ or mod.ts had uncommitted changes. */
async function codeVersion(): Promise<string> {
  const git = async (...args: string[]) => {
    const out = await new Deno.Command("git", { args, stdout: "piped", stderr: "null" }).output();
    return out.success ? new TextDecoder().decode(out.stdout).trim() : "";
  };
  const commit = await git("rev-parse", "--short", "HEAD");
  if (commit === "") return "code version unknown (not a git checkout)";
  const dirty = await git("status", "--porcelain", "--", "lib", "mod.ts");
  return `commit ${commit}${dirty === "" ? "" : " with uncommitted changes in lib/ or mod.ts"}`;
}

async function main(): Promise<void> {
  const timeout = Number(option("timeout") ?? 3600);
  const rounds = Number(option("rounds") ?? 1);
  const loadBefore = loadAverage();
  const rows: Row[] = [];
  for (const n of sizes("n", DEFAULT_N)) {
    for (const p of sizes("p", DEFAULT_P)) {
      const need = estimatedBytes(n, p);
      if (need > 0.8 * availableBytes()) {
        const failure = `skipped: needs about ${(need / 1e9).toFixed(1)} GB, ` +
          `more than 80 % of the ${(availableBytes() / 1e9).toFixed(1)} GB available`;
        rows.push({ n, p, sweepCold: [{ failure }], summariesCold: [] });
        console.error(`n=${n} p=${p}: ${failure}`);
        continue;
      }
      const base = { n, p, k: 10, lambdas: 100 };
      const run = (job: CaseOptions["job"], repeat: number) => {
        console.error(`n=${n} p=${p} ${job} ×${repeat} …`);
        return runProcess({ job, ...base, repeat }, timeout);
      };
      const summariesCold: Outcome[] = [];
      const sweepCold: Outcome[] = [];
      for (let round = 0; round < rounds; round++) {
        summariesCold.push(await run("summaries", 1));
        sweepCold.push(await run("sweep", 1));
      }
      const row: Row = {
        n,
        p,
        summariesCold,
        sweepCold,
        ...(n <= WARM_LIMIT_N
          ? {
            summariesWarm: await run("summaries", WARM_REPEATS),
            sweepWarm: await run("sweep", WARM_REPEATS),
          }
          : {}),
      };
      rows.push(row);
    }
  }
  console.log(
    `Sweep benchmark (${await codeVersion()}; Deno ${Deno.version.deno}): ` +
      "10 folds, 100 λ, closedForm false; seeded synthetic data.\n" +
      "ratio = sweep time / (design + fold summaries) time (warm times when measured); " +
      `cold = fastest of ${rounds} fresh process(es); MB = 10⁶ bytes (VmHWM).\n` +
      `Load average (1, 5, 15 min) before: ${loadBefore}; after: ${loadAverage()} ` +
      `on ${navigator.hardwareConcurrency} logical CPUs.\n`,
  );
  console.log(table(rows));
  console.log("\nSweep stages, cold run (s):\n");
  console.log(stageTable(rows));
  const json = option("json");
  if (json !== undefined) await Deno.writeTextFile(json, JSON.stringify(rows, null, 1) + "\n");
}

if (import.meta.main) await main();
