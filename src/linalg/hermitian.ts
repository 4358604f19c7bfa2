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
import { WorkArray } from "./work-array";

/** The embedding that shiftedPositiveDefinite factorises in place. */
const choleskyWork = new WorkArray();

/**
 * The 2n×2n real symmetric embedding of the Hermitian part ((H + Hᴴ)/2) of H, so that
 * rounding-level asymmetry from how the caller built the matrix does not matter.
 */
export function hermitianEmbedding(re: ArrayLike<number>, im: ArrayLike<number>, n: number): Float64Array {
  return embedInto(new Float64Array(4 * n * n), re, im, n);
}

/** Writes the embedding into `e` (2n×2n, every entry written) and returns it. */
function embedInto(e: Float64Array, re: ArrayLike<number>, im: ArrayLike<number>, n: number): Float64Array {
  const m = 2 * n;
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

/**
 * Whether every eigenvalue of the Hermitian part of H is above −shift, decided without
 * eigenvalues: a Cholesky factorisation of the embedding plus shift·I succeeds when that
 * matrix is positive definite, and its success proves it up to the factorisation's backward
 * error, at most about (2n)²·eps·‖embedding‖. So true means the smallest eigenvalue is above
 * −shift minus that error; false (also for a non-finite entry) decides nothing, and the caller
 * computes the eigenvalue.
 */
export function shiftedPositiveDefinite(re: ArrayLike<number>, im: ArrayLike<number>, n: number, shift: number): boolean {
  const m = 2 * n;
  const a = embedInto(choleskyWork.zeros(m * m), re, im, n);
  for (let i = 0; i < m; i++) a[i * m + i] += shift;
  // Row-oriented Cholesky in place: the lower triangle becomes L with L Lᵀ = a.
  for (let j = 0; j < m; j++) {
    let d = a[j * m + j];
    for (let k = 0; k < j; k++) d -= a[j * m + k] * a[j * m + k];
    if (!(d > 0) || !Number.isFinite(d)) return false;
    const root = Math.sqrt(d);
    a[j * m + j] = root;
    for (let i = j + 1; i < m; i++) {
      let s = a[i * m + j];
      for (let k = 0; k < j; k++) s -= a[i * m + k] * a[j * m + k];
      a[i * m + j] = s / root;
    }
  }
  return true;
}
