import { QuietframeError } from "../errors";
import { complexLuFactor, complexLuSolve, SingularMatrixError } from "../linalg";
import type { AssembledSetup } from "../network/assemble";
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
  const groupMatrix = new GroupSpectra(model, p);
  const combiner = p > 1 ? new OptimalCombiner(p) : undefined;
  let blindPoints = 0;
  // A response so weak that the referred noise overflows is reported like no response at all.
  const markBlind = (f: number): void => {
    blindPoints++;
    total[f] = Infinity;
    for (const t of termPsd) t[f] = Infinity;
  };

  for (let f = 0; f < nf; f++) {
    const omega = 2 * Math.PI * frequencies[f];
    evaluator.at(omega);
    const factor = referredTo.psdFactor(omega);
    if (p === 1) {
      const h2 = evaluator.sRe[0] ** 2 + evaluator.sIm[0] ** 2;
      if (h2 === 0) {
        markBlind(f);
        continue;
      }
      let sum = 0;
      for (let g = 0; g < groups.length; g++) {
        groupMatrix.compute(groups[g].columns, evaluator.hRe, evaluator.hIm);
        const v = (groupMatrix.re[0] / h2) * factor;
        termPsd[g][f] = v;
        sum += v;
      }
      total[f] = sum;
      if (!Number.isFinite(sum)) markBlind(f);
    } else {
      const c = combiner!;
      c.reset();
      for (let g = 0; g < groups.length; g++) {
        groupMatrix.compute(groups[g].columns, evaluator.hRe, evaluator.hIm);
        c.accumulate(groupMatrix.re, groupMatrix.im);
      }
      const q = c.solve(evaluator.sRe, evaluator.sIm);
      if (q === 0) {
        markBlind(f);
        continue;
      }
      let sum = 0;
      for (let g = 0; g < groups.length; g++) {
        groupMatrix.compute(groups[g].columns, evaluator.hRe, evaluator.hIm);
        const v = (c.quadraticForm(groupMatrix.re, groupMatrix.im) / (q * q)) * factor;
        termPsd[g][f] = v;
        sum += v;
      }
      total[f] = sum;
      if (!Number.isFinite(sum)) markBlind(f);
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
    if (termPsd[i].some((v) => v !== 0)) {
      terms.push({ id: g.id, label: g.label, owner: g.owner, category: g.category, psd: termPsd[i] });
    }
  });
  const references = signal.curves.map((curve) => {
    const psd = new Float64Array(nf);
    for (let f = 0; f < nf; f++) {
      const omega = 2 * Math.PI * frequencies[f];
      psd[f] = curve.psd(omega) * referredTo.psdFactor(omega);
    }
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

/** S_g = H_g N_g H_g† for one group (p×p Hermitian), reusing its arrays. */
class GroupSpectra {
  readonly re: Float64Array;
  readonly im: Float64Array;
  constructor(
    private readonly model: StateSpaceModel,
    private readonly p: number,
  ) {
    this.re = new Float64Array(p * p);
    this.im = new Float64Array(p * p);
  }

  compute(columns: readonly number[], hRe: Float64Array, hIm: Float64Array): void {
    const { p, re, im } = this;
    const m = this.model.nInputs;
    const N = this.model.N;
    re.fill(0);
    im.fill(0);
    for (let a = 0; a < p; a++) {
      for (let b = a; b < p; b++) {
        let sr = 0;
        let si = 0;
        for (const i of columns) {
          const ar = hRe[a * m + i];
          const ai = hIm[a * m + i];
          for (const j of columns) {
            const nij = N[i * m + j];
            if (nij === 0) continue;
            // H[a,i] N_ij conj(H[b,j])
            const br = hRe[b * m + j];
            const bi = -hIm[b * m + j];
            sr += nij * (ar * br - ai * bi);
            si += nij * (ar * bi + ai * br);
          }
        }
        re[a * p + b] = sr;
        im[a * p + b] = a === b ? 0 : si;
        re[b * p + a] = sr;
        im[b * p + a] = a === b ? 0 : -si;
      }
    }
  }
}

/** Optimal frequency-dependent combination of several outputs. */
class OptimalCombiner {
  private readonly sRe: Float64Array;
  private readonly sIm: Float64Array;
  private readonly wRe: Float64Array;
  private readonly wIm: Float64Array;
  private readonly piv: Int32Array;
  constructor(private readonly p: number) {
    this.sRe = new Float64Array(p * p);
    this.sIm = new Float64Array(p * p);
    this.wRe = new Float64Array(p);
    this.wIm = new Float64Array(p);
    this.piv = new Int32Array(p);
  }

  reset(): void {
    this.sRe.fill(0);
    this.sIm.fill(0);
  }

  accumulate(re: Float64Array, im: Float64Array): void {
    for (let i = 0; i < re.length; i++) {
      this.sRe[i] += re[i];
      this.sIm[i] += im[i];
    }
  }

  /** Solves S_y w = h and returns q = h† S_y⁻¹ h (real, ≥ 0). */
  solve(hRe: Float64Array, hIm: Float64Array): number {
    const { p, wRe, wIm } = this;
    wRe.set(hRe.subarray(0, p));
    wIm.set(hIm.subarray(0, p));
    if (wRe.every((v) => v === 0) && wIm.every((v) => v === 0)) return 0;
    try {
      complexLuFactor(this.sRe, this.sIm, p, this.piv);
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
    complexLuSolve(this.sRe, this.sIm, p, this.piv, wRe, wIm, 1);
    let q = 0;
    for (let k = 0; k < p; k++) q += hRe[k] * wRe[k] + hIm[k] * wIm[k];
    return q;
  }

  /** Re(w† M w) for a Hermitian M. */
  quadraticForm(re: Float64Array, im: Float64Array): number {
    const { p, wRe, wIm } = this;
    let sum = 0;
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        // conj(w_a) M_ab w_b
        const mr = re[a * p + b];
        const mi = im[a * p + b];
        const xr = mr * wRe[b] - mi * wIm[b];
        const xi = mr * wIm[b] + mi * wRe[b];
        sum += wRe[a] * xr + wIm[a] * xi;
      }
    }
    return sum;
  }
}
