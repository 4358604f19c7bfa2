/**
 * The same sweep run on this machine's worker pool, without chunks or a scheduler: the map
 * through toleranceMap, the samples through spreadAnalysisOnThreads, the optimizer starts
 * through optimizeDesign (in this thread). Gives the bits of the merged chunks (tests compare
 * the two). Node only.
 */
import { spreadAnalysisOnThreads } from "../design/spread-threads";
import { optimizeDesign } from "../design/optimize";
import { toleranceMap } from "../tolerance/map";
import { gridSpec } from "./grid-spec";
import { resolveSweep } from "./resolve";
import { sweepResult, type SweepResult } from "./result";

export interface LocalSweepOptions {
  /** Worker threads, an integer ≥ 1 (default every core); the result does not depend on it. */
  readonly workers?: number;
}

export async function runSweepLocally(description: unknown, options: LocalSweepOptions = {}): Promise<SweepResult> {
  const sweep = resolveSweep(description);
  const d = sweep.description;
  if (d.vary.kind === "grid") {
    const spec = gridSpec(d);
    const map = await toleranceMap(d.setup, spec, { workers: options.workers });
    return sweepResult(d, sweep.fingerprint, { kind: "grid", spec, map });
  }
  if (d.vary.kind === "starts") {
    // The engine has no worker pool for optimizer starts: one optimizeDesign call runs them all in this thread.
    const v = d.vary;
    const options = { starts: v.starts, seed: v.seed, maxEvaluationsPerStart: v.maxEvaluationsPerStart, tolerance: v.tolerance, grid: d.grid };
    return sweepResult(d, sweep.fingerprint, { kind: "starts", optimum: optimizeDesign(d.setup, d.figure, v.parameters, options) });
  }
  const v = d.vary;
  const spread = await spreadAnalysisOnThreads(d.setup, d.figure, v.uncertain, {
    samples: v.samples,
    seed: v.seed,
    target: v.target,
    grid: d.grid,
    bands: d.keep?.curves !== false,
    workers: options.workers,
  });
  return sweepResult(d, sweep.fingerprint, { kind: "samples", spread });
}
