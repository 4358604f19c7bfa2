/**
 * Smallest eigenvalue of a real symmetric matrix: Householder reduction to tridiagonal
 * form, then bisection on the Sturm sequence count (Golub & Van Loan, Matrix Computations,
 * §8.3 and §8.4). About (4/3)m³ flops, a tenth of a Jacobi sweep sequence, which matters
 * when it runs at every stored point of a trajectory.
 *
 * A second job beside symmetric-eigen.ts (all eigenvalues by Jacobi), not a copy of it:
 * Jacobi keeps tiny eigenvalues of graded matrices to high relative accuracy and serves
 * the stationary physicality check; this one is for speed. The two round differently, and
 * saved trajectory states hold this one's bits, so neither replaces the other.
 */

/** Smallest eigenvalue of the symmetric m×m row-major `a` (only its lower triangle is read). */
export function smallestSymmetricEigenvalue(a: ArrayLike<number>, m: number): number {
  if (m === 0) return NaN;
  const w = Float64Array.from(a);
  const d = new Float64Array(m);
  const e = new Float64Array(m); // e[i]: coupling of rows i − 1 and i
  const v = new Float64Array(m);
  const p = new Float64Array(m);
  for (let k = 0; k < m - 2; k++) {
    // Householder vector for column k below the diagonal.
    let alpha = 0;
    for (let i = k + 1; i < m; i++) alpha += w[i * m + k] * w[i * m + k];
    alpha = Math.sqrt(alpha);
    const x0 = w[(k + 1) * m + k];
    if (alpha === 0) {
      e[k + 1] = 0;
      continue;
    }
    const sign = x0 >= 0 ? 1 : -1;
    e[k + 1] = -sign * alpha;
    for (let i = 0; i < m; i++) v[i] = 0;
    v[k + 1] = x0 + sign * alpha;
    for (let i = k + 2; i < m; i++) v[i] = w[i * m + k];
    let vv = 0;
    for (let i = k + 1; i < m; i++) vv += v[i] * v[i];
    const beta = 2 / vv;
    // A ← H A H on the trailing block, H = I − β v vᵀ: p = βAv, q = p − (β pᵀv/2) v, A −= v qᵀ + q vᵀ.
    for (let i = k + 1; i < m; i++) {
      let s = 0;
      for (let j = k + 1; j < m; j++) s += w[i * m + j] * v[j];
      p[i] = beta * s;
    }
    let pv = 0;
    for (let i = k + 1; i < m; i++) pv += p[i] * v[i];
    const c = 0.5 * beta * pv;
    for (let i = k + 1; i < m; i++) p[i] -= c * v[i];
    for (let i = k + 1; i < m; i++) {
      for (let j = k + 1; j < m; j++) w[i * m + j] -= v[i] * p[j] + p[i] * v[j];
    }
  }
  for (let i = 0; i < m; i++) d[i] = w[i * m + i];
  if (m >= 2) e[m - 1] = w[(m - 1) * m + (m - 2)];
  // Gershgorin interval, then bisection on the number of eigenvalues below x.
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < m; i++) {
    const r = (i > 0 ? Math.abs(e[i]) : 0) + (i + 1 < m ? Math.abs(e[i + 1]) : 0);
    lo = Math.min(lo, d[i] - r);
    hi = Math.max(hi, d[i] + r);
  }
  const scale = Math.max(Math.abs(lo), Math.abs(hi), Number.MIN_VALUE);
  for (let it = 0; it < 200 && hi - lo > 2 * Number.EPSILON * scale; it++) {
    const mid = 0.5 * (lo + hi);
    if (countBelow(d, e, m, mid) >= 1) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/** Number of eigenvalues of the tridiagonal (d, e) below x (signs of the LDLᵀ pivots of T − xI). */
function countBelow(d: Float64Array, e: Float64Array, m: number, x: number): number {
  let count = 0;
  let q = 1;
  for (let i = 0; i < m; i++) {
    const off = i > 0 ? e[i] * e[i] : 0;
    q = d[i] - x - (i > 0 ? off / q : 0);
    if (q === 0) q = -Number.EPSILON * (Math.abs(x) + Number.MIN_VALUE) - Number.MIN_VALUE;
    if (q < 0) count++;
  }
  return count;
}
