/**
 * Driving a long run given as a generator of steps (optimizeSteps: one optimizer start a step;
 * spreadSteps: one block of samples): all at once in this thread (runToEnd), or in slices with
 * a turn of the event loop between them (runInSlices), so that a page stays responsive and a
 * Stop button, an abort event or SIGINT is heard between steps. The steps are the same either
 * way, so the result has the same bits. Platform-free.
 */
import { yieldToEventLoop } from "../threads/event-loop";

/** Runs every step now and returns the result. */
export function runToEnd<T>(steps: Generator<unknown, T>): T {
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
  }
}

export interface SliceOptions {
  /**
   * Longest stretch of steps between two pauses, in ms of the given clock (default 0: a pause
   * after every step). A step is never cut; a slice ends after the step that passes the time.
   */
  readonly sliceMs?: number;
  /** The clock (default performance.now). */
  readonly now?: () => number;
  /** The pause between slices (default a turn of the event loop). */
  readonly pause?: () => Promise<void>;
  /** Asked after each step: true ends the slice there (e.g. a step left something to draw). */
  readonly endSliceAfter?: () => boolean;
}

/** Runs the steps in slices with a pause between them; resolves to the result (rejects with what a step throws). */
export async function runInSlices<T>(steps: Generator<unknown, T>, options: SliceOptions = {}): Promise<T> {
  const sliceMs = options.sliceMs ?? 0;
  const now = options.now ?? (() => performance.now());
  const pause = options.pause ?? yieldToEventLoop;
  let sliceStarted = now();
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
    if (now() - sliceStarted >= sliceMs || options.endSliceAfter?.()) {
      await pause();
      sliceStarted = now();
    }
  }
}
