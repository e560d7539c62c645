/**
 * The model-choice statement: every section in every format, rendered from the record alone and
 * deterministically; numbers as the record holds them; hostile names shown as text in HTML, SVG,
 * Markdown and plain text; the evidence chart is valid Vega-Lite v5.
 *
 * Data: seeded synthetic columns (test/helpers.ts) and the invented demo data — plumbing checks;
 * the numbers themselves are tested against outside references in the sweep and record tests.
 * Escaping rules: HTML 5 character references for & < > " ' (WHATWG HTML, "Escaping a string");
 * CommonMark 0.31 backslash escapes of ASCII punctuation (spec section 2.4).
 */
import assert from "node:assert/strict";
import {
  column,
  compare,
  type ComparisonResult,
  CurbfitError,
  elasticNet,
  indicators,
  lasso,
  legendre,
  parseCsv,
  ridge,
  sweep,
  type SweepResult,
  tableFromColumns,
} from "../mod.ts";
import { modelStrengths, recordJson, recordOf } from "../lib/record/mod.ts";
import { evidenceSpec, statement } from "../lib/statement/mod.ts";
import { renderMarkdown } from "../lib/statement/markdown.ts";
import { escapeHtml } from "../lib/views/escape.ts";
import { syntheticColumns } from "./helpers.ts";
import { assertValidVegaLite } from "./vl_assert.ts";
import { assertInertHtml, rawMarkdownMarkup } from "./fixtures/cli/helpers.ts";

const COLS = syntheticColumns(73, 48, 1);

function sweepResult(): SweepResult {
  return sweep(COLS, {
    target: "y",
    terms: [legendre("x", 9), column("z1")],
    lambdas: { count: 30 },
    folds: { k: 6, seed: 13 },
    rule: "one-se",
  });
}

function comparisonResult(): ComparisonResult {
  return compare(COLS, [
    { name: "line", terms: [column("x"), column("z1")], lambdas: [0] },
    { name: "degree 9", terms: [legendre("x", 9), column("z1")], lambdas: { count: 30 } },
    {
      name: "degree 9, rising γ",
      terms: [legendre("x", 9), column("z1")],
      penalty: ridge({ weights: "rising", exponent: 2 }),
      lambdas: { count: 30 },
      rule: "one-se",
    },
  ], { target: "y", folds: { k: 6, seed: 13 } });
}

const SECTIONS = [
  "Question",
  "Data",
  "Evidence",
  "Decision",
  "Cautions",
  "How to reproduce",
];

Deno.test("statement: every section, the cautions and the reproduce commands, in every format", async () => {
  for (const result of [sweepResult(), comparisonResult()]) {
    const st = statement(result, { recordPath: "out/x/record.json", dataPath: "data.csv" });
    const candidates = result === undefined || "candidates" in result ? "Candidates" : "Model";
    const md = st.markdown();
    const text = st.text();
    const html = await st.html();
    for (const title of [...SECTIONS, candidates]) {
      assert.match(md, new RegExp(`^## ${title.replaceAll(" ", " ")}$`, "m"), title);
      assert.match(text, new RegExp(`^${title}\\n-+$`, "m"), title);
      assert.ok(html.includes(`<h2>${title}</h2>`), title);
    }
    for (const out of [md, text, html]) {
      assert.ok(out.includes("not a guarantee"), "validation error is an estimate");
      assert.ok(out.includes("extrapolation"), "caution about the training domain");
      assert.ok(out.includes("deno task curbfit verify out/x/record.json"), "verify command");
      assert.ok(/deno task curbfit (sweep|compare)/.test(out), "rerun command");
    }
    assert.equal((html.match(/<svg/g) ?? []).length, 1, "the chart, inline");
    assert.ok(html.includes("<details>"), "the full CV table folds away");
  }
});

Deno.test("statement: rendered from the record alone, deterministically", async () => {
  const result = comparisonResult();
  const json = recordJson(result);
  const fromResult = statement(result);
  const fromJson = statement(json);
  const fromObject = statement(recordOf(result));
  assert.equal(fromJson.markdown(), fromResult.markdown());
  assert.equal(fromObject.text(), fromResult.text());
  const page = await fromJson.page();
  assert.equal(await fromResult.page(), page, "byte-identical HTML, chart ids included");
  assert.ok(page.startsWith("<!DOCTYPE html>"));
  assertInertHtml(page);
  assert.throws(
    () => statement(json.replace('"kind": "comparison"', '"kind": "survey"')),
    (e: unknown) => e instanceof CurbfitError && e.code === "BAD_RECORD",
  );
});

Deno.test("statement: a file read with another field separator says so; a comma file does not", () => {
  const lines = ["x;y", ...Array.from({ length: 24 }, (_, i) => `${i};${(i * i) % 7}`)];
  const semicolon = parseCsv(lines.join("\n"), { fieldSeparator: ";" });
  const spec = { target: "y", terms: [column("x")], folds: { k: 4, seed: 2 } };
  const withSemicolon = statement(recordOf(sweep(semicolon, spec))).markdown();
  assert.match(withSemicolon, /fields separated by `;`/);
  const comma = parseCsv(lines.join("\n").replaceAll(";", ","));
  assert.doesNotMatch(statement(recordOf(sweep(comma, spec))).markdown(), /fields separated/);
});

Deno.test("statement: numbers are the record's", () => {
  const result = comparisonResult();
  const record = recordOf(result);
  const st = statement(record);
  const table = st.blocks.find((b) => b.kind === "table" && b.table.header[1] === "chosen λ");
  assert.ok(table !== undefined && table.kind === "table");
  record.models.forEach((m, i) => {
    const row = table.table.rows[i];
    assert.equal(row[0], m.name);
    assert.equal(row[1], modelStrengths(m).chosen);
    assert.equal(row[2], m.cv.cvMean[m.choice.index]);
    assert.equal(row[3], m.cv.cvSe[m.choice.index]);
    const vs = record.comparison!.candidates[i].versusBest;
    assert.equal(row[5], vs === null ? "" : vs.mean);
  });
  const best = record.models.find((m) => m.name === record.comparison!.best)!;
  const coefficients = st.blocks.find((b) =>
    b.kind === "table" && b.table.header[0] === "design column"
  );
  assert.ok(coefficients !== undefined && coefficients.kind === "table");
  assert.deepEqual(coefficients.table.rows.slice(1).map((r) => r[1]), best.final.coefficients);
  assert.ok(st.text().includes(`Chosen: ${record.comparison!.best}`));
});

Deno.test("statement: the Jupyter display offers HTML, Markdown and text, each complete", async () => {
  const st = statement(sweepResult());
  const show = (st as unknown as Record<symbol, () => Promise<Record<string, string>>>)[
    Symbol.for("Jupyter.display")
  ];
  const bundle = await show.call(st);
  assert.deepEqual(Object.keys(bundle).sort(), ["text/html", "text/markdown", "text/plain"]);
  assert.ok(bundle["text/html"].includes("<svg"));
  assert.equal(bundle["text/markdown"], st.markdown());
  assert.equal(bundle["text/plain"], st.text());
});

Deno.test("statement: the evidence chart is valid Vega-Lite v5 for curves, λ = 0 and holdout", async () => {
  await assertValidVegaLite(evidenceSpec(recordOf(sweepResult())));
  await assertValidVegaLite(evidenceSpec(recordOf(comparisonResult())));
  const holdout = sweep(COLS, {
    target: "y",
    terms: [legendre("x", 5)],
    lambdas: [0, 0.1, 1, 10],
    folds: { holdout: 0.25, seed: 4 },
  });
  await assertValidVegaLite(evidenceSpec(recordOf(holdout)));
});

/** Hostile names: markup, links, script, a backtick run, a table pipe and an ANSI escape. */
const HOSTILE = {
  target: 'y</h2><script>alert("t")</script>',
  input: "x ``` [a](https://evil.example/) *b* _c_ | d",
  group: "<img src=x onerror=alert(1)>\u001b[31m",
  levels: ["<b>one</b>", "[two](javascript:alert(2))", "`three` & 'four'"],
  source: "<iframe src=https://evil.example>.csv",
};

function hostileResult(): ComparisonResult {
  const n = 30;
  const x = Array.from({ length: n }, (_, i) => i / (n - 1));
  const table = tableFromColumns({
    [HOSTILE.input]: x,
    [HOSTILE.group]: x.map((_, i) => HOSTILE.levels[i % 3]),
    [HOSTILE.target]: x.map((v, i) => Math.cos(3 * v) + 0.2 * (i % 3) + 0.05 * Math.sin(7 * i)),
  }, { source: HOSTILE.source });
  return compare(table, [
    {
      name: "<i>plain</i> | *one*",
      terms: [column(HOSTILE.input), indicators(HOSTILE.group)],
      lambdas: [0],
    },
    {
      name: "[curve](javascript:alert(3))",
      terms: [legendre(HOSTILE.input, 5), indicators(HOSTILE.group)],
    },
  ], { target: HOSTILE.target, folds: { k: 5, seed: 9 } });
}

Deno.test("statement: hostile names show as plain text in HTML, SVG, Markdown and text", async () => {
  const st = statement(hostileResult());
  const html = await st.page();
  assertInertHtml(html);
  assert.equal((html.match(/<svg/g) ?? []).length, 1);
  assert.ok(!html.includes("</h2><script"));
  for (const text of [HOSTILE.target, HOSTILE.source, ...HOSTILE.levels, "<i>plain</i> | *one*"]) {
    assert.ok(html.includes(escapeHtml(text)), `HTML shows ${text} as text`);
  }
  assert.ok(
    html.includes(escapeHtml("<img src=x onerror=alert(1)>\\u001b[31m")),
    "control escaped",
  );
  const svg = html.slice(html.indexOf("<svg"), html.indexOf("</svg>"));
  assert.ok(svg.includes("&lt;i&gt;plain&lt;/i&gt;"), "SVG legend text escaped");
  assert.ok(!svg.includes("<i>"));

  const md = st.markdown();
  assert.deepEqual(rawMarkdownMarkup(md), [], "no character outside code acts as Markdown markup");
  assert.ok(!md.includes("\u001b"), "no raw control character");
  assert.ok(/````\n/.test(md) || md.includes("```\n"), "code fences");

  const text = st.text();
  assert.ok(!text.includes("\u001b"), "plain text shows the escape, never sends it");
  assert.ok(text.includes("\\u001b[31m"));
});

Deno.test("statement markdown: code spans and fences outlast backtick runs in names", () => {
  const md = renderMarkdown([
    { kind: "paragraph", parts: [{ code: "a ``` b" }] },
    { kind: "code", lines: ["name with ```` four"] },
  ]);
  assert.equal(md, "````a ``` b````\n\n`````\nname with ```` four\n`````\n");
});

Deno.test("statement tests' own checks catch active HTML and raw Markdown", () => {
  for (
    const bad of [
      "<p>a</p><script>x()</script>",
      '<img src="x.png">',
      '<a href="https://example.org/">x</a>',
      '<p onclick="x()">a</p>',
      '<div style="background: url(x.png)">a</div>',
      "<style>@import 'x.css';</style>",
      '<svg><use xlink:href="other.svg#a"/></svg>',
    ]
  ) {
    assert.throws(() => assertInertHtml(bad), bad);
  }
  assertInertHtml(
    '<p title="&lt;img src=x onerror=y&gt;">&lt;script&gt;</p><g clip-path="url(#c1)"/>',
  );
  assert.deepEqual(rawMarkdownMarkup("a \\<b\\> `<c>` **d**\n\n```\n<e>\n```\n| f | g |\n"), []);
  assert.deepEqual(rawMarkdownMarkup("a <b> [c](d) *e*"), ["<", ">", "[", "]", "*", "*"]);
});

Deno.test("statement of lasso / elastic-net records: α labels, the 1/(2N) objective, nonzero counts, KKT report", async () => {
  const x = Array.from({ length: 50 }, (_, i) => i / 49);
  const data = { x, y: x.map((v, i) => Math.sin(3 * v) + 0.05 * Math.cos(7 * i)) };
  const s = sweep(data, {
    target: "y",
    terms: [legendre("x", 8)],
    penalty: lasso(),
    alphas: { count: 20 },
    folds: { k: 5, seed: 4 },
  });
  const st = statement(recordJson(s));
  const md = st.markdown();
  const text = st.text();
  for (const shown of [md, text]) {
    assert.match(shown, /α tried/);
    assert.match(shown, /chosen α/);
    assert.match(shown, /nonzero/);
    assert.match(shown, /minimize \(1\/\(2N\)\)/);
    assert.match(shown, /scaled KKT violation/);
    assert.match(shown, /duality gap/);
    assert.match(shown, /--penalty lasso/);
    assert.doesNotMatch(shown, /λ = \d|chosen λ|λ tried|budget C/);
  }
  const nonzero = s.fit.summary.nonzero;
  assert.match(md, new RegExp(`${nonzero} of 8 coefficients nonzero`));
  const html = await st.html();
  assert.match(html, /<svg/);
  await assertValidVegaLite(st.chart());
  const c = compare(data, [
    { name: "ridge", terms: [legendre("x", 6)], lambdas: [0.01, 0.1, 1] },
    {
      name: "net",
      terms: [legendre("x", 8)],
      penalty: elasticNet({ mix: 0.3 }),
      alphas: [0.001, 0.01],
    },
  ], { target: "y", folds: { k: 5, seed: 4 } });
  const mixed = statement(recordJson(c)).markdown();
  assert.match(mixed, /λ or α tried/);
  assert.match(mixed, /chosen λ \/ α/);
  assert.match(mixed, /elastic net, L1 share ρ = 0\.3/);
  await assertValidVegaLite(statement(c).chart());
});
