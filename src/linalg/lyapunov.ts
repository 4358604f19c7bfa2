/**
 * Stationary covariance of dz = A z dt + noise with diffusion matrix Q: the symmetric V
 * with A V + V Aᵀ + Q = 0.
 *
 * Method: write the equation only for the n(n+1)/2 unknowns V[i][j], i ≤ j (V is
 * symmetric, and so is the equation), and solve the resulting dense linear system by LU.
 * For n ≤ 40 that is at most 820 unknowns, a fraction of a second.
 */
import { realLuFactor, realLuSolve } from "./real-lu";
import { SingularMatrixError } from "./singular-error";
import { findNonDecayingMode, NonDecayingModeError } from "./non-decaying-mode";
import { WorkArray } from "./work-array";

/** The packed system and right-hand side of each solve. */
const lyapunovWork = new WorkArray();

/** Index of V[i][j] (i ≤ j) in the packed upper triangle. */
function packed(i: number, j: number, n: number): number {
  if (i > j) {
    const t = i;
    i = j;
    j = t;
  }
  return i * n - (i * (i - 1)) / 2 + (j - i);
}

export function solveLyapunov(a: Float64Array, q: Float64Array, n: number): Float64Array {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`solveLyapunov: order must be a non-negative integer, got ${n}`);
  if (a.length !== n * n || q.length !== n * n) {
    throw new RangeError(`solveLyapunov: A and Q must both hold ${n}×${n} entries`);
  }
  for (let i = 0; i < n * n; i++) {
    if (!Number.isFinite(q[i])) throw new RangeError(`solveLyapunov: Q entry ${i} is ${q[i]}, expected finite`);
  }
  if (n === 0) return new Float64Array(0);

  // Stability first: it names the offending mode, which a singular pivot cannot, and it
  // catches undamped modes whose Lyapunov operator is singular only up to rounding.
  const bad = findNonDecayingMode(a, n);
  if (bad) {
    const sign = bad.im < 0 ? "-" : "+";
    throw new NonDecayingModeError(
      `solveLyapunov: A is not stable, eigenvalue ${bad.re} ${sign} ${Math.abs(bad.im)}i is a ${bad.kind} mode ` + `(real part must be negative); no stationary covariance exists`,
      bad,
    );
  }

  const m = (n * (n + 1)) / 2;
  const work = lyapunovWork.zeros(m * m + m);
  const sys = work.subarray(0, m * m);
  const rhs = work.subarray(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const r = packed(i, j, n);
      const row = r * m;
      // (A V)[i][j] = Σk A[i][k] V[k][j];  (V Aᵀ)[i][j] = Σk V[i][k] A[j][k].
      for (let k = 0; k < n; k++) {
        sys[row + packed(k, j, n)] += a[i * n + k];
        sys[row + packed(i, k, n)] += a[j * n + k];
      }
      // Symmetric part of Q: an antisymmetric part cannot be matched by a symmetric V.
      rhs[r] = -0.5 * (q[i * n + j] + q[j * n + i]);
    }
  }

  const piv = new Int32Array(m);
  try {
    realLuFactor(sys, m, piv);
  } catch (e) {
    if (e instanceof SingularMatrixError) {
      throw new Error("solveLyapunov: the equation A V + V Aᵀ + Q = 0 is singular " + "(A has eigenvalues with λi + λj = 0, e.g. an undamped mode); no unique stationary covariance");
    }
    throw e;
  }
  realLuSolve(sys, m, piv, rhs, 1);

  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const x = rhs[packed(i, j, n)];
      v[i * n + j] = x;
      v[j * n + i] = x;
    }
  }
  return v;
}
