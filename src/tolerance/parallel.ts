import { existsSync } from "node:fs";
import { join } from "node:path";
import { Worker } from "node:worker_threads";
import type { RowResult } from "./evaluate";
import { RowCollector, ToleranceMapCancelled, type ToleranceMapOptions } from "./run";
import type { TolerancePlan } from "./spec";

/**
 * Rows of a tolerance map evaluated on worker threads (Node). Rows are handed out in small
 * chunks as workers ask for them, so cheap rows (unstable cells) and slow ones balance out;
 * every cell is computed by the same code from the same plan, so where it runs changes no bit.
 */

/** Main thread → worker. */
export interface ToWorker {
  readonly rows: readonly number[];
}

/** Worker → main thread. */
export type FromWorker =
  | { readonly type: "row"; readonly y: number; readonly row: RowResult }
  | { readonly type: "idle" }
  | { readonly type: "failed"; readonly y: number; readonly message: string; readonly stack: string };

/**
 * The compiled worker script. Built code finds it beside itself; code run from the TypeScript
 * sources (the test runner) uses the built one, so `npm run build` must have run.
 */
export function workerScript(): string {
  const fromSources = __filename.endsWith(".ts");
  const file = fromSources ? join(__dirname, "..", "..", "dist", "src", "tolerance", "worker.js") : join(__dirname, "worker.js");
  if (!existsSync(file)) {
    throw new Error(`the tolerance-map worker dist/src/tolerance/worker.js is missing: run "npm run build" first`);
  }
  return file;
}

export function runRowsInWorkers(plan: TolerancePlan, workers: number, options: ToleranceMapOptions): Promise<RowCollector> {
  const collector = new RowCollector(plan);
  const rows = collector.rows;
  const { signal, onProgress } = options;
  if (signal?.aborted) return Promise.reject(new ToleranceMapCancelled(0, rows, signal.reason));
  const script = workerScript();
  // About eight chunks per worker: small enough to balance, large enough to keep messages rare.
  const chunk = Math.max(1, Math.floor(rows / (workers * 8)));

  return new Promise<RowCollector>((resolve, reject) => {
    const pool: Worker[] = [];
    let next = 0;
    let settled = false;

    const stopAll = (): Promise<void> => Promise.all(pool.map((w) => w.terminate())).then(
      () => undefined,
      () => undefined,
    );
    const settle = (outcome: () => void): void => {
      if (settled) return;
      settled = true;
      signal?.removeEventListener("abort", onAbort);
      // Settle only once every worker has exited.
      void stopAll().then(outcome);
    };
    const fail = (error: unknown): void => settle(() => reject(error));
    function onAbort(): void {
      fail(new ToleranceMapCancelled(collector.rowsDone, rows, signal?.reason));
    }
    const feed = (w: Worker): void => {
      if (next >= rows) return;
      const batch: number[] = [];
      while (batch.length < chunk && next < rows) batch.push(next++);
      w.postMessage({ rows: batch } satisfies ToWorker);
    };

    signal?.addEventListener("abort", onAbort, { once: true });
    try {
      for (let k = 0; k < workers; k++) {
        const w = new Worker(script, { workerData: { plan } });
        pool.push(w);
        w.on("message", (m: FromWorker) => {
          if (settled) return;
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
            if (done === rows) settle(() => resolve(collector));
          } else {
            const error = new Error(`tolerance map: row ${m.y} failed in a worker: ${m.message}`);
            error.stack = `${error.message}\n--- in the worker ---\n${m.stack}`;
            fail(error);
          }
        });
        w.on("error", fail);
        w.on("messageerror", fail);
        w.on("exit", (code) => {
          if (!settled) fail(new Error(`a tolerance-map worker stopped (exit code ${code}) before the map was done`));
        });
        feed(w);
      }
    } catch (e) {
      fail(e);
    }
  });
}
