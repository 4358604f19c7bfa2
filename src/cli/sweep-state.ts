/**
 * A sweep's result as the widget state users open: a map as a tolerance-map state, a Monte
 * Carlo as a design-widget spread answer, an optimization as its optimum answer, each carrying the sweep's fingerprint and its
 * result's. The merge and the local run write it through here, so the two files are the same.
 */
import type { SweepResult } from "../sweep";
import { atomicWrite } from "../sweep/atomic-write";
import { optimumAnswer, spreadAnswer } from "../../widgets/design/answer";
import { designDocumentText, designState } from "../../widgets/design/document";
import { toleranceWidgetState } from "../../widgets/tolerance/model";

/** The text of the state file of a sweep's result. */
export function sweepStateText(result: SweepResult): string {
  const d = result.description;
  const sweep = { fingerprint: result.sweep, result: result.fingerprint };
  const title = d.name;
  const o = result.outcome;
  if (o.kind === "grid") {
    const state = { ...toleranceWidgetState(d.setup, o.spec, o.map, title === undefined ? {} : { title }), sweep };
    return `${JSON.stringify(state, null, 2)}\n`;
  }
  if (o.kind === "starts") {
    if (d.vary.kind !== "starts") throw new Error("internal: an optimum from another sweep kind");
    const { kind: _kind, ...options } = d.vary;
    const question = { kind: "optimum" as const, ...options };
    return designDocumentText(designState(d.setup, d.figure, question, optimumAnswer(d.setup, d.figure, d.grid, o.optimum), { grid: d.grid, title, sweep }));
  }
  if (d.vary.kind !== "samples") throw new Error("internal: a spread from another sweep kind");
  const v = d.vary;
  const question = { kind: "spread" as const, uncertain: v.uncertain, samples: o.spread.samples, seed: o.spread.seed, ...(v.target === undefined ? {} : { target: v.target }) };
  const state = designState(d.setup, d.figure, question, spreadAnswer(o.spread), { grid: d.grid, title, sweep });
  return designDocumentText(state);
}

/** Writes the state file atomically (two merges at once leave one whole file). */
export function writeSweepState(path: string, result: SweepResult): void {
  atomicWrite(path, sweepStateText(result));
}
