/**
 * The fold hash `curbfit.fold-hash/1`: a seeded map from a row key (a whole number) to a fold,
 * computable row by row without holding the data, and in SQL with BIGINT arithmetic only
 * (`+`, `*`, `%`, no overflow, no bit operations). README.md in this folder states it exactly.
 *
 * Family: a cubic polynomial modulo the Mersenne prime P = 2^31 − 1 with seeded coefficients,
 * which is 4-wise independent over keys that differ modulo P (Wegman & Carter 1981, "New hash
 * functions and their use in authentication and set equality", the polynomial construction):
 *   x = key mod P (mathematical, 0 ≤ x < P)
 *   h = ((a3·x + a2)·x + a1)·x + a0  mod P   (reduced after every product and sum)
 *   fold = h mod K.
 * The coefficients a0 … a3 are drawn from curbfit's one generator: `SeededStream(seed,
 * FOLD_HASH_STREAM)`, four `nextBelow(P)` draws in the order a0, a1, a2, a3. Repeated fold plans
 * continue the same stream: repeat r (0-based) takes draws 4r … 4r + 3, so repeat 0 is the
 * single-repeat hash and each repeat's folds are independent of the others' over the seed.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { explicitPlan, type FoldPlan, SeededStream } from "../folds/mod.ts";
import { makePlan } from "../folds/plan.ts";

/**
 * Name and version of the fold hash; changing anything below needs a new name.
 *
 * @example
 * ```ts
 * import { FOLD_HASH } from "./hash.ts";
 * console.log(FOLD_HASH); // curbfit.fold-hash/1
 * ```
 */
export const FOLD_HASH = "curbfit.fold-hash/1";

/**
 * The prime modulus P = 2^31 − 1.
 *
 * @example
 * ```ts
 * import { FOLD_HASH_PRIME } from "./hash.ts";
 * console.log(FOLD_HASH_PRIME === 2 ** 31 - 1); // true
 * ```
 */
export const FOLD_HASH_PRIME = 2147483647;

/**
 * PCG32 stream the coefficients are drawn from: the ASCII bytes of "fold", 0x666f6c64.
 *
 * @example
 * ```ts
 * import { FOLD_HASH_STREAM } from "./hash.ts";
 * console.log(FOLD_HASH_STREAM.toString(16)); // 666f6c64
 * ```
 */
export const FOLD_HASH_STREAM = 0x666f6c64;

/**
 * Most repeats of a hash fold plan: each repeat holds its own K fold summaries (and, in SQL,
 * multiplies the groups of the queries), so a mistyped count is refused rather than run.
 *
 * @example
 * ```ts
 * import { MAX_HASH_REPEATS } from "./hash.ts";
 * console.log(MAX_HASH_REPEATS); // 100
 * ```
 */
export const MAX_HASH_REPEATS = 100;

/**
 * A seeded fold hash of one repeat: its coefficients and fold count.
 *
 * @example
 * ```ts
 * import { type FoldHash, foldHash } from "./hash.ts";
 * const h: FoldHash = foldHash(1, 10);
 * console.log(h.coefficients.length, h.repeat); // 4 0
 * ```
 */
export interface FoldHash {
  /** Seed of `SeededStream(seed, FOLD_HASH_STREAM)`, an integer from 0 to 2^53 − 1. */
  readonly seed: number;
  /** Number of folds, 2 … 1000; folds are numbered 0 … k − 1. */
  readonly k: number;
  /** The repeat (0-based) these coefficients belong to: draws 4·repeat … 4·repeat + 3. */
  readonly repeat: number;
  /** a0, a1, a2, a3, each in 0 … P − 1. */
  readonly coefficients: readonly [number, number, number, number];
}

/**
 * The fold hash for `seed` and `k` folds, of repeat `repeat` (default 0, the single-repeat hash).
 *
 * @example
 * ```ts
 * import { foldHash, foldOfKey } from "./hash.ts";
 * const h = foldHash(7, 10);
 * console.log(foldOfKey(h, 0), foldOfKey(h, 12345)); // two folds in 0…9
 * const third = foldHash(7, 10, 2); // repeat 2 of a repeated plan: other folds
 * ```
 */
export function foldHash(seed: number, k: number, repeat = 0): FoldHash {
  if (!Number.isInteger(repeat) || repeat < 0 || repeat >= MAX_HASH_REPEATS) {
    throw new CurbfitError(
      "BAD_OPTION",
      `repeat is ${repeat}, but it must be a whole number from 0 to ${MAX_HASH_REPEATS - 1}`,
      "Repeats are numbered from 0",
      { option: "repeat" },
    );
  }
  return foldHashes(seed, k, repeat + 1)[repeat];
}

/**
 * The fold hashes of repeats 0 … repeats − 1 for `seed` and `k` folds: the coefficients of
 * repeat r are draws 4r … 4r + 3 of `SeededStream(seed, FOLD_HASH_STREAM)`.
 *
 * @example
 * ```ts
 * import { foldHashes, foldOfKey } from "./hash.ts";
 * const [first, second] = foldHashes(7, 10, 2);
 * console.log(foldOfKey(first, 12345), foldOfKey(second, 12345)); // the key's fold in each repeat
 * ```
 */
export function foldHashes(seed: number, k: number, repeats = 1): readonly FoldHash[] {
  if (!Number.isSafeInteger(seed) || seed < 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      `folds.seed is ${seed}, but it must be a whole number from 0 to 2^53 − 1`,
      "Pass an explicit seed such as { k: 10, seed: 1 }",
      { option: "folds.seed" },
    );
  }
  if (!Number.isInteger(k) || k < 2 || k > 1000) {
    throw new CurbfitError(
      "BAD_OPTION",
      `folds.k is ${k}, but it must be a whole number from 2 to 1000`,
      "Use e.g. { k: 10 }",
      { option: "folds.k" },
    );
  }
  checkHashRepeats(repeats);
  const s = new SeededStream(seed, FOLD_HASH_STREAM);
  return Object.freeze(Array.from({ length: repeats }, (_, repeat) => {
    const a0 = s.nextBelow(FOLD_HASH_PRIME);
    const a1 = s.nextBelow(FOLD_HASH_PRIME);
    const a2 = s.nextBelow(FOLD_HASH_PRIME);
    const a3 = s.nextBelow(FOLD_HASH_PRIME);
    const coefficients = Object.freeze([a0, a1, a2, a3] as const);
    return Object.freeze({ seed, k, repeat, coefficients });
  }));
}

/**
 * Checks `folds.repeats` of a hash fold plan: a whole number from 1 to {@link MAX_HASH_REPEATS}.
 *
 * @example
 * ```ts
 * import { checkHashRepeats } from "./hash.ts";
 * console.log(checkHashRepeats(3)); // 3
 * ```
 */
export function checkHashRepeats(repeats: unknown): number {
  if (
    typeof repeats === "number" && Number.isInteger(repeats) && repeats >= 1 &&
    repeats <= MAX_HASH_REPEATS
  ) {
    return repeats;
  }
  const shown = typeof repeats === "string" ? JSON.stringify(repeats) : String(repeats);
  throw new CurbfitError(
    "BAD_OPTION",
    `folds.repeats is ${shown}, but it must be a whole number from 1 to ${MAX_HASH_REPEATS}`,
    "Pass e.g. { k: 10, seed: 1, repeats: 3 }, or leave repeats out for one repeat",
    { option: "folds.repeats" },
  );
}

/** (a · b) mod P for 0 ≤ a, b < P, exactly in doubles: b is split into 16-bit halves. */
function mulMod(a: number, b: number): number {
  const high = Math.floor(b / 65536);
  const low = b - high * 65536;
  return (((a * high) % FOLD_HASH_PRIME) * 65536 + a * low) % FOLD_HASH_PRIME;
}

/**
 * The fold of a reduced key x (0 ≤ x < P).
 *
 * @example
 * ```ts
 * import { foldHash, foldOfReduced } from "./hash.ts";
 * console.log(foldOfReduced(foldHash(1, 5), 42)); // a fold in 0…4
 * ```
 */
export function foldOfReduced(hash: FoldHash, x: number): number {
  const [a0, a1, a2, a3] = hash.coefficients;
  let h = (mulMod(a3, x) + a2) % FOLD_HASH_PRIME;
  h = (mulMod(h, x) + a1) % FOLD_HASH_PRIME;
  h = (mulMod(h, x) + a0) % FOLD_HASH_PRIME;
  return h % hash.k;
}

/**
 * The fold of a whole-number key in the range of a SQL BIGINT (−2^63 … 2^63 − 1). A number must
 * be a safe integer; larger keys can be given as decimal text or as a bigint.
 *
 * @example
 * ```ts
 * import { foldHash, foldOfKey } from "./hash.ts";
 * const h = foldHash(3, 4);
 * console.log(foldOfKey(h, 17) === foldOfKey(h, "17")); // true
 * ```
 */
export function foldOfKey(hash: FoldHash, key: number | bigint | string): number {
  return foldOfReduced(hash, reduceKey(key));
}

/** Largest BIGINT, as decimal text. */
const BIGINT_MAX = "9223372036854775807";
const BIGINT_MIN_MAGNITUDE = "9223372036854775808";

/**
 * key mod P (0 ≤ result < P) for a whole number in the BIGINT range; NaN for anything else
 * (not whole, out of range, not a decimal integer literal). Text may carry a sign and spaces.
 *
 * @example
 * ```ts
 * import { reduceKey } from "./hash.ts";
 * console.log(reduceKey(-1), reduceKey("2147483648"), reduceKey(1.5)); // 2147483646 1 NaN
 * ```
 */
export function reduceKey(key: number | bigint | string): number {
  if (typeof key === "number") {
    if (!Number.isSafeInteger(key)) return NaN;
    const r = key % FOLD_HASH_PRIME;
    return r < 0 ? r + FOLD_HASH_PRIME : r + 0;
  }
  if (typeof key === "bigint") {
    if (key > 9223372036854775807n || key < -9223372036854775808n) return NaN;
    const r = Number(key % 2147483647n);
    return r < 0 ? r + FOLD_HASH_PRIME : r;
  }
  return reduceDecimal(key);
}

/** key mod P from decimal text (digits by Horner's rule, each step exact in doubles). */
function reduceDecimal(text: string): number {
  const t = text.trim();
  let i = 0;
  const negative = t.charCodeAt(0) === 45;
  if (negative || t.charCodeAt(0) === 43) i = 1;
  while (i < t.length - 1 && t.charCodeAt(i) === 48) i++; // leading zeros
  const digits = t.slice(i);
  if (!/^[0-9]+$/.test(digits)) return NaN;
  const limit = negative ? BIGINT_MIN_MAGNITUDE : BIGINT_MAX;
  if (digits.length > limit.length || (digits.length === limit.length && digits > limit)) {
    return NaN;
  }
  let r = 0;
  for (let j = 0; j < digits.length; j++) {
    r = (r * 10 + (digits.charCodeAt(j) - 48)) % FOLD_HASH_PRIME;
  }
  return negative && r !== 0 ? FOLD_HASH_PRIME - r : r;
}

/**
 * Fold of every key of an array, e.g. to give the in-memory `sweep` the same folds through
 * `explicitPlan` (row numbers 0 … n − 1 are the keys when no key column is used).
 *
 * @example
 * ```ts
 * import { foldHash, foldsOfKeys } from "./hash.ts";
 * import { explicitPlan } from "../folds/mod.ts";
 * const keys = Array.from({ length: 100 }, (_, i) => i);
 * const plan = explicitPlan(100, { assignment: foldsOfKeys(foldHash(1, 5), keys), k: 5 });
 * console.log(plan.k); // 5
 * ```
 */
export function foldsOfKeys(
  hash: FoldHash,
  keys: ArrayLike<number | bigint | string>,
): Int32Array {
  return Int32Array.from({ length: keys.length }, (_, i) => {
    const x = reduceKey(keys[i]);
    if (Number.isNaN(x)) {
      throw new CurbfitError(
        "BAD_OPTION",
        `key ${String(keys[i])} (entry ${i}) is not a whole number from −2^63 to 2^63 − 1`,
        "Use an integer key column (row ids), or leave the key out to hash row numbers",
        { option: "key" },
      );
    }
    return foldOfReduced(hash, x);
  });
}

/**
 * The in-memory fold plan equal to a scale sweep's hash folds of `keys` (row numbers 0 … n − 1
 * when no key column is used): repeat r of the plan is `foldsOfKeys(foldHash(seed, k, r), keys)`.
 * Scheme "explicit" (each repeat checked by `explicitPlan`: every fold holds a row), `repeats`
 * repeats, seed and generator null (the hash, not a shuffle, made the folds).
 *
 * @example
 * ```ts
 * import { hashFoldPlan } from "./hash.ts";
 * const keys = Array.from({ length: 100 }, (_, i) => i);
 * const plan = hashFoldPlan(keys, { k: 5, seed: 1, repeats: 3 });
 * console.log(plan.k, plan.repeats); // 5 3
 * ```
 */
export function hashFoldPlan(
  keys: ArrayLike<number | bigint | string>,
  options: { readonly k: number; readonly seed: number; readonly repeats?: number },
): FoldPlan {
  const repeats = options.repeats ?? 1;
  const assignment = foldHashes(options.seed, options.k, repeats).map((hash) =>
    explicitPlan(keys.length, { assignment: foldsOfKeys(hash, keys), k: options.k }).assignment[0]
  );
  return makePlan({ scheme: "explicit", nRows: keys.length, k: options.k, repeats, assignment });
}
