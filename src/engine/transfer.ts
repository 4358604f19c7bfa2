import { complexLuFactor, complexLuSolveTransposed, type PivotInverses } from "../linalg/complex-lu";
import { SingularMatrixError } from "../linalg/singular-error";
import type { StateSpaceModel } from "../network/model";
import { giveBackArrays, takeFloats, takeInts } from "./lent-memory";

/** M = −iΩ I − A is singular at this angular frequency: an undamped mode exactly there. */
export function undampedModeError(omega: number): Error {
  return new Error(`the set-up has an undamped mode exactly at ${omega / (2 * Math.PI)} Hz; its response is infinite there`);
}

/**
 * Evaluates, at one angular frequency at a time, the transfer from every input and from
 * the signal to the chosen output rows:
 *   H(Ω) = C_r (−iΩ I − A)^{-1} B + D_r,   h(Ω) = C_r (−iΩ I − A)^{-1} b_s + d_s.
 * It solves (−iΩ I − A)ᵀ Gᵀ = C_rᵀ (a few right-hand sides) instead of inverting,
 * and keeps all work arrays between calls. Everything that does not depend on Ω (−A, C_rᵀ,
 * the non-zero entries of B and b_s) is laid out once in the constructor, so a frequency
 * costs the factorisation, the solve and the products over non-zero entries only. The
 * factorisation and the solve are those of linalg/complex-lu.ts, operation for operation,
 * written out here so that each pivot's reciprocal is computed once for both.
 */
export class TransferEvaluator {
  readonly rows: readonly number[];
  /** Row-major p×m real and imaginary parts of H after `at`. */
  readonly hRe: Float64Array;
  readonly hIm: Float64Array;
  /** Length-p signal response after `at`. */
  readonly sRe: Float64Array;
  readonly sIm: Float64Array;

  private readonly n: number;
  private readonly m: number;
  private readonly p: number;
  /** The Ω-independent parts (layOutFixedParts). */
  private readonly fixed: FixedParts;
  private readonly mRe: Float64Array;
  private readonly mIm: Float64Array;
  private readonly piv: Int32Array;
  /** Reciprocals of the pivots, kept by the factorisation for the solve. */
  private readonly inverses: PivotInverses;
  /** The lent arrays every array above is a view of. */
  private readonly floats: Float64Array;
  private readonly ints: Int32Array;
  /** G = C_r (−iΩ I − A)⁻¹ after `at`, stored transposed (n×p: G[k, j] at j·p + k). */
  readonly gRe: Float64Array;
  readonly gIm: Float64Array;

  constructor(model: StateSpaceModel, rows: readonly number[]) {
    const n = model.nStates;
    const m = model.nInputs;
    const p = rows.length;
    this.rows = rows;
    this.n = n;
    this.m = m;
    this.p = p;
    this.fixed = layOutFixedParts(model, rows);
    // Every array is a view of one lent array (lent-memory.ts), given back by `release`.
    this.floats = takeFloats(2 * p * m + 2 * p + 2 * n * n + 2 * n + 2 * n * p);
    this.ints = takeInts(n);
    let at = 0;
    const next = (length: number): Float64Array => this.floats.subarray(at, (at += length));
    this.hRe = next(p * m);
    this.hIm = next(p * m);
    this.sRe = next(p);
    this.sIm = next(p);
    this.mRe = next(n * n);
    this.mIm = next(n * n);
    this.inverses = { re: next(n), im: next(n) };
    this.gRe = next(n * p);
    this.gIm = next(n * p);
    this.piv = this.ints.subarray(0, n);
  }

  /** Gives the evaluator's memory to the next solver made; this one is not used after. */
  release(): void {
    giveBackArrays(this.floats, this.ints);
    giveBackArrays(this.fixed.floats, this.fixed.ints);
  }

  /**
   * One mode (n = 2, the commonest set-up): G = C_r M⁻¹ with M⁻¹ = adj(M)/det(M), which
   * keeps the exact zeros of M and C_r as LU does. Returns false (and the LU path is
   * taken, which reports a singular matrix or copes with extreme scales) when det(M) is zero
   * or not finite.
   */
  private oneMode(omega: number): boolean {
    const { p, gRe, gIm } = this;
    const { negA, cT } = this.fixed;
    // M = −iΩ I − A
    const m00r = negA[0];
    const m01r = negA[1];
    const m10r = negA[2];
    const m11r = negA[3];
    const mi = -omega;
    // det = m00 m11 − m01 m10 (the off-diagonal entries are real)
    const dr = m00r * m11r - mi * mi - m01r * m10r;
    const di = m00r * mi + mi * m11r;
    const scale = Math.abs(dr) + Math.abs(di);
    if (!(scale > 0) || !Number.isFinite(scale)) return false;
    // Reciprocal of det, pre-scaled as in the LU so |det|² cannot overflow or underflow.
    const s = 1 / scale;
    const pr = dr * s;
    const pi = di * s;
    const d = s / (pr * pr + pi * pi);
    const ir = pr * d;
    const ii = -pi * d;
    for (let k = 0; k < p; k++) {
      const c0 = cT[k];
      const c1 = cT[p + k];
      // [g0, g1] = [c0, c1] adj(M) / det, adj(M) = [[m11, −m01], [−m10, m00]]
      const ar = c0 * m11r - c1 * m10r;
      const ai = c0 * mi;
      const br = c1 * m00r - c0 * m01r;
      const bi = c1 * mi;
      gRe[k] = ar * ir - ai * ii;
      gIm[k] = ar * ii + ai * ir;
      gRe[p + k] = br * ir - bi * ii;
      gIm[p + k] = br * ii + bi * ir;
    }
    return true;
  }

  /** M = −iΩ I − A factorised in place as P M = L U, keeping the pivots' reciprocals for the solve. */
  private factor(omega: number): void {
    const { n, mRe: re, mIm: im, piv } = this;
    const { negA } = this.fixed;
    // Plain loops: for the few entries of a small model they beat set/fill calls.
    for (let i = 0; i < n * n; i++) {
      re[i] = negA[i];
      im[i] = 0;
    }
    for (let i = 0; i < n; i++) im[i * n + i] = -omega;
    try {
      complexLuFactor(re, im, n, piv, this.inverses);
    } catch (e) {
      if (e instanceof SingularMatrixError) throw undampedModeError(omega);
      throw e;
    }
  }

  /** Gᵀ (n×p) from Mᵀ Gᵀ = C_rᵀ with the factors of `factor`. */
  private solveTransposed(): void {
    const { n, p, mRe, mIm, piv, gRe, gIm } = this;
    const { cT } = this.fixed;
    for (let i = 0; i < n * p; i++) {
      gRe[i] = cT[i];
      gIm[i] = 0;
    }
    complexLuSolveTransposed(mRe, mIm, n, piv, gRe, gIm, p, this.inverses);
  }

  /** Fills hRe/hIm/sRe/sIm for angular frequency omega (rad/s). */
  at(omega: number): void {
    const { n, m, p } = this;
    if (n === 2 && this.oneMode(omega)) {
      // G came from the closed-form inverse of a 2×2 matrix.
    } else if (n > 0) {
      this.factor(omega);
      this.solveTransposed();
    }
    const { gRe, gIm, hRe, hIm, sRe, sIm } = this;
    const { dRows, bStart, bRow, bVal, sRow, sVal } = this.fixed;
    for (let k = 0; k < p; k++) {
      for (let c = 0; c < m; c++) {
        let re = dRows[k * m + c];
        let im = 0;
        for (let e = bStart[c]; e < bStart[c + 1]; e++) {
          const j = bRow[e];
          const b = bVal[e];
          re += gRe[j * p + k] * b;
          im += gIm[j * p + k] * b;
        }
        hRe[k * m + c] = re;
        hIm[k * m + c] = im;
      }
      let re = this.fixed.sD[k];
      let im = 0;
      for (let e = 0; e < sRow.length; e++) {
        const j = sRow[e];
        const b = sVal[e];
        re += gRe[j * p + k] * b;
        im += gIm[j * p + k] * b;
      }
      sRe[k] = re;
      sIm[k] = im;
    }
  }
}

/** The Ω-independent parts of a transfer solve, laid out once per model. */
export interface FixedParts {
  /** −A (n×n, row-major): the matrix −iΩ I − A is this with −Ω on the diagonal's imaginary part. */
  readonly negA: Float64Array;
  /** C_rᵀ (n×p), the right-hand side of every solve. */
  readonly cT: Float64Array;
  readonly dRows: Float64Array;
  readonly sD: Float64Array;
  /** Non-zero entries of B by column (compressed columns): state index and value. */
  readonly bStart: Int32Array;
  readonly bRow: Int32Array;
  readonly bVal: Float64Array;
  /** Non-zero entries of the signal's column b_s. */
  readonly sRow: Int32Array;
  readonly sVal: Float64Array;
  /** The lent arrays the parts are views of, given back with giveBackArrays. */
  readonly floats: Float64Array;
  readonly ints: Int32Array;
}

/** Lays out the Ω-independent parts of `model` for the output `rows`, in lent memory (lent-memory.ts). */
export function layOutFixedParts(model: StateSpaceModel, rows: readonly number[]): FixedParts {
  const n = model.nStates;
  const m = model.nInputs;
  const p = rows.length;
  // The non-zero entries are counted first, so every part is a view of two lent arrays.
  let nonZeroB = 0;
  for (let i = 0; i < n * m; i++) if (model.B[i] !== 0) nonZeroB++;
  let nonZeroS = 0;
  for (let j = 0; j < n; j++) if (model.signalB[j] !== 0) nonZeroS++;
  const floats = takeFloats(n * n + n * p + p * m + p + nonZeroB + nonZeroS);
  const ints = takeInts(m + 1 + nonZeroB + nonZeroS);
  let atFloat = 0;
  let atInt = 0;
  const nextFloats = (length: number): Float64Array => floats.subarray(atFloat, (atFloat += length));
  const nextInts = (length: number): Int32Array => ints.subarray(atInt, (atInt += length));
  const negA = nextFloats(n * n);
  for (let i = 0; i < n * n; i++) negA[i] = -model.A[i];
  const cT = nextFloats(n * p);
  const dRows = nextFloats(p * m);
  const sD = nextFloats(p);
  for (let k = 0; k < p; k++) {
    const row = rows[k];
    for (let j = 0; j < n; j++) cT[j * p + k] = model.C[row * n + j];
    for (let c = 0; c < m; c++) dRows[k * m + c] = model.D[row * m + c];
    sD[k] = model.signalD[row];
  }
  const bStart = nextInts(m + 1);
  const bRow = nextInts(nonZeroB);
  const bVal = nextFloats(nonZeroB);
  let e = 0;
  bStart[0] = 0;
  for (let c = 0; c < m; c++) {
    for (let j = 0; j < n; j++) {
      const b = model.B[j * m + c];
      if (b === 0) continue;
      bRow[e] = j;
      bVal[e++] = b;
    }
    bStart[c + 1] = e;
  }
  const sRow = nextInts(nonZeroS);
  const sVal = nextFloats(nonZeroS);
  e = 0;
  for (let j = 0; j < n; j++) {
    if (model.signalB[j] === 0) continue;
    sRow[e] = j;
    sVal[e++] = model.signalB[j];
  }
  return { negA, cT, dRows, sD, bStart, bRow, bVal, sRow, sVal, floats, ints };
}
