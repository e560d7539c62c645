/**
 * Interaction terms: all pairwise products of two terms' columns.
 *
 * @module
 */
import { ddMul } from "../numeric/dd.ts";
import type { Table } from "../table/types.ts";
import { checkBlock, checkTerm, rowCount } from "./checks.ts";
import type { DesignBlock, LearnedTerm, Term } from "./types.ts";

/**
 * Product term: for each column `a_i` of `left` and `b_j` of `right` (left-major order), the
 * column `a_i*b_j` with order `order(a_i) + order(b_j)`. Products are taken in double-double:
 * (ah + al)(bh + bl) ≈ TwoProduct(ah, bh) + (ah·bl + al·bh), dropping only al·bl.
 *
 * Learned parameters: `{ left, right }`, each side's own parameters, learned from the same
 * rows. A row counts as outside when it is outside for either side.
 *
 * @example
 * ```ts
 * import { product } from "./product.ts";
 * import { column } from "./power.ts";
 * import { indicators } from "./indicators.ts";
 * const table = {
 *   nRows: 2, names: ["dose", "site"],
 *   columns: new Map<string, import("../table/types.ts").Column>([
 *     ["dose", { kind: "number", name: "dose", values: Float64Array.of(2, 3) }],
 *     ["site", { kind: "category", name: "site", levels: ["a", "b"], codes: Int32Array.of(0, 1) }],
 *   ]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = product(column("dose"), indicators("site")).learn(table);
 * const block = { n: 2, p: 1, hi: new Float64Array(2), lo: new Float64Array(2) };
 * learned.apply(table, undefined, block, 0);
 * console.log(learned.names, block.hi); // [ "dose*site=b" ] Float64Array(2) [ 0, 3 ]
 * ```
 */
export function product(left: Term, right: Term): Term {
  checkTerm(left, "product()", "left");
  checkTerm(right, "product()", "right");
  const label = `product(${left.label}, ${right.label})`;
  const term: Term = {
    kind: "product",
    label,
    inputs: [...new Set([...left.inputs, ...right.inputs])],
    spec: { kind: "product", left: left.spec, right: right.spec },
    learn(table: Table, rows?: Int32Array): LearnedTerm {
      return learnedProduct(term, left.learn(table, rows), right.learn(table, rows));
    },
  };
  return term;
}

/** The learned form of a product of two learned terms. */
function learnedProduct(term: Term, a: LearnedTerm, b: LearnedTerm): LearnedTerm {
  const names: string[] = [];
  const orders: number[] = [];
  for (let i = 0; i < a.names.length; i++) {
    for (let j = 0; j < b.names.length; j++) {
      names.push(`${a.names[i]}*${b.names[j]}`);
      orders.push(a.orders[i] + b.orders[j]);
    }
  }
  return {
    term,
    names,
    orders,
    params: { left: a.params, right: b.params },
    trailing: true,
    apply(table, rows, block, offset, outside) {
      const n = rowCount(table, rows, term.label);
      checkBlock(block, n, offset, names.length, term.label, true);
      const flags = new Uint8Array(n);
      const left = sideBlock(n, a);
      const right = sideBlock(n, b);
      const out = block.lo ?? new Float64Array(0); // not null: checkBlock with trailing
      const { lo: leftLo } = left;
      const { lo: rightLo } = right;
      a.apply(table, rows, left, 0, flags);
      b.apply(table, rows, right, 0, flags);
      let count = 0;
      for (let r = 0; r < n; r++) {
        if (flags[r] === 1) {
          count++;
          if (outside !== undefined) outside[r] = 1;
        }
        let k = r * block.p + offset;
        for (let i = r * left.p; i < (r + 1) * left.p; i++) {
          for (let j = r * right.p; j < (r + 1) * right.p; j++, k++) {
            const [hi, lo] = ddMul(
              left.hi[i],
              leftLo === null ? 0 : leftLo[i],
              right.hi[j],
              rightLo === null ? 0 : rightLo[j],
            );
            block.hi[k] = hi;
            out[k] = lo;
          }
        }
      }
      return count;
    },
  };
}

/** A zeroed scratch block for one side's columns (with trailing parts when it writes them). */
function sideBlock(n: number, side: LearnedTerm): DesignBlock {
  const p = side.names.length;
  return { n, p, hi: new Float64Array(n * p), lo: side.trailing ? new Float64Array(n * p) : null };
}
