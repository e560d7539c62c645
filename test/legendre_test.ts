/**
 * Legendre polynomials: special values, orthogonality, closed forms, stability at high degree
 * against exact rational arithmetic, and the change of basis between two domains.
 */
import assert from "node:assert/strict";
import {
  buildDesign,
  learnTerms,
  legendre,
  legendreRebase,
  legendreValues,
} from "../lib/design/mod.ts";
import type { Table } from "../lib/table/types.ts";

/** One numeric column "x" as a table. */
function tableOfX(values: readonly number[]): Table {
  return {
    nRows: values.length,
    names: ["x"],
    columns: new Map([["x", { kind: "number", name: "x", values: Float64Array.from(values) }]]),
    source: "test",
    lineOfRow: Int32Array.from(values, (_, i) => i + 2),
    missing: { policy: "error", droppedLines: [] },
  };
}

Deno.test("P_n(1) = 1 and P_n(-1) = (-1)^n for n <= 60", () => {
  // Source: A&S ch. 22 special values (recalled from memory); also immediate from Bonnet's
  // recurrence, where every step at t = ±1 is exact in floating point, so equality is exact.
  const plus = legendreValues(1, 60);
  const minus = legendreValues(-1, 60);
  for (let n = 0; n <= 60; n++) {
    assert.equal(plus[n], 1, `P_${n}(1)`);
    assert.equal(minus[n], n % 2 === 0 ? 1 : -1, `P_${n}(-1)`);
  }
});

/**
 * Gauss–Legendre nodes and weights on [−1, 1], computed here independently of the library:
 * Newton's method on P_N, with P_N and P_{N−1} from the three-term recurrence and
 * P'_N = N (t P_N − P_{N−1}) / (t² − 1); weights 2 / ((1 − t²) P'_N²) (A&S 25.4.29,
 * recalled from memory). Initial guesses cos(π (i − 1/4) / (N + 1/2)) (common practice).
 */
function gaussLegendre(count: number): { nodes: number[]; weights: number[] } {
  const nodes: number[] = [];
  const weights: number[] = [];
  for (let i = 1; i <= count; i++) {
    let t = Math.cos(Math.PI * (i - 0.25) / (count + 0.5));
    let derivative = 0;
    for (let step = 0; step < 100; step++) {
      let p0 = 1;
      let p1 = t;
      for (let k = 1; k < count; k++) [p0, p1] = [p1, ((2 * k + 1) * t * p1 - k * p0) / (k + 1)];
      derivative = count * (t * p1 - p0) / (t * t - 1);
      const change = p1 / derivative;
      t -= change;
      if (Math.abs(change) < 1e-16) break;
    }
    nodes.push(t);
    weights.push(2 / ((1 - t * t) * derivative * derivative));
  }
  return { nodes, weights };
}

Deno.test("orthogonality: ∫ P_m P_n dt = 2/(2n+1) δ_mn for m, n <= 30 (64-point Gauss–Legendre)", () => {
  // Source: A&S 22.2.10 (orthogonality of P_n on [−1, 1] with weight 1), recalled from memory.
  // A 64-point rule integrates polynomials of degree <= 127 exactly, so only rounding remains;
  // tolerance 1e-13 absolute (observed worst about 1e-15).
  const { nodes, weights } = gaussLegendre(64);
  assert.ok(Math.abs(weights.reduce((a, b) => a + b, 0) - 2) < 1e-14, "weights sum to 2");
  const values = nodes.map((t) => legendreValues(t, 30));
  let worst = 0;
  for (let m = 0; m <= 30; m++) {
    for (let n = 0; n <= m; n++) {
      let integral = 0;
      for (let q = 0; q < 64; q++) integral += weights[q] * values[q][m] * values[q][n];
      const expected = m === n ? 2 / (2 * n + 1) : 0;
      worst = Math.max(worst, Math.abs(integral - expected));
      assert.ok(Math.abs(integral - expected) < 1e-13, `m=${m} n=${n}: ${integral}`);
    }
  }
  assert.ok(worst > 0, "the check is not vacuous");
});

Deno.test("closed forms P_2..P_5 and their values at 0.5", () => {
  // Closed forms (A&S Table 22.9 coefficients, recalled from memory; re-derived here from the
  // recurrence by hand): P2 = (3t²−1)/2, P3 = (5t³−3t)/2, P4 = (35t⁴−30t²+3)/8,
  // P5 = (63t⁵−70t³+15t)/8. At t = 0.5 they give −0.125, −0.4375, −0.2890625, 0.08984375
  // (exact binary fractions; recalled from memory and verified from the closed forms).
  const closed = [
    (t: number) => (3 * t ** 2 - 1) / 2,
    (t: number) => (5 * t ** 3 - 3 * t) / 2,
    (t: number) => (35 * t ** 4 - 30 * t ** 2 + 3) / 8,
    (t: number) => (63 * t ** 5 - 70 * t ** 3 + 15 * t) / 8,
  ];
  const atHalf = [-0.125, -0.4375, -0.2890625, 0.08984375];
  const half = legendreValues(0.5, 5);
  closed.forEach((form, i) => {
    assert.equal(form(0.5), atHalf[i], `closed form P${i + 2}(0.5)`);
    assert.ok(Math.abs(half[i + 2] - atHalf[i]) <= 1e-16, `P${i + 2}(0.5) = ${half[i + 2]}`);
  });
  for (let t = -1; t <= 1; t += 1 / 64) {
    const v = legendreValues(t, 5);
    closed.forEach((form, i) => assert.ok(Math.abs(v[i + 2] - form(t)) < 1e-14, `P${i + 2}(${t})`));
  }
});

/**
 * P_n(a / 2^s) exactly, as a double: with Q_n = n! 2^{sn} P_n the recurrence becomes the integer
 * recurrence Q_{n+1} = (2n+1) a Q_n − n² 4^s Q_{n−1}, Q_0 = 1, Q_1 = a (derived from Bonnet's).
 */
function exactLegendre(a: bigint, s: bigint, degree: number): number[] {
  const out = [1];
  let q0 = 1n;
  let q1 = a;
  let factorial = 1n;
  const scale = 2n ** 80n;
  for (let n = 1; n <= degree; n++) {
    factorial *= BigInt(n);
    out.push(Number((q1 * scale) / (factorial * 2n ** (s * BigInt(n)))) / 2 ** 80);
    const bn = BigInt(n);
    [q0, q1] = [q1, (2n * bn + 1n) * a * q1 - bn * bn * 4n ** s * q0];
  }
  return out;
}

Deno.test("stable to degree 200 on [-1, 1]: matches exact rational values", () => {
  // Reference: exact BigInt rational recurrence at dyadic points (exact computation). Forward
  // recurrence on |t| <= 1 has error growing about linearly in n (common practice);
  // tolerance 1e-13 absolute (|P_n| <= 1 there).
  const points: [bigint, bigint][] = [[0n, 0n], [1n, 1n], [-1023n, 10n], [77n, 7n], [63n, 9n], [
    -5n,
    3n,
  ], [4095n, 12n]];
  let worst = 0;
  for (const [a, s] of points) {
    const t = Number(a) / 2 ** Number(s);
    const exact = exactLegendre(a, s, 200);
    const got = legendreValues(t, 200);
    for (let n = 0; n <= 200; n++) {
      const error = Math.abs(got[n] - exact[n]);
      worst = Math.max(worst, error);
      assert.ok(error < 1e-13, `P_${n}(${t}): ${got[n]} vs exact ${exact[n]}`);
    }
  }
  console.log(`worst |error| up to degree 200: ${worst.toExponential(2)}`);
});

Deno.test("legendre term maps its learned domain ends to ±1", () => {
  // Source: definition of the affine map (common practice); P_n(±1) as above.
  const table = tableOfX([3.7, -2.1, 0.4, 9.25]);
  const design = buildDesign(learnTerms([legendre("x", 50)], table), table);
  for (let n = 1; n <= 50; n++) {
    assert.equal(design.block.hi[3 * 50 + n - 1], 1, `P${n} at the maximum`);
    assert.equal(design.block.hi[1 * 50 + n - 1], n % 2 === 0 ? 1 : -1, `P${n} at the minimum`);
  }
});

/** [1, P_1..P_d] of x on `domain`, from the library's term. */
function basisRow(x: number, domain: [number, number], degree: number): number[] {
  const table = tableOfX([x]);
  const design = buildDesign(learnTerms([legendre("x", degree, { domain })], table), table);
  return [1, ...design.block.hi];
}

Deno.test("legendreRebase reproduces the other domain's columns to 1e-12", () => {
  // Reference: direct evaluation of both bases (the identity the matrix must satisfy);
  // tolerance 1e-12 relative to max(1, |value|), as the sweep needs. x runs over the `from`
  // domain, as in the sweep (the design's domain holds every row). Degree <= 25: beyond that a
  // narrower `to` domain makes T's entries large (P_d^to grows outside its own domain), and
  // applying T loses about log10(max|T|) digits; T itself stays accurate (next test).
  const from: [number, number] = [10, 20];
  for (const to of [[10.3, 20.4], [9.8, 19.5], [10.1, 20.6]] as [number, number][]) {
    for (const degree of [1, 5, 12, 25]) {
      const T = legendreRebase(from, to, degree);
      const size = degree + 1;
      let worst = 0;
      for (let x = 10; x <= 20; x += 0.0625) {
        const a = basisRow(x, from, degree);
        const b = basisRow(x, to, degree);
        for (let j = 0; j < size; j++) {
          let sum = 0;
          for (let i = 0; i <= j; i++) sum += a[i] * T[i * size + j];
          worst = Math.max(worst, Math.abs(sum - b[j]) / Math.max(1, Math.abs(b[j])));
        }
      }
      assert.ok(worst < 1e-12, `to [${to}] degree ${degree}: worst ${worst}`);
    }
  }
});

/** Exact fractions [numerator, denominator > 0] in lowest terms, for the reference below. */
type Fraction = readonly [bigint, bigint];
function fraction(n: bigint, d: bigint): Fraction {
  let [a, b] = [n < 0n ? -n : n, d < 0n ? -d : d];
  while (b !== 0n) [a, b] = [b, a % b];
  const g = a === 0n ? 1n : a;
  return d < 0n ? [-n / g, -d / g] : [n / g, d / g];
}
const plus = (a: Fraction, b: Fraction) => fraction(a[0] * b[1] + b[0] * a[1], a[1] * b[1]);
const times = (a: Fraction, b: Fraction) => fraction(a[0] * b[0], a[1] * b[1]);
const whole = (k: number): Fraction => [BigInt(k), 1n];
function dyadic(x: number): Fraction {
  let e = 0n;
  while (!Number.isInteger(x)) [x, e] = [x * 2, e + 1n];
  return fraction(BigInt(x), 2n ** e);
}

/** T in exact rational arithmetic from the same coefficient recurrence, rounded at the end. */
function exactRebase(from: [number, number], to: [number, number], degree: number): number[] {
  const [a0, a1, b0, b1] = [...from, ...to].map(dyadic);
  const toWidth = plus(b1, times(b0, whole(-1)));
  const alpha = times(plus(a1, times(a0, whole(-1))), [toWidth[1], toWidth[0]]);
  const beta = times(plus(plus(a0, a1), times(plus(b0, b1), whole(-1))), [toWidth[1], toWidth[0]]);
  const size = degree + 1;
  const out = new Array<number>(size * size).fill(0);
  let previous: Fraction[] = Array.from({ length: size }, () => whole(0));
  let current: Fraction[] = previous.map((_, k) => whole(k === 0 ? 1 : 0));
  out[0] = 1;
  for (let j = 0; j < degree; j++) {
    const next: Fraction[] = Array.from({ length: size }, () => whole(0));
    for (let k = 0; k <= j; k++) {
      const up = times(alpha, current[k]);
      next[k + 1] = plus(next[k + 1], times(up, fraction(BigInt(k + 1), BigInt(2 * k + 1))));
      if (k > 0) next[k - 1] = plus(next[k - 1], times(up, fraction(BigInt(k), BigInt(2 * k + 1))));
      next[k] = plus(next[k], times(beta, current[k]));
    }
    for (let k = 0; k <= j + 1; k++) {
      const sum = plus(times(next[k], whole(2 * j + 1)), times(previous[k], whole(-j)));
      next[k] = times(sum, fraction(1n, BigInt(j + 1)));
    }
    [previous, current] = [current, next];
    for (let k = 0; k <= j + 1; k++) {
      out[k * size + j + 1] = Number((current[k][0] * 2n ** 200n) / current[k][1]) / 2 ** 200;
    }
  }
  return out;
}

Deno.test("legendreRebase matches exact rational arithmetic entrywise up to degree 50", () => {
  // Reference: the same recurrence in exact BigInt fractions (exact computation).
  // Tolerance 1e-13 relative per nonzero entry (observed worst about 2e-14), even where the
  // entries reach 1e7.
  const from: [number, number] = [10, 20];
  const cases: [[number, number], number][] = [[[9.8, 19.5], 50], [[10.3, 20.4], 30], [
    [10.1, 20.6],
    30,
  ]];
  for (const [to, degree] of cases) {
    const T = legendreRebase(from, to, degree);
    const exact = exactRebase(from, to, degree);
    exact.forEach((value, k) => {
      if (value === 0) assert.equal(T[k], 0, `entry ${k} is exactly zero`);
      else assert.ok(Math.abs(T[k] - value) <= 1e-13 * Math.abs(value), `entry ${k}: ${T[k]}`);
    });
  }
});

Deno.test("legendreRebase: identity on equal domains, inverse the other way, upper triangular", () => {
  // Source: algebra of a change of basis (common practice).
  const same = legendreRebase([2, 5], [2, 5], 8);
  for (let i = 0; i < 9; i++) {
    for (let j = 0; j < 9; j++) assert.equal(same[i * 9 + j], i === j ? 1 : 0, `I[${i},${j}]`);
  }
  const a: [number, number] = [-1.5, 3];
  const b: [number, number] = [-1.4, 3.1];
  const there = legendreRebase(a, b, 10);
  const back = legendreRebase(b, a, 10);
  for (let i = 0; i < 11; i++) {
    for (let j = 0; j < 11; j++) {
      let sum = 0;
      for (let k = 0; k < 11; k++) sum += there[i * 11 + k] * back[k * 11 + j];
      assert.ok(Math.abs(sum - (i === j ? 1 : 0)) < 1e-12, `(T·T⁻¹)[${i},${j}] = ${sum}`);
      if (i > j) assert.equal(there[i * 11 + j], 0, `T[${i},${j}] below the diagonal`);
    }
  }
});

Deno.test("legendreRebase moves a design learned on all rows to a fold's domain", () => {
  // The sweep's use: design built once on all rows' domain; a fold learns a narrower domain.
  const xs = Array.from({ length: 40 }, (_, i) => 5 + 0.37 * i + 0.01 * Math.sin(i));
  const table = tableOfX(xs);
  const fold = Int32Array.from({ length: 36 }, (_, i) => i + 2);
  const all = learnTerms([legendre("x", 9)], table);
  const foldTerms = learnTerms([legendre("x", 9)], table, fold);
  const domainAll = (all[0].params as { domain: [number, number] }).domain;
  const domainFold = (foldTerms[0].params as { domain: [number, number] }).domain;
  assert.deepEqual(domainFold, [xs[2], xs[37]], "fold domain from the fold's rows only");
  const T = legendreRebase(domainAll, domainFold, 9);
  const wide = buildDesign(all, table);
  const narrow = buildDesign(foldTerms, table);
  assert.equal(narrow.outside[0].count, 4, "rows 0, 1, 38, 39 lie outside the fold's domain");
  for (let r = 0; r < 40; r++) {
    const a = [1, ...wide.block.hi.subarray(r * 9, r * 9 + 9)];
    for (let j = 1; j <= 9; j++) {
      let sum = 0;
      for (let i = 0; i <= j; i++) sum += a[i] * T[i * 10 + j];
      const b = narrow.block.hi[r * 9 + j - 1];
      assert.ok(Math.abs(sum - b) < 1e-12 * Math.max(1, Math.abs(b)), `row ${r} P${j}`);
    }
  }
});
