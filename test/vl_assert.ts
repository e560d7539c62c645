/**
 * Test helper for chart code: a Vega-Lite spec passes only if it validates against the Vega-Lite
 * v5 JSON schema shipped inside the pinned vega-lite package (build/vega-lite-schema.json), and
 * vega-lite compiles it and Vega renders it with no warning and no error.
 *
 * @module
 */

import { Ajv } from "ajv";
import schema from "vega-lite/build/vega-lite-schema.json" with { type: "json" };
import { renderSvg, type VegaLiteSpec } from "../lib/views/render.ts";

/**
 * The schema uses three string formats that ajv does not know. `color-hex` is checked as the CSS
 * hex colour notation (3, 4, 6 or 8 hex digits after `#`; CSS Color Module Level 4, §5.2);
 * `uri` and `uri-reference` are accepted as any string, since curbfit charts carry inline data
 * and no links.
 * `strict: false` because the schema carries Vega-Lite's own annotation keywords.
 */
const validate = new Ajv({
  allErrors: true,
  strict: false,
  formats: {
    "color-hex": /^#(?:[0-9a-f]{3,4}|[0-9a-f]{6}|[0-9a-f]{8})$/i,
    uri: true,
    "uri-reference": true,
  },
}).compile(schema);

/**
 * Fails (throws an Error listing every problem) unless `spec` is valid Vega-Lite v5 that
 * compiles and renders without a warning. A spec that cannot be drawn at all rejects with
 * renderSvg's `RENDER_FAILED` error.
 *
 * @example
 * ```ts
 * import { assertValidVegaLite } from "./vl_assert.ts";
 * await assertValidVegaLite({
 *   data: { values: [{ x: 1, y: 2 }] },
 *   mark: "point",
 *   encoding: { x: { field: "x", type: "quantitative" }, y: { field: "y", type: "quantitative" } },
 * });
 * ```
 */
export async function assertValidVegaLite(spec: unknown): Promise<void> {
  const problems: string[] = [];
  if (!validate(spec)) {
    for (const e of validate.errors ?? []) {
      problems.push(`schema: ${e.instancePath || "/"} ${e.message ?? ""}`);
    }
  } else {
    // renderSvg compiles with vega-lite's compile() and a logger that keeps every warning, then
    // runs Vega headless with the same kind of logger; both kinds of warning arrive here.
    await renderSvg(spec as VegaLiteSpec, { onWarning: (w) => problems.push(`warning: ${w}`) });
  }
  if (problems.length > 0) {
    throw new Error(`not a clean Vega-Lite v5 spec:\n  ${problems.join("\n  ")}`);
  }
}
