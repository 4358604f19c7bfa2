/**
 * Arithmetic on small dense real matrices (row-major Float64Array, square unless a shape is
 * given): products, transpose, congruence, symmetrizing, norms and blocks. Plain loops, no
 * allocation hidden behind operators. Solving is in real-lu.ts.
 */

export function identity(n: number): Float64Array {
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) out[i * n + i] = 1;
  return out;
}

/** (r×k)·(k×c). */
export function multiply(a: ArrayLike<number>, b: ArrayLike<number>, r: number, k: number, c: number): Float64Array {
  const out = new Float64Array(r * c);
  for (let i = 0; i < r; i++) {
    const oi = i * c;
    for (let l = 0; l < k; l++) {
      const x = a[i * k + l];
      if (x === 0) continue;
      const bl = l * c;
      for (let j = 0; j < c; j++) out[oi + j] += x * b[bl + j];
    }
  }
  return out;
}

/** Square n×n product. */
export function mul(a: ArrayLike<number>, b: ArrayLike<number>, n: number): Float64Array {
  return multiply(a, b, n, n, n);
}

/** Transpose of an r×c matrix. */
export function transpose(a: ArrayLike<number>, r: number, c: number = r): Float64Array {
  const out = new Float64Array(r * c);
  for (let i = 0; i < r; i++) for (let j = 0; j < c; j++) out[j * r + i] = a[i * c + j];
  return out;
}

/** a·X·aᵀ for square n×n a and X. */
export function congruence(a: ArrayLike<number>, x: ArrayLike<number>, n: number): Float64Array {
  return multiply(mul(a, x, n), transpose(a, n), n, n, n);
}

export function add(a: ArrayLike<number>, b: ArrayLike<number>): Float64Array {
  const out = new Float64Array(a.length);
  for (let i = 0; i < out.length; i++) out[i] = a[i] + b[i];
  return out;
}

/** (X + Xᵀ)/2 in place; returns X. */
export function symmetrize(x: Float64Array, n: number): Float64Array {
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const s = 0.5 * (x[i * n + j] + x[j * n + i]);
      x[i * n + j] = s;
      x[j * n + i] = s;
    }
  }
  return x;
}

/** Largest absolute column sum (the 1-norm). */
export function norm1(a: ArrayLike<number>, n: number): number {
  let best = 0;
  for (let j = 0; j < n; j++) {
    let s = 0;
    for (let i = 0; i < n; i++) s += Math.abs(a[i * n + j]);
    if (s > best) best = s;
  }
  return best;
}

export function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) {
    const x = Math.abs(a[i]);
    if (x > m || x !== x) m = x;
  }
  return m;
}

export function allFinite(a: ArrayLike<number>): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}

/** Block (r0.., c0..) of size r×c from an N-column matrix. */
export function block(a: ArrayLike<number>, cols: number, r0: number, c0: number, r: number, c: number): Float64Array {
  const out = new Float64Array(r * c);
  for (let i = 0; i < r; i++) for (let j = 0; j < c; j++) out[i * c + j] = a[(r0 + i) * cols + c0 + j];
  return out;
}

/** Writes an r×c block into an N-column matrix at (r0, c0), multiplied by `scale`. */
export function setBlock(target: Float64Array, cols: number, r0: number, c0: number, src: ArrayLike<number>, r: number, c: number, scale = 1): void {
  for (let i = 0; i < r; i++) for (let j = 0; j < c; j++) target[(r0 + i) * cols + c0 + j] = scale * src[i * c + j];
}
