/**
 * Ctrl-C during a long command (rank, optimize, spread, sweep local): SIGINT aborts the run's signal,
 * the run stops between steps with a "stopped after N of M" error, and the CLI prints it and
 * exits with status 130 (128 + SIGINT, what shells expect of an interrupted program). Nothing
 * half-computed is printed or written.
 */
import { DesignRunStopped } from "../design/stop";
import { ToleranceMapCancelled } from "../tolerance/run";

/** Exit status of a run stopped by SIGINT. */
export const INTERRUPTED_EXIT = 130;

/** Runs `run` with a signal that SIGINT aborts; the handler is removed when the run settles. */
export async function untilInterrupted<T>(run: (signal: AbortSignal) => Promise<T>): Promise<T> {
  const controller = new AbortController();
  const onInterrupt = (): void => controller.abort(new Error("interrupted (SIGINT)"));
  process.once("SIGINT", onInterrupt);
  try {
    return await run(controller.signal);
  } finally {
    process.off("SIGINT", onInterrupt);
  }
}

/** Whether an error is a run stopped on request (a design run or a tolerance map). */
export function isStoppedRun(e: unknown): e is DesignRunStopped | ToleranceMapCancelled {
  return e instanceof DesignRunStopped || e instanceof ToleranceMapCancelled;
}
