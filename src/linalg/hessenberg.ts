/**
 * Orthogonal reduction to upper Hessenberg form, H = Qᵀ A Q, by Householder reflectors
 * (Golub & Van Loan, Matrix Computations, 4th ed., §7.4.3). Overwrites `a` with H and sets
 * the entries below the subdiagonal to exact zeros. Q is not accumulated: only the
 * eigenvalues are wanted.
 */
export function reduceToHessenbergInPlace(a: Float64Array, n: number): void {
  const v = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    // Reflector that maps a[k+1..n-1][k] onto a multiple of e1.
    let scale = 0;
    for (let i = k + 2; i < n; i++) scale = Math.max(scale, Math.abs(a[i * n + k]));
    if (scale === 0) continue; // column already in Hessenberg form: leave exact zeros alone
    const alpha = a[(k + 1) * n + k];
    scale = Math.max(scale, Math.abs(alpha));
    // Scaled 2-norm so that squaring cannot overflow or underflow.
    let ss = 0;
    for (let i = k + 1; i < n; i++) {
      const t = a[i * n + k] / scale;
      ss += t * t;
    }
    const norm = scale * Math.sqrt(ss);
    const beta = alpha >= 0 ? -norm : norm;
    const tau = (beta - alpha) / beta;
    const denom = alpha - beta;
    v[k + 1] = 1;
    for (let i = k + 2; i < n; i++) v[i] = a[i * n + k] / denom;

    // Left: rows k+1..n-1, columns k+1..n-1 (column k is set explicitly below).
    for (let j = k + 1; j < n; j++) {
      let p = 0;
      for (let i = k + 1; i < n; i++) p += v[i] * a[i * n + j];
      p *= tau;
      for (let i = k + 1; i < n; i++) a[i * n + j] -= p * v[i];
    }
    a[(k + 1) * n + k] = beta;
    for (let i = k + 2; i < n; i++) a[i * n + k] = 0;

    // Right: all rows, columns k+1..n-1.
    for (let i = 0; i < n; i++) {
      const row = i * n;
      let p = 0;
      for (let j = k + 1; j < n; j++) p += a[row + j] * v[j];
      p *= tau;
      for (let j = k + 1; j < n; j++) a[row + j] -= p * v[j];
    }
  }
}
