/**
 * Progress of long runs on stderr. Nothing is shown for the first second, so short runs stay
 * silent; after that a terminal gets one line rewritten in place (at most four times a second)
 * and a log gets a new line at most every five seconds. The line is cleared before the run's
 * own output or error is written.
 *
 * @module
 */
import type { Progress, ProgressListener } from "../sweep/sweep.ts";

/**
 * Where progress goes and how time is read (a test passes its own).
 *
 * @example
 * ```ts
 * import type { ProgressSink } from "./progress.ts";
 * const sink: ProgressSink = { write: (s) => console.error(s), terminal: false, now: () => performance.now() };
 * ```
 */
export interface ProgressSink {
  /** Writes text to stderr as it is (no line feed added). */
  write(text: string): void;
  /** Whether stderr is a terminal (then the line is rewritten in place). */
  readonly terminal: boolean;
  /** Milliseconds from a fixed origin. */
  now(): number;
}

/**
 * A progress reporter: the listener to pass to sweep/compare, and `done` to clear its line.
 *
 * @example
 * ```ts
 * import type { ProgressReporter } from "./progress.ts";
 * const finish = (r: ProgressReporter) => r.done();
 * ```
 */
export interface ProgressReporter {
  readonly listener: ProgressListener;
  /** Clears the progress line (terminal) before other output. */
  done(): void;
}

const QUIET_MS = 1000;

/**
 * A reporter writing to `sink`; `candidates` lists compare's candidate names (for "2 of 3").
 *
 * @example
 * ```ts
 * import { progressReporter } from "./progress.ts";
 * let t = 0;
 * const lines: string[] = [];
 * const r = progressReporter({ write: (s) => lines.push(s), terminal: false, now: () => t }, []);
 * t = 6000;
 * r.listener({ stage: "folds", done: 3, total: 10 });
 * console.log(lines); // [ "curbfit: folds 3 of 10 (6.0 s)\n" ]
 * ```
 */
export function progressReporter(
  sink: ProgressSink,
  candidates: readonly string[],
): ProgressReporter {
  const start = sink.now();
  const gap = sink.terminal ? 250 : 5000;
  let last = -Infinity;
  let shown = false;
  const listener = (p: Progress) => {
    const t = sink.now();
    if (t - start < QUIET_MS || t - last < gap) return;
    last = t;
    const which = p.candidate === undefined
      ? ""
      : `candidate ${candidates.indexOf(p.candidate) + 1} of ${candidates.length}, `;
    const line = `curbfit: ${which}${p.stage} ${p.done} of ${p.total} (${
      ((t - start) / 1000).toFixed(1)
    } s)`;
    sink.write(sink.terminal ? `\r\x1b[K${line}` : `${line}\n`);
    shown = true;
  };
  return {
    listener,
    done: () => {
      if (shown && sink.terminal) sink.write("\r\x1b[K");
      shown = false;
    },
  };
}
