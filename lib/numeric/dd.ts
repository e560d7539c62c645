/**
 * Double-double arithmetic from error-free transformations: a value is the unevaluated sum
 * hi + lo with |lo| <= ulp(hi)/2, giving about 32 significant digits.
 *
 * Sources: Knuth's TwoSum (TAOCP vol. 2, §4.2.2), Dekker's splitting and TwoProduct
 * (Dekker 1971, "A floating-point technique for extending the available precision").
 * JavaScript has no fused multiply-add, so products use Dekker's split.
 *
 * Functions return a fresh `[hi, lo]` pair only where noted; hot loops use the accumulator.
 *
 * @module
 */

const SPLITTER = 134217729; // 2^27 + 1 (Dekker)

/** A double-double value as `[hi, lo]`. */
export type DD = readonly [number, number];

/**
 * High half of Dekker's split: a = h + (a − h) exactly, with h and a − h of at most 26
 * significant bits each, so products of halves are exact.
 *
 * @example
 * ```ts
 * import { splitHigh } from "./dd.ts";
 * const a = 0.1;
 * const h = splitHigh(a);
 * console.log(h + (a - h) === a); // true
 * ```
 */
export function splitHigh(a: number): number {
  const t = SPLITTER * a;
  return t - (t - a);
}

/**
 * The rounding error of p = fl(a·b) from the split halves of a and b (a = aHi + aLo,
 * b = bHi + bLo, from `splitHigh`): a·b = p + productError(…) exactly (Dekker's TwoProduct).
 *
 * @example
 * ```ts
 * import { productError, splitHigh } from "./dd.ts";
 * const a = 0.1, b = 0.3, ah = splitHigh(a), bh = splitHigh(b);
 * console.log(productError(a * b, ah, a - ah, bh, b - bh)); // about 1.7e-18
 * ```
 */
export function productError(
  p: number,
  aHi: number,
  aLo: number,
  bHi: number,
  bLo: number,
): number {
  return ((aHi * bHi - p) + aHi * bLo + aLo * bHi) + aLo * bLo;
}

/**
 * The rounding error of s = fl(a + b): a + b = s + sumError(a, b, s) exactly (Knuth's TwoSum).
 *
 * @example
 * ```ts
 * import { sumError } from "./dd.ts";
 * console.log(sumError(1, 2 ** -60, 1 + 2 ** -60)); // 8.673617379884035e-19
 * ```
 */
export function sumError(a: number, b: number, s: number): number {
  const bb = s - a;
  return (a - (s - bb)) + (b - bb);
}

/** Error-free sum: a + b = s + e exactly. */
export function twoSum(a: number, b: number): DD {
  const s = a + b;
  return [s, sumError(a, b, s)];
}

/** Error-free product: a * b = p + e exactly (barring overflow), by Dekker's split. */
export function twoProduct(a: number, b: number): DD {
  const p = a * b;
  const ah = splitHigh(a);
  const bh = splitHigh(b);
  return [p, productError(p, ah, a - ah, bh, b - bh)];
}

/** Product of two double-double values, rounded to double-double. */
export function ddMul(aHi: number, aLo: number, bHi: number, bLo: number): DD {
  const [p, e] = twoProduct(aHi, bHi);
  return quickTwoSum(p, e + (aHi * bLo + aLo * bHi));
}

/** Renormalize s + e when |s| >= |e|. */
function quickTwoSum(s: number, e: number): DD {
  const h = s + e;
  return [h, e - (h - s)];
}

/**
 * Compensated accumulator for sums of products in double-double. Use one per dot product:
 * `acc.reset(); acc.addProduct(a, b) ...; acc.hi + acc.lo`.
 *
 * @example
 * ```ts
 * import { DDAccumulator } from "./dd.ts";
 * const acc = new DDAccumulator();
 * acc.add(1e16); acc.add(1); acc.add(-1e16);
 * console.log(acc.value()); // 1
 * ```
 */
export class DDAccumulator {
  hi = 0;
  lo = 0;

  reset(): void {
    this.hi = 0;
    this.lo = 0;
  }

  /** Adds a double. */
  add(a: number): void {
    const s = this.hi + a;
    this.lo += sumError(this.hi, a, s);
    this.hi = s;
  }

  /** Adds a double-double value hi + lo. */
  addDD(hi: number, lo: number): void {
    this.add(hi);
    this.lo += lo;
  }

  /** Adds the exact product a * b. */
  addProduct(a: number, b: number): void {
    const p = a * b;
    const ah = splitHigh(a);
    const bh = splitHigh(b);
    this.add(p);
    this.lo += productError(p, ah, a - ah, bh, b - bh);
  }

  /** Adds (aHi + aLo) * b, with the aLo * b term in plain double (its error is far below lo). */
  addDDProduct(aHi: number, aLo: number, b: number): void {
    this.addProduct(aHi, b);
    this.lo += aLo * b;
  }

  /** The accumulated value rounded to double. */
  value(): number {
    return this.hi + this.lo;
  }
}
