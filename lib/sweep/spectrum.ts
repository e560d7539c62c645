/**
 * Ridge solutions for every λ from one eigendecomposition of a training summary.
 *
 * With training co-moments S (centered when there is an intercept, raw otherwise), column scales
 * s_q (training SD, divisor n, or 1) and weights γ_q, let m_q = 1/(√γ_q s_q) and
 * diag(m) S_xx diag(m) = V diag(e) Vᵀ, g = Vᵀ (m ⊙ S_xy). Then for the objective
 * Σ residual² + λ Σ γ_q (s_q w_q)²:
 *   h_j(λ) = g_j/(e_j+λ),  w = m ⊙ (V h),  b = ȳ − x̄ᵀw,
 *   df = Σ e_j/(e_j+λ),    C = Σ h_j²,     RSS = S_yy − Σ g_j² (e_j+2λ)/(e_j+λ)².
 * A held-out summary (n_v, x̄_v, ȳ_v, S_v) gives its squared error without its rows:
 *   SSE_v = S_v,yy − 2 hᵀa + hᵀBh + n_v (ȳ_v − b − x̄_vᵀ w)²,
 * with B = Vᵀ diag(m) S_v,xx diag(m) V and a = Vᵀ (m ⊙ S_v,xy) formed once per fold, so each λ
 * costs O(p²) (common practice for cross-validated ridge; the algebra is Hastie, Tibshirani &
 * Friedman, *Elements of Statistical Learning* 2nd ed., §3.4.1).
 *
 * @module
 */
import { symmetricEigen } from "../numeric/eigen.ts";
import type { Moments } from "./moments.ts";

/** A training summary, decomposed. */
export interface Spectrum {
  readonly p: number;
  readonly count: number;
  readonly e: Float64Array;
  readonly vectors: readonly Float64Array[];
  readonly metric: Float64Array;
  readonly g: Float64Array;
  readonly syy: number;
  readonly meanX: Float64Array;
  readonly meanY: number;
  readonly intercept: boolean;
  /** Column scales used for standardization (1 when off). */
  readonly scales: Float64Array;
}

/** Options shared by every fold. */
export interface SpectrumOptions {
  readonly gamma: Float64Array;
  readonly standardize: boolean;
  readonly intercept: boolean;
}

/**
 * Decomposes a training summary.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "./moments.ts";
 * import { decompose, solutionAt } from "./spectrum.ts";
 * const [m] = bucketMoments(Float64Array.of(0, 1, 2), 1, Float64Array.of(1, 3, 5), Int32Array.of(0, 0, 0), 1);
 * const sp = decompose(m, { gamma: Float64Array.of(1), standardize: false, intercept: true });
 * console.log(solutionAt(sp, 0).w[0]); // 2
 * ```
 */
export function decompose(train: Moments, options: SpectrumOptions): Spectrum {
  const p = train.d - 1;
  const d = train.d;
  const scales = Float64Array.from(
    { length: p },
    (_, q) => options.standardize ? Math.sqrt(train.cross[q * d + q] / train.count) : 1,
  );
  const m = asRegression(train, options.intercept);
  const metric = Float64Array.from(scales, (s, q) => 1 / (Math.sqrt(options.gamma[q]) * s));
  const a = new Float64Array(p * p);
  for (let i = 0; i < p; i++) {
    for (let j = 0; j < p; j++) a[i * p + j] = metric[i] * m.cross[i * d + j] * metric[j];
  }
  const { values, vectors } = symmetricEigen(a, p);
  const e = values.map((v) => Math.max(v, 0));
  const g = Float64Array.from(vectors, (v) => {
    let s = 0;
    for (let q = 0; q < p; q++) s += v[q] * metric[q] * m.cross[q * d + p];
    return s;
  });
  return {
    p,
    count: train.count,
    e,
    vectors,
    metric,
    g,
    syy: m.cross[p * d + p],
    meanX: m.mean.slice(0, p),
    meanY: m.mean[p],
    intercept: options.intercept,
    scales,
  };
}

/** Without an intercept the model fits raw (uncentered) moments about zero. */
function asRegression(m: Moments, intercept: boolean): Moments {
  if (intercept) return m;
  const d = m.d;
  const cross = Float64Array.from(m.cross);
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < d; j++) cross[i * d + j] += m.count * m.mean[i] * m.mean[j];
  }
  return { count: m.count, d, mean: new Float64Array(d), cross };
}

/** Eigenvalues at or below this share of the largest count as zero (only matters at λ = 0). */
const NULL_SHARE = 1e-12;

/** h_j(λ) = g_j/(e_j + λ), with directions of zero curvature left at 0 (minimum norm). */
export function spectralWeights(
  sp: Spectrum,
  lambda: number,
  out: Float64Array = new Float64Array(sp.e.length),
): Float64Array {
  const floor = NULL_SHARE * (sp.e[0] ?? 0);
  for (let j = 0; j < out.length; j++) {
    const e = sp.e[j];
    out[j] = e + lambda > floor ? sp.g[j] / (e + lambda) : 0;
  }
  return out;
}

/** Everything about the training fit at one λ. */
export interface SolutionAt {
  readonly w: Float64Array;
  readonly intercept: number;
  readonly df: number;
  readonly budget: number;
  readonly rss: number;
}

/** Coefficients, intercept, df, C and training RSS at λ. */
export function solutionAt(sp: Spectrum, lambda: number): SolutionAt {
  const h = spectralWeights(sp, lambda);
  const w = coefficientsFrom(sp, h);
  let df = 0, budget = 0;
  sp.e.forEach((e, j) => {
    if (h[j] === 0) return;
    df += e / (e + lambda);
    budget += h[j] * h[j];
  });
  let intercept = 0;
  if (sp.intercept) {
    intercept = sp.meanY;
    for (let q = 0; q < sp.p; q++) intercept -= sp.meanX[q] * w[q];
  }
  return { w, intercept, df, budget, rss: rssFrom(sp, h, lambda) };
}

/**
 * Training RSS at λ alone, O(p): what the fold loop needs.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "./moments.ts";
 * import { decompose, trainingRss } from "./spectrum.ts";
 * const [m] = bucketMoments(Float64Array.of(0, 1, 2), 1, Float64Array.of(1, 3, 5), Int32Array.of(0, 0, 0), 1);
 * const sp = decompose(m, { gamma: Float64Array.of(1), standardize: false, intercept: true });
 * console.log(trainingRss(sp, 0)); // 0
 * ```
 */
export function trainingRss(sp: Spectrum, lambda: number): number {
  return rssFrom(sp, spectralWeights(sp, lambda), lambda);
}

/** RSS = S_yy − Σ h_j g_j (e_j + 2λ)/(e_j + λ), floored at 0. */
function rssFrom(sp: Spectrum, h: Float64Array, lambda: number): number {
  let explained = 0;
  for (let j = 0; j < h.length; j++) {
    if (h[j] === 0) continue;
    const e = sp.e[j];
    explained += h[j] * sp.g[j] * (e + 2 * lambda) / (e + lambda);
  }
  return Math.max(sp.syy - explained, 0);
}

function coefficientsFrom(sp: Spectrum, h: Float64Array): Float64Array {
  const w = new Float64Array(sp.p);
  sp.vectors.forEach((v, j) => {
    if (h[j] === 0) return;
    for (let q = 0; q < sp.p; q++) w[q] += v[q] * h[j];
  });
  for (let q = 0; q < sp.p; q++) w[q] *= sp.metric[q];
  return w;
}

/**
 * Mean squared error on held-out rows for each λ, from their summary alone.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "./moments.ts";
 * import { decompose, heldOutErrors } from "./spectrum.ts";
 * const x = Float64Array.of(0, 1, 2, 3), y = Float64Array.of(1, 3, 5, 7);
 * const [tr, va] = bucketMoments(x, 1, y, Int32Array.of(0, 0, 0, 1), 2);
 * const sp = decompose(tr, { gamma: Float64Array.of(1), standardize: true, intercept: true });
 * console.log(heldOutErrors(sp, va, [0])[0] < 1e-20); // true
 * ```
 */
export function heldOutErrors(
  sp: Spectrum,
  validation: Moments,
  lambdas: readonly number[],
): Float64Array {
  const p = sp.p;
  const d = p + 1;
  const v = asRegression(validation, sp.intercept);
  const m = sp.metric;
  // B = Vᵀ diag(m) S_xx diag(m) V, a = Vᵀ(m ⊙ S_xy), mv = Vᵀ(m ⊙ x̄_v), mt = Vᵀ(m ⊙ x̄_t)
  const sv = new Float64Array(p * p);
  const t = new Float64Array(p);
  for (let j = 0; j < p; j++) {
    const vec = sp.vectors[j];
    for (let r = 0; r < p; r++) {
      let s = 0;
      for (let q = 0; q < p; q++) s += v.cross[r * d + q] * m[q] * vec[q];
      t[r] = s * m[r];
    }
    for (let i = 0; i <= j; i++) {
      const vec2 = sp.vectors[i];
      let s = 0;
      for (let r = 0; r < p; r++) s += vec2[r] * t[r];
      sv[i * p + j] = s;
      sv[j * p + i] = s;
    }
  }
  const a = project(sp, (q) => v.cross[q * d + p]);
  const mv = project(sp, (q) => v.mean[q]);
  const mt = project(sp, (q) => sp.meanX[q]);
  const syy = v.cross[p * d + p];
  const h = new Float64Array(p);
  return Float64Array.from(lambdas, (lambda) => {
    spectralWeights(sp, lambda, h);
    let quad = 0, lin = 0, atV = 0, atT = 0;
    for (let i = 0; i < p; i++) {
      if (h[i] === 0) continue;
      let row = 0;
      for (let j = 0; j < p; j++) row += sv[i * p + j] * h[j];
      quad += h[i] * row;
      lin += h[i] * a[i];
      atV += h[i] * mv[i];
      atT += h[i] * mt[i];
    }
    const b = sp.intercept ? sp.meanY - atT : 0;
    const offset = sp.intercept ? v.mean[p] - b - atV : 0;
    const sse = syy - 2 * lin + quad + validation.count * offset * offset;
    return Math.max(sse, 0) / validation.count;
  });
}

/** Vᵀ(m ⊙ x): each eigenvector's product with the metric-scaled vector x(q). */
function project(sp: Spectrum, x: (q: number) => number): Float64Array {
  const out = new Float64Array(sp.p);
  for (let j = 0; j < sp.p; j++) {
    const vec = sp.vectors[j];
    let s = 0;
    for (let q = 0; q < sp.p; q++) s += vec[q] * sp.metric[q] * x(q);
    out[j] = s;
  }
  return out;
}
