/**
 * The sections of a model-choice statement, each built from the record alone: question, data,
 * candidates, evidence, decision, cautions and how to reproduce it.
 *
 * @module
 */
import {
  type ColumnSummary,
  type FinalSection,
  type FoldsSection,
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
  modelStrengths,
  type PenaltySection,
  type SparsePenaltySection,
} from "../record/mod.ts";
import { strengthSymbol } from "../fit/penalty.ts";
import type { CellTable } from "../views/table.ts";
import { formatNumber } from "../views/table.ts";
import { rerunCommand, shellLines, verifyCommand } from "../cli/rerun.ts";
import type { Block, Inline } from "./blocks.ts";
import { evidenceCaption, evidenceSpec } from "./chart.ts";

/**
 * The label of a model: its candidate name, or "model of TARGET" for a single sweep.
 *
 * @example
 * ```ts
 * import { modelLabel } from "./sections.ts";
 * console.log(modelLabel({ name: null } as never, "brix")); // "model of brix"
 * ```
 */
export function modelLabel(model: Pick<ModelSection, "name">, target: string): string {
  return model.name ?? `model of ${target}`;
}

/** Significant digits of numbers in sentences and tables. */
const DIGITS = 4;

/** A number as the statement prints it (4 significant digits). */
function num(x: number): string {
  return formatNumber(x, DIGITS);
}

/**
 * Options of the statement that the record cannot know.
 *
 * @example
 * ```ts
 * import type { SectionOptions } from "./sections.ts";
 * const paths: SectionOptions = { recordPath: "out/demo/record.json", dataPath: "examples/data/orchard.csv" };
 * ```
 */
export interface SectionOptions {
  /** Where the reader finds the record file (for the commands shown). */
  readonly recordPath: string;
  /** Where the reader finds the data file (for the commands shown). */
  readonly dataPath: string;
}

/** The strength symbol of a model: λ (ridge) or α (lasso / elastic net). */
function symbolOf(m: ModelSection): string {
  return strengthSymbol(modelStrengths(m).scale);
}

/** The strength symbols of a record's models: "λ", "α", or "λ or α" when they differ. */
function symbolsOf(record: ModelChoiceRecord): string {
  return [...new Set(record.models.map(symbolOf))].join(" or ");
}

/** `n thing` or `n things`. */
function count(n: number, thing: string): string {
  return `${n} ${thing}${n === 1 ? "" : "s"}`;
}

function ruleName(rule: string): string {
  return rule === "one-se" ? "one-standard-error rule" : "minimum rule";
}

/**
 * The fold plan in words, e.g. "8-fold cross-validation (rows shuffled by PCG32 with seed 7)".
 *
 * @example
 * ```ts
 * import { describeFolds } from "./sections.ts";
 * console.log(describeFolds({ scheme: "leave-one-out", rows: 12 } as never));
 * // leave-one-out cross-validation (12 folds of one row)
 * ```
 */
export function describeFolds(f: FoldsSection): string {
  const repeats = f.repeats > 1 ? `, repeated ${f.repeats} times with fresh shuffles` : "";
  switch (f.scheme) {
    case "k-fold":
      return `${f.k}-fold cross-validation (rows shuffled by ${f.prng} with seed ${f.seed}${repeats})`;
    case "grouped-k-fold":
      return `${f.k}-fold cross-validation keeping groups together (${
        count(f.groupCount ?? 0, "group")
      }` +
        `${f.groupColumn === null ? "" : ` from column ${JSON.stringify(f.groupColumn)}`}; ` +
        `${f.prng} seed ${f.seed}${repeats})`;
    case "holdout":
      return `a holdout of ${f.fraction} of the rows (${f.prng} seed ${f.seed}${repeats})`;
    case "leave-one-out":
      return `leave-one-out cross-validation (${f.rows} folds of one row)`;
    case "explicit":
      return `${f.k} folds given explicitly (the record lists every row's fold)`;
  }
}

/**
 * A model's penalty in words, e.g. "ridge, γ = 1 (weight decay); standardized".
 *
 * @example
 * ```ts
 * import { describePenalty } from "./sections.ts";
 * console.log(describePenalty({ weights: "rising", exponent: 2 }, true, true));
 * // ridge, γ_q = order^2 (higher orders cost more); standardized
 * console.log(describePenalty({ kind: "lasso", mix: 1, weights: [0, 1, 1], tolerance: 1e-7 }, true, true));
 * // lasso, γ given per column (0: unpenalized), α in the 1/(2N) convention; standardized
 * ```
 */
export function describePenalty(
  p: Pick<PenaltySection, "weights" | "exponent"> | SparsePenaltySection,
  standardize: boolean,
  intercept: boolean,
): string {
  const scale = standardize ? "standardized" : "raw scale";
  const tail = `${scale}${intercept ? "" : "; no intercept"}`;
  if ("mix" in p) {
    const family = p.kind === "lasso" ? "lasso" : `elastic net, L1 share ρ = ${p.mix}`;
    const gamma = p.weights === undefined
      ? ""
      : `, ${gammaWords(p.weights, p.exponent ?? 1)}${
        typeof p.weights === "string" ? "" : " (0: unpenalized)"
      }`;
    return `${family}${gamma}, α in the 1/(2N) convention; ${tail}`;
  }
  return `ridge, ${gammaWords(p.weights, p.exponent)}; ${tail}`;
}

/** How γ was chosen, in words. */
function gammaWords(weights: PenaltySection["weights"], exponent: number): string {
  return typeof weights !== "string"
    ? "γ given per column"
    : weights === "equal"
    ? "γ = 1 (weight decay)"
    : weights === "rising"
    ? `γ_q = order^${exponent} (higher orders cost more)`
    : `γ_q = order^−${exponent} (lower orders cost more)`;
}

function describeGrid(m: ModelSection): string {
  const v = m.grid.values;
  if (m.grid.kind === "explicit" && v.length <= 6) {
    const symbol = symbolOf(m);
    return v.length === 1
      ? `${symbol} = ${num(v[0])} only`
      : `${symbol} ∈ {${v.map(num).join(", ")}}`;
  }
  const spacing = m.grid.kind === "automatic" ? "log-spaced " : "";
  return `${v.length} ${spacing}values from ${num(v[0])} to ${num(v[v.length - 1])}`;
}

function termLabels(m: ModelSection): string {
  return m.terms.map((t) => t.label).join(", ");
}

/**
 * Title and the line saying where the statement comes from.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { titleBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(titleBlocks(recordOf(s))[0]); // { kind: "heading", level: 1, text: "Model-choice statement: y" }
 * ```
 */
export function titleBlocks(record: ModelChoiceRecord): Block[] {
  const s = record.software;
  return [
    { kind: "heading", level: 1, text: `Model-choice statement: ${record.target}` },
    {
      kind: "paragraph",
      parts: [
        `Written from a ${record.schema} record by ${s.library} ${s.version} (${s.runtime} ` +
        `${s.runtimeVersion}); ${
          record.created === null ? "no creation time recorded" : `created ${record.created}`
        }. Every number here is in the record, and verify recomputes it from the data.`,
      ],
    },
  ];
}

/**
 * The question the record answers.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { questionBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(questionBlocks(recordOf(s)).length); // 2
 * ```
 */
export function questionBlocks(record: ModelChoiceRecord): Block[] {
  const cv = describeFolds(record.folds);
  if (record.kind === "sweep") {
    const m = record.models[0];
    return [
      { kind: "heading", level: 2, text: "Question" },
      {
        kind: "paragraph",
        parts: [
          "How strongly should the model of ",
          { strong: record.target },
          ` on ${termLabels(m)} be penalized? The penalty strength ${symbolOf(m)} is chosen from ` +
          `${describeGrid(m)} by ${cv}, using the ${ruleName(m.choice.rule)}.`,
        ],
      },
    ];
  }
  return [
    { kind: "heading", level: 2, text: "Question" },
    {
      kind: "paragraph",
      parts: [
        `Which of ${record.models.length} candidate models predicts `,
        { strong: record.target },
        ` best on rows like these, and how strongly should it be penalized? Each candidate's ` +
        `${
          symbolsOf(record)
        } is chosen by ${cv}; all candidates use the same folds, so their fold errors are ` +
        "compared in pairs.",
      ],
    },
  ];
}

/** Inputs every model reads (term columns and a group column), in the record's column order. */
function roleOf(record: ModelChoiceRecord, name: string): string {
  if (name === record.target) return "target";
  if (name === record.folds.groupColumn) return "fold groups";
  return "input";
}

/** Levels of a category column, shortened for one table cell. */
function levelText(levels: readonly string[]): string {
  const shown = levels.slice(0, 12).join(", ");
  return levels.length > 12 ? `${shown}, … (${levels.length} levels)` : shown;
}

/**
 * The data section: source, rows, missing values, the columns read and the fingerprint.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { dataBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(dataBlocks(recordOf(s))[2].kind); // table
 * ```
 */
export function dataBlocks(record: ModelChoiceRecord): Block[] {
  const d = record.data;
  const dropped = d.missing.droppedLines;
  const missing = d.missing.policy === "error"
    ? "No value was missing (a missing value would have stopped the run)."
    : dropped.length === 0
    ? "Rows with a missing value were to be dropped; none had one."
    : `${count(dropped.length, "row")} with a missing value ${
      dropped.length === 1 ? "was" : "were"
    } ` +
      `dropped (source lines ${dropped.slice(0, 20).join(", ")}${
        dropped.length > 20 ? ", …" : ""
      }).`;
  const table: CellTable = {
    header: ["column", "role", "kind", "values seen"],
    rows: d.columns.map((c) => [
      c.name,
      roleOf(record, c.name),
      c.kind,
      c.kind === "number" ? `${num(c.min)} to ${num(c.max)}` : levelText(c.levels),
    ]),
  };
  return [
    { kind: "heading", level: 2, text: "Data" },
    {
      kind: "paragraph",
      parts: [
        `${count(d.rows, "row")} from `,
        { code: d.source },
        ...(d.fieldSeparator === undefined
          ? []
          : [", fields separated by ", { code: separatorName(d.fieldSeparator) }]),
        `. ${missing}`,
      ],
    },
    { kind: "table", table },
    {
      kind: "paragraph",
      parts: [`Fingerprint of the rows used (${d.encoding}, SHA-256): `, { code: d.sha256 }],
    },
  ];
}

/** A separator as a reader would type it: the tab and the space by name, others as they are. */
function separatorName(separator: string): string {
  return separator === "\t" ? "tab" : separator === " " ? "space" : separator;
}

/**
 * The candidates (or the one model of a sweep): terms, penalty, λ grid and rule.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { candidateBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(candidateBlocks(recordOf(s))[0]); // { kind: "heading", level: 2, text: "Model" }
 * ```
 */
export function candidateBlocks(record: ModelChoiceRecord): Block[] {
  const table: CellTable = {
    header: [
      "candidate",
      "terms",
      "design columns",
      "penalty",
      `${symbolsOf(record)} tried`,
      "rule",
    ],
    rows: record.models.map((m) => [
      modelLabel(m, record.target),
      termLabels(m),
      m.final.names.length,
      describePenalty(m.penalty, m.standardize, m.intercept),
      describeGrid(m),
      m.choice.rule,
    ]),
  };
  return [
    { kind: "heading", level: 2, text: record.kind === "sweep" ? "Model" : "Candidates" },
    { kind: "table", table },
  ];
}

/**
 * One row per model at its chosen λ: CV error ± SE, df and (comparison) the paired difference
 * to the best. Also used by the command line's summary.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { standingTable } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(standingTable(recordOf(s)).header);
 * ```
 */
export function standingTable(record: ModelChoiceRecord): CellTable {
  const comparison = record.comparison;
  return {
    header: [
      record.kind === "sweep" ? "model" : "candidate",
      `chosen ${symbolsOf(record).replace(" or ", " / ")}`,
      "CV error",
      "± SE",
      [...new Set(record.models.map((m) => (isSparseModel(m) ? "nonzero" : "df")))].join(" / "),
      ...(comparison ? ["vs best: paired difference", "± SE", "verdict"] : []),
    ],
    rows: record.models.map((m, i) => {
      const c = m.choice.index;
      const base = [
        modelLabel(m, record.target),
        modelStrengths(m).chosen,
        m.cv.cvMean[c],
        m.cv.cvSe[c],
        modelStrengths(m).size[c],
      ];
      if (comparison === null) return base;
      const vs = comparison.candidates[i].versusBest;
      if (vs === null) return [...base, "", "", "best"];
      return [...base, vs.mean, vs.se, vs.indistinguishable ? "within 2 SE" : "worse"];
    }),
  };
}

/** The mark of grid index `l`: chosen, smallest CV error, both or neither. */
function markOf(m: ModelSection, l: number): string {
  return [
    l === m.choice.index ? "chosen" : "",
    l === m.choice.minimum.index ? "smallest CV error" : "",
  ].filter((s) => s !== "").join(", ");
}

/** The full per-λ (or per-α) CV table of one model (folded away in HTML). */
function cvTable(m: ModelSection): CellTable {
  if (isSparseModel(m)) {
    const cv = m.cv;
    return {
      header: ["α", "CV error", "± SE", "training MSE", "nonzero", "penalty value", "mark"],
      rows: cv.alpha.map((alpha, l) => [
        alpha,
        cv.cvMean[l],
        cv.cvSe[l],
        cv.trainMse[l],
        cv.nonzero[l],
        cv.penaltyValue[l],
        markOf(m, l),
      ]),
    };
  }
  const cv = m.cv;
  return {
    header: [
      "λ",
      "CV error",
      "± SE",
      "training MSE",
      "df",
      "budget C(λ)",
      "GCV",
      ...(cv.loo ? ["LOO"] : []),
      "mark",
    ],
    rows: cv.lambda.map((lambda, l) => [
      lambda,
      cv.cvMean[l],
      cv.cvSe[l],
      cv.trainMse[l],
      cv.df[l],
      cv.budget[l],
      cv.gcv[l],
      ...(cv.loo ? [cv.loo[l]] : []),
      markOf(m, l),
    ]),
  };
}

/**
 * The evidence: the chart, the table of standings and the comparison criterion, with the full
 * per-λ tables folded away (HTML) or pointed to in the record (Markdown, text).
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { evidenceBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(evidenceBlocks(recordOf(s)).map((b) => b.kind));
 * ```
 */
export function evidenceBlocks(record: ModelChoiceRecord): Block[] {
  const details: Block[] = record.models.flatMap((m) => [
    ...(record.models.length > 1
      ? [{ kind: "heading" as const, level: 3 as const, text: modelLabel(m, record.target) }]
      : []),
    { kind: "table" as const, table: cvTable(m), digits: DIGITS },
  ]);
  return [
    { kind: "heading", level: 2, text: "Evidence" },
    { kind: "chart", spec: evidenceSpec(record), caption: evidenceCaption(record) },
    { kind: "table", table: standingTable(record), digits: DIGITS },
    {
      kind: "paragraph",
      parts: [
        "CV error: mean squared error on the validation rows, averaged over the folds; SE: the " +
        "standard deviation of the fold errors divided by √K." +
        (record.comparison ? ` Comparison: ${record.comparison.criterion}.` : ""),
      ],
    },
    {
      kind: "details",
      summary: `Every ${symbolsOf(record)} tried: cross-validation table`,
      blocks: details,
      elsewhere: `The full table for every ${symbolsOf(record)} tried is in the record` +
        " (models[i].cv) and in the " +
        "HTML form of this statement.",
    },
  ];
}

/**
 * The coefficients of a fitted model (a record's `final`, or a fit summary): intercept first,
 * original and standardized scale.
 *
 * @example
 * ```ts
 * import { coefficientTable } from "./sections.ts";
 * const t = coefficientTable({
 *   names: ["x"], intercept: 1, coefficients: [2], standardized: { intercept: 3, coefficients: [0.5] },
 * });
 * console.log(t.rows); // [ [ "(intercept)", 1, 3 ], [ "x", 2, 0.5 ] ]
 * ```
 */
export function coefficientTable(
  f: Pick<FinalSection, "names" | "intercept" | "coefficients" | "standardized">,
): CellTable {
  return {
    header: ["design column", "coefficient", "standardized (s_q w_q)"],
    rows: [
      ["(intercept)", f.intercept, f.standardized.intercept],
      ...f.names.map((name, q) => [name, f.coefficients[q], f.standardized.coefficients[q]]),
    ],
  };
}

/** The model a record settles on: the sweep's model, or the comparison's best candidate. */
function chosenModel(record: ModelChoiceRecord): ModelSection {
  const best = record.comparison?.best;
  return record.models.find((m) => best === undefined || m.name === best) ?? record.models[0];
}

/**
 * The decision: what was chosen, by which rule, and the final model's coefficients.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { decisionBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(decisionBlocks(recordOf(s))[0]); // { kind: "heading", level: 2, text: "Decision" }
 * ```
 */
export function decisionBlocks(record: ModelChoiceRecord): Block[] {
  const m = chosenModel(record);
  const min = m.choice.minimum.index;
  const single = m.grid.values.length === 1;
  const st = modelStrengths(m);
  const symbol = symbolOf(m);
  const ruleLine = single
    ? `${symbol} = ${num(st.chosen)}, the only value tried${
      st.chosen === 0 ? " (no penalty)" : ""
    }; no rule was needed.`
    : `${symbol} = ${num(st.chosen)}, chosen by the rule ${m.choice.definition}. The smallest ` +
      `mean CV error, ${num(m.cv.cvMean[min])} ± ${num(m.cv.cvSe[min])}, is at ` +
      `${symbol} = ${num(st.minimum)}.`;
  const headline: Inline[] = record.comparison
    ? [
      "Chosen: ",
      { strong: record.comparison.best },
      `, the candidate with the lowest mean CV error at its chosen ${
        symbolsOf(record)
      }; ${ruleLine}`,
    ]
    : [`Chosen: ${ruleLine}`];
  const notes = record.models.flatMap((x) =>
    x.choice.notes.map((n) => (record.comparison ? `${modelLabel(x, record.target)}: ${n}` : n))
  );
  return [
    { kind: "heading", level: 2, text: "Decision" },
    { kind: "paragraph", parts: headline },
    ...(record.comparison
      ? [{ kind: "list" as const, items: record.comparison.verdict.map((v) => [v]) }]
      : []),
    ...(notes.length > 0 ? [{ kind: "list" as const, items: notes.map((n) => [n]) }] : []),
    { kind: "paragraph", parts: [finalSentence(m)] },
    { kind: "table", table: coefficientTable(m.final), digits: 6 },
  ];
}

/** The final model in one sentence: its strength, size, fit and solver report. */
function finalSentence(m: ModelSection): string {
  if (isSparseModel(m)) {
    const f = m.final;
    const d = f.descent;
    return `Final model, the coordinate-descent solution on all ${f.n} rows at ` +
      `α = ${num(f.alpha)}: ${f.nonzero} of ${f.names.length} coefficients nonzero, training ` +
      `MSE ${num(f.trainMse)}, residual SD ${num(f.residualSd)}, penalty value ` +
      `${num(f.penaltyValue)}; scaled KKT violation ${num(d.violation)} (tolerance ` +
      `${num(m.penalty.tolerance)}${d.converged ? "" : ", not met"}), duality gap ` +
      `${num(d.gap)} per row, ${d.passes} coordinate passes.`;
  }
  const f = m.final;
  return `Final model, refit on all ${f.n} rows at λ = ${num(f.lambda)}: effective degrees of ` +
    `freedom ${num(f.df)}, training MSE ${num(f.trainMse)}, residual SD ${num(f.residualSd)}, ` +
    `penalty budget C = ${num(f.budget)}, condition number ${num(f.condition)}.`;
}

/**
 * The cautions: the record's own sentences and the training domain of the inputs.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { cautionBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(cautionBlocks(recordOf(s))[1].kind); // list
 * ```
 */
export function cautionBlocks(record: ModelChoiceRecord): Block[] {
  return [
    { kind: "heading", level: 2, text: "Cautions" },
    {
      kind: "list",
      items: [
        ...domainCaution(record.data.columns, record.target),
        ...record.cautions.map((c) => [c]),
      ],
    },
  ];
}

/**
 * The training-domain caution for the input columns (none when there are no inputs).
 *
 * @example
 * ```ts
 * import { domainCaution } from "./sections.ts";
 * console.log(domainCaution([{ name: "x", kind: "number", min: 0, max: 5 }], "y"));
 * ```
 */
export function domainCaution(columns: readonly ColumnSummary[], target: string): Inline[][] {
  const domain = columns.filter((c) => c.name !== target).map((c) =>
    c.kind === "number"
      ? `${c.name} from ${num(c.min)} to ${num(c.max)}`
      : `${c.name} in {${levelText(c.levels)}}`
  );
  if (domain.length === 0) return [];
  return [[
    `Training domain: ${domain.join("; ")}. Predictions outside it are extrapolation, and a ` +
    "polynomial can swing far there.",
  ]];
}

/** Objective lines shared by every model (the γ line differs between candidates). */
function commonObjective(record: ModelChoiceRecord): string[] {
  return record.models[0].objective.filter((line) =>
    record.models.every((m) => m.objective.includes(line))
  );
}

/**
 * How to check and reproduce the record: the verify command, the command that makes it again,
 * the objective, the folds and the software.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { reproduceBlocks } from "./sections.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i);
 * const s = sweep({ x, y: x.map((v) => v + (v % 3)) }, { target: "y", terms: [legendre("x", 2)], folds: { k: 4, seed: 1 } });
 * console.log(reproduceBlocks(recordOf(s), { recordPath: "record.json", dataPath: "data.csv" }).length > 3);
 * ```
 */
export function reproduceBlocks(record: ModelChoiceRecord, options: SectionOptions): Block[] {
  const rerun = rerunCommand(record, options.dataPath);
  const f = record.folds;
  const s = record.software;
  const objective = commonObjective(record);
  return [
    { kind: "heading", level: 2, text: "How to reproduce" },
    {
      kind: "paragraph",
      parts: [
        "Check the record against the data (it recomputes the fingerprint, the folds and every " +
        "number; exit code 0 when all match, 1 with the differing fields named), from a checkout of curbfit:",
      ],
    },
    { kind: "code", lines: shellLines(verifyCommand(options.recordPath, options.dataPath)) },
    ...(rerun === null
      ? [{
        kind: "paragraph" as const,
        parts: [
          "The folds were given explicitly, so only verify (which reads the recorded assignment) rebuilds them.",
        ],
      }]
      : [
        {
          kind: "paragraph" as const,
          parts: [`Make it again from scratch (the same settings give the same numbers):`],
        },
        { kind: "code" as const, lines: shellLines(rerun) },
      ]),
    {
      kind: "paragraph",
      parts: [
        `Folds: ${describeFolds(f)}; fold assignment SHA-256 `,
        { code: f.assignmentSha256 },
        record.models.some(isSparseModel)
          ? ". Objective statements every model shares (each model's full objective is in " +
            "the record, models[i].objective):"
          : ". Objective of every model (γ_q per candidate as listed above):",
      ],
    },
    { kind: "code", lines: objective },
    {
      kind: "paragraph",
      parts: [
        `Software: ${s.library} ${s.version}, ${s.runtime} ${s.runtimeVersion}, V8 ${s.v8}, ` +
        `TypeScript ${s.typescript}.`,
      ],
    },
  ];
}
