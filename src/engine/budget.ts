/**
 * Pass 5 of the pipeline: the signal-referred noise budget of an assembled set-up on a frequency
 * grid, split by independent input group, with the SQL, zero-point and thermal references.
 */
import { QuietframeError } from "../errors";
import { complexLuFactor, complexLuSolve } from "../linalg/complex-lu";
import { SingularMatrixError } from "../linalg/singular-error";
import type { AssembledSetup } from "../setup/assemble";
import type { NoiseCategory, StateSpaceModel } from "../network/model";
import { TransferEvaluator } from "./transfer";

export interface BudgetTerm {
  readonly id: string;
  readonly label: string;
  readonly owner: string;
  readonly category: NoiseCategory;
  /** One-sided PSD in (unit)²/Hz at each frequency. */
  readonly psd: Float64Array;
}

export interface ReferenceSpectrum {
  readonly id: string;
  readonly label: string;
  readonly psd: Float64Array;
}

/** Signal-referred noise of a set-up on a frequency grid, split by independent input group. */
export interface NoiseBudget {
  readonly frequencies: Float64Array;
  /** What the noise is expressed in and the unit of its amplitude (ASD unit = unit/√Hz). */
  readonly quantity: { readonly name: string; readonly unit: string };
  /** Detectors whose outputs are combined (optimally, with frequency-dependent weights). */
  readonly readout: readonly string[];
  /** Total one-sided PSD; equals the sum of the terms. */
  readonly total: Float64Array;
  readonly terms: readonly BudgetTerm[];
  /** SQL, zero-point and thermal references, in the same quantity. */
  readonly references: readonly ReferenceSpectrum[];
  readonly warnings: readonly string[];
}

/**
 * The signal-referred noise budget.
 * One output:   S = Σ_g H_g N_g H_g† / |h|².
 * Several:      w = S_y⁻¹ h, S = 1/(h† S_y⁻¹ h), and group g contributes w† S_g w / (h† S_y⁻¹ h)²,
 * which sums to S exactly because Σ_g S_g = S_y.
 */
export function noiseBudget(assembled: AssembledSetup, frequencies: Float64Array): NoiseBudget {
  const { model, readoutRows, referredTo, signal, setup } = assembled;
  const groups = model.groups;
  const nf = frequencies.length;
  const p = readoutRows.length;
  const total = new Float64Array(nf);
  const termPsd = groups.map(() => new Float64Array(nf));
  const evaluator = new TransferEvaluator(model, readoutRows);
  const spectra = groups.map((g) => new GroupSpectra(model, g.columns, p));
  const referral: SignalReferral = p === 1 ? new SingleOutput() : new OptimalCombination(p);
  // The referral factor (|χ|² for displacement) serves the terms and every reference curve.
  const factors = new Float64Array(nf);
  const nGroups = groups.length;
  let blindPoints = 0;

  for (let f = 0; f < nf; f++) {
    const omega = 2 * Math.PI * frequencies[f];
    const factor = referredTo.psdFactor(omega);
    factors[f] = factor;
    evaluator.at(omega);
    for (let g = 0; g < nGroups; g++) spectra[g].compute(evaluator.hRe, evaluator.hIm);
    let sum = Infinity;
    if (referral.prepare(evaluator.sRe, evaluator.sIm, spectra)) {
      sum = 0;
      for (let g = 0; g < nGroups; g++) {
        const v = referral.referred(spectra[g]) * factor;
        termPsd[g][f] = v;
        sum += v;
      }
    }
    total[f] = sum;
    // No response, or one so weak that the referred noise overflows: reported as blind.
    if (!Number.isFinite(sum)) {
      blindPoints++;
      total[f] = Infinity;
      for (let g = 0; g < nGroups; g++) termPsd[g][f] = Infinity;
    }
  }

  if (blindPoints === nf) {
    throw new QuietframeError({
      path: "readout",
      value: setup.readout,
      problem: `the detector${p > 1 ? "s see" : " sees"} no signal: the ${setup.signal.kind} on '${setup.signal.on}' does not reach ${p > 1 ? "them" : "it"}`,
      allowed: "a readout whose light has interacted with the signal's target (check connections and readout angle)",
    });
  }
  const warnings: string[] = [];
  if (blindPoints > 0) {
    warnings.push(`the readout is blind to the signal at ${blindPoints} of ${nf} frequencies: the referred noise there is infinite or beyond floating-point range`);
  }

  const terms: BudgetTerm[] = [];
  groups.forEach((g, i) => {
    if (!allZero(termPsd[i])) {
      terms.push({ id: g.id, label: g.label, owner: g.owner, category: g.category, psd: termPsd[i] });
    }
  });
  const references = signal.curves.map((curve) => {
    const psd = new Float64Array(nf);
    for (let f = 0; f < nf; f++) psd[f] = curve.psd(2 * Math.PI * frequencies[f]) * factors[f];
    return { id: curve.id, label: curve.label, psd };
  });
  return {
    frequencies,
    quantity: { name: referredTo.name, unit: referredTo.unit },
    readout: setup.readout,
    total,
    terms,
    references,
    warnings,
  };
}

function allZero(xs: Float64Array): boolean {
  for (let i = 0; i < xs.length; i++) if (xs[i] !== 0) return false;
  return true;
}

/**
 * S_g = H_g N_g H_g† for one group (p×p Hermitian), reusing its arrays. The non-zero
 * entries N_ij of the group are listed once, in the order the sum visits them.
 */
class GroupSpectra {
  readonly re: Float64Array;
  readonly im: Float64Array;
  private readonly m: number;
  private readonly ni: Int32Array;
  private readonly nj: Int32Array;
  private readonly nv: Float64Array;
  constructor(
    model: StateSpaceModel,
    columns: readonly number[],
    private readonly p: number,
  ) {
    this.re = new Float64Array(p * p);
    this.im = new Float64Array(p * p);
    const m = model.nInputs;
    this.m = m;
    const ni: number[] = [];
    const nj: number[] = [];
    const nv: number[] = [];
    for (const i of columns) {
      for (const j of columns) {
        const nij = model.N[i * m + j];
        if (nij === 0) continue;
        ni.push(i);
        nj.push(j);
        nv.push(nij);
      }
    }
    this.ni = Int32Array.from(ni);
    this.nj = Int32Array.from(nj);
    this.nv = Float64Array.from(nv);
  }

  compute(hRe: Float64Array, hIm: Float64Array): void {
    const { p, m, re, im, ni, nj, nv } = this;
    const count = nv.length;
    // Every entry is written below (upper triangle and its mirror), so no clearing is needed.
    for (let a = 0; a < p; a++) {
      for (let b = a; b < p; b++) {
        let sr = 0;
        let si = 0;
        for (let e = 0; e < count; e++) {
          const i = ni[e];
          const j = nj[e];
          const nij = nv[e];
          // H[a,i] N_ij conj(H[b,j])
          const ar = hRe[a * m + i];
          const ai = hIm[a * m + i];
          const br = hRe[b * m + j];
          const bi = -hIm[b * m + j];
          sr += nij * (ar * br - ai * bi);
          si += nij * (ar * bi + ai * br);
        }
        re[a * p + b] = sr;
        im[a * p + b] = a === b ? 0 : si;
        re[b * p + a] = sr;
        im[b * p + a] = a === b ? 0 : -si;
      }
    }
  }
}

/** Turns a group's output spectrum into signal-referred noise at one frequency. */
interface SignalReferral {
  /** Takes the signal response and all group spectra; false when the readout is blind to the signal. */
  prepare(hRe: Float64Array, hIm: Float64Array, groups: readonly GroupSpectra[]): boolean;
  referred(group: GroupSpectra): number;
}

/** One output: S_g / |h|². */
class SingleOutput implements SignalReferral {
  private h2 = 0;
  prepare(hRe: Float64Array, hIm: Float64Array): boolean {
    this.h2 = hRe[0] * hRe[0] + hIm[0] * hIm[0];
    return this.h2 !== 0;
  }
  referred(group: GroupSpectra): number {
    return group.re[0] / this.h2;
  }
}

/** Optimal frequency-dependent combination of several outputs: w = S_y⁻¹h, weight w†S_g w/q². */
class OptimalCombination implements SignalReferral {
  private readonly sRe: Float64Array;
  private readonly sIm: Float64Array;
  private readonly wRe: Float64Array;
  private readonly wIm: Float64Array;
  private readonly piv: Int32Array;
  private q = 0;
  constructor(private readonly p: number) {
    this.sRe = new Float64Array(p * p);
    this.sIm = new Float64Array(p * p);
    this.wRe = new Float64Array(p);
    this.wIm = new Float64Array(p);
    this.piv = new Int32Array(p);
  }

  prepare(hRe: Float64Array, hIm: Float64Array, groups: readonly GroupSpectra[]): boolean {
    const { p, sRe, sIm, wRe, wIm } = this;
    sRe.fill(0);
    sIm.fill(0);
    for (const g of groups) {
      for (let i = 0; i < p * p; i++) {
        sRe[i] += g.re[i];
        sIm[i] += g.im[i];
      }
    }
    wRe.set(hRe.subarray(0, p));
    wIm.set(hIm.subarray(0, p));
    if (wRe.every((v) => v === 0) && wIm.every((v) => v === 0)) return false;
    try {
      complexLuFactor(sRe, sIm, p, this.piv);
    } catch (e) {
      if (e instanceof SingularMatrixError) {
        throw new QuietframeError({
          path: "readout",
          problem: "the combined outputs have a singular noise matrix (two detectors see exactly the same noise)",
          allowed: "detectors with independent noise (each homodyne efficiency below 1, or different light)",
        });
      }
      throw e;
    }
    complexLuSolve(sRe, sIm, p, this.piv, wRe, wIm, 1);
    let q = 0;
    for (let k = 0; k < p; k++) q += hRe[k] * wRe[k] + hIm[k] * wIm[k];
    this.q = q;
    return q !== 0;
  }

  /** Re(w† S_g w) / q². */
  referred(group: GroupSpectra): number {
    const { p, wRe, wIm } = this;
    let sum = 0;
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        // conj(w_a) M_ab w_b
        const mr = group.re[a * p + b];
        const mi = group.im[a * p + b];
        const xr = mr * wRe[b] - mi * wIm[b];
        const xi = mr * wIm[b] + mi * wRe[b];
        sum += wRe[a] * xr + wIm[a] * xi;
      }
    }
    return sum / (this.q * this.q);
  }
}
