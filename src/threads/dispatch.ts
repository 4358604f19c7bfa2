/**
 * The frame every job on the engine's worker threads runs in (tolerance-map rows, Monte Carlo
 * samples; Node only): it listens to the job's threads, keeps each a few chunks ahead, and
 * settles the job once — with its value, with an error, or when the caller's signal aborts —
 * calling `release` first and detaching every listener, so no later message of the job is
 * looked at. What a chunk is and what a reply means is the job's own business.
 */
import type { Worker } from "node:worker_threads";
import { CHUNKS_AHEAD } from "./engine-threads";
import type { JobOutcome } from "./pool";

/** How a reply settles its job. */
export interface JobSettling<T> {
  readonly finish: (value: T) => void;
  readonly fail: (error: unknown) => void;
}

export interface ThreadJob<T, M> {
  readonly threads: readonly Worker[];
  readonly signal: AbortSignal | undefined;
  /** Called once, before the promise settles: "failed" after an error or an abort, which may leave threads busy. */
  readonly release: (outcome: JobOutcome) => Promise<void>;
  /** What an abort rejects with; undefined when it comes too late to stop anything (every result is in). */
  readonly stopped: () => unknown;
  /** What a thread that exits before the job is done rejects with. */
  readonly exited: (code: number) => Error;
  /** Hands `thread` its next chunk (nothing once every chunk is handed out). */
  readonly feed: (thread: Worker) => void;
  /** A thread's reply (any reply: the job tells its own apart). */
  readonly onMessage: (thread: Worker, message: M, settling: JobSettling<T>) => void;
}

/** Runs the job on its (started) threads; an abort before the start hands out nothing and keeps the threads as they are. */
export function dispatchOnThreads<T, M>(job: ThreadJob<T, M>): Promise<T> {
  const { threads, signal, release } = job;
  if (signal?.aborted) {
    const stopped = job.stopped();
    return release("done").then(() => Promise.reject(stopped));
  }
  return new Promise<T>((resolve, reject) => {
    let settled = false;
    const detach: (() => void)[] = [];
    const settle = (outcome: JobOutcome, end: () => void): void => {
      if (settled) return;
      settled = true;
      signal?.removeEventListener("abort", onAbort);
      for (const d of detach) d();
      void release(outcome).then(end, end);
    };
    const settling: JobSettling<T> = {
      finish: (value) => settle("done", () => resolve(value)),
      fail: (error) => settle("failed", () => reject(error)),
    };
    function onAbort(): void {
      const stopped = job.stopped();
      if (stopped !== undefined) settling.fail(stopped);
    }
    signal?.addEventListener("abort", onAbort, { once: true });
    try {
      for (const w of threads) {
        const onMessage = (m: M): void => {
          if (!settled) job.onMessage(w, m, settling);
        };
        const onExit = (code: number): void => settling.fail(job.exited(code));
        w.on("message", onMessage);
        w.on("error", settling.fail);
        w.on("messageerror", settling.fail);
        w.on("exit", onExit);
        detach.push(() => {
          w.off("message", onMessage);
          w.off("error", settling.fail);
          w.off("messageerror", settling.fail);
          w.off("exit", onExit);
        });
        for (let k = 0; k < CHUNKS_AHEAD; k++) job.feed(w);
      }
    } catch (e) {
      settling.fail(e);
    }
  });
}
