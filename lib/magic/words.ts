/**
 * Nearest-word suggestions for the `curb` template: when a word is not one the statement
 * accepts, the closest accepted word by optimal-string-alignment distance (Levenshtein distance
 * plus swaps of neighbouring letters) is offered, if it is close enough to be a likely typo.
 *
 * @module
 */

/**
 * Optimal-string-alignment distance: insertions, deletions, substitutions and swaps of two
 * neighbouring characters each cost 1 (each substring edited at most once).
 *
 * @example
 * ```ts
 * import { editDistance } from "./words.ts";
 * console.log(editDistance("predcit", "predict")); // 1
 * ```
 */
export function editDistance(a: string, b: string): number {
  const x = [...a];
  const y = [...b];
  const d: number[][] = Array.from({ length: x.length + 1 }, (_, i) => {
    const row = new Array<number>(y.length + 1).fill(0);
    row[0] = i;
    return row;
  });
  for (let j = 0; j <= y.length; j++) d[0][j] = j;
  for (let i = 1; i <= x.length; i++) {
    for (let j = 1; j <= y.length; j++) {
      const cost = x[i - 1] === y[j - 1] ? 0 : 1;
      d[i][j] = Math.min(d[i - 1][j] + 1, d[i][j - 1] + 1, d[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && x[i - 1] === y[j - 2] && x[i - 2] === y[j - 1]) {
        d[i][j] = Math.min(d[i][j], d[i - 2][j - 2] + 1);
      }
    }
  }
  return d[x.length][y.length];
}

/** Largest distance still taken for a typo of a word this long. */
function tolerance(length: number): number {
  return length <= 4 ? 1 : length <= 8 ? 2 : 3;
}

/**
 * The accepted word closest to `word` (case is ignored), or undefined when none is close.
 * Ties go to the word listed first.
 *
 * @example
 * ```ts
 * import { nearestWord } from "./words.ts";
 * console.log(nearestWord("lamda", ["lambda", "folds"])); // "lambda"
 * console.log(nearestWord("banana", ["lambda", "folds"])); // undefined
 * ```
 */
export function nearestWord(word: string, accepted: readonly string[]): string | undefined {
  const lower = word.toLowerCase();
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const candidate of accepted) {
    const d = editDistance(lower, candidate.toLowerCase());
    if (d < bestDistance) {
      best = candidate;
      bestDistance = d;
    }
  }
  return bestDistance <= tolerance([...lower].length) ? best : undefined;
}

/**
 * `"a"`, `"a" or "b"`, `"a", "b" or "c"`: accepted words for a message.
 *
 * @example
 * ```ts
 * import { listWords } from "./words.ts";
 * console.log(listWords(["min", "one-se"])); // "min" or "one-se"
 * ```
 */
export function listWords(words: readonly string[]): string {
  const quoted = words.map((w) => `"${w}"`);
  if (quoted.length <= 1) return quoted.join("");
  return `${quoted.slice(0, -1).join(", ")} or ${quoted[quoted.length - 1]}`;
}
