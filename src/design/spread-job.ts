/**
 * The messages between a Monte Carlo spread and the worker threads that evaluate its samples,
 * and what a worker does with them: it rebuilds the spread's problem from the same inputs
 * (the same checks, the same figure), takes the draws made by the main thread, and evaluates
 * the chunks of samples it is sent with the same code as the in-process run, so where a
 * sample is evaluated changes no bit. Platform-free; the threads are in spread-threads.ts.
 */
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { evaluateSamples, spreadSetting, type SampleJob, type SampleOutcomes, type SpreadOptions } from "./spread";
import type { UncertaintySpec } from "./uncertainty";

/** A worker's job, sent once as its workerData. */
export interface SpreadJobData {
  readonly setup: SetupDescription | string;
  readonly figure: FigureSpec;
  readonly uncertain: readonly UncertaintySpec[];
  readonly options: Pick<SpreadOptions, "grid" | "bands">;
  readonly draws: Readonly<Record<string, Float64Array>>;
}

/** Main thread → worker: evaluate samples from … to − 1. */
export interface ToSpreadWorker {
  readonly from: number;
  readonly to: number;
}

/** Worker → main thread. */
export type FromSpreadWorker = { readonly type: "ready" } | { readonly type: "samples"; readonly part: SampleOutcomes } | { readonly type: "failed"; readonly message: string; readonly stack: string };

/** What a worker answers to each chunk (its job built once, on the first). */
export function spreadChunkHandler(data: SpreadJobData): (chunk: ToSpreadWorker) => SampleOutcomes {
  let job: SampleJob | undefined;
  return ({ from, to }) => {
    job ??= { ...spreadSetting(data.setup, data.figure, data.uncertain, data.options), draws: data.draws };
    return evaluateSamples(job, from, to);
  };
}
