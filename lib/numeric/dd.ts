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

/** Error-free sum: a + b = s + e exactly. */
export function twoSum(a: number, b: number): DD {
  const s = a + b;
  const bb = s - a;
  const e = (a - (s - bb)) + (b - bb);
  return [s, e];
}

/** Error-free product: a * b = p + e exactly (barring overflow), by Dekker's split. */
export function twoProduct(a: number, b: number): DD {
  const p = a * b;
  let t = SPLITTER * a;
  const ah = t - (t - a);
  const al = a - ah;
  t = SPLITTER * b;
  const bh = t - (t - b);
  const bl = b - bh;
  const e = ((ah * bh - p) + ah * bl + al * bh) + al * bl;
  return [p, e];
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
    const bb = s - this.hi;
    const e = (this.hi - (s - bb)) + (a - bb);
    this.lo += e;
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
    let t = SPLITTER * a;
    const ah = t - (t - a);
    const al = a - ah;
    t = SPLITTER * b;
    const bh = t - (t - b);
    const bl = b - bh;
    const e = ((ah * bh - p) + ah * bl + al * bh) + al * bl;
    this.add(p);
    this.lo += e;
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
