/**
 * The one place that turns a Vega-Lite v5 spec into SVG: vega-lite compiles it to a Vega spec,
 * and a headless Vega `View` (`renderer: "none"`) draws it with `toSVG()`. No browser, no canvas.
 *
 * Output is deterministic: Vega numbers its clip paths and gradients from a process-wide counter,
 * so {@link stableSvgIds} renames every `id` to a name made from a hash of the SVG itself and the
 * order of appearance. The same spec gives byte-identical SVG on every call, and two different
 * charts inlined in one HTML page never share an id.
 *
 * Text: Vega writes `font-family="sans-serif"` (its default) unless the spec's config says
 * otherwise, which every SVG viewer can render. Without a canvas package Vega estimates text
 * widths from the character count and font size; it warns about nothing, but label overlap and
 * truncation decisions rest on that estimate.
 *
 * Vega and vega-lite are loaded on first use, so importing curbfit does not pay for them.
 *
 * @module
 */

import process from "node:process";
import type { LoggerInterface } from "vega";
import type { TopLevelSpec } from "vega-lite";
import { CurbfitError } from "../errors/error.ts";

/** A Vega-Lite v5 top-level specification. */
export type VegaLiteSpec = TopLevelSpec;

/** Options for {@link renderSvg}. */
export interface RenderOptions {
  /**
   * Receives each warning from vega-lite's compiler and Vega's runtime (for example a dropped
   * encoding channel). Warnings never stop a render; without this option they are dropped.
   * Chart tests catch them with `assertValidVegaLite` in test/vl_assert.ts.
   */
  readonly onWarning?: (message: string) => void;
}

type VegaModule = typeof import("vega");
type VegaLiteModule = typeof import("vega-lite");

interface Libraries {
  readonly vega: VegaModule;
  readonly vegaLite: VegaLiteModule;
}

/** Cache of the one-time library load (modules are process-wide anyway). */
let libraries: Promise<Libraries> | undefined;

/**
 * Loads vega and vega-lite once. vega-lite requires vega's Node entry, whose loader pulls in
 * node-fetch → whatwg-url → the deprecated `punycode` module, and `deno run` / `deno test` then
 * print a DEP0040 DeprecationWarning on stderr (Deno's Jupyter kernel shows no process warnings).
 * The flag that silences it is set only for the duration of this import and restored afterwards.
 */
function loadLibraries(): Promise<Libraries> {
  libraries ??= (async () => {
    const node = process as typeof process & { noDeprecation?: boolean };
    const saved = node.noDeprecation;
    node.noDeprecation = true;
    try {
      const [vega, vegaLite] = await Promise.all([import("vega"), import("vega-lite")]);
      return { vega, vegaLite };
    } finally {
      node.noDeprecation = saved;
    }
  })().catch((e) => {
    libraries = undefined; // let a later call try again
    throw renderFailed(
      `vega or vega-lite could not be loaded: ${messageOf(e)}`,
      "make sure the npm packages in deno.json are reachable or already cached (deno install)",
    );
  });
  return libraries;
}

/**
 * A logger in the shape Vega and vega-lite expect, keeping warnings and errors as text. Vega calls
 * the methods detached from the object, so they are closures, not class methods.
 */
function collectingLogger(warnings: string[], errors: string[]): LoggerInterface {
  let current = 2; // Vega's "Warn" level: warnings and errors only.
  const text = (args: readonly unknown[]) => args.map(messageOf).join(" ");
  const logger: LoggerInterface = {
    level: ((next?: number) => {
      if (next === undefined) return current;
      current = next;
      return logger;
    }) as LoggerInterface["level"],
    error: (...args: readonly unknown[]) => {
      errors.push(text(args));
      return logger;
    },
    warn: (...args: readonly unknown[]) => {
      warnings.push(text(args));
      return logger;
    },
    info: () => logger,
    debug: () => logger,
  };
  return logger;
}

function messageOf(value: unknown): string {
  return value instanceof Error ? value.message : String(value);
}

/**
 * A Vega loader that refuses every load and records the refusal as an error (Vega itself only
 * warns about a failed load): curbfit charts carry their data inline and never read files or URLs.
 */
function refusingLoader(errors: string[]) {
  const refuse = (what: unknown): Promise<never> => {
    const message = `loading ${String(what)} is refused: curbfit renders inline data only`;
    errors.push(message);
    return Promise.reject(new Error(message));
  };
  return { load: refuse, sanitize: refuse, http: refuse, file: refuse };
}

/**
 * Renders a Vega-Lite v5 spec to an SVG string in-process, deterministically (see the module
 * notes). Data must be inline (`data.values`); a spec that asks to load a URL or file fails.
 *
 * @throws {CurbfitError} code `RENDER_FAILED` when vega-lite cannot compile the spec or Vega
 * reports an error while running it.
 *
 * @example
 * ```ts
 * import { renderSvg } from "./render.ts";
 * const svg = await renderSvg({
 *   data: { values: [{ lambda: 0.1, error: 2.5 }, { lambda: 1, error: 2.1 }] },
 *   mark: "line",
 *   encoding: {
 *     x: { field: "lambda", type: "quantitative", scale: { type: "log" } },
 *     y: { field: "error", type: "quantitative" },
 *   },
 * });
 * console.log(svg.startsWith("<svg")); // true
 * ```
 */
export async function renderSvg(spec: VegaLiteSpec, options: RenderOptions = {}): Promise<string> {
  const { vega, vegaLite } = await loadLibraries();
  const warnings: string[] = [];
  const errors: string[] = [];
  const logger = collectingLogger(warnings, errors);
  let view: InstanceType<VegaModule["View"]> | undefined;
  try {
    const compiled = vegaLite.compile(structuredClone(spec), { logger });
    view = new vega.View(vega.parse(compiled.spec), {
      renderer: "none",
      logger,
      loader: refusingLoader(errors) as unknown as ReturnType<VegaModule["loader"]>,
    });
    const svg = await view.toSVG();
    if (errors.length > 0) throw renderFailed(errors.join("; "));
    warnings.forEach((w) => options.onWarning?.(w));
    return stableSvgIds(svg);
  } catch (e) {
    throw e instanceof CurbfitError ? e : renderFailed(messageOf(e));
  } finally {
    view?.finalize();
  }
}

const SPEC_HINT = "check the chart spec against the Vega-Lite v5 schema " +
  "(test/vl_assert.ts does this); data must be inline values";

function renderFailed(detail: string, hint = SPEC_HINT): CurbfitError {
  return new CurbfitError("RENDER_FAILED", `the chart could not be drawn: ${detail}`, hint, {
    option: "spec",
  });
}

/** 32-bit FNV-1a over UTF-16 code units, as 8 hex digits (a name, not a security hash). */
function fnv1a(text: string): string {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h.toString(16).padStart(8, "0");
}

/** `id="…"` declarations and the three ways SVG refers to them. */
const ID_SITES = /( id="|="url\(#|href="#)([^")]+)/g;

/**
 * Renames every `id` in an SVG string (and each `url(#…)` / `href="#…"` reference to it) to
 * `cf<hash>-<n>`: `n` counts ids in order of first declaration and `hash` is a hash of the SVG
 * with its ids so numbered. The result depends only on the drawing, not on how many charts the
 * process drew before, and differs between different drawings.
 *
 * @example
 * ```ts
 * import { stableSvgIds } from "./render.ts";
 * stableSvgIds('<svg><g clip-path="url(#clip7)"/><defs><clipPath id="clip7"/></defs></svg>');
 * // '<svg><g clip-path="url(#cf…-1)"/><defs><clipPath id="cf…-1"/></defs></svg>'
 * ```
 */
export function stableSvgIds(svg: string): string {
  const declared = [...svg.matchAll(/ id="([^"]+)"/g)].map((m) => m[1]);
  const order = new Map([...new Set(declared)].map((id, k) => [id, String(k + 1)]));
  const rename = (name: (n: string) => string) =>
    svg.replace(ID_SITES, (site, lead: string, id: string) => {
      const n = order.get(id);
      return n === undefined ? site : lead + name(n);
    });
  const hash = fnv1a(rename((n) => `#${n}`));
  return rename((n) => `cf${hash}-${n}`);
}
