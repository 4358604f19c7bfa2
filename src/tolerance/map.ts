import { availableParallelism } from "node:os";
import type { SetupDescription } from "../setup/format";
import { QuietframeError } from "../errors";
import { runRowsInWorkers, TolerancePool } from "./parallel";
import { checkCallbacks, checkWorkers, runRowsInProcess, type ToleranceMap, type ToleranceMapOptions } from "./run";
import { resolveToleranceSpec, type ToleranceMapSpec } from "./spec";

/**
 * A figure of merit over a 2-D grid of two parameters of a set-up: every cell is the set-up
 * with the two values written in (as strings with units, like an explorer control writes
 * them), evaluated through the ordinary pipeline and reduced to one number. Rows are spread
 * over worker threads (all cores by default); `workers: 1` computes in this thread. The
 * values are bit-identical whatever the number of workers.
 *
 * Rejects with a QuietframeError naming the field for a bad spec or set-up, with a
 * ToleranceMapCancelled when `signal` aborts (after every worker has stopped).
 */
export async function toleranceMap(setup: SetupDescription, spec: ToleranceMapSpec, options: ToleranceMapOptions = {}): Promise<ToleranceMap> {
  const started = performance.now();
  checkCallbacks(options);
  const pool = options.pool;
  if (pool !== undefined && !(pool instanceof TolerancePool)) {
    throw new QuietframeError({ path: "options.pool", value: typeof pool, problem: "is not a tolerance pool", allowed: "await TolerancePool.start(threads)" });
  }
  const requested = checkWorkers(options.workers, pool ? pool.size : availableParallelism());
  const { plan, figure } = resolveToleranceSpec(setup, spec);
  const workers = Math.min(requested, plan.y.written.length, pool ? pool.size : Infinity);
  if (pool) return (await pool.run(plan, workers, options)).finish(plan, figure, started, workers);
  const collector = workers === 1 ? await runRowsInProcess(plan, options) : await runRowsInWorkers(plan, workers, options);
  return collector.finish(plan, figure, started, workers);
}
