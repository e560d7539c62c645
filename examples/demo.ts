/**
 * The main job on the invented orchard data (examples/data/orchard.csv, 36 rows; see
 * make_orchard.ts): how flexible may the season curve of apple sugar (°Brix) against days since
 * blossom be, and how hard should it be reined in?
 *
 * Three candidates share one seeded 8-fold plan:
 * 1. a degree-12 Legendre expansion of days_since_blossom (plus shade_share and watering) with
 *    plain weight decay (γ = 1), λ swept over an automatic grid;
 * 2. a degree-2 expansion with no penalty (λ = 0 only);
 * 3. the degree-12 expansion with an order-weighted penalty, γ_q = order², so high orders cost
 *    more.
 * Each candidate's λ is chosen by the one-standard-error rule; candidates are compared by their
 * paired fold errors. The statement (report.html, statement.md) and the model-choice record
 * (record.json) are written to out/demo/, or to the folder given with --out.
 *
 * Run from a checkout: `deno task demo` (or `npx -y deno@2.9.6 task demo`);
 * `deno task demo --out some/folder` to write elsewhere. Check the record afterwards with the
 * printed `deno task curbfit verify …` command.
 *
 * Caution: the data are invented, the cross-validation error is an estimate and not a
 * guarantee, and the curves say nothing reliable outside days 63–169.
 *
 * @module
 */
import { join, relative } from "node:path";
import { fileURLToPath } from "node:url";
import { column, compare, indicators, legendre, readCsv, recordJson, ridge } from "../mod.ts";
import { writeChoice } from "../lib/cli/output.ts";

/** The output folder: `--out DIR` (or `--out=DIR`), else out/demo. */
function outFolder(args: readonly string[]): string {
  if (args.length === 0) return join("out", "demo");
  const [first, second] = args;
  if (first.startsWith("--out=") && args.length === 1) return first.slice("--out=".length);
  if (first === "--out" && second !== undefined && args.length === 2) return second;
  console.error(
    `demo: expected no arguments or --out DIR, but got ${JSON.stringify(args.join(" "))}`,
  );
  Deno.exit(2);
}

const started = performance.now();
const seconds = () => ((performance.now() - started) / 1000).toFixed(2);

const out = outFolder(Deno.args);
const dataPath = relative(
  Deno.cwd(),
  fileURLToPath(new URL("./data/orchard.csv", import.meta.url)),
);
const orchard = await readCsv(dataPath);

const shared = [column("shade_share"), indicators("watering")];
const flexible = [legendre("days_since_blossom", 12), ...shared];
const result = compare(orchard, [
  { name: "degree 12, weight decay", terms: flexible, penalty: ridge() },
  {
    name: "degree 2, no penalty",
    terms: [legendre("days_since_blossom", 2), ...shared],
    lambdas: [0],
  },
  {
    name: "degree 12, order-weighted γ = order²",
    terms: flexible,
    penalty: ridge({ weights: "rising", exponent: 2 }),
  },
], { target: "brix", folds: { k: 8, seed: 7 }, rule: "one-se" });
const fitted = seconds();

console.log(await writeChoice(out, recordJson(result), dataPath, "demo"));
console.log(`\nTimings: sweeps and comparison ${fitted} s; total with the report ${seconds()} s.`);
