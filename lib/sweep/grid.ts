/**
 * The λ grid. Automatic grids are log-spaced between bounds read off the all-rows spectrum
 * e_j (squared singular values of the standardized, γ-weighted design):
 *   top    = 2 Σ e_j            so df(top) = Σ e/(e+top) < 1/2 (well below one parameter),
 *   bottom = 10⁻³ · e_min       so df(bottom) > 0.999 p (nearly unregularized),
 * with bottom raised to 10⁻¹⁰ · e_max for nearly singular designs (the curve is flat below it).
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

/** How to make the grid: explicit values, or an automatic log-spaced grid. */
export type LambdaGrid =
  | readonly number[]
  | { readonly count?: number; readonly min?: number; readonly max?: number };

/** Default number of λ values in an automatic grid. */
export const DEFAULT_GRID_SIZE = 100;

/**
 * The ascending λ values for a grid spec and the all-rows spectrum.
 *
 * @example
 * ```ts
 * import { lambdaGrid } from "./grid.ts";
 * console.log(lambdaGrid({ count: 3, min: 0.1, max: 10 }, Float64Array.of(4, 1))); // [0.1, 1, 10]
 * ```
 */
export function lambdaGrid(spec: LambdaGrid | undefined, e: Float64Array): number[] {
  if (Array.isArray(spec)) return explicitGrid(spec as readonly number[]);
  const auto = (spec ?? {}) as { count?: number; min?: number; max?: number };
  const count = auto.count ?? DEFAULT_GRID_SIZE;
  if (!Number.isInteger(count) || count < 2 || count > 10000) {
    throw new CurbfitError(
      "BAD_OPTION",
      `lambdas.count is ${count}, but it must be a whole number from 2 to 10000`,
      "Ask for e.g. { count: 50 }",
      { option: "lambdas.count" },
    );
  }
  const positive = Array.from(e).filter((v) => v > 0);
  const eMax = positive.length ? Math.max(...positive) : 1;
  const eMin = positive.length ? Math.min(...positive) : 1;
  const top = auto.max ?? 2 * positive.reduce((s, v) => s + v, 0);
  const bottom = auto.min ?? Math.max(1e-3 * eMin, 1e-10 * eMax);
  for (const [name, v] of [["min", bottom], ["max", top]] as const) {
    if (!(Number.isFinite(v) && v > 0)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `lambdas.${name} is ${v}, but it must be a finite number > 0`,
        "Give positive bounds, or leave them out for an automatic grid",
        { option: `lambdas.${name}` },
      );
    }
  }
  if (!(top > bottom)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `lambdas.max (${top}) must exceed lambdas.min (${bottom})`,
      "Swap or widen the bounds",
      { option: "lambdas.max" },
    );
  }
  const step = Math.log(top / bottom) / (count - 1);
  return Array.from(
    { length: count },
    (_, i) => i === count - 1 ? top : bottom * Math.exp(step * i),
  );
}

function explicitGrid(values: readonly number[]): number[] {
  if (values.length === 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      "lambdas is an empty list",
      "Give at least one λ >= 0, or leave lambdas out for an automatic grid",
      { option: "lambdas" },
    );
  }
  values.forEach((v, i) => {
    if (!(typeof v === "number" && Number.isFinite(v) && v >= 0)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `lambdas[${i}] is ${v}, but every λ must be a finite number >= 0`,
        "Remove negative or non-numeric values",
        { option: `lambdas[${i}]` },
      );
    }
  });
  return [...new Set(values)].sort((a, b) => a - b);
}
