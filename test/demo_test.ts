/**
 * The demo (`deno task demo`) runs the main job on the invented orchard data into a temporary
 * folder through the real deno.json task (so its permission flags are tested too), and the
 * record it writes verifies through the command line (exit code 0).
 */
import assert from "node:assert/strict";
import { join } from "node:path";
import { parseRecord, type RidgeModelSection } from "../lib/record/mod.ts";
import { assertInertHtml, ROOT, runTask } from "./fixtures/cli/helpers.ts";

async function denoTask(args: readonly string[]) {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["task", ...args],
    cwd: ROOT,
    stdin: "null",
    stdout: "piped",
    stderr: "piped",
    env: { NO_COLOR: "1" },
  }).output();
  const text = new TextDecoder();
  return { code: out.code, stdout: text.decode(out.stdout), stderr: text.decode(out.stderr) };
}

Deno.test("demo: deno task demo writes the report and a record that verifies", async () => {
  const dir = await Deno.makeTempDir();
  const out = join(dir, "demo out");
  const ran = await denoTask(["demo", "--out", out]);
  assert.equal(ran.code, 0, ran.stderr);
  for (const f of ["report.html", "statement.md", "record.json"]) {
    assert.ok(ran.stdout.includes(join(out, f)), `the demo prints where ${f} is`);
  }
  assert.match(ran.stdout, /Timings: /);
  assert.match(ran.stdout, /Check it: deno task curbfit verify /);

  const json = await Deno.readTextFile(join(out, "record.json"));
  const record = parseRecord(json);
  assert.equal(record.kind, "comparison");
  assert.equal(record.data.source, "examples/data/orchard.csv");
  assert.equal(record.data.rows, 36);
  assert.deepEqual([record.folds.k, record.folds.seed], [8, 7]);
  const [decay, low, weighted] = record.models as RidgeModelSection[];
  assert.deepEqual(decay.terms.map((t) => t.label), [
    "legendre(days_since_blossom, 12)",
    "column(shade_share)",
    "indicators(watering)",
  ]);
  assert.equal(decay.penalty.weights, "equal");
  assert.equal(decay.grid.kind, "automatic");
  assert.equal(low.terms[0].label, "legendre(days_since_blossom, 2)");
  assert.deepEqual(low.grid.values, [0]);
  assert.deepEqual([weighted.penalty.weights, weighted.penalty.exponent], ["rising", 2]);
  assert.ok(record.models.every((m) => m.choice.rule === "one-se"));

  assertInertHtml(await Deno.readTextFile(join(out, "report.html")));

  const verified = await runTask("curbfit", [
    "verify",
    join(out, "record.json"),
    "--data",
    "examples/data/orchard.csv",
  ]);
  assert.equal(verified.code, 0, verified.stdout + verified.stderr);
  assert.match(verified.stdout, /^Record check: MATCH/);

  const again = join(dir, "again");
  assert.equal((await denoTask(["demo", `--out=${again}`])).code, 0);
  assert.equal(await Deno.readTextFile(join(again, "record.json")), json, "same record bytes");
  await Deno.remove(dir, { recursive: true });
});

Deno.test("demo: an unknown argument is one line on stderr and exit code 2", async () => {
  const ran = await runTask("demo", ["--outdir", "x"]);
  assert.equal(ran.code, 2);
  assert.equal(ran.stderr.trimEnd().split("\n").length, 1, ran.stderr);
  assert.match(ran.stderr, /--outdir/);
});
