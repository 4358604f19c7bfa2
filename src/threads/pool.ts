/**
 * Worker threads of the engine kept running between jobs (Node only), so a job does not pay
 * for starting threads and compiling the engine again. The pool hands its threads to one job
 * at a time, in the order the jobs were asked for; what a job sends the threads (map rows,
 * spread samples) is the job's own business. TolerancePool (src/tolerance/parallel.ts) is the
 * public face of it; Monte Carlo spreads take the same object (src/design/spread-threads.ts).
 */
import { Worker } from "node:worker_threads";
import { workerScript } from "./engine-threads";

/** How a job ended: "failed" (an error or a stop) may leave threads busy with stale work. */
export type JobOutcome = "done" | "failed";

/**
 * A job on the pool's threads: `turn` numbers the pool's jobs (1, 2, …; a thread's replies
 * carry it, so a reply left over from an earlier job is told apart); `release` must be
 * called once when the job settles, before its promise does.
 */
export type PoolJob<T> = (threads: readonly Worker[], turn: number, release: (outcome: JobOutcome) => Promise<void>) => Promise<T>;

export class EngineThreadPool {
  private workers: Worker[] = [];
  private turns = 0;
  private queue: Promise<unknown> = Promise.resolve();
  private closed = false;

  protected constructor(readonly size: number) {}

  /** A pool of `size` threads (an integer ≥ 1), started; resolves once each thread has loaded the engine. */
  static start(size: number): Promise<EngineThreadPool> {
    return EngineThreadPool.started(new EngineThreadPool(size));
  }

  /** `pool` with its threads started (what each kind of pool's start does). */
  protected static async started<P extends EngineThreadPool>(pool: P): Promise<P> {
    if (!Number.isInteger(pool.size) || pool.size < 1) throw new RangeError(`a pool of worker threads needs an integer number of threads ≥ 1, got ${pool.size}`);
    await pool.spawn();
    return pool;
  }

  private async spawn(): Promise<void> {
    const script = workerScript();
    const workers = Array.from({ length: this.size }, () => new Worker(script));
    this.workers = workers;
    await Promise.all(
      workers.map(
        (w) =>
          new Promise<void>((resolve, reject) => {
            const onMessage = (m: { readonly type?: unknown }): void => {
              if (m.type !== "ready") return;
              w.off("message", onMessage);
              w.off("error", reject);
              resolve();
            };
            w.on("message", onMessage);
            w.once("error", reject);
          }),
      ),
    );
    // Idle threads do not keep the process alive; a running job holds them (see runJob).
    for (const w of workers) w.unref();
  }

  /**
   * Runs `job` on at most `limit` of the pool's threads once the jobs asked for before have
   * settled. A job that fails or is stopped stops every thread of the pool (they may still be
   * busy with its work); the next job starts fresh ones. For the engine's own jobs (tolerance
   * maps, Monte Carlo spreads), not a public API.
   */
  runJob<T>(limit: number, job: PoolJob<T>): Promise<T> {
    const turn = this.queue.then(async () => {
      if (this.closed) throw new Error("this pool of worker threads is closed");
      if (this.workers.length === 0) await this.spawn();
      const used = this.workers.slice(0, Math.max(1, Math.min(limit, this.workers.length)));
      for (const w of used) w.ref();
      return job(used, ++this.turns, async (outcome) => {
        for (const w of used) w.unref();
        if (outcome === "failed") await this.stop();
      });
    });
    this.queue = turn.catch(() => undefined);
    return turn;
  }

  private async stop(): Promise<void> {
    const workers = this.workers;
    this.workers = [];
    await Promise.all(workers.map((w) => w.terminate())).then(
      () => undefined,
      () => undefined,
    );
  }

  /** Stops every thread once the jobs already asked for are done. */
  async close(): Promise<void> {
    this.closed = true;
    await this.queue;
    await this.stop();
  }
}

/**
 * A job on `count` threads started for it and stopped before its promise settles (a tolerance
 * map or a spread run without a pool): the pool's own path, so a job runs alike on either.
 */
export async function runOnFreshThreads<T>(count: number, job: PoolJob<T>): Promise<T> {
  const threads = await EngineThreadPool.start(count);
  try {
    return await threads.runJob(count, job);
  } finally {
    await threads.close();
  }
}
