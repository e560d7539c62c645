/**
 * Append-only typed storage for loading columns of unknown length.
 *
 * @module
 */

/** Sizes of the first and of the largest block (entries). */
const FIRST_BLOCK = 1024;
const LARGEST_BLOCK = 65536;

/**
 * Numbers appended one at a time into blocks that are never copied while growing; `collect`
 * copies them once into one array. (Growing one array by doubling would copy every value about
 * twice more, and briefly hold old and new arrays together.)
 *
 * @example
 * ```ts
 * import { Blocks } from "./blocks.ts";
 * const b = new Blocks((n) => new Float64Array(n));
 * b.push(1.5);
 * b.push(2.5);
 * b.push(4);
 * b.collect(); // Float64Array [1.5, 2.5, 4]
 * b.collect(new Uint8Array([1, 0, 1])); // Float64Array [1.5, 4]
 * ```
 */
export class Blocks<A extends Float64Array | Int32Array> {
  readonly #make: (length: number) => A;
  readonly #full: A[] = [];
  #current: A;
  #used = 0;
  /** Entries appended so far. */
  length = 0;

  /** `make(n)` creates a zeroed typed array of n entries. */
  constructor(make: (length: number) => A) {
    this.#make = make;
    this.#current = make(FIRST_BLOCK);
  }

  /** Appends one entry. */
  push(value: number): void {
    if (this.#used === this.#current.length) {
      this.#full.push(this.#current);
      this.#current = this.#make(Math.min(LARGEST_BLOCK, this.#current.length * 2));
      this.#used = 0;
    }
    this.#current[this.#used++] = value;
    this.length++;
  }

  /** All entries in one new array; with `keep`, only those whose `keep` entry is 1. */
  collect(keep?: Uint8Array): A {
    const blocks = [...this.#full, this.#current.subarray(0, this.#used) as A];
    if (keep === undefined) {
      const out = this.#make(this.length);
      let at = 0;
      for (const block of blocks) {
        out.set(block, at);
        at += block.length;
      }
      return out;
    }
    let kept = 0;
    for (let i = 0; i < this.length; i++) kept += keep[i];
    const out = this.#make(kept);
    let row = 0;
    let at = 0;
    for (const block of blocks) {
      for (let i = 0; i < block.length; i++, row++) if (keep[row] === 1) out[at++] = block[i];
    }
    return out;
  }
}
