/**
 * SVG → PNG with resvg compiled to WebAssembly (npm `@resvg/resvg-wasm`), offline, with no
 * system fonts: text is drawn with Inter (SIL Open Font License 1.1), Regular and Bold, read from
 * the TTF files shipped in the npm package `@expo-google-fonts/inter`. Generic families
 * (`sans-serif`, Vega's default) map to Inter, so a PNG looks the same on every machine.
 *
 * The wasm binary and the fonts are files inside npm packages. They are located with Node's
 * `require.resolve` from this module and read with `Deno.readFile`, which needs read permission
 * on Deno's npm cache (the Jupyter kernel has all permissions) and works when curbfit is run from
 * a local checkout (a `file:` module URL). Everything loads once, on the first call.
 *
 * @module
 */

import { createRequire } from "node:module";
import { CurbfitError } from "../errors/error.ts";

/** Options for {@link svgToPng}. */
export interface PngOptions {
  /** Pixels per SVG user unit (2 gives a sharp image on high-density screens). Default 2. */
  readonly scale?: number;
}

type ResvgModule = typeof import("@resvg/resvg-wasm");

interface Rasterizer {
  readonly resvg: ResvgModule;
  readonly fonts: Uint8Array[];
}

/** Font files used, relative to the `@expo-google-fonts/inter` package folder. */
const FONT_FILES = ["400Regular/Inter_400Regular.ttf", "700Bold/Inter_700Bold.ttf"];

/** Cache of the one-time load: resvg's wasm can be initialised only once per process. */
let rasterizer: Promise<Rasterizer> | undefined;

async function readPackageFile(specifier: string): Promise<Uint8Array> {
  const require = createRequire(import.meta.url);
  try {
    return await Deno.readFile(require.resolve(specifier));
  } catch (e) {
    throw new CurbfitError(
      "READ_FAILED",
      `could not read ${specifier} for PNG output (${e instanceof Error ? e.message : e})`,
      "run from a local curbfit checkout with read permission on Deno's npm cache " +
        "(deno run --allow-read), or use the SVG output instead",
    );
  }
}

function loadRasterizer(): Promise<Rasterizer> {
  rasterizer ??= (async () => {
    // The JSON import puts the font package into Deno's module graph, which lets
    // require.resolve find its files; the package has no JavaScript usable outside Expo.
    await import("@expo-google-fonts/inter/package.json", { with: { type: "json" } });
    const resvg = await import("@resvg/resvg-wasm");
    const [wasm, ...fonts] = await Promise.all([
      readPackageFile("@resvg/resvg-wasm/index_bg.wasm"),
      ...FONT_FILES.map((f) => readPackageFile(`@expo-google-fonts/inter/${f}`)),
    ]);
    await resvg.initWasm(wasm);
    return { resvg, fonts };
  })().catch((e) => {
    rasterizer = undefined; // let a later call try again, e.g. after permissions change
    throw e;
  });
  return rasterizer;
}

/**
 * Rasterizes an SVG string (for example from `renderSvg`) to PNG bytes. Deterministic: the same
 * SVG and options give the same bytes.
 *
 * @throws {CurbfitError} `BAD_OPTION` for a scale that is not a positive finite number,
 * `READ_FAILED` when the wasm or font files cannot be read, `RENDER_FAILED` when resvg rejects
 * the SVG.
 *
 * @example
 * ```ts
 * import { svgToPng } from "./png.ts";
 * const png = await svgToPng('<svg xmlns="http://www.w3.org/2000/svg" width="40" height="20">' +
 *   '<text x="2" y="15" font-family="sans-serif">λ=1</text></svg>');
 * console.log(png[1] === 0x50 && png[2] === 0x4e && png[3] === 0x47); // true ("PNG")
 * ```
 */
export async function svgToPng(svg: string, options: PngOptions = {}): Promise<Uint8Array> {
  const scale = options.scale ?? 2;
  if (!(Number.isFinite(scale) && scale > 0)) {
    throw new CurbfitError(
      "BAD_OPTION",
      `scale is ${scale}, but it must be a positive number`,
      "pass a scale such as 1 or 2",
      { option: "scale" },
    );
  }
  const { resvg, fonts } = await loadRasterizer();
  let image: InstanceType<ResvgModule["Resvg"]> | undefined;
  try {
    image = new resvg.Resvg(svg, {
      fitTo: { mode: "zoom", value: scale },
      font: {
        fontBuffers: fonts,
        defaultFontFamily: "Inter",
        sansSerifFamily: "Inter",
        serifFamily: "Inter",
        monospaceFamily: "Inter",
      },
    });
    const rendered = image.render();
    const png = rendered.asPng();
    rendered.free();
    return png;
  } catch (e) {
    throw new CurbfitError(
      "RENDER_FAILED",
      `the SVG could not be rasterized: ${e instanceof Error ? e.message : e}`,
      "pass a complete SVG document, such as the output of renderSvg",
      { option: "svg" },
    );
  } finally {
    image?.free(); // wasm memory is not garbage-collected
  }
}
