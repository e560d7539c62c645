/**
 * Rebuilding terms from their JSON form (`Term.spec`), e.g. when a record is replayed.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";
import { indicators } from "./indicators.ts";
import { legendre } from "./legendre.ts";
import { column, power } from "./power.ts";
import { product } from "./product.ts";
import type { Term } from "./types.ts";

/**
 * The term whose `spec` is `spec`: the inverse of `term.spec`, so
 * `termFromSpec(t.spec).spec` deep-equals `t.spec` for every term `t`.
 * Option values are checked exactly as the term constructors check them.
 *
 * @example
 * ```ts
 * import { termFromSpec } from "./spec.ts";
 * const term = termFromSpec({ kind: "product", left: { kind: "legendre", column: "x", degree: 3 }, right: { kind: "column", column: "z" } });
 * console.log(term.label); // product(legendre(x, 3), column(z))
 * ```
 */
export function termFromSpec(spec: unknown, where = "spec"): Term {
  if (typeof spec !== "object" || spec === null || Array.isArray(spec)) {
    throw badSpec(where, `is ${JSON.stringify(spec) ?? String(spec)}, not an object`);
  }
  const s = spec as Record<string, unknown>;
  switch (s.kind) {
    case "legendre":
      return legendre(
        s.column as string,
        s.degree as number,
        s.domain === undefined ? {} : { domain: s.domain as [number, number] },
      );
    case "power":
      return power(s.column as string, s.degree as number);
    case "column":
      return column(s.column as string);
    case "indicators":
      return indicators(s.column as string);
    case "product":
      return product(
        termFromSpec(s.left, `${where}.left`),
        termFromSpec(s.right, `${where}.right`),
      );
    default:
      throw badSpec(`${where}.kind`, `is ${JSON.stringify(s.kind) ?? "missing"}`);
  }
}

/** BAD_OPTION for a malformed spec. */
function badSpec(option: string, what: string): CurbfitError {
  return new CurbfitError(
    "BAD_OPTION",
    `term ${option} ${what}; kind must be one of "legendre", "power", "column", "indicators", "product"`,
    "Pass the spec of a term exactly as a record stores it",
    { option },
  );
}
