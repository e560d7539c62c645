/**
 * The MIME bundle of every curbfit result, for `[Symbol.for("Jupyter.display")]()`:
 *
 * | result            | chart                         | text                                      |
 * | ----------------- | ----------------------------- | ----------------------------------------- |
 * | `Table`           | none                          | source, rows, one line per column         |
 * | `Fit`             | coefficients (standardized)   | coefficients on both scales, fit numbers  |
 * | `SweepResult`     | validation curve              | the choice, a thinned CV table, notes     |
 * | `ComparisonResult`| comparison                    | one row per candidate, verdicts           |
 * | model-choice record | validation curve or comparison | data, folds, models, cautions          |
 * | verify report     | none                          | the report's text                         |
 *
 * Each bundle with a chart carries `application/vnd.vegalite.v5+json`, `image/svg+xml`,
 * `text/html` (the SVG inline, then a bare table), `text/markdown` (the tables), `text/plain`
 * (aligned, no control characters) and `image/png` when the rasterizer is available (see
 * charts/show.ts). Results attach these with `withDisplay`; this module imports only types from
 * the result modules, which import it, so the module graph stays one-directional.
 *
 * @module
 */
import type { Fit } from "../fit/fit.ts";
import type { ComparisonResult } from "../sweep/compare.ts";
import type { SweepResult } from "../sweep/sweep.ts";
import type { ScaleSweepResult } from "../stream/finish.ts";
import type { Table } from "../table/types.ts";
import {
  type FoldsSection,
  isSparseModel,
  type ModelChoiceRecord,
  type ModelSection,
  modelStrengths,
  standingStrength,
} from "../record/schema.ts";
import type { VerifyReport } from "../record/report.ts";
import { isSparse, type Penalty, type StrengthScale, strengthSymbol } from "../fit/penalty.ts";
import { makeBundle, type MimeBundle } from "./bundle.ts";
import { escapeHtml, escapeMarkdown, showControls } from "./escape.ts";
import { type Cell, type CellTable, formatHtmlTable, formatTextTable } from "./table.ts";
import { chartBundle, JUPYTER_DISPLAY, type ShownBundle, withDisplay } from "./charts/show.ts";
import { coefficientChart } from "./charts/coefficients.ts";
import { comparisonChart, type ComparisonSource } from "./charts/comparison.ts";
import { type CurveSource, validationCurveChart } from "./charts/validation.ts";
import { spreadIndices } from "./charts/sample.ts";
import { foldWords, num } from "./charts/theme.ts";

export { JUPYTER_DISPLAY, withDisplay };

/**
 * The plain caution every model result carries.
 *
 * @example
 * ```ts
 * import { CAUTION } from "./display.ts";
 * console.log(CAUTION.startsWith("Caution")); // true
 * ```
 */
export const CAUTION = "Caution: cross-validation error estimates how this choice does on rows " +
  "like these; it is not a guarantee for new data, and predictions outside the data's range " +
  "are extrapolation.";

/** Rows of the CV table shown in text (evenly spread over the grid, plus minimum and chosen). */
const CURVE_TABLE_ROWS = 12;

/** A text block in the three text forms. */
interface Texts {
  readonly plain: string;
  readonly html: string;
  readonly markdown: string;
}

/**
 * A Markdown pipe table, every cell escaped (`escapeMarkdown`), numeric columns right-aligned.
 *
 * @example
 * ```ts
 * import { markdownTable } from "./display.ts";
 * console.log(markdownTable({ header: ["term", "w"], rows: [["a|b", 1.5]] }));
 * // | term | w |
 * // | --- | ---: |
 * // | a\|b | 1.5 |
 * ```
 */
export function markdownTable(table: CellTable, digits = 6): string {
  const numeric = table.header.map((_, j) =>
    table.rows.some((r) => typeof r[j] === "number") &&
    table.rows.every((r) => typeof r[j] === "number" || r[j] === "")
  );
  // A formatted number holds only digits, ".", "e", "+" and minus signs: safe in a cell as is.
  const cell = (c: Cell) => (typeof c === "number" ? num(c, digits) : escapeMarkdown(c));
  const line = (cells: readonly string[]) => `| ${cells.join(" | ")} |`;
  return [
    line(table.header.map((h) => escapeMarkdown(h))),
    line(numeric.map((n) => (n ? "---:" : "---"))),
    ...table.rows.map((r) => line(r.map(cell))),
  ].join("\n");
}

/** Significant digits of numbers in result tables (enough to tell grid rows apart). */
const TABLE_DIGITS = 4;

/** Paragraphs and tables, in order, in the three text forms. */
function texts(parts: readonly (string | CellTable)[], digits = TABLE_DIGITS): Texts {
  const style = { digits };
  const plain = parts.map((p) => (typeof p === "string" ? p : formatTextTable(p, style)));
  const html = parts.map((p) =>
    typeof p === "string"
      ? `<p>${escapeHtml(p).replace(/\n/g, "<br>")}</p>`
      : formatHtmlTable(p, style)
  );
  const markdown = parts.map((p) =>
    typeof p === "string"
      ? p.split("\n").map(escapeMarkdown).join("  \n")
      : markdownTable(p, digits)
  );
  return { plain: plain.join("\n\n"), html: html.join("\n"), markdown: markdown.join("\n\n") };
}

/** "λ = 0.1", "λ = 0 (no penalty)" or "α = 0.01": a strength with its own symbol. */
function strengthText(scale: StrengthScale, strength: number): string {
  return `${strengthSymbol(scale)} = ${strength === 0 ? "0 (no penalty)" : num(strength)}`;
}

function penaltyWords(penalty: Penalty): string {
  if (isSparse(penalty)) {
    return penalty.kind === "lasso"
      ? "lasso (L1), α in the 1/(2N) convention"
      : `elastic net (L1 share ρ = ${penalty.mix}), α in the 1/(2N) convention`;
  }
  const { weights, exponent } = penalty;
  if (typeof weights !== "string") return "ridge with given weights γ per column";
  if (weights === "equal") return "ridge / weight decay (γ = 1 for every column)";
  return weights === "rising"
    ? `ridge with rising order weights (γ = order^${exponent})`
    : `ridge with falling order weights (γ = order^−${exponent})`;
}

// ---- sweep --------------------------------------------------------------------------------

/** The thinned CV table of a curve, with the minimum and the chosen row marked. */
function curveTable(source: CurveSource): CellTable {
  const { curve, minimum, chosen } = source;
  const picked = spreadIndices(curve.length, CURVE_TABLE_ROWS, [minimum.index, chosen.index]);
  const mark = (i: number) =>
    i === chosen.index && i === minimum.index
      ? "chosen = minimum"
      : i === chosen.index
      ? "chosen"
      : i === minimum.index
      ? "minimum"
      : "";
  return {
    header: source.scale === "alpha"
      ? ["α", "CV error", "± SE", "training MSE", "nonzero", "P(w*)", ""]
      : ["λ", "CV error", "± SE", "training MSE", "df", "budget C", ""],
    rows: picked.map((i) => {
      const p = curve[i];
      const size = source.scale === "alpha" ? p.nonzero : p.df;
      return [p.strength, p.cvMean, p.cvSe, p.trainMse, size, p.budget, mark(i)];
    }),
  };
}

/** What the words of a sweep need: its curve, its final model, and how that model was made. */
type SweepWords = CurveSource & { readonly fit: Fit };

function sweepTexts(s: SweepWords, finalModel: string, extra: readonly string[] = []): Texts {
  const labels = s.fit.terms.map((t) => t.term.label).join(" + ");
  const f = s.fit.summary;
  const table = curveTable(s);
  const rows = s.curve.length;
  return texts([
    `Model: ${s.target} from ${labels}; ${penaltyWords(f.penalty)}; ` +
    `${s.n} rows, ${foldWords(s.folds)}; ${rows} ${strengthSymbol(s.scale)} values.`,
    ...extra,
    table,
    ...(table.rows.length < rows
      ? [`(${table.rows.length} of ${rows} grid rows, evenly spread; result.curve holds all.)`]
      : []),
    f.scale === "alpha"
      ? `Chosen model, the all-rows coordinate-descent solution (no exact refit: the exact ` +
        `solver is for quadratic penalties): ${strengthText(f.scale, f.strength)}, ` +
        `${f.nonzero} of ${f.names.length} coefficients nonzero, training MSE ` +
        `${num(f.trainMse)}, intercept ${num(f.intercept)}. Objective: ${f.objective}. ` +
        "Show result.fit for its coefficients. GCV and closed-form leave-one-out are not " +
        "computed for sparse penalties."
      : `Chosen model, ${finalModel}: ${strengthText(f.scale, f.strength)}, ` +
        `${num(f.df)} effective df, budget C = ${num(f.budget)}, training MSE ` +
        `${num(f.trainMse)}, intercept ${num(f.intercept)}. Show result.fit for its coefficients.`,
    ...s.notes,
    CAUTION,
  ]);
}

/**
 * The MIME bundle of a sweep: the validation curve and the choice in words and numbers.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { sweepBundle } from "./display.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => v * v + 0.1 * Math.sin(5 * i)) }, {
 *   target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 8 },
 * });
 * const bundle = await sweepBundle(s);
 * console.log(bundle["text/plain"].split("\n")[0]); // Sweep: y
 * ```
 */
export function sweepBundle(s: SweepResult): Promise<ShownBundle> {
  const t = sweepTexts(s, "refit on all rows with the exact solver");
  return chartBundle(validationCurveChart(s), {
    heading: `Sweep: ${s.target}`,
    plain: t.plain,
    html: t.html,
    markdown: t.markdown,
  });
}

/**
 * The MIME bundle of a sweep over streamed or SQL data (`sweepStream`, `sweepSql`): the same
 * validation curve and words as `sweepBundle`, with the hash folds, the source and the passes.
 *
 * @example
 * ```ts
 * import { scaleSweepBundle } from "./display.ts";
 * // const result = await sweepStream("big.csv", { target: "y", terms: [...] });
 * // const bundle = await scaleSweepBundle(result);
 * ```
 */
export function scaleSweepBundle(r: ScaleSweepResult): Promise<ShownBundle> {
  const { k, repeats, seed } = r.folds;
  const folds = { scheme: "key-hash", k, repeats, seed } as const;
  const words = { ...r, folds };
  const key = r.folds.key === null ? "the data record number" : `column ${r.folds.key}`;
  const t = sweepTexts(words, "fitted from the all-rows summary", [
    `Rows from ${r.source}, read in ${r.passes} pass${r.passes === 1 ? "" : "es"}; ` +
    `folds from ${r.folds.hash} of ${key}.`,
  ]);
  return chartBundle(validationCurveChart(words), {
    heading: `Sweep: ${r.target}`,
    plain: t.plain,
    html: t.html,
    markdown: t.markdown,
  });
}

// ---- comparison ---------------------------------------------------------------------------

function comparisonTable(c: ComparisonSource): CellTable {
  const scales = new Set(c.candidates.map((d) => d.sweep.scale));
  const mixed = scales.size > 1;
  const symbol = strengthSymbol([...scales][0]);
  return {
    header: [
      "candidate",
      mixed ? "chosen λ or α" : symbol,
      "CV error",
      "± SE",
      "vs best",
      "± SE",
      "paired screen",
    ],
    rows: c.candidates.map((d) => [
      d.name,
      mixed ? strengthText(d.sweep.scale, d.strength) : d.strength,
      d.cvMean,
      d.cvSe,
      d.versusBest?.mean ?? "",
      d.versusBest?.se ?? "",
      d.versusBest === null
        ? "best"
        : d.versusBest.indistinguishable
        ? "within 2 SE"
        : "worse (> 2 SE)",
    ]),
  };
}

/**
 * The MIME bundle of a comparison: the comparison chart, a table and the verdicts.
 *
 * @example
 * ```ts
 * import { compare, legendre } from "../../mod.ts";
 * import { comparisonBundle } from "./display.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const c = compare({ x, y: x.map((v, i) => v * v + 0.05 * Math.sin(9 * i)) }, [
 *   { name: "quadratic", terms: [legendre("x", 2)], lambdas: [0] },
 *   { name: "degree 8", terms: [legendre("x", 8)] },
 * ], { target: "y", folds: { k: 5, seed: 2 } });
 * const bundle = await comparisonBundle(c);
 * ```
 */
export function comparisonBundle(c: ComparisonResult): Promise<ShownBundle> {
  const t = texts([
    `${c.candidates.length} candidates for ${c.target} on the same folds (${
      foldWords(c.folds)
    }); each at its own chosen ${
      c.candidates.some((d) => d.sweep.scale === "alpha")
        ? "strength (λ for ridge in sum-of-squares units, α for lasso / elastic net in the " +
          "1/(2N) convention)"
        : "λ"
    }. Paired screen: a candidate whose per-fold difference to the ` +
    "best has |mean| ≤ 2 SE cannot be told apart from it.",
    comparisonTable(c),
    c.verdict.join("\n"),
    CAUTION,
  ]);
  return chartBundle(comparisonChart(c), {
    heading: `Comparison: ${c.target}`,
    plain: t.plain,
    html: t.html,
    markdown: t.markdown,
  });
}

// ---- fit ----------------------------------------------------------------------------------

/**
 * The MIME bundle of a fit: the standardized coefficients as a chart, both scales in a table,
 * and the fit's numbers.
 *
 * @example
 * ```ts
 * import { fit, legendre } from "../../mod.ts";
 * import { fitBundle } from "./display.ts";
 * const x = Array.from({ length: 20 }, (_, i) => i / 19);
 * const m = fit({ x, y: x.map((v) => Math.sin(3 * v)) }, { target: "y", terms: [legendre("x", 4)], lambda: 0.1 });
 * const bundle = await fitBundle(m);
 * ```
 */
export function fitBundle(model: Fit): Promise<ShownBundle> {
  const s = model.summary;
  const t = texts([
    `${s.target} from ${model.terms.map((t) => t.term.label).join(" + ")}; ` +
    `${penaltyWords(s.penalty)}; ${strengthText(s.scale, s.strength)}; ${s.n} rows.`,
    ...(s.scale === "alpha" ? [`Objective: ${s.objective}.`] : []),
    {
      header: ["column", "order", "γ", "w* (standardized)", "w (data scale)"],
      rows: [
        ["(intercept)", "", "", s.standardized.intercept, s.intercept],
        ...s.names.map((name, q): Cell[] => [
          name,
          s.orders[q],
          s.gamma[q],
          s.standardized.coefficients[q],
          s.coefficients[q],
        ]),
      ],
    },
    s.descent !== null
      ? `${s.nonzero} of ${s.names.length} coefficients nonzero; penalty Σ γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] = ` +
        `${num(s.budget)}; training MSE ${num(s.trainMse)}; coordinate descent ` +
        `${s.descent.converged ? "converged" : "DID NOT converge"} (KKT violation ` +
        `${num(s.descent.violation)} ≤ ${num(s.descent.tolerance)} asked; duality gap ` +
        `${num(s.descent.gap)} per row).`
      : `Effective df ${num(s.df)}; budget C = Σ γ w*² = ${num(s.budget)}; training MSE ` +
        `${num(s.trainMse)}; residual SD ${num(s.residualSd)}; condition number ` +
        `${num(s.condition)}.`,
    "The standardized intercept is the prediction at the column means.",
    "Caution: a fit describes the rows it saw; predictions outside their range are " +
    "extrapolation.",
  ], 6);
  return chartBundle(coefficientChart(s), {
    heading: `Fit: ${s.target}`,
    plain: t.plain,
    html: t.html,
    markdown: t.markdown,
  });
}

// ---- table --------------------------------------------------------------------------------

/** Most category levels listed per column. */
const LEVELS_SHOWN = 6;

/**
 * The MIME bundle of a table: where it came from, its size, and one line per column (kind,
 * range or levels). No chart.
 *
 * @example
 * ```ts
 * import { parseCsv } from "../table/mod.ts";
 * import { tableBundle } from "./display.ts";
 * const bundle = await tableBundle(parseCsv("x,g\n1,a\n2,b\n"));
 * console.log(bundle["text/plain"]);
 * ```
 */
export function tableBundle(table: Table): Promise<MimeBundle> {
  const rows = [...table.columns.values()].map((c): Cell[] => {
    if (c.kind === "number") {
      let lo = Infinity;
      let hi = -Infinity;
      for (const v of c.values) {
        if (v < lo) lo = v;
        if (v > hi) hi = v;
      }
      return [c.name, "number", c.values.length > 0 ? lo : "", c.values.length > 0 ? hi : "", ""];
    }
    const shown = c.levels.slice(0, LEVELS_SHOWN).join(", ");
    const more = c.levels.length > LEVELS_SHOWN ? `, … (${c.levels.length} levels)` : "";
    return [c.name, "category", "", "", shown + more];
  });
  const dropped = table.missing.droppedLines;
  const t = texts([
    `${table.nRows} rows × ${table.names.length} columns from ${table.source}; missing values: ${
      table.missing.policy === "drop"
        ? `rows dropped (${dropped.length}${
          dropped.length > 0 ? `: lines ${dropped.slice(0, 10).join(", ")}` : ""
        }${dropped.length > 10 ? ", …" : ""})`
        : "none allowed"
    }.`,
    { header: ["column", "kind", "min", "max", "levels"], rows },
  ]);
  return makeBundle({
    title: `Table: ${table.source}`,
    plain: t.plain,
    htmlBody: t.html,
    markdown: t.markdown,
  });
}

// ---- model-choice record ------------------------------------------------------------------

/**
 * A recorded model's CV table in the shape the validation chart reads.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { recordCurveSource } from "./display.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const r = recordOf(sweep({ x, y: x.map((v, i) => v + 0.1 * Math.sin(5 * i)) }, {
 *   target: "y", terms: [legendre("x", 4)], folds: { k: 5, seed: 8 },
 * }));
 * console.log(recordCurveSource(r.models[0], r).curve.length); // 100
 * ```
 */
export function recordCurveSource(
  model: ModelSection,
  record: { readonly target: string; readonly folds: FoldsSection },
): CurveSource & { readonly names: readonly string[] } {
  const cv = model.cv;
  const st = modelStrengths(model);
  const ridge = isSparseModel(model) ? null : model.cv;
  return {
    target: record.target,
    n: model.final.n,
    names: model.final.names,
    folds: record.folds,
    notes: model.choice.notes,
    scale: st.scale,
    minimum: { rule: "min", index: model.choice.minimum.index, strength: st.minimum },
    chosen: { rule: model.choice.rule, index: model.choice.index, strength: st.chosen },
    curve: st.grid.map((strength, l) => ({
      strength,
      cvMean: cv.cvMean[l],
      cvSe: cv.cvSe[l],
      foldMse: cv.foldMse[l],
      trainMse: cv.trainMse[l],
      foldTrainMse: cv.foldTrainMse[l],
      df: st.size[l],
      budget: st.measure[l],
      nonzero: cv.path[l].filter((w) => w !== 0).length,
      gcv: ridge === null ? null : ridge.gcv[l],
      loo: ridge?.loo == null ? null : ridge.loo[l],
      path: cv.path[l],
    })),
  };
}

/**
 * A recorded comparison in the shape the comparison chart reads (null for a recorded sweep).
 *
 * @example
 * ```ts
 * import { compare, legendre, recordOf } from "../../mod.ts";
 * import { recordComparisonSource } from "./display.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const c = compare({ x, y: x.map((v, i) => v * v + 0.05 * Math.sin(11 * i)) }, [
 *   { name: "line", terms: [legendre("x", 1)], lambdas: [0] },
 *   { name: "degree 6", terms: [legendre("x", 6)] },
 * ], { target: "y", folds: { k: 5, seed: 1 } });
 * console.log(recordComparisonSource(recordOf(c))?.best);
 * ```
 */
export function recordComparisonSource(record: ModelChoiceRecord): ComparisonSource | null {
  const comparison = record.comparison;
  if (comparison === null) return null;
  return {
    target: record.target,
    folds: record.folds,
    best: comparison.best,
    candidates: comparison.candidates.map((c, i) => ({
      name: c.name,
      cvMean: c.cvMean,
      cvSe: c.cvSe,
      versusBest: c.versusBest,
      strength: standingStrength(c),
      sweep: recordCurveSource(record.models[i], record),
    })),
  };
}

/**
 * The MIME bundle of a model-choice record: its chart (validation curve of a sweep, or the
 * comparison) redrawn from the recorded numbers, and the record's content in words.
 *
 * @example
 * ```ts
 * import { legendre, recordOf, sweep } from "../../mod.ts";
 * import { recordBundle } from "./display.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const r = recordOf(sweep({ x, y: x.map((v, i) => v + 0.1 * Math.sin(5 * i)) }, {
 *   target: "y", terms: [legendre("x", 4)], folds: { k: 5, seed: 8 },
 * }));
 * const bundle = await recordBundle(r);
 * ```
 */
export function recordBundle(record: ModelChoiceRecord): Promise<ShownBundle> {
  const d = record.data;
  const f = record.folds;
  const models = record.models.map((m): Cell[] => [
    m.name ?? record.target,
    m.terms.map((t) => t.label).join(" + "),
    m.choice.rule,
    modelStrengths(m).chosen,
    m.cv.cvMean[m.choice.index],
    modelStrengths(m).finalSize,
  ]);
  const scales = new Set(record.models.map((m) => modelStrengths(m).scale));
  const chosenHeader = `chosen ${[...scales].map(strengthSymbol).join(" / ")}`;
  const sizeHeader = [...scales].map((x) => (x === "alpha" ? "nonzero" : "df")).join(" / ");
  const t = texts([
    `${record.schema} (${record.kind}) for target ${record.target}; written by ${record.software.library} ${record.software.version} on ${record.software.runtime} ${record.software.runtimeVersion}` +
    (record.created === null ? "." : `, ${record.created}.`),
    `Data: ${d.rows} rows of ${d.source}; SHA-256 of the used columns (${d.encoding}) ${d.sha256}.`,
    `Folds: ${foldWords(f)} (${f.scheme}${
      f.prng ? `, ${f.prng}` : ""
    }); assignment SHA-256 ${f.assignmentSha256}.`,
    { header: ["model", "terms", "rule", chosenHeader, "CV error", sizeHeader], rows: models },
    ...(record.comparison ? [record.comparison.verdict.join("\n")] : []),
    record.cautions.join("\n"),
    "Replay it with verify(record, data); save it with recordJson(record).",
  ]);
  const comparison = recordComparisonSource(record);
  const spec = comparison
    ? comparisonChart(comparison)
    : validationCurveChart(recordCurveSource(record.models[0], record));
  return chartBundle(spec, {
    heading: `Model-choice record: ${record.target}`,
    plain: t.plain,
    html: t.html,
    markdown: t.markdown,
  });
}

// ---- verify report ------------------------------------------------------------------------

/**
 * The MIME bundle of a verify report (synchronous: no chart). `text/plain` is exactly
 * `report.text()` with control characters made visible; HTML and Markdown lead with the verdict,
 * list every mismatch, count the checks per record section, and keep the full list of matched
 * fields in a `<details>` element (HTML) that opens without scripts.
 *
 * @example
 * ```ts
 * import { verifyReport } from "../record/report.ts";
 * import { verifyBundle } from "./display.ts";
 * const r = verifyReport([{ field: "data.rows", ok: true, expected: 3, actual: 3, tolerance: "exact", where: null }], []);
 * console.log(verifyBundle(r)["text/plain"].split("\n")[0]); // Record check: MATCH (1 of 1 checks pass)
 * ```
 */
export function verifyBundle(
  report: Pick<VerifyReport, "text" | "entries" | "failures" | "notes">,
): MimeBundle {
  const plain = report.text().split("\n").map(showControls).join("\n");
  const headline = plain.split("\n")[0];
  const shown = (v: unknown) => (typeof v === "string" ? v : JSON.stringify(v));
  const parts: (string | CellTable)[] = [];
  if (report.failures.length > 0) {
    parts.push({
      header: ["mismatched field", "where", "recorded", "recomputed", "tolerance"],
      rows: report.failures.map((f) => [
        f.field,
        f.where ?? "",
        clipText(shown(f.expected)),
        clipText(shown(f.actual)),
        f.tolerance,
      ]),
    });
  }
  parts.push(
    { header: ["record section", "checks", "matched"], rows: sectionCounts(report.entries) },
    ...report.notes,
    "A match means the record is what this data and these settings produce; it does not make " +
      "the validation error a guarantee, nor predictions outside the data's ranges reliable.",
  );
  const t = texts(parts);
  const matched = report.entries.filter((e) => e.ok).map((e) => e.field).join(", ");
  return {
    "text/plain": plain,
    "text/html": [
      "<div>",
      `<p><strong>${escapeHtml(headline)}</strong></p>`,
      t.html,
      `<details><summary>All ${report.entries.length - report.failures.length} matched ` +
      `fields</summary><p>${escapeHtml(matched)}</p></details>`,
      "</div>",
    ].join("\n"),
    "text/markdown": `**${escapeMarkdown(headline)}**\n\n${t.markdown}`,
  };
}

/** Checks per record section: `data`, `folds`, `models[0]`, …, `comparison`, `cautions`. */
function sectionCounts(entries: VerifyReport["entries"]): Cell[][] {
  const counts = new Map<string, [number, number]>();
  for (const e of entries) {
    const section = /^[^.[]+(\[\d+\])?/.exec(e.field)?.[0] ?? e.field;
    const [all, ok] = counts.get(section) ?? [0, 0];
    counts.set(section, [all + 1, ok + (e.ok ? 1 : 0)]);
  }
  return [...counts].map(([section, [all, ok]]) => [section, all, ok]);
}

/** Long recorded values (whole lists) cut for a table cell; report.text() has them whole. */
function clipText(text: string, limit = 80): string {
  return text.length <= limit ? text : `${text.slice(0, limit - 1)}…`;
}
