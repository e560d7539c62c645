/**
 * Benchmark behind the choice of CSV tokenizer (see lib/table/README.md for the results).
 *
 * Generates a CSV file of about 100 MB (10 numeric columns + 1 text column; about 1 in 50 text
 * fields is quoted, some with commas, doubled quotes or line breaks) in a temporary folder, then
 * for each candidate runs a fresh Deno process that parses it and reports throughput (MB/s, 1 MB
 * = 10^6 bytes, wall time from first read to last record) and peak resident memory (VmHWM from
 * /proc/self/status, Linux only). Every run must see the same record count and checksums, so a
 * candidate that splits records differently is caught. It also checks each candidate on small
 * RFC 4180 cases and asks it for the line where each record starts.
 *
 * Run: deno run --allow-read --allow-write --allow-run test/bench/csv_parsers.ts [--mb=100] [--reps=3]
 *
 * @module
 */
import { createReadStream } from "node:fs";
import process from "node:process";
import { parse as csvParseStream } from "csv-parse";
import { parse as csvParseSync } from "csv-parse/sync";
import Papa from "papaparse";
import { CsvTokenizer } from "../../lib/table/csv_tokenizer.ts";
import { parseCsv, readCsv } from "../../lib/table/mod.ts";

/** What one run of one candidate reports. */
interface RunResult {
  readonly records: number;
  /** Sum of the first field read as a number, over data records. */
  readonly sum: number;
  /** Total length of the last (text) field. */
  readonly textLength: number;
  /** Wall time. */
  readonly seconds: number;
  /** CPU time (user + system, all threads): less affected by other jobs on the machine. */
  readonly cpuSeconds: number;
  readonly peakRssMb: number;
}

/** Counts records and checksums them the same way for every candidate. */
class Tally {
  records = 0;
  sum = 0;
  textLength = 0;
  add(fields: readonly string[]): void {
    this.records++;
    if (this.records > 1) this.sum += Number(fields[0]);
    this.textLength += fields[fields.length - 1].length;
  }
}

/** Wall and CPU time since the last `start()`. */
class Clock {
  #wall = 0;
  #cpu = 0;
  constructor() {
    this.start();
  }
  start(): void {
    this.#wall = performance.now();
    this.#cpu = cpuSeconds();
  }
  read(): { seconds: number; cpuSeconds: number } {
    return {
      seconds: (performance.now() - this.#wall) / 1000,
      cpuSeconds: cpuSeconds() - this.#cpu,
    };
  }
}

function cpuSeconds(): number {
  const usage = process.cpuUsage();
  return (usage.user + usage.system) / 1e6;
}

/**
 * Parses the file at `path` into `tally`. The clock runs from the call; a candidate that first
 * reads the whole text restarts it, so only parsing is timed.
 */
type Candidate = (path: string, tally: Tally, clock: Clock) => Promise<void>;

/** Each candidate, in the two ways the loaders need: a file streamed, and text in memory. */
const CANDIDATES: Record<string, Candidate> = {
  "baseline: read + decode only": async (path) => {
    const decoder = new TextDecoder();
    for await (const bytes of fileChunks(path)) decoder.decode(bytes, { stream: true });
  },
  "csv-parse 7.0.3, file stream": (path, tally) =>
    new Promise((resolve, reject) => {
      const parser = csvParseStream({ relax_column_count: true, record_delimiter: ["\r\n", "\n"] });
      parser.on("readable", () => {
        let record: string[] | null;
        while ((record = parser.read()) !== null) tally.add(record);
      });
      parser.on("error", reject);
      parser.on("end", resolve);
      createReadStream(path, { highWaterMark: CHUNK_BYTES }).pipe(parser);
    }),
  "csv-parse 7.0.3, string (sync API)": async (path, tally, clock) => {
    const text = await Deno.readTextFile(path);
    clock.start();
    csvParseSync(text, {
      relax_column_count: true,
      record_delimiter: ["\r\n", "\n"],
      on_record: (record: string[]) => {
        tally.add(record);
        return null; // keep nothing: the tally is all we need
      },
    });
  },
  "papaparse 5.7.1, file stream": (path, tally) =>
    new Promise((resolve, reject) => {
      // papaparse decodes Buffer chunks one by one, which would split UTF-8 characters across
      // chunk ends; a stream with an encoding hands it whole characters.
      Papa.parse(createReadStream(path, { encoding: "utf8", highWaterMark: CHUNK_BYTES }), {
        skipEmptyLines: true,
        step: (row: { data: string[] }) => tally.add(row.data),
        complete: () => resolve(),
        error: (error: Error) => reject(error),
      });
    }),
  "papaparse 5.7.1, string": async (path, tally, clock) => {
    const text = await Deno.readTextFile(path);
    clock.start();
    Papa.parse(text, {
      skipEmptyLines: true,
      step: (row: { data: string[] }) => tally.add(row.data),
    });
  },
  "own tokenizer, file stream": async (path, tally) => {
    const tokenizer = new CsvTokenizer({ source: path, onRecord: (fields) => tally.add(fields) });
    const decoder = new TextDecoder();
    for await (const bytes of fileChunks(path)) {
      tokenizer.push(decoder.decode(bytes, { stream: true }));
    }
    tokenizer.push(decoder.decode());
    tokenizer.end();
  },
  "own tokenizer, string": async (path, tally, clock) => {
    const text = await Deno.readTextFile(path);
    clock.start();
    const tokenizer = new CsvTokenizer({ source: path, onRecord: (fields) => tally.add(fields) });
    tokenizer.push(text);
    tokenizer.end();
  },
  "readCsv (full loader: typed columns)": async (path, tally) => {
    tallyTable(await readCsv(path, { types: { note: "category" } }), tally);
  },
  "parseCsv (full loader: typed columns)": async (path, tally, clock) => {
    const text = await Deno.readTextFile(path);
    clock.start();
    tallyTable(parseCsv(text, { types: { note: "category" } }), tally);
  },
};

/**
 * Bytes per read for every file-streaming candidate (node streams get it as highWaterMark).
 * 1 MiB reads cost far less per byte than a Deno file's `readable` stream, whose 64 KiB chunks
 * alone limit throughput to about 200 MB/s here.
 */
const CHUNK_BYTES = 1 << 20;

/** The file's bytes, CHUNK_BYTES at a time (each chunk valid until the next is read). */
async function* fileChunks(path: string): AsyncGenerator<Uint8Array> {
  using file = await Deno.open(path);
  const buffer = new Uint8Array(CHUNK_BYTES);
  for (let n = await file.read(buffer); n !== null; n = await file.read(buffer)) {
    yield buffer.subarray(0, n);
  }
}

/** Fills a tally from a loaded table (header counts as a record, as for the tokenizers). */
function tallyTable(table: Awaited<ReturnType<typeof readCsv>>, tally: Tally): void {
  const first = table.columns.get(table.names[0]);
  const note = table.columns.get("note");
  if (first?.kind !== "number" || note?.kind !== "category") throw new Error("unexpected kinds");
  tally.records = table.nRows + 1;
  tally.sum = first.values.reduce((a, b) => a + b, 0);
  tally.textLength = "note".length;
  for (const code of note.codes) tally.textLength += note.levels[code].length;
}

// ---------------------------------------------------------------------------------------------
// Test data

/** xorshift32 (Marsaglia 2003): a fixed, seeded stream for reproducible bench data. */
function xorshift32(seed: number): () => number {
  let s = seed >>> 0 || 1;
  return () => {
    s ^= s << 13;
    s >>>= 0;
    s ^= s >>> 17;
    s ^= s << 5;
    s >>>= 0;
    return s / 2 ** 32;
  };
}

const WORDS = ["north", "south", "east", "west", "ridge", "valley", "harbor", "mesa", "delta"];

/** Writes about `megabytes` MB of CSV to `path`; returns its size in bytes. */
async function generate(path: string, megabytes: number): Promise<number> {
  const next = xorshift32(20240611);
  const file = await Deno.open(path, { write: true, create: true, truncate: true });
  const encoder = new TextEncoder();
  const header = [...Array.from({ length: 10 }, (_, j) => `x${j}`), "note"].join(",") + "\n";
  let bytes = 0;
  const write = async (text: string) => {
    const data = encoder.encode(text);
    bytes += data.length;
    for (let done = 0; done < data.length;) done += await file.write(data.subarray(done));
  };
  await write(header);
  while (bytes < megabytes * 1e6) {
    const lines: string[] = [];
    for (let r = 0; r < 10_000; r++) {
      const fields: string[] = [];
      for (let j = 0; j < 10; j++) fields.push(numberText(next, j));
      fields.push(noteText(next));
      lines.push(fields.join(","));
    }
    await write(lines.join("\n") + "\n");
  }
  file.close();
  return bytes;
}

/** Numbers in the forms real files have: integers, fixed decimals, `.5`, `7.`, exponents. */
function numberText(next: () => number, column: number): string {
  const u = next();
  switch (column % 5) {
    case 0:
      return String(Math.floor(u * 1e6));
    case 1:
      return (u * 200 - 100).toFixed(6);
    case 2:
      return u < 0.5 ? (u * 2).toFixed(5).slice(1) : `${Math.floor(u * 1000)}.`;
    case 3:
      return (u * 1e-3).toExponential(8);
    default:
      return String(u * 1e4);
  }
}

function noteText(next: () => number): string {
  const u = next();
  const word = WORDS[Math.floor(next() * WORDS.length)];
  if (u < 0.005) return `"${word}, then ${word}"`;
  if (u < 0.01) return `"the ""${word}"" site"`;
  if (u < 0.02) return `"${word}\n${word}"`;
  return `${word}-${Math.floor(next() * 100)}`;
}

// ---------------------------------------------------------------------------------------------
// RFC 4180 checks

/** RFC 4180 sample (CRLF line ends): quoted comma, quoted line break, doubled quotes, blank line. */
const RFC_TEXT = 'a,b\r\n1,"x, y"\r\n2,"two\r\nlines"\r\n3,"say ""hi"""\r\n\r\n4,end\r\n';
const RFC_RECORDS = [["a", "b"], ["1", "x, y"], ["2", "two\r\nlines"], ["3", 'say "hi"'], [
  "4",
  "end",
]];
/** Line where each record starts: the quoted line break moves later records down one line. */
const RFC_START_LINES = [1, 2, 3, 5, 7];
/** The same records with mixed line ends, as in a file edited on two systems. */
const MIXED_TEXT = RFC_TEXT.replace("\r\n3,", "\n3,").replace("\r\n4,", "\n4,");

/** How a candidate splits a text: its records, and the line numbers it can give for them. */
type Splitter = (text: string) => { records: string[][]; lines: string };

const SPLITTERS: Record<string, Splitter> = {
  "csv-parse, default options": (text) => {
    const records = csvParseSync(text, { skip_empty_lines: true }) as string[][];
    return { records, lines: "(not asked)" };
  },
  // By default csv-parse fixes the record delimiter from the first line; allow both.
  "csv-parse": (text) => {
    const out = csvParseSync(text, {
      info: true,
      skip_empty_lines: true,
      record_delimiter: ["\r\n", "\n"],
    }) as unknown as { record: string[]; info: { lines: number } }[];
    const lines = out.map((o) => o.info.lines);
    return { records: out.map((o) => o.record), lines: `info.lines ${JSON.stringify(lines)}` };
  },
  papaparse: (text) => ({
    records: (Papa.parse(text, { skipEmptyLines: true }) as { data: string[][] }).data,
    lines: "none (character offsets only)",
  }),
  "own tokenizer": (text) => {
    const records: string[][] = [];
    const lines: number[] = [];
    const tokenizer = new CsvTokenizer({
      source: "sample",
      onRecord: (fields, line) => {
        records.push(fields);
        lines.push(line);
      },
    });
    tokenizer.push(text);
    tokenizer.end();
    return { records, lines: `start lines ${JSON.stringify(lines)}` };
  },
};

/** One line per candidate: records right or wrong on both samples, and its line numbers. */
function rfcCheck(): string[] {
  const expected = JSON.stringify(RFC_RECORDS);
  const verdict = (split: Splitter, text: string) => {
    try {
      const { records, lines } = split(text);
      return `${JSON.stringify(records) === expected ? "records ok" : "records WRONG"}, ${lines}`;
    } catch (error) {
      return `throws ${JSON.stringify((error as Error).message.split("\n")[0])}`;
    }
  };
  return [
    `expected: start lines ${JSON.stringify(RFC_START_LINES)}`,
    ...Object.entries(SPLITTERS).map(([name, split]) =>
      `${name}: CRLF sample: ${verdict(split, RFC_TEXT)}; mixed line ends: ${
        verdict(split, MIXED_TEXT)
      }`
    ),
  ];
}

// ---------------------------------------------------------------------------------------------
// Driver

async function child(name: string, path: string): Promise<void> {
  const tally = new Tally();
  const clock = new Clock();
  await CANDIDATES[name](path, tally, clock);
  const time = clock.read();
  const status = await Deno.readTextFile("/proc/self/status");
  const peakKb = Number(/VmHWM:\s+(\d+)/.exec(status)?.[1] ?? NaN);
  const result: RunResult = { ...tally, ...time, peakRssMb: peakKb / 1024 };
  console.log(JSON.stringify(result));
}

async function runChild(name: string, path: string): Promise<RunResult> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "--allow-all", import.meta.filename ?? "", "--child", name, path],
    stdout: "piped",
    stderr: "inherit",
  }).output();
  if (!out.success) throw new Error(`${name} failed`);
  return JSON.parse(new TextDecoder().decode(out.stdout));
}

/** /proc/loadavg, read by a child process (reading /proc directly needs --allow-all). */
async function loadAverage(): Promise<string> {
  const out = await new Deno.Command("cat", { args: ["/proc/loadavg"], stdout: "piped" }).output();
  return new TextDecoder().decode(out.stdout).trim();
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

async function main(): Promise<void> {
  const flag = (name: string, fallback: number) =>
    Number(Deno.args.find((a) => a.startsWith(`--${name}=`))?.split("=")[1] ?? fallback);
  const megabytes = flag("mb", 100);
  const reps = flag("reps", 3);
  console.log(
    `Deno ${Deno.version.deno}, V8 ${Deno.version.v8}, ${navigator.hardwareConcurrency} cores`,
  );
  console.log(`Load average at the start: ${await loadAverage()}`);
  console.log("\nRFC 4180 sample:", JSON.stringify(RFC_TEXT));
  for (const line of rfcCheck()) console.log(`  ${line}`);

  const dir = await Deno.makeTempDir({ prefix: "curbfit_csv_bench_" });
  try {
    const path = `${dir}/bench.csv`;
    const bytes = await generate(path, megabytes);
    console.log(
      `\nFile: ${(bytes / 1e6).toFixed(1)} MB; median of ${reps} runs, each a fresh process, ` +
        "candidates taking turns",
    );
    const names = Object.keys(CANDIDATES);
    const runs = new Map(names.map((name) => [name, [] as RunResult[]]));
    for (let r = 0; r < reps; r++) {
      for (const name of names) runs.get(name)!.push(await runChild(name, path));
    }
    console.log("| candidate | MB/s (wall) | MB/s (CPU time) | peak RSS (MB) | records |");
    console.log("| --- | ---: | ---: | ---: | ---: |");
    const reference = runs.get(names[1])![0];
    for (const name of names) {
      const results = runs.get(name)!;
      const baseline = name.startsWith("baseline");
      for (const run of baseline ? [] : results) {
        const same = run.records === reference.records && run.sum === reference.sum &&
          run.textLength === reference.textLength;
        if (!same) console.log(`  MISMATCH for ${name}: ${JSON.stringify(run)}`);
      }
      const wall = median(results.map((x) => bytes / 1e6 / x.seconds));
      const cpu = median(results.map((x) => bytes / 1e6 / x.cpuSeconds));
      const rss = median(results.map((x) => x.peakRssMb));
      const records = baseline ? "-" : String(results[0].records - 1);
      console.log(
        `| ${name} | ${wall.toFixed(1)} | ${cpu.toFixed(1)} | ${rss.toFixed(0)} | ${records} |`,
      );
    }
    console.log(`\nLoad average at the end: ${await loadAverage()}`);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
}

if (import.meta.main) {
  if (Deno.args[0] === "--child") await child(Deno.args[1], Deno.args[2]);
  else await main();
}
