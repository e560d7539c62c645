/**
 * Per-fold terms without re-reading rows. Terms learn parameters from each training fold (no
 * leakage), but only Legendre domains actually change between folds, and a Legendre basis on
 * one domain is an exact linear change of the basis on another (same polynomial space). So the
 * sweep summarizes rows once in the all-rows basis and maps the summaries into each fold's basis:
 *   x_fold = c + Aᵀ x_base   (A block-diagonal by term, c a constant absorbed by the intercept).
 * Terms whose fold parameters equal the base ones map by the identity. Anything else (e.g. a
 * product containing a Legendre factor, or a high-degree change whose matrix entries would
 * amplify rounding) reports `undefined`, and the sweep rebuilds that fold's design from rows.
 *
 * @module
 */
import type { Json, LearnedTerm } from "../design/types.ts";
import { legendreRebase } from "../design/mod.ts";
import type { Moments } from "./moments.ts";

/** One diagonal block of the change of basis. `matrix` null means identity. */
interface Block {
  readonly offset: number;
  readonly size: number;
  /** size×size, row-major: matrix[k·size + j] = weight of base column k in fold column j. */
  readonly matrix: Float64Array | null;
  readonly constant: Float64Array | null;
}

/** A change of basis from base design columns to a fold's design columns. */
export interface BasisChange {
  readonly blocks: readonly Block[];
}

/** The change from `base` terms to `fold` terms, or undefined when it is not a linear map. */
export function basisChange(
  base: readonly LearnedTerm[],
  fold: readonly LearnedTerm[],
): BasisChange | undefined {
  const blocks: Block[] = [];
  let offset = 0;
  for (let t = 0; t < base.length; t++) {
    const size = base[t].names.length;
    const block = termBlock(base[t], fold[t], offset, size);
    if (block === undefined) return undefined;
    blocks.push(block);
    offset += size;
  }
  return { blocks };
}

function termBlock(
  base: LearnedTerm,
  fold: LearnedTerm,
  offset: number,
  size: number,
): Block | undefined {
  if (sameJson(base.params, fold.params)) return { offset, size, matrix: null, constant: null };
  if (base.term.kind !== "legendre") return undefined;
  const from = (base.params as { domain: [number, number] }).domain;
  const to = (fold.params as { domain: [number, number] }).domain;
  const full = legendreRebase(from, to, size);
  const w = size + 1;
  const matrix = new Float64Array(size * size);
  const constant = new Float64Array(size);
  for (let j = 0; j < size; j++) {
    constant[j] = full[j + 1];
    for (let k = 0; k < size; k++) matrix[k * size + j] = full[(k + 1) * w + j + 1];
  }
  // Large entries mean cancellation (high degree on a much narrower fold domain): rebuild instead.
  if (matrix.some((v) => Math.abs(v) > MAX_REBASE_ENTRY)) return undefined;
  return { offset, size, matrix, constant };
}

/** Above this entry size a change of basis would cost more than ~4 digits; rows are re-read. */
const MAX_REBASE_ENTRY = 1e4;

function sameJson(a: Json, b: Json): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

/**
 * Summary in the fold's basis: mean ← c + Aᵀ mean, cross ← Tᵀ cross T with T = diag(A, 1)
 * (the target, last, is unchanged).
 */
export function changeMoments(m: Moments, change: BasisChange): Moments {
  const { d } = m;
  const mean = Float64Array.from(m.mean);
  const right = Float64Array.from(m.cross); // cross · T
  for (const b of change.blocks) {
    if (b.matrix === null) continue;
    const { offset, size, matrix, constant } = b;
    for (let j = 0; j < size; j++) {
      let s = constant![j];
      for (let k = 0; k < size; k++) s += matrix[k * size + j] * m.mean[offset + k];
      mean[offset + j] = s;
    }
    for (let r = 0; r < d; r++) {
      for (let j = 0; j < size; j++) {
        let s = 0;
        for (let k = 0; k < size; k++) s += m.cross[r * d + offset + k] * matrix[k * size + j];
        right[r * d + offset + j] = s;
      }
    }
  }
  const cross = Float64Array.from(right); // Tᵀ · (cross · T)
  for (const b of change.blocks) {
    if (b.matrix === null) continue;
    const { offset, size, matrix } = b;
    for (let j = 0; j < size; j++) {
      for (let c = 0; c < d; c++) {
        let s = 0;
        for (let k = 0; k < size; k++) s += matrix[k * size + j] * right[(offset + k) * d + c];
        cross[(offset + j) * d + c] = s;
      }
    }
  }
  return { count: m.count, d, mean, cross };
}
