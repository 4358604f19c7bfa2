/**
 * First derivatives of a function that is costly to evaluate and may fail at some points:
 * Ridders' method, a Richardson extrapolation of finite differences over a shrinking step
 * (ratio STEP_RATIO), with the error estimate of the extrapolation tableau (C. J. F. Ridders,
 * Adv. Eng. Software 4 (1982) 75). Central differences where both sides may be evaluated,
 * one-sided ones beside a bound; the tableau then eliminates error terms h, h², … instead of h², h⁴, ….
 */

export type DifferenceKind = "central" | "forward" | "backward";

export interface DerivativeEstimate {
  /** The extrapolated derivative. */
  readonly value: number;
  /**
   * Estimated absolute error of `value`: the smallest change between neighbouring tableau entries,
   * and at least the rounding of a difference quotient, ROUNDING·|f(x)|/step at the step that gave it.
   */
  readonly error: number;
  readonly kind: DifferenceKind;
  /** Evaluations of the function spent (not counting f(x) for one-sided differences, which the caller gives). */
  readonly evaluations: number;
  /** The first (largest) step used. */
  readonly step: number;
}

/** Step shrink ratio between tableau rows and the number of rows (the recommended 1.4 and a short tableau: each row costs one or two evaluations). */
export const STEP_RATIO = 1.4;
export const MAX_ROWS = 8;
/** The tableau stops when the latest diagonal entry moved by more than SAFE × the best error so far (rounding takes over). */
const SAFE = 2;
/** Relative rounding of one value of f (a few units in the last place of a result of many operations). */
const ROUNDING = 1e-15;

/**
 * d f/dx at x from a first step h > 0. `f` returns NaN where it cannot be evaluated; a row whose
 * difference is not finite ends the tableau (the estimate so far is kept). `fx` is f(x), needed
 * for one-sided differences and for the rounding floor of the error. Undefined when not even the
 * first difference is finite.
 */
export function riddersDerivative(f: (x: number) => number, x: number, h: number, kind: DifferenceKind, fx: number): DerivativeEstimate | undefined {
  const ratioPower = kind === "central" ? STEP_RATIO * STEP_RATIO : STEP_RATIO;
  let evaluations = 0;
  const difference = (step: number): number => {
    if (kind === "central") {
      evaluations += 2;
      return (f(x + step) - f(x - step)) / (2 * step);
    }
    evaluations += 1;
    return kind === "forward" ? (f(x + step) - fx) / step : (fx - f(x - step)) / step;
  };
  let previous: number[] = [difference(h)];
  if (!Number.isFinite(previous[0])) return undefined;
  let best = previous[0];
  let bestStep = h;
  let error = Infinity;
  let step = h;
  for (let row = 1; row < MAX_ROWS; row++) {
    step /= STEP_RATIO;
    const d = difference(step);
    if (!Number.isFinite(d)) break;
    const current: number[] = [d];
    let factor = ratioPower;
    for (let j = 1; j <= row; j++) {
      current[j] = (current[j - 1] * factor - previous[j - 1]) / (factor - 1);
      factor *= ratioPower;
      const change = Math.max(Math.abs(current[j] - current[j - 1]), Math.abs(current[j] - previous[j - 1]));
      if (change <= error) {
        error = change;
        best = current[j];
        bestStep = step;
      }
    }
    if (Math.abs(current[row] - previous[row - 1]) >= SAFE * error) break;
    previous = current;
  }
  // A single finite row has no extrapolation to compare with: its error is unknown (Infinity).
  const rounding = Number.isFinite(fx) ? (ROUNDING * Math.abs(fx)) / bestStep : 0;
  return { value: best, error: Math.max(error, rounding), kind, evaluations, step: h };
}
