import { complexLuFactor, complexLuSolveTransposed, SingularMatrixError } from "../linalg";
import type { StateSpaceModel } from "../network/model";

/**
 * Evaluates, at one angular frequency at a time, the transfer from every input and from
 * the signal to the chosen output rows:
 *   H(Ω) = C_r (−iΩ I − A)^{-1} B + D_r,   h(Ω) = C_r (−iΩ I − A)^{-1} b_s + d_s.
 * It solves (−iΩ I − A)ᵀ Gᵀ = C_rᵀ (a few right-hand sides) instead of inverting,
 * and keeps all work arrays between calls.
 */
export class TransferEvaluator {
  readonly rows: readonly number[];
  /** Row-major p×m real and imaginary parts of H after `at`. */
  readonly hRe: Float64Array;
  readonly hIm: Float64Array;
  /** Length-p signal response after `at`. */
  readonly sRe: Float64Array;
  readonly sIm: Float64Array;

  private readonly mRe: Float64Array;
  private readonly mIm: Float64Array;
  private readonly piv: Int32Array;
  private readonly gRe: Float64Array;
  private readonly gIm: Float64Array;

  constructor(
    private readonly model: StateSpaceModel,
    rows: readonly number[],
  ) {
    const n = model.nStates;
    const p = rows.length;
    this.rows = rows;
    this.hRe = new Float64Array(p * model.nInputs);
    this.hIm = new Float64Array(p * model.nInputs);
    this.sRe = new Float64Array(p);
    this.sIm = new Float64Array(p);
    this.mRe = new Float64Array(n * n);
    this.mIm = new Float64Array(n * n);
    this.piv = new Int32Array(n);
    this.gRe = new Float64Array(n * p);
    this.gIm = new Float64Array(n * p);
  }

  /** Fills hRe/hIm/sRe/sIm for angular frequency omega (rad/s). */
  at(omega: number): void {
    const { model, rows, mRe, mIm, gRe, gIm } = this;
    const n = model.nStates;
    const m = model.nInputs;
    const p = rows.length;
    for (let i = 0; i < n * n; i++) {
      mRe[i] = -model.A[i];
      mIm[i] = 0;
    }
    for (let i = 0; i < n; i++) mIm[i * n + i] = -omega;
    if (n > 0) {
      try {
        complexLuFactor(mRe, mIm, n, this.piv);
      } catch (e) {
        if (e instanceof SingularMatrixError) {
          throw new Error(`the set-up has an undamped mode exactly at ${omega / (2 * Math.PI)} Hz; its response is infinite there`);
        }
        throw e;
      }
      // Gᵀ (n×p) = solution of Mᵀ Gᵀ = C_rᵀ
      for (let k = 0; k < p; k++) {
        const row = rows[k];
        for (let j = 0; j < n; j++) {
          gRe[j * p + k] = model.C[row * n + j];
          gIm[j * p + k] = 0;
        }
      }
      complexLuSolveTransposed(mRe, mIm, n, this.piv, gRe, gIm, p);
    }
    const { hRe, hIm, sRe, sIm } = this;
    for (let k = 0; k < p; k++) {
      const row = rows[k];
      for (let c = 0; c < m; c++) {
        let re = model.D[row * m + c];
        let im = 0;
        for (let j = 0; j < n; j++) {
          const b = model.B[j * m + c];
          if (b === 0) continue;
          re += gRe[j * p + k] * b;
          im += gIm[j * p + k] * b;
        }
        hRe[k * m + c] = re;
        hIm[k * m + c] = im;
      }
      let re = model.signalD[row];
      let im = 0;
      for (let j = 0; j < n; j++) {
        const b = model.signalB[j];
        if (b === 0) continue;
        re += gRe[j * p + k] * b;
        im += gIm[j * p + k] * b;
      }
      sRe[k] = re;
      sIm[k] = im;
    }
  }
}
