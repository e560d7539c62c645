/**
 * The `curbfit` command line, run as a subprocess with the running Deno and the permission
 * flags of the deno.json task: exit codes, one-line messages for bad input, verify's exit codes,
 * compare/fit/report, hostile names, the term syntax, and the README's option list.
 *
 * Data: examples/data/orchard.csv (invented demo data) and the bad-input fixtures in
 * test/fixtures/cli/. These are plumbing tests; the numbers themselves are tested against
 * outside references elsewhere (sweep, record tests).
 */
import assert from "node:assert/strict";
import { join } from "node:path";
import {
  column,
  compare,
  CurbfitError,
  elasticNet,
  indicators,
  lasso,
  legendre,
  power,
  product,
  readCsv,
  recordJson,
  ridge,
  type Term,
} from "../mod.ts";
import { runCli } from "../lib/cli/mod.ts";
import type { CliIo } from "../lib/cli/run.ts";
import { COMMANDS } from "../lib/cli/commands.ts";
import {
  formatPenalty,
  formatTerm,
  parseCandidate,
  parsePenalty,
  parseTerm,
  quoteName,
} from "../lib/cli/syntax.ts";
import { argvOf, rerunCommand } from "../lib/cli/rerun.ts";
import {
  isSparseModel,
  modelStrengths,
  parseRecord,
  type RidgeModelSection,
} from "../lib/record/mod.ts";
import { escapeHtml } from "../lib/views/escape.ts";
import {
  assertInertHtml,
  type Ran,
  rawMarkdownMarkup,
  ROOT,
  runTask,
} from "./fixtures/cli/helpers.ts";

const F = "test/fixtures/cli";
const CSV = "test/fixtures/csv";
const ORCHARD = "examples/data/orchard.csv";

/** Asserts the failure shape every bad input must have: exit 2, one stderr line, no stack. */
function assertOneLineError(ran: Ran, mentions: readonly string[]): void {
  const lines = ran.stderr.trimEnd().split("\n");
  assert.equal(ran.code, 2, `exit code 2 expected, got ${ran.code}; stderr: ${ran.stderr}`);
  assert.equal(lines.length, 1, `one stderr line expected, got:\n${ran.stderr}`);
  assert.match(lines[0], /^curbfit( \w+)?: /);
  assert.doesNotMatch(ran.stderr, /\n\s+at |error: Uncaught|Stack backtrace/);
  for (const m of mentions) assert.ok(lines[0].includes(m), `stderr should name ${m}: ${lines[0]}`);
  assert.equal(ran.stdout, "", "nothing on stdout for a failed run");
}

const SWEEP = [
  "sweep",
  "--data",
  ORCHARD,
  "--target",
  "brix",
  "--term",
  "legendre:days_since_blossom:4",
];

const FIT_SHADE = [
  "fit",
  "--data",
  ORCHARD,
  "--target",
  "brix",
  "--term",
  "legendre:days_since_blossom:4",
  "--term",
  "column:shade_share",
];

/** Bad inputs: arguments and what the one stderr line must name. */
const BAD: readonly { name: string; args: string[]; mentions: string[] }[] = [
  {
    name: "missing file",
    args: ["sweep", "--data", `${F}/no_such.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["no_such.csv", "does not exist"],
  },
  {
    name: "empty file",
    args: ["sweep", "--data", `${F}/empty.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["empty.csv", "empty"],
  },
  {
    name: "header only",
    args: ["sweep", "--data", `${F}/header_only.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["header_only.csv", "no data rows"],
  },
  {
    name: "ragged row",
    args: ["sweep", "--data", `${F}/ragged.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["ragged.csv", "line 3", "2 fields", "header has 3"],
  },
  {
    name: "open quote",
    args: ["sweep", "--data", `${F}/open_quote.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["open_quote.csv", "line 2", "never closed"],
  },
  {
    name: "non-numeric value",
    args: ["sweep", "--data", `${F}/non_numeric.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["non_numeric.csv", "line 4", '"abc" is not a number'],
  },
  {
    name: "duplicate header",
    args: ["sweep", "--data", `${F}/duplicate_header.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["duplicate_header.csv", "line 1", 'column "x"', "column 1 and column 3"],
  },
  {
    name: "missing value",
    args: ["sweep", "--data", `${F}/missing_value.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["missing_value.csv", "line 3", "missing"],
  },
  {
    name: "unknown target",
    args: ["sweep", "--data", ORCHARD, "--target", "sugar", "--term", "column:shade_share"],
    mentions: ["--target", '"sugar"', "brix"],
  },
  {
    name: "constant target",
    args: ["sweep", "--data", `${F}/constant_target.csv`, "--target", "y", "--term", "column:x"],
    mentions: ["constant_target.csv", '"y"', "same value"],
  },
  {
    name: "k larger than the rows",
    args: [...SWEEP, "--folds", "50"],
    mentions: ["--folds", "50", "36 rows"],
  },
  {
    name: "negative λ",
    args: [...SWEEP, "--lambdas", "0,-1"],
    mentions: ["--lambdas", "-1", ">= 0"],
  },
  {
    name: "non-integer seed",
    args: [...SWEEP, "--seed", "1.5"],
    mentions: ["--seed", "1.5", "whole number"],
  },
  {
    name: "unknown option",
    args: [...SWEEP, "--sead", "3"],
    mentions: ["--sead", "Did you mean --seed?"],
  },
  {
    name: "malformed record JSON",
    args: ["verify", `${F}/malformed_record.txt`, "--data", ORCHARD],
    mentions: ["malformed_record.txt", "not valid JSON"],
  },
  {
    name: "record from a newer schema version",
    args: ["verify", `${F}/newer_record.json`, "--data", ORCHARD],
    mentions: ["newer_record.json", "record.schema", "version 2", "newer than this curbfit reads"],
  },
  {
    name: "unknown term kind",
    args: [
      "sweep",
      "--data",
      ORCHARD,
      "--target",
      "brix",
      "--term",
      "legendr:days_since_blossom:3",
    ],
    mentions: ["--term", '"legendr"', "Did you mean legendre?"],
  },
  {
    name: "term reads a missing column",
    args: ["sweep", "--data", ORCHARD, "--target", "brix", "--term", "column:shade"],
    mentions: ['"shade"', "shade_share"],
  },
  {
    name: "degree 0",
    args: [
      "sweep",
      "--data",
      ORCHARD,
      "--target",
      "brix",
      "--term",
      "legendre:days_since_blossom:0",
    ],
    mentions: ["--term", "degree", "0"],
  },
  {
    name: "no --data",
    args: ["sweep", "--target", "brix", "--term", "column:x"],
    mentions: ["--data"],
  },
  { name: "unknown command", args: ["swep"], mentions: ['"swep"', "sweep"] },
  { name: "no command", args: [], mentions: ["no command", "help"] },
  {
    name: "bad rule",
    args: [...SWEEP, "--rule", "best"],
    mentions: ["--rule", '"best"', "one-se"],
  },
  {
    name: "one candidate",
    args: [
      "compare",
      "--data",
      ORCHARD,
      "--target",
      "brix",
      "--candidate",
      "name=a; terms=column:shade_share",
    ],
    mentions: ["at least two candidates"],
  },
  {
    name: "repeated candidate name",
    args: [
      "compare",
      "--data",
      ORCHARD,
      "--target",
      "brix",
      "--candidate",
      "name=a; terms=column:shade_share",
      "--candidate",
      "name=a; terms=column:days_since_blossom",
    ],
    mentions: ["candidate 2", "repeated name"],
  },
  {
    name: "unknown candidate key",
    args: [
      "compare",
      "--data",
      ORCHARD,
      "--target",
      "brix",
      "--candidate",
      "name=a; term=column:x",
    ],
    mentions: ["--candidate 1", '"term=column:x"', "Did you mean terms="],
  },
  {
    name: "λ list and automatic grid together",
    args: [...SWEEP, "--lambdas", "1,2", "--lambda-count", "5"],
    mentions: ["--lambdas", "--lambda-count"],
  },
  { name: "verify without a record", args: ["verify"], mentions: ["record file"] },
  {
    name: "a λ grid with a lasso sweep",
    args: [...SWEEP, "--penalty", "lasso", "--lambdas", "0.1,1"],
    mentions: ["--lambdas", "lasso", "alphas"],
  },
  {
    name: "an α grid with a ridge sweep",
    args: [...SWEEP, "--alphas", "0.1"],
    mentions: ["--alphas", "ridge", "lambdas"],
  },
  {
    name: "α = 0 in a sweep's list",
    args: [...SWEEP, "--penalty", "elastic-net:0.5", "--alphas", "0,0.1"],
    mentions: ["--alphas", "> 0"],
  },
  {
    name: "λ with a lasso fit",
    args: [...FIT_SHADE, "--penalty", "lasso", "--lambda", "1"],
    mentions: ["--lambda", "lasso", "alpha"],
  },
  {
    name: "α with a ridge fit",
    args: [...FIT_SHADE, "--alpha", "0.1"],
    mentions: ["--alpha", "ridge", "lasso"],
  },
  {
    name: "elastic net with an L1 share above 1",
    args: [...FIT_SHADE, "--penalty", "elastic-net:1.5", "--alpha", "0.1"],
    mentions: ["--penalty", "1.5"],
  },
  {
    name: "a field separator of two characters",
    args: [...SWEEP, "--field-separator", ";;"],
    mentions: ["--field-separator", '";;"', "exactly one character"],
  },
  {
    name: "a double quote as field separator",
    args: [...SWEEP, "--field-separator", '"'],
    mentions: ["--field-separator", "double quote"],
  },
  {
    name: "a semicolon file read with the default comma",
    args: ["sweep", "--data", `${CSV}/semicolon_cr.csv`, "--target", "y", "--term", "column:x"],
    mentions: [
      "semicolon_cr.csv",
      "line 1: --field-separator: ",
      "semicolons",
      "--field-separator ';'",
    ],
  },
  {
    name: "a bad value in a semicolon file with bare CR line ends",
    args: [
      "sweep",
      "--data",
      `${CSV}/semicolon_cr.csv`,
      "--field-separator",
      ";",
      "--target",
      "y",
      "--term",
      "column:x",
    ],
    mentions: ["semicolon_cr.csv", "line 4", '"oops"'],
  },
];

for (const bad of BAD) {
  Deno.test(`cli: bad input — ${bad.name}: exit 2 and one line naming it`, async () => {
    const out = await Deno.makeTempDir();
    const args = bad.args.length > 0 && bad.args[0] !== "verify" && bad.args[0] !== "swep"
      ? [...bad.args, "--out", out]
      : bad.args;
    assertOneLineError(await runTask("curbfit", args), bad.mentions);
    assert.deepEqual([...Deno.readDirSync(out)], [], "a failed run writes nothing");
    await Deno.remove(out, { recursive: true });
  });
}

Deno.test("cli: at least 15 distinct bad inputs are covered", () => {
  assert.ok(BAD.length >= 15);
});

Deno.test("cli: sweep writes report, statement and record; verify exits 0, then 1 on an edited record naming the field", async () => {
  const out = await Deno.makeTempDir();
  const ran = await runTask("curbfit", [
    ...SWEEP.slice(0, 5),
    "--term",
    "legendre:days_since_blossom:8",
    "--term",
    "column:shade_share",
    "--term",
    "indicators:watering",
    "--folds",
    "6",
    "--seed",
    "3",
    "--rule",
    "one-se",
    "--lambda-count",
    "40",
    "--out",
    out,
  ]);
  assert.equal(ran.code, 0, ran.stderr);
  assert.equal(ran.stderr, "", "a short run prints no progress");
  for (const f of ["report.html", "statement.md", "record.json"]) {
    assert.ok(ran.stdout.includes(join(out, f)), `stdout names ${f}`);
  }
  assert.match(ran.stdout, /Chosen: λ = /);
  assert.match(ran.stdout, /Caution: /);
  const recordPath = join(out, "record.json");
  const record = parseRecord(await Deno.readTextFile(recordPath));
  assert.equal(record.folds.seed, 3);
  assert.equal(record.models[0].choice.rule, "one-se");
  assert.equal(record.models[0].grid.values.length, 40);

  const ok = await runTask("curbfit", ["verify", recordPath, "--data", ORCHARD]);
  assert.equal(ok.code, 0, ok.stdout + ok.stderr);
  assert.match(ok.stdout, /^Record check: MATCH/);
  assert.equal(ok.stderr, "");
  // Without --data, verify reads the file the record names.
  assert.equal((await runTask("curbfit", ["verify", recordPath])).code, 0);

  const edited = JSON.parse(await Deno.readTextFile(recordPath));
  edited.models[0].final.coefficients[2] *= 1.001;
  const editedPath = join(out, "edited.json");
  await Deno.writeTextFile(editedPath, JSON.stringify(edited, null, 2));
  const bad = await runTask("curbfit", ["verify", editedPath, "--data", ORCHARD]);
  assert.equal(bad.code, 1, bad.stderr);
  assert.match(bad.stdout, /^Record check: MISMATCH/);
  assert.ok(bad.stdout.includes("models[0].final.coefficients"), bad.stdout);
  const err = bad.stderr.trimEnd().split("\n");
  assert.equal(err.length, 1);
  assert.ok(err[0].includes("models[0].final.coefficients"), err[0]);

  const report = await runTask("curbfit", ["report", recordPath, "--out", join(out, "again")]);
  assert.equal(report.code, 0, report.stderr);
  assert.equal(
    await Deno.readTextFile(join(out, "again", "statement.md")),
    await Deno.readTextFile(join(out, "statement.md")),
    "the statement is rendered from the record alone",
  );
  await Deno.remove(out, { recursive: true });
});

Deno.test("cli: compare from --candidate and from a --candidates file; fit writes no record", async () => {
  const out = await Deno.makeTempDir();
  const flags = [
    "compare",
    "--data",
    ORCHARD,
    "--target",
    "brix",
    "--folds",
    "6",
    "--seed",
    "11",
    "--term",
    "column:shade_share",
  ];
  const inline = await runTask("curbfit", [
    ...flags,
    "--candidate",
    "name=straight line; terms=column:days_since_blossom + column:shade_share; lambdas=0",
    "--candidate",
    "name=degree 6, rising; terms=legendre:days_since_blossom:6 + column:shade_share; " +
    "penalty=ridge:rising:2; lambda-count=30; rule=one-se",
    "--out",
    join(out, "a"),
  ]);
  assert.equal(inline.code, 0, inline.stderr);
  const fromFile = await runTask("curbfit", [
    ...flags,
    "--candidates",
    `${F}/candidates.txt`,
    "--out",
    join(out, "b"),
  ]);
  assert.equal(fromFile.code, 0, fromFile.stderr);
  const a = await Deno.readTextFile(join(out, "a", "record.json"));
  assert.equal(
    a,
    await Deno.readTextFile(join(out, "b", "record.json")),
    "same candidates, same bytes",
  );
  const record = parseRecord(a);
  assert.equal(record.kind, "comparison");
  assert.deepEqual(record.models.map((m) => m.name), ["straight line", "degree 6, rising"]);
  assert.deepEqual((record.models[1] as RidgeModelSection).penalty.weights, "rising");
  assert.equal(record.models[1].choice.rule, "one-se");

  const fitted = await runTask("curbfit", [
    "fit",
    "--data",
    ORCHARD,
    "--target",
    "brix",
    "--term",
    "legendre:days_since_blossom:3",
    "--lambda",
    "2",
    "--out",
    join(out, "fit"),
  ]);
  assert.equal(fitted.code, 0, fitted.stderr);
  assert.match(fitted.stdout, /P3\(days_since_blossom\)/);
  assert.deepEqual(
    [...Deno.readDirSync(join(out, "fit"))].map((e) => e.name).sort(),
    ["report.html", "statement.md"],
  );
  await Deno.remove(out, { recursive: true });
});

Deno.test("cli: help and version exit 0; every command's help lists its options", async () => {
  const help = await runTask("curbfit", ["help"]);
  assert.equal(help.code, 0);
  for (const c of COMMANDS) assert.ok(help.stdout.includes(c.name));
  const verifyHelp = await runTask("curbfit", ["verify", "--help"]);
  assert.equal(verifyHelp.code, 0);
  assert.match(verifyHelp.stdout, /--data FILE/);
  const version = await runTask("curbfit", ["--version"]);
  assert.match(version.stdout, /^curbfit \d+\.\d+\.\d+\n$/);
});

/** Hostile names: HTML, Markdown and script fragments in the header, levels and file name. */
const HOSTILE_TARGET = 'y<script>alert("t")</script>';
const HOSTILE_INPUT = "x*bold* [link](https://evil.example/a) `tick`";
const HOSTILE_GROUP = '<img src=x onerror="alert(2)">';
const HOSTILE_LEVELS = ["<b>drip</b>", "[rain](javascript:alert(3))", "| pipe | _u_"];
const HOSTILE_FILE = "<svg onload=alert(4)>_[f](javascript:alert(5))_*.csv";

function hostileCsv(): string {
  const quote = (s: string) => `"${s.replaceAll('"', '""')}"`;
  const lines = [[HOSTILE_INPUT, HOSTILE_GROUP, HOSTILE_TARGET].map(quote).join(",")];
  for (let i = 0; i < 24; i++) {
    const x = i / 23;
    const y = Math.sin(3 * x) + 0.3 * (i % 3) + 0.05 * Math.cos(11 * i);
    lines.push([String(x), quote(HOSTILE_LEVELS[i % 3]), y.toFixed(4)].join(","));
  }
  return lines.join("\n") + "\n";
}

Deno.test("cli: hostile header, levels and file name show as text in report, statement and chart", async () => {
  const dir = await Deno.makeTempDir();
  const file = join(dir, HOSTILE_FILE);
  await Deno.writeTextFile(file, hostileCsv());
  const out = join(dir, "out");
  const candidate = (name: string, terms: string) => `name=${quoteName(name)}; terms=${terms}`;
  const input = `column:${quoteName(HOSTILE_INPUT)}`;
  const groups = `indicators:${quoteName(HOSTILE_GROUP)}`;
  const ran = await runTask("curbfit", [
    "compare",
    "--data",
    file,
    "--target",
    HOSTILE_TARGET,
    "--folds",
    "4",
    "--seed",
    "2",
    "--candidate",
    candidate("<i>plain</i> *line*", `${input} + ${groups}`),
    "--candidate",
    candidate("[curve](javascript:alert(6))", `legendre:${quoteName(HOSTILE_INPUT)}:5 + ${groups}`),
    "--out",
    out,
  ]);
  assert.equal(ran.code, 0, ran.stderr);
  const html = await Deno.readTextFile(join(out, "report.html"));
  assertInertHtml(html);
  assert.equal(html.match(/<svg/g)?.length, 1, "one inline SVG: the chart");
  for (const text of [HOSTILE_TARGET, HOSTILE_GROUP, ...HOSTILE_LEVELS, "<i>plain</i> *line*"]) {
    assert.ok(html.includes(escapeHtml(text)), `HTML shows ${text} escaped`);
  }
  const svg = html.slice(html.indexOf("<svg"), html.indexOf("</svg>"));
  assert.ok(svg.includes("&lt;i&gt;plain&lt;/i&gt;"), "the chart legend escapes candidate names");

  const md = await Deno.readTextFile(join(out, "statement.md"));
  assert.deepEqual(rawMarkdownMarkup(md), [], "no unescaped markup outside code");
  assert.ok(md.includes("```\n"), "commands sit in fenced code blocks");
  await Deno.remove(dir, { recursive: true });
});

// ---- in-process: the syntax and the reproduce command ------------------------------------------

Deno.test("cli syntax: terms and penalties round-trip through their text form", () => {
  const terms: Term[] = [
    legendre("days", 12),
    legendre("rate: mm/h", 3, { domain: [0, 40] }),
    power('a "quoted" name', 2),
    column(" spaced "),
    indicators("site*zone+x;y=z"),
    product(legendre("x", 2), indicators("site")),
    product(product(column("a"), column("b")), column("c")),
  ];
  for (const t of terms) {
    const text = formatTerm(t.spec);
    assert.deepEqual(parseTerm(text, "--term").spec, t.spec, text);
  }
  assert.equal(formatTerm(legendre("days", 12).spec), "legendre:days:12");
  for (
    const p of [ridge(), ridge({ weights: "rising", exponent: 2 }), ridge({ weights: [1, 2.5, 4] })]
  ) {
    assert.deepEqual(parsePenalty(formatPenalty(p), "--penalty"), p);
  }
  // the sparse penalties take ridge's weights after their kind (and an elastic net's MIX)
  const sparse: [string, unknown][] = [
    ["lasso", lasso()],
    ["lasso:rising:2", lasso({ weights: "rising", exponent: 2 })],
    ["lasso:0,1,2.5", lasso({ weights: [0, 1, 2.5] })],
    ["elastic-net:0.3", elasticNet({ mix: 0.3 })],
    ["elastic-net:0.3:falling:1.5", elasticNet({ mix: 0.3, weights: "falling", exponent: 1.5 })],
    ["elastic-net:0.5:0,1,1", elasticNet({ mix: 0.5, weights: [0, 1, 1] })],
  ];
  for (const [text, p] of sparse) {
    assert.deepEqual(parsePenalty(text, "--penalty"), p, text);
    assert.equal(formatPenalty(p as ReturnType<typeof lasso>), text);
  }
  assert.deepEqual(parsePenalty("lasso:equal", "--penalty"), lasso());
  const refused: [string, RegExp][] = [
    ["lasso:0,0", /every weight of the lasso penalty is 0/],
    ["lasso:1,-1", /weight 2 is -1/],
    ["ridge:0,1", /weight 1 is 0/],
    ["lasso:rising:2:3", /not a penalty this version knows/],
    ["elastic-net:0.5:wavy", /after elastic-net:0\.5: comes equal, rising, falling or a list/],
    ["lasso:equal:2", /has an exponent, which only rising and falling weights take/],
  ];
  for (const [text, words] of refused) {
    assert.throws(() => parsePenalty(text, "--penalty"), (e: unknown) => {
      assert.ok(e instanceof CurbfitError, String(e));
      assert.equal(e.code, "BAD_OPTION");
      assert.match(e.message, words);
      assert.match(e.message, /--penalty/);
      return true;
    }, text);
  }
  const c = parseCandidate('name="a; ""b"""; terms=column:x; lambdas=0', "--candidate 1");
  assert.equal(c.get("name"), 'a; "b"');
});

/** An in-process CliIo collecting output. */
function memoryIo(): CliIo & { stdout: string[]; stderr: string[] } {
  const stdout: string[] = [];
  const stderr: string[] = [];
  return {
    stdout,
    stderr,
    out: (t) => void stdout.push(t),
    err: (t) => void stderr.push(t),
    errTerminal: false,
    now: () => 0,
  };
}

Deno.test("cli: the reproduce command a statement shows makes the identical record", async () => {
  const orchard = await readCsv(join(ROOT, ORCHARD), { source: ORCHARD });
  const shared = [column("shade_share"), indicators("watering")];
  const result = compare(orchard, [
    { name: "degree 9, weight decay", terms: [legendre("days_since_blossom", 9), ...shared] },
    {
      name: "degree 2; plain",
      terms: [legendre("days_since_blossom", 2), ...shared],
      lambdas: [0, 0.5],
    },
    {
      name: "degree 9, falling γ",
      terms: [legendre("days_since_blossom", 9), ...shared],
      penalty: ridge({ weights: "falling", exponent: 1 }),
      lambdas: { count: 25, min: 1e-3, max: 1e3 },
      rule: "one-se",
    },
  ], { target: "brix", folds: { k: 6, seed: 5, repeats: 2 } });
  const json = recordJson(result);
  const line = rerunCommand(parseRecord(json), ORCHARD);
  assert.ok(line !== null);
  const out = await Deno.makeTempDir();
  const io = memoryIo();
  const cwd = Deno.cwd();
  Deno.chdir(ROOT);
  try {
    assert.equal(
      await runCli([...argvOf(line), "--out", out, "--quiet"], io),
      0,
      io.stderr.join(""),
    );
  } finally {
    Deno.chdir(cwd);
  }
  assert.equal(await Deno.readTextFile(join(out, "record.json")), json);
  await Deno.remove(out, { recursive: true });
});

Deno.test("cli: progress goes to stderr only for long runs, and clears its terminal line", async () => {
  const { progressReporter } = await import("../lib/cli/progress.ts");
  let t = 0;
  const written: string[] = [];
  const log = progressReporter({ write: (s) => written.push(s), terminal: false, now: () => t }, [
    "a",
    "b",
  ]);
  log.listener({ stage: "folds", done: 1, total: 8, candidate: "b" });
  assert.deepEqual(written, [], "silent during the first second");
  t = 1500;
  log.listener({ stage: "folds", done: 2, total: 8, candidate: "b" });
  t = 2000;
  log.listener({ stage: "folds", done: 3, total: 8, candidate: "b" });
  assert.deepEqual(
    written,
    ["curbfit: candidate 2 of 2, folds 2 of 8 (1.5 s)\n"],
    "a log line at most every 5 s",
  );
  const tty: string[] = [];
  t = 0;
  const term = progressReporter({ write: (s) => tty.push(s), terminal: true, now: () => t }, []);
  t = 1200;
  term.listener({ stage: "refit", done: 0, total: 1 });
  term.done();
  assert.deepEqual(tty, ["\r\x1b[Kcurbfit: refit 0 of 1 (1.2 s)", "\r\x1b[K"]);
});

Deno.test("cli: README's Command line section documents every command, option and exit code", async () => {
  const readme = await Deno.readTextFile(join(ROOT, "README.md"));
  const start = readme.indexOf("## Command line");
  assert.ok(start >= 0, "README has a Command line section");
  const end = readme.indexOf("\n## ", start + 1);
  const section = readme.slice(start, end === -1 ? undefined : end);
  for (const c of COMMANDS) {
    assert.ok(section.includes(`curbfit ${c.name}`), `README shows curbfit ${c.name}`);
    for (const o of c.options) {
      assert.ok(section.includes(`--${o.name}`), `README documents --${o.name}`);
    }
  }
  for (const code of ["0", "1", "2"]) assert.match(section, new RegExp(`\\| \`?${code}\`? +\\|`));
});

Deno.test("cli: fit --penalty lasso / elastic-net --alpha: α on the report, the objective stated", async () => {
  const out = await Deno.makeTempDir();
  for (const penalty of ["lasso", "elastic-net:0.5"]) {
    const ran = await runTask("curbfit", [
      ...FIT_SHADE,
      "--penalty",
      penalty,
      "--alpha",
      "0.05",
      "--out",
      out,
    ]);
    assert.equal(ran.code, 0, ran.stderr);
    assert.match(ran.stdout, /α = 0\.05/);
    assert.doesNotMatch(ran.stdout, /λ/);
    const statement = await Deno.readTextFile(join(out, "statement.md"));
    assert.match(statement, /1\/\(2N\)/, "the objective, in the 1/(2N) convention");
    assert.match(statement, /α = 0\.05/);
  }
  await Deno.remove(out, { recursive: true });
});

Deno.test("cli: sweep --penalty lasso --alpha-count writes an α record that verify accepts (exit 0)", async () => {
  const out = await Deno.makeTempDir();
  const ran = await runTask("curbfit", [
    ...SWEEP,
    "--term",
    "column:shade_share",
    "--penalty",
    "lasso",
    "--alpha-count",
    "15",
    "--folds",
    "6",
    "--seed",
    "3",
    "--out",
    out,
    "--quiet",
  ]);
  assert.equal(ran.code, 0, ran.stderr);
  assert.match(ran.stdout, /Chosen: α = /);
  assert.match(ran.stdout, /chosen α/);
  const recordPath = join(out, "record.json");
  const record = parseRecord(await Deno.readTextFile(recordPath));
  const m = record.models[0];
  assert.ok(isSparseModel(m));
  assert.deepEqual(m.penalty, { kind: "lasso", mix: 1, tolerance: 1e-7 });
  assert.deepEqual(m.grid.request, { count: 15, ratio: null });
  const statementText = await Deno.readTextFile(join(out, "statement.md"));
  assert.match(statementText, /1\/\(2N\)/);
  assert.match(statementText, /coefficients nonzero/);
  assert.match(statementText, /--alpha-count 15/, "the reproduce command keeps the α request");
  const ok = await runTask("curbfit", ["verify", recordPath, "--data", ORCHARD]);
  assert.equal(ok.code, 0, ok.stdout + ok.stderr);
  await Deno.remove(out, { recursive: true });
});

Deno.test("cli: sweep --penalty lasso:rising:2 records the weights; verify accepts; the reproduce command remakes it", async () => {
  const out = await Deno.makeTempDir();
  const again = await Deno.makeTempDir();
  const ran = await runTask("curbfit", [
    ...SWEEP,
    "--term",
    "column:shade_share",
    "--penalty",
    "lasso:rising:2",
    "--alpha-count",
    "12",
    "--folds",
    "5",
    "--seed",
    "3",
    "--out",
    out,
    "--quiet",
  ]);
  assert.equal(ran.code, 0, ran.stderr);
  const json = await Deno.readTextFile(join(out, "record.json"));
  const record = parseRecord(json);
  const m = record.models[0];
  assert.ok(isSparseModel(m));
  // legendre P1…P4 have orders 1…4 and the plain column order 1: γ_q = order_q²
  assert.deepEqual(m.penalty, {
    kind: "lasso",
    mix: 1,
    weights: "rising",
    exponent: 2,
    gamma: [1, 4, 9, 16, 1],
    tolerance: 1e-7,
  });
  const statementText = await Deno.readTextFile(join(out, "statement.md"));
  assert.match(
    statementText,
    /--penalty lasso:rising:2/,
    "the reproduce command keeps the weights",
  );
  assert.match(statementText, /lasso, γ\\_q = order\^2/); // Markdown escapes the underscore
  const ok = await runTask("curbfit", ["verify", join(out, "record.json"), "--data", ORCHARD]);
  assert.equal(ok.code, 0, ok.stdout + ok.stderr);
  const line = rerunCommand(record, ORCHARD);
  assert.ok(line !== null);
  const remade = await runTask("curbfit", [...argvOf(line), "--out", again, "--quiet"]);
  assert.equal(remade.code, 0, remade.stderr);
  assert.equal(await Deno.readTextFile(join(again, "record.json")), json);
  // weights that do not fit the design: one line naming --penalty
  const bad = await runTask("curbfit", [
    ...FIT_SHADE,
    "--penalty",
    "elastic-net:0.5:0,1",
    "--alpha",
    "0.05",
  ]);
  assertOneLineError(bad, ["--penalty", "2 weights were given for 5 design columns"]);
  await Deno.remove(out, { recursive: true });
  await Deno.remove(again, { recursive: true });
});

Deno.test("cli: compare mixes ridge and elastic-net candidates; the reproduce command remakes the record", async () => {
  const out = await Deno.makeTempDir();
  const again = await Deno.makeTempDir();
  const candidates = [
    "--candidate",
    "name=ridge; terms=legendre:days_since_blossom:5 + column:shade_share; lambdas=0,0.1,1,10",
    "--candidate",
    "name=net; terms=legendre:days_since_blossom:9 + column:shade_share; " +
    "penalty=elastic-net:0.3; alphas=0.003,0.03,0.3; rule=one-se",
  ];
  const base = ["compare", "--data", ORCHARD, "--target", "brix", "--folds", "5", "--seed", "2"];
  const ran = await runTask("curbfit", [...base, ...candidates, "--out", out, "--quiet"]);
  assert.equal(ran.code, 0, ran.stderr);
  assert.match(ran.stdout, /chosen λ \/ α/);
  const json = await Deno.readTextFile(join(out, "record.json"));
  const record = parseRecord(json);
  assert.deepEqual(record.models.map((m) => modelStrengths(m).scale), ["lambda", "alpha"]);
  const ok = await runTask("curbfit", ["verify", join(out, "record.json"), "--data", ORCHARD]);
  assert.equal(ok.code, 0, ok.stdout + ok.stderr);
  const line = rerunCommand(record, ORCHARD);
  assert.ok(line !== null);
  const remade = await runTask("curbfit", [...argvOf(line), "--out", again, "--quiet"]);
  assert.equal(remade.code, 0, remade.stderr);
  assert.equal(await Deno.readTextFile(join(again, "record.json")), json);
  await Deno.remove(out, { recursive: true });
  await Deno.remove(again, { recursive: true });
});

Deno.test("cli: --field-separator reads a tab-separated file with bare CR line ends to the comma file's record", async () => {
  const dir = await Deno.makeTempDir();
  const orchard = await Deno.readTextFile(join(ROOT, ORCHARD));
  assert.ok(!orchard.includes('"') && !orchard.includes("\t"), "no quotes or tabs to convert");
  const converted = join(dir, "orchard.tsv");
  await Deno.writeTextFile(converted, orchard.replaceAll(",", "\t").replace(/\r?\n/g, "\r"));
  const flags = [
    "--target",
    "brix",
    "--term",
    "legendre:days_since_blossom:5",
    "--term",
    "column:shade_share",
    "--term",
    "indicators:watering",
    "--folds",
    "6",
    "--seed",
    "4",
    "--quiet",
  ];
  const records: Record<string, unknown>[] = [];
  for (const data of [[ORCHARD], [converted, "--field-separator", "tab"]]) {
    const out = join(dir, String(records.length));
    const ran = await runTask("curbfit", ["sweep", "--data", ...data, ...flags, "--out", out]);
    assert.equal(ran.code, 0, ran.stderr);
    const record = JSON.parse(await Deno.readTextFile(join(out, "record.json")));
    assert.equal(record.data.source, data[0]);
    delete record.data.source;
    assert.equal(record.data.fieldSeparator, data.length > 1 ? "\t" : undefined);
    delete record.data.fieldSeparator;
    records.push(record);
  }
  assert.deepEqual(
    records[1],
    records[0],
    "same rows, same record (apart from the file name and the separator)",
  );
  const help = await runTask("curbfit", ["help", "fit"]);
  assert.match(help.stdout, /--field-separator CHAR .*tab/);
  await Deno.remove(dir, { recursive: true });
});

Deno.test("cli: semicolon and tab files — sweep records the separator, verify reads it, the reproduce command gives it", async () => {
  const dir = await Deno.makeTempDir();
  const orchard = await Deno.readTextFile(join(ROOT, ORCHARD));
  assert.ok(!orchard.includes('"') && !orchard.includes(";") && !orchard.includes("\t"));
  const flags = [
    "--target",
    "brix",
    "--term",
    "legendre:days_since_blossom:4",
    "--term",
    "indicators:watering",
    "--folds",
    "5",
    "--seed",
    "3",
    "--quiet",
  ];
  const cases = [
    { name: "semicolon", char: ";", word: ";", plural: "semicolons", wrong: "tab", shown: "';'" },
    { name: "tab", char: "\t", word: "tab", plural: "tabs", wrong: "|", shown: "tab" },
  ];
  for (const c of cases) {
    const path = join(dir, `orchard_${c.name}.txt`);
    await Deno.writeTextFile(path, orchard.replaceAll(",", c.char));
    const out = join(dir, c.name);
    const sweep = ["sweep", "--data", path, "--field-separator", c.word, ...flags];
    const ran = await runTask("curbfit", [...sweep, "--out", out]);
    assert.equal(ran.code, 0, ran.stderr);
    const recordPath = join(out, "record.json");
    const json = await Deno.readTextFile(recordPath);
    const record = parseRecord(json);
    assert.equal(record.data.fieldSeparator, c.char, `${c.name}: the record keeps the separator`);

    // verify with the data file the record names, read with the recorded separator: a match.
    const ok = await runTask("curbfit", ["verify", recordPath]);
    assert.equal(ok.code, 0, ok.stdout + ok.stderr);
    assert.match(ok.stdout, /^Record check: MATCH/);
    assert.doesNotMatch(ok.stdout, /field separator/, "no note when nothing was overridden");
    const same = await runTask("curbfit", [
      "verify",
      recordPath,
      "--data",
      path,
      "--field-separator",
      c.word,
    ]);
    assert.equal(same.code, 0, same.stdout + same.stderr);

    // A wrong override is an input error, not a mismatch: the header line does not split with
    // it and holds the recorded separator, so reading stops there (exit 2, one line).
    const wrong = await runTask("curbfit", ["verify", recordPath, "--field-separator", c.wrong]);
    assertOneLineError(wrong, [
      path,
      "line 1: --field-separator: ",
      `probably separated by ${c.plural}`,
      `The record says its data was read with ${c.plural}; leave out --field-separator`,
    ]);
    assert.doesNotMatch(wrong.stderr, /option fieldSeparator/, "the flag, not the API option");

    // The reproduce command gives the separator and makes the identical record again.
    const statementText = await Deno.readTextFile(join(out, "statement.md"));
    assert.ok(
      statementText.includes(`--field-separator ${c.shown}`),
      `statement.md shows --field-separator ${c.shown}`,
    );
    const line = rerunCommand(record, path);
    assert.ok(line !== null);
    assert.ok(argvOf(line).join(" ").includes(`--data ${path} --field-separator ${c.word} `));
    const again = join(dir, `${c.name}_again`);
    const remade = await runTask("curbfit", [...argvOf(line), "--out", again, "--quiet"]);
    assert.equal(remade.code, 0, remade.stderr);
    assert.equal(await Deno.readTextFile(join(again, "record.json")), json);
  }

  // A comma record checked against the same rows in a semicolon file: --field-separator reads
  // them, the report matches and its notes say the separator differs from the record's.
  const commaOut = join(dir, "comma");
  const made = await runTask("curbfit", [
    "sweep",
    "--data",
    ORCHARD,
    ...flags,
    "--out",
    commaOut,
  ]);
  assert.equal(made.code, 0, made.stderr);
  const commaJson = await Deno.readTextFile(join(commaOut, "record.json"));
  assert.ok(!commaJson.includes("fieldSeparator"), "no key for a comma file");
  assert.ok(
    !(rerunCommand(parseRecord(commaJson), ORCHARD)!.options.some(([o]) =>
      o === "--field-separator"
    )),
  );
  const semicolonPath = join(dir, "orchard_semicolon.txt");
  const unflagged = await runTask("curbfit", [
    "verify",
    join(commaOut, "record.json"),
    "--data",
    semicolonPath,
  ]);
  assertOneLineError(unflagged, [
    "--field-separator ';'",
    "The record names no field separator (commas, or rows in memory)",
  ]);
  const overridden = await runTask("curbfit", [
    "verify",
    join(commaOut, "record.json"),
    "--data",
    semicolonPath,
    "--field-separator",
    ";",
  ]);
  assert.equal(overridden.code, 0, overridden.stdout + overridden.stderr);
  assert.match(
    overridden.stdout,
    /The record names no field separator .*; these rows were read with semicolons/,
  );
  const help = await runTask("curbfit", ["help", "verify"]);
  assert.match(help.stdout, /--field-separator CHAR .*instead of the record's/);
  await Deno.remove(dir, { recursive: true });
});
