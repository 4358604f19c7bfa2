import { QuietframeError } from "../errors";
import { CellStatus } from "../figures/outcome";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { maximizeOnLine } from "./line-search";
import { designParameter, numericParameters, shownValue, withinBounds, type DesignParameter, type ParameterBound } from "./parameters";
import { designProblem, merit, valueOfLevel, type DesignFigure, type DesignGrid, type DesignProblem } from "./problem";
import { parameterDerivative } from "./parameter-derivative";
import type { DifferenceKind } from "./ridders-derivative";
import { defaultRange, type RangeEnd } from "./search-range";

/**
 * Which parameter is the bottleneck: for a figure of merit and each numeric parameter, how much
 * the figure improves per relative change (dB per 1 % from the derivative, dB for 10 % computed),
 * which direction helps, the physical bound in that direction, and the best figure that
 * parameter alone reaches within its range. The table is ranked by the gain per 1 %.
 */

export interface RankOptions {
  /** Parameters to rank ("component.parameter"); default every numeric parameter of the set-up. */
  readonly parameters?: readonly string[];
  /** Grid of the curves and grid-based figures; default the set-up's. */
  readonly grid?: DesignGrid;
  /** Positions scanned for the best reachable figure of each parameter (≥ 3, default 25). */
  readonly scanPoints?: number;
  /** First relative step of the derivative (default 0.02: ±2 % of the value, shrinking by 1.4 per row). */
  readonly relativeStep?: number;
}

export interface ParameterSensitivity {
  readonly target: string;
  readonly value: number;
  /** The value as written for people ("95 %", "1.2 MHz"). */
  readonly shown: string;
  /** Undefined when the figure could not be differentiated at the current value (then `message` says why). */
  readonly derivative?: {
    /** d(figure in dB)/d(parameter in SI units): for the noise, its level in dB; for margins, the margin. */
    readonly levelPerUnit: number;
    readonly error: number;
    readonly kind: DifferenceKind;
    readonly evaluations: number;
  };
  /** Improvement of the figure in dB (positive: better) when the value grows by 1 %, from the derivative; null for a value of 0. */
  readonly gainPer1Percent: number | null;
  /** Its error estimate (from the extrapolation). */
  readonly gainPer1PercentError: number | null;
  /** Improvement in dB computed (not extrapolated) with the value moved 10 % in the helping direction, stopped at the bound; null when nothing helps or the value is 0. */
  readonly gainFor10Percent: number | null;
  /** Which way helps: "increase", "decrease", or "neither" (the slope is within its error of 0). */
  readonly helps: "increase" | "decrease" | "neither";
  /** The parameter's physical bound in the helping direction (undefined: none on that side). */
  readonly bound?: ParameterBound & { readonly shown: string };
  /** The best the figure gets with this parameter alone over its search range (the bound where it has one). */
  readonly best?: {
    readonly value: number;
    readonly shown: string;
    /** The figure there, in its unit. */
    readonly figure: number;
    /** Improvement in dB over the current figure. */
    readonly gainDb: number;
    /** Where the best sits: inside the range or at an end (a physical bound or the search limit). */
    readonly at: "inside" | RangeEnd;
    readonly range: readonly [number, number];
  };
  readonly message?: string;
}

export interface Ranking {
  readonly figure: DesignFigure;
  /** The figure at the set-up's values. */
  readonly current: number;
  /** Ranked: largest |gain per 1 %| first; parameters without one last. */
  readonly parameters: readonly ParameterSensitivity[];
  readonly evaluations: number;
}

/** Ranks the parameters of a set-up for a figure. Throws a QuietframeError when the set-up as given has no value for the figure. */
export function rankParameters(setup: SetupDescription | string, figure: FigureSpec, options: RankOptions = {}): Ranking {
  const problem = designProblem(setup, figure, options.grid);
  const scanPoints = options.scanPoints ?? 25;
  if (!Number.isInteger(scanPoints) || scanPoints < 3 || scanPoints > 10_000) {
    throw new QuietframeError({ path: "options.scanPoints", value: options.scanPoints, problem: "is not a usable number of scan points", allowed: "an integer from 3 to 10000" });
  }
  const relativeStep = options.relativeStep ?? 0.02;
  if (!(relativeStep > 0 && relativeStep <= 0.5)) {
    throw new QuietframeError({ path: "options.relativeStep", value: options.relativeStep, problem: "is not a usable relative step", allowed: "0 < relativeStep ≤ 0.5" });
  }
  const parameters = options.parameters === undefined ? numericParameters(problem.base) : options.parameters.map((t, i) => designParameter(problem.base, t, `options.parameters[${i}]`));
  const base = problem.evaluate({}, []);
  if (base.status !== CellStatus.ok) {
    throw new QuietframeError({ path: "setup", value: problem.base.name || "(set-up)", problem: `has no value for the figure as given: ${base.message}`, allowed: "a set-up that evaluates" });
  }
  const rows = parameters.map((p) => sensitivity(problem, p, base.value, scanPoints, relativeStep));
  const key = (r: ParameterSensitivity): number => (r.gainPer1Percent === null ? -1 : Math.abs(r.gainPer1Percent));
  const ranked = rows
    .map((r, i) => ({ r, i }))
    .sort((a, b) => key(b.r) - key(a.r) || a.i - b.i)
    .map((e) => e.r);
  return { figure: problem.figure, current: base.value, parameters: ranked, evaluations: problem.evaluations };
}

function sensitivity(problem: DesignProblem, p: DesignParameter, current: number, scanPoints: number, relativeStep: number): ParameterSensitivity {
  const fig = problem.figure;
  const x0 = p.value;
  const m0 = merit(fig, { value: current, status: CellStatus.ok });
  const zeroScale = problem.grid.to;
  let failure: string | undefined;
  const meritAt = (x: number): number => {
    if (!withinBounds(p, x)) return -Infinity;
    const outcome = problem.evaluate({ [p.target]: x }, [p]);
    if (outcome.status !== CellStatus.ok) failure ??= `at ${shownValue(x, p)}: ${outcome.message}`;
    return merit(fig, outcome);
  };
  // The derivative is of the figure's level (dB), finite or NaN; merit flips its sign for the noise.
  const sign = fig.better === "higher" ? 1 : -1;
  const levelAt = (x: number): number => {
    const m = meritAt(x);
    return Number.isFinite(m) ? sign * m : NaN;
  };
  const scale = x0 !== 0 ? Math.abs(x0) : zeroScale * 1e-3;
  const derivative = parameterDerivative(levelAt, p, x0, relativeStep * scale, sign * m0);
  const derivativeFailure = failure;
  const range = defaultRange(p, zeroScale);
  const line = maximizeOnLine(meritAt, range, scanPoints, { x: x0, merit: m0 });
  const bestAt: RangeEnd | "inside" = line.at === "low-end" ? range.loEnd : line.at === "high-end" ? range.hiEnd : "inside";
  const best =
    line.merit === -Infinity
      ? undefined
      : {
          value: line.x,
          shown: shownValue(line.x, p),
          figure: valueOfLevel(fig, sign * line.merit),
          gainDb: line.merit - m0,
          at: bestAt,
          range: [range.lo, range.hi] as const,
        };
  const common = { target: p.target, value: x0, shown: shownValue(x0, p), best };
  if (!derivative) {
    return {
      ...common,
      gainPer1Percent: null,
      gainPer1PercentError: null,
      gainFor10Percent: null,
      helps: "neither",
      message: `the figure has no value on either side of the current value, e.g. ${derivativeFailure ?? "(no message)"}`,
    };
  }
  const slope = sign * derivative.value; // merit per SI unit
  const helps = Math.abs(slope) <= derivative.error || slope === 0 ? "neither" : slope > 0 ? "increase" : "decrease";
  const bound = helps === "increase" ? p.upper : helps === "decrease" ? p.lower : undefined;
  let gainFor10Percent: number | null = null;
  if (helps !== "neither" && x0 !== 0) {
    const towards = helps === "increase" ? 1 : -1;
    let x1 = x0 + towards * 0.1 * Math.abs(x0);
    if (!withinBounds(p, x1)) x1 = towards > 0 ? range.hi : range.lo;
    const m1 = meritAt(x1);
    gainFor10Percent = Number.isFinite(m1) ? m1 - m0 : null;
  }
  return {
    ...common,
    derivative: { levelPerUnit: derivative.value, error: derivative.error, kind: derivative.kind, evaluations: derivative.evaluations },
    gainPer1Percent: x0 === 0 ? null : slope * 0.01 * x0,
    gainPer1PercentError: x0 === 0 ? null : derivative.error * 0.01 * Math.abs(x0),
    gainFor10Percent,
    helps,
    bound: bound ? { ...bound, shown: shownValue(bound.value, p) } : undefined,
  };
}
