/**
 * The model-choice record, schema `curbfit.model-choice/1`: the TypeScript shape of the JSON
 * document (README.md in this folder describes every field). Keys are listed here in the order
 * the document writes them. Inside these objects every number is a JavaScript number (NaN and
 * ±Infinity included); `recordJson` writes non-finite numbers as the strings "NaN",
 * "Infinity" and "-Infinity", and `parseRecord` reads them back.
 *
 * @module
 */
import type { Json } from "../design/types.ts";
import type { StrengthScale } from "../fit/penalty.ts";
import type { FoldPlan } from "../folds/mod.ts";
import type { ColumnSummary } from "./fingerprint.ts";

/**
 * The schema name written into every record.
 *
 * @example
 * ```ts
 * import { SCHEMA_NAME } from "./schema.ts";
 * console.log(SCHEMA_NAME); // curbfit.model-choice
 * ```
 */
export const SCHEMA_NAME = "curbfit.model-choice";

/**
 * The schema version this library writes and reads.
 *
 * @example
 * ```ts
 * import { SCHEMA_VERSION } from "./schema.ts";
 * console.log(SCHEMA_VERSION); // 1
 * ```
 */
export const SCHEMA_VERSION = 1;

/**
 * The `schema` field: name and version.
 *
 * @example
 * ```ts
 * import { SCHEMA } from "./schema.ts";
 * console.log(SCHEMA); // curbfit.model-choice/1
 * ```
 */
export const SCHEMA = `${SCHEMA_NAME}/${SCHEMA_VERSION}`;

/**
 * The software that wrote the record.
 *
 * @example
 * ```ts
 * import type { SoftwareSection } from "./schema.ts";
 * const describe = (s: SoftwareSection) => `${s.library} ${s.version} on ${s.runtime} ${s.runtimeVersion}`;
 * ```
 */
export interface SoftwareSection {
  /** "curbfit". */
  readonly library: string;
  /** The library version (deno.json "version"). */
  readonly version: string;
  /** "deno", or "unknown" outside Deno. */
  readonly runtime: string;
  /** The runtime's version. */
  readonly runtimeVersion: string;
  /** The V8 version (floating-point library functions come from it). */
  readonly v8: string;
  /** The TypeScript version bundled with the runtime. */
  readonly typescript: string;
}

/**
 * The rows the sweep read: summary and fingerprint (see `summarizeData`).
 *
 * @example
 * ```ts
 * import type { DataSection } from "./schema.ts";
 * const describe = (d: DataSection) => `${d.rows} rows of ${d.source}, SHA-256 ${d.sha256}`;
 * ```
 */
export interface DataSection {
  /** The table's source label: a file path, "CSV text", "stream", "rows" or "columns". */
  readonly source: string;
  /**
   * The one character between fields when the data was CSV read with one other than the comma
   * (e.g. `";"`, `"\t"`); absent for commas and for rows and columns in memory, and in records
   * written before curbfit kept it, which read with commas.
   */
  readonly fieldSeparator?: string;
  /** Rows used (after the missing-value policy). */
  readonly rows: number;
  /** The columns the model read, sorted by name. */
  readonly columns: readonly ColumnSummary[];
  /** The missing-value policy and the source lines of the rows it dropped. */
  readonly missing: { readonly policy: "error" | "drop"; readonly droppedLines: readonly number[] };
  /** The byte encoding hashed into `sha256` ("curbfit.rows/1"). */
  readonly encoding: string;
  /** SHA-256 of the encoded rows, 64 lowercase hex digits. */
  readonly sha256: string;
}

/**
 * The fold plan: how to rebuild it, and its fingerprint.
 *
 * @example
 * ```ts
 * import type { FoldsSection } from "./schema.ts";
 * const describe = (f: FoldsSection) => `${f.scheme}, k = ${f.k}, ${f.prng} seed ${f.seed}`;
 * ```
 */
export interface FoldsSection {
  /** Which algorithm made the plan (lib/folds/README.md). */
  readonly scheme: FoldPlan["scheme"];
  /** "PCG32", or null when nothing is drawn. */
  readonly prng: "PCG32" | null;
  /** The seed, or null when nothing is drawn. */
  readonly seed: number | null;
  /** Validation folds per repeat. */
  readonly k: number;
  /** Repeats; repeat r is drawn from PCG32 stream r. */
  readonly repeats: number;
  /** Holdout only: the fraction asked for validation. */
  readonly fraction: number | null;
  /** Grouped folds made from a column (`folds: { groups }`): that column's name. */
  readonly groupColumn: string | null;
  /** Grouped folds only: the number of distinct groups. */
  readonly groupCount: number | null;
  /** Rows the plan covers. */
  readonly rows: number;
  /** `assignmentDigest` of the plan (lib/folds/README.md). */
  readonly assignmentSha256: string;
  /**
   * The fold of every row, one array per repeat, when the plan cannot be rebuilt from the
   * settings above (explicit plans; grouped plans not made from a column); otherwise null.
   */
  readonly assignment: readonly (readonly number[])[] | null;
}

/**
 * One term: its recipe, what it learned on all rows, and the columns it wrote.
 *
 * @example
 * ```ts
 * import type { TermSection } from "./schema.ts";
 * const describe = (t: TermSection) => `${t.label} → ${t.outputs.join(", ")}`;
 * ```
 */
export interface TermSection {
  /** The term's label, e.g. `legendre(x, 8)`. */
  readonly label: string;
  /** The term's JSON recipe (`termFromSpec` rebuilds the term). */
  readonly spec: Json;
  /** Learned parameters that determine the values (null when none). */
  readonly params: Json;
  /** The design columns it writes. */
  readonly outputs: readonly string[];
  /** Polynomial order of each output. */
  readonly orders: readonly number[];
}

/**
 * The penalty and its per-column weights.
 *
 * @example
 * ```ts
 * import type { PenaltySection } from "./schema.ts";
 * const isPlainRidge = (p: PenaltySection) => p.gamma.every((g) => g === 1);
 * ```
 */
export interface PenaltySection {
  /** The penalty family. */
  readonly kind: "ridge";
  /** How γ was chosen: "equal", "rising", "falling" or one weight per column. */
  readonly weights: "equal" | "rising" | "falling" | readonly number[];
  /** Exponent of "rising" / "falling" weights. */
  readonly exponent: number;
  /** γ_q per design column. */
  readonly gamma: readonly number[];
}

/**
 * The λ grid: the request as given, and the values swept (ascending).
 *
 * @example
 * ```ts
 * import type { GridSection } from "./schema.ts";
 * const span = (g: GridSection) => [g.values[0], g.values[g.values.length - 1]];
 * ```
 */
export interface GridSection {
  /** "automatic" (log-spaced, ends chosen or given) or "explicit" (a list was given). */
  readonly kind: "automatic" | "explicit";
  /** The automatic grid's request: each field null when left to its default. */
  readonly request: {
    readonly count: number | null;
    readonly min: number | null;
    readonly max: number | null;
  } | null;
  /** The λ values swept, ascending. */
  readonly values: readonly number[];
}

/**
 * The cross-validation table, one entry per grid value (columns aligned with grid.values).
 *
 * @example
 * ```ts
 * import type { CvSection } from "./schema.ts";
 * const band = (cv: CvSection, l: number) => [cv.cvMean[l] - cv.cvSe[l], cv.cvMean[l] + cv.cvSe[l]];
 * ```
 */
export interface CvSection {
  /** What each column means, in words. */
  readonly definitions: readonly string[];
  /** λ of each row. */
  readonly lambda: readonly number[];
  /** Mean validation MSE over the K·R folds. */
  readonly cvMean: readonly number[];
  /** SD of the fold errors (divisor K·R − 1) / √K. */
  readonly cvSe: readonly number[];
  /** Training MSE of the all-rows fit. */
  readonly trainMse: readonly number[];
  /** Mean training MSE over the folds' training rows. */
  readonly foldTrainMse: readonly number[];
  /** Effective degrees of freedom of the all-rows fit. */
  readonly df: readonly number[];
  /** C(λ) = Σ γ_q (s_q w_q)² of the all-rows fit. */
  readonly budget: readonly number[];
  /** Generalized cross-validation error. */
  readonly gcv: readonly number[];
  /** Closed-form leave-one-out MSE, or null when not computed. */
  readonly loo: readonly number[] | null;
  /** Per λ: validation MSE of every fold, repeat-major. */
  readonly foldMse: readonly (readonly number[])[];
  /** Per λ: standardized coefficients of the all-rows fit. */
  readonly path: readonly (readonly number[])[];
}

/**
 * The rule and what it chose.
 *
 * @example
 * ```ts
 * import type { ChoiceSection } from "./schema.ts";
 * const moved = (c: ChoiceSection) => c.index !== c.minimum.index; // one-SE moved off the minimum
 * ```
 */
export interface ChoiceSection {
  /** The selection rule. */
  readonly rule: "min" | "one-se";
  /** The rule in words. */
  readonly definition: string;
  /** Grid index of the chosen λ. */
  readonly index: number;
  /** The chosen λ. */
  readonly lambda: number;
  /** The grid point with the smallest mean CV error. */
  readonly minimum: { readonly index: number; readonly lambda: number };
  /** Plain-language notes, e.g. the minimum on an edge of the grid. */
  readonly notes: readonly string[];
}

/**
 * The chosen model refit on all rows: every number of its summary.
 *
 * @example
 * ```ts
 * import type { FinalSection } from "./schema.ts";
 * const equation = (f: FinalSection) =>
 *   [String(f.intercept), ...f.names.map((n, q) => `${f.coefficients[q]}·${n}`)].join(" + ");
 * ```
 */
export interface FinalSection {
  /** Rows fitted. */
  readonly n: number;
  /** The chosen λ. */
  readonly lambda: number;
  /** C(λ) met by the solution. */
  readonly budget: number;
  /** Effective degrees of freedom. */
  readonly df: number;
  /** Design column names, in coefficient order. */
  readonly names: readonly string[];
  /** Intercept on the original scale. */
  readonly intercept: number;
  /** Coefficients on the original scale. */
  readonly coefficients: readonly number[];
  /** Standardized scale: w*_q = s_q w_q; intercept = prediction at the column means. */
  readonly standardized: { readonly intercept: number; readonly coefficients: readonly number[] };
  /** Column means of the design (standardization statistics). */
  readonly means: readonly number[];
  /** Column SDs of the design, divisor n (1 when not standardizing). */
  readonly sds: readonly number[];
  /** Training mean squared error. */
  readonly trainMse: number;
  /** √(RSS / (n − intercept − df)). */
  readonly residualSd: number;
  /** 2-norm condition number of the centered, standardized design. */
  readonly condition: number;
  /** Iterative-refinement steps of the exact solver. */
  readonly refinementSteps: number;
}

/**
 * One swept ridge model (keys `lambda`: the ridge λ in sum-of-squares units).
 *
 * @example
 * ```ts
 * import type { RidgeModelSection } from "./schema.ts";
 * const chosenError = (m: RidgeModelSection) => m.cv.cvMean[m.choice.index];
 * ```
 */
export interface RidgeModelSection {
  /** The candidate's name in a comparison; null for a single sweep. */
  readonly name: string | null;
  /** The terms, in design order. */
  readonly terms: readonly TermSection[];
  /** Whether design columns were standardized with training statistics. */
  readonly standardize: boolean;
  /** Whether an unpenalized intercept was fitted. */
  readonly intercept: boolean;
  /** The penalty. */
  readonly penalty: PenaltySection;
  /** The objective written out, one statement per line. */
  readonly objective: readonly string[];
  /** The λ grid. */
  readonly grid: GridSection;
  /** Whether closed-form leave-one-out errors were computed. */
  readonly closedForm: boolean;
  /** The cross-validation table. */
  readonly cv: CvSection;
  /** The rule and its choice. */
  readonly choice: ChoiceSection;
  /** The chosen model refit on all rows. */
  readonly final: FinalSection;
}

/**
 * A lasso / elastic-net penalty: its family, L1 share ρ, per-column weights when they are not
 * all 1, and the solver's stopping tolerance. `weights`, `exponent` and `gamma` are present
 * together or not at all; absent, every γ_q is 1 (records written before weights existed, and
 * every record of an unweighted penalty, which stays byte for byte as it was).
 *
 * @example
 * ```ts
 * import type { SparsePenaltySection } from "./schema.ts";
 * const isLasso = (p: SparsePenaltySection) => p.mix === 1;
 * const unpenalized = (p: SparsePenaltySection) => (p.gamma ?? []).filter((g) => g === 0).length;
 * ```
 */
export interface SparsePenaltySection {
  /** The penalty family. */
  readonly kind: "lasso" | "elastic-net";
  /** ρ, the L1 share of the penalty (1 for the lasso). */
  readonly mix: number;
  /** How γ was chosen: "rising", "falling" or one weight ≥ 0 per column; absent: all 1. */
  readonly weights?: "rising" | "falling" | readonly number[];
  /** Exponent of "rising" / "falling" weights; present with `weights`. */
  readonly exponent?: number;
  /** γ_q ≥ 0 per design column (0: unpenalized); present with `weights`. */
  readonly gamma?: readonly number[];
  /** Largest scaled KKT violation the coordinate-descent solver accepted (lib/sparse/descent.ts). */
  readonly tolerance: number;
}

/**
 * The α grid of a sparse model: the request as given, and the values swept (ascending).
 *
 * @example
 * ```ts
 * import type { SparseGridSection } from "./schema.ts";
 * const depth = (g: SparseGridSection) => g.values[0] / g.values[g.values.length - 1];
 * ```
 */
export interface SparseGridSection {
  /** "automatic" (log-spaced down from the all-rows α_max) or "explicit" (a list was given). */
  readonly kind: "automatic" | "explicit";
  /** The automatic path's request (`alphas: { count, ratio }`), null fields for defaults. */
  readonly request: { readonly count: number | null; readonly ratio: number | null } | null;
  /** The α values swept, ascending. */
  readonly values: readonly number[];
}

/**
 * The cross-validation table of a sparse model, one entry per α (aligned with grid.values).
 *
 * @example
 * ```ts
 * import type { SparseCvSection } from "./schema.ts";
 * const sparsest = (cv: SparseCvSection) => Math.min(...cv.nonzero);
 * ```
 */
export interface SparseCvSection {
  /** What each column means, in words. */
  readonly definitions: readonly string[];
  /** α of each row. */
  readonly alpha: readonly number[];
  /** Mean validation MSE over the K·R folds. */
  readonly cvMean: readonly number[];
  /** SD of the fold errors (divisor K·R − 1) / √K. */
  readonly cvSe: readonly number[];
  /** Training MSE of the all-rows fit. */
  readonly trainMse: readonly number[];
  /** Mean training MSE over the folds' training rows. */
  readonly foldTrainMse: readonly number[];
  /** Nonzero coefficients of the all-rows fit. */
  readonly nonzero: readonly number[];
  /** Σ γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] of the all-rows fit (the penalty per unit α). */
  readonly penaltyValue: readonly number[];
  /** Per α: validation MSE of every fold, repeat-major. */
  readonly foldMse: readonly (readonly number[])[];
  /** Per α: standardized coefficients of the all-rows fit. */
  readonly path: readonly (readonly number[])[];
}

/**
 * The rule and the α it chose.
 *
 * @example
 * ```ts
 * import type { SparseChoiceSection } from "./schema.ts";
 * const moved = (c: SparseChoiceSection) => c.index !== c.minimum.index;
 * ```
 */
export interface SparseChoiceSection {
  /** The selection rule. */
  readonly rule: "min" | "one-se";
  /** The rule in words. */
  readonly definition: string;
  /** Grid index of the chosen α. */
  readonly index: number;
  /** The chosen α. */
  readonly alpha: number;
  /** The grid point with the smallest mean CV error. */
  readonly minimum: { readonly index: number; readonly alpha: number };
  /** Plain-language notes, e.g. the minimum on an edge of the grid. */
  readonly notes: readonly string[];
}

/**
 * The chosen sparse model: the all-rows path's solution at the chosen α.
 *
 * @example
 * ```ts
 * import type { SparseFinalSection } from "./schema.ts";
 * const kept = (f: SparseFinalSection) => f.names.filter((_, q) => f.coefficients[q] !== 0);
 * ```
 */
export interface SparseFinalSection {
  /** Rows fitted. */
  readonly n: number;
  /** The chosen α. */
  readonly alpha: number;
  /** Σ γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] of the solution. */
  readonly penaltyValue: number;
  /** Nonzero coefficients (intercept not counted). */
  readonly nonzero: number;
  /** Design column names, in coefficient order. */
  readonly names: readonly string[];
  /** Intercept on the original scale. */
  readonly intercept: number;
  /** Coefficients on the original scale. */
  readonly coefficients: readonly number[];
  /** Standardized scale: w*_q = s_q w_q; intercept = prediction at the column means. */
  readonly standardized: { readonly intercept: number; readonly coefficients: readonly number[] };
  /** Column means of the design (standardization statistics; 0 when not standardizing). */
  readonly means: readonly number[];
  /** Column SDs of the design, divisor n (1 when not standardizing). */
  readonly sds: readonly number[];
  /** Training mean squared error. */
  readonly trainMse: number;
  /**
   * √(RSS / (n − intercept − df)), df the effective degrees of freedom (lib/sparse/df.ts): the
   * nonzero count for the lasso, less for the elastic net.
   */
  readonly residualSd: number;
  /** 2-norm condition number of the centered, standardized design. */
  readonly condition: number;
  /** The coordinate-descent report of this solution. */
  readonly descent: {
    /** Coordinate passes over the columns. */
    readonly passes: number;
    /** Whether the KKT violation met penalty.tolerance. */
    readonly converged: boolean;
    /** Largest scaled KKT violation over all columns (lib/sparse/descent.ts). */
    readonly violation: number;
    /** Duality gap per observation, units of y² (lib/sparse/path.ts). */
    readonly gap: number;
  };
}

/**
 * One swept lasso / elastic-net model (keys `alpha`: α in the 1/(2N) convention, never the
 * ridge λ). It has no `closedForm` field: closed-form leave-one-out is a ridge identity.
 *
 * @example
 * ```ts
 * import type { SparseModelSection } from "./schema.ts";
 * const chosenNonzero = (m: SparseModelSection) => m.cv.nonzero[m.choice.index];
 * ```
 */
export interface SparseModelSection {
  /** The candidate's name in a comparison; null for a single sweep. */
  readonly name: string | null;
  /** The terms, in design order. */
  readonly terms: readonly TermSection[];
  /** Whether design columns were standardized with training statistics. */
  readonly standardize: boolean;
  /** Whether an unpenalized intercept was fitted. */
  readonly intercept: boolean;
  /** The penalty and solver tolerance. */
  readonly penalty: SparsePenaltySection;
  /** The objective written out, one statement per line. */
  readonly objective: readonly string[];
  /** The α grid. */
  readonly grid: SparseGridSection;
  /** The cross-validation table. */
  readonly cv: SparseCvSection;
  /** The rule and its choice. */
  readonly choice: SparseChoiceSection;
  /** The chosen model on all rows. */
  readonly final: SparseFinalSection;
}

/**
 * One swept model: ridge (keys `lambda`) or lasso / elastic net (keys `alpha`); tell them apart
 * with `isSparseModel`.
 *
 * @example
 * ```ts
 * import { type ModelSection, modelStrengths } from "./schema.ts";
 * const chosen = (m: ModelSection) => modelStrengths(m).chosen;
 * ```
 */
export type ModelSection = RidgeModelSection | SparseModelSection;

/**
 * Whether a recorded model is lasso / elastic net (its keys say `alpha`).
 *
 * @example
 * ```ts
 * import { isSparseModel, type ModelSection } from "./schema.ts";
 * const symbol = (m: ModelSection) => (isSparseModel(m) ? "α" : "λ");
 * ```
 */
export function isSparseModel(m: ModelSection): m is SparseModelSection {
  return m.penalty.kind === "lasso" || m.penalty.kind === "elastic-net";
}

/**
 * A recorded model's strengths on its own scale: the grid (ascending), the chosen and the
 * minimum-error value, the final model's, and per grid value its size (ridge: effective df;
 * sparse: nonzero count) and penalty measure (ridge: budget C(λ); sparse: ρ‖w*‖₁ + …).
 *
 * @example
 * ```ts
 * import { type ModelSection, modelStrengths } from "./schema.ts";
 * const label = (m: ModelSection) => `${modelStrengths(m).scale} = ${modelStrengths(m).chosen}`;
 * ```
 */
export function modelStrengths(m: ModelSection): {
  readonly scale: StrengthScale;
  readonly grid: readonly number[];
  readonly chosen: number;
  readonly minimum: number;
  readonly final: number;
  readonly size: readonly number[];
  readonly measure: readonly number[];
  readonly finalSize: number;
  readonly finalMeasure: number;
} {
  if (isSparseModel(m)) {
    return {
      scale: "alpha",
      grid: m.cv.alpha,
      chosen: m.choice.alpha,
      minimum: m.choice.minimum.alpha,
      final: m.final.alpha,
      size: m.cv.nonzero,
      measure: m.cv.penaltyValue,
      finalSize: m.final.nonzero,
      finalMeasure: m.final.penaltyValue,
    };
  }
  return {
    scale: "lambda",
    grid: m.cv.lambda,
    chosen: m.choice.lambda,
    minimum: m.choice.minimum.lambda,
    final: m.final.lambda,
    size: m.cv.df,
    measure: m.cv.budget,
    finalSize: m.final.df,
    finalMeasure: m.final.budget,
  };
}

/**
 * One candidate's standing in a comparison.
 *
 * @example
 * ```ts
 * import type { CandidateStanding } from "./schema.ts";
 * const tied = (c: CandidateStanding) => c.versusBest?.indistinguishable ?? true;
 * ```
 */
export type CandidateStanding = RidgeStanding | SparseStanding;

/**
 * What every candidate's standing holds besides its chosen strength.
 *
 * @example
 * ```ts
 * import type { StandingCommon } from "./schema.ts";
 * const tied = (c: StandingCommon) => c.versusBest?.indistinguishable ?? true;
 * ```
 */
export interface StandingCommon {
  /** The candidate's name. */
  readonly name: string;
  /** Mean CV error at its chosen λ. */
  readonly cvMean: number;
  /** Standard error of that mean. */
  readonly cvSe: number;
  /** Paired per-fold difference to the best candidate; null for the best itself. */
  readonly versusBest: {
    readonly mean: number;
    readonly se: number;
    readonly indistinguishable: boolean;
  } | null;
}

/**
 * A ridge candidate's standing: chosen λ first (key `lambda`).
 *
 * @example
 * ```ts
 * import type { RidgeStanding } from "./schema.ts";
 * const chosen = (c: RidgeStanding) => c.lambda;
 * ```
 */
export interface RidgeStanding extends StandingCommon {
  /** Its chosen λ. */
  readonly lambda: number;
}

/**
 * A lasso / elastic-net candidate's standing: chosen α (key `alpha`).
 *
 * @example
 * ```ts
 * import type { SparseStanding } from "./schema.ts";
 * const chosen = (c: SparseStanding) => c.alpha;
 * ```
 */
export interface SparseStanding extends StandingCommon {
  /** Its chosen α. */
  readonly alpha: number;
}

/**
 * A candidate's chosen strength, whichever its scale.
 *
 * @example
 * ```ts
 * import { type CandidateStanding, standingStrength } from "./schema.ts";
 * const chosen = (c: CandidateStanding) => standingStrength(c);
 * ```
 */
export function standingStrength(c: CandidateStanding): number {
  return "alpha" in c ? c.alpha : c.lambda;
}

/**
 * The comparison of candidates on one fold plan.
 *
 * @example
 * ```ts
 * import type { ComparisonSection } from "./schema.ts";
 * const summary = (c: ComparisonSection) => `${c.best}: ${c.verdict.join(" ")}`;
 * ```
 */
export interface ComparisonSection {
  /** Name of the candidate with the lowest CV error at its chosen λ. */
  readonly best: string;
  /** How candidates are paired, in words. */
  readonly criterion: string;
  /** Every candidate, in comparison order. */
  readonly candidates: readonly CandidateStanding[];
  /** One plain sentence per candidate. */
  readonly verdict: readonly string[];
}

/**
 * A model-choice record (schema `curbfit.model-choice/1`).
 *
 * @example
 * ```ts
 * import { type ModelChoiceRecord, modelStrengths } from "./schema.ts";
 * const headline = (r: ModelChoiceRecord) =>
 *   r.models.map((m) => `${m.name ?? r.target}: ${modelStrengths(m).chosen} (${m.choice.rule})`);
 * ```
 */
export interface ModelChoiceRecord {
  /** "curbfit.model-choice/1". */
  readonly schema: string;
  /** A single sweep, or a comparison of candidates. */
  readonly kind: "sweep" | "comparison";
  /** ISO 8601 creation time, only when asked for; otherwise null. */
  readonly created: string | null;
  /** The software that wrote the record. */
  readonly software: SoftwareSection;
  /** The predicted column. */
  readonly target: string;
  /** The rows used: summary and fingerprint. */
  readonly data: DataSection;
  /** The fold plan. */
  readonly folds: FoldsSection;
  /** One model for a sweep, one per candidate for a comparison. */
  readonly models: readonly ModelSection[];
  /** The comparison, or null for a sweep. */
  readonly comparison: ComparisonSection | null;
  /** Plain cautions for readers. */
  readonly cautions: readonly string[];
}
