/**
 * A root of a function of one variable inside a bracket [a, b] where it changes sign: Brent's
 * method (R. P. Brent, Algorithms for Minimization without Derivatives, 1973, ch. 4), which
 * takes inverse quadratic or secant steps while they behave and bisects otherwise, so it never
 * needs more than about the square of the bisection count. A point where the function is not
 * finite (an unstable set-up scored −∞) is taken by its sign, and the next step bisects.
 */

const EPSILON = 2.220446049250313e-16;

export interface RootResult {
  /** The end of the final bracket where |f| is smaller. */
  readonly x: number;
  readonly fx: number;
  readonly evaluations: number;
  /** The final bracket (sorted): the root lies between them. */
  readonly bracket: readonly [number, number];
}

/**
 * `fa` = f(a), `fb` = f(b) with opposite signs (or one of them 0). `tolerance`: absolute width
 * in x at which to stop (to it, 4·ε·|x| is added).
 */
export function brentRoot(f: (x: number) => number, a: number, b: number, fa: number, fb: number, tolerance: number, maxEvaluations = 200): RootResult {
  if (!(fa <= 0 && fb >= 0) && !(fa >= 0 && fb <= 0)) throw new Error("internal: brentRoot needs a bracket with a sign change");
  let c = a;
  let fc = fa;
  let d = b - a;
  let e = d;
  let evaluations = 0;
  for (;;) {
    if ((fb > 0 && fc > 0) || (fb < 0 && fc < 0)) {
      c = a;
      fc = fa;
      d = b - a;
      e = d;
    }
    if (Math.abs(fc) < Math.abs(fb)) {
      a = b;
      b = c;
      c = a;
      fa = fb;
      fb = fc;
      fc = fa;
    }
    const tol1 = 2 * EPSILON * Math.abs(b) + 0.5 * tolerance;
    const xm = 0.5 * (c - b);
    if (Math.abs(xm) <= tol1 || fb === 0 || evaluations >= maxEvaluations) {
      return { x: b, fx: fb, evaluations, bracket: b < c ? [b, c] : [c, b] };
    }
    const finite = Number.isFinite(fa) && Number.isFinite(fb) && Number.isFinite(fc);
    if (finite && Math.abs(e) >= tol1 && Math.abs(fa) > Math.abs(fb)) {
      const s = fb / fa;
      let p: number;
      let q: number;
      if (a === c) {
        p = 2 * xm * s;
        q = 1 - s;
      } else {
        const qa = fa / fc;
        const r = fb / fc;
        p = s * (2 * xm * qa * (qa - r) - (b - a) * (r - 1));
        q = (qa - 1) * (r - 1) * (s - 1);
      }
      if (p > 0) q = -q;
      else p = -p;
      if (2 * p < Math.min(3 * xm * q - Math.abs(tol1 * q), Math.abs(e * q))) {
        e = d;
        d = p / q;
      } else {
        d = xm;
        e = d;
      }
    } else {
      d = xm;
      e = d;
    }
    a = b;
    fa = fb;
    b += Math.abs(d) > tol1 ? d : xm > 0 ? tol1 : -tol1;
    fb = f(b);
    evaluations++;
    if (Number.isNaN(fb)) throw new Error("internal: brentRoot's function returned NaN; score infeasible points as ±Infinity");
  }
}
