/**
 * Eigenvalues of an upper Hessenberg matrix by the implicit Francis double-shift QR
 * iteration with deflation (Golub & Van Loan, Matrix Computations, 4th ed., §7.5,
 * Algorithms 7.5.1–7.5.2), eigenvalues only.
 */
import { hypot } from "../numeric/portable-math";

const EPS = Number.EPSILON;

/** Scratch for a Householder reflector I − τ·[1 v1 v2]ᵀ[1 v1 v2]: [beta, tau, v1, v2]. */
const house = new Float64Array(4);

/** Reflector mapping (x, y, z) to (beta, 0, 0); tau = 0 means "identity". */
function makeHouse3(x: number, y: number, z: number): void {
  const tail = hypot(y, z);
  if (tail === 0) {
    house[0] = x;
    house[1] = 0;
    house[2] = 0;
    house[3] = 0;
    return;
  }
  const norm = hypot(x, tail);
  const beta = x >= 0 ? -norm : norm;
  const d = x - beta;
  house[0] = beta;
  house[1] = (beta - x) / beta;
  house[2] = y / d;
  house[3] = z / d;
}

/**
 * Eigenvalues of the real 2×2 [[a, b], [c, d]] into out[0..3] = re1, im1, re2, im2.
 * Scaled by the largest entry so squares cannot overflow; for real roots the larger one
 * is formed without cancellation and the other from the product (Vieta).
 */
export function eigenvalues2x2(a: number, b: number, c: number, d: number, out: Float64Array): void {
  const m = Math.max(Math.abs(a), Math.abs(b), Math.abs(c), Math.abs(d));
  if (m === 0) {
    out.fill(0, 0, 4);
    return;
  }
  a /= m;
  b /= m;
  c /= m;
  d /= m;
  const p = 0.5 * (a - d);
  const bc = b * c;
  const q = p * p + bc;
  if (q >= 0) {
    const z = p + (p >= 0 ? Math.sqrt(q) : -Math.sqrt(q));
    out[0] = (d + z) * m;
    out[1] = 0;
    out[2] = (z !== 0 ? d - bc / z : d + z) * m;
    out[3] = 0;
  } else {
    const re = (d + p) * m;
    const im = Math.sqrt(-q) * m;
    out[0] = re;
    out[1] = im;
    out[2] = re;
    out[3] = -im;
  }
}

const pair = new Float64Array(4);

/**
 * Overwrites the Hessenberg matrix `h` (order n) while computing its eigenvalues into
 * wr/wi starting at `offset`. Returns the number of QR sweeps used; throws if more than
 * `maxIterations` sweeps would be needed.
 */
export function hessenbergEigenvalues(h: Float64Array, n: number, wr: Float64Array, wi: Float64Array, offset: number, maxIterations: number): number {
  let norm = 0;
  for (let i = 0; i < n; i++) {
    for (let j = Math.max(0, i - 1); j < n; j++) norm += Math.abs(h[i * n + j]);
  }
  let hi = n - 1;
  let sinceDeflation = 0;
  let total = 0;
  while (hi >= 0) {
    // Bottom-most unreduced block [l, hi]: walk up until a negligible subdiagonal.
    let l = hi;
    while (l > 0) {
      let s = Math.abs(h[(l - 1) * n + l - 1]) + Math.abs(h[l * n + l]);
      if (s === 0) s = norm;
      if (Math.abs(h[l * n + l - 1]) <= EPS * s) {
        h[l * n + l - 1] = 0;
        break;
      }
      l--;
    }
    if (l === hi) {
      wr[offset + hi] = h[hi * n + hi];
      wi[offset + hi] = 0;
      hi -= 1;
      sinceDeflation = 0;
      continue;
    }
    if (l === hi - 1) {
      const i0 = (hi - 1) * n + hi - 1;
      eigenvalues2x2(h[i0], h[i0 + 1], h[i0 + n], h[i0 + n + 1], pair);
      wr[offset + hi - 1] = pair[0];
      wi[offset + hi - 1] = pair[1];
      wr[offset + hi] = pair[2];
      wi[offset + hi] = pair[3];
      hi -= 2;
      sinceDeflation = 0;
      continue;
    }
    if (total >= maxIterations) {
      throw new Error(`eigenvalue QR iteration did not converge: an unreduced ${hi - l + 1}×${hi - l + 1} block ` + `remains after ${total} sweeps`);
    }
    total++;
    sinceDeflation++;

    // Shifts: the eigenvalues of the trailing 2×2 (Francis), passed as their sum and
    // product so the step stays in real arithmetic. Every 10th sweep without deflation
    // uses an ad hoc shift instead, to break cycles that the standard shift can enter.
    let sum: number;
    let prod: number;
    if (sinceDeflation % 10 === 0) {
      const top = sinceDeflation % 20 === 10;
      const s = top ? Math.abs(h[(l + 1) * n + l]) + Math.abs(h[(l + 2) * n + l + 1]) : Math.abs(h[hi * n + hi - 1]) + Math.abs(h[(hi - 1) * n + hi - 2]);
      const x = 0.75 * s + (top ? h[l * n + l] : h[hi * n + hi]);
      sum = 2 * x;
      prod = x * x + 0.4375 * s * s;
    } else {
      const a = h[(hi - 1) * n + hi - 1];
      const b = h[(hi - 1) * n + hi];
      const c = h[hi * n + hi - 1];
      const d = h[hi * n + hi];
      sum = a + d;
      prod = a * d - b * c;
    }
    francisStep(h, n, l, hi, sum, prod);
  }
  return total;
}

/** One implicit double-shift QR sweep on the active block [l, hi] (at least 3×3). */
function francisStep(h: Float64Array, n: number, l: number, hi: number, sum: number, prod: number): void {
  // First column of (H − σ1 I)(H − σ2 I), computed on scaled entries so it cannot overflow.
  const h00 = h[l * n + l];
  const h01 = h[l * n + l + 1];
  const h10 = h[(l + 1) * n + l];
  const h11 = h[(l + 1) * n + l + 1];
  const h21 = h[(l + 2) * n + l + 1];
  const m = Math.max(Math.abs(h00), Math.abs(h01), Math.abs(h10), Math.abs(h11), Math.abs(h21), Math.abs(sum), Math.sqrt(Math.abs(prod)));
  const f = 1 / m;
  const a00 = h00 * f;
  const a10 = h10 * f;
  const sm = sum * f;
  let x = a00 * a00 + h01 * f * a10 - sm * a00 + prod * f * f;
  let y = a10 * (a00 + h11 * f - sm);
  let z = a10 * h21 * f;

  for (let k = l; k <= hi - 2; k++) {
    if (k > l) {
      x = h[k * n + k - 1];
      y = h[(k + 1) * n + k - 1];
      z = h[(k + 2) * n + k - 1];
    }
    makeHouse3(x, y, z);
    const tau = house[1];
    if (tau === 0) continue;
    const v1 = house[2];
    const v2 = house[3];
    if (k > l) {
      h[k * n + k - 1] = house[0];
      h[(k + 1) * n + k - 1] = 0;
      h[(k + 2) * n + k - 1] = 0;
    }
    const r0 = k * n;
    const r1 = r0 + n;
    const r2 = r1 + n;
    for (let j = k; j <= hi; j++) {
      const p = tau * (h[r0 + j] + v1 * h[r1 + j] + v2 * h[r2 + j]);
      h[r0 + j] -= p;
      h[r1 + j] -= p * v1;
      h[r2 + j] -= p * v2;
    }
    const last = Math.min(k + 3, hi);
    for (let i = l; i <= last; i++) {
      const row = i * n + k;
      const p = tau * (h[row] + v1 * h[row + 1] + v2 * h[row + 2]);
      h[row] -= p;
      h[row + 1] -= p * v1;
      h[row + 2] -= p * v2;
    }
  }

  // Final 2×2 reflector returns the matrix to Hessenberg form.
  const k = hi - 1;
  x = h[k * n + k - 1];
  y = h[(k + 1) * n + k - 1];
  makeHouse3(x, y, 0);
  const tau = house[1];
  if (tau === 0) return;
  const v1 = house[2];
  h[k * n + k - 1] = house[0];
  h[(k + 1) * n + k - 1] = 0;
  const r0 = k * n;
  const r1 = r0 + n;
  for (let j = k; j <= hi; j++) {
    const p = tau * (h[r0 + j] + v1 * h[r1 + j]);
    h[r0 + j] -= p;
    h[r1 + j] -= p * v1;
  }
  for (let i = l; i <= hi; i++) {
    const row = i * n + k;
    const p = tau * (h[row] + v1 * h[row + 1]);
    h[row] -= p;
    h[row + 1] -= p * v1;
  }
}
