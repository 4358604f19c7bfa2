/**
 * Smallest eigenvalue of a Hermitian matrix H = Re + i·Im, e.g. for checking that a
 * covariance satisfies the uncertainty relation V + (i/2)Σ ≥ 0.
 *
 * Uses the real symmetric embedding [[Re, −Im], [Im, Re]] of order 2n, whose spectrum is
 * that of H with every eigenvalue doubled, so the real symmetric solvers serve complex
 * input: Jacobi here (all eigenvalues, high relative accuracy), or the faster
 * smallestSymmetricEigenvalue on the same embedding where speed matters.
 */
import { symmetricEigenvalues } from "./symmetric-eigen";

/**
 * The 2n×2n real symmetric embedding of the Hermitian part ((H + Hᴴ)/2) of H, so that
 * rounding-level asymmetry from how the caller built the matrix does not matter.
 */
export function hermitianEmbedding(re: ArrayLike<number>, im: ArrayLike<number>, n: number): Float64Array {
  const m = 2 * n;
  const e = new Float64Array(m * m);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const sr = 0.5 * (re[i * n + j] + re[j * n + i]);
      const ai = 0.5 * (im[i * n + j] - im[j * n + i]);
      e[i * m + j] = sr;
      e[(i + n) * m + (j + n)] = sr;
      e[i * m + (j + n)] = -ai;
      e[(i + n) * m + j] = ai;
    }
  }
  return e;
}

/** Smallest eigenvalue of the Hermitian part of H, by Jacobi on the embedding. */
export function minEigenvalueHermitian(re: Float64Array, im: Float64Array, n: number): number {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`minEigenvalueHermitian: order must be ≥ 1, got ${n}`);
  if (re.length !== n * n || im.length !== n * n) {
    throw new RangeError(`minEigenvalueHermitian: real and imaginary parts must both hold ${n}×${n} entries`);
  }
  return symmetricEigenvalues(hermitianEmbedding(re, im, n), 2 * n)[0];
}
