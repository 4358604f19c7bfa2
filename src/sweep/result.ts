/**
 * A sweep's assembled result — a tolerance map, a Monte Carlo spread or an optimum, exactly what the
 * engine's own calls return — with the sweep's fingerprint and a fingerprint of the result's
 * numbers. The merge of chunks and the local run on the worker pool both produce this, and
 * give the same bits.
 */
import type { SpreadResult } from "../design/spread";
import type { OptimizeResult } from "../design/optimize";
import type { ToleranceMap, ToleranceMapSpec } from "../tolerance";
import { arraysDigest } from "./digest";
import type { SweepDescription } from "./format";

export interface SweepResult {
  readonly description: SweepDescription;
  /** The sweep's fingerprint (of its description and the quietframe version). */
  readonly sweep: string;
  readonly outcome:
    | { readonly kind: "grid"; readonly spec: ToleranceMapSpec; readonly map: ToleranceMap }
    | { readonly kind: "samples"; readonly spread: SpreadResult }
    | { readonly kind: "starts"; readonly optimum: OptimizeResult };
  /** "sha256:…" over every number of the result (figures, statuses, bands, starts and optimum). */
  readonly fingerprint: string;
}

export function sweepResult(description: SweepDescription, sweep: string, outcome: SweepResult["outcome"]): SweepResult {
  return { description, sweep, outcome, fingerprint: outcomeDigest(outcome) };
}

function outcomeDigest(outcome: SweepResult["outcome"]): string {
  if (outcome.kind === "grid")
    return arraysDigest([
      ["values", outcome.map.values],
      ["status", outcome.map.status],
    ]);
  if (outcome.kind === "starts") {
    const o = outcome.optimum;
    return arraysDigest([
      ["starts", Float64Array.from(o.starts, (r) => r.figure)],
      ["evaluations", Float64Array.from(o.starts, (r) => r.evaluations)],
      ["current", Float64Array.of(o.current)],
      ["optimum", Float64Array.from(o.optimum ? [o.optimum.figure, ...o.optimum.values.map((v) => v.value)] : [])],
    ]);
  }
  const s = outcome.spread;
  const bands = s.bands
    ? ([
        ["p5", s.bands.p5],
        ["median", s.bands.median],
        ["p95", s.bands.p95],
      ] as const)
    : [];
  return arraysDigest([["values", s.values], ["nominal", Float64Array.of(s.nominal)], ...bands]);
}
