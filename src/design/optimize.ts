import { QuietframeError } from "../errors";
import { CellStatus } from "../figures/outcome";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { GaussianSource } from "../timedomain/random";
import { minimizeInBox } from "./nelder-mead";
import { designParameter, shownValue, type DesignParameter } from "./parameters";
import { designProblem, merit, valueOfLevel, type DesignFigure, type DesignGrid } from "./problem";
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

  const valuesOf = (u: Float64Array): Record<string, number> => Object.fromEntries(params.map((p, k) => [p.target, fromUnit(ranges[k], u[k])]));
  const messages = new Map<string, string>();
  const cost = (u: Float64Array): number => {
    const outcome = problem.evaluate(valuesOf(u), params);
    if (outcome.status !== CellStatus.ok && outcome.message) messages.set("last", outcome.message);
    const m = merit(problem.figure, outcome);
    return m === -Infinity ? Infinity : -m;
  };
  const currentOutcome = problem.evaluate({}, []);
  const current = currentOutcome.status === CellStatus.ok ? currentOutcome.value : NaN;

  const random = new GaussianSource(seed);
  const reports: StartReport[] = [];
  let best: { u: Float64Array; f: number } | undefined;
  for (let s = 0; s < starts; s++) {
    if (s > 0) options.onProgress?.(s, starts);
    const u0 = new Float64Array(n);
    for (let k = 0; k < n; k++) u0[k] = s === 0 ? clampUnit(toUnit(ranges[k], params[k].value)) : random.uniform();
    const before = problem.evaluations;
    const f0 = cost(u0);
    const start = valuesOf(u0);
    if (f0 === Infinity) {
      reports.push({ start, status: "infeasible-start", figure: NaN, evaluations: problem.evaluations - before, message: messages.get("last") });
      continue;
    }
    const run = minimizeInBox(cost, u0, { xTolerance: tolerance, maxEvaluations });
    reports.push({ start, status: run.converged ? "converged" : "budget-spent", figure: figureOf(problem.figure, -run.f), evaluations: problem.evaluations - before });
    if (!best || run.f < best.f) best = { u: run.u, f: run.f };
  }
  options.onProgress?.(starts, starts);
  if (!best) {
    const reasons = [...new Set(reports.map((r) => r.message ?? "no value"))];
    return {
      figure: problem.figure,
      status: "infeasible",
      current,
      starts: reports,
      evaluations: problem.evaluations,
      message: `every start (${starts}) has no value for the figure: ${reasons.join("; ")}`,
    };
  }
  const bestU = best.u;
  const values: OptimizedValue[] = params.map((p, k) => {
    const r = ranges[k];
    const value = fromUnit(r, bestU[k]);
    const end = bestU[k] <= ON_BOUND ? "low" : bestU[k] >= 1 - ON_BOUND ? "high" : undefined;
    return { target: p.target, value, shown: shownValue(value, p), range: [r.lo, r.hi] as const, onBound: end ? { end, kind: end === "low" ? r.loEnd : r.hiEnd } : undefined };
  });
  // The figure evaluated once more at the optimum: its own bits, not a value back from the dB scale.
  const final = problem.evaluate(valuesOf(bestU), params);
  const optimumFigure = final.status === CellStatus.ok ? final.value : figureOf(problem.figure, -best.f);
  const onBounds = values.filter((v) => v.onBound);
  const message =
    `best ${problem.figure.label}: ${optimumFigure.toPrecision(6)}${problem.figure.unit ? ` ${problem.figure.unit}` : ""} at ${values.map((v) => `${v.target} = ${v.shown}`).join(", ")}` +
    (onBounds.length ? `; on a bound: ${onBounds.map((v) => `${v.target} (${v.onBound!.end} end, ${v.onBound!.kind})`).join(", ")}` : "");
  return { figure: problem.figure, status: "ok", current, optimum: { values, figure: optimumFigure }, starts: reports, evaluations: problem.evaluations, message };
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
