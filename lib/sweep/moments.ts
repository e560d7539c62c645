/**
 * Mergeable summaries of a set of rows: count, column means and centered co-moments of
 * [x₁ … x_p, y]. Two-pass within a set (means, then centered products); sets are combined and
 * removed with the pairwise formulas of Chan, Golub & LeVeque (1979, "Updating formulae and a
 * pairwise algorithm for computing sample variances"):
 *   S_{A∪B} = S_A + S_B + (n_A n_B / n) δδᵀ,  δ = mean_B − mean_A.
 * These are what the sweep solves from, so a row is read once however many λ are tried.
 *
 * @module
 */

/** Summary of rows over d = p + 1 columns (design columns, then the target last). */
export interface Moments {
  readonly count: number;
  readonly d: number;
  readonly mean: Float64Array;
  /** Centered co-moments Σ (v − mean)(v − mean)ᵀ, d×d row-major, symmetric. */
  readonly cross: Float64Array;
}

/** Empty summary over d columns. */
export function emptyMoments(d: number): Moments {
  return { count: 0, d, mean: new Float64Array(d), cross: new Float64Array(d * d) };
}

/**
 * Summaries of each bucket of rows: `bucket[i]` in 0..buckets−1 (or −1 to skip the row).
 * `x` is the n×p row-major design, `y` the target.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "./moments.ts";
 * const [m] = bucketMoments(Float64Array.of(1, 2, 3), 1, Float64Array.of(2, 4, 6), Int32Array.of(0, 0, 0), 1);
 * console.log(m.count, m.mean); // 3 Float64Array [2, 4]
 * ```
 */
export function bucketMoments(
  x: Float64Array,
  p: number,
  y: Float64Array,
  bucket: Int32Array,
  buckets: number,
): Moments[] {
  const d = p + 1;
  const n = y.length;
  const counts = new Float64Array(buckets);
  const means = Array.from({ length: buckets }, () => new Float64Array(d));
  for (let i = 0; i < n; i++) {
    const b = bucket[i];
    if (b < 0) continue;
    counts[b]++;
    const mean = means[b];
    for (let j = 0; j < p; j++) mean[j] += x[i * p + j];
    mean[p] += y[i];
  }
  means.forEach((m, b) => m.forEach((s, j) => (m[j] = counts[b] > 0 ? s / counts[b] : 0)));
  const crosses = centeredProducts(x, p, y, bucket, means);
  return crosses.map((cross, b) => {
    mirrorUpper(cross, d);
    return { count: counts[b], d, mean: means[b], cross };
  });
}

/** Rows staged per bucket before their products are added (a block of a rank-B update). */
const BLOCK = 32;

/**
 * Upper triangles of Σ (v − mean)(v − mean)ᵀ per bucket. Centered rows are staged column-major
 * in blocks of BLOCK rows per bucket, then added as dot products of length BLOCK: the same sums
 * in a cache-friendly order (about twice as fast as row-at-a-time outer products).
 */
function centeredProducts(
  x: Float64Array,
  p: number,
  y: Float64Array,
  bucket: Int32Array,
  means: readonly Float64Array[],
): Float64Array[] {
  const d = p + 1;
  const crosses = means.map(() => new Float64Array(d * d));
  const stage = means.map(() => new Float64Array(d * BLOCK));
  const fill = new Int32Array(means.length);
  const flush = (b: number) => {
    const s = stage[b], c = crosses[b], m = fill[b];
    for (let j = 0; j < d; j++) {
      const oj = j * BLOCK;
      for (let l = j; l < d; l++) {
        const ol = l * BLOCK;
        let acc = 0;
        for (let t = 0; t < m; t++) acc += s[oj + t] * s[ol + t];
        c[j * d + l] += acc;
      }
    }
    fill[b] = 0;
  };
  for (let i = 0; i < y.length; i++) {
    const b = bucket[i];
    if (b < 0) continue;
    const s = stage[b], mean = means[b], t = fill[b];
    for (let j = 0; j < p; j++) s[j * BLOCK + t] = x[i * p + j] - mean[j];
    s[p * BLOCK + t] = y[i] - mean[p];
    if (++fill[b] === BLOCK) flush(b);
  }
  for (let b = 0; b < means.length; b++) if (fill[b] > 0) flush(b);
  return crosses;
}

/** Summary of the union of disjoint row sets. */
export function mergeMoments(parts: readonly Moments[], d: number): Moments {
  let acc = emptyMoments(d);
  for (const part of parts) acc = mergePair(acc, part);
  return acc;
}

function mergePair(a: Moments, b: Moments): Moments {
  if (b.count === 0) return a;
  if (a.count === 0) return b;
  const d = a.d;
  const n = a.count + b.count;
  const delta = Float64Array.from(b.mean, (mb, j) => mb - a.mean[j]);
  const mean = Float64Array.from(a.mean, (ma, j) => ma + (delta[j] * b.count) / n);
  const f = (a.count * b.count) / n;
  const cross = new Float64Array(d * d);
  for (let j = 0; j < d; j++) {
    for (let l = 0; l < d; l++) {
      cross[j * d + l] = a.cross[j * d + l] + b.cross[j * d + l] + f * delta[j] * delta[l];
    }
  }
  return { count: n, d, mean, cross };
}

/** Summary of `whole` with the disjoint subset `part` removed (Chan et al.'s formula reversed). */
export function removeMoments(whole: Moments, part: Moments): Moments {
  const d = whole.d;
  const n = whole.count - part.count;
  if (part.count === 0) return whole;
  const mean = Float64Array.from(
    whole.mean,
    (mw, j) => (whole.count * mw - part.count * part.mean[j]) / n,
  );
  const delta = Float64Array.from(part.mean, (mp, j) => mp - mean[j]);
  const f = (n * part.count) / whole.count;
  const cross = new Float64Array(d * d);
  for (let j = 0; j < d; j++) {
    for (let l = 0; l < d; l++) {
      cross[j * d + l] = whole.cross[j * d + l] - part.cross[j * d + l] - f * delta[j] * delta[l];
    }
  }
  return { count: n, d, mean, cross };
}

function mirrorUpper(a: Float64Array, d: number): void {
  for (let j = 0; j < d; j++) for (let l = j + 1; l < d; l++) a[l * d + j] = a[j * d + l];
}
