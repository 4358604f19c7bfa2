/**
 * Smallest eigenvalue of a Hermitian matrix H = Re + i·Im, e.g. for checking that a
 * covariance satisfies the uncertainty relation V + (i/2)Σ ≥ 0.
 *
 * Uses the real symmetric embedding [[Re, −Im], [Im, Re]] of order 2n, whose spectrum is
 * that of H with every eigenvalue doubled, so the real Jacobi solver can be reused.
 */
import { symmetricEigenvalues } from "./symmetric-eigen";

export { symmetricEigenvalues };

/**
 * Only the Hermitian part of the input is used ((H + Hᴴ)/2), so rounding-level asymmetry
 * from how the caller built the matrix does not matter.
 */
export function minEigenvalueHermitian(re: Float64Array, im: Float64Array, n: number): number {
  if (!Number.isInteger(n) || n < 1) throw new RangeError(`minEigenvalueHermitian: order must be ≥ 1, got ${n}`);
  if (re.length !== n * n || im.length !== n * n) {
    throw new RangeError(`minEigenvalueHermitian: real and imaginary parts must both hold ${n}×${n} entries`);
  }
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
  return symmetricEigenvalues(e, m)[0];
}
