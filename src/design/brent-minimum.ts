/**
 * The minimum of a function of one variable on an interval: Brent's method (R. P. Brent,
 * Algorithms for Minimization without Derivatives, 1973, ch. 5), golden-section steps with
 * parabolic interpolation when it behaves. It finds a local minimum near the starting point;
 * callers scan first. Infeasible points are scored +Infinity: they are never taken, and a
 * parabola through one is not fitted (a golden-section step is taken instead).
 */

const GOLDEN = 0.381966011250105;
const TINY = 1e-300;

export interface MinimumResult {
  readonly x: number;
  readonly fx: number;
  readonly evaluations: number;
}

/**
 * Minimizes f on [a, b] starting at x0 (a ≤ x0 ≤ b) with f(x0) = fx0. Stops when the
 * bracket around the best point is narrower than about 2·(relTolerance·|x| + absTolerance).
 */
export function brentMinimum(f: (x: number) => number, a: number, b: number, x0: number, fx0: number, relTolerance: number, absTolerance: number, maxEvaluations = 200): MinimumResult {
  let x = x0;
  let w = x0;
  let v = x0;
  let fx = fx0;
  let fw = fx0;
  let fv = fx0;
  let d = 0;
  let e = 0;
  let evaluations = 0;
  while (evaluations < maxEvaluations) {
    const xm = 0.5 * (a + b);
    const tol1 = relTolerance * Math.abs(x) + absTolerance + TINY;
    const tol2 = 2 * tol1;
    if (Math.abs(x - xm) <= tol2 - 0.5 * (b - a)) break;
    let golden = true;
    if (Math.abs(e) > tol1) {
      const r = (x - w) * (fx - fv);
      let q = (x - v) * (fx - fw);
      let p = (x - v) * q - (x - w) * r;
      q = 2 * (q - r);
      if (q > 0) p = -p;
      q = Math.abs(q);
      const previous = e;
      if (Number.isFinite(p) && Number.isFinite(q) && q !== 0 && Math.abs(p) < Math.abs(0.5 * q * previous) && p > q * (a - x) && p < q * (b - x)) {
        e = d;
        d = p / q;
        const u = x + d;
        if (u - a < tol2 || b - u < tol2) d = xm >= x ? tol1 : -tol1;
        golden = false;
      }
    }
    if (golden) {
      e = x >= xm ? a - x : b - x;
      d = GOLDEN * e;
    }
    const u = Math.abs(d) >= tol1 ? x + d : x + (d >= 0 ? tol1 : -tol1);
    const fu = f(u);
    evaluations++;
    if (fu <= fx) {
      if (u >= x) a = x;
      else b = x;
      v = w;
      fv = fw;
      w = x;
      fw = fx;
      x = u;
      fx = fu;
    } else {
      if (u < x) a = u;
      else b = u;
      if (fu <= fw || w === x) {
        v = w;
        fv = fw;
        w = u;
        fw = fu;
      } else if (fu <= fv || v === x || v === w) {
        v = u;
        fv = fu;
      }
    }
  }
  return { x, fx, evaluations };
}
