/**
 * Benchmark (not a test): a cross-validated lasso path from fold summaries (lib/sparse on
 * lib/sweep/moments.ts) against scikit-learn's LassoCV, on the same rows and the same folds,
 * same machine, one run each.
 *
 * Data (invented, seeded): n rows, p columns with AR(1) correlation 0.5^|j−k| between columns,
 * y = 20 of the columns with coefficients ±(1 … 2.9) plus N(0, 5²) noise; a 10-fold plan from
 * kFoldPlan (seed 1). Rows, target and fold assignment go to a temporary folder; each side runs
 * in a fresh process that reads them, records its peak resident memory (VmHWM), then times:
 * - curbfit: one pass summarizing the rows of each fold (bucketMoments), all-rows summary by
 *   merging, α path (100 values from α_max down to 10⁻³ α_max), for each fold the path on
 *   "all minus fold" with the held-out error from the fold's summary, the α with the smallest
 *   mean CV error, and the all-rows path down to it (the refit). Default tolerance (scaled KKT
 *   violation ≤ 10⁻⁷); columns not standardized, so both sides solve the same problem;
 * - scikit-learn: LassoCV(n_alphas=100, eps=1e-3, cv=PredefinedSplit(folds)) with defaults
 *   otherwise (tol 1e-4 on its duality gap; Gram precomputed per fold since n > p; refit on all
 *   rows), once with the default BLAS threads and once with one thread (curbfit uses one).
 * It then prints time, peak memory, their ratios, and how closely the two CV curves and chosen
 * α agree (they solve the same problem to different tolerances).
 *
 * Run: deno run --allow-all test/bench/sparse_vs_sklearn.ts
 *      [--n=100000] [--p=200] [--k=10] [--alphas=100]
 *
 * @module
 */
import { bucketMoments, mergeMoments, removeMoments } from "../../lib/sweep/moments.ts";
import { kFoldPlan, SeededStream } from "../../lib/folds/mod.ts";
import { alphaGrid, gramProblem, lasso, sparsePath } from "../../lib/sparse/mod.ts";
import { normals } from "../helpers.ts";

/** What each side prints. */
interface SideResult {
  readonly version: string;
  readonly seconds: number;
  readonly baselineRssMb: number;
  readonly peakRssMb: number;
  readonly alphas: number[];
  readonly cvMean: number[];
  readonly best: number;
  readonly nonzero: number;
  readonly threads?: string;
  readonly phases?: Record<string, number>;
  readonly convergenceWarnings?: number;
  readonly unconverged?: number;
}

interface Meta {
  readonly n: number;
  readonly p: number;
  readonly k: number;
  readonly alphas: number;
}

function option(name: string, fallback: number): number {
  const hit = Deno.args.find((a) => a.startsWith(`--${name}=`));
  return hit === undefined ? fallback : Number(hit.slice(name.length + 3));
}

function peakRssMb(): number {
  const line = Deno.readTextFileSync("/proc/self/status").split("\n").find((l) =>
    l.startsWith("VmHWM:")
  );
  return line === undefined ? NaN : Number(line.split(/\s+/)[1]) / 1024;
}

/** The invented rows, written little-endian as x.f64 (row-major), y.f64, folds.i32. */
async function writeData(folder: string, meta: Meta): Promise<void> {
  const { n, p, k } = meta;
  const s = new SeededStream(20240611);
  const e = normals(s, n * p);
  const x = new Float64Array(n * p);
  const keep = Math.sqrt(0.75);
  for (let i = 0; i < n; i++) {
    x[i * p] = e[i * p];
    for (let j = 1; j < p; j++) x[i * p + j] = 0.5 * x[i * p + j - 1] + keep * e[i * p + j];
  }
  const y = normals(s, n).map((v) => 5 * v);
  const step = Math.max(1, Math.floor(p / 20));
  for (let t = 0; t < Math.min(20, p); t++) {
    const beta = (t % 2 ? -1 : 1) * (1 + t / 10);
    for (let i = 0; i < n; i++) y[i] += beta * x[i * p + t * step];
  }
  const folds = kFoldPlan(n, { k, seed: 1 }).assignment[0];
  await Deno.writeFile(`${folder}/x.f64`, new Uint8Array(x.buffer));
  await Deno.writeFile(`${folder}/y.f64`, new Uint8Array(y.buffer));
  await Deno.writeFile(`${folder}/folds.i32`, new Uint8Array(folds.buffer));
  await Deno.writeTextFile(`${folder}/meta.json`, JSON.stringify(meta));
}

/** A file's bytes, read into one buffer of its size (no intermediate copies to inflate VmHWM). */
async function readWhole(path: string): Promise<ArrayBuffer> {
  using file = await Deno.open(path);
  const bytes = new Uint8Array((await file.stat()).size);
  for (let at = 0; at < bytes.length;) {
    const got = await file.read(bytes.subarray(at));
    if (got === null) throw new Error(`${path} ended early`);
    at += got;
  }
  return bytes.buffer;
}

/** The curbfit side, in a child process. */
async function runOurs(folder: string): Promise<SideResult> {
  const meta: Meta = JSON.parse(await Deno.readTextFile(`${folder}/meta.json`));
  const { n, p, k } = meta;
  const x = new Float64Array(await readWhole(`${folder}/x.f64`));
  const y = new Float64Array(await readWhole(`${folder}/y.f64`));
  const folds = new Int32Array(await readWhole(`${folder}/folds.i32`));
  if (x.length !== n * p || y.length !== n || folds.length !== n) throw new Error("bad data files");
  const baselineRssMb = peakRssMb();
  const options = { standardize: false };
  const t0 = performance.now();
  const buckets = bucketMoments(x, p, y, folds, k);
  const t1 = performance.now();
  const all = mergeMoments(buckets, p + 1);
  const whole = gramProblem(all, options);
  const alphas = alphaGrid(whole, lasso(), { count: meta.alphas });
  const cvSum = new Float64Array(alphas.length);
  let unconverged = 0;
  buckets.forEach((fold) => {
    const train = gramProblem(removeMoments(all, fold), options);
    const path = sparsePath(train, lasso(), { alphas, validation: fold });
    path.solutions.forEach((s, l) => {
      cvSum[l] += s.heldOutMse as number;
      if (!s.converged) unconverged++;
    });
  });
  const cvMean = Array.from(cvSum, (v) => v / k);
  const bestIndex = cvMean.indexOf(Math.min(...cvMean));
  const t2 = performance.now();
  const refit = sparsePath(whole, lasso(), { alphas: alphas.slice(0, bestIndex + 1) });
  const t3 = performance.now();
  const final = refit.solutions[bestIndex];
  return {
    version: `curbfit lib/sparse, Deno ${Deno.version.deno}, V8 ${Deno.version.v8}`,
    seconds: (t3 - t0) / 1000,
    phases: { summaries: (t1 - t0) / 1000, folds: (t2 - t1) / 1000, refit: (t3 - t2) / 1000 },
    baselineRssMb,
    peakRssMb: peakRssMb(),
    alphas,
    cvMean,
    best: alphas[bestIndex],
    nonzero: final.nonzero,
    unconverged,
  };
}

async function runChild(command: string, args: string[], env?: Record<string, string>) {
  const out = await new Deno.Command(command, { args, env, stderr: "inherit" }).output();
  if (!out.success) throw new Error(`${command} ${args.join(" ")} failed`);
  return JSON.parse(new TextDecoder().decode(out.stdout)) as SideResult;
}

function maxRelDiff(a: readonly number[], b: readonly number[]): number {
  return Math.max(...a.map((v, i) => Math.abs(v - b[i]) / Math.abs(b[i])));
}

async function main(): Promise<void> {
  const child = Deno.args.find((a) => a.startsWith("--child="));
  if (child !== undefined) {
    console.log(JSON.stringify(await runOurs(child.slice("--child=".length))));
    return;
  }
  const meta = {
    n: option("n", 100_000),
    p: option("p", 200),
    k: option("k", 10),
    alphas: option("alphas", 100),
  };
  const folder = await Deno.makeTempDir({ prefix: "curbfit-sparse-bench-" });
  try {
    console.log(
      `data: n = ${meta.n}, p = ${meta.p}, ${meta.k} folds × ${meta.alphas} α; writing to ${folder}`,
    );
    await writeData(folder, meta);
    const self = new URL(import.meta.url).pathname;
    const python = new URL("./sparse_vs_sklearn.py", import.meta.url).pathname;
    const ours = await runChild(Deno.execPath(), [
      "run",
      "--allow-all",
      self,
      `--child=${folder}`,
    ]);
    const sk = await runChild("/usr/bin/python3", [python, folder]);
    const one = "1";
    const sk1 = await runChild("/usr/bin/python3", [python, folder], {
      OPENBLAS_NUM_THREADS: one,
      OMP_NUM_THREADS: one,
      MKL_NUM_THREADS: one,
    });
    const rows = [
      ["curbfit (fold summaries)", ours],
      [`scikit-learn LassoCV (${sk.threads} threads)`, sk],
      [`scikit-learn LassoCV (${sk1.threads} threads)`, sk1],
    ] as const;
    console.log(`\n${ours.version}\n${sk.version}\n`);
    const growth = (r: SideResult) => r.peakRssMb - r.baselineRssMb;
    console.log("side".padEnd(50), "seconds  peak RSS MB  before fit MB  growth MB  time ratio");
    for (const [name, r] of rows) {
      const cells = [
        r.seconds.toFixed(2).padStart(7),
        r.peakRssMb.toFixed(0).padStart(11),
        r.baselineRssMb.toFixed(0).padStart(13),
        growth(r).toFixed(0).padStart(9),
        `${(r.seconds / ours.seconds).toFixed(2)}×`.padStart(10),
      ];
      console.log(name.padEnd(50), cells.join("  "));
    }
    console.log(
      `curbfit phases (s): ${JSON.stringify(ours.phases)}; unconverged α: ${ours.unconverged}`,
    );
    console.log(
      `scikit-learn convergence warnings: ${sk.convergenceWarnings}, ${sk1.convergenceWarnings}`,
    );
    console.log(
      `α grids, max relative difference: ${maxRelDiff(ours.alphas, sk.alphas).toExponential(2)}`,
    );
    console.log(
      `mean CV MSE per α, max relative difference: ${
        maxRelDiff(ours.cvMean, sk.cvMean).toExponential(2)
      }`,
    );
    console.log(
      `chosen α: curbfit ${ours.best} (${ours.nonzero} nonzero), scikit-learn ${sk.best} (${sk.nonzero} nonzero)`,
    );
  } finally {
    await Deno.remove(folder, { recursive: true });
  }
}

await main();
