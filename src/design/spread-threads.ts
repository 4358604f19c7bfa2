/**
 * Monte Carlo spreads with their samples evaluated on worker threads (Node only, exported from
 * the "quietframe/node" entry). The main thread checks the request, evaluates the nominal figure
 * and makes every draw; workers evaluate chunks of samples with the same code as the
 * in-process run; the result is assembled in sample order, so it has the same bits as
 * spreadAnalysis with the same seed, whatever the number of threads. Progress is told per chunk
 * of samples; a stop (options.signal) terminates every worker before the promise rejects.
 */
import { availableParallelism } from "node:os";
import { Worker } from "node:worker_threads";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { CHUNKS_AHEAD, nextChunkSize, workerScript } from "../threads/engine-threads";
import { checkWorkers } from "../threads/worker-count";
import { runInSlices } from "./slices";
import { evaluateSamples, finishSpread, planSpread, planSteps, type SampleOutcomes, type SpreadOptions, type SpreadPlan, type SpreadResult } from "./spread";
import { checkStopSignal, DesignRunStopped, stopIfAborted } from "./stop";
import type { FromSpreadWorker, SpreadJobData, ToSpreadWorker } from "./spread-job";
import type { UncertaintySpec } from "./uncertainty";

export interface SpreadThreadOptions extends SpreadOptions {
  /**
   * Threads evaluating samples: an integer ≥ 1, default every core (os.availableParallelism()).
   * 1 evaluates in this thread, without workers. The result does not depend on it (bit for bit).
   */
  readonly workers?: number;
}

/** Smallest chunk of samples handed to a worker (a message per sample would cost more than the sample). */
const SMALLEST_CHUNK = 16;

/** spreadAnalysis with the samples evaluated on worker threads; rejects with the errors spreadAnalysis throws. */
export async function spreadAnalysisOnThreads(setup: SetupDescription | string, figure: FigureSpec, uncertain: readonly UncertaintySpec[], options: SpreadThreadOptions = {}): Promise<SpreadResult> {
  const requested = checkWorkers(options.workers, availableParallelism());
  const signal = checkStopSignal(options.signal);
  const plan = planSpread(setup, figure, uncertain, options);
  const workers = Math.min(requested, Math.ceil(plan.samples / SMALLEST_CHUNK));
  // In this thread: in blocks with a turn of the event loop between them, so a stop is heard.
  if (workers === 1) return options.onProgress || signal ? runInSlices(planSteps(plan, options.onProgress, signal)) : finishSpread(plan, [evaluateSamples(plan, 0, plan.samples)]);
  stopIfAborted(signal, "spread", 0, plan.samples, "samples");
  const job: SpreadJobData = { setup, figure, uncertain, options: { grid: options.grid, bands: options.bands }, draws: plan.draws };
  return finishSpread(plan, await samplesOnThreads(plan, job, workers, options.onProgress, signal), plan.samples);
}

/**
 * Every sample of the plan, evaluated on `count` fresh worker threads, which are stopped before
 * the promise settles; an abort stops them and rejects with a DesignRunStopped.
 */
function samplesOnThreads(plan: SpreadPlan, job: SpreadJobData, count: number, onProgress: SpreadOptions["onProgress"], signal: AbortSignal | undefined): Promise<SampleOutcomes[]> {
  const script = workerScript();
  const threads = Array.from({ length: count }, () => new Worker(script, { workerData: { spread: job } }));
  const parts: SampleOutcomes[] = [];
  return new Promise<SampleOutcomes[]>((resolve, reject) => {
    let next = 0;
    let done = 0;
    let settled = false;
    // An abort heard once every sample is in (from the last progress call) stops nothing: the result is whole.
    const onAbort = (): void => {
      if (done < plan.samples) settle(() => reject(new DesignRunStopped("spread", done, plan.samples, "samples", signal?.reason)));
    };
    const settle = (finish: () => void): void => {
      if (settled) return;
      settled = true;
      signal?.removeEventListener("abort", onAbort);
      void Promise.all(threads.map((w) => w.terminate())).then(finish, finish);
    };
    signal?.addEventListener("abort", onAbort, { once: true });
    const feed = (w: Worker): void => {
      if (next >= plan.samples) return;
      const to = next + nextChunkSize(plan.samples - next, count, SMALLEST_CHUNK);
      w.postMessage({ from: next, to } satisfies ToSpreadWorker);
      next = to;
    };
    for (const w of threads) {
      w.on("message", (m: FromSpreadWorker) => {
        if (settled) return;
        if (m.type === "ready") {
          for (let k = 0; k < CHUNKS_AHEAD; k++) feed(w);
        } else if (m.type === "samples") {
          parts.push(m.part);
          done += m.part.values.length;
          try {
            onProgress?.(done, plan.samples);
          } catch (e) {
            settle(() => reject(e));
            return;
          }
          if (settled) return;
          if (done === plan.samples) settle(() => resolve(parts));
          else feed(w);
        } else {
          const error = new Error(`spread: samples failed in a worker: ${m.message}`);
          error.stack = `${error.message}\n--- in the worker ---\n${m.stack}`;
          settle(() => reject(error));
        }
      });
      w.on("error", (e) => settle(() => reject(e)));
      w.on("exit", (code) => settle(() => reject(new Error(`a spread worker stopped (exit code ${code}) before the samples were done`))));
    }
  });
}
