/**
 * Eigenvalues of a real symmetric matrix by the cyclic Jacobi method (Golub & Van Loan,
 * Matrix Computations, 4th ed., §8.5.2–8.5.3). Chosen over tridiagonal QR for its
 * simplicity and because, with the threshold |a_pq| ≤ ε·sqrt(|a_pp·a_qq|), it keeps small
 * eigenvalues of graded matrices to high relative accuracy (Demmel & Veselić, SIAM J.
 * Matrix Anal. Appl. 13 (1992) 1204–1245), which matters for a positivity check.
 * When only the smallest eigenvalue is wanted and speed matters (every stored point of a
 * run), smallest-eigenvalue.ts does that job by bisection; the two round differently.
 */
const EPS = Number.EPSILON;
const MAX_SWEEPS = 60;

/** Eigenvalues in ascending order. Only the upper triangle of `a` is read; `a` is not modified. */
export function symmetricEigenvalues(a: Float64Array, n: number): Float64Array {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`symmetricEigenvalues: bad order ${n}`);
  if (a.length !== n * n) throw new RangeError(`symmetricEigenvalues: expected ${n * n} entries, got ${a.length}`);
  const w = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = i; j < n; j++) {
      const x = a[i * n + j];
      if (!Number.isFinite(x)) throw new RangeError(`symmetricEigenvalues: entry (${i}, ${j}) is ${x}`);
      w[i * n + j] = x;
      w[j * n + i] = x;
    }
  }
  jacobiInPlace(w, n);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = w[i * n + i];
  return out.sort();
}

function jacobiInPlace(w: Float64Array, n: number): void {
  for (let sweep = 0; sweep < MAX_SWEEPS; sweep++) {
    let rotated = false;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = w[p * n + q];
        if (apq === 0) continue;
        const app = w[p * n + p];
        const aqq = w[q * n + q];
        if (Math.abs(apq) <= EPS * Math.sqrt(Math.abs(app)) * Math.sqrt(Math.abs(aqq))) {
          w[p * n + q] = 0;
          w[q * n + p] = 0;
          continue;
        }
        rotated = true;
        // Rotation angle with t = tan θ the smaller root of t² + 2τt − 1 = 0.
        const tau = (aqq - app) / (2 * apq);
        const t = Math.abs(tau) > 1e150 ? 1 / (2 * tau) : (tau >= 0 ? 1 : -1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        w[p * n + p] = app - t * apq;
        w[q * n + q] = aqq + t * apq;
        w[p * n + q] = 0;
        w[q * n + p] = 0;
        for (let r = 0; r < n; r++) {
          if (r === p || r === q) continue;
          const arp = w[r * n + p];
          const arq = w[r * n + q];
          const np = c * arp - s * arq;
          const nq = s * arp + c * arq;
          w[r * n + p] = np;
          w[p * n + r] = np;
          w[r * n + q] = nq;
          w[q * n + r] = nq;
        }
      }
    }
    if (!rotated) return;
  }
  throw new Error(`symmetricEigenvalues: Jacobi did not converge in ${MAX_SWEEPS} sweeps`);
}
