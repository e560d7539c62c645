// Tests for lib/folds: the PCG32 generator against its authors' published output, the bounded
// integer and double draws, every fold scheme's guarantees, pinned seed → assignment vectors,
// option errors, and the no-Math.random rule for the whole library.

import assert from "node:assert/strict";
import {
  assignmentDigest,
  explicitPlan,
  type FoldPlan,
  foldRows,
  groupedKFoldPlan,
  holdoutPlan,
  kFoldPlan,
  leaveOneOutPlan,
  SeededStream,
} from "../lib/folds/mod.ts";
import { CurbfitError } from "../lib/errors/error.ts";

// ---------------------------------------------------------------------------------------------
// Helpers

/** Asserts that `run` throws a CurbfitError with `code` whose place and message name `option`. */
function assertOptionError(run: () => unknown, option: string, code = "BAD_OPTION"): void {
  assert.throws(run, (e: unknown) => {
    assert.ok(e instanceof CurbfitError, `expected CurbfitError, got ${e}`);
    assert.equal(e.code, code);
    assert.equal(e.place.option, option);
    assert.ok(e.message.includes(`option ${option}`), e.message);
    assert.ok(e.hint.length > 0);
    return true;
  });
}

/** Rows per fold (index 0..k−1) in one repeat; −1 rows are not counted. */
function foldSizes(folds: Int32Array, k: number): number[] {
  const sizes = new Array<number>(k).fill(0);
  for (const f of folds) if (f >= 0) sizes[f]++;
  return sizes;
}

const asLists = (plan: FoldPlan) => plan.assignment.map((a) => Array.from(a));

/**
 * Independent BigInt transcription of pcg_basic.c (imneme/pcg-c-basic: pcg32_srandom_r and
 * pcg32_random_r), used as an oracle for seeds and streams whose high 32 bits are non-zero.
 */
function bigIntPcg32(initstate: bigint, initseq: bigint): () => number {
  const mask = (1n << 64n) - 1n;
  const inc = ((initseq << 1n) | 1n) & mask;
  let state = 0n;
  const next = () => {
    const old = state;
    state = (old * 6364136223846793005n + inc) & mask;
    const xorshifted = Number((((old >> 18n) ^ old) >> 27n) & 0xffffffffn);
    const rot = Number(old >> 59n);
    return ((xorshifted >>> rot) | (xorshifted << (-rot & 31))) >>> 0;
  };
  next();
  state = (state + initstate) & mask;
  next();
  return next;
}

// ---------------------------------------------------------------------------------------------
// PCG32 against the published reference output

// Source: imneme/pcg-c, test-high/expected/check-pcg32.out (the PCG authors' expected output of
// the pcg32 check program; imneme/pcg-c-basic's pcg32-demo.c is "mechanically generated from"
// the same program and prints the same lines, seeded with pcg32_srandom_r(&rng, 42u, 54u)).
// Each round prints six 32-bit outputs, 65 coin tosses (boundedrand(2): H when 1), 33 die rolls
// (boundedrand(6) + 1) and a 52-card deal (Fisher–Yates: for i = 52..2 swap cards[boundedrand(i)]
// with cards[i-1]; card c printed as "A23456789TJQK"[c / 4] + "hcds"[c % 4]). The expected file
// also prints an "Again:" line that replays the six outputs after advancing back, which leaves
// the state where it was; we skip it.
const PCG_REFERENCE_ROUNDS = [
  {
    u32: "a15c02b7 7b47f409 ba1d3330 83d2f293 bfa4784b cbed606e",
    coins: "HHTTTHTHHHTHTTTHHHHHTTTHHHTHTHTHTTHTTTHHHHHHTTTTHHTTTTTHTTTTTTTHT",
    rolls: "3 4 1 1 2 2 3 2 4 3 2 4 3 3 5 2 3 1 3 1 5 1 4 1 5 6 4 6 6 2 6 3 3",
    cards: "Qd Ks 6d 3s 3d 4c 3h Td Kc 5c Jh Kd Jd As 4s 4h Ad Th Ac Jc 7s Qs " +
      "2s 7h Kh 2d 6c Ah 4d Qh 9h 6s 5s 2c 9c Ts 8d 9s 3c 8c Js 5d 2h 6h " +
      "7d 8s 9d 5h 8h Qc 7c Tc",
  },
  {
    u32: "74ab93ad 1c1da000 494ff896 34462f2f d308a3e5 0fa83bab",
    coins: "HHHHHHHHHHTHHHTHTHTHTHTTTTHHTTTHHTHHTHTTHHTTTHHHHHHTHTTHTHTTTTTTT",
    rolls: "5 1 1 3 3 2 4 5 3 2 2 6 4 3 2 4 2 4 3 2 3 6 3 2 3 4 2 4 1 1 5 4 4",
    cards: "7d 2s 7h Td 8s 3c 3d Js 2d Tc 4h Qs 5c 9c Th 2c Jc Qd 9d Qc 7s 3s " +
      "5s 6h 4d Jh 4c Ac 4s 5h 5d Kc 8h 8d Jd 9s Ad 6s 6c Kd 2h 3h Kh Ts " +
      "Qh 9h 6d As 7c Ks Ah 8c",
  },
  {
    u32: "39af5f9f 04196b18 c3c3eb28 c076c60c c693e135 f8f63932",
    coins: "HTTHHTTTTTHTTHHHTHTTHHTTHTHHTHTHTTTTHHTTTHHTHHTTHTTHHHTHHHTHTTTHT",
    rolls: "5 1 5 3 2 2 4 5 3 3 1 3 4 6 3 2 3 4 2 2 3 1 5 2 4 6 6 4 2 4 3 3 6",
    cards: "Kd Jh Kc Qh 4d Qc 4h 9d 3c Kh Qs 8h 5c Jd 7d 8d 3h 7c 8s 3s 2h Ks " +
      "9c 9h 2c 8c Ad 7s 4s 2s 5h 6s 4c Ah 7h 5s Ac 3d 5d Qd As Tc 6h 9s " +
      "2d 6c 6d Td Jc Ts Th Js",
  },
  {
    u32: "55ce6851 97a7726d 17e10815 58007d43 962fb148 b9bb55bd",
    coins: "HHTHHTTTTHTHHHHHTTHHHTTTHHTHTHTHTHHTTHTHHHHHHTHHTHHTHHTTTTHHTHHTT",
    rolls: "6 6 3 2 3 4 2 6 4 2 6 3 2 3 5 5 3 4 4 6 6 2 6 5 4 4 6 1 6 1 3 6 5",
    cards: "Qd 8h 5d 8s 8d Ts 7h Th Qs Js 7s Kc 6h 5s 4d Ac Jd 7d 7c Td 2c 6s " +
      "5h 6d 3s Kd 9s Jh Kh As Ah 9h 3c Qh 9c 2d Tc 9d 2s 3d Ks 4h Qc Ad " +
      "Jc 8c 2h 3h 4s 4c 5c 6c",
  },
  {
    u32: "fcef7cd6 1b488b5a d0daf7ea 1d9a70f7 241a37cf 9a3857b7",
    coins: "HHHHTHHTTHTTHHHTTTHHTHTHTTTTHTTHTHTTTHHHTHTHTTHTTHTHHTHTHHHTHTHTT",
    rolls: "5 4 1 2 6 1 3 1 5 6 3 6 2 1 4 4 5 2 1 5 6 5 6 4 4 4 5 2 6 4 3 5 6",
    cards: "4d 9s Qc 9h As Qs 7s 4c Kd 6h 6s 2c 8c 5d 7h 5h Jc 3s 7c Jh Js Ks " +
      "Tc Jd Kc Th 3h Ts Qh Ad Td 3c Ah 2d 3d 5c Ac 8s 5s 9c 2h 6c 6d Kh " +
      "Qd 8d 7d 2s 8h 4h 9d 4s",
  },
];

Deno.test("PCG32 seeded with (42, 54) reproduces the authors' published demo output", () => {
  const stream = new SeededStream(42, 54);
  for (const [round, expected] of PCG_REFERENCE_ROUNDS.entries()) {
    const u32 = Array.from(
      { length: 6 },
      () => stream.nextUint32().toString(16).padStart(8, "0"),
    );
    assert.equal(u32.join(" "), expected.u32, `round ${round + 1} 32-bit outputs`);
    const coins = Array.from({ length: 65 }, () => stream.nextBelow(2) ? "H" : "T").join("");
    assert.equal(coins, expected.coins, `round ${round + 1} coins`);
    const rolls = Array.from({ length: 33 }, () => stream.nextBelow(6) + 1).join(" ");
    assert.equal(rolls, expected.rolls, `round ${round + 1} rolls`);
    const cards = Array.from(
      stream.permutation(52),
      (c) => "A23456789TJQK"[Math.floor(c / 4)] + "hcds"[c % 4],
    ).join(" ");
    assert.equal(cards, expected.cards, `round ${round + 1} cards`);
  }
});

Deno.test("PCG32 on 32-bit halves matches a BigInt transcription for wide seeds and streams", () => {
  const pairs: [number, number][] = [
    [0, 0],
    [2 ** 32 - 1, 2 ** 31],
    [2 ** 32, 2 ** 32 - 1],
    [2 ** 53 - 1, 2 ** 53 - 1],
    [123456789012345, 2 ** 40 + 5],
  ];
  for (const [seed, stream] of pairs) {
    const ours = new SeededStream(seed, stream);
    const oracle = bigIntPcg32(BigInt(seed), BigInt(stream));
    for (let i = 0; i < 2000; i++) {
      assert.equal(ours.nextUint32(), oracle(), `seed ${seed}, stream ${stream}, draw ${i}`);
    }
  }
});

Deno.test("SeededStream rejects seeds and streams outside 0..2^53-1", () => {
  assertOptionError(() => new SeededStream(-1), "seed");
  assertOptionError(() => new SeededStream(2 ** 53), "seed");
  assertOptionError(() => new SeededStream(1.5), "seed");
  assertOptionError(() => new SeededStream(1, -2), "stream");
  assertOptionError(() => new SeededStream(1).nextBelow(0), "bound");
  assertOptionError(() => new SeededStream(1).nextBelow(2 ** 32 + 1), "bound");
});

// ---------------------------------------------------------------------------------------------
// Bounded integers and doubles

/** Pearson's chi-square statistic of observed counts against equal expected counts. */
function chiSquare(counts: readonly number[]): number {
  const total = counts.reduce((a, b) => a + b, 0);
  const expected = total / counts.length;
  return counts.reduce((sum, c) => sum + (c - expected) ** 2 / expected, 0);
}

Deno.test("nextBelow stays in range and is roughly uniform (chi-square, p = 0.001)", () => {
  // Critical values of the chi-square distribution at upper-tail p = 0.001: 9 degrees of
  // freedom 27.877, 2 degrees of freedom 13.816 (standard chi-square tables, e.g. NIST/SEMATECH
  // e-Handbook of Statistical Methods, section 1.3.6.7.4). The sample is seeded, so each
  // statistic below is a fixed number; the test fails only if the draws change or skew.
  const stream = new SeededStream(20240611, 1);
  const counts = new Array<number>(10).fill(0);
  for (let i = 0; i < 200_000; i++) {
    const x = stream.nextBelow(10);
    assert.ok(Number.isInteger(x) && x >= 0 && x < 10);
    counts[x]++;
  }
  assert.ok(chiSquare(counts) < 27.877, `chi-square ${chiSquare(counts)} for bound 10`);

  // bound = 3·2^30: plain "r % bound" would put half of all draws in the lowest third (values
  // below 2^30 have two preimages), giving a chi-square near 10^4 here; rejection keeps the
  // thirds equal.
  const bound = 3 * 2 ** 30;
  const thirds = [0, 0, 0];
  for (let i = 0; i < 60_000; i++) {
    const x = stream.nextBelow(bound);
    assert.ok(Number.isInteger(x) && x >= 0 && x < bound);
    thirds[Math.floor(x / 2 ** 30)]++;
  }
  assert.ok(chiSquare(thirds) < 13.816, `chi-square ${chiSquare(thirds)} for bound 3*2^30`);

  for (const edge of [1, 2, 2 ** 31 + 1, 2 ** 32]) {
    for (let i = 0; i < 1000; i++) {
      const x = stream.nextBelow(edge);
      assert.ok(Number.isInteger(x) && x >= 0 && x < edge, `bound ${edge}: ${x}`);
    }
  }
});

Deno.test("nextDouble gives 53-bit doubles in [0, 1) built from two outputs", () => {
  const stream = new SeededStream(99);
  const twin = new SeededStream(99);
  let sum = 0;
  let oddSeen = false;
  const count = 100_000;
  for (let i = 0; i < count; i++) {
    const x = stream.nextDouble();
    assert.ok(x >= 0 && x < 1);
    const scaled = x * 2 ** 53;
    assert.ok(Number.isInteger(scaled));
    if (scaled % 2 === 1) oddSeen = true; // the lowest of the 53 bits is used
    assert.equal(scaled, (twin.nextUint32() >>> 5) * 2 ** 26 + (twin.nextUint32() >>> 6));
    sum += x;
  }
  assert.ok(oddSeen);
  // Mean of U(0,1) is 1/2 with standard error sqrt(1/12/count) ≈ 0.00091; allow 5 SE.
  assert.ok(Math.abs(sum / count - 0.5) < 5 * Math.sqrt(1 / 12 / count));
});

Deno.test("permutation returns each index once", () => {
  assert.deepEqual(Array.from(new SeededStream(1).permutation(5)), [3, 4, 0, 1, 2]); // pinned
  const stream = new SeededStream(5);
  for (const n of [0, 1, 2, 3, 17, 1000]) {
    const order = stream.permutation(n);
    assert.deepEqual(
      Array.from(order).sort((a, b) => a - b),
      Array.from({ length: n }, (_, i) => i),
    );
  }
});

// ---------------------------------------------------------------------------------------------
// Pinned seed → assignment vectors (the reproducibility contract)

// Computed once with this implementation and frozen. They were cross-checked when frozen
// against an independent Python transcription of lib/folds/README.md (Python integers for the
// 64-bit state, hashlib for SHA-256) which gave identical assignments and digests. If one of
// these changes, every saved record's folds change: that is a breaking change, not a fix.
Deno.test("pinned k-fold vectors: n=10,k=3,seed=1 and n=7,k=2,seed=2024", () => {
  const a = kFoldPlan(10, { k: 3, seed: 1 });
  assert.deepEqual(asLists(a), [[1, 2, 0, 0, 1, 2, 0, 2, 0, 1]]);
  assert.equal(
    assignmentDigest(a),
    "fb58befaaaf29ebdba3d75e4e5b1950da91f7989f1ae7e17de4a37505a2018af",
  );
  const b = kFoldPlan(7, { k: 2, seed: 2024 });
  assert.deepEqual(asLists(b), [[1, 0, 1, 0, 0, 0, 1]]);
  assert.equal(
    assignmentDigest(b),
    "310df10e2d5e3c6a935890b95c83828c5ea926f02aeb4b0f6dfd0a1d45969cc2",
  );
  const widest = kFoldPlan(6, { k: 3, seed: 2 ** 53 - 1 });
  assert.deepEqual(asLists(widest), [[2, 2, 0, 1, 0, 1]]);
});

Deno.test("pinned repeated k-fold vector: n=8,k=4,seed=99,repeats=3", () => {
  const plan = kFoldPlan(8, { k: 4, seed: 99, repeats: 3 });
  assert.deepEqual(asLists(plan), [
    [3, 1, 1, 2, 2, 0, 3, 0],
    [0, 2, 3, 2, 3, 1, 0, 1],
    [1, 0, 3, 2, 0, 2, 3, 1],
  ]);
  assert.equal(
    assignmentDigest(plan),
    "7d580ee7417081f02ec4184d46df6e8c6c54d5ba739b4856ba8d4902c4a6f741",
  );
});

Deno.test("pinned grouped and holdout vectors", () => {
  const grouped = groupedKFoldPlan(10, {
    groups: ["a", "b", "a", "c", "d", "b", "e", "e", "c", "f"],
    k: 3,
    seed: 5,
  });
  assert.deepEqual(asLists(grouped), [[1, 2, 1, 1, 0, 2, 0, 0, 1, 2]]);
  assert.equal(
    assignmentDigest(grouped),
    "4d46c76a7628c8e5740561b09e0532ee71d24795c585d230ddc2b8b36c20a413",
  );
  const holdout = holdoutPlan(10, { fraction: 0.3, seed: 7 });
  assert.deepEqual(asLists(holdout), [[0, -1, -1, 0, -1, 0, -1, -1, -1, -1]]);
  assert.equal(
    assignmentDigest(holdout),
    "92001ebe923cba7a6e2cd5f31abb26054025eea67019ec8466b881f033fe8b99",
  );
});

Deno.test("plans carry their scheme, seed and generator in a fixed key order", () => {
  const plan = kFoldPlan(10, { k: 3, seed: 1 });
  assert.deepEqual(Object.keys(plan), [
    "scheme",
    "nRows",
    "k",
    "repeats",
    "seed",
    "prng",
    "fraction",
    "groupCount",
    "assignment",
  ]);
  assert.equal(plan.scheme, "k-fold");
  assert.equal(plan.prng, "PCG32");
  assert.equal(plan.seed, 1);
  assert.ok(Object.isFrozen(plan));
  assert.equal(leaveOneOutPlan(3).prng, null);
  assert.equal(leaveOneOutPlan(3).seed, null);
  // Same call, same plan.
  assert.deepEqual(
    asLists(kFoldPlan(50, { k: 7, seed: 3 })),
    asLists(kFoldPlan(50, { k: 7, seed: 3 })),
  );
});

// ---------------------------------------------------------------------------------------------
// Scheme guarantees

Deno.test("k-fold: sizes differ by at most one, the first n mod k folds hold the extra row", () => {
  for (let n = 2; n <= 40; n++) {
    for (let k = 2; k <= n; k++) {
      const folds = kFoldPlan(n, { k, seed: n * 1000 + k }).assignment[0];
      const sizes = foldSizes(folds, k);
      const base = Math.floor(n / k);
      const expected = sizes.map((_, f) => base + (f < n % k ? 1 : 0));
      assert.deepEqual(sizes, expected, `n=${n}, k=${k}`);
    }
  }
  const big = kFoldPlan(100_003, { k: 10, seed: 8 }).assignment[0];
  assert.deepEqual(foldSizes(big, 10), [
    10001,
    10001,
    10001,
    10000,
    10000,
    10000,
    10000,
    10000,
    10000,
    10000,
  ]);
});

Deno.test("repeated k-fold: repeats differ, each is a valid k-fold, repeat r = stream r", () => {
  const plan = kFoldPlan(30, { k: 4, seed: 11, repeats: 5 });
  assert.equal(plan.repeats, 5);
  const seen = new Set<string>();
  for (const folds of plan.assignment) {
    assert.deepEqual(foldSizes(folds, 4), [8, 8, 7, 7]);
    seen.add(folds.join(","));
  }
  assert.equal(seen.size, 5);
  // Repeat 0 is the single k-fold plan with the same seed.
  assert.deepEqual(
    Array.from(plan.assignment[0]),
    Array.from(kFoldPlan(30, { k: 4, seed: 11 }).assignment[0]),
  );
  // Repeat 3 is drawn from stream 3: its shuffle is SeededStream(11, 3).permutation(30).
  const order = new SeededStream(11, 3).permutation(30);
  const folds = plan.assignment[3];
  const blockOf = (position: number) =>
    position < 8 ? 0 : position < 16 ? 1 : position < 23 ? 2 : 3;
  order.forEach((row, position) => assert.equal(folds[row], blockOf(position)));
});

/** The grouped rule written plainly: linear scan for the smallest fold, ties to lowest index. */
function groupedOracle(codes: Int32Array, groupCount: number, k: number, seed: number): number[] {
  const sizes = new Array<number>(groupCount).fill(0);
  for (const c of codes) sizes[c]++;
  const foldRowsSoFar = new Array<number>(k).fill(0);
  const foldOfGroup = new Array<number>(groupCount);
  for (const group of new SeededStream(seed, 0).permutation(groupCount)) {
    let best = 0;
    for (let f = 1; f < k; f++) if (foldRowsSoFar[f] < foldRowsSoFar[best]) best = f;
    foldOfGroup[group] = best;
    foldRowsSoFar[best] += sizes[group];
  }
  return Array.from(codes, (c) => foldOfGroup[c]);
}

Deno.test("grouped k-fold: groups never split, no fold empty, follows the smallest-fold rule", () => {
  const draw = new SeededStream(77);
  for (let trial = 0; trial < 60; trial++) {
    const groupCount = 2 + draw.nextBelow(40);
    const n = groupCount + draw.nextBelow(200);
    // Codes numbered by first appearance (as the planner numbers them) with uneven sizes.
    const codes = new Int32Array(n);
    for (let i = 0; i < n; i++) {
      codes[i] = i < groupCount ? i : draw.nextBelow(1 + draw.nextBelow(groupCount));
    }
    const k = 2 + draw.nextBelow(groupCount - 1);
    const seed = draw.nextBelow(1_000_000);
    const plan = groupedKFoldPlan(n, { groups: codes, k, seed, repeats: 2 });
    assert.equal(plan.groupCount, groupCount);
    for (const folds of plan.assignment) {
      const foldOfGroup = new Map<number, number>();
      for (let i = 0; i < n; i++) {
        const known = foldOfGroup.get(codes[i]);
        if (known === undefined) foldOfGroup.set(codes[i], folds[i]);
        else assert.equal(folds[i], known, `trial ${trial}: group ${codes[i]} split`);
      }
      assert.ok(foldSizes(folds, k).every((s) => s > 0), `trial ${trial}: empty fold`);
    }
    assert.deepEqual(Array.from(plan.assignment[0]), groupedOracle(codes, groupCount, k, seed));
  }
});

Deno.test("grouped k-fold: string, number and int32 labels with the same grouping agree", () => {
  const strings = ["x", "y", "x", "z", "w", "z", "y"];
  const numbers = [10, 20, 10, 30, 40, 30, 20];
  const codes = Int32Array.from([7, 3, 7, 1, 0, 1, 3]);
  const plans = [strings, numbers, codes].map((groups) =>
    asLists(groupedKFoldPlan(7, { groups, k: 2, seed: 4 }))
  );
  assert.deepEqual(plans[0], plans[1]);
  assert.deepEqual(plans[0], plans[2]);
  // 1 and "1" are different labels.
  assert.equal(groupedKFoldPlan(4, { groups: [1, "1", 2, 2], k: 2, seed: 0 }).groupCount, 3);
  // Leave-one-group-out is k = number of groups.
  const logo = groupedKFoldPlan(7, { groups: strings, k: 4, seed: 1 });
  assert.deepEqual(foldSizes(logo.assignment[0], 4).sort(), [1, 2, 2, 2]);
});

Deno.test("holdout: validation size is Math.round(fraction * n), the rest is -1", () => {
  const plan = holdoutPlan(10, { fraction: 0.25, seed: 3, repeats: 4 });
  assert.equal(plan.k, 1);
  assert.equal(plan.fraction, 0.25);
  for (const folds of plan.assignment) {
    assert.equal(folds.filter((f) => f === 0).length, 3); // 2.5 rounds up to 3
    assert.equal(folds.filter((f) => f === -1).length, 7);
  }
  const { training, validation } = foldRows(plan, 2, 0);
  assert.equal(validation.length, 3);
  assert.equal(training.length, 7);
  assertOptionError(() => holdoutPlan(10, { fraction: 0.04, seed: 1 }), "fraction"); // 0 rows
  assertOptionError(() => holdoutPlan(10, { fraction: 0.96, seed: 1 }), "fraction"); // 10 rows
  assertOptionError(() => holdoutPlan(10, { fraction: 1, seed: 1 }), "fraction");
  assertOptionError(() => holdoutPlan(10, { fraction: NaN, seed: 1 }), "fraction");
});

Deno.test("leave-one-out: row i is fold i", () => {
  const plan = leaveOneOutPlan(5);
  assert.equal(plan.k, 5);
  assert.deepEqual(asLists(plan), [[0, 1, 2, 3, 4]]);
  assertOptionError(() => leaveOneOutPlan(1), "nRows", "TOO_FEW_ROWS");
});

Deno.test("explicit: a valid assignment is copied; the first bad row is named", () => {
  const given = [2, 0, 1, 1, 0, 2];
  const plan = explicitPlan(6, { assignment: given });
  assert.equal(plan.k, 3);
  assert.equal(plan.scheme, "explicit");
  given[0] = 0; // the plan holds its own copy
  assert.equal(plan.assignment[0][0], 2);
  assert.equal(explicitPlan(4, { assignment: [-1, 0, -1, 0] }).k, 1);
  assert.equal(explicitPlan(3, { assignment: Int32Array.from([1, 0, 1]), k: 2 }).k, 2);

  assertOptionError(() => explicitPlan(4, { assignment: [0, 1, 2.5, 7] }), "assignment[2]");
  assertOptionError(() => explicitPlan(4, { assignment: [0, 1, -2, 1] }), "assignment[2]");
  assertOptionError(() => explicitPlan(3, { assignment: [0, 1, 1], k: 2.5 }), "k");
  assertOptionError(() => explicitPlan(3, { assignment: [0, 2, 1], k: 2 }), "assignment[1]");
  assertOptionError(() => explicitPlan(4, { assignment: [0, 2, 2, 0] }), "assignment"); // no fold 1
  assertOptionError(() => explicitPlan(3, { assignment: [0, 1] }), "assignment"); // length
  assertOptionError(() => explicitPlan(3, { assignment: [0, 0, 0] }), "assignment"); // no training
  assertOptionError(() => explicitPlan(3, { assignment: [-1, -1, -1] }), "assignment");
  assertOptionError(() => explicitPlan(3, { assignment: [0, 1, 1e9] }), "assignment[2]");
  assertOptionError(
    () => explicitPlan(3, { assignment: [0, 1, null as unknown as number] }),
    "assignment[2]",
  );
});

Deno.test("foldRows: validation is the fold, training is everything else, both ascending", () => {
  const plans = [
    kFoldPlan(23, { k: 4, seed: 9, repeats: 2 }),
    groupedKFoldPlan(8, { groups: [1, 1, 2, 3, 3, 4, 5, 5], k: 3, seed: 2 }),
    holdoutPlan(9, { fraction: 0.5, seed: 1 }),
    leaveOneOutPlan(4),
  ];
  for (const plan of plans) {
    for (let r = 0; r < plan.repeats; r++) {
      for (let f = 0; f < plan.k; f++) {
        const { training, validation } = foldRows(plan, r, f);
        const folds = plan.assignment[r];
        assert.deepEqual(Array.from(validation), [...folds.keys()].filter((i) => folds[i] === f));
        assert.deepEqual(Array.from(training), [...folds.keys()].filter((i) => folds[i] !== f));
      }
    }
  }
  const plan = plans[0];
  assertOptionError(() => foldRows(plan, 2, 0), "repeat");
  assertOptionError(() => foldRows(plan, 0, 4), "fold");
  assertOptionError(() => foldRows(plan, 0, -1), "fold");
});

Deno.test("assignmentDigest hashes little-endian int32s, repeat by repeat", async () => {
  // SHA-256 via Web Crypto (crypto.subtle, an independent code path from node:crypto) over the
  // canonical bytes written out by hand.
  const bytes = Uint8Array.from([
    ...[0, 0, 0, 0, 1, 0, 0, 0, 2, 0, 0, 0], // leaveOneOutPlan(3)
  ]);
  const subtleHex = async (data: Uint8Array<ArrayBuffer>) =>
    Array.from(
      new Uint8Array(await crypto.subtle.digest("SHA-256", data)),
      (b) => b.toString(16).padStart(2, "0"),
    ).join("");
  assert.equal(assignmentDigest(leaveOneOutPlan(3)), await subtleHex(bytes));
  assert.equal(
    assignmentDigest(leaveOneOutPlan(3)),
    "ad5dc1478de06a4c2728ea528bd9361a4b945e92a414bf4d180cedaaeaa5f4cc",
  );
  const withMinusOne = explicitPlan(2, { assignment: [-1, 0] });
  assert.equal(
    assignmentDigest(withMinusOne),
    await subtleHex(Uint8Array.from([0xff, 0xff, 0xff, 0xff, 0, 0, 0, 0])),
  );
  const repeated = kFoldPlan(3, { k: 3, seed: 0, repeats: 2 });
  const concatenated = new Uint8Array(24);
  repeated.assignment.forEach((folds, r) =>
    folds.forEach((f, i) => concatenated[r * 12 + i * 4] = f)
  );
  assert.equal(assignmentDigest(repeated), await subtleHex(concatenated));
});

// ---------------------------------------------------------------------------------------------
// Option errors

Deno.test("bad options give a CurbfitError naming the option", () => {
  assertOptionError(() => kFoldPlan(10, { k: 1, seed: 1 }), "k");
  assertOptionError(() => kFoldPlan(10, { k: 11, seed: 1 }), "k");
  assertOptionError(() => kFoldPlan(10, { k: 2.5, seed: 1 }), "k");
  assertOptionError(
    () => kFoldPlan(10, { seed: 1 } as unknown as { k: number; seed: number }),
    "k",
  );
  assertOptionError(() => kFoldPlan(10, { k: 3, seed: -1 }), "seed");
  assertOptionError(() => kFoldPlan(10, { k: 3, seed: 2 ** 53 }), "seed");
  assertOptionError(() => kFoldPlan(10, { k: 3, seed: 0.5 }), "seed");
  assertOptionError(() => kFoldPlan(10, { k: 3, seed: "7" as unknown as number }), "seed");
  assertOptionError(
    () => kFoldPlan(10, { k: 3 } as unknown as { k: number; seed: number }),
    "seed",
  );
  assertOptionError(() => kFoldPlan(10, { k: 3, seed: 1, repeats: 0 }), "repeats");
  assertOptionError(() => kFoldPlan(10, { k: 3, seed: 1, repeats: 1.5 }), "repeats");
  assertOptionError(
    () => kFoldPlan(10, { k: 3, seed: 1, repeat: 2 } as unknown as { k: number; seed: number }),
    "repeat",
  );
  assertOptionError(() => kFoldPlan(1, { k: 2, seed: 1 }), "nRows", "TOO_FEW_ROWS");
  assertOptionError(() => kFoldPlan(-3, { k: 2, seed: 1 }), "nRows");
  assertOptionError(() => kFoldPlan(2 ** 31, { k: 2, seed: 1 }), "nRows", "TOO_LARGE");
  // Grouped: fewer groups than k, wrong length, a missing label.
  assertOptionError(
    () => groupedKFoldPlan(4, { groups: ["a", "a", "b", "b"], k: 3, seed: 1 }),
    "k",
  );
  assertOptionError(
    () => groupedKFoldPlan(4, { groups: ["a", "b", "c"], k: 2, seed: 1 }),
    "groups",
  );
  assertOptionError(
    () =>
      groupedKFoldPlan(4, {
        groups: ["a", "b", null as unknown as string, "c"],
        k: 2,
        seed: 1,
      }),
    "groups[2]",
  );
  assertOptionError(() => groupedKFoldPlan(3, { groups: [1, NaN, 2], k: 2, seed: 1 }), "groups[1]");
  // Messages say what to do.
  assert.throws(() => kFoldPlan(10, { k: 11, seed: 1 }), (e: unknown) => {
    assert.ok(e instanceof CurbfitError);
    assert.match(e.message, /option k is 11, but it must be a whole number from 2 to 10/);
    assert.match(e.message, /Pass k between 2 and 10/);
    return true;
  });
});

Deno.test("planners never modify the caller's data", () => {
  const groups = ["b", "a", "b", "c"];
  const copy = [...groups];
  groupedKFoldPlan(4, { groups, k: 2, seed: 1 });
  assert.deepEqual(groups, copy);
  const codes = Int32Array.from([3, 3, 1, 2]);
  groupedKFoldPlan(4, { groups: codes, k: 2, seed: 1 });
  assert.deepEqual(Array.from(codes), [3, 3, 1, 2]);
});

// ---------------------------------------------------------------------------------------------
// No Math.random in the library

Deno.test("no source file under lib/ calls Math.random", async () => {
  const libDir = new URL("../lib/", import.meta.url);
  const offenders: string[] = [];
  let checked = 0;
  async function walk(dir: URL): Promise<void> {
    for await (const entry of Deno.readDir(dir)) {
      const url = new URL(entry.name + (entry.isDirectory ? "/" : ""), dir);
      if (entry.isDirectory) await walk(url);
      else if (/\.(ts|tsx|js|mjs|mts)$/.test(entry.name)) {
        checked++;
        const text = await Deno.readTextFile(url);
        if (/Math\s*\.\s*random|Math\s*\[\s*["'`]random/.test(text)) offenders.push(url.pathname);
      }
    }
  }
  await walk(libDir);
  assert.ok(checked > 0, "no library source files found");
  assert.deepEqual(offenders, []);
});
