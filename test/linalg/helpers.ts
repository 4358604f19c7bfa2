/** Test-only utilities: a seeded PRNG and small dense-matrix helpers. */
import type { Complex, MathJsStatic } from "./mathjs-reference";

/** mulberry32: tiny deterministic PRNG so failures reproduce (from memory). */
export function seededRandom(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (s + 0x6d2b79f5) >>> 0;
    let t = s;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Uniform in [−1, 1). */
export function uniform(rand: () => number): number {
  return 2 * rand() - 1;
}

export function randomMatrix(rand: () => number, rows: number, cols = rows): Float64Array {
  const a = new Float64Array(rows * cols);
  for (let i = 0; i < a.length; i++) a[i] = uniform(rand);
  return a;
}

export function toRows(a: Float64Array, rows: number, cols = rows): number[][] {
  const out: number[][] = [];
  for (let i = 0; i < rows; i++) out.push(Array.from(a.subarray(i * cols, (i + 1) * cols)));
  return out;
}

export function fromRows(rows: number[][]): Float64Array {
  return Float64Array.from(rows.flat());
}

export function complexRows(math: MathJsStatic, re: Float64Array, im: Float64Array, rows: number, cols = rows): Complex[][] {
  const out: Complex[][] = [];
  for (let i = 0; i < rows; i++) {
    const row: Complex[] = [];
    for (let j = 0; j < cols; j++) row.push(math.complex(re[i * cols + j], im[i * cols + j]));
    out.push(row);
  }
  return out;
}

export function matMul(a: Float64Array, b: Float64Array, n: number, k: number, m: number): Float64Array {
  const c = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let p = 0; p < k; p++) {
      const x = a[i * k + p];
      for (let j = 0; j < m; j++) c[i * m + j] += x * b[p * m + j];
    }
  }
  return c;
}

export function transpose(a: Float64Array, rows: number, cols = rows): Float64Array {
  const t = new Float64Array(rows * cols);
  for (let i = 0; i < rows; i++) for (let j = 0; j < cols; j++) t[j * rows + i] = a[i * cols + j];
  return t;
}

/** Max-abs entry. */
export function maxAbs(a: ArrayLike<number>): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

/** Random orthogonal matrix from Gram–Schmidt on a random matrix (twice, for orthogonality). */
export function randomOrthogonal(rand: () => number, n: number): Float64Array {
  const q = randomMatrix(rand, n);
  for (let pass = 0; pass < 2; pass++) {
    for (let j = 0; j < n; j++) {
      for (let k = 0; k < j; k++) {
        let d = 0;
        for (let i = 0; i < n; i++) d += q[i * n + j] * q[i * n + k];
        for (let i = 0; i < n; i++) q[i * n + j] -= d * q[i * n + k];
      }
      let s = 0;
      for (let i = 0; i < n; i++) s += q[i * n + j] ** 2;
      s = Math.sqrt(s);
      for (let i = 0; i < n; i++) q[i * n + j] /= s;
    }
  }
  return q;
}

export interface Eig {
  re: number;
  im: number;
}

/**
 * Largest distance between two eigenvalue multisets after greedy nearest matching
 * (each reference value is used once).
 */
export function multisetDistance(got: Eig[], want: Eig[]): number {
  if (got.length !== want.length) return Infinity;
  const used = new Array<boolean>(want.length).fill(false);
  let worst = 0;
  for (const g of got) {
    let best = -1;
    let bestD = Infinity;
    for (let j = 0; j < want.length; j++) {
      if (used[j]) continue;
      const d = Math.hypot(g.re - want[j].re, g.im - want[j].im);
      if (d < bestD) {
        bestD = d;
        best = j;
      }
    }
    used[best] = true;
    worst = Math.max(worst, bestD);
  }
  return worst;
}

export function pairs(v: { re: Float64Array; im: Float64Array }): Eig[] {
  return Array.from(v.re, (re, i) => ({ re, im: v.im[i] }));
}

/**
 * Q B Qᵀ with Q a random orthogonal matrix and B block diagonal with the given eigenvalues
 * (a real λ as a 1×1 block, a pair a ± ib as [[a, b], [−b, a]]): a normal matrix whose
 * spectrum is known exactly (a similarity keeps the eigenvalues).
 */
export function knownSpectrum(rand: () => number, eigenvalues: readonly Eig[]): { a: Float64Array; n: number } {
  const n = eigenvalues.length;
  const b = new Float64Array(n * n);
  for (let k = 0; k < n; k++) {
    const e = eigenvalues[k];
    if (e.im === 0) {
      b[k * n + k] = e.re;
    } else {
      b[k * n + k] = e.re;
      b[(k + 1) * n + k + 1] = e.re;
      b[k * n + k + 1] = e.im;
      b[(k + 1) * n + k] = -e.im;
      k++;
    }
  }
  const q = randomOrthogonal(rand, n);
  return { a: matMul(matMul(q, b, n, n, n), transpose(q, n), n, n, n), n };
}

/** A spectrum of `pairs` complex pairs and `reals` real values, spread over [−3, 3] (conjugates adjacent). */
export function spreadSpectrum(pairs: number, reals: number): Eig[] {
  const out: Eig[] = [];
  for (let k = 0; k < pairs; k++) {
    const re = -2.5 + (5 * k) / Math.max(pairs, 1);
    const im = 0.5 + 0.3 * k;
    out.push({ re, im }, { re, im: -im });
  }
  for (let k = 0; k < reals; k++) out.push({ re: -3 + (6 * (k + 0.5)) / reals, im: 0 });
  return out;
}
