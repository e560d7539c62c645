/**
 * Terms and the design matrix. A `Term` is a recipe (e.g. Legendre degree 10 of column x);
 * `learn` fixes its parameters from training rows only; the resulting `LearnedTerm` writes its
 * columns for any rows, counting rows that fall outside what it learned.
 *
 * @module
 */
import type { Table } from "../table/types.ts";

/**
 * JSON-safe values, for learned parameters written into records.
 *
 * @example
 * ```ts
 * import type { Json } from "./types.ts";
 * const params: Json = { domain: [0, 10] };
 * ```
 */
export type Json =
  | null
  | boolean
  | number
  | string
  | readonly Json[]
  | { readonly [k: string]: Json };

/**
 * Row-major block of design values in double-double: value = hi[i * p + j] + lo[i * p + j].
 * `lo` is zero wherever a value is exact in double (and for Legendre columns, which are
 * computed in double).
 *
 * @example
 * ```ts
 * import type { DesignBlock } from "./types.ts";
 * const block: DesignBlock = { n: 2, p: 1, hi: Float64Array.of(0.1, 0.2), lo: new Float64Array(2) };
 * console.log(block.hi[1] + block.lo[1]); // 0.2
 * ```
 */
export interface DesignBlock {
  /** Rows. */
  readonly n: number;
  /** Columns. */
  readonly p: number;
  /** Leading parts, length n·p, row-major. */
  readonly hi: Float64Array;
  /**
   * Trailing parts, length n·p, row-major (|lo| ≤ ulp(hi)/2); null when every value is exact in
   * double (no term writes trailing parts), so no memory is spent on zeros.
   */
  readonly lo: Float64Array | null;
}

/**
 * The kinds of term; `spec.kind` of every term is one of these.
 *
 * @example
 * ```ts
 * import type { TermKind } from "./types.ts";
 * const kinds: TermKind[] = ["legendre", "power", "column", "indicators", "product"];
 * ```
 */
export type TermKind = "legendre" | "power" | "column" | "indicators" | "product";

/**
 * A model term before learning.
 *
 * @example
 * ```ts
 * import { legendre } from "./legendre.ts";
 * import type { Term } from "./types.ts";
 * const term: Term = legendre("x", 3);
 * console.log(term.label, term.inputs); // legendre(x, 3) [ "x" ]
 * ```
 */
export interface Term {
  /** What sort of term this is. */
  readonly kind: TermKind;
  /** Human label, e.g. `legendre(x, 10)`. */
  readonly label: string;
  /** Table columns the term reads. */
  readonly inputs: readonly string[];
  /** JSON form of the recipe (for records and the equivalent API call); see `termFromSpec`. */
  readonly spec: Json;
  /** Fixes parameters (domains, levels) from `rows` of `table` (all rows when omitted). */
  learn(table: Table, rows?: Int32Array): LearnedTerm;
}

/**
 * A term with its parameters fixed.
 *
 * @example
 * ```ts
 * import { power } from "./power.ts";
 * const x = Float64Array.of(1, 2, 3);
 * const table = {
 *   nRows: 3, names: ["x"], columns: new Map([["x", { kind: "number" as const, name: "x", values: x }]]),
 *   source: "columns", lineOfRow: Int32Array.of(1, 2, 3), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = power("x", 2).learn(table);
 * const block = { n: 3, p: 2, hi: new Float64Array(6), lo: new Float64Array(6) };
 * learned.apply(table, undefined, block, 0);
 * console.log(learned.names, block.hi); // [ "x", "x^2" ] Float64Array(6) [ 1, 1, 2, 4, 3, 9 ]
 * ```
 */
export interface LearnedTerm {
  /** The recipe this was learned from. */
  readonly term: Term;
  /** One name per output column, e.g. `P3(x)`, `x^2`, `region=north`. */
  readonly names: readonly string[];
  /** Polynomial order of each output column (1 for plain columns and indicators). */
  readonly orders: readonly number[];
  /**
   * Learned parameters that determine the values, JSON-safe (null when nothing learned affects
   * them): two learnings of one term with equal params (as JSON) write identical columns. The
   * sweep relies on this to skip folds whose terms did not change. Bookkeeping that only feeds
   * the outside count (e.g. a plain column's training range) is not part of params.
   */
  readonly params: Json;
  /**
   * Whether `apply` writes nonzero trailing parts (`lo`): powers above 1 and products do. A term
   * without them accepts a block whose `lo` is null (and zeroes its own `lo` entries otherwise).
   */
  readonly trailing: boolean;
  /**
   * Writes this term's columns for `rows` (all rows when omitted) into `block`, starting at
   * column `offset` (both `hi` and `lo` are written). Returns how many of those rows lie
   * outside what the term learned (values are still written for them). When `outside` is given
   * (one flag per written row), the flag of each such row is set to 1; other flags are left as
   * they are, so several terms can mark one array.
   */
  apply(
    table: Table,
    rows: Int32Array | undefined,
    block: DesignBlock,
    offset: number,
    outside?: Uint8Array,
  ): number;
}

/**
 * How many rows one term found outside what it learned.
 *
 * @example
 * ```ts
 * import type { OutsideCount } from "./types.ts";
 * const entry: OutsideCount = { label: "legendre(x, 10)", count: 3 };
 * ```
 */
export interface OutsideCount {
  /** The term's label, e.g. `legendre(x, 10)`. */
  readonly label: string;
  /** Rows outside (0 when none). */
  readonly count: number;
}

/**
 * A built design: the matrix for some rows plus what each column is.
 *
 * @example
 * ```ts
 * import type { Design } from "./types.ts";
 * function describe(d: Design): string {
 *   return `${d.n} rows × ${d.p} columns: ${d.names.join(", ")}`;
 * }
 * ```
 */
export interface Design {
  /** Rows written. */
  readonly n: number;
  /** Columns written (the intercept is not a column; the model carries it). */
  readonly p: number;
  /** Column names, unique. */
  readonly names: readonly string[];
  /** Polynomial order of each column. */
  readonly orders: readonly number[];
  /** Index (into the learned-term list) of the term that wrote each column. */
  readonly termIndex: Int32Array;
  /** The values, n × p row-major in double-double. */
  readonly block: DesignBlock;
  /** One entry per term, in term order: rows outside what that term learned (0 when none). */
  readonly outside: readonly OutsideCount[];
}
