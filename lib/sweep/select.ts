/**
 * Rules that pick λ from a cross-validation curve (ascending λ).
 *
 * - "min": the λ with the smallest mean CV error (first one on ties).
 * - "one-se": the largest λ whose mean CV error is within one standard error of the minimum,
 *   mean(λ) ≤ mean(λ_min) + SE(λ_min) (Breiman, Friedman, Olshen & Stone 1984, *Classification
 *   and Regression Trees*; Hastie, Tibshirani & Friedman, *Elements of Statistical Learning*
 *   2nd ed., §7.10). It prefers the simpler (more penalized) model the data cannot tell apart.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

/** A selection rule. */
export type SelectionRule = "min" | "one-se";

/** Which grid point a rule picked. */
export interface Choice {
  /** The rule that made this choice. */
  readonly rule: SelectionRule;
  /** Position of the chosen point in the ascending grid (and in the sweep's `curve`). */
  readonly index: number;
  /** The chosen strength: ridge λ or sparse α (the sweep result's `scale` says which). */
  readonly strength: number;
}

/**
 * Applies a rule to mean CV errors and their standard errors over an ascending λ grid.
 *
 * @example
 * ```ts
 * import { choose } from "./select.ts";
 * const lambdas = [0.1, 1, 10];
 * console.log(choose("one-se", lambdas, [1.0, 0.9, 0.95], [0.1, 0.1, 0.1]).strength); // 10
 * ```
 */
export function choose(
  rule: SelectionRule,
  lambdas: readonly number[],
  mean: ArrayLike<number>,
  se: ArrayLike<number>,
): Choice {
  let best = 0;
  for (let i = 1; i < lambdas.length; i++) if (mean[i] < mean[best]) best = i;
  if (rule === "min") return { rule, index: best, strength: lambdas[best] };
  if (rule !== "one-se") {
    throw new CurbfitError(
      "BAD_OPTION",
      `rule is ${JSON.stringify(rule)}`,
      'Use "min" (smallest CV error) or "one-se" (largest λ within one standard error of it)',
      { option: "rule" },
    );
  }
  const limit = mean[best] + (Number.isFinite(se[best]) ? se[best] : 0);
  let index = best;
  for (let i = lambdas.length - 1; i > best; i--) {
    if (mean[i] <= limit) {
      index = i;
      break;
    }
  }
  return { rule, index, strength: lambdas[index] };
}

/**
 * The minimum and the rule's choice on a curve of points (ascending strength) with mean CV errors
 * and their standard errors: what every sweep reports.
 *
 * @example
 * ```ts
 * import { chooseOnCurve } from "./select.ts";
 * const curve = [0.1, 1, 10].map((strength, i) => ({ strength, cvMean: [1, 0.9, 0.95][i], cvSe: 0.1 }));
 * const { minimum, chosen } = chooseOnCurve(curve, "one-se");
 * console.log(minimum.strength, chosen.strength); // 1 10
 * ```
 */
export function chooseOnCurve(
  curve: readonly { readonly strength: number; readonly cvMean: number; readonly cvSe: number }[],
  rule: SelectionRule = "min",
): { minimum: Choice; chosen: Choice } {
  const grid = curve.map((c) => c.strength);
  const means = curve.map((c) => c.cvMean);
  const ses = curve.map((c) => c.cvSe);
  return { minimum: choose("min", grid, means, ses), chosen: choose(rule, grid, means, ses) };
}
