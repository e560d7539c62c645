/**
 * curbfit: regularized linear models for notebooks, with λ chosen by seeded cross-validation.
 *
 * Objective (augmented-error convention, sum-of-squares units):
 *   minimize Σᵢ (yᵢ − b − zᵢᵀw)² + λ Σ_q γ_q w*_q²
 * where w*_q is the coefficient on the standardized scale; the intercept b is never penalized.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "./mod.ts";
 * const x = Array.from({ length: 50 }, (_, i) => i / 49);
 * const y = x.map((v, i) => Math.exp(-2 * v) + 0.05 * Math.sin(13 * i));
 * const result = sweep({ x, y }, { target: "y", terms: [legendre("x", 10)], folds: { k: 5, seed: 42 } });
 * console.log(result.chosen.lambda);
 * ```
 *
 * @module
 */
export { CurbfitError, type ErrorCode, type ErrorPlace } from "./lib/errors/error.ts";
export {
  type CategoryColumn,
  type CellValue,
  type Column,
  type ColumnArrays,
  type ColumnKind,
  type CsvOptions,
  isTable,
  type LoadOptions,
  type MissingReport,
  type NumericColumn,
  parseCsv,
  readCsv,
  readCsvStream,
  type RowObjects,
  type Table,
  tableFromColumns,
  tableFromRows,
  toTable,
} from "./lib/table/mod.ts";
export {
  column,
  type DesignBlock,
  indicators,
  type Json,
  type LearnedTerm,
  legendre,
  type LegendreOptions,
  power,
  product,
  type Term,
  type TermKind,
} from "./lib/design/mod.ts";
export {
  type Penalty,
  ridge,
  type RidgePenalty,
  type RidgeWeights,
  type StrengthScale,
} from "./lib/fit/penalty.ts";
export { elasticNet, lasso, type SparsePenalty } from "./lib/sparse/penalty.ts";
export type { AlphaGrid } from "./lib/sparse/grid.ts";
export {
  Fit,
  fit,
  type FitSpec,
  type FitSummary,
  type Prediction,
  type TableInput,
} from "./lib/fit/fit.ts";
export {
  type CurvePoint,
  type CurveResult,
  type Progress,
  type ProgressListener,
  sweep,
  sweepAsync,
  type SweepResult,
  type SweepSpec,
} from "./lib/sweep/sweep.ts";
export {
  type Candidate,
  type CandidateOutcome,
  compare,
  compareAsync,
  type CompareOptions,
  type ComparisonResult,
  type PairedDifference,
} from "./lib/sweep/compare.ts";
export type { Choice, SelectionRule } from "./lib/sweep/select.ts";
export type { LambdaGrid } from "./lib/sweep/grid.ts";
export type { FoldRequest } from "./lib/sweep/folds.ts";
export {
  type ExplicitOptions,
  explicitPlan,
  type FoldPlan,
  type FoldScheme,
  type GroupedKFoldOptions,
  groupedKFoldPlan,
  type GroupLabels,
  type HoldoutOptions,
  holdoutPlan,
  type KFoldOptions,
  kFoldPlan,
  leaveOneOutPlan,
} from "./lib/folds/mod.ts";
export {
  type CandidateStanding,
  type CategoryColumnSummary,
  type ChoiceSection,
  type ColumnSummary,
  type ComparisonSection,
  type CvSection,
  type DataSection,
  type DataSummary,
  type FinalSection,
  type FoldsSection,
  type GridSection,
  isSparseModel,
  type LoadedModel,
  type LoadedRecord,
  loadRecord,
  type ModelChoiceRecord,
  type ModelSection,
  modelStrengths,
  type NumberColumnSummary,
  parseRecord,
  type PenaltySection,
  readRecordedData,
  type RecordedReadOptions,
  recordJson,
  recordOf,
  type RecordOptions,
  type RidgeModelSection,
  type RidgeStanding,
  type Shown,
  type SoftwareSection,
  type SparseChoiceSection,
  type SparseCvSection,
  type SparseFinalSection,
  type SparseGridSection,
  type SparseModelSection,
  type SparsePenaltySection,
  type SparseStanding,
  type StandingCommon,
  type SweepProvenance,
  type SweepSource,
  type TermSection,
  verify,
  type VerifyEntry,
  type VerifyReport,
} from "./lib/record/mod.ts";
export {
  ApiCall,
  type CandidateNode as CurbCandidate,
  curb,
  type CurbPlan,
  curbPlan,
  type CurbProgram,
  type CurbResult,
  type DataNode as CurbData,
  equivalentCall,
  type FoldsNode as CurbFolds,
  type Job as CurbJob,
  MagicError,
  type Named as CurbName,
  type RunOptions,
  type Settings as CurbSettings,
  type SourceLine as CurbSourceLine,
  type Spot,
  type TermNode as CurbTerm,
  type Token as CurbToken,
} from "./lib/magic/mod.ts";
export {
  type Bundle,
  type DisplaySink,
  type ProgressDisplay,
  progressDisplay,
  type ProgressOptions,
} from "./lib/kernel/progress.ts";
export {
  type Block as StatementBlock,
  type Inline as StatementInline,
  Statement,
  statement,
  type StatementOptions,
} from "./lib/statement/mod.ts";
export { type CliIo, EXIT, runCli } from "./lib/cli/mod.ts";
export {
  type DroppedRecord,
  FOLD_HASH,
  type FoldHash,
  foldHash,
  foldOfKey,
  foldsOfKeys,
  hashFoldPlan,
  type HashFoldRequest,
  type HashFolds,
  type ReadStats,
  type ScaleProgress,
  type ScaleProgressListener,
  type ScaleSweepResult,
  type ScaleSweepSpec,
  type StreamFormat,
  type StreamSource,
  type StreamSweepResult,
  type StreamSweepSpec,
  sweepStream,
} from "./lib/stream/mod.ts";
export {
  duckdbConnection,
  type DuckDBConnectionLike,
  type PgClientLike,
  postgresConnection,
  type SqlConnection,
  type SqlDialect,
  type SqlQuery,
  type SqlRows,
  type SqlSweepResult,
  type SqlSweepSpec,
  sweepSql,
} from "./lib/sql/mod.ts";
export {
  chartBundle,
  type ChartText,
  coefficientChart,
  comparisonChart,
  type ComparisonSource,
  type CurveSource,
  fittedCurveChart,
  type PathSource,
  residualChart,
  showChart,
  type ShownBundle,
  shrinkagePathChart,
  validationCurveChart,
  type ValidationOptions,
} from "./lib/views/charts/mod.ts";
export type { PlanWords } from "./lib/views/charts/theme.ts";
export type { VegaLiteSpec } from "./lib/views/render.ts";
export type { MimeBundle } from "./lib/views/bundle.ts";
export type { Cell as TableCell, CellTable } from "./lib/views/table.ts";
