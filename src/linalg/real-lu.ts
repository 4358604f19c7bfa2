/**
 * Real dense LU with partial pivoting (row-major Float64Array), same conventions as
 * complexLuFactor: P A = L U stored in place, row k exchanged with piv[k] at step k.
 * `solve` wraps factor and solve for callers that can afford two copies.
 */
import { SingularMatrixError } from "./singular-error";

export function realLuFactor(a: Float64Array, n: number, piv: Int32Array): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`matrix order must be a non-negative integer, got ${n}`);
  if (a.length < n * n) throw new RangeError(`matrix array holds fewer than ${n}×${n} entries`);
  if (piv.length < n) throw new RangeError(`pivot array holds fewer than ${n} entries`);
  for (let k = 0; k < n; k++) {
    const rowK = k * n;
    let p = k;
    let best = Math.abs(a[rowK + k]);
    for (let i = k + 1; i < n; i++) {
      const m = Math.abs(a[i * n + k]);
      // A NaN candidate is taken as pivot so it is reported below rather than skipped.
      if (m > best || (m !== m && best === best)) {
        best = m;
        p = i;
      }
    }
    piv[k] = p;
    if (best === 0) throw new SingularMatrixError(k);
    if (!Number.isFinite(best)) throw new SingularMatrixError(k, "pivot is not finite");
    if (p !== k) {
      const rowP = p * n;
      for (let j = 0; j < n; j++) {
        const t = a[rowK + j];
        a[rowK + j] = a[rowP + j];
        a[rowP + j] = t;
      }
    }
    const pivot = a[rowK + k];
    for (let i = k + 1; i < n; i++) {
      const rowI = i * n;
      if (a[rowI + k] === 0) continue;
      const l = a[rowI + k] / pivot;
      a[rowI + k] = l;
      for (let j = k + 1; j < n; j++) a[rowI + j] -= l * a[rowK + j];
    }
  }
}

/** Solves A X = B in place (B is n×nrhs, row-major) from the factors of realLuFactor. */
export function realLuSolve(a: Float64Array, n: number, piv: Int32Array, b: Float64Array, nrhs: number): void {
  if (a.length < n * n || piv.length < n) throw new RangeError(`factor arrays are smaller than order ${n}`);
  if (!Number.isInteger(nrhs) || nrhs < 0 || b.length < n * nrhs) {
    throw new RangeError(`right-hand side must hold ${n}×${nrhs} entries`);
  }
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p === k) continue;
    for (let c = 0; c < nrhs; c++) {
      const t = b[k * nrhs + c];
      b[k * nrhs + c] = b[p * nrhs + c];
      b[p * nrhs + c] = t;
    }
  }
  for (let i = 1; i < n; i++) {
    const bi = i * nrhs;
    for (let k = 0; k < i; k++) {
      const l = a[i * n + k];
      if (l === 0) continue;
      const bk = k * nrhs;
      for (let c = 0; c < nrhs; c++) b[bi + c] -= l * b[bk + c];
    }
  }
  for (let i = n - 1; i >= 0; i--) {
    const bi = i * nrhs;
    for (let k = i + 1; k < n; k++) {
      const u = a[i * n + k];
      if (u === 0) continue;
      const bk = k * nrhs;
      for (let c = 0; c < nrhs; c++) b[bi + c] -= u * b[bk + c];
    }
    const d = a[i * n + i];
    for (let c = 0; c < nrhs; c++) b[bi + c] /= d;
  }
}

/** Solves M X = B (M n×n, B n×c) by LU with partial pivoting; M and B are left untouched. */
export function solve(m: ArrayLike<number>, b: ArrayLike<number>, n: number, c: number): Float64Array {
  const lu = Float64Array.from(m);
  const piv = new Int32Array(n);
  realLuFactor(lu, n, piv);
  const x = Float64Array.from(b);
  realLuSolve(lu, n, piv, x, c);
  return x;
}
