/**
 * The transfer functions of TransferEvaluator for a block of frequencies at once: the same
 * factorisation, solve and products, operation for operation and so bit for bit, with the
 * frequency as the innermost loop. Each matrix entry holds its values at every frequency of the
 * block side by side (entry e, frequency f at e·B + f), so the loops run long and without calls
 * instead of over the few entries of a small model; pivoting stays per frequency. A one-mode
 * model keeps TransferEvaluator's closed-form 2×2 inverse, one frequency at a time; four states
 * read by one output (every example) go through the written-out kernel of transfer-four.ts.
 */
import type { StateSpaceModel } from "../network/model";
import { type FixedParts, layOutFixedParts, TransferEvaluator, undampedModeError } from "./transfer";
import { giveBackArrays, takeFloats, takeInts } from "./lent-memory";
import { solveFourStates } from "./transfer-four";

/** Frequencies per block: long enough for the loops, short enough that a large model's block stays in cache. */
export const TRANSFER_BLOCK = 64;

const NO_FLOATS = new Float64Array(0);
const NO_INTS = new Int32Array(0);

export class TransferBlock {
  /** H after `solve`: input c of output k at frequency f of the block at (k·m + c)·B + f. */
  readonly hRe: Float64Array;
  readonly hIm: Float64Array;
  /** The signal's response of output k at frequency f at k·B + f. */
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
  private readonly invRe: Float64Array;
  private readonly invIm: Float64Array;
  private readonly gRe: Float64Array;
  private readonly gIm: Float64Array;
  /** Per frequency: whether the current row is eliminated at this step (its entry below the pivot is not zero). */
  private readonly eliminate: Int32Array;
  /** The size of each frequency's pivot candidate (|re| + |im|) during the search. */
  private readonly best: Float64Array;
  /** Arrays of one value per frequency of the block, for the caller's own sums. */
  readonly work: readonly Float64Array[];
  private readonly floats: Float64Array;
  private readonly ints: Int32Array;
  /** The one-frequency evaluator of one-mode models. */
  private readonly single?: TransferEvaluator;
  /** Four states and one output: solved by solveFourStates, without the arrays of the LU below. */
  private readonly four: boolean;

  constructor(
    model: StateSpaceModel,
    rows: readonly number[],
    private readonly size: number = TRANSFER_BLOCK,
    workArrays = 0,
  ) {
    const n = model.nStates;
    const m = model.nInputs;
    const p = rows.length;
    const B = size;
    this.n = n;
    this.m = m;
    this.p = p;
    this.four = n === 4 && p === 1;
    const lu = n === 2 || this.four ? 0 : n;
    // Every per-frequency array is a view of one lent array (lent-memory.ts), given back by `release`.
    this.floats = takeFloats(B * (2 * p * m + 2 * p + 2 * lu * lu + 3 * lu + 2 * n * p + workArrays));
    this.ints = lu === 0 ? NO_INTS : takeInts(B * (lu + 1));
    let at = 0;
    // The LU's arrays are empty where it is not used: one shared empty array, not a view each.
    const next = (length: number): Float64Array => (length === 0 ? NO_FLOATS : this.floats.subarray(at, (at += length)));
    this.hRe = next(p * m * B);
    this.hIm = next(p * m * B);
    this.sRe = next(p * B);
    this.sIm = next(p * B);
    this.mRe = next(lu * lu * B);
    this.mIm = next(lu * lu * B);
    this.invRe = next(lu * B);
    this.invIm = next(lu * B);
    this.best = next(lu === 0 ? 0 : B);
    this.gRe = next(n * p * B);
    this.gIm = next(n * p * B);
    this.work = Array.from({ length: workArrays }, () => next(B));
    this.piv = lu === 0 ? NO_INTS : this.ints.subarray(0, lu * B);
    this.eliminate = lu === 0 ? NO_INTS : this.ints.subarray(lu * B, (lu + 1) * B);
    // The Ω-independent parts, laid out as TransferEvaluator lays them out.
    this.fixed = layOutFixedParts(model, rows);
    if (n === 2) this.single = new TransferEvaluator(model, rows);
  }

  /** Gives the block's memory to the next solver made; this one is not used after. */
  release(): void {
    giveBackArrays(this.floats, this.ints);
    giveBackArrays(this.fixed.floats, this.fixed.ints);
    this.single?.release();
  }

  /**
   * Fills hRe/hIm/sRe/sIm for the angular frequencies omegas[from … from + count − 1] (count ≤
   * the block size). Throws where TransferEvaluator.at throws: at the first of them where
   * M = −iΩ I − A is singular (an undamped mode exactly there).
   */
  solve(omegas: Float64Array, from: number, count: number): void {
    if (count > this.size) throw new Error(`TransferBlock: ${count} frequencies exceed the block of ${this.size}`);
    const { single } = this;
    if (single) {
      this.solveOneAtATime(single, omegas, from, count);
      return;
    }
    if (this.four) {
      const good = solveFourStates(this.fixed.negA, this.fixed.cT, omegas, from, count, this.gRe, this.gIm, this.size);
      if (good < count) throw undampedModeError(omegas[from + good]);
    } else if (this.n > 0) {
      const good = this.factor(omegas, from, count);
      if (good < count) throw undampedModeError(omegas[from + good]);
      this.solveTransposed(count);
    }
    this.products(count);
  }

  /** One-mode models: TransferEvaluator frequency by frequency (its closed form, or its LU when that fails). */
  private solveOneAtATime(single: TransferEvaluator, omegas: Float64Array, from: number, count: number): void {
    const { m, p, size: B, hRe, hIm, sRe, sIm } = this;
    for (let f = 0; f < count; f++) {
      single.at(omegas[from + f]);
      for (let i = 0; i < p * m; i++) {
        hRe[i * B + f] = single.hRe[i];
        hIm[i * B + f] = single.hIm[i];
      }
      for (let k = 0; k < p; k++) {
        sRe[k * B + f] = single.sRe[k];
        sIm[k * B + f] = single.sIm[k];
      }
    }
  }

  /**
   * P M = L U of M = −iΩ I − A at every frequency, as complexLuFactor does it for one (the same
   * pivot choice, reciprocals and updates, so the same bits). Returns the number of leading
   * frequencies factorised: the first whose pivot is zero or not finite ends the block.
   */
  private factor(omegas: Float64Array, from: number, count: number): number {
    const { n, size: B, mRe: re, mIm: im, piv, invRe, invIm, eliminate, best } = this;
    const { negA } = this.fixed;
    for (let e = 0; e < n * n; e++) {
      const o = e * B;
      re.fill(negA[e], o, o + count);
      im.fill(0, o, o + count);
    }
    for (let i = 0; i < n; i++) {
      const o = (i * n + i) * B;
      for (let f = 0; f < count; f++) im[o + f] = -omegas[from + f];
    }
    let good = count;
    for (let k = 0; k < n; k++) {
      const kk = (k * n + k) * B;
      const kB = k * B;
      // The pivot search of each frequency, row by row over all of them: the diagonal first,
      // then each row below in order, as the one-frequency search visits them.
      for (let f = 0; f < good; f++) {
        best[f] = Math.abs(re[kk + f]) + Math.abs(im[kk + f]);
        piv[kB + f] = k;
      }
      for (let i = k + 1; i < n; i++) {
        const ik = (i * n + k) * B;
        for (let f = 0; f < good; f++) {
          const size = Math.abs(re[ik + f]) + Math.abs(im[ik + f]);
          const b = best[f];
          // A NaN candidate is taken as pivot so it is reported rather than skipped.
          if (size > b || (size !== size && b === b)) {
            best[f] = size;
            piv[kB + f] = i;
          }
        }
      }
      for (let f = 0; f < good; f++) {
        if (best[f] === 0 || !Number.isFinite(best[f])) {
          good = f;
          break;
        }
      }
      for (let f = 0; f < good; f++) {
        const pivot = piv[kB + f];
        if (pivot === k) continue;
        for (let j = 0; j < n; j++) {
          const a = (k * n + j) * B + f;
          const b = (pivot * n + j) * B + f;
          let t = re[a];
          re[a] = re[b];
          re[b] = t;
          t = im[a];
          im[a] = im[b];
          im[b] = t;
        }
      }
      for (let f = 0; f < good; f++) {
        // Reciprocal of the pivot, pre-scaled so |re|²+|im|² cannot overflow or underflow.
        const s = 1 / best[f];
        const pr = re[kk + f] * s;
        const pi = im[kk + f] * s;
        const d = s / (pr * pr + pi * pi);
        invRe[kB + f] = pr * d;
        invIm[kB + f] = -pi * d;
      }
      for (let i = k + 1; i < n; i++) {
        const ik = (i * n + k) * B;
        // A row with nothing below the pivot at any frequency of the block (a structural zero of A) is left as it is.
        let any = false;
        for (let f = 0; f < good; f++) {
          const ar = re[ik + f];
          const ai = im[ik + f];
          if (ar === 0 && ai === 0) {
            eliminate[f] = 0;
            continue;
          }
          any = true;
          eliminate[f] = 1;
          const ir = invRe[k * B + f];
          const ii = invIm[k * B + f];
          re[ik + f] = ar * ir - ai * ii;
          im[ik + f] = ar * ii + ai * ir;
        }
        if (!any) continue;
        for (let j = k + 1; j < n; j++) {
          const ij = (i * n + j) * B;
          const kj = (k * n + j) * B;
          for (let f = 0; f < good; f++) {
            if (eliminate[f] === 0) continue;
            const lr = re[ik + f];
            const li = im[ik + f];
            const ur = re[kj + f];
            const ui = im[kj + f];
            re[ij + f] -= lr * ur - li * ui;
            im[ij + f] -= lr * ui + li * ur;
          }
        }
      }
    }
    return good;
  }

  /** Gᵀ from Mᵀ Gᵀ = C_rᵀ at every frequency, as complexLuSolveTransposed does it with the kept reciprocals. */
  private solveTransposed(count: number): void {
    const { n, p, size: B, piv, invRe, invIm, gRe, gIm } = this;
    const { cT } = this.fixed;
    for (let r = 0; r < n * p; r++) {
      const c = cT[r];
      const o = r * B;
      for (let f = 0; f < count; f++) {
        gRe[o + f] = c;
        gIm[o + f] = 0;
      }
    }
    // Uᵀ w = b: row i of U is column i of Uᵀ.
    for (let i = 0; i < n; i++) {
      for (let c = 0; c < p; c++) {
        const o = (i * p + c) * B;
        for (let f = 0; f < count; f++) {
          const ir = invRe[i * B + f];
          const ii = invIm[i * B + f];
          const xr = gRe[o + f];
          const xi = gIm[o + f];
          gRe[o + f] = xr * ir - xi * ii;
          gIm[o + f] = xr * ii + xi * ir;
        }
      }
      for (let j = i + 1; j < n; j++) this.subtractRow((i * n + j) * B, j, i, count);
    }
    // Lᵀ z = w: row i of L (left of the diagonal) is column i of Lᵀ above the diagonal.
    for (let i = n - 1; i > 0; i--) {
      for (let j = 0; j < i; j++) this.subtractRow((i * n + j) * B, j, i, count);
    }
    // x = Pᵀ z: the exchanges undone in reverse order.
    for (let k = n - 1; k >= 0; k--) {
      for (let f = 0; f < count; f++) {
        const q = piv[k * B + f];
        if (q === k) continue;
        for (let c = 0; c < p; c++) {
          const a = (k * p + c) * B + f;
          const b = (q * p + c) * B + f;
          let t = gRe[a];
          gRe[a] = gRe[b];
          gRe[b] = t;
          t = gIm[a];
          gIm[a] = gIm[b];
          gIm[b] = t;
        }
      }
    }
  }

  /** Row dst of G += −(factor at entry offset o) · row src, where the factor is not zero (axpyRow of the solve). */
  private subtractRow(o: number, dst: number, src: number, count: number): void {
    const { p, size: B, mRe: re, mIm: im, gRe, gIm } = this;
    for (let c = 0; c < p; c++) {
      const d = (dst * p + c) * B;
      const s = (src * p + c) * B;
      for (let f = 0; f < count; f++) {
        const ur = re[o + f];
        const ui = im[o + f];
        if (ur === 0 && ui === 0) continue;
        const fr = -ur;
        const fi = -ui;
        const xr = gRe[s + f];
        const xi = gIm[s + f];
        gRe[d + f] += fr * xr - fi * xi;
        gIm[d + f] += fr * xi + fi * xr;
      }
    }
  }

  /** H = G B + D and h = G b_s + d_s over the non-zero entries of B and b_s, in TransferEvaluator's order. */
  private products(count: number): void {
    const { m, p, size: B, gRe, gIm, hRe, hIm, sRe, sIm } = this;
    const { dRows, bStart, bRow, bVal, sRow, sVal, sD } = this.fixed;
    for (let k = 0; k < p; k++) {
      for (let c = 0; c < m; c++) {
        const o = (k * m + c) * B;
        const d = dRows[k * m + c];
        if (bStart[c + 1] === bStart[c] + 1) {
          // One entry (the commonest column): the sums started and taken in one pass, d + g b and 0 + g b.
          const g = (bRow[bStart[c]] * p + k) * B;
          const b = bVal[bStart[c]];
          for (let f = 0; f < count; f++) {
            hRe[o + f] = d + gRe[g + f] * b;
            hIm[o + f] = 0 + gIm[g + f] * b;
          }
          continue;
        }
        for (let f = 0; f < count; f++) {
          hRe[o + f] = d;
          hIm[o + f] = 0;
        }
        for (let e = bStart[c]; e < bStart[c + 1]; e++) {
          const g = (bRow[e] * p + k) * B;
          const b = bVal[e];
          for (let f = 0; f < count; f++) {
            hRe[o + f] += gRe[g + f] * b;
            hIm[o + f] += gIm[g + f] * b;
          }
        }
      }
      const o = k * B;
      for (let f = 0; f < count; f++) {
        sRe[o + f] = sD[k];
        sIm[o + f] = 0;
      }
      for (let e = 0; e < sRow.length; e++) {
        const g = (sRow[e] * p + k) * B;
        const b = sVal[e];
        for (let f = 0; f < count; f++) {
          sRe[o + f] += gRe[g + f] * b;
          sIm[o + f] += gIm[g + f] * b;
        }
      }
    }
  }
}
