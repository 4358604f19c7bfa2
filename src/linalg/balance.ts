/**
 * Parlett–Reinsch balancing: a diagonal similarity D⁻¹ A D with D made of powers of two
 * (so the scaling itself is exact) that makes each off-diagonal row and column 1-norm
 * comparable. It reduces ‖A‖ and with it the absolute rounding error of the QR iteration.
 * B. N. Parlett & C. Reinsch, Numer. Math. 13 (1969) 293–304.
 */
const RADIX = 2;
const RADIX_SQ = RADIX * RADIX;
/** A rescaling is kept only if it shrinks the row+column norm by at least 5 %. */
const GAIN = 0.95;

export function balanceInPlace(a: Float64Array, n: number): void {
  let changed = true;
  // Each accepted step reduces a positive norm by a fixed factor, so this terminates.
  while (changed) {
    changed = false;
    for (let i = 0; i < n; i++) {
      let r = 0;
      let c = 0;
      for (let j = 0; j < n; j++) {
        if (j === i) continue;
        c += Math.abs(a[j * n + i]);
        r += Math.abs(a[i * n + j]);
      }
      if (c === 0 || r === 0) continue;
      const total = c + r;
      let f = 1;
      let g = r / RADIX;
      while (c < g) {
        f *= RADIX;
        c *= RADIX_SQ;
      }
      g = r * RADIX;
      while (c > g) {
        f /= RADIX;
        c /= RADIX_SQ;
      }
      if ((c + r) / f < GAIN * total) {
        changed = true;
        const inv = 1 / f;
        for (let j = 0; j < n; j++) a[i * n + j] *= inv;
        for (let j = 0; j < n; j++) a[j * n + i] *= f;
      }
    }
  }
}
