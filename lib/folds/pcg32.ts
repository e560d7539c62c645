/**
 * The one pseudo-random generator curbfit uses: PCG32, the "XSH RR" member of the PCG family
 * (M. E. O'Neill, "PCG: A Family of Simple Fast Space-Efficient Statistically Good Algorithms
 * for Random Number Generation", 2014): a 64-bit linear congruential state with a selectable odd
 * increment (the stream), and a 32-bit output made by an xorshift-high followed by a random
 * rotation. Seeding and the bounded-integer method follow the authors' basic C library
 * (`pcg32_srandom_r`, `pcg32_boundedrand_r`), so outputs match its published demo output.
 *
 * The 64-bit state is kept as two unsigned 32-bit halves and multiplied with `Math.imul` and
 * 16-bit partial products; no BigInt is used (measured faster, see README.md).
 *
 * @module
 */

import { CurbfitError } from "../errors/error.ts";

/** PCG's default 64-bit LCG multiplier 6364136223846793005 = 0x5851F42D_4C957F2D, in halves. */
const MUL_HI = 0x5851f42d;
const MUL_LO = 0x4c957f2d;
const MUL_LO_LOW16 = MUL_LO & 0xffff;
const MUL_LO_HIGH16 = MUL_LO >>> 16;

const TWO_POW_32 = 4294967296;
const TWO_POW_26 = 67108864;
const TWO_POW_53 = 9007199254740992;

/**
 * A seeded PCG32 stream of pseudo-random numbers. Same `(seed, stream)` ⇒ same numbers, on every
 * machine. `seed` becomes PCG's 64-bit `initstate` and `stream` its `initseq` (the stream
 * selector): both are non-negative safe integers (< 2^53), taken as unsigned 64-bit integers
 * whose top 11 bits are zero. Never mutates anything but itself.
 *
 * @example
 * ```ts
 * import { SeededStream } from "./pcg32.ts";
 * const s = new SeededStream(42, 54);
 * s.nextUint32(); // 0xa15c02b7, as in the PCG authors' demo output
 * s.nextBelow(6); // an integer in 0..5, unbiased
 * s.nextDouble(); // a double in [0, 1) with 53 random bits
 * ```
 */
export class SeededStream {
  /** The seed this stream was made with. */
  readonly seed: number;
  /** The stream selector (PCG's `initseq`) this stream was made with. */
  readonly stream: number;
  #stateHi = 0;
  #stateLo = 0;
  readonly #incHi: number;
  readonly #incLo: number;

  /**
   * Seeds like the authors' `pcg32_srandom_r(rng, initstate = seed, initseq = stream)`.
   *
   * @example
   * ```ts
   * import { SeededStream } from "./pcg32.ts";
   * const repeat3 = new SeededStream(20240611, 3); // seed 20240611, stream 3
   * ```
   */
  constructor(seed: number, stream = 0) {
    requireSafeCount(seed, "seed");
    requireSafeCount(stream, "stream");
    this.seed = seed;
    this.stream = stream;
    const seqHi = Math.floor(stream / TWO_POW_32);
    const seqLo = stream >>> 0;
    // inc = (initseq << 1) | 1, as 64 bits.
    this.#incHi = ((seqHi << 1) | (seqLo >>> 31)) >>> 0;
    this.#incLo = ((seqLo << 1) | 1) >>> 0;
    // pcg32_srandom_r: state = 0; step; state += initstate; step.
    this.#step();
    const initLo = seed >>> 0;
    const lo = (this.#stateLo + initLo) >>> 0;
    const carry = lo < initLo ? 1 : 0;
    this.#stateHi = (this.#stateHi + Math.floor(seed / TWO_POW_32) + carry) >>> 0;
    this.#stateLo = lo;
    this.#step();
  }

  /**
   * The next 32-bit output as an unsigned integer in 0..2^32−1.
   *
   * @example
   * ```ts
   * import { SeededStream } from "./pcg32.ts";
   * const u = new SeededStream(7).nextUint32(); // 0 <= u < 2 ** 32
   * ```
   */
  nextUint32(): number {
    const oldHi = this.#stateHi;
    const oldLo = this.#stateLo;
    this.#step();
    // xorshifted = ((old >> 18) ^ old) >> 27, truncated to 32 bits.
    const xHi = oldHi ^ (oldHi >>> 18);
    const xLo = oldLo ^ ((oldLo >>> 18) | (oldHi << 14));
    const xorshifted = (xLo >>> 27) | (xHi << 5);
    const rot = oldHi >>> 27;
    return ((xorshifted >>> rot) | (xorshifted << (-rot & 31))) >>> 0;
  }

  /**
   * An unbiased integer in 0..bound−1, by the PCG authors' rejection method: outputs below
   * (2^32 − bound) mod bound are discarded, so every residue is equally likely.
   * `bound` is an integer in 1..2^32.
   *
   * @example
   * ```ts
   * import { SeededStream } from "./pcg32.ts";
   * const die = new SeededStream(2024).nextBelow(6) + 1; // 1..6
   * ```
   */
  nextBelow(bound: number): number {
    if (!Number.isInteger(bound) || bound < 1 || bound > TWO_POW_32) {
      throw new CurbfitError(
        "BAD_OPTION",
        `option bound is ${bound}, but it must be an integer from 1 to 2^32`,
        "Pass a whole number of outcomes between 1 and 4294967296",
        { option: "bound" },
      );
    }
    const threshold = (TWO_POW_32 - bound) % bound;
    for (;;) {
      const r = this.nextUint32();
      if (r >= threshold) return r % bound;
    }
  }

  /**
   * A double in [0, 1) with 53 random bits: (a >>> 5)·2^26 + (b >>> 6), divided by 2^53, where
   * a and b are the next two 32-bit outputs in that order.
   *
   * @example
   * ```ts
   * import { SeededStream } from "./pcg32.ts";
   * const x = new SeededStream(1).nextDouble(); // 0 <= x < 1
   * ```
   */
  nextDouble(): number {
    const a = this.nextUint32() >>> 5;
    const b = this.nextUint32() >>> 6;
    return (a * TWO_POW_26 + b) / TWO_POW_53;
  }

  /**
   * A uniformly random permutation of 0..n−1 (Fisher–Yates, Durstenfeld's form): start from
   * the identity and, for i = n down to 2, swap entry `nextBelow(i)` with entry i−1. This is the
   * same walk the PCG authors' demo uses to deal cards, so it is checked against their output.
   *
   * @example
   * ```ts
   * import { SeededStream } from "./pcg32.ts";
   * const order = new SeededStream(1).permutation(5); // Int32Array [3, 4, 0, 1, 2]
   * ```
   */
  permutation(n: number): Int32Array {
    requireSafeCount(n, "n");
    const order = new Int32Array(n);
    for (let i = 0; i < n; i++) order[i] = i;
    for (let i = n; i > 1; i--) {
      const chosen = this.nextBelow(i);
      const held = order[chosen];
      order[chosen] = order[i - 1];
      order[i - 1] = held;
    }
    return order;
  }

  /** state = state · multiplier + inc (mod 2^64), on 32-bit halves. */
  #step(): void {
    const hi = this.#stateHi;
    const lo = this.#stateLo;
    // Full 64-bit product of lo · MUL_LO from 16-bit partial products (each < 2^32, exact).
    const a0 = lo & 0xffff;
    const a1 = lo >>> 16;
    const p00 = a0 * MUL_LO_LOW16;
    const p01 = a0 * MUL_LO_HIGH16;
    const p10 = a1 * MUL_LO_LOW16;
    const mid = (p00 >>> 16) + (p01 & 0xffff) + (p10 & 0xffff);
    const carryHi = a1 * MUL_LO_HIGH16 + (p01 >>> 16) + (p10 >>> 16) + (mid >>> 16);
    const productLo = Math.imul(lo, MUL_LO) >>> 0;
    const productHi = (carryHi + Math.imul(hi, MUL_LO) + Math.imul(lo, MUL_HI)) >>> 0;
    const sumLo = (productLo + this.#incLo) >>> 0;
    const carry = sumLo < productLo ? 1 : 0;
    this.#stateHi = (productHi + this.#incHi + carry) >>> 0;
    this.#stateLo = sumLo;
  }
}

/** Throws unless `value` is an integer in 0..2^53−1. */
function requireSafeCount(value: number, option: string): void {
  if (!Number.isSafeInteger(value) || value < 0) {
    throw new CurbfitError(
      "BAD_OPTION",
      `option ${option} is ${value}, but it must be a whole number from 0 to 2^53-1`,
      `Pass a non-negative integer for ${option}, for example 20240611`,
      { option },
    );
  }
}
