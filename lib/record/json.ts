/**
 * Canonical JSON text for records: keys in the order the object holds them (records are built
 * key by key), numbers in JavaScript's shortest round-trip form (ECMAScript Number::toString),
 * non-finite numbers as the strings "NaN", "Infinity", "-Infinity", two-space indentation,
 * lists of numbers (and short lists of text) on one line, and one final line feed. Equal
 * records give equal bytes.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import type { SweepResult } from "../sweep/sweep.ts";
import type { ComparisonResult } from "../sweep/compare.ts";
import { recordOf, type RecordOptions } from "./build.ts";
import type { ModelChoiceRecord } from "./schema.ts";

/**
 * The canonical JSON text of a record, or of the record of a sweep or comparison.
 *
 * @example
 * ```ts
 * import { legendre, sweep } from "../../mod.ts";
 * import { recordJson } from "./json.ts";
 * const x = Array.from({ length: 30 }, (_, i) => i / 29);
 * const s = sweep({ x, y: x.map((v, i) => v * v + 0.1 * Math.sin(5 * i)) }, {
 *   target: "y", terms: [legendre("x", 4)], folds: { k: 5, seed: 8 },
 * });
 * console.log(recordJson(s) === recordJson(s)); // true
 * ```
 */
export function recordJson(
  source: ModelChoiceRecord | SweepResult | ComparisonResult,
  options: RecordOptions = {},
): string {
  const record = "schema" in source ? source : recordOf(source, options);
  return canonicalJson(record) + "\n";
}

/**
 * Canonical JSON text of a JSON-like value (see the module notes); undefined, functions and
 * other non-JSON values are refused.
 *
 * @example
 * ```ts
 * import { canonicalJson } from "./json.ts";
 * console.log(canonicalJson({ a: [1, 0.1, NaN], b: { c: -0 } }));
 * // {
 * //   "a": [1, 0.1, "NaN"],
 * //   "b": {
 * //     "c": 0
 * //   }
 * // }
 * ```
 */
export function canonicalJson(value: unknown, indent = ""): string {
  if (value === null || typeof value === "boolean") return String(value);
  if (typeof value === "number") return numberText(value);
  if (typeof value === "string") return JSON.stringify(value);
  const inner = indent + "  ";
  if (Array.isArray(value)) {
    if (value.length === 0) return "[]";
    if (value.every(isPlain)) {
      const line = `[${value.map((v) => canonicalJson(v)).join(", ")}]`;
      if (!value.some((v) => typeof v === "string") || line.length <= ONE_LINE) return line;
    }
    return `[\n${value.map((v) => inner + canonicalJson(v, inner)).join(",\n")}\n${indent}]`;
  }
  if (typeof value === "object" && !ArrayBuffer.isView(value)) {
    const entries = Object.entries(value);
    if (entries.length === 0) return "{}";
    const lines = entries.map(([k, v]) =>
      `${inner}${JSON.stringify(k)}: ${canonicalJson(v, inner)}`
    );
    return `{\n${lines.join(",\n")}\n${indent}}`;
  }
  throw new CurbfitError(
    "BAD_RECORD",
    `a record may hold only JSON values, but it holds ${String(value)}`,
    "Build records with recordOf or parseRecord",
    { option: "record" },
  );
}

/** Longest one-line list of text; longer ones get a line per item. Lists of numbers never wrap. */
const ONE_LINE = 80;

function isPlain(value: unknown): boolean {
  return value === null || typeof value !== "object";
}

/** Shortest round-trip text; −0 is written as 0, non-finite values as quoted names. */
function numberText(value: number): string {
  if (Number.isFinite(value)) return String(value);
  return JSON.stringify(String(value));
}
