/**
 * A fingerprint of a fold plan's assignment, for records: equal digests mean the same rows were
 * in the same folds.
 *
 * @module
 */

import { createHash } from "node:crypto";
import type { FoldPlan } from "./plan.ts";

/**
 * SHA-256 (FIPS 180-4) of the plan's assignment, as 64 lowercase hex digits. The hashed bytes
 * are, for each repeat in order, each row's fold index in row order as a 4-byte little-endian
 * two's-complement integer (so −1 is ff ff ff ff): 4 · repeats · nRows bytes, nothing else.
 * The same on every machine, whatever its byte order.
 *
 * @example
 * ```ts
 * import { leaveOneOutPlan } from "./schemes.ts";
 * import { assignmentDigest } from "./digest.ts";
 * assignmentDigest(leaveOneOutPlan(2)); // SHA-256 of bytes 00 00 00 00 01 00 00 00
 * ```
 */
export function assignmentDigest(plan: FoldPlan): string {
  const hash = createHash("sha256");
  for (const folds of plan.assignment) hash.update(littleEndianBytes(folds));
  return hash.digest("hex");
}

/** The int32 values as little-endian bytes, independent of the machine's byte order. */
function littleEndianBytes(values: Int32Array): Uint8Array {
  const bytes = new Uint8Array(values.length * 4);
  const view = new DataView(bytes.buffer);
  for (let i = 0; i < values.length; i++) view.setInt32(i * 4, values[i], true);
  return bytes;
}
