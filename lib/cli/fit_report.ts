/**
 * The report of `curbfit fit`: one model fitted at a given λ (or budget) on all rows. No λ is
 * chosen and nothing is validated, so there is no model-choice record; the report says so and
 * points to `sweep` for evidence.
 *
 * @module
 */
import type { Fit } from "../fit/fit.ts";
import type { Table } from "../table/types.ts";
import { summarizeData } from "../record/mod.ts";
import type { Block } from "../statement/blocks.ts";
import { coefficientTable, describePenalty, domainCaution } from "../statement/sections.ts";
import { isSparse, strengthSymbol } from "../fit/penalty.ts";
import { formatNumber } from "../views/table.ts";

/**
 * The blocks of a fit report.
 *
 * @example
 * ```ts
 * import { column, fit, tableFromColumns } from "../../mod.ts";
 * import { fitBlocks } from "./fit_report.ts";
 * const table = tableFromColumns({ x: [1, 2, 3, 4], y: [1.1, 1.9, 3.2, 3.9] });
 * const f = fit(table, { target: "y", terms: [column("x")] });
 * console.log(fitBlocks(f, table)[0]); // { kind: "heading", level: 1, text: "Fitted model: y" }
 * ```
 */
export function fitBlocks(f: Fit, table: Table): Block[] {
  const s = f.summary;
  const n = (x: number) => formatNumber(x, 4);
  const inputs = [...new Set(f.terms.flatMap((t) => t.term.inputs))];
  const data = summarizeData(table, [s.target, ...inputs]);
  return [
    { kind: "heading", level: 1, text: `Fitted model: ${s.target}` },
    {
      kind: "paragraph",
      parts: [
        `${s.n} rows from `,
        { code: table.source },
        `; terms ${f.terms.map((t) => t.term.label).join(", ")}; ` +
        `${
          isSparse(s.penalty)
            ? s.objective
            : describePenalty(s.penalty, s.standardize, s.hasIntercept)
        }; ${strengthSymbol(s.scale)} = ${n(s.strength)} ` +
        (s.descent === null
          ? `(penalty budget C = ${n(s.budget)}).`
          : s.gamma.every((g) => g === 1)
          ? `(P(w*) = ρ‖w*‖₁ + ((1 − ρ)/2)‖w*‖² = ${n(s.budget)}).`
          : `(P(w*) = Σ_q γ_q [ρ|w*_q| + ((1 − ρ)/2) w*_q²] = ${n(s.budget)}; γ = ` +
            `${s.gamma.map(n).join(", ")}).`),
      ],
    },
    {
      kind: "paragraph",
      parts: [
        s.descent === null
          ? `Effective degrees of freedom ${n(s.df)}, training MSE ${n(s.trainMse)}, residual ` +
            `SD ${n(s.residualSd)}, condition number ${n(s.condition)}.`
          : `${s.nonzero} of ${s.names.length} coefficients nonzero, training MSE ` +
            `${n(s.trainMse)}, condition number ${n(s.condition)}; coordinate descent ` +
            `${s.descent.converged ? "converged" : "DID NOT converge"} (scaled KKT violation ` +
            `${n(s.descent.violation)}, tolerance ${n(s.descent.tolerance)}; duality gap ` +
            `${n(s.descent.gap)} per row).`,
      ],
    },
    { kind: "table", table: coefficientTable(s), digits: 6 },
    { kind: "heading", level: 2, text: "Cautions" },
    {
      kind: "list",
      items: [
        [
          "No cross-validation was run: the training error understates the error on new rows. " +
          "Use curbfit sweep to choose λ with evidence and a record.",
        ],
        ...domainCaution(data.columns, s.target),
      ],
    },
  ];
}
