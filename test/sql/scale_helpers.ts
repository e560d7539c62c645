/**
 * Shared checks for the scale tests (streaming and SQL): seeded invented data with row keys,
 * the in-memory reference sweep on the same hash folds, and a comparison of two curves.
 */
import assert from "node:assert/strict";
import { explicitPlan, sweep, type SweepResult, tableFromColumns, type Term } from "../../mod.ts";
import { foldHash, foldsOfKeys } from "../../lib/stream/hash.ts";
import type { ScaleSweepResult } from "../../lib/stream/finish.ts";
import { syntheticColumns } from "../helpers.ts";

/** Invented rows: keys (beyond 2^31, spaced 7919 apart), a shard 1 or 2, x, z1, z2, y. */
export interface KeyedRows {
  readonly n: number;
  readonly ids: number[];
  readonly shard: number[];
  readonly columns: Record<string, number[]>;
}

export function keyedRows(seed: number, n: number): KeyedRows {
  const columns = syntheticColumns(seed, n, 2);
  return {
    n,
    ids: Array.from({ length: n }, (_, i) => 10_000_000_000 + 7919 * i),
    shard: Array.from({ length: n }, (_, i) => 1 + (i % 2)),
    columns,
  };
}

/** The in-memory sweep on the same folds: explicitPlan from the fold hash of the keys. */
export function memorySweep(
  columns: Record<string, number[]>,
  keys: readonly (number | string)[],
  terms: readonly Term[],
  k: number,
  seed: number,
): SweepResult {
  const plan = explicitPlan(keys.length, { assignment: foldsOfKeys(foldHash(seed, k), keys), k });
  return sweep(tableFromColumns(columns), { target: "y", terms, folds: plan, closedForm: false });
}

function relative(a: number, b: number, scale = Math.max(Math.abs(a), Math.abs(b))): number {
  return a === b ? 0 : Math.abs(a - b) / scale;
}

/**
 * Asserts that a scale sweep equals the in-memory sweep to `tol` relative: every curve column
 * (coefficient paths relative to their largest entry), the choice and the fitted model.
 * Returns the largest relative difference seen.
 */
export function assertSameSweep(
  got: ScaleSweepResult,
  want: SweepResult,
  tol: number,
): number {
  assert.equal(got.n, want.n);
  assert.deepEqual(got.names, want.names);
  assert.equal(got.curve.length, want.curve.length);
  let worst = 0;
  const check = (a: number, b: number, what: string, scale?: number) => {
    const r = relative(a, b, scale);
    worst = Math.max(worst, r);
    assert.ok(r <= tol, `${what}: ${a} vs ${b} (relative ${r})`);
  };
  got.curve.forEach((g, i) => {
    const w = want.curve[i];
    for (
      const key of [
        "strength",
        "cvMean",
        "cvSe",
        "trainMse",
        "foldTrainMse",
        "df",
        "budget",
        "gcv",
      ] as const
    ) {
      check(g[key] as number, w[key] as number, `curve[${i}].${key}`);
    }
    g.foldMse.forEach((v, f) => check(v, w.foldMse[f], `curve[${i}].foldMse[${f}]`));
    const top = Math.max(...w.path.map(Math.abs));
    g.path.forEach((v, q) => check(v, w.path[q], `curve[${i}].path[${q}]`, top));
  });
  assert.equal(got.chosen.index, want.chosen.index);
  const gs = got.fit.summary, ws = want.fit.summary;
  const top = Math.max(...ws.coefficients.map(Math.abs));
  gs.coefficients.forEach((v, q) => check(v, ws.coefficients[q], `coefficients[${q}]`, top));
  check(gs.intercept, ws.intercept, "intercept", Math.max(1, Math.abs(ws.intercept)));
  check(gs.df, ws.df, "df");
  check(gs.trainMse, ws.trainMse, "trainMse");
  gs.sds.forEach((v, q) => check(v, ws.sds[q], `sds[${q}]`));
  return worst;
}
