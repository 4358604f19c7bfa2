/**
 * Worker threads counted through Node's own 'exit' event, so a test observes "no worker is left
 * running" from outside the code under test. Use it as the factory of a module mock:
 *
 *   vi.mock("node:worker_threads", async (original) => (await vi.importActual<typeof TrackedWorkers>("../helpers/tracked-workers")).trackedWorkerThreads(await original()));
 */
import type * as WorkerThreads from "node:worker_threads";

/** Workers created so far, and those that have not exited yet. */
export const tracked = { created: 0, live: new Set<object>() };

export function trackedWorkerThreads(original: typeof WorkerThreads): typeof WorkerThreads {
  class TrackedWorker extends original.Worker {
    constructor(...args: ConstructorParameters<typeof original.Worker>) {
      super(...args);
      tracked.created++;
      tracked.live.add(this);
      this.on("exit", () => tracked.live.delete(this));
    }
  }
  return { ...original, default: { ...original, Worker: TrackedWorker }, Worker: TrackedWorker } as typeof WorkerThreads;
}
