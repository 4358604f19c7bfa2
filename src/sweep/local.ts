/**
 * The same sweep run on this machine's worker pool, without chunks or a scheduler: the map
 * through toleranceMap, the samples through spreadAnalysisOnThreads, the optimizer starts
 * through optimizeSteps (in this thread, in slices). Gives the bits of the merged chunks (tests
 * compare the two). Progress and a stop signal reach whichever runs. Node only.
 */
import { spreadAnalysisOnThreads } from "../design/spread-threads";
import { optimizeSteps } from "../design/optimize";
import { runInSlices } from "../design/slices";
import { toleranceMap } from "../tolerance/map";
import { gridSpec } from "./grid-spec";
import { resolveSweep } from "./resolve";
import { sweepResult, type SweepResult } from "./result";

export interface LocalSweepOptions {
  /** Worker threads, an integer ≥ 1 (default every core); the result does not depend on it. */
  readonly workers?: number;
  /** Told the items (rows, samples or starts) done and their number as the sweep runs. */
  readonly onProgress?: (done: number, total: number) => void;
  /**
   * Stops the sweep: its workers are terminated and the promise rejects with a
   * ToleranceMapCancelled (a map) or a DesignRunStopped (samples, starts); no result is given.
   */
  readonly signal?: AbortSignal;
}

export async function runSweepLocally(description: unknown, options: LocalSweepOptions = {}): Promise<SweepResult> {
  const sweep = resolveSweep(description);
  const d = sweep.description;
  if (d.vary.kind === "grid") {
    const spec = gridSpec(d);
    const map = await toleranceMap(d.setup, spec, { workers: options.workers, onProgress: options.onProgress, signal: options.signal });
    return sweepResult(d, sweep.fingerprint, { kind: "grid", spec, map });
  }
  if (d.vary.kind === "starts") {
    // The engine has no worker pool for optimizer starts: they run in this thread, a turn of the event loop between starts.
    const v = d.vary;
    const starts = { starts: v.starts, seed: v.seed, maxEvaluationsPerStart: v.maxEvaluationsPerStart, tolerance: v.tolerance, grid: d.grid, onProgress: options.onProgress, signal: options.signal };
    return sweepResult(d, sweep.fingerprint, { kind: "starts", optimum: await runInSlices(optimizeSteps(d.setup, d.figure, v.parameters, starts)) });
  }
  const v = d.vary;
  const spread = await spreadAnalysisOnThreads(d.setup, d.figure, v.uncertain, {
    samples: v.samples,
    seed: v.seed,
    target: v.target,
    grid: d.grid,
    bands: d.keep?.curves !== false,
    workers: options.workers,
    onProgress: options.onProgress,
    signal: options.signal,
  });
  return sweepResult(d, sweep.fingerprint, { kind: "samples", spread });
}
