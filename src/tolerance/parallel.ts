import type { Worker } from "node:worker_threads";
import { dispatchOnThreads } from "../threads/dispatch";
import { nextChunkSize } from "../threads/engine-threads";
import { EngineThreadPool, type JobOutcome, runOnFreshThreads } from "../threads/pool";
import type { RowResult } from "./evaluate";
import { RowCollector, ToleranceMapCancelled, type ToleranceMapOptions } from "./run";
import type { TolerancePlan } from "./spec";

/**
 * Rows of a tolerance map evaluated on worker threads (Node). Rows are handed out in chunks
 * that shrink as the map nears its end (a share of what is left), two chunks ahead per worker
 * so that no worker waits for a message between chunks; cheap rows (unstable cells) and slow
 * ones balance out. Every cell is computed by the same code from the same plan, so where it
 * runs changes no bit.
 */

/** Main thread → worker: rows of map `map`; `plan` comes with a pooled worker's first chunk of a map. */
export interface ToWorker {
  readonly map: number;
  readonly plan?: TolerancePlan;
  readonly rows: readonly number[];
}

/** Worker → main thread. */
export type FromWorker =
  | { readonly type: "ready"; readonly map: number }
  | { readonly type: "row"; readonly map: number; readonly y: number; readonly row: RowResult }
  | { readonly type: "idle"; readonly map: number }
  | { readonly type: "failed"; readonly map: number; readonly y: number; readonly message: string; readonly stack: string };

/**
 * Hands the rows of one map to the given (started) workers and collects them, the plan with each
 * worker's first chunk (a thread serves many maps). Resolves
 * when every row is in; on failure or abort it stops feeding and rejects (dispatch.ts calls
 * `release` once first, after which no message of this map is looked at).
 */
function dispatchRows(workers: readonly Worker[], plan: TolerancePlan, map: number, options: ToleranceMapOptions, release: (outcome: JobOutcome) => Promise<void>): Promise<RowCollector> {
  const collector = new RowCollector(plan);
  const rows = collector.rows;
  const { signal, onProgress } = options;
  let next = 0;
  const planSent = new Set<Worker>();
  const feed = (w: Worker): void => {
    if (next >= rows) return;
    const chunk = nextChunkSize(rows - next, workers.length);
    const batch: number[] = [];
    while (batch.length < chunk && next < rows) batch.push(next++);
    const withPlan = !planSent.has(w);
    planSent.add(w);
    w.postMessage((withPlan ? { map, plan, rows: batch } : { map, rows: batch }) satisfies ToWorker);
  };
  return dispatchOnThreads<RowCollector, FromWorker>({
    threads: workers,
    signal,
    release,
    feed,
    stopped: () => new ToleranceMapCancelled(collector.rowsDone, rows, signal?.reason),
    exited: (code) => new Error(`a tolerance-map worker stopped (exit code ${code}) before the map was done`),
    onMessage: (w, m, { finish, fail }) => {
      if (m.map !== map) return;
      if (m.type === "idle") {
        feed(w);
      } else if (m.type === "row") {
        const done = collector.add(m.y, m.row);
        try {
          onProgress?.(done, rows);
        } catch (e) {
          fail(e);
          return;
        }
        if (done === rows) finish(collector);
      } else if (m.type === "failed") {
        const error = new Error(`tolerance map: row ${m.y} failed in a worker: ${m.message}`);
        error.stack = `${error.message}\n--- in the worker ---\n${m.stack}`;
        fail(error);
      }
    },
  });
}

/** Rows of one map on `workers` fresh threads, which are stopped before the promise settles. */
export function runRowsInWorkers(plan: TolerancePlan, workers: number, options: ToleranceMapOptions): Promise<RowCollector> {
  if (options.signal?.aborted) return Promise.reject(new ToleranceMapCancelled(0, plan.y.written.length, options.signal.reason));
  return runOnFreshThreads(workers, (used, map, release) => dispatchRows(used, plan, map, options, release));
}

/**
 * Worker threads kept running between jobs, so a job does not pay for starting threads and
 * compiling the engine again: start one with `TolerancePool.start(threads)`, pass it as
 * `toleranceMap(setup, spec, { pool })` or `spreadAnalysisOnThreads(setup, figure, uncertain,
 * { pool })` any number of times (jobs on one pool run one after another, in the order they
 * were asked for), and `close()` it when done. A map or spread that fails or is stopped stops
 * the pool's threads and the pool starts fresh ones for the next job, so no stale row or
 * sample is ever computing.
 */
export class TolerancePool extends EngineThreadPool {
  /** Starts `size` worker threads and resolves once each has loaded the engine. */
  static override start(size: number): Promise<TolerancePool> {
    return EngineThreadPool.started(new TolerancePool(size));
  }

  /** Rows of one map on the pool's threads (at most `limit` of them); waits for the jobs asked for before. */
  run(plan: TolerancePlan, limit: number, options: ToleranceMapOptions): Promise<RowCollector> {
    return this.runJob(limit, (used, map, release) => dispatchRows(used, plan, map, options, release));
  }
}
