import { QuietframeError } from "../errors";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { crossingOnSide } from "./crossing-search";
import { maximizeOnLine } from "./line-search";
import { designParameter, shownValue, withinBounds, type DesignParameter } from "./parameters";
import { designProblem, merit, valueOfLevel, type DesignFigure, type DesignGrid, type DesignProblem } from "./problem";
import { defaultRange, fromUnit, givenRange, toUnit, type RangeEnd, type SearchRange } from "./search-range";
import { targetMerit } from "./target";

/**
 * Solving for a target: the value of one parameter at which a figure reaches a target (the
 * crossing nearest the current value, by steps that double away from it and Brent's method in
 * the step that crosses), and the window around the current value in which the figure stays at
 * or above the target. Reaching nothing is a result, not an error: it says so and gives the best.
 */

export interface SolveOptions {
  /** Range searched, values with units ({ min: "50 %", max: "100 %" }); default the parameter's (see search-range.ts). */
  readonly range?: { readonly min: string | number; readonly max: string | number };
  readonly grid?: DesignGrid;
  /** Scan positions for the best value when the target is not reached (default 25). */
  readonly scanPoints?: number;
}

export interface SettingFigure {
  readonly value: number;
  readonly shown: string;
  /** The figure there, in its unit (NaN where it has none). */
  readonly figure: number;
}

export interface SolveResult {
  readonly figure: DesignFigure;
  readonly parameter: string;
  /** The target, in the figure's unit. */
  readonly target: number;
  readonly range: { readonly lo: number; readonly hi: number; readonly loEnd: RangeEnd; readonly hiEnd: RangeEnd; readonly shown: string };
  readonly current: SettingFigure & { readonly reaches: boolean };
  /**
   * "crossing": `solution` is where the figure equals the target (nearest the current value);
   * "edge": `solution` is where the set-up stops having a value (unstable or refused beyond), the figure reaching the target on its near side;
   * "everywhere": the target is reached across the range (no crossing found);
   * "never": no value in the range reaches it; `best` is the best that is reached.
   */
  readonly outcome: "crossing" | "edge" | "everywhere" | "never";
  readonly solution?: SettingFigure;
  /** The best figure over the range (given when the target is never reached). */
  readonly best?: SettingFigure & { readonly at: "inside" | RangeEnd };
  readonly message: string;
  readonly evaluations: number;
}

export interface WindowEnd extends SettingFigure {
  /** "crossing": the figure falls below the target beyond; "edge": the set-up has no value beyond; or the range end reached without either. */
  readonly kind: "crossing" | "edge" | RangeEnd;
}

export interface WindowResult {
  readonly figure: DesignFigure;
  readonly parameter: string;
  readonly target: number;
  readonly current: SettingFigure & { readonly reaches: boolean };
  /** Absent when the current value does not reach the target. */
  readonly low?: WindowEnd;
  readonly high?: WindowEnd;
  readonly message: string;
  readonly evaluations: number;
}

interface Line {
  readonly problem: DesignProblem;
  readonly p: DesignParameter;
  readonly range: SearchRange;
  readonly targetMerit: number;
  readonly target: number;
  readonly meritAt: (x: number) => number;
  readonly setting: (x: number) => SettingFigure;
}

function line(setup: SetupDescription | string, figure: FigureSpec, parameter: string, target: unknown, options: SolveOptions): Line {
  const problem = designProblem(setup, figure, options.grid);
  const p = designParameter(problem.base, parameter, "parameter");
  const range = options.range === undefined ? defaultRange(p, problem.grid.to) : givenRange(p, options.range?.min, options.range?.max, "range");
  const t = targetMerit(problem.figure, target, "target");
  const cache = new Map<number, number>();
  const meritAt = (x: number): number => {
    const known = cache.get(x);
    if (known !== undefined) return known;
    const m = withinBounds(p, x) ? merit(problem.figure, problem.evaluate({ [p.target]: x }, [p])) : -Infinity;
    cache.set(x, m);
    return m;
  };
  const setting = (x: number): SettingFigure => {
    const m = meritAt(x);
    const level = problem.figure.better === "higher" ? m : -m;
    return { value: x, shown: shownValue(x, p), figure: Number.isFinite(m) ? valueOfLevel(problem.figure, level) : NaN };
  };
  return { problem, p, range, targetMerit: t.merit, target: t.value, meritAt, setting };
}

/** The value of `parameter` at which the figure reaches `target`; see SolveResult. */
export function solveForTarget(setup: SetupDescription | string, figure: FigureSpec, parameter: string, target: unknown, options: SolveOptions = {}): SolveResult {
  const L = line(setup, figure, parameter, target, options);
  const { range, p, problem } = L;
  const scanPoints = checkScanPoints(options.scanPoints);
  const x0 = Math.min(Math.max(p.value, range.lo), range.hi);
  const current = { ...L.setting(p.value), reaches: L.meritAt(p.value) >= L.targetMerit };
  const g = (u: number): number => L.meritAt(fromUnit(range, u)) - L.targetMerit;
  const u0 = toUnit(range, x0);
  let g0 = g(u0);
  let start = u0;
  // From a start without a value, walk from the best scanned point instead.
  let scanned: ReturnType<typeof maximizeOnLine> | undefined;
  if (!Number.isFinite(g0)) {
    scanned = maximizeOnLine(L.meritAt, range, scanPoints);
    if (scanned.merit === -Infinity) return neverResult(L, current, undefined, "no value in the range gives the figure a value (every setting is refused or unstable)");
    start = toUnit(range, scanned.x);
    g0 = g(start);
  }
  const below = crossingOnSide(g, start, g0, -1);
  const above = crossingOnSide(g, start, g0, +1);
  const found = [below, above].filter((s) => s.found).sort((a, b) => Math.abs(a.u - start) - Math.abs(b.u - start));
  const shownRange = rangeText(L);
  const base = { figure: problem.figure, parameter: p.target, target: L.target, range: { ...rangeOf(range), shown: shownRange }, current };
  if (found.length > 0) {
    const c = found[0];
    const solution = L.setting(fromUnit(range, c.u));
    const outcome = c.edge ? "edge" : "crossing";
    const message =
      outcome === "crossing"
        ? `${p.target} = ${solution.shown} gives ${figureText(problem.figure, L.target)} (the crossing nearest the current ${current.shown})`
        : `${p.target} = ${solution.shown} is the edge where the set-up stops having a value; on its near side the figure reaches ${figureText(problem.figure, L.target)}`;
    return { ...base, outcome, solution, message, evaluations: problem.evaluations };
  }
  if (g0 >= 0) {
    return { ...base, outcome: "everywhere", message: `every value of ${p.target} in ${shownRange} reaches ${figureText(problem.figure, L.target)}`, evaluations: problem.evaluations };
  }
  scanned ??= maximizeOnLine(L.meritAt, range, scanPoints, { x: x0, merit: L.meritAt(x0) });
  return neverResult(L, current, scanned, undefined);
}

function neverResult(L: Line, current: SolveResult["current"], scanned: ReturnType<typeof maximizeOnLine> | undefined, why: string | undefined): SolveResult {
  const { problem, p, range } = L;
  const best =
    scanned && scanned.merit > -Infinity ? { ...L.setting(scanned.x), at: scanned.at === "low-end" ? range.loEnd : scanned.at === "high-end" ? range.hiEnd : ("inside" as const) } : undefined;
  const message =
    why ??
    `no value of ${p.target} in ${rangeText(L)} reaches ${figureText(problem.figure, L.target)}; the best is ${best ? `${figureText(problem.figure, best.figure)} at ${best.shown}` : "undefined"}`;
  return {
    figure: problem.figure,
    parameter: p.target,
    target: L.target,
    range: { ...rangeOf(range), shown: rangeText(L) },
    current,
    outcome: "never",
    best,
    message,
    evaluations: problem.evaluations,
  };
}

/** The interval around the current value of `parameter` in which the figure stays at or above `target`. */
export function targetWindow(setup: SetupDescription | string, figure: FigureSpec, parameter: string, target: unknown, options: SolveOptions = {}): WindowResult {
  const L = line(setup, figure, parameter, target, options);
  const { range, p, problem } = L;
  const m0 = L.meritAt(p.value);
  const current = { ...L.setting(p.value), reaches: m0 >= L.targetMerit };
  const base = { figure: problem.figure, parameter: p.target, target: L.target, current };
  if (!current.reaches) {
    const why = Number.isFinite(m0) ? `gives ${figureText(problem.figure, current.figure)}` : "gives the figure no value";
    return { ...base, message: `the current ${p.target} = ${current.shown} ${why}, short of ${figureText(problem.figure, L.target)}: there is no window around it`, evaluations: problem.evaluations };
  }
  if (p.value < range.lo || p.value > range.hi) {
    throw new QuietframeError({ path: "range", value: options.range, problem: `does not contain the current value ${current.shown}`, allowed: "a range around the current value" });
  }
  const g = (u: number): number => L.meritAt(fromUnit(range, u)) - L.targetMerit;
  const u0 = toUnit(range, p.value);
  const end = (side: ReturnType<typeof crossingOnSide>, rangeEnd: RangeEnd): WindowEnd => ({
    ...L.setting(fromUnit(range, side.u)),
    kind: !side.found ? rangeEnd : side.edge ? "edge" : "crossing",
  });
  const low = end(crossingOnSide(g, u0, g(u0), -1), range.loEnd);
  const high = end(crossingOnSide(g, u0, g(u0), +1), range.hiEnd);
  const message = `${figureText(problem.figure, L.target)} or better for ${p.target} from ${low.shown} (${endText(low.kind)}) to ${high.shown} (${endText(high.kind)}) around ${current.shown}`;
  return { ...base, low, high, message, evaluations: problem.evaluations };
}

function endText(kind: WindowEnd["kind"]): string {
  switch (kind) {
    case "crossing":
      return "the figure falls below the target beyond";
    case "edge":
      return "the set-up has no value beyond";
    case "bound":
      return "the parameter's bound";
    case "search-limit":
      return "the end of the search; the parameter has no bound there";
    case "given":
      return "the end of the given range";
  }
}

function figureText(figure: DesignFigure, value: number): string {
  if (figure.unit === "dB")
    return `${value.toPrecision(4)} dB ${figure.kind === "margin-at" || figure.kind === "margin-band" || figure.kind === "best-margin" ? "margin below the SQL" : ""}`.trimEnd();
  if (figure.kind === "noise-at") return `a noise of ${value.toPrecision(4)} ${figure.unit}`;
  return `a ratio of ${value.toPrecision(4)}`;
}

function rangeText(L: Line): string {
  return `${shownValue(L.range.lo, L.p)} … ${shownValue(L.range.hi, L.p)}`;
}

function rangeOf(r: SearchRange) {
  return { lo: r.lo, hi: r.hi, loEnd: r.loEnd, hiEnd: r.hiEnd };
}

function checkScanPoints(points: unknown): number {
  if (points === undefined) return 25;
  if (typeof points !== "number" || !Number.isInteger(points) || points < 3 || points > 10_000) {
    throw new QuietframeError({ path: "options.scanPoints", value: points, problem: "is not a usable number of scan points", allowed: "an integer from 3 to 10000" });
  }
  return points;
}
