/**
 * Stopping a long design run (optimizer starts, Monte Carlo samples) with an AbortSignal: the
 * signal is checked between starts or blocks of samples, and a stopped run rejects with a
 * DesignRunStopped saying how far it got. Nothing half-computed is returned: the partial
 * starts or samples are dropped, never assembled into a result. Platform-free.
 */
import { QuietframeError } from "../errors";

/** The rejection of a stopped run: "optimize stopped after 2 of 8 starts; no result". */
export class DesignRunStopped extends Error {
  readonly done: number;
  readonly total: number;
  readonly unit: string;
  constructor(run: string, done: number, total: number, unit: string, reason?: unknown) {
    super(`${run} stopped after ${done} of ${total} ${unit}; no result is given for a stopped run`, { cause: reason });
    // The name the platform gives aborted work, so callers that test for it need not know this class.
    this.name = "AbortError";
    this.done = done;
    this.total = total;
    this.unit = unit;
  }
}

/** Checks an options.signal: absent, or something with the AbortSignal shape. */
export function checkStopSignal(signal: unknown, path = "options.signal"): AbortSignal | undefined {
  if (signal === undefined) return undefined;
  const s = signal as { aborted?: unknown; addEventListener?: unknown } | null;
  if (typeof s !== "object" || s === null || typeof s.aborted !== "boolean" || typeof s.addEventListener !== "function") {
    throw new QuietframeError({ path, value: typeof signal, problem: "is not an AbortSignal", allowed: "an AbortController's signal" });
  }
  return signal as AbortSignal;
}

/** Throws DesignRunStopped when the signal has been aborted. */
export function stopIfAborted(signal: AbortSignal | undefined, run: string, done: number, total: number, unit: string): void {
  if (signal?.aborted) throw new DesignRunStopped(run, done, total, unit, signal.reason);
}
