/**
 * The kernel add-on: the progress display (throttling, in-place updates, time-left estimate),
 * `deno task kernel` (Jupyter check, install advice, kernel spec install) and
 * `deno task new-notebook` (scaffold, refusal to overwrite, and the starter notebook executed
 * headless in Deno's kernel through Jupyter's own client, nbclient).
 *
 * The tests that need Jupyter (Debian: python3-nbclient python3-nbformat jupyter-client
 * python3-ipykernel) print a line starting `SKIP:` and pass when it is missing, except under
 * CI=true, where they fail.
 */
import assert from "node:assert/strict";
import {
  type Bundle,
  describeProgress,
  fractionDone,
  jupyterSink,
  progressDisplay,
} from "../lib/kernel/progress.ts";
import { setUpKernel } from "../lib/kernel/install.ts";
import {
  type CommandResult,
  commandRunner,
  DEBIAN_PACKAGES,
  KERNEL_DISPLAY_NAME,
  KERNEL_NAME,
} from "../lib/kernel/jupyter.ts";
import { moduleTarget, scaffoldFiles, writeScaffold } from "../lib/kernel/scaffold.ts";
import { resolveFolder } from "../lib/kernel/new_notebook.ts";
import { CurbfitError } from "../mod.ts";

const ROOT = new URL("../", import.meta.url).pathname.replace(/\/$/, "");
const RUNNER = new URL("notebook/run_notebook.py", import.meta.url).pathname;
const DENO = Deno.execPath();

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** A sink that records what would be shown. */
function recorder() {
  const shown: { bundle: Bundle; id: string; update: boolean }[] = [];
  const sink = (bundle: Bundle, o: { display_id: string; update: boolean }) => {
    shown.push({ bundle, id: o.display_id, update: o.update });
    return Promise.resolve();
  };
  return { shown, sink };
}

/** Skips (prints SKIP:) or, under CI=true, fails. */
function skipOrFail(test: string, reason: string): void {
  if (Deno.env.get("CI") === "true") {
    assert.fail(`CI=true, so ${test} cannot be skipped: ${reason}`);
  }
  console.log(`SKIP: ${test}: ${reason}`);
}

Deno.test("progress: fraction done and the time-left estimate", () => {
  // 10 folds + 1 refit per model: after 5 folds, 5/11 of the work.
  assert.equal(fractionDone({ stage: "folds", done: 5, total: 10 }, []), 5 / 11);
  assert.equal(fractionDone({ stage: "refit", done: 1, total: 1 }, []), 1);
  assert.equal(fractionDone({ stage: "refit", done: 0, total: 1 }, [], 10), 10 / 11);
  assert.equal(fractionDone({ stage: "summaries", done: 1, total: 2 }, [], 10), 0.5 * 10 / 11);
  const names = ["a", "b"];
  assert.equal(
    fractionDone({ stage: "folds", done: 5, total: 5, candidate: "b" }, names),
    0.5 + 0.5 * 5 / 6,
  );
  assert.equal(
    describeProgress({ stage: "folds", done: 3, total: 5 }, [], 1500),
    "fold 3 of 5 · 50% · 1.5 s elapsed, about 1.5 s left",
  );
  assert.equal(
    describeProgress({ stage: "folds", done: 1, total: 4, candidate: "b" }, names, 6000),
    'fold 1 of 4 · candidate 2 of 2 "b" · 60% · 6.0 s elapsed, about 4.0 s left',
  );
});

Deno.test("progress: a synchronous burst of reports becomes one update after the interval", async () => {
  const { shown, sink } = recorder();
  const p = progressDisplay({ title: "sweeping", sink, intervalMs: 30 });
  await p.start();
  for (let done = 1; done <= 1000; done++) p.listener({ stage: "folds", done, total: 1000 });
  assert.equal(shown.length, 1, "nothing is sent while the engine holds the thread");
  await sleep(80);
  assert.equal(shown.length, 2);
  assert.match(
    String(shown[1].bundle["text/plain"]),
    /^curbfit: sweeping — fold 1000 of 1000 · 99%/,
  );
  await p.finish({ "text/plain": "the result" });
  assert.deepEqual(shown.map((s) => s.update), [false, true, true]);
  assert.ok(shown.every((s) => s.id === shown[0].id), "one output, updated in place");
  assert.deepEqual(shown[2].bundle, { "text/plain": "the result" });
});

Deno.test("progress: an engine that yields between folds shows each update, throttled", async () => {
  const { shown, sink } = recorder();
  let clock = 0;
  const p = progressDisplay({
    title: "comparing",
    sink,
    intervalMs: 10,
    now: () => clock,
    candidates: ["a"],
  });
  await p.start();
  for (let done = 1; done <= 4; done++) {
    clock += 1000;
    p.listener({ stage: "folds", done, total: 4, candidate: "a" });
    await sleep(25);
  }
  const lines = shown.slice(1).map((s) => String(s.bundle["text/plain"]));
  assert.deepEqual(lines, [
    'curbfit: comparing — fold 1 of 4 · candidate 1 of 1 "a" · 20% · 1.0 s elapsed, about 4.0 s left',
    'curbfit: comparing — fold 2 of 4 · candidate 1 of 1 "a" · 40% · 2.0 s elapsed, about 3.0 s left',
    'curbfit: comparing — fold 3 of 4 · candidate 1 of 1 "a" · 60% · 3.0 s elapsed, about 2.0 s left',
    'curbfit: comparing — fold 4 of 4 · candidate 1 of 1 "a" · 80% · 4.0 s elapsed, about 1.0 s left',
  ]);
  assert.match(String(shown[1].bundle["text/html"]), /^<div><strong>curbfit<\/strong>: comparing/);
  await p.fail(new Error("first line\nsecond line"));
  assert.equal(
    shown[shown.length - 1].bundle["text/plain"],
    "curbfit: comparing — stopped after 4.0 s: first line",
  );
});

Deno.test("progress: does nothing outside Deno's kernel", async () => {
  assert.equal(jupyterSink(), undefined, "reading Deno.jupyter outside the kernel is caught");
  const p = progressDisplay({ title: "x" });
  await p.start();
  p.listener({ stage: "folds", done: 1, total: 2 });
  await p.finish({ "text/plain": "done" });
});

Deno.test("new-notebook: the import target is relative inside the checkout, a file URL outside", () => {
  assert.equal(moduleTarget("/work/main/analyses/kiln", "/work/main"), "../../mod.ts");
  assert.equal(moduleTarget("/work/main", "/work/main/"), "./mod.ts");
  assert.equal(moduleTarget("/work/mainly/kiln", "/work/main"), "file:///work/main/mod.ts");
  assert.equal(moduleTarget("/tmp/a b", "/srv/curb fit"), "file:///srv/curb%20fit/mod.ts");
  assert.equal(resolveFolder("../kiln/./x", "/home/me/work"), "/home/me/kiln/x");
  assert.equal(resolveFolder("/abs", "/ignored"), "/abs");
});

Deno.test("new-notebook: the files of an analysis folder", () => {
  const imports = { "ml-matrix": "npm:ml-matrix@6.15.1", curbfit: "ignored" };
  const files = scaffoldFiles({ folder: "/tmp/kiln-drying", root: "/work/main", imports });
  assert.deepEqual(Object.keys(files).sort(), [
    ".gitignore",
    "README.md",
    "analysis.ipynb",
    "deno.json",
  ]);
  assert.deepEqual(JSON.parse(files["deno.json"]), {
    imports: { curbfit: "file:///work/main/mod.ts", "ml-matrix": "npm:ml-matrix@6.15.1" },
  });
  const nb = JSON.parse(files["analysis.ipynb"]);
  assert.equal(nb.nbformat, 4);
  assert.equal(nb.metadata.kernelspec.name, KERNEL_NAME);
  assert.equal(nb.metadata.kernelspec.display_name, KERNEL_DISPLAY_NAME);
  const sources = nb.cells.map((c: { source: string[] }) => c.source.join(""));
  assert.ok(sources.some((s: string) => s.includes("await curb`")), "uses the template");
  assert.ok(sources.some((s: string) => s.includes("compare(drying, [")), "uses the API");
  assert.ok(new Set(nb.cells.map((c: { id: string }) => c.id)).size === nb.cells.length);
  assert.match(files["README.md"], /extrapolation|outside the training domain/i);
  assert.match(files["README.md"], /estimate, not a guarantee/);
  assert.match(files["README.md"], /file:\/\/\/work\/main\/mod\.ts/);
  assert.match(files[".gitignore"], /\.ipynb_checkpoints\//);
});

Deno.test("new-notebook: refuses a folder that is not empty, with exit code 2", async () => {
  const dir = await Deno.makeTempDir({ prefix: "curbfit-scaffold-" });
  try {
    await Deno.writeTextFile(`${dir}/notes.txt`, "keep me");
    await assert.rejects(
      () => writeScaffold(dir, { "deno.json": "{}" }),
      (e: unknown) => e instanceof CurbfitError && e.code === "FOLDER_NOT_EMPTY",
    );
    const out = await new Deno.Command(DENO, {
      args: ["task", "-q", "new-notebook", dir],
      cwd: ROOT,
      stdin: "null",
    }).output();
    const text = new TextDecoder().decode(out.stdout);
    assert.equal(out.code, 2, text);
    assert.match(text, /already holds files, and new-notebook never overwrites anything/);
    assert.equal(await Deno.readTextFile(`${dir}/notes.txt`), "keep me");
    const usage = await new Deno.Command(DENO, {
      args: ["task", "-q", "new-notebook"],
      cwd: ROOT,
      stdin: "null",
    }).output();
    assert.equal(usage.code, 2);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("kernel: without Jupyter it says how to install it both ways and exits 1", async () => {
  const calls: string[] = [];
  const missing = (command: string, args: readonly string[]): Promise<CommandResult> => {
    calls.push([command, ...args].join(" "));
    return Promise.resolve({ code: 127, stdout: "", stderr: `${command}: command not found` });
  };
  const printed: string[] = [];
  assert.equal(await setUpKernel(missing, DENO, (l) => printed.push(l)), 1);
  const text = printed.join("\n");
  assert.match(text, /Jupyter was not found/);
  assert.ok(text.includes(`sudo apt-get install ${DEBIAN_PACKAGES}`));
  assert.ok(
    DEBIAN_PACKAGES.includes("python3-nbclient python3-nbformat jupyter-client python3-ipykernel"),
  );
  assert.ok(text.includes("pip install jupyterlab"));
  assert.deepEqual(calls, ["jupyter --version"], "nothing is installed");

  const dir = await Deno.makeTempDir({ prefix: "curbfit-nopath-" });
  try {
    const out = await new Deno.Command(DENO, {
      args: ["run", "--allow-read", "--allow-env", "--allow-run", `${ROOT}/lib/kernel/install.ts`],
      env: { PATH: dir },
      stdin: "null",
    }).output();
    assert.equal(out.code, 1);
    assert.match(new TextDecoder().decode(out.stdout), /pip install jupyterlab/);
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

Deno.test("kernel: the install command and the check that Jupyter lists it", async () => {
  const calls: string[] = [];
  const fake = (command: string, args: readonly string[]): Promise<CommandResult> => {
    calls.push([command, ...args].join(" "));
    const listing = {
      kernelspecs: {
        [KERNEL_NAME]: {
          resource_dir: "/k/curbfit",
          spec: { argv: [DENO, "jupyter", "--kernel"], display_name: KERNEL_DISPLAY_NAME },
        },
      },
    };
    const stdout = args.join(" ") === "kernelspec list --json"
      ? JSON.stringify(listing)
      : args[0] === "--version"
      ? "jupyter_core     : 4.12.0\njupyterlab       : 4.1.0\nnotebook         : not installed"
      : "";
    return Promise.resolve({ code: 0, stdout, stderr: "" });
  };
  const printed: string[] = [];
  assert.equal(await setUpKernel(fake, DENO, (l) => printed.push(l)), 0);
  assert.ok(
    calls.includes(
      `${DENO} jupyter --install --force --name ${KERNEL_NAME} --display ${KERNEL_DISPLAY_NAME}`,
    ),
    calls.join("\n"),
  );
  const text = printed.join("\n");
  assert.match(text, /front ends: JupyterLab\./);
  assert.match(text, /installed in \/k\/curbfit/);
  assert.match(text, /Change Kernel… → Deno \(curbfit\)/);
  assert.match(text, /VS Code: Select Kernel/);
});

/** Whether `jupyter` runs here. */
async function jupyterHere(): Promise<boolean> {
  return (await commandRunner()("jupyter", ["--version"])).code === 0;
}

Deno.test("kernel: `deno task kernel` installs the spec where Jupyter finds it", async () => {
  if (!(await jupyterHere())) return skipOrFail("kernel install", "no `jupyter` command");
  const dir = await Deno.makeTempDir({ prefix: "curbfit-xdg-" });
  try {
    // Deno and Jupyter both put user kernel specs under $XDG_DATA_HOME/jupyter on Linux, so
    // the user's own kernels are left alone.
    const out = await new Deno.Command(DENO, {
      args: ["task", "-q", "kernel"],
      cwd: ROOT,
      env: { XDG_DATA_HOME: dir },
      stdin: "null",
    }).output();
    const text = new TextDecoder().decode(out.stdout);
    assert.equal(out.code, 0, text + new TextDecoder().decode(out.stderr));
    const spec = JSON.parse(
      await Deno.readTextFile(`${dir}/jupyter/kernels/${KERNEL_NAME}/kernel.json`),
    );
    assert.equal(spec.display_name, KERNEL_DISPLAY_NAME);
    assert.deepEqual(spec.argv.slice(1), ["jupyter", "--kernel", "--conn", "{connection_file}"]);
    assert.equal(await Deno.realPath(spec.argv[0]), await Deno.realPath(DENO), "this Deno");
    assert.match(text, new RegExp(`installed in ${dir}/jupyter/kernels/${KERNEL_NAME}`));
    const again = await new Deno.Command(DENO, {
      args: ["task", "-q", "kernel"],
      cwd: ROOT,
      env: { XDG_DATA_HOME: dir },
      stdin: "null",
    }).output();
    assert.equal(again.code, 0, "a second run refreshes the spec");
  } finally {
    await Deno.remove(dir, { recursive: true });
  }
});

/** The first Python that has nbclient and finds `kernel` through JUPYTER_PATH, or undefined. */
async function notebookPython(env: Record<string, string>): Promise<string | undefined> {
  const candidates = [Deno.env.get("CURBFIT_PYTHON"), "python3", "/usr/bin/python3"];
  for (const python of new Set(candidates.filter((c): c is string => !!c))) {
    if ((await commandRunner(env)(python, [RUNNER, "--probe", KERNEL_NAME])).code === 0) {
      return python;
    }
  }
  return undefined;
}

interface Output {
  output_type: string;
  name?: string;
  data?: Record<string, unknown>;
  ename?: string;
  evalue?: string;
  text?: string | string[];
}

const joined = (t: unknown) => (Array.isArray(t) ? t.join("") : String(t ?? ""));

Deno.test("new-notebook: the starter notebook runs in Deno's kernel from a folder elsewhere", async () => {
  const tmp = await Deno.makeTempDir({ prefix: "curbfit-starter-" });
  try {
    const specDir = `${tmp}/jupyter/kernels/${KERNEL_NAME}`;
    await Deno.mkdir(specDir, { recursive: true });
    await Deno.writeTextFile(
      `${specDir}/kernel.json`,
      JSON.stringify({
        argv: [DENO, "jupyter", "--kernel", "--conn", "{connection_file}"],
        display_name: KERNEL_DISPLAY_NAME,
        language: "typescript",
      }),
    );
    const env = { JUPYTER_PATH: `${tmp}/jupyter` };
    const python = await notebookPython(env);
    if (python === undefined) {
      return skipOrFail("starter notebook", "no Python with nbclient, nbformat and jupyter_client");
    }
    const folder = `${tmp}/kiln-drying`;
    const made = await new Deno.Command(DENO, {
      args: ["task", "-q", "new-notebook", folder],
      cwd: ROOT,
      stdin: "null",
    }).output();
    assert.equal(made.code, 0, new TextDecoder().decode(made.stdout));
    const out = `${tmp}/out`;
    await Deno.mkdir(out);
    const ran = await commandRunner(env)(python, [
      RUNNER,
      KERNEL_NAME,
      `${folder}/analysis.ipynb`,
      out,
      "300",
    ]);
    assert.equal(ran.code, 0, ran.stderr);
    const nb = JSON.parse(await Deno.readTextFile(ran.stdout.split("\n").pop()!));
    const cells = new Map<string, Output[]>(
      nb.cells.filter((c: { cell_type: string }) => c.cell_type === "code")
        .map((c: { id: string; outputs: Output[] }) => [c.id, c.outputs]),
    );
    for (const [id, outputs] of cells) {
      for (const o of outputs) {
        assert.notEqual(o.output_type, "error", `${id}: ${o.ename}: ${o.evalue}`);
        assert.ok(!(o.output_type === "stream" && o.name === "stderr"), `${id}: ${joined(o.text)}`);
      }
    }
    const template = cells.get("template")!;
    assert.equal(template.length, 1, "one output: the progress line, updated in place");
    assert.equal(template[0].output_type, "display_data");
    const plain = joined(template[0].data?.["text/plain"]);
    assert.ok(!plain.startsWith("curbfit: "), `the result replaced the progress line: ${plain}`);
    assert.ok("text/html" in (template[0].data ?? {}));
    const call = cells.get("api-call")!;
    assert.equal(call.length, 1);
    const markdown = joined(call[0].data?.["text/markdown"]);
    assert.match(markdown, /^```ts\nimport \{ legendre, ridge, sweep \} from "curbfit";/);
    assert.match(markdown, /penalty: ridge\(\{ weights: "rising", exponent: 2 \}\)/);
    assert.ok(cells.get("compare")!.some((o) => o.output_type === "execute_result"));
  } finally {
    await Deno.remove(tmp, { recursive: true });
  }
});
