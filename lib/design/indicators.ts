/**
 * Indicator (0/1) columns for a category column, one per level except the reference level.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { CategoryColumn, Table } from "../table/types.ts";
import { categoryColumn, checkBlock, checkName, rowCount } from "./checks.ts";
import type { LearnedTerm, Term } from "./types.ts";

/**
 * Indicator columns of a category column: `region=north` is 1 on rows whose level is "north"
 * and 0 elsewhere, one column per level except the reference level (the first level in the
 * table's sorted level list), whose effect the intercept carries. Orders are all 1.
 *
 * Learned parameter: `{ levels, reference }`, where `levels` are the table column's levels, not
 * just those seen in the training rows, so every fold of a sweep has the same columns (a level
 * absent from a fold's training rows gives an all-zero column there, which the penalty handles).
 * Applied to another table, levels are matched by name; a row whose level was not learned is an
 * UNKNOWN_LEVEL error (it is never silently treated as the reference level).
 *
 * Errors: a numeric column (BAD_OPTION), a column with a single level (CONSTANT_COLUMN), an
 * unknown column (UNKNOWN_COLUMN).
 *
 * @example
 * ```ts
 * import { indicators } from "./indicators.ts";
 * const region = { kind: "category" as const, name: "region", levels: ["east", "north", "west"], codes: Int32Array.of(0, 1, 2) };
 * const table = {
 *   nRows: 3, names: ["region"], columns: new Map([["region", region]]),
 *   source: "rows", lineOfRow: Int32Array.of(1, 2, 3), missing: { policy: "error" as const, droppedLines: [] },
 * };
 * const learned = indicators("region").learn(table);
 * const block = { n: 3, p: 2, hi: new Float64Array(6), lo: new Float64Array(6) };
 * learned.apply(table, undefined, block, 0);
 * console.log(learned.names, block.hi); // [ "region=north", "region=west" ] Float64Array(6) [ 0, 0, 1, 0, 0, 1 ]
 * ```
 */
export function indicators(name: string): Term {
  checkName(name, "indicators");
  const label = `indicators(${name})`;
  const term: Term = {
    kind: "indicators",
    label,
    inputs: [name],
    spec: { kind: "indicators", column: name },
    learn(table: Table, rows?: Int32Array): LearnedTerm {
      const levels = categoryColumn(table, name, label).levels;
      rowCount(table, rows, label);
      if (levels.length < 2) {
        throw new CurbfitError(
          "CONSTANT_COLUMN",
          `${label}: column ${JSON.stringify(name)} has the single level ` +
            `${JSON.stringify(levels[0] ?? "")}, so there is nothing to contrast it with`,
          "Drop the term, or load data in which the column takes at least two values",
          { source: table.source, column: name },
        );
      }
      return learnedIndicators(term, name, levels.slice());
    },
  };
  return term;
}

/** The learned form: indicator of each of `levels[1…]`. */
function learnedIndicators(term: Term, name: string, levels: readonly string[]): LearnedTerm {
  const width = levels.length - 1;
  return {
    term,
    names: levels.slice(1).map((level) => `${name}=${level}`),
    orders: levels.slice(1).map(() => 1),
    params: { levels, reference: levels[0] },
    trailing: false,
    apply(table, rows, block, offset) {
      const column = categoryColumn(table, name, term.label);
      const n = rowCount(table, rows, term.label);
      checkBlock(block, n, offset, width, term.label);
      const slotOfCode = slotsFor(column, levels);
      for (let i = 0; i < n; i++) {
        const r = rows === undefined ? i : rows[i];
        const slot = slotOfCode[column.codes[r]];
        if (slot === UNKNOWN) throw unknownLevel(table, column, r, levels, term.label);
        const start = i * block.p + offset;
        block.hi.fill(0, start, start + width);
        block.lo?.fill(0, start, start + width);
        if (slot >= 0) block.hi[start + slot] = 1;
      }
      return 0;
    },
  };
}

/** Marks a table level that was not learned. */
const UNKNOWN = -2;

/**
 * For each code of `column`: the output slot of its level (−1 for the reference level,
 * UNKNOWN for a level not in `levels`).
 */
function slotsFor(column: CategoryColumn, levels: readonly string[]): Int32Array {
  const learnedIndex = new Map(levels.map((level, i) => [level, i]));
  return Int32Array.from(column.levels, (level) => {
    const index = learnedIndex.get(level);
    return index === undefined ? UNKNOWN : index - 1;
  });
}

/** The UNKNOWN_LEVEL error for row `r`. */
function unknownLevel(
  table: Table,
  column: CategoryColumn,
  r: number,
  levels: readonly string[],
  label: string,
): CurbfitError {
  const level = column.levels[column.codes[r]];
  return new CurbfitError(
    "UNKNOWN_LEVEL",
    `${label}: level ${JSON.stringify(level)} was not among the learned levels ` +
      `(${levels.map((l) => JSON.stringify(l)).join(", ")})`,
    "Remove or recode these rows, or refit on data that includes this level",
    { source: table.source, line: table.lineOfRow[r], column: column.name },
  );
}
