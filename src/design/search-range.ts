import { QuietframeError } from "../errors";
import { log, exp } from "../numeric/portable-math";
import { parseParameterValue, shownValue, withinBounds, type DesignParameter } from "./parameters";

/**
 * The interval a design search explores for one parameter, and the coordinate it searches in.
 * Its ends are the parameter's physical bounds where it has them; where it has none (a mass
 * has no upper bound) the search stops SEARCH_FACTOR away from the current value, and says so.
 */

/** How far a search goes on a side without a physical bound: a factor 1000 from the current value (three decades). */
export const SEARCH_FACTOR = 1000;

export type RangeEnd = "bound" | "search-limit" | "given";

export interface SearchRange {
  readonly lo: number;
  readonly hi: number;
  /** What each end is: the parameter's physical bound, a search limit (no bound there), or given by the caller. */
  readonly loEnd: RangeEnd;
  readonly hiEnd: RangeEnd;
  /** "log": equal ratios (a positive range spanning a factor 10 or more); "linear" otherwise. */
  readonly scale: "log" | "linear";
}

/**
 * The default range: physical bounds, otherwise SEARCH_FACTOR around a positive value (also
 * below a positive value whose only lower bound is 0), a half turn either side of an angle (a
 * quadrature repeats after 180°), or `zeroScale` (SI units) either side of a value of 0 with no
 * bound, e.g. the grid's top frequency for a detuning.
 */
export function defaultRange(p: DesignParameter, zeroScale: number): SearchRange {
  const x = p.value;
  let lo: number;
  let hi: number;
  let loEnd: RangeEnd = "bound";
  let hiEnd: RangeEnd = "bound";
  const halfTurn = Math.PI;
  const width = x !== 0 ? Math.abs(x) * SEARCH_FACTOR : zeroScale;
  // A positive quantity bounded only by 0 (a mass, a temperature, a power) is searched in equal ratios down to x/SEARCH_FACTOR.
  const positiveFromZero = p.lower !== undefined && p.lower.value === 0 && x > 0 && p.spec.kind !== "fraction";
  if (p.lower && !positiveFromZero) lo = p.lower.inclusive ? p.lower.value : inside(p.lower.value, +1, p.upper?.value ?? x);
  else {
    loEnd = "search-limit";
    lo = p.spec.kind === "angle" ? x - halfTurn : x > 0 ? x / SEARCH_FACTOR : x - width;
  }
  if (p.upper && p.upper.inclusive) hi = p.upper.value;
  else if (p.upper) hi = inside(p.upper.value, -1, lo);
  else {
    hiEnd = "search-limit";
    hi = p.spec.kind === "angle" ? x + halfTurn : x > 0 ? x * SEARCH_FACTOR : x + width;
  }
  return { lo, hi, loEnd, hiEnd, scale: scaleOf(lo, hi) };
}

/** A range given by the caller (values with units); each end must lie inside the parameter's bounds. */
export function givenRange(p: DesignParameter, rawLo: unknown, rawHi: unknown, path: string): SearchRange {
  const lo = parseParameterValue(p, rawLo, `${path}.min`);
  const hi = parseParameterValue(p, rawHi, `${path}.max`);
  if (!withinBounds(p, lo)) {
    throw new QuietframeError({ path: `${path}.min`, value: rawLo, problem: `is outside the range of ${p.target}`, allowed: p.allowed });
  }
  if (!withinBounds(p, hi)) {
    throw new QuietframeError({ path: `${path}.max`, value: rawHi, problem: `is outside the range of ${p.target}`, allowed: p.allowed });
  }
  if (!(hi > lo)) {
    throw new QuietframeError({ path: `${path}.max`, value: rawHi, problem: `must be above min (${shownValue(lo, p)})`, allowed: `max > ${shownValue(lo, p)}` });
  }
  return { lo, hi, loEnd: "given", hiEnd: "given", scale: scaleOf(lo, hi) };
}

/** An exclusive bound moved a hair inside (towards `towards`), so the end is an allowed value. */
function inside(bound: number, direction: 1 | -1, towards: number): number {
  const step = Math.max(Math.abs(bound), Math.abs(towards - bound)) * 1e-9;
  return bound + direction * (step > 0 ? step : Number.MIN_VALUE);
}

function scaleOf(lo: number, hi: number): "log" | "linear" {
  return lo > 0 && hi / lo >= 10 ? "log" : "linear";
}

/** Position u ∈ [0, 1] of a value in the range (log or linear). */
export function toUnit(r: SearchRange, x: number): number {
  return r.scale === "log" ? log(x / r.lo) / log(r.hi / r.lo) : (x - r.lo) / (r.hi - r.lo);
}

/** The value at position u ∈ [0, 1]; the ends are exact. */
export function fromUnit(r: SearchRange, u: number): number {
  if (u <= 0) return r.lo;
  if (u >= 1) return r.hi;
  return r.scale === "log" ? r.lo * exp(u * log(r.hi / r.lo)) : r.lo + u * (r.hi - r.lo);
}
