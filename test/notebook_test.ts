/**
 * Runs every examples/*.ipynb headless in Deno's Jupyter kernel through Jupyter's own client
 * (nbclient, via test/notebook/run_notebook.py) and checks the executed notebook:
 *
 * - no `error` output and no `stderr` stream output in any cell;
 * - a code cell whose metadata has `curbfit.expect: [MIME types]` shows at least one rich output
 *   (`execute_result` / `display_data`), and every rich output of that cell carries every listed
 *   type, a `text/plain` without ANSI escape codes and a `text/html` without `<script`;
 * - `curbfit.plainIncludes: [strings]` must each appear in one of the cell's `text/plain` outputs;
 * - where an output carries both a Vega-Lite spec and SVG, rendering that spec here, in another
 *   process, gives the same SVG byte for byte.
 *
 * The kernel is this very Deno binary (`Deno.execPath()`), declared in a temporary kernel spec
 * passed through JUPYTER_PATH, so the check needs no `deno jupyter --install` and cannot pick up
 * another Deno version. Python is $CURBFIT_PYTHON when set, else the first of `python3` and
 * `/usr/bin/python3` that has nbclient, nbformat and jupyter_client (Debian: python3-nbclient,
 * python3-nbformat, jupyter-client). Without one the test prints a line starting `SKIP:` and
 * passes, except when CI=true, where it fails.
 *
 * @module
 */

import assert from "node:assert/strict";
import { renderSvg, type VegaLiteSpec } from "../lib/views/render.ts";

const ROOT = new URL("../", import.meta.url);
const RUNNER = new URL("notebook/run_notebook.py", import.meta.url).pathname;
const KERNEL = "curbfit-deno";
const CELL_TIMEOUT_SECONDS = 300;
const VEGA_LITE = "application/vnd.vegalite.v5+json";

interface Output {
  output_type: string;
  name?: string;
  text?: string | string[];
  ename?: string;
  evalue?: string;
  data?: Record<string, unknown>;
}

interface Cell {
  cell_type: string;
  id?: string;
  source: string | string[];
  metadata?: { curbfit?: { expect?: string[]; plainIncludes?: string[] } };
  outputs?: Output[];
}

interface Notebook {
  cells: Cell[];
}

/** Jupyter stores multi-line strings either whole or as a list of lines. */
function joined(text: string | string[] | unknown): string {
  return Array.isArray(text) ? text.join("") : String(text ?? "");
}

async function run(cmd: string, args: string[], env: Record<string, string>) {
  try {
    const out = await new Deno.Command(cmd, { args, env, stdin: "null" }).output();
    const decode = (b: Uint8Array) => new TextDecoder().decode(b).trim();
    return { code: out.code, stdout: decode(out.stdout), stderr: decode(out.stderr) };
  } catch (e) {
    if (e instanceof Deno.errors.NotFound) {
      return { code: 127, stdout: "", stderr: `${cmd} not found` };
    }
    throw e;
  }
}

/** Writes a kernel spec for this Deno binary; returns the JUPYTER_PATH entry that holds it. */
async function writeKernelSpec(dir: string): Promise<string> {
  const specDir = `${dir}/jupyter/kernels/${KERNEL}`;
  await Deno.mkdir(specDir, { recursive: true });
  const spec = {
    argv: [Deno.execPath(), "jupyter", "--kernel", "--conn", "{connection_file}"],
    display_name: "Deno (curbfit test)",
    language: "typescript",
  };
  await Deno.writeTextFile(`${specDir}/kernel.json`, JSON.stringify(spec, null, 2));
  return `${dir}/jupyter`;
}

/** The first Python that can drive the kernel, or the reasons none can. */
async function findPython(env: Record<string, string>): Promise<string | string[]> {
  const chosen = Deno.env.get("CURBFIT_PYTHON");
  const candidates = chosen ? [chosen] : ["python3", "/usr/bin/python3"];
  const reasons: string[] = [];
  for (const python of candidates) {
    const probe = await run(python, [RUNNER, "--probe", KERNEL], env);
    if (probe.code === 0) return python;
    reasons.push(`${python}: ${probe.stdout || probe.stderr}`);
  }
  return reasons;
}

async function exampleNotebooks(): Promise<string[]> {
  const dir = new URL("examples/", ROOT).pathname;
  const names: string[] = [];
  for await (const entry of Deno.readDir(dir)) {
    if (entry.isFile && entry.name.endsWith(".ipynb")) names.push(`${dir}${entry.name}`);
  }
  return names.sort();
}

function cellName(cell: Cell, index: number): string {
  return `cell ${index + 1}${cell.id ? ` (${cell.id})` : ""}`;
}

/** Every problem in one executed notebook, as sentences. */
async function problemsIn(notebook: Notebook): Promise<string[]> {
  const problems: string[] = [];
  for (const [index, cell] of notebook.cells.entries()) {
    const where = cellName(cell, index);
    const outputs = cell.outputs ?? [];
    for (const out of outputs) {
      if (out.output_type === "error") {
        problems.push(`${where}: error ${out.ename}: ${out.evalue}`);
      }
      if (out.output_type === "stream" && out.name === "stderr") {
        problems.push(`${where}: wrote to stderr: ${joined(out.text)}`);
      }
    }
    const expect = cell.metadata?.curbfit;
    if (expect === undefined) continue;
    const rich = outputs.filter((o) => o.data !== undefined);
    if (rich.length === 0) problems.push(`${where}: no rich output`);
    for (const out of rich) {
      const data = out.data ?? {};
      for (const type of expect.expect ?? []) {
        if (!(type in data)) problems.push(`${where}: output lacks ${type}`);
      }
      if (joined(data["text/plain"]).includes("\u001b")) {
        problems.push(`${where}: text/plain has ANSI escape codes`);
      }
      if (/<script/i.test(joined(data["text/html"]))) {
        problems.push(`${where}: text/html contains a script`);
      }
      if (VEGA_LITE in data && "image/svg+xml" in data) {
        const again = await renderSvg(data[VEGA_LITE] as VegaLiteSpec);
        if (again !== joined(data["image/svg+xml"])) {
          problems.push(`${where}: SVG drawn in the kernel differs from SVG drawn here`);
        }
      }
    }
    const plains = rich.map((o) => joined(o.data?.["text/plain"]));
    for (const wanted of expect.plainIncludes ?? []) {
      if (!plains.some((p) => p.includes(wanted))) {
        problems.push(`${where}: no text/plain output includes ${JSON.stringify(wanted)}`);
      }
    }
  }
  return problems;
}

Deno.test("example notebooks run cleanly in Deno's Jupyter kernel", async (t) => {
  const tmp = await Deno.makeTempDir({ prefix: "curbfit-notebooks-" });
  try {
    const jupyterPath = await writeKernelSpec(tmp);
    const inherited = Deno.env.get("JUPYTER_PATH");
    const env = { JUPYTER_PATH: inherited ? `${jupyterPath}:${inherited}` : jupyterPath };
    const python = await findPython(env);
    if (Array.isArray(python)) {
      const reason = `no Python with nbclient, nbformat and jupyter_client (${python.join("; ")})`;
      if (Deno.env.get("CI") === "true") {
        assert.fail(`CI=true, so this cannot be skipped: ${reason}`);
      }
      console.log(`SKIP: notebook_test: ${reason}`);
      return;
    }
    const notebooks = await exampleNotebooks();
    assert.ok(notebooks.length > 0, "examples/ holds no .ipynb file");
    for (const path of notebooks) {
      await t.step(path.slice(path.lastIndexOf("/") + 1), async () => {
        const result = await run(
          python,
          [RUNNER, KERNEL, path, tmp, String(CELL_TIMEOUT_SECONDS)],
          env,
        );
        assert.equal(result.code, 0, `running ${path} failed:\n${result.stderr}`);
        const executed: Notebook = JSON.parse(await Deno.readTextFile(result.stdout));
        assert.deepEqual(await problemsIn(executed), [], `problems in executed ${path}`);
      });
    }
  } finally {
    await Deno.remove(tmp, { recursive: true });
  }
});
