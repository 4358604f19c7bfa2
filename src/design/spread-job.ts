/**
 * The messages between a Monte Carlo spread and the worker threads that evaluate its samples,
 * and what a worker does with them: it rebuilds the spread's problem from the same inputs
 * (the same checks, the same figure), takes the draws made by the main thread, and evaluates
 * the chunks of samples it is sent with the same code as the in-process run, so where a
 * sample is evaluated changes no bit. The job comes with each thread's first chunk of a spread,
 * so one thread serves any number of spreads (and tolerance maps) in turn. Platform-free; the
 * threads are in spread-threads.ts.
 */
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { evaluateSamples, spreadSetting, type SampleJob, type SampleOutcomes, type SpreadOptions } from "./spread";
import type { UncertaintySpec } from "./uncertainty";

/** A spread's job, sent with each thread's first chunk of it. */
export interface SpreadJobData {
  readonly setup: SetupDescription | string;
  readonly figure: FigureSpec;
  readonly uncertain: readonly UncertaintySpec[];
  readonly options: Pick<SpreadOptions, "grid" | "bands">;
  readonly draws: Readonly<Record<string, Float64Array>>;
}

/** Main thread → worker: evaluate samples from … to − 1 of spread number `spread` (its job comes with the thread's first chunk of it). */
export interface ToSpreadWorker {
  readonly spread: number;
  readonly job?: SpreadJobData;
  readonly from: number;
  readonly to: number;
}

/** Worker → main thread, about spread number `spread`. */
export type FromSpreadWorker =
  | { readonly type: "samples"; readonly spread: number; readonly part: SampleOutcomes }
  | { readonly type: "failed"; readonly spread: number; readonly message: string; readonly stack: string };

/** What a thread answers to each chunk: the current spread's problem is built once, on its first chunk. */
export function spreadChunkHandler(): (chunk: ToSpreadWorker) => SampleOutcomes {
  let current: { readonly spread: number; readonly data: SpreadJobData; job?: SampleJob } | undefined;
  return ({ spread, job, from, to }) => {
    if (job) current = { spread, data: job };
    if (!current || current.spread !== spread) throw new Error(`internal: samples of spread ${spread} arrived before its job`);
    const { data } = current;
    current.job ??= { ...spreadSetting(data.setup, data.figure, data.uncertain, data.options), draws: data.draws };
    return evaluateSamples(current.job, from, to);
  };
}
