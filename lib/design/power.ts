/**
 * Plain numeric columns and their raw powers x, x², …, x^d. Powers are computed in
 * double-double by repeated products x^k = x^(k−1) · x (Dekker's TwoProduct for hi·x plus the
 * cross term lo·x), so each is the exact power of the stored double to about 30 significant
 * digits (relative error below about k · 2⁻¹⁰⁴); the exact solver needs this to reach NIST
 * certified accuracy on polynomial problems such as Filip and Wampler.
 *
 * @module
 */
import { productError, splitHigh } from "../numeric/dd.ts";
import type { Table } from "../table/types.ts";
import {
  checkBlock,
  checkDegree,
  checkName,
  numericColumn,
  rowCount,
  valueRange,
} from "./checks.ts";
import type { DesignBlock, Json, LearnedTerm, Term, TermKind } from "./types.ts";

/**
 * Raw powers of a numeric column: `x`, `x^2`, …, `x^d` with orders 1…d, in double-double
 * (`block.hi` + `block.lo`). Nothing learned affects the values (`params` is null); learning
 * remembers the training rows' [min, max] only so that `apply` can count rows outside it
 * (extrapolation).
 *
 * Errors: degree not a whole number in 1…200 (BAD_OPTION, option "degree"); a category column
 * (BAD_OPTION); an unknown column (UNKNOWN_COLUMN). Raw powers of a wide-ranging column are
 * badly conditioned; prefer `legendre` unless the raw coefficients are wanted.
 *
 * @example
 * ```ts
 * import { power } from "./power.ts";
 * const table = {
 *   nRows: 2, names: ["x"],
 *   columns: new Map([["x", { kind: "number" as const, name: "x", values: Float64Array.of(0.1, 3) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = power("x", 2).learn(table);
 * const block = { n: 2, p: 2, hi: new Float64Array(4), lo: new Float64Array(4) };
 * learned.apply(table, undefined, block, 0);
 * console.log(learned.names, block.hi[1], block.lo[1]); // [ "x", "x^2" ] 0.010000000000000002 -8.326672684688674e-19
 * ```
 */
export function power(column: string, degree: number): Term {
  checkName(column, "power");
  const label = `power(${column}, ${degree})`;
  checkDegree(degree, label);
  return powersTerm("power", label, column, degree, { kind: "power", column, degree });
}

/**
 * A plain numeric column, one output named after the column, order 1. Like `power`, `params` is
 * null and the training rows' [min, max] is kept only to count rows outside it.
 *
 * `column` does not dispatch on category columns: naming one is an error that suggests
 * `indicators(name)`. A numeric-looking column that was loaded as categories (say, one stray
 * "n/a") would otherwise silently turn into dozens of indicator columns.
 *
 * @example
 * ```ts
 * import { column } from "./power.ts";
 * const table = {
 *   nRows: 2, names: ["age"],
 *   columns: new Map([["age", { kind: "number" as const, name: "age", values: Float64Array.of(31, 47) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = column("age").learn(table, Int32Array.of(0));
 * console.log(learned.names, learned.params); // [ "age" ] null
 * const block = { n: 2, p: 1, hi: new Float64Array(2), lo: new Float64Array(2) };
 * console.log(learned.apply(table, undefined, block, 0)); // 1 (47 is outside [31, 31])
 * ```
 */
export function column(name: string): Term {
  checkName(name, "column");
  return powersTerm("column", `column(${name})`, name, 1, { kind: "column", column: name });
}

/** The term writing x^1 … x^degree of one numeric column in double-double. */
function powersTerm(kind: TermKind, label: string, name: string, degree: number, spec: Json): Term {
  const names: string[] = [];
  const orders: number[] = [];
  for (let k = 1; k <= degree; k++) {
    names.push(k === 1 ? name : `${name}^${k}`);
    orders.push(k);
  }
  const term: Term = {
    kind,
    label,
    inputs: [name],
    spec,
    learn(table: Table, rows?: Int32Array): LearnedTerm {
      const values = numericColumn(table, name, label).values;
      const [min, max] = valueRange(values, rows, rowCount(table, rows, label), label);
      return {
        term,
        names,
        orders,
        params: null,
        trailing: degree > 1,
        apply(table, rows, block, offset, outside) {
          const values = numericColumn(table, name, label).values;
          const n = rowCount(table, rows, label);
          checkBlock(block, n, offset, degree, label, degree > 1);
          let count = 0;
          for (let i = 0; i < n; i++) {
            const x = values[rows === undefined ? i : rows[i]];
            if (x < min || x > max) {
              count++;
              if (outside !== undefined) outside[i] = 1;
            }
            writePowers(x, degree, block, i * block.p + offset);
          }
          return count;
        },
      };
    },
  };
  return term;
}

/**
 * Writes x^1 … x^degree in double-double at block position `start`: each step is the
 * double-double product (hi + lo)·x (TwoProduct of hi and x, plus lo·x, renormalized), with the
 * split of x taken once. The block has trailing parts whenever degree > 1 (checkBlock).
 */
function writePowers(x: number, degree: number, block: DesignBlock, start: number): void {
  let hi = x;
  let lo = 0;
  block.hi[start] = hi;
  const trailing = block.lo;
  if (trailing === null) return;
  trailing[start] = lo;
  const xHi = splitHigh(x);
  const xLo = x - xHi;
  for (let k = 1; k < degree; k++) {
    const prod = hi * x;
    const hHi = splitHigh(hi);
    const e = productError(prod, hHi, hi - hHi, xHi, xLo) + (hi * 0 + lo * x);
    hi = prod + e;
    lo = e - (hi - prod);
    block.hi[start + k] = hi;
    trailing[start + k] = lo;
  }
}
