/**
 * Complex LU factorisation with partial pivoting, on split real/imaginary Float64Arrays
 * (row-major). This is the per-frequency hot path: nothing here allocates, and the
 * factors are reused for both A X = B and Aᵀ X = B.
 *
 * Pivot choice uses |re| + |im| rather than the modulus: it avoids a square root per
 * candidate and is within a factor √2 of |z|, which only changes the growth-factor bound
 * of partial pivoting by a constant.
 */
import { SingularMatrixError } from "./singular-error";

export { SingularMatrixError };

function checkSizes(n: number, re: Float64Array, im: Float64Array, piv: Int32Array): void {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`matrix order must be a non-negative integer, got ${n}`);
  if (re.length < n * n || im.length < n * n) throw new RangeError(`matrix arrays hold fewer than ${n}×${n} entries`);
  if (piv.length < n) throw new RangeError(`pivot array holds fewer than ${n} entries`);
}

function checkRhs(n: number, nrhs: number, bRe: Float64Array, bIm: Float64Array): void {
  if (!Number.isInteger(nrhs) || nrhs < 0) throw new RangeError(`nrhs must be a non-negative integer, got ${nrhs}`);
  if (bRe.length < n * nrhs || bIm.length < n * nrhs) {
    throw new RangeError(`right-hand side arrays hold fewer than ${n}×${nrhs} entries`);
  }
}

/**
 * Where complexLuFactor keeps the reciprocal of each pivot (U's diagonal), for a solve that
 * would otherwise compute it again: an evaluation per frequency factors once and solves once.
 */
export interface PivotInverses {
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/**
 * In-place LU with partial pivoting: on return the strict lower triangle holds L (unit
 * diagonal implied), the upper triangle holds U, and row k was exchanged with row piv[k]
 * at step k (so P A = L U with P the product of those exchanges).
 */
export function complexLuFactor(re: Float64Array, im: Float64Array, n: number, piv: Int32Array, inverses?: PivotInverses): void {
  checkSizes(n, re, im, piv);
  if (inverses && (inverses.re.length < n || inverses.im.length < n)) throw new Error("complexLuFactor: inverses must hold n entries");
  for (let k = 0; k < n; k++) {
    const rowK = k * n;
    let p = k;
    let best = Math.abs(re[rowK + k]) + Math.abs(im[rowK + k]);
    for (let i = k + 1; i < n; i++) {
      const m = Math.abs(re[i * n + k]) + Math.abs(im[i * n + k]);
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
        let t = re[rowK + j];
        re[rowK + j] = re[rowP + j];
        re[rowP + j] = t;
        t = im[rowK + j];
        im[rowK + j] = im[rowP + j];
        im[rowP + j] = t;
      }
    }
    // Reciprocal of the pivot, pre-scaled so |re|²+|im|² cannot overflow or underflow.
    const s = 1 / best;
    const pr = re[rowK + k] * s;
    const pi = im[rowK + k] * s;
    const d = s / (pr * pr + pi * pi);
    const invRe = pr * d;
    const invIm = -pi * d;
    if (inverses) {
      inverses.re[k] = invRe;
      inverses.im[k] = invIm;
    }
    for (let i = k + 1; i < n; i++) {
      const rowI = i * n;
      const ar = re[rowI + k];
      const ai = im[rowI + k];
      if (ar === 0 && ai === 0) continue;
      const lr = ar * invRe - ai * invIm;
      const li = ar * invIm + ai * invRe;
      re[rowI + k] = lr;
      im[rowI + k] = li;
      for (let j = k + 1; j < n; j++) {
        const ur = re[rowK + j];
        const ui = im[rowK + j];
        re[rowI + j] -= lr * ur - li * ui;
        im[rowI + j] -= lr * ui + li * ur;
      }
    }
  }
}

/** Solves A X = B in place (B is n×nrhs, row-major) from the factors of complexLuFactor. */
export function complexLuSolve(re: Float64Array, im: Float64Array, n: number, piv: Int32Array, bRe: Float64Array, bIm: Float64Array, nrhs: number): void {
  checkSizes(n, re, im, piv);
  checkRhs(n, nrhs, bRe, bIm);
  // Apply P to B in the order the exchanges were made.
  for (let k = 0; k < n; k++) {
    const p = piv[k];
    if (p !== k) swapRows(bRe, bIm, k, p, nrhs);
  }
  // L y = P b (unit lower triangular), row-oriented so B rows are read contiguously.
  for (let i = 1; i < n; i++) {
    const rowI = i * n;
    const bi = i * nrhs;
    for (let k = 0; k < i; k++) {
      const lr = re[rowI + k];
      const li = im[rowI + k];
      if (lr === 0 && li === 0) continue;
      axpyRow(bRe, bIm, bi, k * nrhs, -lr, -li, nrhs);
    }
  }
  // U x = y.
  for (let i = n - 1; i >= 0; i--) {
    const rowI = i * n;
    const bi = i * nrhs;
    for (let k = i + 1; k < n; k++) {
      const ur = re[rowI + k];
      const ui = im[rowI + k];
      if (ur === 0 && ui === 0) continue;
      axpyRow(bRe, bIm, bi, k * nrhs, -ur, -ui, nrhs);
    }
    scaleRowByInverse(bRe, bIm, bi, re[rowI + i], im[rowI + i], nrhs);
  }
}

/**
 * Solves Aᵀ X = B in place (plain transpose, no conjugation) from the factors of A.
 * Since P A = L U, Aᵀ = Uᵀ Lᵀ P, so: Uᵀ w = b (forward), Lᵀ z = w (backward), x = Pᵀ z.
 * Column-oriented updates keep the reads of U and L along their stored rows.
 */
export function complexLuSolveTransposed(re: Float64Array, im: Float64Array, n: number, piv: Int32Array, bRe: Float64Array, bIm: Float64Array, nrhs: number, inverses?: PivotInverses): void {
  checkSizes(n, re, im, piv);
  checkRhs(n, nrhs, bRe, bIm);
  // Uᵀ w = b: row i of U is column i of Uᵀ.
  for (let i = 0; i < n; i++) {
    const rowI = i * n;
    const bi = i * nrhs;
    if (inverses) scaleRow(bRe, bIm, bi, inverses.re[i], inverses.im[i], nrhs);
    else scaleRowByInverse(bRe, bIm, bi, re[rowI + i], im[rowI + i], nrhs);
    for (let j = i + 1; j < n; j++) {
      const ur = re[rowI + j];
      const ui = im[rowI + j];
      if (ur === 0 && ui === 0) continue;
      axpyRow(bRe, bIm, j * nrhs, bi, -ur, -ui, nrhs);
    }
  }
  // Lᵀ z = w: row i of L (left of the diagonal) is column i of Lᵀ above the diagonal.
  for (let i = n - 1; i > 0; i--) {
    const rowI = i * n;
    const bi = i * nrhs;
    for (let j = 0; j < i; j++) {
      const lr = re[rowI + j];
      const li = im[rowI + j];
      if (lr === 0 && li === 0) continue;
      axpyRow(bRe, bIm, j * nrhs, bi, -lr, -li, nrhs);
    }
  }
  // x = Pᵀ z: undo the exchanges in reverse order.
  for (let k = n - 1; k >= 0; k--) {
    const p = piv[k];
    if (p !== k) swapRows(bRe, bIm, k, p, nrhs);
  }
}

function swapRows(bRe: Float64Array, bIm: Float64Array, a: number, b: number, nrhs: number): void {
  const oa = a * nrhs;
  const ob = b * nrhs;
  for (let c = 0; c < nrhs; c++) {
    let t = bRe[oa + c];
    bRe[oa + c] = bRe[ob + c];
    bRe[ob + c] = t;
    t = bIm[oa + c];
    bIm[oa + c] = bIm[ob + c];
    bIm[ob + c] = t;
  }
}

/** Row at `dst` += (fr + i·fi) · row at `src`. */
function axpyRow(bRe: Float64Array, bIm: Float64Array, dst: number, src: number, fr: number, fi: number, nrhs: number): void {
  for (let c = 0; c < nrhs; c++) {
    const xr = bRe[src + c];
    const xi = bIm[src + c];
    bRe[dst + c] += fr * xr - fi * xi;
    bIm[dst + c] += fr * xi + fi * xr;
  }
}

/** Row at `off` /= (dr + i·di), with the same overflow-safe reciprocal as the factorisation. */
function scaleRowByInverse(bRe: Float64Array, bIm: Float64Array, off: number, dr: number, di: number, nrhs: number): void {
  const s = 1 / (Math.abs(dr) + Math.abs(di));
  const pr = dr * s;
  const pi = di * s;
  const d = s / (pr * pr + pi * pi);
  scaleRow(bRe, bIm, off, pr * d, -pi * d, nrhs);
}

/** Row at `off` *= (ir + i·ii). */
function scaleRow(bRe: Float64Array, bIm: Float64Array, off: number, ir: number, ii: number, nrhs: number): void {
  for (let c = 0; c < nrhs; c++) {
    const xr = bRe[off + c];
    const xi = bIm[off + c];
    bRe[off + c] = xr * ir - xi * ii;
    bIm[off + c] = xr * ii + xi * ir;
  }
}
