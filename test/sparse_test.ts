/**
 * The lasso / elastic-net solver (lib/sparse) against outside references:
 * - scikit-learn 1.2.1 (Debian python3-sklearn) `Lasso` and `ElasticNet` coefficients on the
 *   diabetes data of Efron, Hastie, Johnstone & Tibshirani (2004), standardized with the
 *   population SD, numbers committed in test/reference/sparse/reference.json by
 *   make_reference.py there (which also checks them against exact active-set solutions);
 * - the order in which variables enter and leave the lasso path, from scikit-learn's
 *   `lars_path(method="lasso")` on the same data;
 * - the optimality (KKT) conditions, recomputed here from the rows, not from the summaries;
 * - the documented conversion to ridge (λ_ridge = N·α), against the ridge engine;
 * - the effective df (lib/sparse/df.ts) against the trace of the hat matrix
 *   Z_A (Z_AᵀZ_A + N·α·(1 − ρ)·I)⁻¹ Z_Aᵀ formed here from rows (the elastic net's df: Zou &
 *   Hastie 2005, J. R. Statist. Soc. B 67; Tibshirani & Taylor 2012, Ann. Statist. 40 — both
 *   recalled from memory), against Stein's divergence Σᵢ ∂ŷᵢ/∂yᵢ of the solver's own fitted
 *   values by central differences (Stein 1981, Ann. Statist. 9, recalled from memory; the
 *   lasso's count: Zou, Hastie & Tibshirani 2007, Ann. Statist. 35), and against the ridge df
 *   Σ e_j/(e_j + λ) of the ridge engine at ρ → 0 (Hastie, Tibshirani & Friedman, Elements of
 *   Statistical Learning 2nd ed., §3.4.1, recalled from memory).
 * Synthetic data below is invented (seeded), for the checks that need no outside numbers.
 */
import assert from "node:assert/strict";
import { CurbfitError } from "../lib/errors/error.ts";
import { bucketMoments, type Moments, removeMoments } from "../lib/sweep/moments.ts";
import { decompose, solutionAt } from "../lib/sweep/spectrum.ts";
import { SeededStream } from "../lib/folds/mod.ts";
import {
  alphaGrid,
  alphaMax,
  elasticNet,
  gramProblem,
  lasso,
  solutionDf,
  type SparsePath,
  sparsePath,
  sparsePathFromRows,
  type SparsePenalty,
  type SparseSolution,
} from "../lib/sparse/mod.ts";
import { normals } from "./helpers.ts";

interface ReferenceFit {
  mix: number;
  alpha: number;
  alphaMax: number;
  standardized: number[];
  coefficients: number[];
  intercept: number;
}

interface Reference {
  data: { file: string; sha256: string; rows: number; columns: string[] };
  means: number[];
  sds: number[];
  fits: ReferenceFit[];
  lars: {
    alphas: number[];
    events: string[];
    midpoints: { alpha: number; standardized: number[]; active: string[] }[];
  };
}

const HERE = new URL("./reference/sparse/", import.meta.url);
const REF: Reference = JSON.parse(await Deno.readTextFile(new URL("reference.json", HERE)));
const CSV = await Deno.readTextFile(new URL(REF.data.file, HERE));
const NAMES = REF.data.columns;
const P = NAMES.length;

/** The diabetes rows: x (n×10 row-major) and y. */
function diabetes(): { x: Float64Array; y: Float64Array; n: number } {
  const rows = CSV.trim().split("\n").slice(1).map((line) => line.split(",").map(Number));
  const x = Float64Array.from(rows.flatMap((r) => r.slice(0, P)));
  const y = Float64Array.from(rows, (r) => r[P]);
  return { x, y, n: rows.length };
}

function penaltyFor(mix: number): SparsePenalty {
  return mix === 1 ? lasso() : elasticNet({ mix });
}

function maxAbsDiff(a: readonly number[], b: readonly number[]): number {
  assert.equal(a.length, b.length);
  return Math.max(...a.map((v, i) => Math.abs(v - b[i])));
}

/**
 * Largest scaled KKT violation of a solution, from the rows: z = standardized (or raw) columns,
 * r = y − b − xᵀw, g_j = ⟨z_j, r⟩/N, scaled by √(mean z_j² · mean r₀²) with r₀ = y − ȳ (or y).
 * With column weights γ_j (path.gamma) the conditions are |g_j| ≤ αργ_j at w_j = 0 and
 * g_j = α(1 − ρ)γ_j w_j + αργ_j sign(w_j) otherwise (the subgradient of the weighted penalty).
 */
function kktFromRows(
  x: Float64Array,
  y: Float64Array,
  path: SparsePath,
  s: SparseSolution,
): number {
  const n = y.length;
  const p = x.length / n;
  const mix = path.penalty.mix;
  const ybar = path.intercept ? y.reduce((t, v) => t + v, 0) / n : 0;
  const r = Float64Array.from(y, (v, i) => {
    let fitted = s.intercept;
    for (let q = 0; q < p; q++) fitted += x[i * p + q] * s.coefficients[q];
    return v - fitted;
  });
  const vy = y.reduce((t, v) => t + (v - ybar) ** 2, 0) / n;
  let worst = 0;
  for (let q = 0; q < p; q++) {
    const center = path.intercept ? path.means[q] : 0;
    let g = 0, zz = 0;
    for (let i = 0; i < n; i++) {
      const z = (x[i * p + q] - center) / path.scales[q];
      g += z * r[i];
      zz += z * z;
    }
    g /= n;
    const w = s.standardized[q];
    const a = s.alpha * mix * path.gamma[q], beta = s.alpha * (1 - mix) * path.gamma[q];
    const raw = w === 0 ? Math.max(Math.abs(g) - a, 0) : Math.abs(g - beta * w - Math.sign(w) * a);
    worst = Math.max(worst, raw / Math.sqrt((zz / n) * vy));
  }
  return worst;
}

Deno.test("the diabetes copy is the one the reference was made from (SHA-256, means, SDs)", async () => {
  const bytes = new TextEncoder().encode(CSV);
  const digest = new Uint8Array(await crypto.subtle.digest("SHA-256", bytes));
  assert.equal(
    Array.from(digest, (b) => b.toString(16).padStart(2, "0")).join(""),
    REF.data.sha256,
  );
  const { x, y, n } = diabetes();
  assert.equal(n, REF.data.rows);
  const path = sparsePathFromRows(x, P, y, lasso(), { alphas: [1] });
  assert.ok(maxAbsDiff(path.means, REF.means) < 1e-12);
  // population SD (divisor N), as numpy.std(ddof=0) in the script
  path.scales.forEach((s, q) => assert.ok(Math.abs(s / REF.sds[q] - 1) < 1e-13));
});

for (const mix of [1, 0.5, 0.2]) {
  const label = mix === 1 ? "Lasso" : `ElasticNet(l1_ratio=${mix})`;
  Deno.test(`coefficients equal scikit-learn ${label} on the diabetes data to 1e-6`, () => {
    const fits = REF.fits.filter((f) => f.mix === mix);
    const { x, y } = diabetes();
    const path = sparsePathFromRows(x, P, y, penaltyFor(mix), {
      alphas: fits.map((f) => f.alpha),
      tolerance: 1e-13,
    });
    assert.ok(Math.abs(path.alphaMax / fits[0].alphaMax - 1) < 1e-12);
    fits.forEach((ref) => {
      const s = path.solutions.find((t) => t.alpha === ref.alpha) as SparseSolution;
      assert.ok(s.converged);
      // scikit-learn's coef_ on the standardized columns is our standardized coefficients
      assert.ok(maxAbsDiff(s.standardized, ref.standardized) < 1e-6, `α = ${ref.alpha}`);
      assert.ok(maxAbsDiff(s.coefficients, ref.coefficients) < 1e-6, `α = ${ref.alpha}`);
      assert.ok(Math.abs(s.intercept - ref.intercept) < 1e-6, `α = ${ref.alpha}`);
      assert.equal(s.nonzero, ref.standardized.filter((v) => v !== 0).length);
    });
  });
}

Deno.test("the lasso path equals scikit-learn's lars_path(method='lasso'): coefficients and entry order", () => {
  const { x, y } = diabetes();
  const mids = REF.lars.midpoints;
  const path = sparsePathFromRows(x, P, y, lasso(), {
    alphas: mids.map((m) => m.alpha),
    tolerance: 1e-13,
  });
  assert.ok(Math.abs(path.alphaMax / REF.lars.alphas[0] - 1) < 1e-12);
  const events: string[] = [];
  let before = new Set<string>();
  path.solutions.forEach((s, k) => {
    assert.equal(s.alpha, mids[k].alpha);
    assert.ok(maxAbsDiff(s.standardized, mids[k].standardized) < 1e-6, `segment ${k + 1}`);
    const now = new Set(NAMES.filter((_, q) => s.standardized[q] !== 0));
    NAMES.forEach((name) => now.has(name) && !before.has(name) && events.push(`+${name}`));
    NAMES.forEach((name) => before.has(name) && !now.has(name) && events.push(`-${name}`));
    before = now;
  });
  assert.deepEqual(events, REF.lars.events);
  // Efron et al. (2004), diabetes example: bmi enters first, then s5 (ltg), then bp — recalled
  // from memory, and confirmed above by lars_path.
  assert.deepEqual(events.slice(0, 3), ["+bmi", "+s5", "+bp"]);
});

for (const mix of [1, 0.5]) {
  Deno.test(`KKT holds (from the rows) at every solution of an automatic path, mix ${mix}`, () => {
    const { x, y } = diabetes();
    const variants = [
      { tolerance: 1e-7 },
      { tolerance: 1e-10 },
      { tolerance: 1e-10, intercept: false },
      { tolerance: 1e-10, standardize: false },
    ];
    for (const options of variants) {
      const path = sparsePathFromRows(x, P, y, penaltyFor(mix), options);
      assert.equal(path.solutions.length, 100);
      for (const s of path.solutions) {
        assert.ok(s.converged && s.violation <= options.tolerance);
        // the solver's own check, recomputed from rows: differs only by rounding (≤ 1e-12)
        const fromRows = kktFromRows(x, y, path, s);
        assert.ok(fromRows <= options.tolerance + 1e-12, `${JSON.stringify(options)} ${fromRows}`);
        assert.ok(s.gap >= -1e-12 * s.trainMse && s.gap <= 1e-6 * path.solutions[0].trainMse);
      }
    }
  });
}

Deno.test("warm-started path equals cold starts at every α to 1e-6 (tolerance 1e-10), in fewer passes", () => {
  const { x, y } = diabetes();
  for (const penalty of [lasso(), elasticNet({ mix: 0.3 })]) {
    const warm = sparsePathFromRows(x, P, y, penalty, { tolerance: 1e-10 });
    const cold = sparsePathFromRows(x, P, y, penalty, { tolerance: 1e-10, warmStart: false });
    warm.solutions.forEach((s, k) => {
      assert.equal(s.alpha, cold.solutions[k].alpha);
      // both have scaled KKT violation ≤ 1e-10, i.e. gradients within 1e-10·SD(y) ≈ 8e-9;
      // the smallest eigenvalue of the diabetes correlation matrix is ≈ 0.01, so coefficients
      // may differ by up to about 1e-6 in the worst case.
      assert.ok(maxAbsDiff(s.standardized, cold.solutions[k].standardized) < 1e-6);
    });
    const passes = (p: SparsePath) => p.solutions.reduce((t, s) => t + s.passes, 0);
    assert.ok(passes(warm) < passes(cold));
  }
});

Deno.test("α_max is the smallest α with all coefficients zero; the automatic path spans α_max·[1e-3, 1]", () => {
  const { x, y, n } = diabetes();
  for (const penalty of [lasso(), elasticNet({ mix: 0.2 })]) {
    const top = sparsePathFromRows(x, P, y, penalty, { alphas: [1] }).alphaMax;
    const path = sparsePathFromRows(x, P, y, penalty, {
      alphas: [top, top * (1 - 1e-9)],
      tolerance: 1e-13, // so the tiny first coefficient (≈ 1e-9 of the gradient) must appear
    });
    assert.equal(path.solutions[0].nonzero, 0);
    assert.equal(path.solutions[1].nonzero, 1);
    assert.ok(path.solutions[1].standardized[NAMES.indexOf("bmi")] > 0);
    const [m] = bucketMoments(x, P, y, new Int32Array(n), 1);
    const grid = alphaGrid(gramProblem(m), penalty);
    assert.equal(grid.length, 100);
    assert.equal(grid[0], top);
    assert.ok(Math.abs(grid[99] / (1e-3 * top) - 1) < 1e-14); // N = 442 > p = 10: ε = 1e-3
    grid.slice(1).forEach((a, i) =>
      assert.ok(Math.abs(a / grid[i] / 1e-3 ** (1 / 99) - 1) < 1e-12)
    );
  }
});

/** Seeded, invented rows with more columns than rows: y depends on the first 3 of p columns. */
function wide(n: number, p: number, seed: number): { x: Float64Array; y: Float64Array } {
  const s = new SeededStream(seed);
  const x = normals(s, n * p);
  const e = normals(s, n);
  const y = Float64Array.from(
    e,
    (v, i) => 3 * x[i * p] - 2 * x[i * p + 1] + x[i * p + 2] + 0.5 * v,
  );
  return { x, y };
}

Deno.test("N ≤ p: automatic path stops at 1e-2·α_max, KKT holds from the rows", () => {
  const { x, y } = wide(30, 60, 5);
  const path = sparsePathFromRows(x, 60, y, lasso(), { tolerance: 1e-9, alphas: { count: 40 } });
  const last = path.solutions[39];
  assert.ok(Math.abs(last.alpha / (1e-2 * path.alphaMax) - 1) < 1e-14);
  for (const s of path.solutions) assert.ok(kktFromRows(x, y, path, s) <= 1e-9 + 1e-12);
  assert.ok(last.nonzero <= 30); // a lasso solution has at most N nonzeros here (generic data)
});

Deno.test("held-out and training MSE from summaries equal direct computation from rows", () => {
  const { x, y, n } = diabetes();
  const side = Int32Array.from({ length: n }, (_, i) => (i % 5 === 2 ? 1 : 0));
  const [train, validation] = bucketMoments(x, P, y, side, 2);
  const path = sparsePath(gramProblem(train), elasticNet({ mix: 0.7 }), {
    validation,
    alphas: { count: 30 },
  });
  const mse = (s: SparseSolution, which: number) => {
    let sse = 0, count = 0;
    for (let i = 0; i < n; i++) {
      if (side[i] !== which) continue;
      let fitted = s.intercept;
      for (let q = 0; q < P; q++) fitted += x[i * P + q] * s.coefficients[q];
      sse += (y[i] - fitted) ** 2;
      count++;
    }
    return sse / count;
  };
  for (const s of path.solutions) {
    assert.ok(Math.abs((s.heldOutMse as number) / mse(s, 1) - 1) < 1e-10);
    assert.ok(Math.abs(s.trainMse / mse(s, 0) - 1) < 1e-10);
  }
});

Deno.test("a fold's path from summaries (whole minus fold) equals the path from its training rows", () => {
  const { x, y, n } = diabetes();
  const fold = Int32Array.from({ length: n }, (_, i) => i % 4);
  const buckets = bucketMoments(x, P, y, fold, 4);
  const [all] = bucketMoments(x, P, y, new Int32Array(n), 1);
  const alphas = alphaGrid(gramProblem(all), lasso(), { count: 25 });
  const fromSummaries = sparsePath(gramProblem(removeMoments(all, buckets[3])), lasso(), {
    alphas,
    tolerance: 1e-12,
  });
  const rows = Array.from({ length: n }, (_, i) => i).filter((i) => fold[i] !== 3);
  const fromRows = sparsePathFromRows(
    Float64Array.from(rows.flatMap((i) => Array.from(x.subarray(i * P, i * P + P)))),
    P,
    Float64Array.from(rows, (i) => y[i]),
    lasso(),
    { alphas, tolerance: 1e-12 },
  );
  fromSummaries.solutions.forEach((s, k) => {
    assert.ok(maxAbsDiff(s.coefficients, fromRows.solutions[k].coefficients) < 1e-8);
  });
});

Deno.test("ρ → 0 is ridge with λ_ridge = N·α (documented conversion; ridge engine as reference)", () => {
  const { x, y, n } = diabetes();
  const [m] = bucketMoments(x, P, y, new Int32Array(n), 1);
  const mix = 1e-12;
  const spectrum = decompose(m, {
    gamma: new Float64Array(P).fill(1),
    standardize: true,
    intercept: true,
  });
  for (const alpha of [0.01, 0.3, 5]) {
    const s = sparsePath(gramProblem(m), elasticNet({ mix }), { alphas: [alpha], tolerance: 1e-13 })
      .solutions[0];
    const ridge = solutionAt(spectrum, n * alpha * (1 - mix));
    s.coefficients.forEach((w, q) => assert.ok(Math.abs(w / ridge.w[q] - 1) < 1e-8, `α ${alpha}`));
    assert.ok(Math.abs(s.intercept / ridge.intercept - 1) < 1e-10);
  }
});

Deno.test("a pass limit too small is reported as not converged, not hidden", () => {
  const { x, y } = diabetes();
  const path = sparsePathFromRows(x, P, y, lasso(), { alphas: [0.05], maxPasses: 2 });
  const s = path.solutions[0];
  assert.equal(s.converged, false);
  assert.ok(s.violation > path.tolerance);
  assert.equal(s.passes, 2);
});

Deno.test("results are deterministic and frozen; the caller's summary is not changed", () => {
  const { x, y, n } = diabetes();
  const [m] = bucketMoments(x, P, y, new Int32Array(n), 1);
  const copy: Moments = { ...m, mean: m.mean.slice(), cross: m.cross.slice() };
  const mine: SparsePenalty = { kind: "elastic-net", mix: 0.4 };
  const a = sparsePath(gramProblem(m), mine, { validation: m });
  const b = sparsePath(gramProblem(m), elasticNet({ mix: 0.4 }), { validation: m });
  assert.deepEqual(m, copy);
  assert.ok(!Object.isFrozen(mine));
  assert.equal(JSON.stringify(a), JSON.stringify(b));
  assert.ok(Object.isFrozen(a) && Object.isFrozen(a.solutions[5].coefficients));
});

Deno.test("bad input gets a clear CurbfitError with a stable code", () => {
  const { x, y, n } = diabetes();
  const [m] = bucketMoments(x, P, y, new Int32Array(n), 1);
  const g = gramProblem(m);
  const fails = (code: string, f: () => unknown, words: RegExp) =>
    assert.throws(f, (e) => e instanceof CurbfitError && e.code === code && words.test(e.message));
  fails("BAD_OPTION", () => elasticNet({ mix: 0 }), /mix is 0.*ridge\(\)/);
  fails("BAD_OPTION", () => elasticNet({ mix: 1.5 }), /option penalty.mix/);
  fails("BAD_OPTION", () => sparsePath(g, { kind: "lasso", mix: 0.5 }), /lasso is mix 1/);
  fails("BAD_OPTION", () => alphaGrid(g, lasso(), []), /empty/);
  fails("BAD_OPTION", () => alphaGrid(g, lasso(), [1, 0]), /alphas\[1\] is 0/);
  fails("BAD_OPTION", () => alphaGrid(g, lasso(), { count: 1 }), /alphas.count/);
  fails("BAD_OPTION", () => alphaGrid(g, lasso(), { ratio: 1 }), /alphas.ratio/);
  fails("BAD_OPTION", () => sparsePath(g, lasso(), { tolerance: 0 }), /tolerance is 0/);
  fails("BAD_OPTION", () => sparsePath(g, lasso(), { maxPasses: 0.5 }), /maxPasses/);
  fails("BAD_OPTION", () => sparsePathFromRows(x, 3, y, lasso()), /not 442 rows/);
  const [v2] = bucketMoments(Float64Array.of(1, 2), 1, Float64Array.of(1, 2), new Int32Array(2), 1);
  fails("BAD_OPTION", () => sparsePath(g, lasso(), { validation: v2 }), /1 design columns/);
  const constant = Float64Array.from(x, (v, i) => (i % P === 4 ? 7 : v));
  fails(
    "CONSTANT_COLUMN",
    () => sparsePathFromRows(constant, P, y, lasso(), { names: NAMES, where: "rows of fold 2" }),
    /column "s1".*design column s1 is constant over the rows of fold 2/,
  );
  fails(
    "CONSTANT_TARGET",
    () => sparsePathFromRows(x, P, new Float64Array(n).fill(3), lasso()),
    /constant/,
  );
  fails(
    "TOO_FEW_ROWS",
    () => sparsePathFromRows(x.slice(0, P), P, y.slice(0, 1), lasso()),
    /1 training rows/,
  );
  const bad = x.slice();
  bad[17] = NaN;
  fails("NOT_FINITE", () => sparsePathFromRows(bad, P, y, lasso()), /not a finite number/);
  const orthogonal = {
    ...m,
    cross: m.cross.map((v, k) => (k % (P + 1) === P && k < P * (P + 1) ? 0 : v)),
  };
  fails("BAD_OPTION", () => alphaGrid(gramProblem(orthogonal), lasso()), /no design column/);
  assert.equal(alphaMax(gramProblem(orthogonal), lasso()), 0);
});

/**
 * Seeded, invented rows with correlated columns: x_q = u_q + 0.6·u_(q−1) (u standard normal),
 * y = 2x₀ − x₁ + 0.5x₂ + 0.25x₃ + 0.7·noise.
 */
function correlated(n: number, p: number, seed: number): { x: Float64Array; y: Float64Array } {
  const s = new SeededStream(seed);
  const u = normals(s, n * p);
  const x = Float64Array.from(u, (v, k) => (k % p === 0 ? v : v + 0.6 * u[k - 1]));
  const e = normals(s, n);
  const y = Float64Array.from(e, (v, i) => {
    const row = x.subarray(i * p, i * p + p);
    return 2 * row[0] - row[1] + 0.5 * row[2] + 0.25 * row[3] + 0.7 * v;
  });
  return { x, y };
}

/** Solves the dense system M X = B (M k×k, B k×m, row-major) by Gaussian elimination with partial pivoting. */
function denseSolve(m: Float64Array, b: Float64Array, k: number, cols: number): Float64Array {
  const a = Float64Array.from(m);
  const r = Float64Array.from(b);
  for (let c = 0; c < k; c++) {
    let pivot = c;
    for (let i = c + 1; i < k; i++) {
      if (Math.abs(a[i * k + c]) > Math.abs(a[pivot * k + c])) pivot = i;
    }
    for (let j = 0; j < k; j++) [a[c * k + j], a[pivot * k + j]] = [a[pivot * k + j], a[c * k + j]];
    for (let j = 0; j < cols; j++) {
      [r[c * cols + j], r[pivot * cols + j]] = [r[pivot * cols + j], r[c * cols + j]];
    }
    for (let i = c + 1; i < k; i++) {
      const f = a[i * k + c] / a[c * k + c];
      for (let j = c; j < k; j++) a[i * k + j] -= f * a[c * k + j];
      for (let j = 0; j < cols; j++) r[i * cols + j] -= f * r[c * cols + j];
    }
  }
  for (let c = k - 1; c >= 0; c--) {
    for (let j = 0; j < cols; j++) {
      let v = r[c * cols + j];
      for (let i = c + 1; i < k; i++) v -= a[c * k + i] * r[i * cols + j];
      r[c * cols + j] = v / a[c * k + c];
    }
  }
  return r;
}

/**
 * tr H for H = Z_A (Z_AᵀZ_A + c·Γ_A)⁻¹ Z_Aᵀ, c = N·α·(1 − ρ), Γ = diag(γ) (I by default), formed
 * from the rows: Z_A holds the active columns, centered (with an intercept) and divided by their
 * SD (divisor N, about the mean, when standardizing; else 1), as the objective in
 * lib/sparse/penalty.ts defines them.
 */
function hatTraceFromRows(
  x: Float64Array,
  y: Float64Array,
  s: SparseSolution,
  mix: number,
  read: { standardize: boolean; intercept: boolean },
  gamma: readonly number[] = new Array(x.length / y.length).fill(1),
): number {
  const n = y.length;
  const p = x.length / n;
  const active = s.standardized.flatMap((w, q) => (w !== 0 ? [q] : []));
  const k = active.length;
  const z = new Float64Array(n * k); // N×k, row-major
  active.forEach((q, j) => {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += x[i * p + q] / n;
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (x[i * p + q] - mean) ** 2;
    const sd = read.standardize ? Math.sqrt(ss / n) : 1;
    for (let i = 0; i < n; i++) z[i * k + j] = (x[i * p + q] - (read.intercept ? mean : 0)) / sd;
  });
  const c = n * s.alpha * (1 - mix);
  const m = new Float64Array(k * k);
  for (let a = 0; a < k; a++) {
    for (let b = 0; b < k; b++) {
      let t = 0;
      for (let i = 0; i < n; i++) t += z[i * k + a] * z[i * k + b];
      m[a * k + b] = t + (a === b ? c * gamma[active[a]] : 0);
    }
  }
  const zt = new Float64Array(k * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < k; j++) zt[j * n + i] = z[i * k + j];
  const solved = denseSolve(m, zt, k, n); // (Z_AᵀZ_A + cI)⁻¹ Z_Aᵀ, k×N
  let trace = 0;
  for (let i = 0; i < n; i++) for (let j = 0; j < k; j++) trace += z[i * k + j] * solved[j * n + i];
  return trace;
}

Deno.test("elastic-net df equals the trace of Z_A (Z_AᵀZ_A + N·α·(1 − ρ)·I)⁻¹ Z_Aᵀ from rows to 1e-10", () => {
  const cases = [
    { n: 40, p: 6, seed: 21, mix: 0.5, read: { standardize: true, intercept: true } },
    { n: 25, p: 8, seed: 22, mix: 0.2, read: { standardize: true, intercept: true } },
    { n: 60, p: 5, seed: 23, mix: 0.8, read: { standardize: true, intercept: false } },
    { n: 30, p: 7, seed: 24, mix: 0.35, read: { standardize: false, intercept: true } },
  ];
  let checked = 0, worst = 0;
  for (const { n, p, seed, mix, read } of cases) {
    const { x, y } = correlated(n, p, seed);
    const path = sparsePathFromRows(x, p, y, elasticNet({ mix }), {
      alphas: { count: 12 },
      tolerance: 1e-10,
      ...read,
    });
    for (const s of path.solutions) {
      const df = solutionDf(s);
      if (s.nonzero === 0) {
        assert.equal(df, 0);
        continue;
      }
      const trace = hatTraceFromRows(x, y, s, mix, read);
      const rel = Math.abs(df - trace) / trace;
      worst = Math.max(worst, rel);
      assert.ok(rel < 1e-10, `n ${n} p ${p} ρ ${mix} α ${s.alpha}: ${df} vs ${trace}`);
      checked++;
    }
  }
  // measured: 44 solutions, largest relative difference 1.1e-15
  assert.ok(checked >= 40, `${checked} solutions checked; worst ${worst}`);
});

Deno.test("df is Stein's divergence of the solver's fitted values (central differences), minus the intercept's 1", () => {
  const n = 30, p = 5;
  const { x, y } = correlated(n, p, 31);
  const h = 1e-4;
  const cases: [SparsePenalty, number][] = [
    [elasticNet({ mix: 0.5 }), 0.05],
    [elasticNet({ mix: 0.2 }), 0.3],
    [lasso(), 0.05],
  ];
  for (const [penalty, alpha] of cases) {
    const solve = (yy: Float64Array) =>
      sparsePathFromRows(x, p, yy, penalty, { alphas: [alpha], tolerance: 1e-14 }).solutions[0];
    const base = solve(y);
    const pattern = (s: SparseSolution) => s.standardized.map((w) => Math.sign(w)).join();
    const fitted = (s: SparseSolution, i: number) =>
      s.coefficients.reduce((t, w, q) => t + w * x[i * p + q], s.intercept);
    let divergence = 0;
    for (let i = 0; i < n; i++) {
      const up = Float64Array.from(y), down = Float64Array.from(y);
      up[i] += h;
      down[i] -= h;
      const a = solve(up), b = solve(down);
      // the active set and signs must not change, or the fit is not locally affine here
      assert.equal(pattern(a), pattern(base));
      assert.equal(pattern(b), pattern(base));
      divergence += (fitted(a, i) - fitted(b, i)) / (2 * h);
    }
    const df = solutionDf(base);
    // Locally the fit is affine in y, so the central difference is exact but for rounding and
    // the solver's stopping error (scaled KKT ≤ 1e-14), both divided by h. Measured: within
    // 3e-12 (df 3.865 and 3.061 of 4 nonzero; the lasso 4). A wrong scale of the quadratic term
    // (e.g. α(1 − ρ) or 2Nα(1 − ρ) in place of Nα(1 − ρ)) moves df by more than 0.1.
    assert.ok(
      Math.abs(divergence - 1 - df) < 1e-8,
      `${penalty.kind} ${penalty.mix}: ${divergence - 1} vs ${df}`,
    );
  }
});

Deno.test("lasso df is the nonzero count exactly; elastic-net df is below it and rises to it as ρ → 1", () => {
  const { x, y } = diabetes();
  for (const penalty of [lasso(), elasticNet({ mix: 1 })]) {
    const path = sparsePathFromRows(x, P, y, penalty, { alphas: { count: 40 } });
    for (const s of path.solutions) assert.equal(s.df, s.nonzero);
  }
  for (const mix of [0.05, 0.5, 0.95]) {
    const path = sparsePathFromRows(x, P, y, elasticNet({ mix }), { alphas: { count: 40 } });
    for (const s of path.solutions) {
      const df = solutionDf(s);
      assert.ok(df >= 0 && (s.nonzero === 0 ? df === 0 : df < s.nonzero), `ρ ${mix}: ${df}`);
    }
  }
  // At one α the active set is the same for every ρ below (checked); df then rises with ρ, since
  // each term μ/(μ + α(1 − ρ)) does, and the gap to the count is Σ β/(μ + β) ≤ β Σ 1/μ → 0.
  const alpha = 0.02;
  const mixes = [0.9, 0.99, 0.999, 0.9999, 1];
  const sols = mixes.map((mix) =>
    sparsePathFromRows(x, P, y, mix === 1 ? lasso() : elasticNet({ mix }), {
      alphas: [alpha],
      tolerance: 1e-12,
    }).solutions[0]
  );
  const active = (s: SparseSolution) => s.standardized.map((w) => (w !== 0 ? 1 : 0)).join("");
  sols.forEach((s) => assert.equal(active(s), active(sols[4])));
  const dfs = sols.map(solutionDf);
  dfs.forEach((d, i) => i > 0 && assert.ok(d > dfs[i - 1], `ρ ${mixes[i]}: ${d} ≤ ${dfs[i - 1]}`));
  assert.equal(dfs[4], sols[4].nonzero);
  // measured: 9.7655, 9.9726, 9.9972, 9.99972, 10 (all 10 columns active)
  assert.ok(sols[4].nonzero - dfs[3] < 1e-2, `${dfs[3]}`);
});

Deno.test("ρ → 0 with every column active: df is the ridge df Σ e/(e + λ) at λ = N·α", () => {
  const { x, y, n } = diabetes();
  const [m] = bucketMoments(x, P, y, new Int32Array(n), 1);
  const spectrum = decompose(m, {
    gamma: new Float64Array(P).fill(1),
    standardize: true,
    intercept: true,
  });
  const mix = 1e-9;
  for (const alpha of [0.001, 0.03, 1, 30]) {
    const s = sparsePath(gramProblem(m), elasticNet({ mix }), { alphas: [alpha], tolerance: 1e-12 })
      .solutions[0];
    assert.equal(s.nonzero, P, `α ${alpha}: every column active`);
    const df = solutionDf(s);
    // |Σ μ/(μ + α(1 − ρ)) − Σ μ/(μ + α)| ≤ ρ·P (each term moves by at most ρ), plus rounding.
    // Measured: at most 1.9e-9 (bound 1e-8); against λ = N·α·(1 − ρ), 4.4e-16 relative.
    const ridgeAtNAlpha = solutionAt(spectrum, n * alpha).df;
    assert.ok(
      Math.abs(df - ridgeAtNAlpha) <= mix * P + 1e-12,
      `α ${alpha}: ${df} vs ${ridgeAtNAlpha}`,
    );
    // at the documented conversion λ = N·α·(1 − ρ) the two are the same number, up to rounding
    const ridgeExact = solutionAt(spectrum, n * alpha * (1 - mix)).df;
    assert.ok(Math.abs(df / ridgeExact - 1) < 1e-12, `α ${alpha}: ${df} vs ${ridgeExact}`);
  }
});

Deno.test("fold paths (scored on held-out rows) skip df unless asked; reporting a missing df is a clear error", () => {
  const { x, y, n } = diabetes();
  const side = Int32Array.from({ length: n }, (_, i) => (i % 5 === 2 ? 1 : 0));
  const [train, validation] = bucketMoments(x, P, y, side, 2);
  const penalty = elasticNet({ mix: 0.5 });
  const fold = sparsePath(gramProblem(train), penalty, { validation, alphas: { count: 5 } });
  assert.ok(fold.solutions.every((s) => s.df === null));
  assert.throws(
    () => solutionDf(fold.solutions[3]),
    (e) => e instanceof CurbfitError && e.code === "BAD_OPTION" && e.place.option === "df",
  );
  const asked = sparsePath(gramProblem(train), penalty, {
    validation,
    alphas: { count: 5 },
    df: true,
  });
  const plain = sparsePath(gramProblem(train), penalty, { alphas: { count: 5 } });
  assert.deepEqual(asked.solutions.map((s) => s.df), plain.solutions.map((s) => s.df));
  assert.ok(plain.solutions.every((s) => typeof s.df === "number"));
});

// ---- per-column weights γ_q ----------------------------------------------------------------------

/** Weights for the diabetes columns in the checks below: bp (index 3) unpenalized, others spread. */
const GAMMA = [0.5, 1, 2, 0, 1.5, 1, 3, 0.7, 1, 0.2];

/** Standardized diabetes columns (x − mean)/SD, SD with divisor N, as gram.ts standardizes. */
function standardizedColumns(x: Float64Array, n: number): Float64Array {
  const z = new Float64Array(x.length);
  for (let q = 0; q < P; q++) {
    let mean = 0;
    for (let i = 0; i < n; i++) mean += x[i * P + q] / n;
    let ss = 0;
    for (let i = 0; i < n; i++) ss += (x[i * P + q] - mean) ** 2;
    const sd = Math.sqrt(ss / n);
    for (let i = 0; i < n; i++) z[i * P + q] = (x[i * P + q] - mean) / sd;
  }
  return z;
}

Deno.test("a weighted lasso is the plain lasso on columns x_q/γ_q with coefficient γ_q·w_q", () => {
  // Handbook identity (common practice; it is how the adaptive lasso of Zou 2006, J. Amer.
  // Statist. Assoc. 101, is usually fitted — recalled from memory): with v_q = γ_q w_q,
  // Σ_q γ_q |w_q| = Σ_q |v_q| and x_q w_q = (x_q/γ_q) v_q, so both are the same problem in other
  // coordinates (γ_q > 0). Standardization must be accounted for: it divides x_q/γ_q by its own
  // SD and so undoes the rescaling. Hence (1) on raw columns (standardize: false) and (2) for the
  // default standardized fit, on the standardized columns z*_q formed here from the rows.
  const { x, y, n } = diabetes();
  const gamma = GAMMA.map((g) => (g === 0 ? 1 : g));
  const check = (
    columns: Float64Array,
    weighted: SparsePath,
    coefficient: (s: SparseSolution, q: number) => number,
    raw: boolean,
  ) => {
    const scaled = Float64Array.from(columns, (v, k) => v / gamma[k % P]);
    const plain = sparsePathFromRows(scaled, P, y, lasso(), {
      alphas: weighted.solutions.map((s) => s.alpha),
      tolerance: 1e-13,
      standardize: false,
    });
    assert.ok(Math.abs(plain.alphaMax / weighted.alphaMax - 1) < 1e-12, "α_max");
    let worst = 0;
    const top = Math.max(...plain.solutions.flatMap((v) => v.coefficients.map(Math.abs)));
    weighted.solutions.forEach((s, k) => {
      const v = plain.solutions[k];
      s.coefficients.forEach((_, q) => {
        worst = Math.max(worst, Math.abs(gamma[q] * coefficient(s, q) - v.coefficients[q]) / top);
      });
      // (at α_max itself either side may keep a coefficient of rounding size)
      if (k > 0) assert.equal(s.nonzero, v.nonzero, `α ${s.alpha}`);
      // on the raw columns the intercepts are the same number too (standardized: centred there)
      if (raw) assert.ok(Math.abs(s.intercept - v.intercept) <= 1e-9 * Math.abs(v.intercept));
    });
    // measured: 2.6e-14 (raw) and 2.9e-14 (standardized) of the path's largest coefficient
    assert.ok(worst < 1e-9, `largest difference ${worst} of the largest coefficient`);
  };
  const options = { alphas: { count: 30 }, tolerance: 1e-13 };
  const raw = sparsePathFromRows(x, P, y, lasso({ weights: gamma }), {
    ...options,
    standardize: false,
  });
  check(x, raw, (s, q) => s.coefficients[q], true);
  const standardized = sparsePathFromRows(x, P, y, lasso({ weights: gamma }), options);
  check(standardizedColumns(x, n), standardized, (s, q) => s.standardized[q], false);
  // Rescaling raw columns does not weigh a standardized lasso at all: the same standardized fit.
  const rescaled = Float64Array.from(x, (v, k) => v / gamma[k % P]);
  const a = sparsePathFromRows(rescaled, P, y, lasso(), { alphas: [0.5], tolerance: 1e-13 });
  const b = sparsePathFromRows(x, P, y, lasso(), { alphas: [0.5], tolerance: 1e-13 });
  assert.ok(maxAbsDiff(a.solutions[0].standardized, b.solutions[0].standardized) < 1e-9);
});

for (const mix of [1, 0.4]) {
  Deno.test(`KKT holds (from the rows) with weights and an unpenalized column, mix ${mix}`, () => {
    const { x, y } = diabetes();
    const penalty = mix === 1 ? lasso({ weights: GAMMA }) : elasticNet({ mix, weights: GAMMA });
    const variants = [
      { tolerance: 1e-10 },
      { tolerance: 1e-10, intercept: false },
      { tolerance: 1e-10, standardize: false },
    ];
    for (const options of variants) {
      const path = sparsePathFromRows(x, P, y, penalty, options);
      assert.deepEqual(path.gamma, GAMMA);
      for (const s of path.solutions) {
        assert.ok(s.converged && s.violation <= options.tolerance);
        const fromRows = kktFromRows(x, y, path, s);
        assert.ok(fromRows <= options.tolerance + 1e-12, `${JSON.stringify(options)} ${fromRows}`);
        // the duality gap with the unpenalized column projected out (path.ts): ≥ 0 and small
        assert.ok(s.gap >= -1e-12 * s.trainMse && s.gap <= 1e-6 * path.solutions[0].trainMse);
      }
    }
  });
}

Deno.test("γ_q = 0 keeps a column in the model at every α; above α_max it is least squares alone", () => {
  const { x, y, n } = diabetes();
  const bp = NAMES.indexOf("bp");
  assert.equal(GAMMA[bp], 0);
  for (const penalty of [lasso({ weights: GAMMA }), elasticNet({ mix: 0.3, weights: GAMMA })]) {
    const path = sparsePathFromRows(x, P, y, penalty, { tolerance: 1e-12 });
    assert.ok(path.solutions.every((s) => s.standardized[bp] !== 0), "in at every α of the path");
    const top = path.alphaMax;
    const above = sparsePathFromRows(x, P, y, penalty, {
      alphas: [10 * top, top, top * (1 - 1e-9)],
      tolerance: 1e-13,
    });
    const [far, atMax, below] = above.solutions;
    // at and above α_max only the unpenalized column: its least-squares slope with an
    // intercept, Sxy/Sxx (the handbook formula of simple linear regression), from the rows
    let mx = 0, my = 0;
    for (let i = 0; i < n; i++) (mx += x[i * P + bp] / n), (my += y[i] / n);
    let sxy = 0, sxx = 0;
    for (let i = 0; i < n; i++) {
      sxy += (x[i * P + bp] - mx) * (y[i] - my);
      sxx += (x[i * P + bp] - mx) ** 2;
    }
    for (const s of [far, atMax]) {
      assert.equal(s.nonzero, 1);
      assert.ok(Math.abs(s.coefficients[bp] / (sxy / sxx) - 1) < 1e-12, `${s.coefficients[bp]}`);
      assert.ok(Math.abs(s.intercept - (my - mx * s.coefficients[bp])) < 1e-9);
    }
    // just below α_max the first penalized column enters: α_max is max |g_q|/(ργ_q) over γ_q > 0
    assert.equal(below.nonzero, 2);
    // df: 1 for the unpenalized column, plus the entered one's share
    assert.equal(far.df, 1);
  }
});

Deno.test("weighted elastic-net df equals tr[Z_A (Z_AᵀZ_A + N·α·(1 − ρ)·Γ_A)⁻¹ Z_Aᵀ] from rows to 1e-10", () => {
  const cases = [
    { n: 40, p: 6, seed: 21, mix: 0.5, weights: [0, 1, 2, 0.5, 3, 1] },
    { n: 30, p: 7, seed: 24, mix: 0.25, weights: [1, 0, 0, 4, 0.25, 2, 1] },
    { n: 60, p: 5, seed: 23, mix: 0.8, weights: [2, 1, 0.5, 1, 3] },
  ];
  let checked = 0, worst = 0;
  for (const { n, p, seed, mix, weights } of cases) {
    const { x, y } = correlated(n, p, seed);
    const read = { standardize: true, intercept: true };
    const path = sparsePathFromRows(x, p, y, elasticNet({ mix, weights }), {
      alphas: { count: 12 },
      tolerance: 1e-10,
    });
    for (const s of path.solutions) {
      const df = solutionDf(s);
      if (s.nonzero === 0) {
        assert.equal(df, 0);
        continue;
      }
      const trace = hatTraceFromRows(x, y, s, mix, read, weights);
      const rel = Math.abs(df - trace) / trace;
      worst = Math.max(worst, rel);
      assert.ok(rel < 1e-10, `p ${p} ρ ${mix} α ${s.alpha}: ${df} vs ${trace}`);
      checked++;
    }
    const lassoPath = sparsePathFromRows(x, p, y, lasso({ weights }), { alphas: { count: 12 } });
    for (const s of lassoPath.solutions) assert.equal(s.df, s.nonzero, "the lasso: the count");
  }
  // measured: 35 solutions with an active column, largest relative difference 1.1e-15
  assert.ok(checked >= 30, `${checked} checked, worst ${worst}`);
});

Deno.test("weighted df (with an unpenalized column) is Stein's divergence of the solver's fitted values", () => {
  const n = 30, p = 5;
  const { x, y } = correlated(n, p, 31);
  const h = 1e-4;
  const cases: [SparsePenalty, number][] = [
    [elasticNet({ mix: 0.5, weights: [0, 2, 1, 0.5, 1] }), 0.05],
    [elasticNet({ mix: 0.2, weights: [1, 1, 3, 0, 0.5] }), 0.3],
    [lasso({ weights: [0, 2, 1, 0.5, 1] }), 0.05],
  ];
  for (const [penalty, alpha] of cases) {
    const solve = (yy: Float64Array) =>
      sparsePathFromRows(x, p, yy, penalty, { alphas: [alpha], tolerance: 1e-14 }).solutions[0];
    const base = solve(y);
    const pattern = (s: SparseSolution) => s.standardized.map((w) => Math.sign(w)).join();
    const fitted = (s: SparseSolution, i: number) =>
      s.coefficients.reduce((t, w, q) => t + w * x[i * p + q], s.intercept);
    let divergence = 0;
    for (let i = 0; i < n; i++) {
      const up = Float64Array.from(y), down = Float64Array.from(y);
      up[i] += h;
      down[i] -= h;
      const a = solve(up), b = solve(down);
      assert.equal(pattern(a), pattern(base));
      assert.equal(pattern(b), pattern(base));
      divergence += (fitted(a, i) - fitted(b, i)) / (2 * h);
    }
    // as in the unweighted check above: exact for a locally affine fit but for rounding and
    // the stopping error divided by h; a wrong Γ or a missed projection moves df by far more
    assert.ok(Math.abs(divergence - 1 - solutionDf(base)) < 1e-8, `${divergence - 1}`);
  }
});

Deno.test("ρ → 0 with weights is the weighted ridge λ Σ γ_q w*_q² at λ_ridge = N·α (ridge engine as reference)", () => {
  const { x, y, n } = diabetes();
  const weights = GAMMA.map((g) => (g === 0 ? 0.3 : g)); // the ridge engine takes γ > 0
  const [m] = bucketMoments(x, P, y, new Int32Array(n), 1);
  const mix = 1e-12;
  const spectrum = decompose(m, {
    gamma: Float64Array.from(weights),
    standardize: true,
    intercept: true,
  });
  for (const alpha of [0.01, 0.3, 5]) {
    const s = sparsePath(gramProblem(m), elasticNet({ mix, weights }), {
      alphas: [alpha],
      tolerance: 1e-13,
    }).solutions[0];
    const ridge = solutionAt(spectrum, n * alpha * (1 - mix));
    s.coefficients.forEach((w, q) => assert.ok(Math.abs(w / ridge.w[q] - 1) < 1e-8, `α ${alpha}`));
    assert.ok(Math.abs(solutionDf(s) / ridge.df - 1) < 1e-10, `df at α ${alpha}`);
  }
});

Deno.test("equal weights give the very numbers of no weights; a list of ones differs only in its label", () => {
  const { x, y } = diabetes();
  assert.deepEqual(lasso({ weights: "equal" }), lasso());
  assert.deepEqual(elasticNet({ mix: 0.3, weights: "equal" }), elasticNet({ mix: 0.3 }));
  assert.equal("weights" in lasso(), false, "no weights key without weights");
  for (const mix of [1, 0.3]) {
    const plain = sparsePathFromRows(x, P, y, penaltyFor(mix), { tolerance: 1e-10 });
    const equal = sparsePathFromRows(
      x,
      P,
      y,
      mix === 1 ? lasso({ weights: "equal" }) : elasticNet({ mix, weights: "equal" }),
      { tolerance: 1e-10 },
    );
    assert.equal(JSON.stringify(equal), JSON.stringify(plain), "bit for bit, penalty included");
    const ones = new Array(P).fill(1);
    const listed = sparsePathFromRows(
      x,
      P,
      y,
      mix === 1 ? lasso({ weights: ones }) : elasticNet({ mix, weights: ones }),
      { tolerance: 1e-10 },
    );
    assert.deepEqual(listed.solutions, plain.solutions, "the same numbers, bit for bit");
    assert.deepEqual(listed.penalty.weights, ones);
    assert.deepEqual(plain.gamma, ones);
  }
});

Deno.test("bad weights get a clear CurbfitError naming the option", () => {
  const { x, y, n } = diabetes();
  const fails = (code: string, f: () => unknown, words: RegExp, option?: string) =>
    assert.throws(f, (e) => {
      assert.ok(e instanceof CurbfitError, String(e));
      assert.equal(e.code, code);
      assert.match(e.message, words);
      if (option !== undefined) assert.equal(e.place.option, option);
      return true;
    });
  fails(
    "BAD_OPTION",
    () => lasso({ weights: [1, -1] }),
    /weight 2 is -1.*>= 0/,
    "penalty.weights[1]",
  );
  fails(
    "BAD_OPTION",
    () => elasticNet({ weights: [0, 0] }),
    /every weight .* is 0/,
    "penalty.weights",
  );
  fails("BAD_OPTION", () => lasso({ weights: [1, NaN] }), /weight 2 is NaN/);
  fails(
    "BAD_OPTION",
    () => lasso({ exponent: 2 }),
    /exponent .* equal weights/,
    "penalty.exponent",
  );
  fails("BAD_OPTION", () => lasso({ weights: "rising", exponent: -1 }), /exponent is -1/);
  fails(
    "BAD_OPTION",
    () => sparsePathFromRows(x, P, y, lasso({ weights: "rising" })),
    /polynomial order/,
    "penalty.weights",
  );
  fails(
    "BAD_OPTION",
    () => sparsePathFromRows(x, P, y, lasso({ weights: [1, 2] })),
    /2 weights were given for 10 design columns/,
    "penalty.weights",
  );
  fails(
    "BAD_OPTION",
    () => sparsePathFromRows(x, P, y, lasso(), { gamma: new Array(P).fill(0) }),
    /every column weight is 0/,
    "gamma",
  );
  // two identical unpenalized columns: their least-squares coefficients are not determined
  const twin = Float64Array.from(
    { length: n * 3 },
    (_, k) => x[Math.floor(k / 3) * P + [2, 2, 3][k % 3]],
  );
  fails(
    "RANK_DEFICIENT",
    () => sparsePathFromRows(twin, 3, y, lasso({ weights: [0, 0, 1] })),
    /unpenalized design columns \(weight 0: columns 1, 2\) are collinear/,
    "penalty.weights",
  );
});
