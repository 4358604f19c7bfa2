import { QuietframeError } from "../errors";
import { CellStatus } from "../figures/outcome";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { GaussianSource } from "../timedomain/random";
import { minimizeInBox } from "./nelder-mead";
import { designParameter, shownValue, type DesignParameter } from "./parameters";
import { runToEnd } from "./slices";
import { checkStopSignal, stopIfAborted } from "./stop";
import { designProblem, merit, valueOfLevel, type DesignFigure, type DesignGrid, type DesignProblem } from "./problem";
import { defaultRange, fromUnit, givenRange, toUnit, type RangeEnd, type SearchRange } from "./search-range";

/**
 * The best figure over several parameters at once, each within bounds: bounded Nelder–Mead
 * (nelder-mead.ts) in the unit box of the parameters' ranges (equal ratios on log ranges), from
 * the current values and from further seeded random starts. Settings without a value (unstable,
 * refused) are infeasible points the search moves away from; a start that has no value itself is
 * reported with the reason and skipped.
 */

export interface OptimizeParameter {
  /** "component.parameter". */
  readonly target: string;
  /** Range, values with units; each end defaults to the parameter's own (see search-range.ts). Give both or neither. */
  readonly min?: string | number;
  readonly max?: string | number;
}

export interface OptimizeOptions {
  readonly grid?: DesignGrid;
  /** Number of starts: the current values, then random points of the box (default 4, 1 … 100). */
  readonly starts?: number;
  /** Seed of the random starts, an integer 0 … 2³²−1 (default 1). Same seed, same result. */
  readonly seed?: number;
  /** Evaluations allowed per start (default 400 + 200 × the number of parameters). */
  readonly maxEvaluationsPerStart?: number;
  /** Convergence: simplex size in the unit box (default 1e-10). */
  readonly tolerance?: number;
  /** Called after each start with the starts done and their number, e.g. to show progress. */
  readonly onProgress?: (done: number, total: number) => void;
  /** Stops the run between starts: it then throws a DesignRunStopped (stop.ts) and gives no result. */
  readonly signal?: AbortSignal;
  /**
   * Called after each start but the last, once some start has a value, with the best so far
   * (provisional: the final result replaces it), e.g. to draw it while the run goes on.
   */
  readonly onBestSoFar?: (best: ProvisionalOptimum) => void;
}

/** The best of the starts run so far, as a result, and how many of the starts it covers. */
export interface ProvisionalOptimum {
  readonly done: number;
  readonly total: number;
  /** Status "ok"; its figure is the search's own value at the best point (the final result evaluates it once more). */
  readonly result: OptimizeResult;
}

export interface OptimizedValue {
  readonly target: string;
  readonly value: number;
  readonly shown: string;
  readonly range: readonly [number, number];
  /** Which end of its range the value sits on (within 1e-6 of the range in the unit box), and what that end is. */
  readonly onBound?: { readonly end: "low" | "high"; readonly kind: RangeEnd };
}

export interface StartReport {
  /** The start's values (SI), by target. */
  readonly start: Readonly<Record<string, number>>;
  readonly status: "converged" | "budget-spent" | "infeasible-start";
  /** The best figure this start reached (NaN for an infeasible start). */
  readonly figure: number;
  readonly evaluations: number;
  readonly message?: string;
}

export interface OptimizeResult {
  readonly figure: DesignFigure;
  /** "ok": an optimum was found; "infeasible": every start was refused or unstable (see `message`). */
  readonly status: "ok" | "infeasible";
  /** The figure at the current values (NaN when they give none). */
  readonly current: number;
  readonly optimum?: { readonly values: readonly OptimizedValue[]; readonly figure: number };
  readonly starts: readonly StartReport[];
  readonly evaluations: number;
  readonly message: string;
}

const ON_BOUND = 1e-6;

/** Maximizes the figure (minimizes it for the noise) over the given parameters. */
export function optimizeDesign(setup: SetupDescription | string, figure: FigureSpec, parameters: readonly OptimizeParameter[], options: OptimizeOptions = {}): OptimizeResult {
  return runToEnd(optimizeSteps(setup, figure, parameters, options));
}

/**
 * optimizeDesign one start at a time: the generator yields the starts done after each start but
 * the last and returns the result, so a caller can pause between starts (runInSlices) with the
 * same bits. The signal is looked at before each start.
 */
export function* optimizeSteps(setup: SetupDescription | string, figure: FigureSpec, parameters: readonly OptimizeParameter[], options: OptimizeOptions = {}): Generator<number, OptimizeResult> {
  const signal = checkStopSignal(options.signal);
  const plan = planOptimize(setup, figure, parameters, options);
  const outcomes: StartOutcome[] = [];
  for (let s = 0; s < plan.starts; s++) {
    stopIfAborted(signal, "optimize", s, plan.starts, "starts");
    outcomes.push(runStart(plan, s));
    options.onProgress?.(s + 1, plan.starts);
    if (s + 1 < plan.starts) {
      if (options.onBestSoFar) {
        const best = bestSoFar(plan, outcomes);
        if (best) options.onBestSoFar(best);
      }
      yield s + 1;
    }
  }
  return finishOptimize(plan, outcomes);
}

/**
 * The best point of the starts run so far, chosen as finishOptimize chooses (the lowest cost,
 * the earlier start on a tie), so after every start it is the final optimum's point. Nothing is
 * evaluated: the run's evaluation count and the final result stay as they are without it.
 * Undefined while no start has a value.
 */
export function bestSoFar(plan: OptimizePlan, outcomes: readonly StartOutcome[]): ProvisionalOptimum | undefined {
  const best = bestOutcome(outcomes);
  if (!best) return undefined;
  const { problem, starts, current } = plan;
  const values = optimizedValues(plan, best.u);
  const figure = figureOf(problem.figure, -best.f);
  const result: OptimizeResult = {
    figure: problem.figure,
    status: "ok",
    current,
    optimum: { values, figure },
    starts: outcomes.map((o) => o.report),
    evaluations: problem.evaluations,
    message: `best of ${outcomes.length} of ${starts} starts so far (provisional): ${figure.toPrecision(6)}${problem.figure.unit ? ` ${problem.figure.unit}` : ""} at ${values.map((v) => `${v.target} = ${v.shown}`).join(", ")}`,
  };
  return { done: outcomes.length, total: starts, result };
}

/** The outcome with the lowest cost, the earlier start on a tie; undefined when no start has a value. */
function bestOutcome(outcomes: readonly StartOutcome[]): { u: Float64Array; f: number } | undefined {
  let best: { u: Float64Array; f: number } | undefined;
  for (const o of outcomes) if (o.best && (!best || o.best.f < best.f)) best = o.best;
  return best;
}

/** The parameters' values at a point of the unit box, each with its range and the bound it sits on. */
function optimizedValues(plan: Pick<OptimizePlan, "params" | "ranges">, u: Float64Array): OptimizedValue[] {
  return plan.params.map((p, k) => {
    const r = plan.ranges[k];
    const value = fromUnit(r, u[k]);
    const end = u[k] <= ON_BOUND ? "low" : u[k] >= 1 - ON_BOUND ? "high" : undefined;
    return { target: p.target, value, shown: shownValue(value, p), range: [r.lo, r.hi] as const, onBound: end ? { end, kind: end === "low" ? r.loEnd : r.hiEnd } : undefined };
  });
}

/**
 * An optimization laid out before any start runs: the problem, the parameters and their
 * ranges, the figure at the current values, and every start's point in the unit box (the
 * current values, then seeded random points drawn here in start order). Each start then runs
 * on its own (runStart), so where a start runs changes no bit; finishOptimize assembles them.
 */
export interface OptimizePlan {
  readonly problem: DesignProblem;
  readonly params: readonly DesignParameter[];
  readonly ranges: readonly SearchRange[];
  readonly starts: number;
  readonly maxEvaluations: number;
  readonly tolerance: number;
  /** The figure at the current values (NaN when they give none). */
  readonly current: number;
  readonly startPoints: readonly Float64Array[];
}

/** One start's report and, unless it had no value, the best point it reached (unit box) and its cost (−merit). */
export interface StartOutcome {
  readonly report: StartReport;
  readonly best?: { readonly u: Float64Array; readonly f: number };
}

/** Checks everything, evaluates the figure at the current values and draws every start. */
export function planOptimize(
  setup: SetupDescription | string,
  figure: FigureSpec,
  parameters: readonly OptimizeParameter[],
  options: Omit<OptimizeOptions, "onProgress" | "signal" | "onBestSoFar"> = {},
): OptimizePlan {
  const problem = designProblem(setup, figure, options.grid);
  if (!Array.isArray(parameters) || parameters.length === 0) {
    throw new QuietframeError({ path: "parameters", value: parameters, problem: "names no parameter to optimize", allowed: 'one or more { target: "component.parameter", min?, max? }' });
  }
  const params: DesignParameter[] = [];
  const ranges: SearchRange[] = [];
  parameters.forEach((spec, i) => {
    const path = `parameters[${i}]`;
    if (typeof spec !== "object" || spec === null) throw new QuietframeError({ path, value: spec, problem: "must be an object", allowed: '{ target: "component.parameter", min?, max? }' });
    const p = designParameter(problem.base, spec.target, `${path}.target`);
    if (params.some((q) => q.target === p.target)) throw new QuietframeError({ path: `${path}.target`, value: spec.target, problem: "is named twice", allowed: "each parameter once" });
    if ((spec.min === undefined) !== (spec.max === undefined)) {
      throw new QuietframeError({ path: `${path}.${spec.min === undefined ? "min" : "max"}`, problem: "is missing", allowed: "both min and max, or neither (the parameter's own range)" });
    }
    params.push(p);
    ranges.push(spec.min === undefined ? defaultRange(p, problem.grid.to) : givenRange(p, spec.min, spec.max, path));
  });
  const starts = integerOption(options.starts, 4, 1, 100, "options.starts");
  const seed = integerOption(options.seed, 1, 0, 4294967295, "options.seed");
  const n = params.length;
  const maxEvaluations = integerOption(options.maxEvaluationsPerStart, 400 + 200 * n, 10, 1_000_000, "options.maxEvaluationsPerStart");
  const tolerance = options.tolerance ?? 1e-10;
  if (!(tolerance > 0 && tolerance < 0.1))
    throw new QuietframeError({ path: "options.tolerance", value: options.tolerance, problem: "is not a usable tolerance", allowed: "0 < tolerance < 0.1 (unit-box coordinates)" });
  const currentOutcome = problem.evaluate({}, []);
  const current = currentOutcome.status === CellStatus.ok ? currentOutcome.value : NaN;
  // The seeded generator serves the random starts only, in start order: drawing them all here gives the same points.
  const random = new GaussianSource(seed);
  const startPoints: Float64Array[] = [];
  for (let s = 0; s < starts; s++) {
    const u0 = new Float64Array(n);
    for (let k = 0; k < n; k++) u0[k] = s === 0 ? clampUnit(toUnit(ranges[k], params[k].value)) : random.uniform();
    startPoints.push(u0);
  }
  return { problem, params, ranges, starts, maxEvaluations, tolerance, current, startPoints };
}

function valuesOf(plan: Pick<OptimizePlan, "params" | "ranges">, u: Float64Array): Record<string, number> {
  return Object.fromEntries(plan.params.map((p, k) => [p.target, fromUnit(plan.ranges[k], u[k])]));
}

/** Runs start `s` of the plan: bounded Nelder–Mead from its point; a start without a value is reported with the reason. */
export function runStart(plan: OptimizePlan, s: number): StartOutcome {
  const { problem, params } = plan;
  let lastMessage: string | undefined;
  const cost = (u: Float64Array): number => {
    const outcome = problem.evaluate(valuesOf(plan, u), params);
    if (outcome.status !== CellStatus.ok && outcome.message) lastMessage = outcome.message;
    const m = merit(problem.figure, outcome);
    return m === -Infinity ? Infinity : -m;
  };
  const u0 = plan.startPoints[s];
  const before = problem.evaluations;
  const f0 = cost(u0);
  const start = valuesOf(plan, u0);
  if (f0 === Infinity) return { report: { start, status: "infeasible-start", figure: NaN, evaluations: problem.evaluations - before, message: lastMessage } };
  const run = minimizeInBox(cost, u0, { xTolerance: plan.tolerance, maxEvaluations: plan.maxEvaluations });
  return {
    report: { start, status: run.converged ? "converged" : "budget-spent", figure: figureOf(problem.figure, -run.f), evaluations: problem.evaluations - before },
    best: { u: run.u, f: run.f },
  };
}

/**
 * The result from every start's outcome, in start order; `evaluatedElsewhere`: evaluations the
 * starts made in other threads or processes (they count as evaluations too).
 */
export function finishOptimize(plan: OptimizePlan, outcomes: readonly StartOutcome[], evaluatedElsewhere = 0): OptimizeResult {
  const { problem, params, starts, current } = plan;
  const reports = outcomes.map((o) => o.report);
  const best = bestOutcome(outcomes);
  if (!best) {
    const reasons = [...new Set(reports.map((r) => r.message ?? "no value"))];
    return {
      figure: problem.figure,
      status: "infeasible",
      current,
      starts: reports,
      evaluations: problem.evaluations + evaluatedElsewhere,
      message: `every start (${starts}) has no value for the figure: ${reasons.join("; ")}`,
    };
  }
  const bestU = best.u;
  const values = optimizedValues(plan, bestU);
  // The figure evaluated once more at the optimum: its own bits, not a value back from the dB scale.
  const final = problem.evaluate(valuesOf(plan, bestU), params);
  const optimumFigure = final.status === CellStatus.ok ? final.value : figureOf(problem.figure, -best.f);
  const onBounds = values.filter((v) => v.onBound);
  const message =
    `best ${problem.figure.label}: ${optimumFigure.toPrecision(6)}${problem.figure.unit ? ` ${problem.figure.unit}` : ""} at ${values.map((v) => `${v.target} = ${v.shown}`).join(", ")}` +
    (onBounds.length ? `; on a bound: ${onBounds.map((v) => `${v.target} (${v.onBound!.end} end, ${v.onBound!.kind})`).join(", ")}` : "");
  return { figure: problem.figure, status: "ok", current, optimum: { values, figure: optimumFigure }, starts: reports, evaluations: problem.evaluations + evaluatedElsewhere, message };
}

function figureOf(figure: DesignFigure, meritValue: number): number {
  return valueOfLevel(figure, figure.better === "higher" ? meritValue : -meritValue);
}

function clampUnit(u: number): number {
  return u < 0 ? 0 : u > 1 ? 1 : u;
}

function integerOption(value: unknown, fallback: number, min: number, max: number, path: string): number {
  if (value === undefined) return fallback;
  if (typeof value !== "number" || !Number.isInteger(value) || value < min || value > max) {
    throw new QuietframeError({ path, value, problem: "is not a usable whole number", allowed: `an integer from ${min} to ${max}` });
  }
  return value;
}
