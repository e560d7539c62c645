/**
 * Scale benchmark (not a test): the sweep over n rows, p = 20 and 50 design columns, 10 hash
 * folds × 100 λ, for the streaming CSV reader, DuckDB (its own table and a Parquet file) and a
 * PostgreSQL server, beside the in-memory sweep where it fits. Each job runs in a fresh Deno
 * process (test/bench/scale_case.ts), which reports wall time (whole call, including every
 * pass or query and the solve), peak resident memory (VmHWM of the Deno process — for
 * PostgreSQL the server's own memory is not included) and rows per second (n / wall time).
 *
 * Options: --n=1000000 (rows), --p=20,50, --jobs=stream,duckdb,parquet,postgres,memory,
 * --memory-max-n=1000000 (largest n for the in-memory job), --dir=PATH (data folder, removed at
 * the end unless --keep). Prints a Markdown table.
 *
 * Run: deno run -A test/bench/scale.ts --n=1000000
 *
 * @module
 */
const HERE = new URL(".", import.meta.url).pathname;

function option(name: string, fallback: string): string {
  return Deno.args.find((a) => a.startsWith(`--${name}=`))?.slice(name.length + 3) ?? fallback;
}

const n = Number(option("n", "1000000"));
const ps = option("p", "20,50").split(",").map(Number);
const jobs = option("jobs", "stream,duckdb,parquet,postgres,memory").split(",");
const memoryMaxN = Number(option("memory-max-n", "1000000"));
const dir = option("dir", `${Deno.makeTempDirSync({ prefix: "curbfit-scale-" })}`);
const keep = Deno.args.includes("--keep");

async function runCase(args: string[]): Promise<Record<string, unknown>> {
  const out = await new Deno.Command(Deno.execPath(), {
    args: ["run", "-A", `${HERE}scale_case.ts`, ...args, `--dir=${dir}`, `--n=${n}`],
    stdout: "piped",
    stderr: "piped",
  }).output();
  const text = new TextDecoder().decode(out.stdout).trim().split("\n").at(-1) ?? "";
  if (!out.success) {
    return { failure: new TextDecoder().decode(out.stderr).split("\n").slice(0, 3).join(" ") };
  }
  return JSON.parse(text);
}

async function bash(script: string, args: string[]): Promise<string> {
  const out = await new Deno.Command("bash", { args: [`${HERE}../sql/${script}`, ...args] })
    .output();
  if (!out.success) throw new Error(new TextDecoder().decode(out.stderr));
  return new TextDecoder().decode(out.stdout);
}

const rows: string[] = [];
const generated = await runCase(["--job=generate"]);
console.error(`generated ${n} rows in ${Number(generated.seconds).toFixed(1)} s`);

let pgDir: string | null = null;
let port = 0;
let loadSeconds = NaN;
if (jobs.includes("postgres")) {
  pgDir = `${dir}/pg`;
  port = 45000 + (Deno.pid % 1000);
  const bindir = (await bash("pg-start.sh", [pgDir, String(port)])).trim();
  await Deno.chmod(dir, 0o755);
  await Deno.chmod(`${dir}/data.csv`, 0o644);
  const t0 = performance.now();
  const psql = (sql: string) =>
    new Deno.Command(`${bindir}/psql`, {
      args: ["-h", "127.0.0.1", "-p", String(port), "-U", "curbfit", "-d", "postgres", "-c", sql],
      stdout: "null",
    }).output();
  await psql(
    "CREATE TABLE obs (id BIGINT, x DOUBLE PRECISION, z1 DOUBLE PRECISION, z2 DOUBLE PRECISION, " +
      "z3 DOUBLE PRECISION, z4 DOUBLE PRECISION, y DOUBLE PRECISION)",
  );
  await psql(`COPY obs FROM '${dir}/data.csv' (FORMAT csv, HEADER)`);
  await psql("VACUUM ANALYZE obs");
  loadSeconds = (performance.now() - t0) / 1000;
  console.error(`loaded PostgreSQL in ${loadSeconds.toFixed(1)} s`);
}

try {
  for (const p of ps) {
    for (const job of jobs) {
      if (job === "memory" && n > memoryMaxN) {
        rows.push(`| ${job} | ${n} | ${p} | skipped (n > ${memoryMaxN}) | | | |`);
        continue;
      }
      const r = await runCase([`--job=${job}`, `--p=${p}`, `--port=${port}`]);
      console.error(JSON.stringify(r));
      if ("failure" in r) {
        rows.push(`| ${job} | ${n} | ${p} | failed: ${String(r.failure).slice(0, 80)} | | | |`);
        continue;
      }
      const s = Number(r.seconds), mem = Number(r.peakMiB), rate = Number(r.rowsPerSecond);
      rows.push(
        `| ${job} | ${n} | ${p} | ${s.toFixed(1)} | ${mem.toFixed(0)} | ${
          (rate / 1e6).toFixed(2)
        } | ` +
          `${Number(r.lambda).toPrecision(6)} |`,
      );
    }
  }
} finally {
  if (pgDir !== null) await bash("pg-stop.sh", [pgDir]);
  if (!keep) await Deno.remove(dir, { recursive: true }).catch(() => {});
}

console.log("| source | n | p | wall s | peak MiB | M rows/s | chosen λ |");
console.log("| --- | --- | --- | --- | --- | --- | --- |");
for (const r of rows) console.log(r);
if (Number.isFinite(loadSeconds)) {
  console.log(`\nPostgreSQL load (COPY + VACUUM ANALYZE): ${loadSeconds.toFixed(1)} s`);
}
