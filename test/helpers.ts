/**
 * Shared test helpers: seeded synthetic data (invented, for tests only) and row subsets.
 */
import { SeededStream } from "../lib/folds/mod.ts";
import { type Table, tableFromColumns } from "../mod.ts";

/** Standard normal draws by Box–Muller from a seeded stream. */
export function normals(stream: SeededStream, n: number): Float64Array {
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const u = 1 - stream.nextDouble();
    const v = stream.nextDouble();
    out[i] = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * v);
  }
  return out;
}

/** A seeded regression problem: columns x (uniform on [-3, 5]), z1..zk (normal), y. */
export function syntheticColumns(
  seed: number,
  n: number,
  extra = 2,
  noise = 0.3,
): Record<string, number[]> {
  const s = new SeededStream(seed);
  const x = Array.from({ length: n }, () => -3 + 8 * s.nextDouble());
  const cols: Record<string, number[]> = { x };
  const y = x.map((v) => Math.sin(v) + 0.2 * v);
  for (let j = 1; j <= extra; j++) {
    const z = Array.from(normals(s, n));
    cols[`z${j}`] = z;
    z.forEach((v, i) => (y[i] += (j % 2 ? 0.5 : -0.25) * v));
  }
  const e = normals(s, n);
  cols.y = y.map((v, i) => v + noise * e[i]);
  return cols;
}

/** The table made of the given rows of numeric columns. */
export function subsetColumns(cols: Record<string, number[]>, rows: ArrayLike<number>): Table {
  const out: Record<string, number[]> = {};
  for (const [k, v] of Object.entries(cols)) out[k] = Array.from(rows, (i) => v[i]);
  return tableFromColumns(out);
}

/** |a − b| / max(|b|, tiny). */
export function relErr(a: number, b: number): number {
  return Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
}

/**
 * Asserts that two plain values have the same shape and equal non-numbers, and that every pair
 * of numbers agrees to `tolerance` relative (or is equal, NaN included). Names the first path
 * that differs.
 */
export function assertNumbersClose(
  actual: unknown,
  expected: unknown,
  tolerance: number,
  path = "value",
): void {
  if (typeof actual === "number" && typeof expected === "number") {
    if (Object.is(actual, expected) || relErr(actual, expected) <= tolerance) return;
    throw new Error(`${path}: ${actual} vs ${expected} (relative ${relErr(actual, expected)})`);
  }
  if (typeof actual !== "object" || actual === null || typeof expected !== "object") {
    if (actual !== expected) throw new Error(`${path}: ${String(actual)} vs ${String(expected)}`);
    return;
  }
  const keys = new Set([...Object.keys(actual), ...Object.keys(expected ?? {})]);
  for (const key of keys) {
    assertNumbersClose(
      (actual as Record<string, unknown>)[key],
      (expected as Record<string, unknown>)[key],
      tolerance,
      `${path}.${key}`,
    );
  }
}
