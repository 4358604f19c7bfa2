/**
 * rankParameters one parameter at a time, as a generator of steps: a long ranking can say how far
 * it is (onProgress), run in slices (runInSlices) and stop between parameters (signal). Each
 * parameter's row does not depend on the others (the same figure at the set-up's values, the same
 * steps and scan), so the rows, their order (largest |gain per 1 %| first, ties in list order) and
 * the evaluation count (the set-up's own value once) are exactly those of one rankParameters call.
 * Platform-free.
 */
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { loadSetup } from "../setup/load";
import { designParameter, numericParameters } from "./parameters";
import { rankParameters, type ParameterSensitivity, type RankOptions, type Ranking } from "./rank";
import { checkStopSignal, stopIfAborted } from "./stop";

export interface RankStepOptions extends RankOptions {
  /** Called after each parameter with the parameters done and their number. */
  readonly onProgress?: (done: number, total: number) => void;
  /** Stops the run between parameters: it then throws a DesignRunStopped (stop.ts) and gives no result. */
  readonly signal?: AbortSignal;
}

/** Yields the parameters done after each parameter but the last; returns the ranking. */
export function* rankSteps(setup: SetupDescription | string, figure: FigureSpec, options: RankStepOptions = {}): Generator<number, Ranking> {
  const signal = checkStopSignal(options.signal);
  // rankParameters reads the grid, scan and step options and ignores the rest.
  const { parameters, ...common } = options;
  // Every option, the figure and the grid are checked (and the set-up's figure taken) before the first parameter.
  const head = rankParameters(setup, figure, { ...common, parameters: [] });
  const base = loadSetup(setup);
  const targets = parameters === undefined ? numericParameters(base).map((p) => p.target) : parameters.map((t, i) => designParameter(base, t, `options.parameters[${i}]`).target);
  const rows: ParameterSensitivity[] = [];
  let evaluations = head.evaluations;
  for (const [i, target] of targets.entries()) {
    stopIfAborted(signal, "ranking", i, targets.length, "parameters");
    const one = rankParameters(setup, figure, { ...common, parameters: [target] });
    rows.push(one.parameters[0]);
    evaluations += one.evaluations - head.evaluations;
    options.onProgress?.(i + 1, targets.length);
    if (i + 1 < targets.length) yield i + 1;
  }
  const key = (r: ParameterSensitivity): number => (r.gainPer1Percent === null ? -1 : Math.abs(r.gainPer1Percent));
  const ranked = rows
    .map((r, i) => ({ r, i }))
    .sort((a, b) => key(b.r) - key(a.r) || a.i - b.i)
    .map((e) => e.r);
  return { figure: head.figure, current: head.current, parameters: ranked, evaluations };
}
