/**
 * The exact solver and the constraint form, on seeded invented problems, checked against
 * identities of the trade rather than against itself:
 * - the solution satisfies the penalized normal equations (Zᵀ Z + Λ) θ = Zᵀ y, Λ = diag(0, λγ s²)
 *   (first-order optimality of a strictly convex quadratic; common practice), formed here
 *   independently in double-double;
 * - df(λ) and C(λ) fall as λ grows (Hastie, Tibshirani & Friedman, ESL 2nd ed., §3.4.1);
 * - budget → λ → budget round trip.
 */
import assert from "node:assert/strict";
import { column, CurbfitError, fit, legendre, power, ridge, tableFromColumns } from "../mod.ts";
import { DDAccumulator } from "../lib/numeric/dd.ts";
import { buildDesign } from "../lib/design/mod.ts";
import { relErr, syntheticColumns } from "./helpers.ts";

/** max_q |((ZᵀZ + Λ)θ − Zᵀy)_q| / max_q |(Zᵀy)_q| for the fit's own design. */
function normalEquationResidual(m: ReturnType<typeof fit>, cols: Record<string, number[]>): number {
  const table = tableFromColumns(cols);
  const d = buildDesign(m.terms, table);
  const { n, p, hi, lo } = d.block;
  const s = m.summary;
  const y = cols[s.target];
  const theta = [s.intercept, ...s.coefficients];
  const col = (
    i: number,
    j: number,
  ) => (j === 0 ? 1 : hi[i * p + j - 1] + (lo?.[i * p + j - 1] ?? 0));
  const acc = new DDAccumulator();
  let worst = 0, scale = 0;
  for (let j = 0; j <= p; j++) {
    acc.reset();
    for (let i = 0; i < n; i++) {
      let fitted = 0;
      for (let k = 0; k <= p; k++) fitted += col(i, k) * theta[k];
      acc.addProduct(col(i, j), fitted - y[i]);
    }
    if (j > 0) acc.add(s.strength * s.gamma[j - 1] * s.sds[j - 1] ** 2 * theta[j]);
    let zty = 0;
    for (let i = 0; i < n; i++) zty += col(i, j) * y[i];
    worst = Math.max(worst, Math.abs(acc.value()));
    scale = Math.max(scale, Math.abs(zty));
  }
  return worst / scale;
}

Deno.test("ridge solutions satisfy the penalized normal equations to 1e-10", () => {
  for (const seed of [1, 2, 3, 4, 5]) {
    const cols = syntheticColumns(seed, 40 + 10 * seed);
    for (const lambda of [0, 1e-3, 0.7, 25, 1e4]) {
      for (const standardize of [true, false]) {
        const m = fit(cols, {
          target: "y",
          terms: [legendre("x", 6), column("z1"), column("z2")],
          lambda,
          standardize,
          penalty: ridge({ weights: seed % 2 ? "equal" : "rising", exponent: 2 }),
        });
        const r = normalEquationResidual(m, cols);
        assert.ok(r < 1e-10, `seed ${seed} λ ${lambda} standardize ${standardize}: ${r}`);
      }
    }
  }
});

Deno.test("df(λ) and C(λ) decrease with λ; λ = 0 gives df = p", () => {
  const cols = syntheticColumns(9, 60);
  const terms = [legendre("x", 8), column("z1")];
  let previous = { df: Infinity, budget: Infinity };
  for (const lambda of [0, 0.01, 0.1, 1, 10, 100, 1000]) {
    const s = fit(cols, { target: "y", terms, lambda }).summary;
    if (lambda === 0) assert.ok(relErr(s.df, 9) < 1e-12);
    assert.ok(s.df < previous.df && s.budget < previous.budget, `λ ${lambda}`);
    previous = s;
  }
});

Deno.test("budget → λ → budget round trip to 1e-10; a loose budget gives λ = 0", () => {
  const cols = syntheticColumns(12, 70);
  const terms = [legendre("x", 10), column("z2")];
  const free = fit(cols, { target: "y", terms, lambda: 0 }).summary;
  for (const share of [0.9, 0.5, 0.1, 1e-3]) {
    const budget = share * free.budget;
    const m = fit(cols, { target: "y", terms, budget }).summary;
    assert.ok(m.strength > 0);
    assert.ok(relErr(m.budget, budget) < 1e-10, `share ${share}: ${m.budget} vs ${budget}`);
    const again = fit(cols, { target: "y", terms, lambda: m.strength }).summary;
    assert.ok(relErr(again.budget, budget) < 1e-10);
  }
  const loose = fit(cols, { target: "y", terms, budget: 2 * free.budget }).summary;
  assert.equal(loose.strength, 0);
});

Deno.test("coefficients on both scales agree: w*_q = s_q w_q and the intercept at the means", () => {
  const cols = syntheticColumns(4, 50);
  const s = fit(cols, { target: "y", terms: [power("x", 3), column("z1")], lambda: 2 }).summary;
  s.coefficients.forEach((w, q) =>
    assert.ok(relErr(s.standardized.coefficients[q], w * s.sds[q]) < 1e-15)
  );
  const atMeans = s.intercept + s.coefficients.reduce((a, w, q) => a + w * s.means[q], 0);
  assert.ok(relErr(s.standardized.intercept, atMeans) < 1e-14);
});

Deno.test("the fit object is immutable and predicts; extrapolation is counted, not hidden", () => {
  const cols = syntheticColumns(6, 40);
  const m = fit(cols, { target: "y", terms: [legendre("x", 4)], lambda: 0.1 });
  assert.ok(
    Object.isFrozen(m) && Object.isFrozen(m.summary) && Object.isFrozen(m.summary.coefficients),
  );
  assert.throws(() => ((m.summary.coefficients as number[])[0] = 1));
  const p = m.predict({ x: [0, 1, 10, -9] });
  assert.equal(p.values.length, 4);
  assert.deepEqual(p.outside, [{ label: "legendre(x, 4)", count: 2 }]);
});

function expectCode(code: string, f: () => unknown, pattern: RegExp) {
  assert.throws(f, (e: unknown) => {
    assert.ok(e instanceof CurbfitError, String(e));
    assert.equal(e.code, code);
    assert.match(e.message, pattern);
    return true;
  });
}

Deno.test("bad fit requests name the option or column at fault", () => {
  const cols = syntheticColumns(7, 30);
  const snapshot = structuredClone(cols);
  const terms = [legendre("x", 3)];
  expectCode(
    "UNKNOWN_COLUMN",
    () => fit(cols, { target: "sales", terms }),
    /target column "sales".*Choose one of: x, z1, z2, y/,
  );
  expectCode(
    "CONSTANT_TARGET",
    () => fit({ x: [1, 2, 3], y: [5, 5, 5] }, { target: "y", terms }),
    /same value \(5\) in all 3 rows/,
  );
  expectCode(
    "BAD_OPTION",
    () => fit(cols, { target: "y", terms, lambda: -1 }),
    /option lambda: lambda is -1/,
  );
  expectCode(
    "BAD_OPTION",
    () => fit(cols, { target: "y", terms, lambda: 1, budget: 2 }),
    /both lambda and budget/,
  );
  expectCode("BAD_OPTION", () => fit(cols, { target: "y", terms, budget: 0 }), /option budget/);
  expectCode("BAD_OPTION", () => fit(cols, { target: "y", terms: [] }), /option terms/);
  expectCode(
    "BAD_OPTION",
    () => fit(cols, { target: "x", terms }),
    /also an input of legendre\(x, 3\)/,
  );
  expectCode(
    "RANK_DEFICIENT",
    () =>
      fit({ a: [1, 2, 3, 4, 5], b: [2, 4, 6, 8, 10], y: [1, 3, 2, 5, 4] }, {
        target: "y",
        terms: [column("a"), column("b")],
        standardize: false,
      }),
    /columns a, b are \(nearly\) linearly dependent/,
  );
  expectCode(
    "TOO_FEW_ROWS",
    () => fit({ x: [1, 2, 3], y: [1, 4, 2] }, { target: "y", terms: [power("x", 3)] }),
    /3 rows cannot determine 4 coefficients/,
  );
  expectCode(
    "BAD_OPTION",
    () => fit(cols, { target: "y", terms, penalty: ridge({ weights: [1, 2] }) }),
    /2 weights were given for 3 design columns/,
  );
  assert.deepEqual(cols, snapshot, "caller data unchanged");
});
