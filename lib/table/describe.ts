/**
 * Small helpers that word values and counts for error messages.
 *
 * @module
 */

/**
 * Short description of a value of unknown type: `"abc"`, `12`, `null`, `an array`, `a Date`.
 *
 * @example
 * ```ts
 * import { describeValue } from "./describe.ts";
 * describeValue("7"); // '"7"'
 * describeValue(new Map()); // "a Map"
 * ```
 */
export function describeValue(value: unknown): string {
  if (typeof value === "string") return JSON.stringify(value);
  if (typeof value === "bigint") return `${value}n`;
  if (typeof value !== "object" && typeof value !== "function") return String(value);
  if (value === null) return "null";
  if (Array.isArray(value)) return "an array";
  if (typeof value === "function") return "a function";
  return `a ${value.constructor?.name ?? "object"}`;
}

/**
 * `n` and the noun, plural unless `n` is 1: "1 field", "3 fields".
 *
 * @example
 * ```ts
 * import { count } from "./describe.ts";
 * count(1, "row"); // "1 row"
 * count(0, "row"); // "0 rows"
 * ```
 */
export function count(n: number, noun: string): string {
  return `${n} ${noun}${n === 1 ? "" : "s"}`;
}
