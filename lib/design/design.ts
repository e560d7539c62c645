/**
 * From terms to a design matrix: learn every term on training rows, then write the columns of
 * all terms for any rows into one double-double block.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { Table } from "../table/types.ts";
import { checkTerm, rowCount } from "./checks.ts";
import type { Design, Json, LearnedTerm, OutsideCount, Term } from "./types.ts";

/**
 * Learns every term from `rows` of `table` (all rows when omitted): domains (and the ranges
 * used to count rows outside them) come from those rows only. Checks that the terms' output names are unique.
 *
 * Errors: an unknown column (UNKNOWN_COLUMN, naming it, listing the table's columns and
 * suggesting the nearest name); two outputs with the same name (BAD_OPTION, option "terms");
 * anything a term itself refuses.
 *
 * @example
 * ```ts
 * import { learnTerms } from "./design.ts";
 * import { legendre } from "./legendre.ts";
 * import { column } from "./power.ts";
 * const table = {
 *   nRows: 4, names: ["x", "z"],
 *   columns: new Map([
 *     ["x", { kind: "number" as const, name: "x", values: Float64Array.of(1, 2, 3, 4) }],
 *     ["z", { kind: "number" as const, name: "z", values: Float64Array.of(0, 1, 0, 1) }],
 *   ]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2, 3, 4), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = learnTerms([legendre("x", 2), column("z")], table, Int32Array.of(0, 1));
 * console.log(learned[0].params); // { domain: [ 1, 2 ] }
 * ```
 */
export function learnTerms(
  terms: readonly Term[],
  table: Table,
  rows?: Int32Array,
): readonly LearnedTerm[] {
  if (!Array.isArray(terms)) {
    throw new CurbfitError(
      "BAD_OPTION",
      "option terms must be a list of terms",
      'Pass an array, e.g. [legendre("x", 5), column("z")]',
      { option: "terms" },
    );
  }
  terms.forEach((term, i) => checkTerm(term, "learnTerms()", `terms[${i}]`));
  const learned = terms.map((term) => term.learn(table, rows));
  checkUniqueNames(learned);
  return learned;
}

/**
 * Writes the design for `rows` of `table` (all rows when omitted) from learned terms: columns
 * in term order, each term's columns in its own order. Rows outside what a term learned are
 * written as usual and counted per term in `outside`.
 *
 * Errors: an unknown column or unknown category level in `table`; a value that overflows
 * (NOT_FINITE, naming the design column and source line); duplicate output names.
 *
 * @example
 * ```ts
 * import { buildDesign, learnTerms } from "./design.ts";
 * import { legendre } from "./legendre.ts";
 * const table = {
 *   nRows: 3, names: ["x"],
 *   columns: new Map([["x", { kind: "number" as const, name: "x", values: Float64Array.of(0, 1, 3) }]]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2, 3), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = learnTerms([legendre("x", 2)], table, Int32Array.of(0, 1));
 * const design = buildDesign(learned, table);
 * console.log(design.names, design.outside); // [ "P1(x)", "P2(x)" ] [ { label: "legendre(x, 2)", count: 1 } ]
 * ```
 */
export function buildDesign(
  learned: readonly LearnedTerm[],
  table: Table,
  rows?: Int32Array,
): Design {
  const names = checkUniqueNames(learned);
  const n = rowCount(table, rows, "buildDesign");
  const p = names.length;
  // Trailing parts take memory only when some term writes them (powers above 1, products).
  const trailing = learned.some((term) => term.trailing);
  const block = {
    n,
    p,
    hi: new Float64Array(n * p),
    lo: trailing ? new Float64Array(n * p) : null,
  };
  const termIndex = new Int32Array(p);
  const orders: number[] = [];
  let offset = 0;
  learned.forEach((term, t) => {
    termIndex.fill(t, offset, offset + term.names.length);
    orders.push(...term.orders);
    offset += term.names.length;
  });
  // Every term writes one block of rows at a time, so the rows being written stay in cache
  // (a term's columns are strided across the row-major block).
  const selected = rows ?? allRows(n);
  const counts = new Array<number>(learned.length).fill(0);
  for (let start = 0; start < n; start += BUILD_ROWS) {
    const end = Math.min(n, start + BUILD_ROWS);
    const part = {
      n: end - start,
      p,
      hi: block.hi.subarray(start * p, end * p),
      lo: block.lo === null ? null : block.lo.subarray(start * p, end * p),
    };
    const partRows = selected.subarray(start, end);
    offset = 0;
    learned.forEach((term, t) => {
      counts[t] += term.apply(table, partRows, part, offset);
      offset += term.names.length;
    });
  }
  const outside: OutsideCount[] = learned.map((term, t) => ({
    label: term.term.label,
    count: counts[t],
  }));
  checkFinite(block, names, table, rows);
  return { n, p, names, orders, termIndex, block, outside };
}

/** Rows written per block by `buildDesign`. */
const BUILD_ROWS = 1024;

/** The row indices 0 … n − 1. */
function allRows(n: number): Int32Array {
  const rows = new Int32Array(n);
  for (let i = 0; i < n; i++) rows[i] = i;
  return rows;
}

/** All output names in order, or an error naming the first repeated one and its two terms. */
function checkUniqueNames(learned: readonly LearnedTerm[]): string[] {
  const ownerOf = new Map<string, string>();
  const names: string[] = [];
  for (const term of learned) {
    for (const name of term.names) {
      const owner = ownerOf.get(name);
      if (owner !== undefined) {
        throw new CurbfitError(
          "BAD_OPTION",
          `terms ${owner} and ${term.term.label} both produce a column named ` +
            JSON.stringify(name) +
            (owner === term.term.label ? " (the same term twice)" : ""),
          "Remove one of them; the same column twice cannot be fitted separately",
          { option: "terms" },
        );
      }
      ownerOf.set(name, term.term.label);
      names.push(name);
    }
  }
  return names;
}

/** NOT_FINITE for the first design value that overflowed, naming its column and line. */
function checkFinite(
  block: Design["block"],
  names: readonly string[],
  table: Table,
  rows: Int32Array | undefined,
): void {
  const { hi, lo } = block;
  for (let k = 0; k < hi.length; k++) {
    if (Number.isFinite(hi[k]) && (lo === null || Number.isFinite(lo[k]))) continue;
    const i = Math.floor(k / block.p);
    const r = rows === undefined ? i : rows[i];
    throw new CurbfitError(
      "NOT_FINITE",
      `design column ${JSON.stringify(names[k % block.p])} overflows double precision ` +
        "(beyond ±1.8e308)",
      "Use legendre() on a learned domain, a lower degree, or rescale the column",
      { source: table.source, line: table.lineOfRow[r] },
    );
  }
}

/**
 * Does this term's output depend on which rows it learned from? True when its recipe holds a
 * Legendre term without a given domain (the domain is the training rows' range), directly or
 * inside a product. Plain columns, powers and indicators (levels come from the table) write the
 * same values whatever rows they learned on, so per-fold learning can be skipped for them.
 *
 * @example
 * ```ts
 * import { learnsFromRows } from "./design.ts";
 * import { column, legendre } from "./mod.ts";
 * console.log(learnsFromRows(legendre("x", 3)), learnsFromRows(column("z"))); // true false
 * console.log(learnsFromRows(legendre("x", 3, { domain: [0, 1] }))); // false
 * ```
 */
export function learnsFromRows(term: Term): boolean {
  return specLearns(term.spec);
}

function specLearns(spec: Json): boolean {
  if (Array.isArray(spec)) return spec.some(specLearns);
  if (typeof spec !== "object" || spec === null) return false;
  const o = spec as { readonly [k: string]: Json };
  if (o.kind === "legendre" && o.domain === undefined) return true;
  return Object.values(o).some(specLearns);
}
