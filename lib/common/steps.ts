/**
 * Long computations written once as generators that yield between steps (e.g. after each
 * fold), then driven either straight through (synchronous API) or with a pause on the event
 * loop at each step, so a notebook kernel can send progress updates while the work runs.
 *
 * @module
 */

/** A computation that yields between steps and returns T. */
export type Steps<T> = Generator<void, T, void>;

/**
 * Runs all steps at once.
 *
 * @example
 * ```ts
 * import { runSteps } from "./steps.ts";
 * function* count() { yield; yield; return 2; }
 * console.log(runSteps(count())); // 2
 * ```
 */
export function runSteps<T>(steps: Steps<T>): T {
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
  }
}

/**
 * Runs the steps, yielding to the event loop (a macrotask) between them.
 *
 * @example
 * ```ts
 * import { runStepsAsync } from "./steps.ts";
 * function* count() { yield; return 1; }
 * console.log(await runStepsAsync(count())); // 1
 * ```
 */
export async function runStepsAsync<T>(steps: Steps<T>): Promise<T> {
  for (;;) {
    const next = steps.next();
    if (next.done) return next.value;
    await new Promise((resolve) => setTimeout(resolve, 0));
  }
}
