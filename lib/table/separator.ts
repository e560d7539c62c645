/**
 * The field separator of CSV input: which characters may separate fields, how they are named in
 * messages, and the check that stops a file read with the wrong separator at its header line.
 *
 * @module
 */
import { CurbfitError } from "../errors/error.ts";

/** The separator when none is given. */
export const DEFAULT_SEPARATOR = ",";

/** Separators common in exported data, looked for when a header line does not split. */
const COMMON_SEPARATORS = [",", ";", "\t", "|"] as const;

const NAMES: Readonly<Record<string, readonly [one: string, many: string]>> = {
  ",": ["comma", "commas"],
  ";": ["semicolon", "semicolons"],
  "\t": ["tab", "tabs"],
  "|": ["vertical bar", "vertical bars"],
  " ": ["space", "spaces"],
};

/**
 * Why `value` cannot separate CSV fields, as a clause to follow "but", or undefined when it can.
 * A separator is exactly one character; not a double quote (it marks quoted fields), not CR or
 * LF (they end records), and not an ASCII letter or digit, `.`, `+` or `-` (they occur inside
 * numbers and the missing-value tokens, which it would cut in two).
 *
 * @example
 * ```ts
 * import { separatorProblem } from "./separator.ts";
 * separatorProblem(";"); // undefined
 * separatorProblem("\\t"); // "it is 2 characters long; a separator is exactly one character"
 * ```
 */
export function separatorProblem(value: unknown): string | undefined {
  if (typeof value !== "string") return "a separator is a string of one character";
  if (value.length === 0) return "it is empty; a separator is exactly one character";
  if ([...value].length === 1 && value.length === 2) {
    return "it is a character beyond U+FFFF, which cannot separate fields";
  }
  if (value.length > 1) {
    return `it is ${value.length} characters long; a separator is exactly one character`;
  }
  if (/[\uD800-\uDFFF]/.test(value)) return "it is half of a surrogate pair, not a character";
  if (value === '"') return "the double quote marks quoted fields, so it cannot also separate them";
  if (value === "\r" || value === "\n") return "a line break ends a record";
  if (/[A-Za-z0-9.+-]/.test(value)) {
    return "ASCII letters and digits, '.', '+' and '-' occur inside numbers and the " +
      "missing-value tokens (NA, NaN, null), which it would cut in two";
  }
  return undefined;
}

/**
 * A separator as words for messages: `"semicolon"` (or the plural), else the character quoted.
 *
 * @example
 * ```ts
 * import { separatorName } from "./separator.ts";
 * separatorName("\t"); // "tab"
 * separatorName("#", true); // '"#" characters'
 * ```
 */
export function separatorName(separator: string, plural = false): string {
  const name = NAMES[separator];
  if (name !== undefined) return name[plural ? 1 : 0];
  return plural ? `${JSON.stringify(separator)} characters` : JSON.stringify(separator);
}

/**
 * The common separator (comma, semicolon, tab, vertical bar) other than `separator` that occurs
 * most often in `text` (ties: in that order), or undefined when none occurs.
 *
 * @example
 * ```ts
 * import { likelySeparator } from "./separator.ts";
 * likelySeparator("x;y;z", ","); // ";"
 * likelySeparator("x y", ","); // undefined
 * ```
 */
export function likelySeparator(text: string, separator: string): string | undefined {
  let best: string | undefined;
  let bestCount = 0;
  for (const candidate of COMMON_SEPARATORS) {
    if (candidate === separator) continue;
    const count = text.split(candidate).length - 1;
    if (count > bestCount) [best, bestCount] = [candidate, count];
  }
  return best;
}

/**
 * Stops a file that is probably read with the wrong separator: its header line did not split
 * (one field), was not written in quotes, and holds another common separator. A one-column file
 * whose name really contains such a character writes the name in double quotes.
 *
 * @throws {CurbfitError} `BAD_OPTION` naming the option `fieldSeparator`, the source and line.
 *
 * @example
 * ```ts
 * import { checkHeaderSeparator } from "./separator.ts";
 * checkHeaderSeparator(["x", "y"], false, ",", "data.csv", 1); // fine
 * try {
 *   checkHeaderSeparator(["x;y"], false, ",", "data.csv", 1);
 * } catch (e) {
 *   console.log((e as Error).message); // data.csv, line 1, option fieldSeparator: the header ...
 * }
 * ```
 */
export function checkHeaderSeparator(
  header: readonly string[],
  quoted: boolean,
  separator: string,
  source: string,
  line: number,
): void {
  if (header.length !== 1 || quoted) return;
  const likely = likelySeparator(header[0], separator);
  if (likely === undefined) return;
  const count = header[0].split(likely).length - 1;
  const shown = header[0].length > 60 ? `${header[0].slice(0, 57)}...` : header[0];
  throw new CurbfitError(
    "BAD_OPTION",
    `the header line is one column name, ${JSON.stringify(shown)}, which holds ${count} ` +
      `${separatorName(likely, count !== 1)}: the fields are probably separated by ` +
      `${separatorName(likely, true)}, but they are read as separated by ` +
      separatorName(separator, true),
    `Set the field separator to ${JSON.stringify(likely)} (fieldSeparator: ` +
      `${JSON.stringify(likely)} in code, --field-separator ${cliWord(likely)} on the command ` +
      "line); if this really is one column, write its name in double quotes",
    { source, line, option: "fieldSeparator" },
  );
}

/** How a separator is typed after --field-separator in a POSIX shell. */
function cliWord(separator: string): string {
  return separator === "\t" ? "tab" : `'${separator}'`;
}
