/**
 * Test helpers for the SQL engines: throwaway PostgreSQL servers on loopback ports (started and
 * stopped with pg-start.sh / pg-stop.sh beside this file), DuckDB availability, and the
 * SKIP-or-fail rule: a missing tool prints a visible `SKIP:` line locally and fails under CI=true.
 *
 * @module
 */
import pg from "pg";

const HERE = new URL(".", import.meta.url).pathname;

/** Whether CI is running (CI=true): missing tools are then failures, not skips. */
export function inCi(): boolean {
  return Deno.env.get("CI") === "true";
}

/**
 * Whether a tool is usable: if not, prints `SKIP: …` (or throws under CI=true) and says false.
 */
export function requireTool(available: boolean, what: string): boolean {
  if (available) return true;
  if (inCi()) throw new Error(`${what} is required under CI=true but is missing`);
  console.log(`SKIP: ${what} is not available here; the test did not run`);
  return false;
}

/** Whether PostgreSQL's server programs are installed. */
export function postgresInstalled(): boolean {
  try {
    for (const entry of Deno.readDirSync("/usr/lib/postgresql")) {
      try {
        Deno.statSync(`/usr/lib/postgresql/${entry.name}/bin/initdb`);
        return true;
      } catch { /* next */ }
    }
  } catch { /* no folder */ }
  return false;
}

/** Whether native add-ons (DuckDB) may load: --allow-ffi was given. */
export function ffiAllowed(): boolean {
  return Deno.permissions.querySync({ name: "ffi" }).state === "granted";
}

/** A free loopback port at or after `from`. */
function freePort(from: number): number {
  for (let port = from; port < from + 2000; port++) {
    try {
      const listener = Deno.listen({ hostname: "127.0.0.1", port });
      listener.close();
      return port;
    } catch { /* taken */ }
  }
  throw new Error("no free port found");
}

let nextPort = 41000 + (Deno.pid % 500) * 20;

/** A running throwaway server. */
export interface PostgresServer {
  readonly port: number;
  connect(): Promise<pg.Client>;
  stop(): Promise<void>;
}

async function script(name: string, args: string[]): Promise<string> {
  const out = await new Deno.Command("bash", { args: [`${HERE}${name}`, ...args] }).output();
  const text = new TextDecoder().decode(out.stdout) + new TextDecoder().decode(out.stderr);
  if (!out.success) throw new Error(`${name} failed: ${text}`);
  return text;
}

/** Starts a server in a new temporary folder on a free loopback port. */
export async function startPostgres(): Promise<PostgresServer> {
  const port = freePort(nextPort);
  nextPort = port + 1;
  const dir = `${await Deno.makeTempDir({ prefix: "curbfit-pg-" })}/server`;
  await script("pg-start.sh", [dir, String(port)]);
  return {
    port,
    async connect() {
      const client = new pg.Client({
        host: "127.0.0.1",
        port,
        user: "curbfit",
        database: "postgres",
      });
      client.on("error", () => {}); // a server stopped under an open client is not a test failure
      await client.connect();
      return client;
    },
    async stop() {
      await script("pg-stop.sh", [dir]);
      await Deno.remove(dir.slice(0, -"/server".length), { recursive: true }).catch(() => {});
    },
  };
}

/**
 * Makes `table` on the coordinator a table partitioned `BY LIST (shard)` whose partition i + 1 is
 * the foreign table `${table}_${i + 1}` on shard i (postgres_fdw; each shard already holds that
 * table), and turns on partition-wise aggregation. `columns` is the column list in SQL;
 * `serverOptions` are extra postgres_fdw server options (e.g. fdw_tuple_cost).
 */
export async function partitionOverShards(
  client: pg.Client,
  table: string,
  columns: string,
  shards: readonly PostgresServer[],
  serverOptions: Readonly<Record<string, string>> = {},
): Promise<void> {
  await client.query("CREATE EXTENSION postgres_fdw");
  await client.query(`CREATE TABLE ${table} (${columns}) PARTITION BY LIST (shard)`);
  const extra = Object.entries(serverOptions).map(([k, v]) => `, ${k} '${v}'`).join("");
  for (const [i, shard] of shards.entries()) {
    await client.query(
      `CREATE SERVER shard_${i + 1} FOREIGN DATA WRAPPER postgres_fdw ` +
        `OPTIONS (host '127.0.0.1', port '${shard.port}', dbname 'postgres'${extra})`,
    );
    await client.query(
      `CREATE USER MAPPING FOR curbfit SERVER shard_${i + 1} OPTIONS (user 'curbfit')`,
    );
    await client.query(
      `CREATE FOREIGN TABLE ${table}_${i + 1} PARTITION OF ${table} FOR VALUES IN (${i + 1}) ` +
        `SERVER shard_${i + 1} OPTIONS (table_name '${table}_${i + 1}')`,
    );
  }
  await client.query("SET enable_partitionwise_aggregate = on");
}

/** Runs `body` with a connection to a fresh in-memory DuckDB database, closed afterwards. */
export async function withDuckDB(
  body: (con: import("@duckdb/node-api").DuckDBConnection) => Promise<void>,
): Promise<void> {
  const { DuckDBInstance } = await import("@duckdb/node-api");
  const db = await DuckDBInstance.create(":memory:");
  const con = await db.connect();
  try {
    await body(con);
  } finally {
    con.closeSync();
    db.closeSync();
  }
}
