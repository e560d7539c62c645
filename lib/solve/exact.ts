/**
 * The exact solver: regularized least squares on the data matrix by Householder QR, polished by
 * augmented-system iterative refinement (Björck 1967, "Iterative refinement of linear least
 * squares solutions I", BIT 7) with residuals computed in double-double.
 *
 * Problem (augmented-error convention, sum-of-squares units):
 *   minimize Σᵢ (yᵢ − b − Σ_q Z_iq w_q)² + Σ_q c_q² w_q²
 * where c_q = √(λ γ_q) · s_q is supplied by the caller (s_q the column's scale). The penalty
 * enters as p extra rows of the matrix A = [1 Z; 0 diag(c)], so λ = 0 is ordinary least squares
 * and the intercept b is never penalized. The normal equations are never formed.
 *
 * One Householder QR of the data rows, Z₀ = Q₀R₀, serves every λ: the penalty rows are folded in
 * by a small QR of [R₀; diag(c)] (the standard update for appended rows; Golub & Van Loan,
 * *Matrix Computations*, 4th ed., §6.5), so A = Q R with Q = diag(Q₀, I)·Q_s. R₀ also gives the
 * unpenalized triangular factor the spectral form needs (df, condition, budget).
 *
 * @module
 */
import {
  applyQ,
  applyQt,
  type HouseholderQR,
  householderQR,
  rEntry,
  solveR,
  solveRt,
} from "../numeric/qr.ts";
import { DDAccumulator } from "../numeric/dd.ts";
import { type ColumnSums, columnsWithLo, residualPass, residualSumOfSquares } from "./residuals.ts";
import type { DesignBlock } from "../design/types.ts";
import type { Triangular } from "./spectral.ts";

/** A least-squares problem with a double-double design (row-major n×p). */
export interface LsProblem {
  readonly n: number;
  readonly p: number;
  readonly hi: Float64Array;
  readonly lo: Float64Array | null;
  readonly y: Float64Array;
  readonly intercept: boolean;
  /** c_q = √(λγ_q)·s_q per column; omitted or all zero for no penalty. */
  readonly penaltyRoot?: Float64Array;
}

/** The refined solution. */
export interface LsSolution {
  /** Intercept (0 when the problem has none). */
  readonly intercept: number;
  /** Coefficients on the design's own scale. */
  readonly w: Float64Array;
  /** Σᵢ residualᵢ² over the data rows, from double-double residuals. */
  readonly rss: number;
  /** Refinement steps taken. */
  readonly iterations: number;
  /** Relative size of the last correction (‖δx‖∞/‖x‖∞, scaled units). */
  readonly lastCorrection: number;
}

/**
 * The QR factorization of the data rows [1 Z] (or [Z]), each column scaled by an exact power of
 * two to unit max-abs (so scaling adds no rounding).
 */
export interface DataFactor {
  readonly n: number;
  readonly p: number;
  readonly intercept: boolean;
  readonly qr: HouseholderQR;
  /** Power-of-two scale of each factored column (1 for the intercept). */
  readonly scale: Float64Array;
  /** Per design column: 1 when any of its lo parts is nonzero (see `columnsWithLo`). */
  readonly withLo: Uint8Array;
}

const MAX_STEPS = 40;
/**
 * Converged when the correction is at most 2⁻⁵⁴ of max |x|: below half an ulp of the largest
 * component, so further steps only move the last bits (on the NIST StRD sets they then flip
 * one ulp back and forth). Stricter thresholds cost a step without changing any LRE.
 */
const CONVERGED = 2 ** -54;
/** Rows per block when transposing the design (a block of p doubles per row stays in cache). */
const TRANSPOSE_ROWS = 256;

/**
 * Factors the data rows of a design once (one copy, one QR).
 *
 * @example
 * ```ts
 * import { factorData } from "./exact.ts";
 * const f = factorData({ n: 3, p: 1, hi: Float64Array.of(0, 1, 2), lo: new Float64Array(3) }, true);
 * console.log(f.qr.n); // 2: intercept and one column
 * ```
 */
export function factorData(block: DesignBlock, intercept: boolean): DataFactor {
  const { n, p, hi } = block;
  const off = intercept ? 1 : 0;
  const scale = new Float64Array(off + p).fill(1);
  const maxAbs = new Float64Array(p);
  for (let i = 0; i < n; i++) {
    const row = i * p;
    for (let q = 0; q < p; q++) {
      const v = Math.abs(hi[row + q]);
      if (v > maxAbs[q]) maxAbs[q] = v;
    }
  }
  maxAbs.forEach((m, q) => (scale[off + q] = m > 0 ? 2 ** -Math.floor(Math.log2(m)) : 1));
  const cols = Array.from({ length: off + p }, () => new Float64Array(n));
  if (intercept) cols[0].fill(1);
  // Transpose in blocks of rows, so each block of the row-major design is read from cache.
  for (let start = 0; start < n; start += TRANSPOSE_ROWS) {
    const end = Math.min(n, start + TRANSPOSE_ROWS);
    for (let q = 0; q < p; q++) {
      const col = cols[off + q];
      const sq = scale[off + q];
      for (let i = start; i < end; i++) col[i] = hi[i * p + q] * sq;
    }
  }
  const withLo = columnsWithLo(block);
  return { n, p, intercept, qr: householderQR(cols, n), scale, withLo };
}

/**
 * R, z and ρ² of the unpenalized problem from the data factor: R in the design's own units
 * (the trailing block after the intercept: the centered problem), z the matching part of Qᵀy.
 *
 * @example
 * ```ts
 * import { factorData, triangularOf } from "./exact.ts";
 * const f = factorData({ n: 3, p: 1, hi: Float64Array.of(0, 1, 2), lo: new Float64Array(3) }, true);
 * console.log(triangularOf(f, Float64Array.of(1, 3, 5)).rho2 < 1e-20); // true
 * ```
 */
export function triangularOf(factor: DataFactor, y: Float64Array): Triangular {
  const { n, p, qr, scale } = factor;
  const off = factor.intercept ? 1 : 0;
  const qty = Float64Array.from(y);
  applyQt(qr, qty);
  const r = Array.from({ length: p }, (_, q) => {
    const col = new Float64Array(p);
    for (let i = 0; i <= q; i++) col[i] = rEntry(qr, i + off, q + off) / scale[q + off];
    return col;
  });
  let rho2 = 0;
  for (let i = off + p; i < n; i++) rho2 += qty[i] * qty[i];
  return { r, z: qty.slice(off, off + p), rho2 };
}

/**
 * Solves the problem to (near) full double precision in the coefficients, reusing `factor`
 * (from `factorData` of the same design) when given.
 *
 * @example
 * ```ts
 * import { solveRefined } from "./exact.ts";
 * const sol = solveRefined({
 *   n: 3, p: 1, hi: Float64Array.of(0, 1, 2), lo: new Float64Array(3),
 *   y: Float64Array.of(1, 3, 5), intercept: true,
 * });
 * console.log(sol.intercept, sol.w[0]); // 1 2
 * ```
 */
export function solveRefined(problem: LsProblem, factor?: DataFactor): LsSolution {
  const data = factor ?? factorData(problem, problem.intercept);
  const ortho = augmentedFactor(data, problem.penaltyRoot);
  const { n } = problem;
  const nc = data.scale.length;
  const m = n + ortho.penaltyRows;
  const x = new Float64Array(nc);
  const r = new Float64Array(m);
  // Work vectors of length m, reused by every step.
  const f = new Float64Array(m);
  const qtf = new Float64Array(m);
  const dr = new Float64Array(m);
  const sums = { hi: new Float64Array(nc), lo: new Float64Array(nc), intercept: problem.intercept };
  let steps = 0;
  let last = Infinity;
  for (; steps < MAX_STEPS; steps++) {
    residualF(problem, data, ortho, x, r, f, sums);
    const g = residualG(problem, data, ortho, r, sums);
    // Solve [I A; Aᵀ 0][δr; δx] = [f; g] with A = Q[R; 0] (Björck 1967).
    const h = ortho.solveRt(g);
    ortho.qt(f, qtf);
    const d1h = new Float64Array(nc);
    for (let j = 0; j < nc; j++) d1h[j] = qtf[j] - h[j];
    const dx = ortho.solveR(d1h);
    qtf.set(h);
    ortho.q(qtf, dr);
    let dxMax = 0, xMax = 0;
    for (let j = 0; j < nc; j++) {
      x[j] += dx[j];
      dxMax = Math.max(dxMax, Math.abs(dx[j]));
      xMax = Math.max(xMax, Math.abs(x[j]));
    }
    for (let i = 0; i < m; i++) r[i] += dr[i];
    const rel = xMax === 0 ? 0 : dxMax / xMax;
    const stalled = steps >= 2 && rel > 0.5 * last;
    last = rel;
    if (rel <= CONVERGED || stalled) {
      steps++;
      break;
    }
  }
  for (let j = 0; j < nc; j++) x[j] *= data.scale[j];
  const off = problem.intercept ? 1 : 0;
  const w = x.slice(off);
  const intercept = problem.intercept ? x[0] : 0;
  return {
    intercept,
    w,
    rss: residualSumOfSquares(problem, intercept, w, data.withLo),
    iterations: steps,
    lastCorrection: last,
  };
}

/**
 * The orthogonal factor of A = [1 Z; 0 diag(c)] (scaled), as operations. Vectors in the
 * rotated space are laid out as [the nc + (penalty rows) entries of the small factor's space,
 * then the n − nc trailing entries of Q₀ᵀ's data part].
 */
interface AugmentedFactor {
  readonly penaltyRows: number;
  /** Penalty row value of factored column j (scaled units), 0 for the intercept. */
  readonly penalty: Float64Array;
  /** out ← Qᵀ v (both of length n + penaltyRows, distinct). */
  qt(v: Float64Array, out: Float64Array): void;
  /** out ← Q v (both of length n + penaltyRows, distinct). */
  q(v: Float64Array, out: Float64Array): void;
  solveR(b: Float64Array): Float64Array;
  solveRt(b: Float64Array): Float64Array;
}

function augmentedFactor(data: DataFactor, root: Float64Array | undefined): AugmentedFactor {
  const { n, qr } = data;
  const nc = data.scale.length;
  const off = data.intercept ? 1 : 0;
  const penalty = new Float64Array(nc);
  if (root) root.forEach((c, q) => (penalty[off + q] = c * data.scale[off + q]));
  const rows = root !== undefined && root.some((c) => c > 0) ? data.p : 0;
  // Small factor of [R₀; P] ((nc + rows) × nc), or R₀ itself when there is no penalty.
  const small = householderQR(
    Array.from({ length: nc }, (_, j) => {
      const col = new Float64Array(nc + rows);
      for (let i = 0; i <= j; i++) col[i] = rEntry(qr, i, j);
      if (rows > 0 && j >= off) col[nc + j - off] = penalty[j];
      return col;
    }),
    nc + rows,
  );
  const mid = nc + rows;
  const work = new Float64Array(n);
  const head = new Float64Array(mid);
  return {
    penaltyRows: rows,
    penalty,
    qt(v, out) {
      work.set(v.subarray(0, n));
      applyQt(qr, work);
      out.set(work.subarray(0, nc));
      out.set(v.subarray(n, n + rows), nc);
      applyQt(small, out.subarray(0, mid));
      out.set(work.subarray(nc), mid);
    },
    q(v, out) {
      head.set(v.subarray(0, mid));
      applyQ(small, head);
      work.set(head.subarray(0, nc));
      work.set(v.subarray(mid), nc);
      applyQ(qr, work);
      out.set(work);
      out.set(head.subarray(nc), n);
    },
    solveR: (b) => solveR(small, b),
    solveRt: (b) => solveRt(small, b),
  };
}

/**
 * f ← b − r − A x in double-double (data rows from the row-major design, then penalty rows),
 * and, in the same pass over the design, the data rows' part of Aᵀr into `sums`.
 */
function residualF(
  problem: LsProblem,
  data: DataFactor,
  ortho: AugmentedFactor,
  x: Float64Array,
  r: Float64Array,
  f: Float64Array,
  sums: ColumnSums,
): void {
  const { n } = problem;
  const off = problem.intercept ? 1 : 0;
  const w = Float64Array.from(x.subarray(off), (v, q) => v * data.scale[off + q]);
  residualPass(problem, data.withLo, off ? x[0] : 0, w, { r, out: f, sums, multiplier: "given" });
  const acc = new DDAccumulator();
  for (let q = 0; q < ortho.penaltyRows; q++) {
    acc.reset();
    acc.add(-r[n + q]);
    acc.addProduct(-ortho.penalty[off + q], x[off + q]);
    f[n + q] = acc.value();
  }
}

/** g = −Aᵀ r in double-double from the data rows' column sums and the penalty rows. */
function residualG(
  problem: LsProblem,
  data: DataFactor,
  ortho: AugmentedFactor,
  r: Float64Array,
  sums: ColumnSums,
): Float64Array {
  const { n } = problem;
  const off = problem.intercept ? 1 : 0;
  const sumLo = sums.lo;
  // Column j of the scaled matrix is the design column times scale[j], an exact power of two, so
  // the penalty entry divided by it is exactly c_q.
  const acc = new DDAccumulator();
  return Float64Array.from(sums.hi, (h, j) => {
    acc.hi = h;
    acc.lo = sumLo[j];
    if (j >= off && j - off < ortho.penaltyRows) {
      acc.addProduct(ortho.penalty[j] / data.scale[j], r[n + j - off]);
    }
    return -acc.value() * data.scale[j];
  });
}
