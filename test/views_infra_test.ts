/**
 * Tests for the display infrastructure in lib/views: escaping, tables, SVG rendering, PNG
 * rasterizing, MIME bundles, and the Vega-Lite test helper itself.
 */

import assert from "node:assert/strict";
import fc from "fast-check";
import { CurbfitError } from "../lib/errors/error.ts";
import { makeBundle, MIME } from "../lib/views/bundle.ts";
import { escapeHtml, escapeMarkdown, showControls } from "../lib/views/escape.ts";
import { svgToPng } from "../lib/views/png.ts";
import { renderSvg, stableSvgIds, type VegaLiteSpec } from "../lib/views/render.ts";
import { formatHtmlTable, formatNumber, formatTextTable } from "../lib/views/table.ts";
import { assertValidVegaLite } from "./vl_assert.ts";

const HOSTILE = "<script>alert('x')</script> & \"q\" | *b* _i_ `c` [l](u) \u001b[31mred";

/** A small line chart with a clipped mark (so Vega emits clip-path ids). Made-up numbers. */
function lineChart(values: { penalty: number; error: number }[]): VegaLiteSpec {
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    width: 200,
    height: 100,
    data: { values },
    mark: { type: "line", point: true, clip: true },
    encoding: {
      x: { field: "penalty", type: "quantitative", scale: { type: "log" } },
      y: { field: "error", type: "quantitative" },
    },
  };
}

const POINTS = [{ penalty: 0.1, error: 2.2 }, { penalty: 1, error: 1.9 }, {
  penalty: 10,
  error: 2.6,
}];

function assertCurbfitError(code: string) {
  return (e: unknown) => e instanceof CurbfitError && e.code === code;
}

// ---------------------------------------------------------------- escaping

// HTML Living Standard, "Serializing HTML fragments" (escaping a string): & < > and, in
// attributes, " must be written as character references (section name recalled from memory);
// ' is escaped too so single-quoted attributes are safe as well (common practice).
Deno.test("escapeHtml turns markup characters into entities", () => {
  assert.equal(
    escapeHtml(`<script>alert('x')</script> & "q"`),
    "&lt;script&gt;alert(&#39;x&#39;)&lt;/script&gt; &amp; &quot;q&quot;",
  );
  assert.equal(escapeHtml("a\tb\nc"), "a\tb\nc", "tab and line feed are kept as whitespace");
  assert.equal(escapeHtml("a\u001bb\u0000"), "a\\u001bb\\u0000");
});

Deno.test("escapeHtml output decodes back to its input and holds no raw markup", () => {
  const decode = (s: string) =>
    s.replace(
      /&lt;|&gt;|&quot;|&#39;|&amp;/g,
      (e) => ({ "&lt;": "<", "&gt;": ">", "&quot;": '"', "&#39;": "'", "&amp;": "&" })[e]!,
    );
  fc.assert(fc.property(fc.string({ unit: "binary" }), (s) => {
    const out = escapeHtml(s);
    assert.doesNotMatch(out, /[<>"']/);
    assert.doesNotMatch(out, /&(?!lt;|gt;|quot;|#39;|amp;)/);
    assert.equal(decode(out), s.replace(/(?![\t\n\r])\p{Cc}/gu, showControls));
  }));
});

// CommonMark spec 0.31.2, "Backslash escapes": any ASCII punctuation character may be
// backslash-escaped and then stands for itself (section name recalled from memory).
// CommonMark 0.31 §2.4: a backslash before ASCII punctuation makes it literal; the inline
// markup starters are ` * _ ~ [ ] ! < > & | and \\ itself; block starters open a line.
Deno.test("escapeMarkdown escapes every inline markup starter and leading block starter", () => {
  assert.equal(escapeMarkdown("a|b *c* [d](e) <f>"), "a\\|b \\*c\\* \\[d\\](e) \\<f\\>");
  assert.equal(escapeMarkdown("`x` & _y_"), "\\`x\\` \\& \\_y\\_");
  assert.equal(escapeMarkdown("# title"), "\\# title");
  assert.equal(escapeMarkdown("12. item"), "12\\. item");
  assert.equal(
    escapeMarkdown("x-y, 1.5 (a)"),
    "x-y, 1.5 (a)",
    "harmless punctuation stays readable",
  );
  assert.equal(escapeMarkdown("two\nlines"), "two\\\\nlines", "one line, break made visible");
  const isPunct = (ch: string) => /[!-/:-@[-`{-~]/.test(ch);
  const inline = (ch: string) => /[\\`*_~[\]!<>&|]/.test(ch);
  fc.assert(fc.property(fc.string({ unit: "binary" }), (s) => {
    const out = escapeMarkdown(s);
    let plain = "";
    for (let i = 0; i < out.length; i++) {
      if (out[i] === "\\") {
        assert.ok(isPunct(out[i + 1] ?? ""), `lone backslash in ${JSON.stringify(out)}`);
        plain += out[++i];
      } else {
        assert.ok(!inline(out[i]), `unescaped ${out[i]} in ${JSON.stringify(out)}`);
        plain += out[i];
      }
    }
    assert.equal(plain, showControls(s), "removing the escapes gives the text back");
    assert.doesNotMatch(out, /\n/);
    assert.doesNotMatch(out, /^[#+=-]|^\d+[.)]/, "no block starter at the start");
  }));
});

// ECMA-48 / ANSI X3.64: terminal control sequences start with ESC (U+001B); Unicode category Cc
// is U+0000–U+001F and U+007F–U+009F (Unicode Standard, General_Category).
Deno.test("showControls makes control characters visible and keeps other text", () => {
  assert.equal(
    showControls("red\u001b[31m\nx\ty\r\u007f\u0085"),
    "red\\u001b[31m\\nx\\ty\\r\\u007f\\u0085",
  );
  assert.equal(showControls("λ ≤ 1 — ok"), "λ ≤ 1 — ok");
});

// ---------------------------------------------------------------- tables

// ECMA-262, Number.prototype.toPrecision: p significant digits, exponential form when the
// exponent is < -6 or >= p.
Deno.test("formatNumber writes significant digits without trailing zeros", () => {
  assert.equal(formatNumber(2 / 3), "0.666667");
  assert.equal(formatNumber(1.5), "1.5");
  assert.equal(formatNumber(1234.5, 3), "1.23e+3");
  assert.equal(formatNumber(123456789), "1.23457e+8");
  assert.equal(formatNumber(1e-7), "1e-7");
  assert.equal(formatNumber(0.0001234), "0.0001234");
  assert.equal(formatNumber(100000), "100000");
  assert.equal(formatNumber(-0), "0");
  assert.equal(formatNumber(NaN), "NaN");
  assert.equal(formatNumber(Infinity), "Inf");
  assert.equal(formatNumber(-Infinity), "-Inf");
  assert.throws(() => formatNumber(1, 0), assertCurbfitError("BAD_OPTION"));
  assert.throws(() => formatNumber(1, 2.5), assertCurbfitError("BAD_OPTION"));
});

Deno.test("formatTextTable aligns text left and number columns right", () => {
  const text = formatTextTable({
    header: ["term", "weight", "note"],
    rows: [["x", 1.5, "a\u001b[31m"], ["λ²", -0.25, ""], ["x³", 12, "big"]],
  });
  assert.equal(
    text,
    [
      "term  weight  note",
      "----  ------  -----------",
      "x        1.5  a\\u001b[31m",
      "λ²     -0.25",
      "x³        12  big",
    ].join("\n"),
  );
  assert.ok(!text.includes("\u001b"));
});

Deno.test("formatTextTable treats blank cells in a number column as numbers", () => {
  assert.equal(
    formatTextTable({ header: ["a"], rows: [[1], [""], [10.5]] }),
    "   a\n----\n   1\n\n10.5",
  );
  assert.equal(formatTextTable({ header: ["only"], rows: [] }), "only\n----");
});

Deno.test("table formatters reject ragged rows and bad digits", () => {
  const ragged = { header: ["a", "b"], rows: [[1, 2], [3]] };
  assert.throws(() => formatTextTable(ragged), assertCurbfitError("BAD_OPTION"));
  assert.throws(() => formatHtmlTable(ragged), assertCurbfitError("BAD_OPTION"));
  assert.throws(
    () => formatTextTable({ header: ["a"], rows: [["x"]] }, { digits: 18 }),
    assertCurbfitError("BAD_OPTION"),
  );
});

Deno.test("formatHtmlTable escapes cells and right-aligns number columns", () => {
  assert.equal(
    formatHtmlTable({ header: ["term <i>", "weight"], rows: [["<x>&", 1.5], ["y", 2 / 3]] }),
    [
      "<table>",
      '<thead><tr><th>term &lt;i&gt;</th><th align="right">weight</th></tr></thead>',
      "<tbody>",
      '<tr><td>&lt;x&gt;&amp;</td><td align="right">1.5</td></tr>',
      '<tr><td>y</td><td align="right">0.666667</td></tr>',
      "</tbody>",
      "</table>",
    ].join("\n"),
  );
});

// ---------------------------------------------------------------- SVG

Deno.test("stableSvgIds depends on the drawing, not on Vega's id counter", () => {
  const drawing = (n: number) =>
    `<svg><g clip-path="url(#clip${n})"/><defs><clipPath id="clip${n}"><rect/></clipPath>` +
    `</defs><text>url(#clip3)</text><use href="#clip${n}"/><g fill="url(#other)"/></svg>`;
  const a = stableSvgIds(drawing(3));
  assert.equal(a, stableSvgIds(drawing(41)));
  const id = a.match(/ id="([^"]+)"/)![1];
  assert.match(id, /^cf[0-9a-f]{8}-1$/);
  assert.ok(a.includes(`clip-path="url(#${id})"`) && a.includes(`href="#${id}"`));
  assert.ok(a.includes("<text>url(#clip3)</text>"), "text content is left alone");
  assert.ok(a.includes('fill="url(#other)"'), "references to undeclared ids are left alone");
  const b = stableSvgIds(drawing(3).replace("<rect/>", "<rect width='2'/>"));
  assert.notEqual(b.match(/ id="([^"]+)"/)![1], id, "different drawings get different ids");
  assert.equal(stableSvgIds("<svg/>"), "<svg/>");
});

Deno.test("renderSvg is deterministic across calls and unaffected by other charts", async () => {
  const spec = lineChart(POINTS);
  const before = structuredClone(spec);
  const first = await renderSvg(spec);
  await renderSvg(lineChart([{ penalty: 1, error: 1 }, { penalty: 2, error: 3 }]));
  const again = await renderSvg(spec);
  assert.equal(again, first, "byte-identical SVG");
  assert.deepEqual(spec, before, "the caller's spec is not changed");
  assert.ok(first.startsWith("<svg"));
  assert.match(first, /clip-path="url\(#cf[0-9a-f]{8}-1\)"/);
  assert.doesNotMatch(first, /id="clip\d+"/);
  assert.match(first, /font-family="sans-serif"/);
  assert.doesNotMatch(first, /<script|<foreignObject/i);
});

Deno.test("renderSvg escapes text from the spec", async () => {
  const spec = { ...lineChart(POINTS), title: HOSTILE };
  const svg = await renderSvg(spec);
  assert.doesNotMatch(svg, /<script/);
  assert.ok(svg.includes("&lt;script&gt;"));
});

Deno.test("renderSvg reports warnings and refuses to load data", async () => {
  const warnings: string[] = [];
  await renderSvg({
    data: { values: [{ a: "not a number" }] },
    mark: "point",
    encoding: { x: { field: "a", type: "quantitative" } },
  }, { onWarning: (w) => warnings.push(w) });
  assert.ok(warnings.some((w) => w.includes("Infinite extent")), warnings.join("; "));

  await assert.rejects(
    renderSvg({
      data: { url: "data/secret.csv" },
      mark: "point",
      encoding: { x: { field: "a", type: "quantitative" } },
    }),
    (e) => assertCurbfitError("RENDER_FAILED")(e) && /inline data only/.test(String(e)),
  );
  await assert.rejects(
    renderSvg({ data: { values: [] }, mark: "no-such-mark" } as unknown as VegaLiteSpec),
    assertCurbfitError("RENDER_FAILED"),
  );
});

// ---------------------------------------------------------------- PNG

/** PNG: 8-byte signature, then the IHDR chunk with big-endian width and height at bytes 16–23
 * (PNG specification, W3C, §5.2 and §11.2.1; recalled from memory). */
function pngSize(png: Uint8Array): [number, number] {
  assert.deepEqual([...png.subarray(0, 8)], [137, 80, 78, 71, 13, 10, 26, 10]);
  assert.equal(new TextDecoder().decode(png.subarray(12, 16)), "IHDR");
  const view = new DataView(png.buffer, png.byteOffset, png.byteLength);
  return [view.getUint32(16), view.getUint32(20)];
}

Deno.test("svgToPng rasterizes at the asked scale, deterministically", async () => {
  const svg = await renderSvg(lineChart(POINTS));
  const [w, h] = svg.match(/width="(\d+)" height="(\d+)"/)!.slice(1).map(Number);
  const png = await svgToPng(svg);
  assert.deepEqual(pngSize(png), [2 * w, 2 * h]);
  assert.deepEqual(pngSize(await svgToPng(svg, { scale: 1 })), [w, h]);
  assert.deepEqual(await svgToPng(svg), png, "same SVG, same bytes");
});

Deno.test("svgToPng draws text with its bundled font", async () => {
  const svg = (text: string) =>
    `<svg xmlns="http://www.w3.org/2000/svg" width="60" height="20"><rect width="60" ` +
    `height="20" fill="white"/><text x="2" y="15" font-family="sans-serif" font-size="12">` +
    `${text}</text></svg>`;
  // With no usable font resvg draws no glyphs, so both images would be the same blank page.
  assert.notDeepEqual(await svgToPng(svg("λ = 0.1")), await svgToPng(svg("")));
});

Deno.test("svgToPng rejects a bad scale and a broken SVG", async () => {
  await assert.rejects(svgToPng("<svg/>", { scale: 0 }), assertCurbfitError("BAD_OPTION"));
  await assert.rejects(svgToPng("<svg", { scale: 1 }), assertCurbfitError("RENDER_FAILED"));
});

// ---------------------------------------------------------------- bundles

Deno.test("makeBundle with a chart carries spec, SVG, HTML and plain text", async () => {
  const spec = lineChart(POINTS);
  const table = { header: ["penalty", "error"], rows: POINTS.map((p) => [p.penalty, p.error]) };
  const bundle = await makeBundle({
    spec,
    title: HOSTILE,
    plain: formatTextTable(table),
    htmlBody: formatHtmlTable(table),
  });
  assert.deepEqual(Object.keys(bundle), [MIME.vegaLite, MIME.svg, MIME.html, MIME.plain]);
  assert.equal(bundle[MIME.vegaLite], spec);
  assert.equal(bundle[MIME.svg], await renderSvg(spec));
  const html = bundle[MIME.html];
  assert.ok(html.includes(bundle[MIME.svg]!), "the chart is inside the HTML");
  assert.ok(html.includes(formatHtmlTable(table)));
  assert.ok(html.includes(escapeHtml(HOSTILE)));
  assert.doesNotMatch(html, /<script|<style|style=/i);
  assert.equal(
    bundle[MIME.plain],
    `${showControls(HOSTILE)}\n\n${formatTextTable(table)}`,
  );
  assert.ok(!bundle[MIME.plain].includes("\u001b"));
});

Deno.test("makeBundle without a chart shows the plain text in HTML and adds Markdown", async () => {
  const bundle = await makeBundle({
    title: "Weights | *raw*",
    plain: "line one\nline <two> \u001b[1m",
    markdown: escapeMarkdown("body"),
  });
  assert.deepEqual(Object.keys(bundle), [MIME.html, MIME.markdown, MIME.plain]);
  assert.ok(bundle[MIME.html].includes("<pre>line one\nline &lt;two&gt; \\u001b[1m</pre>"));
  assert.equal(bundle[MIME.markdown], "**Weights \\| \\*raw\\***\n\nbody");
  assert.equal(bundle[MIME.plain], "Weights | *raw*\n\nline one\nline <two> \\u001b[1m");
});

Deno.test("a result class displays through Symbol.for('Jupyter.display')", async () => {
  class Shown {
    [Symbol.for("Jupyter.display")]() {
      return makeBundle({ title: "t", plain: "p" });
    }
  }
  const display = (new Shown() as unknown as Record<symbol, () => Promise<object>>)[
    Symbol.for("Jupyter.display")
  ];
  assert.deepEqual(Object.keys(await display()), [MIME.html, MIME.plain]);
});

// ---------------------------------------------------------------- the test helper itself

Deno.test("assertValidVegaLite accepts a clean spec", async () => {
  await assertValidVegaLite(lineChart(POINTS));
});

Deno.test("assertValidVegaLite rejects schema errors, compile warnings and runtime warnings", async () => {
  await assert.rejects(
    assertValidVegaLite({ data: { values: [] }, mark: "pointy" }),
    /schema: \/mark/,
  );
  await assert.rejects(
    assertValidVegaLite({
      data: { values: [{ a: 1 }] },
      mark: "point",
      encoding: { x: { field: "a", type: "quantitative" }, size: { field: "a", type: "nominal" } },
    }),
    /warning: Channel size should not be used/,
  );
  await assert.rejects(
    assertValidVegaLite({
      data: { values: [] },
      mark: "point",
      encoding: { x: { field: "a", type: "quantitative" } },
    }),
    /warning: Infinite extent/,
  );
});
