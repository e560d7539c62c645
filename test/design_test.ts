/**
 * Terms and the design matrix: learning on training rows only, outside-domain counts, exact
 * double-double powers and products, indicators, errors, and that caller tables are untouched.
 */
import assert from "node:assert/strict";
import { CurbfitError } from "../lib/errors/error.ts";
import {
  buildDesign,
  column,
  indicators,
  learnTerms,
  legendre,
  power,
  product,
  termFromSpec,
} from "../lib/design/mod.ts";
import type { Design, Term } from "../lib/design/mod.ts";
import type { Column, Table } from "../lib/table/types.ts";

/** A table from plain arrays: numbers become numeric columns, strings become categories. */
function makeTable(data: Record<string, readonly number[] | readonly string[]>): Table {
  const columns = new Map<string, Column>();
  let nRows = 0;
  for (const [name, values] of Object.entries(data)) {
    nRows = values.length;
    if (typeof values[0] === "number") {
      columns.set(name, { kind: "number", name, values: Float64Array.from(values as number[]) });
    } else {
      const levels = [...new Set(values as string[])].sort();
      const codes = Int32Array.from(values as string[], (v) => levels.indexOf(v));
      columns.set(name, { kind: "category", name, levels, codes });
    }
  }
  return {
    nRows,
    names: Object.keys(data),
    columns,
    source: "test.csv",
    lineOfRow: Int32Array.from({ length: nRows }, (_, i) => i + 2),
    missing: { policy: "error", droppedLines: [] },
  };
}

/** Learns on `rows` (all when omitted) and builds the design for all rows of `table`. */
function design(terms: Term[], table: Table, rows?: Int32Array): Design {
  return buildDesign(learnTerms(terms, table, rows), table);
}

/** Value at (row, column) of a design: hi + lo (lo is null when every value is exact). */
function at(d: Design, row: number, col: number): number {
  return d.block.hi[row * d.p + col] + (d.block.lo?.[row * d.p + col] ?? 0);
}

/** The trailing parts of a design whose terms write them. */
function trailingOf(d: Design): Float64Array {
  assert.ok(d.block.lo !== null, "this design should carry trailing parts");
  return d.block.lo;
}

/** Runs `fn`, expecting a CurbfitError with `code` whose message contains every fragment. */
function expectError(fn: () => unknown, code: string, fragments: string[]): CurbfitError {
  try {
    fn();
  } catch (e) {
    assert.ok(e instanceof CurbfitError, `expected CurbfitError, got ${e}`);
    assert.equal(e.code, code, e.message);
    for (const f of fragments) assert.ok(e.message.includes(f), `"${f}" in: ${e.message}`);
    return e;
  }
  assert.fail(`expected ${code}`);
}

// ---- exact dyadic arithmetic (reference for double-double values) ----

/** x = num / 2^exp exactly (every finite double is such a fraction). */
function dyadic(x: number): { num: bigint; exp: bigint } {
  let exp = 0n;
  while (!Number.isInteger(x)) [x, exp] = [x * 2, exp + 1n];
  return { num: BigInt(x), exp };
}

/** |(hi + lo) − num / 2^exp| / |num / 2^exp|, computed exactly and then rounded. */
function relativeError(hi: number, lo: number, num: bigint, exp: bigint): number {
  const h = dyadic(hi);
  const l = dyadic(lo);
  const e = [exp, h.exp, l.exp].reduce((a, b) => (a > b ? a : b));
  const got = h.num * 2n ** (e - h.exp) + l.num * 2n ** (e - l.exp);
  const want = num * 2n ** (e - exp);
  const diff = got > want ? got - want : want - got;
  return Number((diff * 2n ** 200n) / (want < 0n ? -want : want)) / 2 ** 200;
}

/** Relative error of hi + lo as x^k (exact power of the double x). */
function powerError(hi: number, lo: number, x: number, k: number): number {
  const d = dyadic(x);
  return relativeError(hi, lo, d.num ** BigInt(k), d.exp * BigInt(k));
}

// ---- learning and the outside count ----

Deno.test("legendre learns its domain from the training rows only and counts rows outside", () => {
  // Source: the term's definition (affine map of [min, max] of training rows onto [−1, 1]).
  const table = makeTable({ x: [0, 1, 2, 3, 4, 5, 6, 7, 8, 9] });
  const learned = learnTerms([legendre("x", 3)], table, Int32Array.of(2, 3, 4, 5));
  assert.deepEqual(learned[0].params, { domain: [2, 5] });
  const d = buildDesign(learned, table);
  assert.deepEqual(d.outside, [{ label: "legendre(x, 3)", count: 6 }], "rows 0, 1, 6..9");
  // Outside rows are still computed: x = 9 maps to t = (2·9 − 7) / 3 = 11/3.
  assert.ok(Math.abs(at(d, 9, 0) - 11 / 3) < 1e-15, `P1 at x = 9: ${at(d, 9, 0)}`);
  assert.ok(Math.abs(at(d, 9, 1) - (3 * (11 / 3) ** 2 - 1) / 2) < 1e-13, "P2 closed form");
  assert.equal(at(d, 2, 0), -1);
  assert.equal(at(d, 5, 0), 1);
  // The design for the training rows alone has nothing outside.
  assert.equal(buildDesign(learned, table, Int32Array.of(2, 3, 4, 5)).outside[0].count, 0);
});

Deno.test("learned terms apply to new rows of another table and count those outside", () => {
  // Source: the term's definition; counts by hand.
  const train = makeTable({ x: [10, 12, 15, 20], z: [1, 2, 3, 4] });
  const learned = learnTerms([legendre("x", 2), column("z"), power("x", 2)], train);
  const fresh = makeTable({ x: [9.99, 10, 20, 20.5, 15], z: [0, 1, 4, 4, 5] });
  const d = buildDesign(learned, fresh);
  assert.deepEqual(d.outside, [
    { label: "legendre(x, 2)", count: 2 },
    { label: "column(z)", count: 2 },
    { label: "power(x, 2)", count: 2 },
  ]);
  assert.ok(at(d, 0, 0) < -1, "below the domain maps below −1");
  assert.deepEqual(d.names, ["P1(x)", "P2(x)", "z", "x", "x^2"]);
  assert.equal(at(d, 3, 3), 20.5, "values outside the range are written unchanged");
});

Deno.test("equal params mean equal columns: plain and power terms learn nothing that matters", () => {
  // Contract in lib/design/types.ts (the sweep skips folds whose params did not change).
  const table = makeTable({ x: [1, 2, 3, 4], z: [5, 6, 7, 8], g: ["a", "b", "a", "c"] });
  const terms = [
    column("z"),
    power("x", 3),
    indicators("g"),
    product(column("x"), indicators("g")),
  ];
  const first = learnTerms(terms, table, Int32Array.of(0, 1));
  const second = learnTerms(terms, table, Int32Array.of(2, 3));
  assert.deepEqual(first.map((t) => t.params), second.map((t) => t.params));
  const a = buildDesign(first, table);
  const b = buildDesign(second, table);
  assert.deepEqual(a.block, b.block, "identical columns");
  assert.deepEqual(
    a.outside.map((o) => o.count),
    [2, 2, 0, 2],
    "rows 2, 3 outside the training range",
  );
  assert.deepEqual(
    b.outside.map((o) => o.count),
    [2, 2, 0, 2],
    "rows 0, 1 outside the training range",
  );
});

Deno.test("a fixed domain is used as given, and a constant training column is then fine", () => {
  // Source: the term's definition.
  const table = makeTable({ x: [3, 3, 3, 7] });
  const learned = learnTerms([legendre("x", 1, { domain: [0, 6] })], table, Int32Array.of(0, 1));
  assert.deepEqual(learned[0].params, { domain: [0, 6] });
  assert.deepEqual(learned[0].term.spec, {
    kind: "legendre",
    column: "x",
    degree: 1,
    domain: [0, 6],
  });
  const d = buildDesign(learned, table);
  assert.equal(at(d, 0, 0), 0);
  assert.equal(at(d, 3, 0), 4 / 3);
  assert.equal(d.outside[0].count, 1);
});

// ---- exact double-double powers and products ----

Deno.test("power: x^k of small integers is exact in double-double up to 3^40", () => {
  // Reference: BigInt exact integers (exact computation). Integers below 2^106 fit in hi + lo
  // and must come out exact; larger ones (7^38 and up) to k·2^-104 relative.
  const table = makeTable({ x: [3, -2, 7, 1] });
  const d = design([power("x", 40)], table);
  assert.deepEqual(d.orders, Array.from({ length: 40 }, (_, i) => i + 1));
  assert.deepEqual(d.names.slice(0, 3), ["x", "x^2", "x^3"]);
  [3, -2, 7, 1].forEach((x, r) => {
    for (let k = 1; k <= 40; k++) {
      const hi = d.block.hi[r * 40 + k - 1];
      const lo = trailingOf(d)[r * 40 + k - 1];
      if (Math.abs(x) ** k < 2 ** 106) {
        assert.equal(BigInt(hi) + BigInt(lo), BigInt(x) ** BigInt(k), `${x}^${k}`);
      } else {
        assert.ok(powerError(hi, lo, x, k) <= k * 2 ** -104, `${x}^${k}`);
      }
    }
  });
});

Deno.test("power: decimals and NIST Filip x values to the 10th power, ~30 digits", () => {
  // Data: NIST StRD Filip.csv x column (/work/shared/data/nist-strd), plus 0.1, 1.7, -3.3.
  // Reference: exact BigInt powers of the stored doubles (exact computation). Tolerance
  // k·2^-104 relative (each double-double product adds a few units of 2^-106; Dekker 1971).
  const text = Deno.readTextFileSync(
    new URL("../../shared/data/nist-strd/Filip.csv", import.meta.url),
  );
  const xs = text.trim().split("\n").slice(1).map((line) => Number(line.split(",")[1]));
  assert.equal(xs.length, 82, "Filip has 82 observations");
  xs.push(0.1, 1.7, -3.3);
  const d = design([power("x", 10)], makeTable({ x: xs }));
  let worst = 0;
  xs.forEach((x, r) => {
    for (let k = 1; k <= 10; k++) {
      const e = powerError(d.block.hi[r * 10 + k - 1], trailingOf(d)[r * 10 + k - 1], x, k);
      worst = Math.max(worst, e / k);
      assert.ok(e <= k * 2 ** -104, `${x}^${k}: relative error ${e}`);
    }
  });
  // Plain double powers would be off by ~1e-16; the lo parts carry the rest.
  const plain = powerError(xs[0] ** 10, 0, xs[0], 10);
  assert.ok(plain > 1e-20, `plain double x^10 error ${plain}`);
  console.log(`worst relative error per power step: ${worst.toExponential(2)}`);
});

Deno.test("product: pairwise double-double products, orders add, left-major names", () => {
  // Reference: exact BigInt powers (x^i · x^j = x^(i+j)); tolerance (i+j+1)·2^-104 relative.
  const xs = [0.1, -6.860120914, 1.7, 1e-3];
  const table = makeTable({ x: xs });
  const d = design([product(power("x", 2), power("x", 3))], table);
  assert.deepEqual(d.names, ["x*x", "x*x^2", "x*x^3", "x^2*x", "x^2*x^2", "x^2*x^3"]);
  assert.deepEqual(d.orders, [2, 3, 4, 3, 4, 5]);
  xs.forEach((x, r) => {
    d.orders.forEach((k, c) => {
      const e = powerError(d.block.hi[r * 6 + c], trailingOf(d)[r * 6 + c], x, k);
      assert.ok(e <= (k + 1) * 2 ** -104, `${d.names[c]} at ${x}: ${e}`);
    });
  });
});

Deno.test("product: params of both sides; a row outside either side counts once", () => {
  // Source: the term's definition; counts by hand.
  const table = makeTable({ x: [0, 1, 2, 3, 9], z: [5, 6, 7, 9, 9], g: ["a", "b", "a", "b", "b"] });
  const learned = learnTerms(
    [product(legendre("x", 1), legendre("z", 2)), product(column("x"), indicators("g"))],
    table,
    Int32Array.of(0, 1, 2),
  );
  assert.deepEqual(learned[0].params, { left: { domain: [0, 2] }, right: { domain: [5, 7] } });
  assert.deepEqual(learned[1].params, {
    left: null,
    right: { levels: ["a", "b"], reference: "a" },
  });
  const d = buildDesign(learned, table);
  assert.deepEqual(d.names, ["P1(x)*P1(z)", "P1(x)*P2(z)", "x*g=b"]);
  assert.deepEqual(d.orders, [2, 3, 2]);
  assert.deepEqual(Array.from(d.termIndex), [0, 0, 1]);
  assert.equal(d.outside[0].count, 2, "rows 3 and 4 are outside both x's and z's domains");
  assert.equal(d.outside[1].count, 2, "rows 3 and 4 are outside x's range");
  // Row 1: x = 1 → P1 = 0; z = 6 → P1 = 0, P2 = −0.5. Row 3: x = 3 → P1 = 2; g = b.
  assert.equal(at(d, 1, 1), 0);
  assert.equal(at(d, 3, 0), 2 * 3, "P1(x) = 2, P1(z) = (2·9 − 12)/2 = 3");
  assert.deepEqual([0, 1, 2, 3, 4].map((r) => at(d, r, 2)), [0, 1, 0, 3, 9]);
});

// ---- indicators ----

Deno.test("indicators: one 0/1 column per non-reference level, levels from the table", () => {
  // Source: the term's definition (reference = first sorted level).
  const table = makeTable({ region: ["west", "north", "east", "north", "south"] });
  const learned = learnTerms([indicators("region")], table, Int32Array.of(0, 1, 2));
  assert.deepEqual(learned[0].params, {
    levels: ["east", "north", "south", "west"],
    reference: "east",
  });
  const d = buildDesign(learned, table);
  assert.deepEqual(d.names, ["region=north", "region=south", "region=west"]);
  assert.deepEqual(d.orders, [1, 1, 1]);
  assert.deepEqual(Array.from(d.block.hi), [0, 0, 1, 1, 0, 0, 0, 0, 0, 1, 0, 0, 0, 1, 0]);
  assert.equal(d.block.lo, null, "indicators are exact: no trailing parts are allocated");
  // "south" is absent from the training rows: its column is all zero there, not dropped.
  const trainOnly = buildDesign(learned, table, Int32Array.of(0, 1, 2));
  assert.deepEqual(Array.from(trainOnly.block.hi.filter((_, k) => k % 3 === 1)), [0, 0, 0]);
});

Deno.test("indicators on another table match levels by name; unseen levels are errors", () => {
  // Source: the term's definition.
  const learned = learnTerms([indicators("g")], makeTable({ g: ["a", "b", "c"] }));
  const other = makeTable({ g: ["c", "b", "c"] }); // its own level list is ["b", "c"]
  assert.deepEqual(Array.from(buildDesign(learned, other).block.hi), [0, 1, 1, 0, 0, 1]);
  const unseen = makeTable({ g: ["a", "d"] });
  const e = expectError(() => buildDesign(learned, unseen), "UNKNOWN_LEVEL", [
    '"d"',
    '"a", "b", "c"',
    "test.csv",
    "line 3",
  ]);
  assert.equal(e.place.column, "g");
});

Deno.test("indicators: a single level is an error", () => {
  expectError(
    () => learnTerms([indicators("g")], makeTable({ g: ["a", "a"] })),
    "CONSTANT_COLUMN",
    [
      "indicators(g)",
      'single level "a"',
    ],
  );
});

// ---- errors ----

Deno.test("bad degrees and domains are BAD_OPTION errors naming the option", () => {
  for (const degree of [0, -1, 2.5, 201, NaN, Infinity, "3" as unknown as number]) {
    for (const make of [() => legendre("x", degree), () => power("x", degree)]) {
      const e = expectError(make, "BAD_OPTION", [
        "option degree",
        "whole number from 1 to 200, not",
      ]);
      assert.equal(e.place.option, "degree");
    }
  }
  const domains = [[1, 1], [2, 1], [0, Infinity], [NaN, 1], [0], [-1.7e308, 1.7e308]];
  for (const domain of domains) {
    const e = expectError(
      () => legendre("x", 2, { domain: domain as unknown as [number, number] }),
      "BAD_OPTION",
      ["option domain", "lo < hi"],
    );
    assert.equal(e.place.option, "domain");
  }
  expectError(() => column(""), "BAD_OPTION", ["option column"]);
  expectError(() => product("x" as unknown as Term, column("z")), "BAD_OPTION", [
    'product(): left must be a term, not "x"',
  ]);
});

Deno.test("unknown columns name the column, list the available ones and suggest the nearest", () => {
  const table = makeTable({ dose: [1, 2], weight: [3, 4], site: ["a", "b"] });
  const e = expectError(() => learnTerms([legendre("dos", 2)], table), "UNKNOWN_COLUMN", [
    'column "dos"',
    'columns: "dose", "weight", "site"',
    'Did you mean "dose"?',
  ]);
  assert.equal(e.place.column, "dos");
  expectError(() => learnTerms([column("Weight")], table), "UNKNOWN_COLUMN", [
    'Did you mean "weight"?',
  ]);
  expectError(() => learnTerms([power("height_cm", 2)], table), "UNKNOWN_COLUMN", [
    "Use one of the listed column names",
  ]);
  // Also when applying learned terms to a table that lacks the column.
  const learned = learnTerms([column("dose")], table);
  expectError(() => buildDesign(learned, makeTable({ doses: [1] })), "UNKNOWN_COLUMN", [
    'Did you mean "doses"?',
  ]);
});

Deno.test("wrong column kinds are clear errors that suggest the right term", () => {
  const table = makeTable({ x: [1, 2], region: ["a", "b"] });
  expectError(() => learnTerms([column("region")], table), "BAD_OPTION", [
    "column(region) needs numbers",
    'indicators("region")',
  ]);
  expectError(() => learnTerms([legendre("region", 2)], table), "BAD_OPTION", ["holds categories"]);
  expectError(() => learnTerms([indicators("x")], table), "BAD_OPTION", [
    "needs categories",
    'column("x")',
  ]);
});

Deno.test("legendre on a column with a single value in the training rows is an error", () => {
  const table = makeTable({ x: [4, 4, 5] });
  expectError(
    () => learnTerms([legendre("x", 3)], table, Int32Array.of(0, 1)),
    "CONSTANT_COLUMN",
    ['column "x" has the single value 4', "zero width", "domain: [lo, hi]"],
  );
});

Deno.test("duplicate output names, bad rows, no rows and overflow are errors", () => {
  const table = makeTable({ x: [1, 2, 3], z: [1e200, 1, 2] });
  expectError(() => learnTerms([column("x"), power("x", 2)], table), "BAD_OPTION", [
    "column(x) and power(x, 2)",
    'column named "x"',
  ]);
  expectError(() => learnTerms([column("z"), column("z")], table), "BAD_OPTION", [
    "the same term twice",
  ]);
  expectError(() => learnTerms([column("x")], table, Int32Array.of(0, 3)), "BAD_OPTION", [
    "rows[1] is 3",
    "rows 0 to 2",
  ]);
  expectError(() => learnTerms([column("x")], table, new Int32Array(0)), "TOO_FEW_ROWS", [
    "no training rows",
  ]);
  expectError(() => design([power("z", 2)], table), "NOT_FINITE", [
    'design column "z^2" overflows',
    "line 2",
  ]);
  expectError(
    () => learnTerms("x" as unknown as Term[], table),
    "BAD_OPTION",
    ["option terms must be a list"],
  );
});

// ---- the whole design ----

Deno.test("buildDesign: row-major layout, names, orders, term index, empty term list", () => {
  const table = makeTable({ x: [0, 2, 4], g: ["p", "q", "p"], z: [0.5, 0.25, 0.125] });
  const d = design([legendre("x", 2), indicators("g"), column("z")], table);
  assert.equal(d.n, 3);
  assert.equal(d.p, 4);
  assert.deepEqual(d.names, ["P1(x)", "P2(x)", "g=q", "z"]);
  assert.deepEqual(d.orders, [1, 2, 1, 1]);
  assert.deepEqual(Array.from(d.termIndex), [0, 0, 1, 2]);
  assert.equal(d.block.n, 3);
  assert.equal(d.block.p, 4);
  // Closed forms P1 = t, P2 = (3t² − 1)/2 at t = −1, 0, 1 (recalled from memory).
  assert.deepEqual(Array.from(d.block.hi), [-1, 1, 0, 0.5, 0, -0.5, 1, 0.25, 1, 1, 0, 0.125]);
  const empty = design([], table);
  assert.equal(empty.p, 0);
  assert.equal(empty.n, 3);
});

Deno.test("termFromSpec rebuilds every kind of term from its spec", () => {
  const terms = [
    legendre("x", 4),
    legendre("x", 2, { domain: [0, 1] }),
    power("x", 3),
    column("z"),
    indicators("g"),
    product(product(column("x"), indicators("g")), legendre("z", 2)),
  ];
  for (const term of terms) {
    const copy = termFromSpec(JSON.parse(JSON.stringify(term.spec)));
    assert.deepEqual(copy.spec, term.spec);
    assert.equal(copy.label, term.label);
    assert.equal(copy.kind, term.kind);
  }
  expectError(() => termFromSpec({ kind: "spline" }), "BAD_OPTION", ['spec.kind is "spline"']);
  expectError(() => termFromSpec({ kind: "product", left: 3 }), "BAD_OPTION", [
    "spec.left is 3",
  ]);
});

Deno.test("the caller's table is unchanged after learning and building", () => {
  const table = makeTable({ x: [0.1, 5, -2, 7], g: ["b", "a", "c", "a"], z: [1, 2, 3, 4] });
  const snapshot = structuredClone({
    names: table.names,
    columns: [...table.columns.entries()],
    lineOfRow: table.lineOfRow,
    nRows: table.nRows,
  });
  const terms = [
    legendre("x", 6),
    power("z", 3),
    indicators("g"),
    product(legendre("x", 2), indicators("g")),
  ];
  const learned = learnTerms(terms, table, Int32Array.of(0, 1, 3));
  buildDesign(learned, table);
  buildDesign(learned, table, Int32Array.of(2, 0));
  assert.deepEqual(
    {
      names: table.names,
      columns: [...table.columns.entries()],
      lineOfRow: table.lineOfRow,
      nRows: table.nRows,
    },
    snapshot,
  );
});
