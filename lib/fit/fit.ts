/**
 * `fit`: one regularized least-squares model on all rows, solved exactly.
 *
 * Objective (augmented-error convention, sum-of-squares units):
 *   minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q (s_q w_q)²
 * with s_q the training SD of design column q (divisor n) when `standardize` is on (default),
 * else 1. Per observation this is E_in + (λ/N)·Σ γ_q w*_q². The intercept b is never penalized.
 * The constraint form minimizes E_in subject to Σ γ_q (s_q w_q)² ≤ C.
 *
 * With `penalty: lasso()` or `elasticNet({ mix })` the strength is `alpha`, in the 1/(2N)
 * convention: minimize (1/(2N)) Σᵢ (yᵢ − b − zᵢᵀw)² + α Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²]
 * (γ_q from the penalty's `weights`, resolved per column as for ridge; all 1 without them),
 * solved by coordinate descent (sparse_fit.ts). `lambda`/`budget` belong to ridge and `alpha` to
 * the sparse penalties; mixing them is an error, and every summary says its `scale`.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { deepFreeze } from "../common/freeze.ts";
import type { Design, LearnedTerm, Term } from "../design/types.ts";
import { buildDesign, learnTerms } from "../design/mod.ts";
import type { Table } from "../table/types.ts";
import { type ColumnArrays, type RowObjects, toTable } from "../table/mod.ts";
import { degreesOfFreedom, lambdaForBudget } from "../solve/spectral.ts";
import {
  allRowsMoments,
  type KnownSummaries,
  solveOn,
  solverBasis,
  spectralFormOf,
} from "./solver.ts";
import { jacobiSvd } from "../numeric/svd.ts";
import { DDAccumulator } from "../numeric/dd.ts";
import {
  checkStrengthOptions,
  isSparse,
  objectiveText,
  type Penalty,
  penaltyWeights,
  ridge,
  type StrengthScale,
} from "./penalty.ts";
import { allRowsPath, sparseSummary } from "./sparse_fit.ts";
import type { SparsePath } from "../sparse/mod.ts";
import { columnScales } from "./scale.ts";
import { fitBundle, JUPYTER_DISPLAY } from "../views/display.ts";
import type { ShownBundle } from "../views/charts/show.ts";

/** In-memory data accepted wherever a Table is: row objects or named column arrays. */
export type TableInput = RowObjects | ColumnArrays;

/** What to fit. */
export interface FitSpec {
  /** Name of the numeric column to predict. */
  readonly target: string;
  /** Terms of the model (the intercept is separate; see `intercept`). */
  readonly terms: readonly Term[];
  /** Penalty; default `ridge()` (γ_q = 1); or `lasso()` / `elasticNet({ mix })`. */
  readonly penalty?: Penalty;
  /** Ridge only: strength λ ≥ 0 in sum-of-squares units; default 0 (ordinary least squares). */
  readonly lambda?: number;
  /** Ridge only, instead of λ: the budget C > 0 of the constraint Σ γ_q w*_q² ≤ C. */
  readonly budget?: number;
  /** Lasso / elastic net only (required there): strength α > 0 in the 1/(2N) convention. */
  readonly alpha?: number;
  /** Lasso / elastic net only: largest scaled KKT violation accepted (default 10⁻⁷). */
  readonly tolerance?: number;
  /** Standardize design columns with training statistics (default true). */
  readonly standardize?: boolean;
  /** Fit an unpenalized intercept (default true). */
  readonly intercept?: boolean;
}

/** Predictions for new rows, with rows outside the training domain counted per term. */
export interface Prediction {
  /** One prediction per row, in row order (each formed in double-double, then rounded). */
  readonly values: Float64Array;
  /** Terms that met rows outside what they learned (e.g. a Legendre domain), with counts. */
  readonly outside: readonly { readonly label: string; readonly count: number }[];
}

/** Numbers describing one fitted model; every array is frozen. */
export interface FitSummary {
  /** Name of the predicted column. */
  readonly target: string;
  /** Rows fitted. */
  readonly n: number;
  /** Design column names, in coefficient order. */
  readonly names: readonly string[];
  /** Polynomial order of each design column. */
  readonly orders: readonly number[];
  /** The penalty: ridge with its weights, lasso, or elastic net with its mix. */
  readonly penalty: Penalty;
  /** Which convention `strength` is on: ridge λ ("lambda") or sparse α ("alpha"). */
  readonly scale: StrengthScale;
  /** The minimized objective, stated exactly. */
  readonly objective: string;
  /** γ_q per design column (all 1 for a sparse penalty without weights). */
  readonly gamma: readonly number[];
  /** Penalty strength: ridge λ (sum-of-squares units) or sparse α (1/(2N) units); see `scale`. */
  readonly strength: number;
  /**
   * Ridge: budget C(λ) = Σ γ_q (s_q w_q)² met by the solution. Sparse: the penalty's value per
   * unit α, Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] (‖w*‖₁ for the unweighted lasso).
   */
  readonly budget: number;
  /**
   * Effective degrees of freedom, intercept not counted. Ridge: Σ σ²/(σ²+λ). Sparse:
   * tr[(G_AA + α(1 − ρ)Γ_A)⁻¹ G_AA] over the active block of the (standardized) Gram matrix,
   * Γ = diag(γ) (lib/sparse/df.ts; Σ_j μ_j/(μ_j + α(1 − ρ)) over its eigenvalues μ_j with equal
   * weights) — the nonzero count for the lasso, below it for the elastic net.
   */
  readonly df: number;
  /** Number of nonzero coefficients. */
  readonly nonzero: number;
  /** Intercept and coefficients on the original scale of the data. */
  readonly intercept: number;
  /** One coefficient per design column, on the original scale (see `intercept`). */
  readonly coefficients: readonly number[];
  /** On the standardized scale: w*_q = s_q w_q, intercept = prediction at the column means. */
  readonly standardized: { readonly intercept: number; readonly coefficients: readonly number[] };
  /** Whether columns were standardized (the penalty then acts on w*_q = s_q w_q). */
  readonly standardize: boolean;
  /** Whether an unpenalized intercept was fitted. */
  readonly hasIntercept: boolean;
  /** Column means of the training rows (0 when not standardizing). */
  readonly means: readonly number[];
  /** Column SDs (divisor n) of the training rows (1 when not standardizing). */
  readonly sds: readonly number[];
  /** Σ residual² / n on the training rows. */
  readonly trainMse: number;
  /** √(RSS / (n − intercept − df)): the OLS residual SD at λ = 0. */
  readonly residualSd: number;
  /** 2-norm condition number of the (centered) standardized design. */
  readonly condition: number;
  /** Iterative-refinement steps of the exact solver (0 for sparse fits). */
  readonly refinementSteps: number;
  /** Sparse fits: coordinate-descent report (KKT violation, duality gap per observation); else null. */
  readonly descent: {
    readonly passes: number;
    readonly violation: number;
    readonly converged: boolean;
    readonly gap: number;
    readonly tolerance: number;
  } | null;
}

/** Largest condition number accepted at λ = 0 before the design is called rank deficient. */
const RANK_LIMIT = 1e15;

/**
 * An immutable fitted model.
 *
 * @example
 * ```ts
 * import { fit, legendre } from "../../mod.ts";
 * const data = { x: [0, 1, 2, 3, 4, 5], y: [1.1, 2.9, 5.2, 6.8, 9.1, 11] };
 * const m = fit(data, { target: "y", terms: [legendre("x", 1)], lambda: 0.5 });
 * console.log(m.summary.coefficients, m.predict({ x: [2.5] }).values);
 * ```
 */
export class Fit {
  /** The fitted numbers. */
  readonly summary: FitSummary;
  /** The terms with their learned parameters. */
  readonly terms: readonly LearnedTerm[];

  /**
   * Wraps a summary and the learned terms that make its design; `fit`, `sweep` and `loadRecord`
   * build these.
   */
  constructor(summary: FitSummary, terms: readonly LearnedTerm[]) {
    this.summary = summary;
    this.terms = terms;
    Object.freeze(this);
  }

  /** Predicts the target for new rows (any input `toTable` accepts); counts extrapolation. */
  predict(data: Table | TableInput): Prediction {
    const table = toTable(data);
    const design = buildDesign(this.terms, table);
    const { n, p, hi, lo } = design.block;
    const w = this.summary.coefficients;
    const values = new Float64Array(n);
    const acc = new DDAccumulator();
    for (let i = 0; i < n; i++) {
      acc.reset();
      acc.add(this.summary.intercept);
      for (let q = 0; q < p; q++) {
        acc.addDDProduct(hi[i * p + q], lo === null ? 0 : lo[i * p + q], w[q]);
      }
      values[i] = acc.value();
    }
    return { values, outside: design.outside.filter((o) => o.count > 0) };
  }

  /** Jupyter display: the standardized coefficients as a chart, and the fit's numbers. */
  [JUPYTER_DISPLAY](): Promise<ShownBundle> {
    return fitBundle(this);
  }
}

/**
 * Fits one model on all rows of `data` with the exact solver (Householder QR plus
 * double-double iterative refinement), at a given λ or for a given budget C.
 *
 * @example
 * ```ts
 * import { fit, legendre, ridge } from "../../mod.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i / 19);
 * const y = x.map((v) => Math.sin(3 * v));
 * const m = fit({ x, y }, { target: "y", terms: [legendre("x", 8)], penalty: ridge(), budget: 1 });
 * console.log(m.summary.strength, m.summary.budget); // λ found for C = 1, and C = 1
 * ```
 */
export function fit(data: Table | TableInput, spec: FitSpec): Fit {
  checkStrength(spec);
  const table = toTable(data);
  const { y, terms, design } = prepare(table, spec);
  return fitPrepared(spec, terms, design, y);
}

/** Learned terms, design and target of a spec on a table (all rows). */
export function prepare(table: Table, spec: FitSpec) {
  checkSpec(spec);
  const y = targetValues(table, spec);
  const terms = learnTerms(spec.terms, table);
  const design = buildDesign(terms, table);
  return { y, terms, design };
}

/** Solution `index` of an already solved all-rows sparse path (a sparse sweep's final model). */
interface SolvedPath {
  readonly path: SparsePath;
  readonly index: number;
}

/**
 * The fit on an already built design: exact for ridge; for lasso / elastic net the all-rows
 * coordinate-descent solution at `spec.alpha`, or the `known.sparse` solution. `known` may also
 * carry the all-rows co-moments and their spectrum (a sweep has them), so they are not
 * computed again.
 */
export function fitPrepared(
  spec: FitSpec,
  terms: readonly LearnedTerm[],
  design: Design,
  y: Float64Array,
  known: KnownSummaries & { readonly sparse?: SolvedPath } = {},
): Fit {
  const standardize = spec.standardize ?? true;
  const intercept = spec.intercept ?? true;
  const penalty = spec.penalty ?? ridge();
  const { n, p } = design.block;
  const moments = known.moments ?? allRowsMoments(design.block, y);
  const scales = standardize ? columnScales(moments) : undefined;
  const sds = scales ? scales.sds : new Float64Array(p).fill(1);
  if (scales) checkNotConstant(design, sds, scales.means);
  const gamma = penaltyWeights(penalty, design.orders);
  // A sparse fit takes only the condition number from the basis, which uses unit weights (its
  // γ may hold zeros, which the ridge spectrum cannot take).
  const basisGamma = isSparse(penalty) ? new Float64Array(p).fill(1) : gamma;
  const options = { gamma: basisGamma, standardize, intercept };
  const basis = solverBasis(design, y, sds, options, { ...known, moments });
  const condition = basis.condition;
  if (isSparse(penalty)) {
    const options = { standardize, intercept, tolerance: spec.tolerance };
    const { path, index } = known.sparse ??
      { path: allRowsPath(design, moments, penalty, [spec.alpha as number], options), index: 0 };
    const summary = sparseSummary(path, path.solutions[index], {
      target: spec.target,
      design,
      penalty,
      condition,
    });
    return new Fit(summary, terms);
  }
  const sf = spectralFormOf(basis, sds, gamma);
  const lambda = spec.budget !== undefined ? lambdaForBudget(sf, spec.budget) : spec.lambda ?? 0;
  // The co-moments basis is only taken at condition ≤ 10⁵, where the rank is full.
  if (lambda === 0 && basis.kind === "rows") {
    checkRank(design, basis.triangular.r, sds, condition, n, intercept);
  }
  const penaltyRoot = Float64Array.from(gamma, (g, q) => Math.sqrt(lambda * g) * sds[q]);
  const sol = solveOn(basis, { ...design.block, y, intercept, penaltyRoot }, lambda);
  const w = Array.from(sol.w);
  const wStd = w.map((v, q) => v * sds[q]);
  const means = scales ? Array.from(scales.means) : new Array<number>(p).fill(0);
  const df = degreesOfFreedom(sf, lambda);
  const residualDf = n - (intercept ? 1 : 0) - df;
  const summary: FitSummary = deepFreeze({
    target: spec.target,
    n,
    names: [...design.names],
    orders: [...design.orders],
    penalty,
    scale: "lambda",
    objective: objectiveText(penalty),
    gamma: Array.from(gamma),
    strength: lambda,
    budget: wStd.reduce((s, v, q) => s + gamma[q] * v * v, 0),
    df,
    nonzero: w.filter((v) => v !== 0).length,
    intercept: sol.intercept,
    coefficients: w,
    standardized: {
      intercept: sol.intercept + w.reduce((s, v, q) => s + v * means[q], 0),
      coefficients: wStd,
    },
    standardize,
    hasIntercept: intercept,
    means,
    sds: Array.from(sds),
    trainMse: sol.rss / n,
    residualSd: residualDf > 0 ? Math.sqrt(sol.rss / residualDf) : NaN,
    condition,
    refinementSteps: sol.iterations,
    descent: null,
  });
  return new Fit(summary, terms);
}

function checkSpec(spec: FitSpec): void {
  if (typeof spec?.target !== "string") {
    throw new CurbfitError(
      "BAD_OPTION",
      "no target column was named",
      'Pass the column to predict, e.g. { target: "y", terms: [...] }',
      { option: "target" },
    );
  }
  if (!Array.isArray(spec.terms) || spec.terms.length === 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      "no terms were given",
      'Pass at least one term, e.g. terms: [legendre("x", 5)]',
      { option: "terms" },
    );
  }
}

function checkStrength(spec: FitSpec): void {
  const penalty = spec.penalty ?? ridge();
  checkStrengthOptions(penalty, spec as unknown as Record<string, unknown>);
  if (isSparse(penalty) && !(Number.isFinite(spec.alpha) && (spec.alpha as number) > 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      spec.alpha === undefined
        ? `a ${penalty.kind} fit needs alpha, and none was given`
        : `alpha is ${spec.alpha}, but it must be a finite number > 0`,
      "Give alpha > 0 in the 1/(2N) convention (or use sweep with alphas to choose it)",
      { option: "alpha" },
    );
  }
  if (spec.lambda !== undefined && spec.budget !== undefined) {
    throw new CurbfitError(
      "BAD_OPTION",
      "both lambda and budget were given",
      "Give either lambda (penalty strength) or budget (constraint size), not both",
      { option: "budget" },
    );
  }
  if (spec.lambda !== undefined && !(Number.isFinite(spec.lambda) && spec.lambda >= 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `lambda is ${spec.lambda}, but it must be a finite number >= 0`,
      "Use 0 for no penalty or a positive penalty strength",
      { option: "lambda" },
    );
  }
  if (spec.budget !== undefined && !(Number.isFinite(spec.budget) && spec.budget > 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `budget is ${spec.budget}, but it must be a finite number > 0`,
      "Give the size C of the constraint Σ γ_q w_q² ≤ C",
      { option: "budget" },
    );
  }
}

function targetValues(table: Table, spec: FitSpec): Float64Array {
  const col = table.columns.get(spec.target);
  if (col === undefined) {
    throw new CurbfitError(
      "UNKNOWN_COLUMN",
      `the target column ${JSON.stringify(spec.target)} is not in the data`,
      `Choose one of: ${table.names.join(", ")}`,
      { source: table.source, option: "target" },
    );
  }
  if (col.kind !== "number") {
    throw new CurbfitError(
      "BAD_OPTION",
      `the target column ${JSON.stringify(spec.target)} holds text, not numbers`,
      "Choose a numeric column as the target",
      { source: table.source, option: "target" },
    );
  }
  for (const term of spec.terms) {
    if (term.inputs.includes(spec.target)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `the target ${JSON.stringify(spec.target)} is also an input of ${term.label}`,
        "Remove that term or choose another target",
        { option: "terms" },
      );
    }
  }
  const v = col.values;
  if (isConstant(v)) {
    throw new CurbfitError(
      "CONSTANT_TARGET",
      `the target column ${JSON.stringify(spec.target)} has the same value (${
        v[0]
      }) in all ${v.length} rows`,
      "There is nothing to model; check that the right column and rows were loaded",
      { source: table.source, column: spec.target },
    );
  }
  // Read, never written: the table's own column serves (tables are immutable).
  return v;
}

function isConstant(values: Float64Array): boolean {
  for (let i = 1; i < values.length; i++) if (values[i] !== values[0]) return false;
  return true;
}

function checkNotConstant(design: Design, sds: Float64Array, means: Float64Array): void {
  sds.forEach((sd, q) => {
    if (!(sd > 1e-14 * Math.abs(means[q]))) {
      throw new CurbfitError(
        "CONSTANT_COLUMN",
        `design column ${
          design.names[q]
        } is constant over the ${design.n} rows, so it cannot be standardized`,
        "Remove the term that makes it, or check the data",
        { option: "terms" },
      );
    }
  });
}

function checkRank(
  design: Design,
  r: readonly Float64Array[],
  sds: Float64Array,
  condition: number,
  n: number,
  intercept: boolean,
): void {
  const coefficients = design.p + (intercept ? 1 : 0);
  if (n < coefficients) {
    throw new CurbfitError(
      "TOO_FEW_ROWS",
      `${n} rows cannot determine ${coefficients} coefficients without a penalty`,
      "Use fewer terms, more rows, or a penalty (lambda > 0)",
      { option: "lambda" },
    );
  }
  if (condition <= RANK_LIMIT) return;
  const { v } = jacobiSvd(r.map((col, q) => col.map((x) => x / sds[q])));
  const weakest = v[v.length - 1];
  const involved = design.names.filter((_, q) => Math.abs(weakest[q]) > 0.1);
  throw new CurbfitError(
    "RANK_DEFICIENT",
    `the design is rank deficient (condition number ${condition.toPrecision(3)}): ` +
      `columns ${involved.join(", ")} are (nearly) linearly dependent`,
    "Remove one of them, lower a degree, or use a penalty (lambda > 0)",
    { option: "terms" },
  );
}
