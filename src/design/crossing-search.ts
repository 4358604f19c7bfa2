import { brentRoot } from "./brent-root";

/**
 * Where a function of one coordinate u ∈ [0, 1] first changes sign walking away from a start
 * u0: steps that double from FIRST_STEP (so a narrow region around u0 is resolved and the whole
 * range is still reached in about 30 steps), then Brent's method inside the step that changed
 * sign. A sign change farther out than the first one on a side is not looked for.
 */

/** First step in the unit coordinate: 1e-9 of the range (on a log range of six decades, a relative change of 1.4e-8). */
export const FIRST_STEP = 1e-9;
/** Width of the final bracket in u. */
const ROOT_TOLERANCE = 1e-13;

export interface SideCrossing {
  /** The crossing in u (the bracket end nearer to it), or the range end when there is none. */
  readonly u: number;
  /** g there. */
  readonly g: number;
  /** Whether g changed sign on this side (false: `u` is the range end, 0 or 1). */
  readonly found: boolean;
  /** Whether the far side of the crossing had no value (g infinite): the edge of a region, not a smooth crossing. */
  readonly edge: boolean;
}

/** Walks from u0 (g(u0) = g0, finite) towards `direction` (−1: to 0, +1: to 1). g may be ±Infinity, never NaN. */
export function crossingOnSide(g: (u: number) => number, u0: number, g0: number, direction: 1 | -1): SideCrossing & { readonly evaluations: number } {
  const end = direction > 0 ? 1 : 0;
  let uPrev = u0;
  let gPrev = g0;
  let evaluations = 0;
  let step = FIRST_STEP;
  while (uPrev !== end) {
    const u = direction > 0 ? Math.min(1, u0 + step) : Math.max(0, u0 - step);
    const gu = g(u);
    evaluations++;
    if (gu >= 0 !== gPrev >= 0) {
      const root = brentRoot(g, uPrev, u, gPrev, gu, ROOT_TOLERANCE);
      evaluations += root.evaluations;
      return { u: root.x, g: root.fx, found: true, edge: !Number.isFinite(gu) || !Number.isFinite(root.fx), evaluations };
    }
    uPrev = u;
    gPrev = gu;
    step *= 2;
  }
  return { u: end, g: gPrev, found: false, edge: false, evaluations };
}
