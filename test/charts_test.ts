/**
 * Charts and the display protocol (lib/views/charts, lib/views/display.ts):
 *
 * - every chart spec validates against the Vega-Lite v5 JSON schema shipped in the pinned
 *   vega-lite package and compiles and renders without a warning (test/vl_assert.ts);
 * - the SVG is well-formed XML (strict parse with @xmldom/xmldom; any warning fails) and holds
 *   the marks the chart promises (band, chosen-λ rule, one line per coefficient, …);
 * - the numbers drawn are the numbers computed (curves against `fit(...).predict`, residuals
 *   against y − prediction, normal quantiles against Python's statistics.NormalDist);
 * - every result returns one MIME bundle, and its text/plain matches the committed snapshot in
 *   test/snapshots/ (regenerate with UPDATE_SNAPSHOTS=1 after checking the differences);
 * - hostile column names, levels, candidate names and source labels show as text in every
 *   MIME type and load nothing.
 *
 * Data: seeded synthetic columns from test/helpers.ts (invented, for display tests only).
 */
import assert from "node:assert/strict";
import { type Document, DOMParser, type Element } from "@xmldom/xmldom";
import {
  coefficientChart,
  compare,
  comparisonChart,
  fit,
  fittedCurveChart,
  legendre,
  parseCsv,
  parseRecord,
  recordJson,
  recordOf,
  residualChart,
  ridge,
  showChart,
  shrinkagePathChart,
  sweep,
  tableFromColumns,
  validationCurveChart,
  verify,
} from "../mod.ts";
import { CurbfitError, indicators } from "../mod.ts";
import { renderSvg, type VegaLiteSpec } from "../lib/views/render.ts";
import { COLORS, num } from "../lib/views/charts/theme.ts";
import { normalQuantile, normalScores } from "../lib/views/charts/normal.ts";
import { POINT_LIMIT } from "../lib/views/charts/sample.ts";
import { visibleControls } from "../lib/views/charts/show.ts";
import { markdownTable } from "../lib/views/display.ts";
import { assertValidVegaLite } from "./vl_assert.ts";
import { syntheticColumns } from "./helpers.ts";

const DISPLAY = Symbol.for("Jupyter.display");
const VEGA_LITE = "application/vnd.vegalite.v5+json";
const CHART_TYPES = [VEGA_LITE, "image/svg+xml", "text/html", "text/markdown", "text/plain"];

const COLS = syntheticColumns(21, 40, 0);
const SWEEP = sweep(COLS, {
  target: "y",
  terms: [legendre("x", 8)],
  folds: { k: 5, seed: 3 },
  rule: "one-se",
});
const CANDIDATES = [
  { name: "Legendre 8, weight decay", terms: [legendre("x", 8)], rule: "one-se" as const },
  {
    name: "Legendre 8, rising order weights",
    terms: [legendre("x", 8)],
    penalty: ridge({ weights: "rising", exponent: 2 }),
  },
  { name: "Legendre 2, no penalty", terms: [legendre("x", 2)], lambdas: [0] },
];
const COMPARISON = compare(COLS, CANDIDATES, { target: "y", folds: { k: 5, seed: 3 } });

type Bundle = Record<string, unknown>;

async function displayOf(value: unknown): Promise<Bundle> {
  const show = (value as Record<symbol, unknown>)[DISPLAY];
  assert.equal(typeof show, "function", "the value has no Jupyter display method");
  return await (show as () => Bundle | Promise<Bundle>).call(value);
}

/** Parses SVG strictly: a warning or an error fails. */
function parseSvg(svg: string): Document {
  const parser = new DOMParser({
    onError: (level: string, message: string) => {
      throw new Error(`SVG is not well-formed (${level}): ${message}`);
    },
  });
  return parser.parseFromString(svg, "image/svg+xml");
}

function elements(doc: Document, tag: string): Element[] {
  return Array.from(doc.getElementsByTagName(tag));
}

/** The `g` elements of one Vega mark type in the plots (class "mark-<type> role-mark"). */
function markGroups(doc: Document, type: string): Element[] {
  return elements(doc, "g").filter((g) => {
    const classes = (g.getAttribute("class") ?? "").split(" ");
    return classes.includes(`mark-${type}`) && classes.includes("role-mark");
  });
}

function descendants(group: Element, tag: string): Element[] {
  return Array.from(group.getElementsByTagName(tag));
}

/** Every text the SVG shows. */
function svgTexts(doc: Document): string[] {
  return elements(doc, "text").map((t) => t.textContent ?? "");
}

async function drawn(spec: VegaLiteSpec): Promise<Document> {
  await assertValidVegaLite(spec);
  return parseSvg(await renderSvg(spec));
}

/** Data rows of the layers (at any depth) whose mark is `mark` and whose encoding has `field`. */
function layerRows(spec: unknown, field: string): Record<string, number | string>[][] {
  const found: Record<string, number | string>[][] = [];
  const visit = (node: unknown) => {
    if (Array.isArray(node)) return node.forEach(visit);
    if (node === null || typeof node !== "object") return;
    const n = node as Record<string, unknown>;
    const values = (n.data as { values?: unknown } | undefined)?.values;
    if (Array.isArray(values) && values.some((v) => field in (v as object))) {
      found.push(values as Record<string, number | string>[]);
    }
    Object.values(n).forEach(visit);
  };
  visit(spec);
  return found;
}

function titleText(spec: VegaLiteSpec): string {
  const t = (spec as { title: { text: string | string[] } }).title.text;
  return Array.isArray(t) ? t.join(" ") : t;
}

// ---- charts ---------------------------------------------------------------------------------

Deno.test("validation curve: band, chosen and minimum rules, fold curves, df axis, named sides", async () => {
  const spec = validationCurveChart(SWEEP);
  const doc = await drawn(spec);
  assert.match(titleText(spec), /^Chosen λ = \S+ by the one-SE rule \(5-fold CV, seed 3\)$/);
  const fills = markGroups(doc, "area").flatMap((g) => descendants(g, "path"))
    .map((p) => p.getAttribute("fill"));
  assert.deepEqual(fills, [COLORS.band], "one ±1 SE band");
  const ruleStrokes = markGroups(doc, "rule").flatMap((g) => descendants(g, "line"))
    .map((l) => l.getAttribute("stroke"));
  assert.ok(ruleStrokes.includes(COLORS.chosen), "a rule at the chosen λ");
  assert.notEqual(SWEEP.chosen.index, SWEEP.minimum.index, "the data should move one-SE off");
  assert.ok(ruleStrokes.includes(COLORS.minimum), "a rule at the minimum");
  const lines = markGroups(doc, "line").flatMap((g) => descendants(g, "path"));
  assert.equal(lines.length, 5 + 2, "five fold curves, the training and the CV error");
  const texts = svgTexts(doc);
  for (
    const wanted of [
      "effective degrees of freedom (8 penalized columns)",
      "← less penalty: overfitting side",
      "more penalty: underfitting side →",
      "min + 1 SE",
      "λ, penalty strength (log scale)",
    ]
  ) assert.ok(texts.includes(wanted), `the chart shows "${wanted}"`);
  assert.ok(texts.some((t) => t.startsWith("chosen, λ = ")));
  assert.ok(texts.some((t) => t.startsWith("minimum, λ = ")));
  // The CV curve drawn is the sweep's curve.
  const cv = layerRows(spec, "series").flat().filter((r) => r.series === "CV error ± 1 SE");
  assert.deepEqual(cv.map((r) => r.mse), SWEEP.curve.map((p) => p.cvMean));
});

Deno.test("validation curve: λ = 0 on the grid is a dashed level line; one λ shows its folds", async () => {
  const withZero = sweep(COLS, {
    target: "y",
    terms: [legendre("x", 8)],
    folds: { k: 5, seed: 3 },
    lambdas: [0, 0.1, 1, 10, 100],
  });
  const spec = validationCurveChart(withZero);
  const doc = await drawn(spec);
  const subtitle = JSON.stringify((spec as { title: { subtitle: string[] } }).title.subtitle);
  assert.match(subtitle, /λ = 0 \(no penalty\) cannot sit on a log axis/);
  const dashed = markGroups(doc, "rule").flatMap((g) => descendants(g, "line"))
    .filter((l) => l.getAttribute("stroke-dasharray") === "4,4");
  assert.equal(dashed.length, 1, "one dashed level line for λ = 0");
  assert.ok(svgTexts(doc).some((t) => t.startsWith("λ = 0: ")));

  const single = sweep(COLS, {
    target: "y",
    terms: [legendre("x", 2)],
    folds: { k: 5, seed: 3 },
    lambdas: [0],
  });
  const one = validationCurveChart(single);
  const oneDoc = await drawn(one);
  assert.match(titleText(one), /^No penalty \(λ = 0\): CV error /);
  const dots = markGroups(oneDoc, "symbol").flatMap((g) => descendants(g, "path"));
  assert.equal(dots.length, 5, "one dot per fold");
});

Deno.test("shrinkage path: one line per coefficient, chosen λ on both panels, budget C(λ)", async () => {
  const spec = shrinkagePathChart(SWEEP);
  const doc = await drawn(spec);
  const lines = markGroups(doc, "line").flatMap((g) => descendants(g, "path"));
  assert.equal(lines.length, 8 + 1, "P1…P8 and the budget curve");
  const chosenRules = markGroups(doc, "rule").flatMap((g) => descendants(g, "line"))
    .filter((l) => l.getAttribute("stroke") === COLORS.chosen);
  assert.equal(chosenRules.length, 2, "the chosen λ on the path and on the budget panel");
  const texts = svgTexts(doc);
  for (let q = 1; q <= 8; q++) assert.ok(texts.includes(`P${q}`), `legend names P${q}`);
  assert.ok(texts.some((t) => t.endsWith("of x")), "the legend title names the input");
  assert.ok(texts.includes("budget C(λ)"));
  const path = layerRows(spec, "term").flat();
  const chosen = SWEEP.curve[SWEEP.chosen.index];
  const atChosen = path.filter((r) => r.strength === chosen.strength).map((r) => r.w);
  assert.deepEqual(atChosen, [...chosen.path]);
});

Deno.test("fitted curve: points, three exact curves, shaded outside; several inputs refused", async () => {
  const spec = fittedCurveChart(SWEEP, COLS);
  const doc = await drawn(spec);
  const points = markGroups(doc, "symbol").flatMap((g) => descendants(g, "path"));
  assert.equal(points.length, 40);
  const shades = markGroups(doc, "rect").flatMap((g) => descendants(g, "path"))
    .filter((p) => p.getAttribute("fill") === COLORS.outside);
  assert.equal(shades.length, 2, "both margins outside the data are shaded");
  const rows = layerRows(spec, "curve").flat();
  const curves = [...new Set(rows.map((r) => r.curve))] as string[];
  assert.equal(curves.length, 3);
  const lambdas = [SWEEP.chosen.strength, SWEEP.minimum.strength, SWEEP.curve[0].strength];
  curves.forEach((name, k) => {
    const mine = rows.filter((r) => r.curve === name);
    const model = fit(COLS, { target: "y", terms: [legendre("x", 8)], lambda: lambdas[k] });
    const expected = model.predict({ x: mine.map((r) => r.x as number) }).values;
    mine.forEach((r, i) =>
      assert.ok(Math.abs((r.y as number) - expected[i]) <= 1e-12 * (1 + Math.abs(expected[i])))
    );
  });
  const two = sweep({ ...COLS, g: COLS.x.map((v) => (v > 0 ? "a" : "b")) }, {
    target: "y",
    terms: [legendre("x", 3), indicators("g")],
    folds: { k: 5, seed: 3 },
  });
  assert.throws(
    () => fittedCurveChart(two, { ...COLS, g: COLS.x.map((v) => (v > 0 ? "a" : "b")) }),
    (e) =>
      e instanceof CurbfitError && e.code === "BAD_OPTION" && /reads 2: "x", "g"/.test(e.message),
  );
});

Deno.test("comparison: intervals, paired differences, curves; a λ = 0 candidate is a level line", async () => {
  const spec = comparisonChart(COMPARISON);
  const doc = await drawn(spec);
  assert.match(titleText(spec), new RegExp(`^Best: ${COMPARISON.best}, CV error `));
  const texts = svgTexts(doc);
  for (const c of COMPARISON.candidates) {
    assert.ok(texts.some((t) => t.startsWith(`${c.name}: `)), `row for ${c.name}`);
  }
  assert.ok(texts.includes("Legendre 2, no penalty (λ = 0)"), "the λ = 0 candidate is labelled");
  const dashed = markGroups(doc, "rule").flatMap((g) => descendants(g, "line"))
    .filter((l) => l.getAttribute("stroke-dasharray") === "5,4");
  assert.equal(dashed.length, 1);
  const curves = markGroups(doc, "line").flatMap((g) => descendants(g, "path"));
  assert.equal(curves.length, 2, "the two penalized candidates have curves");
  const diffs = layerRows(spec, "lo2").flat().filter((r) => String(r.label).includes(": "));
  for (const c of COMPARISON.candidates) {
    const mid = c.versusBest === null ? 0 : c.versusBest.mean;
    assert.ok(diffs.some((r) => r.name === c.name && r.mid === mid), `difference of ${c.name}`);
  }
});

Deno.test("residuals: y − prediction; normal quantiles match Python's statistics.NormalDist", async () => {
  const model = SWEEP.fit;
  const spec = residualChart(model, COLS);
  const doc = await drawn(spec);
  const dots = markGroups(doc, "symbol").flatMap((g) => descendants(g, "path"));
  assert.equal(dots.length, 80, "40 residuals in each panel");
  const rows = layerRows(spec, "residual").flat();
  const predicted = model.predict(COLS).values;
  rows.forEach((r, i) => assert.equal(r.residual, COLS.y[i] - predicted[i]));
  assert.match(titleText(spec), new RegExp(`SD ${num(model.summary.residualSd)},`), "the fit's SD");
  // Reference values: Python 3.11 statistics.NormalDist().inv_cdf(p) (CPython implements the
  // same AS 241 algorithm), printed with repr().
  const reference: [number, number][] = [
    [1e-300, -37.0470962993612],
    [1e-20, -9.262340089798405],
    [0.001, -3.090232306167813],
    [0.02425, -1.9729610513118845],
    [0.025, -1.9599639845400538],
    [0.3, -0.5244005127080407],
    [0.5, 0],
    [0.975, 1.9599639845400536],
    [1 - 1e-10, 6.361340889697421],
  ];
  for (const [p, z] of reference) assert.equal(normalQuantile(p), z, `Φ⁻¹(${p})`);
  assert.ok(Number.isNaN(normalQuantile(0)) && Number.isNaN(normalQuantile(1)));
  const scores = normalScores(40);
  assert.ok(Math.abs(scores[0] + scores[39]) < 1e-15, "Blom positions are symmetric");
});

Deno.test("coefficient chart: one bar per column, on the standardized scale", async () => {
  const spec = coefficientChart(SWEEP.fit);
  const doc = await drawn(spec);
  const bars = markGroups(doc, "rect").flatMap((g) => descendants(g, "path"));
  assert.equal(bars.length, 8);
  const rows = layerRows(spec, "column").flat();
  assert.deepEqual(rows.map((r) => r.w), [...SWEEP.fit.summary.standardized.coefficients]);
});

Deno.test("embedded data is bounded: 5000 rows draw at most 2000 points and the chart says so", async () => {
  const big = syntheticColumns(5, 5000, 0);
  const s = sweep(big, { target: "y", terms: [legendre("x", 4)], folds: { k: 5, seed: 1 } });
  for (const spec of [fittedCurveChart(s, big), residualChart(s.fit, big)]) {
    await assertValidVegaLite(spec);
    for (const rows of layerRows(spec, "y").concat(layerRows(spec, "residual"))) {
      if (!("curve" in rows[0])) assert.ok(rows.length <= POINT_LIMIT, `${rows.length} points`);
    }
    const subtitle = JSON.stringify((spec as { title: { subtitle: string[] } }).title.subtitle);
    assert.match(subtitle, /Showing 2000 of 5000/);
  }
});

// ---- display protocol -------------------------------------------------------------------------

Deno.test("display: every result shows one bundle; the method is invisible to keys and JSON", async () => {
  const table = tableFromColumns(COLS);
  const record = recordOf(SWEEP);
  const cases: [string, unknown, string[]][] = [
    ["sweep", SWEEP, CHART_TYPES],
    ["comparison", COMPARISON, CHART_TYPES],
    ["fit", SWEEP.fit, CHART_TYPES],
    ["record", record, CHART_TYPES],
    ["parsed record", parseRecord(recordJson(COMPARISON)), CHART_TYPES],
    ["table", table, ["text/html", "text/markdown", "text/plain"]],
    ["verify report", verify(recordJson(SWEEP), COLS), [
      "text/html",
      "text/markdown",
      "text/plain",
    ]],
  ];
  for (const [name, value, types] of cases) {
    const bundle = await displayOf(value);
    for (const type of types) assert.ok(type in bundle, `${name} bundle has ${type}`);
    const plain = String(bundle["text/plain"]);
    assert.ok(!plain.includes("\u001b"), `${name}: no ANSI codes`);
    assert.ok(!/<script/i.test(String(bundle["text/html"])), `${name}: no script`);
    if (types.includes("image/svg+xml")) {
      parseSvg(String(bundle["image/svg+xml"]));
      assert.ok(String(bundle["text/html"]).includes("<svg"), `${name}: chart inline in HTML`);
      if ("image/png" in bundle) {
        const png = atob(String(bundle["image/png"]));
        assert.equal(png.slice(1, 4), "PNG", `${name}: a PNG`);
      }
    }
    assert.ok(!Object.keys(value as object).some((k) => k.includes("Jupyter")));
  }
  assert.equal(
    Object.getOwnPropertyDescriptor(SWEEP, DISPLAY)?.enumerable,
    false,
    "the display method is not enumerable",
  );
  assert.ok(Object.isFrozen(SWEEP) && Object.isFrozen(COMPARISON));
  assert.equal(recordJson(parseRecord(recordJson(SWEEP))), recordJson(SWEEP));
  assert.deepEqual(JSON.parse(JSON.stringify(record)), JSON.parse(recordJson(SWEEP)));
});

Deno.test("display: a chart spec shows itself; showChart copies and cleans an edited spec", async () => {
  const spec = validationCurveChart(SWEEP);
  const bundle = await displayOf(spec);
  assert.deepEqual(bundle[VEGA_LITE], spec);
  const edited = showChart({ ...spec, title: "edited\u001b[31m" } as VegaLiteSpec);
  assert.equal((edited as { title: string }).title, "edited\\u001b[31m");
  const shown = await displayOf(edited);
  assert.ok(String(shown["text/plain"]).includes("edited\\u001b[31m"));
  assert.deepEqual(visibleControls({ a: ["x\u0007"] }), { a: ["x\\u0007"] });
});

// ---- text/plain snapshots ---------------------------------------------------------------------

const SNAPSHOTS = new URL("./snapshots/", import.meta.url);

async function matchesSnapshot(name: string, text: string): Promise<void> {
  const file = new URL(`${name}.txt`, SNAPSHOTS);
  if (Deno.env.get("UPDATE_SNAPSHOTS") === "1") {
    await Deno.mkdir(SNAPSHOTS, { recursive: true });
    await Deno.writeTextFile(file, text + "\n");
    return;
  }
  const saved = await Deno.readTextFile(file);
  assert.equal(text + "\n", saved, `text/plain of ${name} differs from test/snapshots/${name}.txt`);
}

Deno.test("text/plain snapshots of every result", async () => {
  // The runtime's version is in a record's text; it is masked so a Deno upgrade does not fail it.
  const mask = (text: string) => text.replaceAll(Deno.version.deno, "<deno version>");
  const cases: [string, unknown][] = [
    ["sweep", SWEEP],
    ["comparison", COMPARISON],
    ["fit", SWEEP.fit],
    ["table", tableFromColumns(COLS)],
    ["record_sweep", recordOf(SWEEP)],
    ["record_comparison", recordOf(COMPARISON)],
    ["verify", verify(recordJson(COMPARISON), COLS)],
  ];
  for (const [name, value] of cases) {
    const plain = String((await displayOf(value))["text/plain"]);
    await matchesSnapshot(name, mask(plain));
  }
});

// ---- hostile content --------------------------------------------------------------------------

const XSS = "<script>alert(1)</script>";
const HOSTILE_X = `${XSS} days`;
const HOSTILE_GROUP = "**bold** | `tick` & co";
const HOSTILE_LEVELS = [
  '<img src="http://example.com/x.png">',
  "[link](http://example.com) |",
  "red\u001b[31m",
];
const HOSTILE_TARGET = "y & <b>sugar</b> \u001b[31mred";
const HOSTILE_SOURCE = '<a href="http://example.com">orchard</a> **file**';

function hostileCsv(): string {
  const quote = (s: string) => `"${s.replaceAll('"', '""')}"`;
  const lines = [[HOSTILE_X, HOSTILE_GROUP, HOSTILE_TARGET].map(quote).join(",")];
  COLS.x.forEach((x, i) => {
    lines.push(
      [String(x), quote(HOSTILE_LEVELS[i % 3]), String(COLS.y[i] + (i % 3) * 0.2)].join(","),
    );
  });
  return lines.join("\n") + "\n";
}

/** Hostile fragments as they would look unescaped in Markdown (escaped ones have a backslash). */
const MARKDOWN_RAW = [
  /(^|[^\\])<(script|img|a |b>)/,
  /\*\*bold\*\*/,
  /\*\*x\*\*/,
  /`tick`/,
  /`y`/,
  /(^|[^\\])\]\(http/,
];

const ACTIVE_ELEMENTS = new Set([
  "script",
  "img",
  "image",
  "a",
  "iframe",
  "object",
  "embed",
  "foreignobject",
  "link",
  "style",
  "use",
]);

/**
 * No element or attribute that could run code or fetch anything: the markup is parsed (xmldom;
 * HTML leniently, SVG strictly) and every element and attribute is looked at, so escaped text
 * such as `&lt;a href="…"&gt;` inside a label counts as the text it is.
 */
function assertInert(where: string, markup: string, type: "text/html" | "image/svg+xml"): void {
  assert.ok(!/<script/i.test(markup), `${where}: a script tag`);
  const doc = type === "image/svg+xml"
    ? parseSvg(markup)
    : new DOMParser({ onError: () => {} }).parseFromString(markup, "text/html");
  for (const element of elements(doc, "*")) {
    const tag = (element.localName ?? element.nodeName).toLowerCase();
    assert.ok(!ACTIVE_ELEMENTS.has(tag), `${where}: a <${tag}> element`);
    for (const attribute of Array.from(element.attributes)) {
      const name = attribute.name.toLowerCase();
      assert.ok(!name.startsWith("on"), `${where}: an event handler ${name}`);
      if (["href", "src", "xlink:href"].includes(name)) {
        assert.ok(attribute.value.startsWith("#"), `${where}: ${name}="${attribute.value}"`);
      }
    }
  }
}

Deno.test("hostile names, levels and sources show as text in every MIME type", async () => {
  // The checker itself catches live markup.
  for (const live of ['<p><img src="http://example.com/x.png"></p>', '<p onclick="x()">x</p>']) {
    assert.throws(() => assertInert("probe", live, "text/html"));
  }
  assert.throws(() =>
    assertInert("probe", '<svg><a href="http://example.com"/></svg>', "image/svg+xml")
  );
  const table = parseCsv(hostileCsv(), { source: HOSTILE_SOURCE });
  const terms = [legendre(HOSTILE_X, 3), indicators(HOSTILE_GROUP)];
  const s = sweep(table, { target: HOSTILE_TARGET, terms, folds: { k: 4, seed: 2 } });
  const single = sweep(table, {
    target: HOSTILE_TARGET,
    terms: [legendre(HOSTILE_X, 3)],
    folds: { k: 4, seed: 2 },
  });
  const c = compare(table, [
    { name: XSS, terms },
    {
      name: "**x** | `y` & [z](http://example.com)",
      terms: [legendre(HOSTILE_X, 1)],
      lambdas: [0],
    },
  ], { target: HOSTILE_TARGET, folds: { k: 4, seed: 2 } });
  const values: [string, unknown][] = [
    ["table", table],
    ["sweep", s],
    ["fit", s.fit],
    ["comparison", c],
    ["record", recordOf(c)],
    ["verify", verify(recordJson(s), table)],
    ["path chart", shrinkagePathChart(s)],
    ["fitted chart", fittedCurveChart(single, table)],
    ["residual chart", residualChart(s.fit, table)],
  ];
  for (const [name, value] of values) {
    if (name.endsWith("chart")) await assertValidVegaLite(value);
    const bundle = await displayOf(value);
    const html = String(bundle["text/html"]);
    assertInert(`${name} text/html`, html, "text/html");
    assert.ok(html.includes("&lt;") || name === "verify", `${name}: HTML shows < as an entity`);
    const plain = String(bundle["text/plain"]);
    assert.ok(!plain.includes("\u001b"), `${name}: no raw ESC in text/plain`);
    const md = String(bundle["text/markdown"] ?? "");
    for (const raw of MARKDOWN_RAW) {
      assert.ok(!raw.test(md), `${name}: Markdown holds unescaped ${raw.source}`);
    }
    if ("image/svg+xml" in bundle) {
      const svg = String(bundle["image/svg+xml"]);
      assertInert(`${name} SVG`, svg, "image/svg+xml");
      const texts = svgTexts(parseSvg(svg)).join("\n");
      assert.ok(!texts.includes("\u001b"), `${name}: no raw ESC in SVG text`);
    }
    const spec = JSON.stringify(bundle[VEGA_LITE] ?? {});
    assert.ok(
      !/"(url|href)"\s*:/.test(spec) && !/"image"/.test(spec),
      `${name}: spec loads nothing`,
    );
  }
  // The hostile text itself is shown, as text.
  const sweepSvg = String((await displayOf(s))["image/svg+xml"]);
  assert.ok(svgTexts(parseSvg(sweepSvg)).some((t) => t.includes("y & <b>sugar</b>")));
  const pathSvg = String((await displayOf(shrinkagePathChart(s)))["image/svg+xml"]);
  const labels = svgTexts(parseSvg(pathSvg));
  assert.ok(labels.some((t) => t.startsWith(`${HOSTILE_GROUP}=`)), "legend shows the column");
  const shownTarget = HOSTILE_TARGET.replace("\u001b", "\\u001b");
  assert.ok(svgTexts(parseSvg(sweepSvg)).some((t) => t.includes(shownTarget)), "ESC as \\u001b");
  const fitPlain = String((await displayOf(s.fit))["text/plain"]);
  assert.ok(fitPlain.includes(`${HOSTILE_GROUP}=red\\u001b[31m`), "a level with ESC, made visible");
  const tablePlain = String((await displayOf(table))["text/plain"]);
  assert.ok(tablePlain.includes(HOSTILE_SOURCE) && tablePlain.includes(HOSTILE_X));
  const tableMd = String((await displayOf(table))["text/markdown"]);
  assert.ok(tableMd.includes("\\*\\*bold\\*\\* \\| \\`tick\\` \\& co"));
});

Deno.test("markdownTable escapes cells and right-aligns numbers", () => {
  assert.equal(
    markdownTable({ header: ["name", "w"], rows: [["a|b *c*", 1.5], ["<x>", -2]] }),
    "| name | w |\n| --- | ---: |\n| a\\|b \\*c\\* | 1.5 |\n| \\<x\\> | −2 |",
  );
});
