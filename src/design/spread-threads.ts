/**
 * Monte Carlo spreads with their samples evaluated on worker threads (Node only, exported from
 * the "quietframe/node" entry): fresh threads started for the run, or the warm threads of a
 * pool (`options.pool`, the TolerancePool a tolerance map takes). The main thread checks the
 * request, evaluates the nominal figure and makes every draw; workers evaluate chunks of
 * samples with the same code as the in-process run; the result is assembled in sample order,
 * so it has the same bits as spreadAnalysis with the same seed, whatever the threads. Progress
 * is told per chunk of samples; a stop (options.signal) or a failure stops every thread the
 * run used before the promise rejects (a pool starts fresh ones for its next job).
 */
import { availableParallelism } from "node:os";
import type { Worker } from "node:worker_threads";
import { QuietframeError } from "../errors";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { dispatchOnThreads } from "../threads/dispatch";
import { nextChunkSize } from "../threads/engine-threads";
import { EngineThreadPool, type JobOutcome, type PoolJob, runOnFreshThreads } from "../threads/pool";
import { checkWorkers } from "../threads/worker-count";
import { runInSlices } from "./slices";
import { evaluateSamples, finishSpread, planSpread, planSteps, type SampleOutcomes, type SpreadOptions, type SpreadPlan, type SpreadResult } from "./spread";
import { checkStopSignal, DesignRunStopped, stopIfAborted } from "./stop";
import type { FromSpreadWorker, SpreadJobData, ToSpreadWorker } from "./spread-job";
import type { UncertaintySpec } from "./uncertainty";

export interface SpreadThreadOptions extends SpreadOptions {
  /**
   * Threads evaluating samples: an integer ≥ 1, default every core (os.availableParallelism()).
   * 1 evaluates in this thread, without workers. With a pool: at most this many of its threads
   * (default all of them). The result does not depend on it (bit for bit).
   */
  readonly workers?: number;
  /**
   * Warm worker threads (`await TolerancePool.start(n)`, the pool tolerance maps take): the
   * samples are evaluated on its threads, after the jobs asked of it before, instead of on
   * threads started and stopped for this run. A stop or failure stops the pool's threads; the
   * pool stays usable and starts fresh ones for its next job.
   */
  readonly pool?: EngineThreadPool;
}

/** Smallest chunk of samples handed to a worker (a message per sample would cost more than the sample). */
const SMALLEST_CHUNK = 16;

/** spreadAnalysis with the samples evaluated on worker threads; rejects with the errors spreadAnalysis throws. */
export async function spreadAnalysisOnThreads(setup: SetupDescription | string, figure: FigureSpec, uncertain: readonly UncertaintySpec[], options: SpreadThreadOptions = {}): Promise<SpreadResult> {
  const pool = checkPool(options.pool);
  const requested = checkWorkers(options.workers, pool ? pool.size : availableParallelism());
  const signal = checkStopSignal(options.signal);
  const plan = planSpread(setup, figure, uncertain, options);
  const workers = Math.min(requested, Math.ceil(plan.samples / SMALLEST_CHUNK), pool ? pool.size : Infinity);
  // In this thread: in blocks with a turn of the event loop between them, so a stop is heard.
  if (workers === 1 && !pool) return options.onProgress || signal ? runInSlices(planSteps(plan, options.onProgress, signal)) : finishSpread(plan, [evaluateSamples(plan, 0, plan.samples)]);
  stopIfAborted(signal, "spread", 0, plan.samples, "samples");
  const job: SpreadJobData = { setup, figure, uncertain, options: { grid: options.grid, bands: options.bands }, draws: plan.draws };
  const run: PoolJob<SampleOutcomes[]> = (threads, spread, release) => dispatchSamples(threads, plan, { job, spread }, options.onProgress, signal, release);
  return finishSpread(plan, await (pool ? pool.runJob(workers, run) : runOnFreshThreads(workers, run)), plan.samples);
}

function checkPool(pool: unknown): EngineThreadPool | undefined {
  if (pool === undefined || pool instanceof EngineThreadPool) return pool;
  throw new QuietframeError({ path: "options.pool", value: typeof pool, problem: "is not a pool of worker threads", allowed: "await TolerancePool.start(threads)" });
}

/**
 * Hands every sample of the plan to the given (started) threads, the job with each thread's
 * first chunk, and collects the outcomes of spread number `spread` (other replies are not looked
 * at). On an abort or failure it stops feeding and rejects (dispatch.ts calls `release` once
 * first).
 */
function dispatchSamples(
  threads: readonly Worker[],
  plan: SpreadPlan,
  { job, spread }: { readonly job: SpreadJobData; readonly spread: number },
  onProgress: SpreadOptions["onProgress"],
  signal: AbortSignal | undefined,
  release: (outcome: JobOutcome) => Promise<void>,
): Promise<SampleOutcomes[]> {
  const parts: SampleOutcomes[] = [];
  let next = 0;
  let done = 0;
  const jobSent = new Set<Worker>();
  const feed = (w: Worker): void => {
    if (next >= plan.samples) return;
    const to = next + nextChunkSize(plan.samples - next, threads.length, SMALLEST_CHUNK);
    const withJob = !jobSent.has(w);
    jobSent.add(w);
    w.postMessage((withJob ? { spread, job, from: next, to } : { spread, from: next, to }) satisfies ToSpreadWorker);
    next = to;
  };
  return dispatchOnThreads<SampleOutcomes[], FromSpreadWorker>({
    threads,
    signal,
    release,
    feed,
    // An abort heard once every sample is in (from the last progress call) stops nothing: the result is whole.
    stopped: () => (done < plan.samples ? new DesignRunStopped("spread", done, plan.samples, "samples", signal?.reason) : undefined),
    exited: (code) => new Error(`a spread worker stopped (exit code ${code}) before the samples were done`),
    onMessage: (w, m, { finish, fail }) => {
      if (m.spread !== spread) return;
      if (m.type === "samples") {
        parts.push(m.part);
        done += m.part.values.length;
        try {
          onProgress?.(done, plan.samples);
        } catch (e) {
          fail(e);
          return;
        }
        if (done === plan.samples) finish(parts);
        else feed(w);
      } else {
        const error = new Error(`spread: samples failed in a worker: ${m.message}`);
        error.stack = `${error.message}\n--- in the worker ---\n${m.stack}`;
        fail(error);
      }
    },
  });
}
