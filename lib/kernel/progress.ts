/**
 * Progress of a sweep or comparison as one notebook output that is updated in place, then
 * replaced by the final result.
 *
 * In Deno's Jupyter kernel an update reaches the notebook only when JavaScript yields to the
 * event loop: `start` is awaited, so its line shows before the work begins, and updates are
 * sent from a timer (at most one per `intervalMs`, default 200 ms). An engine that reports
 * progress from a synchronous loop therefore shows the starting line, then the result; one
 * that yields between folds shows every update. Outside a kernel (`Deno.jupyter` missing)
 * everything here does nothing.
 *
 * The time left is the elapsed time scaled by the work left, elapsed · (1 − f) / f, where f
 * counts finished folds plus one final refit per model, summed over candidates.
 *
 * @module
 */
import type { Progress, ProgressListener } from "../sweep/sweep.ts";
import { escapeHtml } from "../views/escape.ts";

/** A Jupyter MIME bundle: MIME type → content. */
export type Bundle = Readonly<Record<string, unknown>>;

/**
 * Shows or updates an output: the contract of `Deno.jupyter.display(bundle, { raw: true, … })`.
 *
 * @example
 * ```ts
 * import type { DisplaySink } from "./progress.ts";
 * const shown: unknown[] = [];
 * const sink: DisplaySink = async (bundle, options) => void shown.push([bundle, options]);
 * ```
 */
export type DisplaySink = (
  bundle: Bundle,
  options: { readonly display_id: string; readonly update: boolean },
) => Promise<void>;

/**
 * `Deno.jupyter.display` in raw mode when running in Deno's Jupyter kernel, else undefined.
 * (Outside the kernel, reading `Deno.jupyter` throws; that is caught here.)
 *
 * @example
 * ```ts
 * import { jupyterSink } from "./progress.ts";
 * console.log(jupyterSink() === undefined); // true outside a notebook
 * ```
 */
export function jupyterSink(): DisplaySink | undefined {
  let jupyter: { display?: unknown } | undefined;
  try {
    jupyter = (Deno as unknown as { jupyter?: { display?: unknown } }).jupyter;
  } catch {
    return undefined;
  }
  const display = jupyter?.display;
  if (typeof display !== "function") return undefined;
  return (bundle, options) =>
    (display as (b: unknown, o: object) => Promise<void>)(bundle, { raw: true, ...options });
}

/** What the progress line describes. */
export interface ProgressOptions {
  /** Shown first, e.g. "sweeping 60 λ values over 5 folds". */
  readonly title: string;
  /** Candidate names in the order `compare` runs them (omit for a single sweep). */
  readonly candidates?: readonly string[];
  /** Where to show it; default `jupyterSink()`; null turns the display off. */
  readonly sink?: DisplaySink | null;
  /** Least time between updates in ms (default 200). */
  readonly intervalMs?: number;
  /** Clock in ms (default `performance.now`); tests pass their own. */
  readonly now?: () => number;
}

/** A progress output: pass `listener` to sweep/compare, await `start` before, `finish` after. */
export interface ProgressDisplay {
  /**
   * The `progress` option for sweep/compare: keeps the latest report and redraws at most once per
   * `intervalMs` (on a timer, so updates show while an async sweep yields to the event loop).
   */
  readonly listener: ProgressListener;
  /** Shows the starting line (awaited, so it appears before synchronous work starts). */
  start(): Promise<void>;
  /** Replaces the progress line with the final bundle. */
  finish(bundle: Bundle): Promise<void>;
  /** Replaces the progress line with a note that the work stopped, and why. */
  fail(error: unknown): Promise<void>;
}

let displays = 0;

/**
 * A throttled, in-place progress output for sweep/compare progress reports.
 *
 * @example
 * ```ts
 * import { progressDisplay } from "./progress.ts";
 * import { legendre, sweep } from "../../mod.ts";
 * const x = Array.from({ length: 40 }, (_, i) => i / 39);
 * const data = { x, y: x.map((v) => Math.cos(3 * v)) };
 * const progress = progressDisplay({ title: "sweeping 100 λ values over 5 folds" });
 * await progress.start();
 * const s = sweep(data, { target: "y", terms: [legendre("x", 6)], folds: { k: 5, seed: 1 }, progress: progress.listener });
 * await progress.finish({ "text/plain": `chosen λ = ${s.chosen.strength}` });
 * ```
 */
export function progressDisplay(options: ProgressOptions): ProgressDisplay {
  const sink = options.sink === undefined ? jupyterSink() : options.sink;
  if (sink === null || sink === undefined) return silentDisplay();
  const now = options.now ?? (() => performance.now());
  const interval = options.intervalMs ?? 200;
  const id = `curbfit-progress-${++displays}-${Date.now()}`;
  const names = options.candidates ?? [];
  let started = now();
  let latest: Progress | undefined;
  let foldSteps: number | undefined;
  let lastSent = -Infinity;
  let timer: ReturnType<typeof setTimeout> | undefined;
  let chain: Promise<void> = Promise.resolve();
  let shown = false;
  const send = (bundle: Bundle) => {
    const update = shown;
    shown = true;
    chain = chain.then(() => sink(bundle, { display_id: id, update }));
    return chain;
  };
  const flush = () => {
    timer = undefined;
    if (latest === undefined) return;
    lastSent = now();
    const line = describeProgress(latest, names, lastSent - started, foldSteps);
    send(progressBundle(options.title, line));
  };
  const stopTimer = () => {
    if (timer !== undefined) clearTimeout(timer);
    timer = undefined;
  };
  return {
    listener(progress) {
      latest = progress;
      if (progress.stage === "folds") foldSteps = progress.total;
      if (timer === undefined) {
        timer = setTimeout(flush, Math.max(0, lastSent + interval - now()));
      }
    },
    start() {
      started = now();
      lastSent = started;
      return send(progressBundle(options.title, "starting…"));
    },
    finish(bundle) {
      stopTimer();
      return send(bundle);
    },
    fail(error) {
      stopTimer();
      const reason = error instanceof Error ? error.message.split("\n")[0] : String(error);
      const seconds = ((now() - started) / 1000).toFixed(1);
      return send(progressBundle(options.title, `stopped after ${seconds} s: ${reason}`));
    },
  };
}

function silentDisplay(): ProgressDisplay {
  const done = () => Promise.resolve();
  return { listener: () => {}, start: done, finish: done, fail: done };
}

/**
 * The fraction of the work done (0…1) after `p`: each model's folds plus its final refit, the
 * candidates counted equally. `foldSteps` is the fold count seen in earlier reports (the
 * "summaries" and "refit" reports do not carry it); without it those reports count as 0.
 *
 * @example
 * ```ts
 * import { fractionDone } from "./progress.ts";
 * console.log(fractionDone({ stage: "folds", done: 5, total: 10 }, [])); // 5 / 11
 * ```
 */
export function fractionDone(
  p: Progress,
  candidates: readonly string[],
  foldSteps?: number,
): number {
  const known = foldSteps ?? 0;
  const within = p.stage === "folds"
    ? p.done / (p.total + 1)
    : p.stage === "refit"
    ? (p.done >= p.total ? 1 : known / (known + 1))
    : (p.done / p.total) * (known / (known + 1));
  const index = p.candidate === undefined ? -1 : candidates.indexOf(p.candidate);
  return index < 0 ? within : (index + within) / candidates.length;
}

/**
 * One line of progress text, e.g.
 * `fold 7 of 10 · candidate 2 of 3 "degree 12" · 45% · 3.1 s elapsed, about 3.8 s left`.
 *
 * @example
 * ```ts
 * import { describeProgress } from "./progress.ts";
 * console.log(describeProgress({ stage: "folds", done: 3, total: 5 }, [], 1500));
 * // fold 3 of 5 · 50% · 1.5 s elapsed, about 1.5 s left
 * ```
 */
export function describeProgress(
  p: Progress,
  candidates: readonly string[],
  elapsedMs: number,
  foldSteps?: number,
): string {
  const parts: string[] = [];
  if (p.stage === "summaries") parts.push(`summarizing folds (repeat ${p.done + 1} of ${p.total})`);
  if (p.stage === "folds") parts.push(`fold ${p.done} of ${p.total}`);
  if (p.stage === "refit") parts.push(p.done < p.total ? "fitting the chosen model" : "refit done");
  const index = p.candidate === undefined ? -1 : candidates.indexOf(p.candidate);
  if (index >= 0) {
    parts.push(`candidate ${index + 1} of ${candidates.length} ${JSON.stringify(p.candidate)}`);
  }
  const f = fractionDone(p, candidates, foldSteps);
  parts.push(`${Math.floor(100 * f)}%`);
  const elapsed = `${(elapsedMs / 1000).toFixed(1)} s elapsed`;
  parts.push(
    f > 0 && f < 1
      ? `${elapsed}, about ${((elapsedMs * (1 - f)) / f / 1000).toFixed(1)} s left`
      : elapsed,
  );
  return parts.join(" · ");
}

/**
 * The progress output: text/plain and text/html (a `<progress>` bar needs no script).
 *
 * @example
 * ```ts
 * import { progressBundle } from "./progress.ts";
 * console.log(progressBundle("sweeping", "fold 1 of 5")["text/plain"]); // curbfit: sweeping — fold 1 of 5
 * ```
 */
export function progressBundle(title: string, line: string): Record<string, string> {
  return {
    "text/plain": `curbfit: ${title} — ${line}`,
    "text/html": `<div><strong>curbfit</strong>: ${escapeHtml(title)} — ${escapeHtml(line)}</div>`,
  };
}
