/**
 * The sparse solvers' view of a training summary: the per-observation Gram matrix of the
 * standardized design and its covariances with the target. From a Moments summary (count N,
 * means x̄, ȳ, centered co-moments S) and column scales s_q (training SD with divisor N when
 * standardizing, else 1):
 *   G_qr = T_qr / (N s_q s_r),   c_q = T_qy / (N s_q),   v_y = T_yy / N,
 * where T = S with an intercept (the centered problem; the intercept is then b = ȳ − x̄ᵀw), and
 * T = S + N m mᵀ (moments about zero, m = (x̄, ȳ)) without one. Then for standardized
 * coefficients w*, (1/N) Σᵢ (yᵢ − b − xᵢᵀw)² = v_y − 2cᵀw* + w*ᵀG w*, so a coordinate-descent
 * solver needs only (G, c, v_y): O(p²) numbers, whatever the row count (Friedman, Hastie &
 * Tibshirani 2010, J. Stat. Softw. 33, §2.2 "covariance updates").
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Moments } from "../sweep/moments.ts";

/** A training summary in the form the coordinate-descent solver uses. */
export interface GramProblem {
  readonly p: number;
  /** Training row count N. */
  readonly count: number;
  /** G, p×p row-major, symmetric (per observation; unit diagonal when standardized). */
  readonly gram: Float64Array;
  /** c: covariances of the standardized columns with the target (per observation). */
  readonly covariance: Float64Array;
  /** v_y: the target's mean square about ȳ (about 0 without an intercept). */
  readonly targetSquare: number;
  /** Column scales s_q (training SD, divisor N, or 1 when not standardizing). */
  readonly scales: Float64Array;
  readonly meanX: Float64Array;
  readonly meanY: number;
  readonly standardize: boolean;
  readonly intercept: boolean;
}

/** How to read a summary: standardize columns (default true), fit an intercept (default true). */
export interface GramOptions {
  readonly standardize?: boolean;
  readonly intercept?: boolean;
  /** Design column names, for error messages (default "column 1", "column 2", …). */
  readonly names?: readonly string[];
  /** Which rows the summary covers, for error messages (default "training rows"). */
  readonly where?: string;
}

/**
 * The Gram form of a training summary. Throws CurbfitError when there are fewer than 2 rows,
 * a value is not finite, a column is constant (cannot be standardized or carries no
 * information), or the target is constant.
 *
 * @example
 * ```ts
 * import { bucketMoments } from "../sweep/moments.ts";
 * import { gramProblem } from "./gram.ts";
 * const x = Float64Array.of(1, 0, 2, 1, 3, 1, 4, 0), y = Float64Array.of(1, 2, 4, 3);
 * const [m] = bucketMoments(x, 2, y, new Int32Array(4), 1);
 * const g = gramProblem(m);
 * console.log(g.gram[0], g.count); // ≈ 1 (standardized: unit diagonal) 4
 * ```
 */
export function gramProblem(train: Moments, options: GramOptions = {}): GramProblem {
  const standardize = options.standardize ?? true;
  const intercept = options.intercept ?? true;
  const where = options.where ?? "training rows";
  const name = (q: number) => options.names?.[q] ?? `column ${q + 1}`;
  const { count: n, d, mean, cross } = train;
  const p = d - 1;
  if (!(n >= 2)) {
    throw new CurbfitError(
      "TOO_FEW_ROWS",
      `there are ${n} ${where}, but a sparse fit needs at least 2`,
      "Use fewer folds or more data",
      { option: "folds" },
    );
  }
  if (!mean.every(Number.isFinite) || !cross.every(Number.isFinite)) {
    throw new CurbfitError(
      "NOT_FINITE",
      `the summary of the ${where} holds a value that is not a finite number`,
      "Remove or replace infinite and missing values before fitting",
    );
  }
  const shift = intercept ? 0 : n;
  const about = (i: number, j: number) => cross[i * d + j] + shift * mean[i] * mean[j];
  const scales = Float64Array.from(
    { length: p },
    (_, q) => standardize ? Math.sqrt(cross[q * d + q] / n) : 1,
  );
  for (let q = 0; q < p; q++) {
    if (!(scales[q] > 0 && about(q, q) > 0)) {
      throw new CurbfitError(
        "CONSTANT_COLUMN",
        `design column ${name(q)} is constant over the ${where}, so it cannot be ` +
          (standardize ? "standardized" : "fitted"),
        "Use grouped or more folds so every level and value range appears in training, or drop the term",
        { column: name(q) },
      );
    }
  }
  const gram = new Float64Array(p * p);
  for (let q = 0; q < p; q++) {
    for (let r = 0; r < p; r++) gram[q * p + r] = about(q, r) / (n * scales[q] * scales[r]);
  }
  const covariance = Float64Array.from(scales, (s, q) => about(q, p) / (n * s));
  const targetSquare = about(p, p) / n;
  if (!(targetSquare > 0)) {
    throw new CurbfitError(
      "CONSTANT_TARGET",
      `the target is ${intercept ? "constant" : "zero"} over the ${where}`,
      "There is nothing to fit; check the target column",
    );
  }
  return {
    p,
    count: n,
    gram,
    covariance,
    targetSquare,
    scales,
    meanX: mean.slice(0, p),
    meanY: mean[p],
    standardize,
    intercept,
  };
}
