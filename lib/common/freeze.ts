/**
 * Freezing result objects so callers cannot change what a fit or sweep reported.
 *
 * @module
 */

/**
 * Freezes an object graph in place (typed arrays are left as they are: they cannot be frozen;
 * results copy them from internal state) and returns it.
 *
 * @example
 * ```ts
 * import { deepFreeze } from "./freeze.ts";
 * const r = deepFreeze({ a: [1, 2] });
 * console.log(Object.isFrozen(r.a)); // true
 * ```
 */
export function deepFreeze<T>(value: T): T {
  if (value && typeof value === "object" && !ArrayBuffer.isView(value) && !Object.isFrozen(value)) {
    for (const v of Object.values(value)) deepFreeze(v);
    Object.freeze(value);
  }
  return value;
}
