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
import { sweepStream } from "../lib/stream/stream.ts";
import { legendre } from "../lib/design/mod.ts";
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

// ---------------------------------------------------------------------------------------------
// Field separators and line ends

Deno.test("fieldSeparator: NIST Longley with semicolons, tabs, bars or spaces loads to the comma file's numbers", async () => {
  // Longley: n = 16 (NIST StRD certified.json), first observation y = 60323 (Longley.csv).
  const text = await Deno.readTextFile(new URL("Longley.csv", NIST));
  const comma = parseCsv(text);
  assert.equal(comma.nRows, 16);
  assert.equal(numbers(comma, "y")[0], 60323);
  const dir = await Deno.makeTempDir();
  try {
    for (const separator of [";", "\t", "|", " "]) {
      const converted = text.replaceAll(",", separator);
      const path = `${dir}/longley.txt`;
      await Deno.writeTextFile(path, converted);
      // Seven-character chunks cut records, fields and numbers anywhere.
      const pieces = converted.match(/[^]{1,7}/g)!;
      const tables = [
        parseCsv(converted, { fieldSeparator: separator }),
        await readCsv(path, { fieldSeparator: separator }),
        await readCsvStream(streamOf(pieces), { fieldSeparator: separator }),
      ];
      for (const table of tables) {
        const label = `${JSON.stringify(separator)} from ${table.source}`;
        assert.deepEqual(table.names, comma.names, label);
        for (const name of comma.names) {
          assert.deepEqual(numbers(table, name), numbers(comma, name), `${label}, ${name}`);
        }
        assert.deepEqual([...table.lineOfRow], [...comma.lineOfRow], label);
      }
    }
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("fieldSeparator: quotes work as with commas, and a comma is plain text", () => {
  const text = 'id;label;note\r\n1;a,b;"x; y"\r\n2;"c ""d""";"two\r\nlines"\r\n3;e;\r\n';
  const table = parseCsv(text, { fieldSeparator: ";", missing: "drop" });
  assert.deepEqual(numbers(table, "id"), [1, 2]);
  assert.deepEqual(category(table, "label").levels, ["a,b", 'c "d"']);
  assert.deepEqual(category(table, "note").levels, ["two\r\nlines", "x; y"]);
  assert.deepEqual(table.missing.droppedLines, [5]);
  assertFails(
    () => parseCsv('a;b\n1;"x",\n', { fieldSeparator: ";" }),
    "OPEN_QUOTE",
    "line 2",
    'column "b"',
    '","',
  );
});

Deno.test("line ends: bare CR, CRLF and LF give the same rows and line numbers, in errors too", () => {
  // Records start on lines 2, 5, 6, 7: a quoted line break moves them down, line 4 is blank.
  const lf = 'x,note\n1,"two\nlines"\n\n2,plain\n3,"say ""hi"""\n4,last';
  for (const end of ["\n", "\r\n", "\r"]) {
    const text = lf.replaceAll("\n", end);
    const label = JSON.stringify(end);
    const table = parseCsv(text);
    assert.deepEqual([...table.lineOfRow], [2, 5, 6, 7], label);
    assert.deepEqual(numbers(table, "x"), [1, 2, 3, 4], label);
    assert.deepEqual(
      category(table, "note").levels,
      ["last", "plain", 'say "hi"', `two${end}lines`],
      label,
    );
    assertFails(() => parseCsv(`${text}${end}bad,x`), "BAD_NUMBER", "line 8", 'column "x"');
    assertFails(() => parseCsv(`${text}${end}5`), "RAGGED_ROW", "line 8", "1 field");
    assertFails(() => parseCsv(`${text}${end}5,"open${end}6,y`), "OPEN_QUOTE", "line 8");
    const dropped = parseCsv(`${text}${end}NA,z${end}${end}6,w`, { missing: "drop" });
    assert.deepEqual(dropped.missing.droppedLines, [8], label);
    assert.deepEqual([...dropped.lineOfRow], [2, 5, 6, 7, 10], label);
  }
});

Deno.test("line ends: mixed in one file, each CR, LF or CRLF ends one line", () => {
  // Lines: 1 "x,y" CR, 2 "1,2" LF, 3 "3,4" CRLF, 4 "5,6" CR, 5 empty CRLF, 6 "7,8" LF, 7 empty CR,
  // 8 "9,oops" CR.
  const mixed = "x,y\r1,2\n3,4\r\n5,6\r\r\n7,8\n\r9,oops\r";
  assertFails(() => parseCsv(mixed), "BAD_NUMBER", "line 8", 'column "y"', '"oops"');
  const table = parseCsv(mixed.replace("9,oops\r", ""));
  assert.deepEqual([...table.lineOfRow], [2, 3, 4, 6]);
  assert.deepEqual(numbers(table, "y"), [2, 4, 6, 8]);
  // A bare CR after a closing quote ends the record (before, only CRLF or LF could).
  const afterQuote = parseCsv('a,b\r1,"q"\r2,"r"\r\n3,"s"\n');
  assert.deepEqual([...afterQuote.lineOfRow], [2, 3, 4]);
  assert.deepEqual(category(afterQuote, "b").levels, ["q", "r", "s"]);
  // Quoted fields keep every kind of line end as written, and count each as one line.
  const quoted = parseCsv('a,b\n1,"p\rq\r\nr\ns"\r5,t\n');
  assert.deepEqual(category(quoted, "b").levels, ["p\rq\r\nr\ns", "t"]);
  assert.deepEqual([...quoted.lineOfRow], [2, 6]);
});

Deno.test("tokenizer: bare CR and CRLF cut anywhere between chunks, with a chosen separator", () => {
  const text = 'a;b;c\r1;"x\ry";3\r\r2;"p\r\nq";\r\n"";q"r;"m\n\rn"\r4;5;6\r';
  const run = (chunks: string[]) => {
    const out: [string[], number, boolean][] = [];
    const tokenizer = new CsvTokenizer({
      source: "t",
      separator: ";",
      onRecord: (f, l, q) => out.push([f, l, q]),
    });
    for (const chunk of chunks) tokenizer.push(chunk);
    tokenizer.end();
    return { records: out, next: tokenizer.line };
  };
  const whole = run([text]);
  assert.deepEqual(whole, {
    records: [
      [["a", "b", "c"], 1, false],
      [["1", "x\ry", "3"], 2, true],
      [["2", "p\r\nq", ""], 5, true],
      [["", 'q"r', "m\n\rn"], 7, true],
      [["4", "5", "6"], 10, false],
    ],
    next: 11,
  });
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

Deno.test("bad options: a fieldSeparator that cannot separate fields is BAD_OPTION naming it", async () => {
  const text = "a,b\n1,2\n";
  for (const bad of ['"', "\r", "\n", "", ";;", "\\t", ".", "-", "+", "e", "7", "\u{1F600}"]) {
    assertFails(
      () => parseCsv(text, { fieldSeparator: bad }),
      "BAD_OPTION",
      "option fieldSeparator",
      JSON.stringify(bad),
    );
  }
  assertFails(
    () => parseCsv(text, { fieldSeparator: 44 as never }),
    "BAD_OPTION",
    "option fieldSeparator",
    "44",
  );
  // Options are checked before the file is opened or the stream read.
  await assertRejects(
    () => readCsv("no/such/file.csv", { fieldSeparator: '"' }),
    "BAD_OPTION",
    "option fieldSeparator",
  );
  await assertRejects(
    () => readCsvStream(streamOf([text]), { fieldSeparator: "\n" }),
    "BAD_OPTION",
    "option fieldSeparator",
  );
  // Rows and columns have no separator: the option is refused, not ignored.
  assertFails(
    () => tableFromRows([{ a: 1 }], { fieldSeparator: ";" } as never),
    "BAD_OPTION",
    "option fieldSeparator",
    "CSV input only",
  );
  assertFails(
    () => toTable({ a: [1] }, { fieldSeparator: "," } as never),
    "BAD_OPTION",
    "option fieldSeparator",
  );
});

Deno.test("wrong separator: a header that does not split names the likely one; nothing is guessed", async () => {
  assertFails(
    () => parseCsv("x;y\n1;2\n"),
    "BAD_OPTION",
    "CSV text, line 1, option fieldSeparator",
    '"x;y"',
    "separated by semicolons",
    'fieldSeparator: ";"',
  );
  assertFails(
    () => parseCsv("x\ty\n1\t2\n"),
    "BAD_OPTION",
    "line 1",
    "tabs",
    "field-separator tab",
  );
  assertFails(
    () => parseCsv("x,y\n1,2\n", { fieldSeparator: ";" }),
    "BAD_OPTION",
    "line 1",
    "probably separated by commas",
    "read as separated by semicolons",
  );
  // The header's own line is named after blank lines; the most frequent candidate is named.
  assertFails(
    () => parseCsv("\r\n\r\na|b|c;d\r\n1|2|3;4\r\n"),
    "BAD_OPTION",
    "line 3",
    "2 vertical",
  );
  await assertRejects(
    () => readCsvStream(streamOf(["x;", "y\n1;2\n"]), { source: "feed" }),
    "BAD_OPTION",
    "feed, line 1",
  );
  // Quoted names followed by another separator: the quote error suggests it.
  assertFails(
    () => parseCsv('"x";"y"\n"1";2\n'),
    "OPEN_QUOTE",
    "line 1",
    'set the field separator to ";"',
  );
  assert.deepEqual(numbers(parseCsv('"x";"y"\n"1";2\n', { fieldSeparator: ";" }), "x"), [1]);
  // A one-column header in double quotes is taken as written; one without another separator too.
  assert.deepEqual(parseCsv('"price;usd"\n3\n4\n').names, ["price;usd"]);
  assert.deepEqual(parseCsv("x\n1\n").names, ["x"]);
  // A record that does not split, under a header that does, says so in its hint.
  assertFails(
    () => parseCsv("x,y\n1,2\n3;4\n"),
    "RAGGED_ROW",
    "line 3",
    "has 1 field,",
    "If the semicolons in it are meant to separate its fields",
  );
  assertFails(() => parseCsv("x;y\n1;2\n3\n", { fieldSeparator: ";" }), "RAGGED_ROW", "semicolon");
  // With the separator given, a decimal comma stays text: no value is changed silently.
  assertFails(
    () => parseCsv("x;y\n2;3\n1,5;2\n", { fieldSeparator: ";" }),
    "BAD_NUMBER",
    "line 3",
    '"1,5"',
  );
});

Deno.test("sweepStream takes fieldSeparator: NIST Pontius with semicolons and bare CR sweeps as with commas", async () => {
  // The comma file is the reference; Pontius (NIST StRD) has n = 40 rows of y, x.
  const comma = await Deno.readTextFile(new URL("Pontius.csv", NIST));
  const semicolons = comma.replaceAll(",", ";").replace(/\r?\n/g, "\r");
  const spec = {
    target: "y",
    terms: [legendre("x", 2)],
    folds: { k: 4, seed: 3 },
    lambdas: [0, 1e-3, 1],
  };
  const a = await sweepStream(() => streamOf([comma]), spec);
  const b = await sweepStream(() => streamOf(semicolons.match(/[^]{1,9}/g)!), {
    ...spec,
    fieldSeparator: ";",
  });
  assert.equal(a.rows.used, 40);
  assert.equal(b.rows.used, 40);
  assert.deepEqual(b.curve, a.curve);
  assert.deepEqual(b.minimum, a.minimum);
  // A bad separator, one given for NDJSON, and a header read with the wrong one: BAD_OPTION.
  await assertRejects(
    () => sweepStream(() => streamOf([comma]), { ...spec, fieldSeparator: "\n" }),
    "BAD_OPTION",
    "option fieldSeparator",
  );
  await assertRejects(
    () =>
      sweepStream(() => streamOf(['{"x":1,"y":2}\n']), {
        ...spec,
        format: "ndjson",
        fieldSeparator: ";",
      }),
    "BAD_OPTION",
    "option fieldSeparator",
    "ndjson",
  );
  await assertRejects(
    () => sweepStream(() => streamOf([semicolons]), { ...spec, label: "pontius" }),
    "BAD_OPTION",
    "pontius, line 1, option fieldSeparator",
    "semicolons",
  );
});
