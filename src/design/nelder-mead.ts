/**
 * Derivative-free minimization in the unit box [0, 1]ⁿ: the Nelder–Mead simplex method
 * (J. A. Nelder & R. Mead, Computer Journal 7 (1965) 308) with the standard coefficients
 * (reflection 1, expansion 2, contraction ½, shrink ½, in the form of Lagarias, Reeds, Wright &
 * Wright, SIAM J. Optim. 9 (1998) 112), bounds kept by projecting every trial point onto the
 * box, and restarts from the best point with a fresh simplex until a restart no longer improves
 * (a cure for the method's known stagnation, C. T. Kelley, SIAM J. Optim. 10 (1999) 43).
 * Infeasible points are scored +Infinity: the simplex moves away from them like from any worse point.
 */

export interface BoxMinimizeOptions {
  /** Stop when every vertex lies within this distance (max norm, unit-box coordinates) of the best. Default 1e-10. */
  readonly xTolerance?: number;
  /** … or when the values of all vertices agree to this (absolute). Default 0 (only the size test). */
  readonly fTolerance?: number;
  /** Evaluations allowed for one start, restarts included. Default 400 + 200·n. */
  readonly maxEvaluations?: number;
  /** Edge of the first simplex in unit-box coordinates. Default 0.1. */
  readonly initialStep?: number;
}

export interface BoxMinimum {
  readonly u: Float64Array;
  readonly f: number;
  readonly evaluations: number;
  /** The simplex shrank below the tolerance (false: the evaluation budget ran out first). */
  readonly converged: boolean;
  readonly restarts: number;
}

/** Minimizes f over [0, 1]ⁿ from `start`. f(u) may be +Infinity (infeasible), never NaN. */
export function minimizeInBox(f: (u: Float64Array) => number, start: Float64Array, options: BoxMinimizeOptions = {}): BoxMinimum {
  const n = start.length;
  const xTolerance = options.xTolerance ?? 1e-10;
  const fTolerance = options.fTolerance ?? 0;
  const maxEvaluations = options.maxEvaluations ?? 400 + 200 * n;
  let evaluations = 0;
  const value = (u: Float64Array): number => {
    evaluations++;
    const y = f(u);
    if (Number.isNaN(y)) throw new Error("internal: minimizeInBox's function returned NaN; score infeasible points as +Infinity");
    return y;
  };
  let best = clampToBox(Float64Array.from(start));
  let fBest = value(best);
  let step = options.initialStep ?? 0.1;
  let restarts = -1;
  let converged = false;
  for (;;) {
    restarts++;
    const run = simplexSearch(value, best, fBest, step, xTolerance, fTolerance, () => evaluations < maxEvaluations);
    const improved = run.f < fBest;
    converged = run.converged;
    if (run.f <= fBest) {
      best = run.u;
      fBest = run.f;
    }
    // A restart that finds nothing better (or a budget that ran out) ends the search.
    if (!improved || !run.converged || evaluations >= maxEvaluations) break;
    step = Math.max(Math.min(step, 0.1), 100 * xTolerance);
  }
  return { u: best, f: fBest, evaluations, converged, restarts };
}

function clampToBox(u: Float64Array): Float64Array {
  for (let i = 0; i < u.length; i++) u[i] = u[i] < 0 ? 0 : u[i] > 1 ? 1 : u[i];
  return u;
}

/** One simplex run from x0 (value f0) with edges `step`, kept inside the box. */
function simplexSearch(
  value: (u: Float64Array) => number,
  x0: Float64Array,
  f0: number,
  step: number,
  xTolerance: number,
  fTolerance: number,
  mayEvaluate: () => boolean,
): { u: Float64Array; f: number; converged: boolean } {
  const n = x0.length;
  const vertices: Float64Array[] = [Float64Array.from(x0)];
  const values: number[] = [f0];
  for (let i = 0; i < n; i++) {
    const v = Float64Array.from(x0);
    // Step inward when the edge would leave the box.
    v[i] = x0[i] + step <= 1 ? x0[i] + step : x0[i] - step;
    clampToBox(v);
    vertices.push(v);
    values.push(value(v));
  }
  const centroid = new Float64Array(n);
  const along = (t: number, worst: Float64Array): Float64Array => {
    const out = new Float64Array(n);
    for (let k = 0; k < n; k++) out[k] = centroid[k] + t * (centroid[k] - worst[k]);
    return clampToBox(out);
  };
  for (;;) {
    // Order: best first; ties keep the older vertex first.
    const order = values.map((_, i) => i).sort((i, j) => values[i] - values[j] || i - j);
    const sortedV = order.map((i) => vertices[i]);
    const sortedF = order.map((i) => values[i]);
    for (let i = 0; i <= n; i++) {
      vertices[i] = sortedV[i];
      values[i] = sortedF[i];
    }
    if (simplexSize(vertices) <= xTolerance || (Number.isFinite(values[n]) && values[n] - values[0] <= fTolerance)) {
      return { u: vertices[0], f: values[0], converged: true };
    }
    if (!mayEvaluate()) return { u: vertices[0], f: values[0], converged: false };
    centroid.fill(0);
    for (let i = 0; i < n; i++) for (let k = 0; k < n; k++) centroid[k] += vertices[i][k] / n;
    const worst = vertices[n];
    const reflected = along(1, worst);
    const fr = value(reflected);
    if (fr < values[0]) {
      const expanded = along(2, worst);
      const fe = value(expanded);
      if (fe < fr) replaceWorst(vertices, values, expanded, fe);
      else replaceWorst(vertices, values, reflected, fr);
      continue;
    }
    if (fr < values[n - 1]) {
      replaceWorst(vertices, values, reflected, fr);
      continue;
    }
    // Contract outside (towards the reflected point) or inside (towards the worst).
    const outside = fr < values[n];
    const contracted = along(outside ? 0.5 : -0.5, worst);
    const fc = value(contracted);
    if (outside ? fc <= fr : fc < values[n]) {
      replaceWorst(vertices, values, contracted, fc);
      continue;
    }
    // Shrink every vertex halfway towards the best.
    for (let i = 1; i <= n; i++) {
      const v = new Float64Array(n);
      for (let k = 0; k < n; k++) v[k] = vertices[0][k] + 0.5 * (vertices[i][k] - vertices[0][k]);
      vertices[i] = v;
      values[i] = value(v);
    }
  }
}

function replaceWorst(vertices: Float64Array[], values: number[], v: Float64Array, fv: number): void {
  vertices[vertices.length - 1] = v;
  values[values.length - 1] = fv;
}

/** Largest distance (max norm) of a vertex from the best one. */
function simplexSize(vertices: Float64Array[]): number {
  let size = 0;
  for (let i = 1; i < vertices.length; i++) for (let k = 0; k < vertices[0].length; k++) size = Math.max(size, Math.abs(vertices[i][k] - vertices[0][k]));
  return size;
}
