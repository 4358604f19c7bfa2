/**
 * The same sweep run on this machine's worker pool, without chunks or a scheduler: the map
 * through toleranceMap, the samples through spreadAnalysisOnThreads. Gives the bits of the
 * merged chunks (tests compare the two). Node only.
 */
import { spreadAnalysisOnThreads } from "../design/spread-threads";
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
