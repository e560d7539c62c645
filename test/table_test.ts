/**
 * Tests of the table loaders (lib/table). References: RFC 4180 (CSV format), the ECMAScript
 * Number() conversion (correctly rounded decimal → float64, the reference for parseDecimal), and
 * the NIST StRD data files in /work/shared/data/nist-strd with their certified.json. Other
 * expected values are worked out by hand from the small inputs written in each test.
 */
import assert from "node:assert/strict";
import fc from "fast-check";
import { CurbfitError, type ErrorCode } from "../lib/errors/error.ts";
import {
  isTable,
  parseCsv,
  readCsv,
  readCsvStream,
  type Table,
  tableFromColumns,
  tableFromRows,
  toTable,
} from "../lib/table/mod.ts";
import { CsvTokenizer } from "../lib/table/csv_tokenizer.ts";
import { parseDecimal } from "../lib/table/values.ts";

const NIST = new URL("../../shared/data/nist-strd/", import.meta.url);
const FIXTURES = new URL("./fixtures/csv/", import.meta.url);

/** Checks that `error` is a CurbfitError with `code` whose message contains every fragment. */
function check(error: unknown, code: ErrorCode, fragments: readonly string[]): true {
  assert.ok(error instanceof CurbfitError, `expected a CurbfitError, got ${error}`);
  assert.equal(error.code, code, error.message);
  for (const fragment of fragments) {
    assert.ok(
      error.message.includes(fragment),
      `message ${JSON.stringify(error.message)} should contain ${JSON.stringify(fragment)}`,
    );
  }
  return true;
}

function assertFails(run: () => unknown, code: ErrorCode, ...fragments: string[]): void {
  assert.throws(run, (error) => check(error, code, fragments));
}

async function assertRejects(
  run: () => Promise<unknown>,
  code: ErrorCode,
  ...fragments: string[]
): Promise<void> {
  await assert.rejects(run, (error) => check(error, code, fragments));
}

function numbers(table: Table, name: string): number[] {
  const column = table.columns.get(name);
  assert.equal(column?.kind, "number", `column ${name} should be numeric`);
  return [...(column as { values: Float64Array }).values];
}

function category(table: Table, name: string): { levels: string[]; codes: number[] } {
  const column = table.columns.get(name);
  assert.equal(column?.kind, "category", `column ${name} should be a category`);
  const { levels, codes } = column as { levels: readonly string[]; codes: Int32Array };
  return { levels: [...levels], codes: [...codes] };
}

/** A stream that yields the given chunks, one per pull. */
function streamOf<T>(chunks: readonly T[]): ReadableStream<T> {
  return ReadableStream.from(chunks);
}

// ---------------------------------------------------------------------------------------------
// Loaders on well-formed input

Deno.test("parseCsv: numeric and category columns, lines, source, frozen table", () => {
  const table = parseCsv("load,site\n1.5,north\n.25,South\n-3e2,north\n");
  assert.equal(table.nRows, 3);
  assert.deepEqual(table.names, ["load", "site"]);
  assert.deepEqual(numbers(table, "load"), [1.5, 0.25, -300]);
  // Levels sort by UTF-16 code units: "S" (83) before "n" (110).
  assert.deepEqual(category(table, "site"), { levels: ["South", "north"], codes: [1, 0, 1] });
  assert.deepEqual([...table.lineOfRow], [2, 3, 4]);
  assert.equal(table.source, "CSV text");
  assert.deepEqual(table.missing, { policy: "error", droppedLines: [] });
  assert.ok(Object.isFrozen(table) && Object.isFrozen(table.names));
  assert.ok(isTable(table));
});

Deno.test("parseCsv: number forms from NIST files, signs, exponents and spaces", () => {
  const text = "v\n.11019\n760.\n1.00000\n-1.5e-3\n  42 \n+7\n1E3\n\t-.5\t\n";
  assert.deepEqual(numbers(parseCsv(text), "v"), [0.11019, 760, 1, -0.0015, 42, 7, 1000, -0.5]);
});

Deno.test("parseDecimal gives exactly Number()'s correctly rounded value (ECMAScript Number)", () => {
  const edge = [
    "9007199254740993", // 2^53 + 1: not exact, must round like Number()
    "1e22", // largest exact power of ten
    "1e23", // not exact
    "0.1",
    "123456789012345678e-5",
    "2.2250738585072011e-308",
    "4.9e-324",
    "1.7976931348623157e308",
    "1e400",
    "-0",
    "000123.4500",
  ];
  for (const text of edge) assert.ok(Object.is(parseDecimal(text), Number(text)), text);
  fc.assert(
    fc.property(
      fc.stringMatching(/^[+-]?(\d{1,20}(\.\d{0,20})?|\.\d{1,20})([eE][+-]?\d{1,3})?$/),
      (text) => Object.is(parseDecimal(text), Number(text)),
    ),
    { seed: 4180, numRuns: 20_000 },
  );
  for (const text of ["", " ", ".", "e5", "1e", "1e+", "0x10", "1_000", "1,5", "Infinity", "1 2"]) {
    assert.ok(Number.isNaN(parseDecimal(text)), JSON.stringify(text));
  }
});

Deno.test("parseCsv: RFC 4180 quoting, CRLF line ends, byte order mark, blank lines", () => {
  const text = '\uFEFFid,note\r\n1,"a, b"\r\n2,"say ""hi"""\r\n\r\n3,plain\r\n';
  const table = parseCsv(text);
  assert.deepEqual(table.names, ["id", "note"]);
  assert.deepEqual(category(table, "note").levels, ["a, b", "plain", 'say "hi"']);
  assert.deepEqual([...table.lineOfRow], [2, 3, 5]);
});

Deno.test("parseCsv: line breaks inside quotes keep every later line number right", () => {
  const text = 'x,note\n1,"two\nlines"\n2,"three\r\nline\nfield"\n3,one\nbad,x\n';
  // Records start on lines 2, 4, 7; the bad value is on line 8.
  assertFails(() => parseCsv(text), "BAD_NUMBER", "line 8", 'column "x"');
  const table = parseCsv(text.replace("bad,x\n", ""));
  assert.deepEqual([...table.lineOfRow], [2, 4, 7]);
  assert.deepEqual(category(table, "note").levels, ["one", "three\r\nline\nfield", "two\nlines"]);
});

Deno.test("tokenizer: every way of cutting the text into chunks gives the same records", () => {
  const text =
    'a,b,c\r\n1,"x\r\ny",3\n\n2,"he said ""hi""",\r\n\r\n"",q"r,"multi\n\nline"\r\n4,5,6';
  const run = (chunks: string[]) => {
    const out: [string[], number][] = [];
    const tokenizer = new CsvTokenizer({ source: "t", onRecord: (f, l) => out.push([f, l]) });
    for (const chunk of chunks) tokenizer.push(chunk);
    tokenizer.end();
    return out;
  };
  const whole = run([text]);
  assert.deepEqual(whole, [
    [["a", "b", "c"], 1],
    [["1", "x\r\ny", "3"], 2],
    [["2", 'he said "hi"', ""], 5],
    [["", 'q"r', "multi\n\nline"], 7],
    [["4", "5", "6"], 10],
  ]);
  for (let i = 0; i <= text.length; i++) {
    for (let j = i; j <= text.length; j++) {
      assert.deepEqual(
        run([text.slice(0, i), text.slice(i, j), text.slice(j)]),
        whole,
        `${i},${j}`,
      );
    }
  }
});

Deno.test("readCsvStream: text chunks, and byte chunks that split a UTF-8 character", async () => {
  const fromText = await readCsvStream(streamOf(["x,pl", "ace\n1,Zür", "ich\n2,Köln\n"]));
  assert.equal(fromText.source, "stream");
  assert.deepEqual(category(fromText, "place").levels, ["Köln", "Zürich"]);
  const bytes = new TextEncoder().encode("\uFEFFx,price\n1,5€\n2,7€\n");
  const cut = bytes.indexOf(0xe2) + 1; // inside the three bytes of "€"
  const fromBytes = await readCsvStream(streamOf([bytes.subarray(0, cut), bytes.subarray(cut)]), {
    source: "feed",
  });
  assert.equal(fromBytes.source, "feed");
  assert.deepEqual(fromBytes.names, ["x", "price"]);
  assert.deepEqual(category(fromBytes, "price").levels, ["5€", "7€"]);
});

Deno.test("readCsv: a file by path or file URL, labelled by its path", async () => {
  const dir = await Deno.makeTempDir();
  try {
    const path = `${dir}/doses.csv`;
    await Deno.writeTextFile(path, "dose,response\r\n1,0.5\r\n2,NA\r\n3,1.4\r\n");
    const table = await readCsv(path, { missing: "drop" });
    assert.equal(table.source, path);
    assert.deepEqual(numbers(table, "response"), [0.5, 1.4]);
    assert.deepEqual(table.missing, { policy: "drop", droppedLines: [3] });
    const byUrl = await readCsv(new URL(`file://${path}`), { missing: "drop" });
    assert.equal(byUrl.source, path);
    await assertRejects(() => readCsv(path), "MISSING_VALUE", path, "line 3", 'column "response"');
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("readCsv: NIST Pontius loads 40 rows and reads .11019 exactly", async () => {
  // n = 40 and the first observation (.11019, 150000) are from NIST StRD (certified.json, Pontius.csv).
  const path = new URL("Pontius.csv", NIST);
  const table = await readCsv(path);
  assert.equal(table.nRows, 40);
  assert.equal(numbers(table, "y")[0], 0.11019);
  assert.equal(numbers(table, "x")[0], 150000);
  assert.equal(table.lineOfRow[39], 41);
  assert.equal(table.source, path.pathname);
});

Deno.test("readCsv: every NIST StRD file has the certified n and Number()-equal values", async () => {
  const certified = JSON.parse(await Deno.readTextFile(new URL("certified.json", NIST)));
  for (const [name, info] of Object.entries(certified.datasets as Record<string, { n: number }>)) {
    const url = new URL(`${name}.csv`, NIST);
    const table = await readCsv(url);
    assert.equal(table.nRows, info.n, name);
    const lines = (await Deno.readTextFile(url)).trim().split(/\r?\n/).slice(1);
    table.names.forEach((column, j) => {
      const expected = lines.map((line) => Number(line.split(",")[j]));
      assert.deepEqual(numbers(table, column), expected, `${name}.${column}`);
    });
  }
});

Deno.test("tableFromRows: key union, numbers, numeric strings, bigints, missing values", () => {
  const rows = [
    { speed: 12.5, surface: "gravel" },
    { speed: null, surface: "asphalt" },
    { speed: "30", surface: "asphalt", grade: 2n },
    { speed: 18, surface: "dirt", grade: 1 },
  ];
  assertFails(() => tableFromRows(rows), "MISSING_VALUE", "rows, line 1", 'column "grade"');
  const table = tableFromRows(rows, { missing: "drop" });
  assert.deepEqual(table.names, ["speed", "surface", "grade"]);
  assert.deepEqual(numbers(table, "speed"), [30, 18]);
  assert.deepEqual(numbers(table, "grade"), [2, 1]);
  assert.deepEqual(category(table, "surface"), { levels: ["asphalt", "dirt"], codes: [0, 1] });
  assert.deepEqual(table.missing.droppedLines, [1, 2]);
  assert.deepEqual([...table.lineOfRow], [3, 4]);
  assert.equal(table.source, "rows");
});

Deno.test("tableFromColumns: typed and plain arrays, NaN as missing, types override", () => {
  const table = tableFromColumns(
    { hour: new Float64Array([0, 6, NaN, 18]), zone: [10, 9, 9, undefined] },
    { missing: "drop", types: { zone: "category" } },
  );
  assert.deepEqual(numbers(table, "hour"), [0, 6]);
  // Category levels are text, sorted by code units: "10" before "9".
  assert.deepEqual(category(table, "zone"), { levels: ["10", "9"], codes: [0, 1] });
  assert.deepEqual(table.missing.droppedLines, [3, 4]);
  assert.equal(table.source, "columns");
});

Deno.test("toTable dispatches and passes a table through; isTable", () => {
  const fromRows = toTable([{ x: 1, y: 2 }, { x: 2, y: 4.5 }]);
  const fromColumns = toTable({ x: [1, 2], y: [2, 4.5] });
  assert.equal(toTable(fromRows), fromRows);
  assert.deepEqual(numbers(fromRows, "y"), numbers(fromColumns, "y"));
  assert.ok(isTable(fromColumns));
  assert.ok(!isTable({ x: [1, 2] }) && !isTable(null) && !isTable([]));
  assertFails(() => toTable("x,y\n1,2" as never), "BAD_OPTION", "parseCsv");
  assertFails(() => toTable(Promise.resolve() as never), "BAD_OPTION", "await");
});

Deno.test("types: a numeric-looking column as category, and a forced number", () => {
  const table = parseCsv("zip,y\n10115,1\n8001,2\n", { types: { zip: "category" } });
  assert.deepEqual(category(table, "zip").levels, ["10115", "8001"]);
  assertFails(
    () => parseCsv("code,y\nA1,1\n", { types: { code: "number" } }),
    "BAD_NUMBER",
    "line 2",
    'column "code"',
    'types says it is "number"',
  );
});

Deno.test("caller data is never mutated, and tables do not share it", () => {
  const hour = new Float64Array([1, 2, NaN, 4]);
  const columns = { hour, shift: ["day", "night", "day", "night"] };
  const rows = [{ a: 1, b: "u" }, { a: NaN, b: "v" }, { a: 3, b: "u" }];
  const columnsBefore = structuredClone(columns);
  const rowsBefore = structuredClone(rows);
  const fromColumns = tableFromColumns(columns, { missing: "drop" });
  tableFromRows(rows, { missing: "drop" });
  toTable(rows, { missing: "drop" });
  assert.deepEqual(columns, columnsBefore);
  assert.deepEqual(rows, rowsBefore);
  const stored = fromColumns.columns.get("hour") as { values: Float64Array };
  assert.notEqual(stored.values.buffer, hour.buffer);
  hour[0] = 99;
  assert.equal(stored.values[0], 1);
});

Deno.test("missing: drop reports exact source lines, also around quoted line breaks", () => {
  const text = 'a,b\n1,u\nNA,v\n2,"multi\nline"\n3,\n4,w\n';
  const table = parseCsv(text, { missing: "drop" });
  assert.deepEqual(table.missing, { policy: "drop", droppedLines: [3, 6] });
  assert.deepEqual([...table.lineOfRow], [2, 4, 7]);
  assert.deepEqual(numbers(table, "a"), [1, 2, 4]);
  // "v" occurs only in a dropped row, so it is no level.
  assert.deepEqual(category(table, "b"), { levels: ["multi\nline", "u", "w"], codes: [1, 0, 2] });
  // The missing tokens are exactly: empty, NA, NaN, null (spaces around them allowed).
  const tokens = parseCsv("x,y\n1,\n2, NA\n3,NaN\n4,null\n5,6\n7,na\n", {
    missing: "drop",
    types: { y: "category" },
  });
  assert.deepEqual(tokens.missing.droppedLines, [2, 3, 4, 5]);
  assert.deepEqual(category(tokens, "y").levels, ["6", "na"]);
});

// ---------------------------------------------------------------------------------------------
// Malformed input: each error names its code and where

Deno.test("bad CSV: empty input, header only, only blank lines", async () => {
  assertFails(() => parseCsv(""), "EMPTY_INPUT", "CSV text", "no header");
  assertFails(() => parseCsv("\uFEFF\r\n\n"), "EMPTY_INPUT", "CSV text");
  assertFails(() => parseCsv("a,b\n"), "NO_ROWS", "CSV text", "no data rows");
  assertFails(() => parseCsv("data.csv"), "NO_ROWS", "line 1", "readCsv");
  await assertRejects(() => readCsv(new URL("empty.csv", FIXTURES)), "EMPTY_INPUT", "empty.csv");
});

Deno.test("bad CSV: ragged row names the line and both field counts", async () => {
  assertFails(
    () => parseCsv("a,b\n1,2\n3\n4,5\n"),
    "RAGGED_ROW",
    "line 3",
    "has 1 field,",
    "header has 2",
  );
  assertFails(() => parseCsv("a,b\n1,2,\n"), "RAGGED_ROW", "line 2", "3 fields");
  await assertRejects(
    () => readCsv(new URL("ragged.csv", FIXTURES)),
    "RAGGED_ROW",
    "ragged.csv, line 5",
    "4 fields",
    "header has 3",
  );
});

Deno.test("bad CSV: a quote left open names the line where it opened", async () => {
  assertFails(
    () => parseCsv('a,note\n1,ok\n2,"never closed\n3,x\n4,y\n'),
    "OPEN_QUOTE",
    "line 3",
    'column "note"',
    "never closed",
  );
  assertFails(() => parseCsv('a,b\n1,"x"y\n'), "OPEN_QUOTE", "line 2", 'column "b"', '"y"');
  await assertRejects(
    () => readCsv(new URL("open_quote.csv", FIXTURES)),
    "OPEN_QUOTE",
    "open_quote.csv, line 3",
  );
});

Deno.test("bad CSV: text in a numeric column suggests types: category", () => {
  assertFails(
    () => parseCsv("a,b\n1,2\nseven,3\n"),
    "BAD_NUMBER",
    "line 3",
    'column "a"',
    '"seven"',
    'types: { a: "category" }',
  );
  assertFails(() => parseCsv("a,b\n1,2\n0x1F,3\n"), "BAD_NUMBER", "line 3", 'column "a"');
  assertFails(() => parseCsv("a,b\n1,2\n1 000,3\n"), "BAD_NUMBER", "line 3");
});

Deno.test("bad CSV: duplicate and blank header names", () => {
  assertFails(
    () => parseCsv("x,y, x\n1,2,3\n"),
    "DUPLICATE_HEADER",
    "line 1",
    'column "x"',
    "column 1 and column 3",
  );
  assertFails(() => parseCsv("x,,y\n1,2,3\n"), "BLANK_HEADER", "line 1", 'column "2"');
  assertFails(() => tableFromRows([{ "": 1 }]), "BLANK_HEADER", 'column "1"');
});

Deno.test("bad CSV: a column with every value missing", () => {
  assertFails(() => parseCsv("a,b\n1,NA\n2,\n"), "ALL_MISSING", 'column "b"', "2 rows");
  assertFails(() => parseCsv("a,b\n1,NA\n2,\n", { missing: "drop" }), "ALL_MISSING", 'column "b"');
  assertFails(
    () => tableFromColumns({ a: [1, 2], b: [null, NaN] }),
    "ALL_MISSING",
    'column "b"',
  );
});

Deno.test("bad CSV: infinities are not finite numbers", () => {
  assertFails(() => parseCsv("a,b\n1,2\n3,Infinity\n"), "NOT_FINITE", "line 3", 'column "b"');
  assertFails(() => parseCsv("a,b\n1,2\n-inf,3\n"), "NOT_FINITE", "line 3", 'column "a"');
  assertFails(() => parseCsv("a,b\n1,2\n3,1e400\n"), "NOT_FINITE", "line 3", 'column "b"');
  assertFails(() => parseCsv("a\nINF\n"), "NOT_FINITE", "line 2", 'column "a"');
  assertFails(() => tableFromRows([{ a: 1 }, { a: -Infinity }]), "NOT_FINITE", "line 2");
});

Deno.test("bad CSV: values of magnitude >= 2^500 are too large", () => {
  assertFails(
    () => parseCsv("a,b\n1,2\n3,1e308\n"),
    "TOO_LARGE",
    "line 3",
    'column "b"',
    "Rescale",
  );
  assertFails(() => parseCsv(`a\n${-(2 ** 500)}\n`), "TOO_LARGE", "line 2");
  // The largest double below 2^500 is accepted.
  const below = 2 ** 500 * (1 - 2 ** -53);
  assert.deepEqual(numbers(parseCsv(`a\n${below}\n`), "a"), [below]);
  assertFails(() => tableFromColumns({ a: [1, 1e200] }), "TOO_LARGE", "line 2", 'column "a"');
});

Deno.test("bad CSV: a missing value under the default policy names the first one", () => {
  assertFails(
    () => parseCsv("a,b,c\n1,2,3\n4,NA,6\n7,8,\n"),
    "MISSING_VALUE",
    "line 3",
    'column "b"',
    "2 of 3",
    'missing: "drop"',
  );
  assertFails(() => parseCsv("a,b\nNA,1\n2,NA\n", { missing: "drop" }), "NO_ROWS", "every");
});

Deno.test("bad input: unreadable files and streams give READ_FAILED naming the source", async () => {
  await assertRejects(() => readCsv("no/such/file.csv"), "READ_FAILED", "no/such/file.csv");
  const dir = await Deno.makeTempDir();
  try {
    await assertRejects(() => readCsv(dir), "READ_FAILED", dir, "directory");
    const bad = `${dir}/latin1.csv`;
    await Deno.writeFile(bad, new Uint8Array([...new TextEncoder().encode("a\n1\n"), 0xe9, 10]));
    await assertRejects(() => readCsv(bad), "READ_FAILED", bad, "UTF-8");
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
  const failing = new ReadableStream<string>({
    pull(controller) {
      controller.error(new TypeError("socket hang up"));
    },
  });
  await assert.rejects(
    () => readCsvStream(failing, { source: "upload" }),
    (error) => {
      check(error, "READ_FAILED", ["upload", "socket hang up"]);
      assert.equal((error as Error).cause, undefined);
      return true;
    },
  );
});

Deno.test("bad options: unknown names and wrong values give BAD_OPTION or UNKNOWN_COLUMN", () => {
  const text = "a,b\n1,2\n";
  assertFails(() => parseCsv(text, { mising: "drop" } as never), "BAD_OPTION", "mising");
  assertFails(() => parseCsv(text, { missing: "skip" } as never), "BAD_OPTION", "option missing");
  assertFails(
    () => parseCsv(text, { types: { a: "text" } } as never),
    "BAD_OPTION",
    "option types.a",
  );
  assertFails(() => parseCsv(text, { types: { c: "number" } }), "UNKNOWN_COLUMN", "types.c");
  assertFails(
    () => tableFromColumns({ a: [1, 2], b: [1] }),
    "RAGGED_ROW",
    'column "b"',
    "1 value,",
  );
  assertFails(() => tableFromRows([{ a: 1 }, { a: true }]), "BAD_NUMBER", "line 2", "true");
  assertFails(() => tableFromRows([]), "EMPTY_INPUT", "rows");
  assertFails(() => tableFromColumns({ a: [] }), "NO_ROWS", "columns");
});
