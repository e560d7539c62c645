/**
 * Legendre polynomial terms. A numeric column is mapped affinely from its domain [lo, hi] onto
 * [−1, 1] (t = ((x − lo) − (hi − x)) / (hi − lo), exactly ±1 at the ends) and expanded as
 * P_1(t) … P_d(t) by Bonnet's recurrence (n + 1) P_{n+1} = (2n + 1) t P_n − n P_{n−1}, which is
 * stable for |t| ≤ 1 (Abramowitz & Stegun 22.7.10, equation number recalled from memory; the
 * forward recurrence's error grows only slowly with n there, measured in test/legendre_test.ts).
 * P_0 = 1 is left to the model's intercept. Values are computed in double.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Table } from "../table/types.ts";
import {
  checkBlock,
  checkDegree,
  checkDomain,
  checkName,
  numericColumn,
  rowCount,
  valueRange,
} from "./checks.ts";
import type { LearnedTerm, Term } from "./types.ts";

/**
 * Options of `legendre`.
 *
 * @example
 * ```ts
 * import { legendre, type LegendreOptions } from "./legendre.ts";
 * const options: LegendreOptions = { domain: [0, 100] };
 * const term = legendre("age", 4, options);
 * ```
 */
export interface LegendreOptions {
  /**
   * Interval mapped onto [−1, 1]. When omitted it is learned as the training rows' [min, max].
   * Rows outside it are still expanded (the polynomials grow quickly there) and are counted.
   */
  readonly domain?: readonly [number, number];
}

/**
 * Legendre term: columns `P1(x)` … `Pd(x)` of column `x` mapped onto [−1, 1], with orders 1…d.
 * Learned parameter: `{ domain: [lo, hi] }` (the training rows' min and max unless given).
 * Rows outside the domain are counted by `apply`; their values are still computed.
 *
 * Errors: degree not a whole number in 1…200 (BAD_OPTION, option "degree"); bad domain
 * (BAD_OPTION, option "domain"); a category column (BAD_OPTION); training rows with a single
 * distinct value and no domain given (CONSTANT_COLUMN); an unknown column (UNKNOWN_COLUMN).
 *
 * @example
 * ```ts
 * import { legendre } from "./legendre.ts";
 * const table = {
 *   nRows: 3, names: ["x"],
 *   columns: new Map([["x", { kind: "number" as const, name: "x", values: Float64Array.of(0, 5, 10) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2, 3), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = legendre("x", 2).learn(table);
 * console.log(learned.names, learned.params); // [ "P1(x)", "P2(x)" ] { domain: [ 0, 10 ] }
 * ```
 */
export function legendre(column: string, degree: number, options: LegendreOptions = {}): Term {
  checkName(column, "legendre");
  const label = `legendre(${column}, ${degree})`;
  checkDegree(degree, label);
  const given = options.domain === undefined ? undefined : checkDomain(options.domain, label);
  const term: Term = {
    kind: "legendre",
    label,
    inputs: [column],
    spec: given === undefined
      ? { kind: "legendre", column, degree }
      : { kind: "legendre", column, degree, domain: [given[0], given[1]] },
    learn(table: Table, rows?: Int32Array): LearnedTerm {
      const values = numericColumn(table, column, label).values;
      const n = rowCount(table, rows, label);
      const domain = given ?? learnDomain(values, rows, n, table.source, column, label);
      return learnedLegendre(term, column, degree, domain);
    },
  };
  return term;
}

/** The training rows' [min, max], refusing a zero-width interval. */
function learnDomain(
  values: Float64Array,
  rows: Int32Array | undefined,
  n: number,
  source: string,
  column: string,
  label: string,
): readonly [number, number] {
  const [lo, hi] = valueRange(values, rows, n, label);
  if (lo < hi && Number.isFinite(hi - lo)) return [lo, hi];
  throw new CurbfitError(
    "CONSTANT_COLUMN",
    lo === hi
      ? `${label}: column ${JSON.stringify(column)} has the single value ${lo} in the training ` +
        "rows, so its domain has zero width"
      : `${label}: column ${JSON.stringify(column)} spans [${lo}, ${hi}], too wide to map`,
    "Drop the term, or pass { domain: [lo, hi] } to fix the interval yourself",
    { source, column },
  );
}

/** The learned form of a Legendre term on a fixed domain. */
function learnedLegendre(
  term: Term,
  column: string,
  degree: number,
  domain: readonly [number, number],
): LearnedTerm {
  const [lo, hi] = domain;
  const width = hi - lo;
  const names: string[] = [];
  const orders: number[] = [];
  for (let k = 1; k <= degree; k++) {
    names.push(`P${k}(${column})`);
    orders.push(k);
  }
  return {
    term,
    names,
    orders,
    params: { domain: [lo, hi] },
    trailing: false,
    apply(table, rows, block, offset, outside) {
      const values = numericColumn(table, column, term.label).values;
      const n = rowCount(table, rows, term.label);
      checkBlock(block, n, offset, degree, term.label);
      let count = 0;
      for (let i = 0; i < n; i++) {
        const x = values[rows === undefined ? i : rows[i]];
        if (x < lo || x > hi) {
          count++;
          if (outside !== undefined) outside[i] = 1;
        }
        const start = i * block.p + offset;
        writeLegendre(((x - lo) - (hi - x)) / width, degree, block.hi, start);
        block.lo?.fill(0, start, start + degree);
      }
      return count;
    },
  };
}

/** Writes P_1(t) … P_degree(t) into out[start …] by Bonnet's recurrence. */
function writeLegendre(t: number, degree: number, out: Float64Array, start: number): void {
  let previous = 1;
  let current = t;
  out[start] = current;
  for (let k = 1; k < degree; k++) {
    const next = ((2 * k + 1) * t * current - k * previous) / (k + 1);
    previous = current;
    current = next;
    out[start + k] = current;
  }
}

/**
 * P_0(t) … P_degree(t) at one point, by the same recurrence the term uses.
 *
 * @example
 * ```ts
 * import { legendreValues } from "./legendre.ts";
 * console.log(legendreValues(0.5, 3)); // Float64Array(4) [ 1, 0.5, -0.125, -0.4375 ]
 * ```
 */
export function legendreValues(t: number, degree: number): Float64Array {
  checkDegree(degree, "legendreValues");
  const out = new Float64Array(degree + 1);
  out[0] = 1;
  writeLegendre(t, degree, out, 1);
  return out;
}

/**
 * Change of Legendre basis between two domains of the same degree d: the (d+1)×(d+1) matrix T,
 * row-major, with
 *   [1, P_1^to(x), …, P_d^to(x)] = [1, P_1^from(x), …, P_d^from(x)] · T   for every x,
 * where P_k^D(x) is P_k of x mapped from domain D onto [−1, 1]. T is upper triangular; entry
 * (i, j) is the coefficient of P_i^from in P_j^to.
 *
 * Computed without sampling: with t the `from` coordinate, the `to` coordinate is s = αt + β
 * (α = width_from / width_to, β = (sum_from − sum_to) / width_to), and the Legendre-basis
 * coefficients of P_j(s) follow Bonnet's recurrence on coefficient vectors, multiplying by t
 * with t·P_k = ((k+1) P_{k+1} + k P_{k−1}) / (2k+1) (the same recurrence solved for t·P_k).
 * For domains that differ by a few percent α ≈ 1, β ≈ 0 and every step is well conditioned.
 *
 * Accuracy (test/legendre_test.ts): entries match exact rational arithmetic to about 2e-14
 * relative up to degree 50. Applying T is only as good as its size allows: when `to` is
 * narrower than `from`, P_d^to grows on the part of `from` outside `to`, entries of T grow like
 * that (max |T| ≈ 1e3 at degree 25, 4e7 at degree 50, for a 3% narrower domain) and products
 * [1, P^from]·T lose about log10(max |T|) digits. Reproduction to 1e-12 (relative to
 * max(1, |value|)) is tested up to degree 25 for domains a few percent apart.
 *
 * Used by the sweep to move a design built on one domain to a fold's learned domain.
 *
 * @example
 * ```ts
 * import { legendreRebase } from "./legendre.ts";
 * // Same domain: the identity.
 * console.log(legendreRebase([0, 1], [0, 1], 1)); // Float64Array(4) [ 1, 0, 0, 1 ]
 * // [0, 2] → [0, 1]: P_1 on [0, 1] is 2x − 1 = 1 + P_1 on [0, 2] (which is x − 1).
 * console.log(legendreRebase([0, 2], [0, 1], 1)); // Float64Array(4) [ 1, 1, 0, 2 ]
 * ```
 */
export function legendreRebase(
  domainFrom: readonly [number, number],
  domainTo: readonly [number, number],
  degree: number,
): Float64Array {
  const label = "legendreRebase";
  checkDegree(degree, label);
  const [a0, a1] = checkDomain(domainFrom, label);
  const [b0, b1] = checkDomain(domainTo, label);
  const alpha = (a1 - a0) / (b1 - b0);
  const beta = ((a0 - b0) + (a1 - b1)) / (b1 - b0);
  const size = degree + 1;
  const out = new Float64Array(size * size);
  let previous = new Float64Array(size); // coefficients of P_{j−1}(s)
  let current = new Float64Array(size); // coefficients of P_j(s)
  current[0] = 1;
  out[0] = 1;
  for (let j = 0; j < degree; j++) {
    // next = ((2j+1) (α t + β) current − j previous) / (j+1), ordered so that integer steps
    // stay exact (equal domains give exactly the identity).
    const next = new Float64Array(size);
    for (let k = 0; k <= j; k++) {
      const c = current[k];
      if (c === 0) continue;
      const scaled = (2 * j + 1) * alpha * c;
      next[k + 1] += scaled * (k + 1) / (2 * k + 1);
      if (k > 0) next[k - 1] += scaled * k / (2 * k + 1);
      next[k] += (2 * j + 1) * beta * c;
    }
    for (let k = 0; k <= j + 1; k++) next[k] = (next[k] - j * previous[k]) / (j + 1);
    previous = current;
    current = next;
    for (let k = 0; k <= j + 1; k++) out[k * size + j + 1] = current[k];
  }
  return out;
}
