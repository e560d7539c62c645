/**
 * Outside reference: the 11 NIST StRD linear least-squares datasets with certified values
 * (NIST/ITL Statistical Reference Datasets; test/fixtures/nist-strd/README.md). Each is fitted at
 * λ = 0 through the public API — `power` terms for the polynomial sets, plain columns for Longley,
 * no intercept for NoInt1/NoInt2 — and scored by the log relative error (LRE) that NIST's
 * documentation and McCullough (1998, "Assessing the reliability of statistical software",
 * The American Statistician 52) use: LRE = −log10(|estimate − certified| / |certified|),
 * capped at 15; with a certified value of 0, −log10|estimate|.
 */
import assert from "node:assert/strict";
import { column, fit, power, readCsv } from "../mod.ts";

const dir = new URL("./fixtures/nist-strd/", import.meta.url);
const certified = JSON.parse(await Deno.readTextFile(new URL("certified.json", dir))).datasets;

function lre(estimate: number, cert: number): number {
  if (estimate === cert) return 15;
  const err = cert === 0 ? Math.abs(estimate) : Math.abs(estimate - cert) / Math.abs(cert);
  return Math.min(15, -Math.log10(err));
}

for (const name of Object.keys(certified)) {
  const c = certified[name];
  Deno.test(`NIST StRD ${name}: certified coefficients to LRE >= 11, residual SD to LRE >= 10`, async () => {
    const table = await readCsv(new URL(`${name}.csv`, dir));
    const terms = c.predictors.length === 1
      ? [power("x", c.degree)]
      : c.predictors.map((p: string) => column(p));
    const m = fit(table, { target: "y", terms, lambda: 0, intercept: c.intercept });
    const s = m.summary;
    const estimates = c.intercept ? [s.intercept, ...s.coefficients] : [...s.coefficients];
    assert.equal(estimates.length, c.coefficients.length);
    c.coefficients.forEach((cc: { name: string; estimate: string }, k: number) => {
      const score = lre(estimates[k], Number(cc.estimate));
      assert.ok(
        score >= 11,
        `${name} ${cc.name}: LRE ${score.toFixed(2)} (${estimates[k]} vs ${cc.estimate})`,
      );
    });
    const sdScore = lre(s.residualSd, Number(c.residualSD));
    assert.ok(sdScore >= 10, `${name} residual SD: LRE ${sdScore.toFixed(2)}`);
  });
}
