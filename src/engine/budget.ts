/**
 * Pass 5 of the pipeline: the signal-referred noise budget of an assembled set-up on a frequency
 * grid, split by independent input group, with the SQL, zero-point and thermal references.
 */
import { QuietframeError } from "../errors";
import { complexLuFactor, complexLuSolve } from "../linalg/complex-lu";
import { SingularMatrixError } from "../linalg/singular-error";
import type { AssembledSetup } from "../setup/assemble";
import type { NoiseCategory, NoiseGroup, StateSpaceModel } from "../network/model";
import type { ReferenceCurve } from "../components/types";
import { TransferEvaluator } from "./transfer";
import { TRANSFER_BLOCK, TransferBlock } from "./transfer-block";

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
  /** Total one-sided PSD; equals the sum of the terms. It and the terms' PSDs are views of one buffer. */
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
  return noiseBudgets(assembled, [frequencies])[0];
}

/**
 * The budgets of one set-up on several lists of frequencies, solved in one pass over all of them
 * (a figure at its own frequency beside a curve: one set-up of the solvers instead of two). Each
 * is the budget noiseBudget gives for its list, bit for bit: every frequency gets the same
 * operations alone or in a block. Throws what noiseBudget throws for one of the lists, though
 * not necessarily for the first list that noiseBudget alone would refuse.
 */
export function noiseBudgets(assembled: AssembledSetup, lists: readonly Float64Array[]): NoiseBudget[] {
  const { model, readoutRows, referredTo } = assembled;
  const groups = model.groups;
  const p = readoutRows.length;
  const nGroups = groups.length;
  for (const frequencies of lists) for (const input of model.classicalInputs ?? []) input.requireCovers(frequencies);
  let nf = 0;
  for (const frequencies of lists) nf += frequencies.length;
  // One allocation (a typed array costs about as much to allocate as tens of frequencies cost to
  // compute) for the totals and every term (the totals first, then each group's), the angular
  // frequencies and the referral factor (|χ|² for displacement), which serves the terms and every
  // reference curve and is kept for them, and the frequencies of every list one after another (a
  // single list is used as it is).
  const buffer = new Float64Array((1 + nGroups + 2 + (lists.length === 1 ? 0 : 1)) * nf);
  const curves = buffer.subarray(0, (1 + nGroups) * nf);
  const omegas = buffer.subarray((1 + nGroups) * nf, (2 + nGroups) * nf);
  const factors = buffer.subarray((2 + nGroups) * nf, (3 + nGroups) * nf);
  const all = lists.length === 1 ? lists[0] : buffer.subarray((3 + nGroups) * nf);
  if (lists.length > 1) {
    let at = 0;
    for (const frequencies of lists) {
      all.set(frequencies, at);
      at += frequencies.length;
    }
  }
  for (let f = 0; f < nf; f++) {
    const omega = 2 * Math.PI * all[f];
    omegas[f] = omega;
    factors[f] = referredTo.psdFactor(omega);
  }
  const entries = new GroupEntries(model, groups);
  // A few frequencies (a figure at one frequency) go one at a time: a block solver costs more to set up than they take.
  if (p === 1 && nf >= BLOCK_FROM) singleOutputCurves(model, readoutRows, entries, all, omegas, factors, curves);
  else oneAtATimeCurves(model, readoutRows, entries, all, omegas, factors, curves);
  const budgets: NoiseBudget[] = [];
  let from = 0;
  for (const frequencies of lists) {
    const to = from + frequencies.length;
    budgets.push(budgetOf(assembled, frequencies, curves, nf, from, to, omegas.subarray(from, to), factors.subarray(from, to)));
    from = to;
  }
  return budgets;
}

/**
 * The budget on frequencies from … to − 1 of curves solved for nf frequencies (`curves`: the
 * totals, then each group's terms, nf values each); `omegas` and `factors` are the list's own.
 */
function budgetOf(assembled: AssembledSetup, frequencies: Float64Array, curves: Float64Array, nf: number, from: number, to: number, omegas: Float64Array, factors: Float64Array): NoiseBudget {
  const { model, readoutRows, referredTo, signal, setup } = assembled;
  const groups = model.groups;
  const nGroups = groups.length;
  const p = readoutRows.length;
  const total = curves.subarray(from, to);
  let blindPoints = 0;
  for (let f = from; f < to; f++) {
    // No response, or one so weak that the referred noise overflows: reported as blind.
    if (!Number.isFinite(curves[f])) {
      blindPoints++;
      curves[f] = Infinity;
      for (let g = 0; g < nGroups; g++) curves[(1 + g) * nf + f] = Infinity;
    }
  }
  const count = to - from;
  if (blindPoints === count) {
    throw new QuietframeError({
      path: "readout",
      value: setup.readout,
      problem: `the detector${p > 1 ? "s see" : " sees"} no signal: the ${setup.signal.kind} on '${setup.signal.on}' does not reach ${p > 1 ? "them" : "it"}`,
      allowed: "a readout whose light has interacted with the signal's target (check connections and readout angle)",
    });
  }
  const warnings: string[] = [];
  if (blindPoints > 0) {
    warnings.push(`the readout is blind to the signal at ${blindPoints} of ${count} frequencies: the referred noise there is infinite or beyond floating-point range`);
  }

  const terms: BudgetTerm[] = [];
  groups.forEach((g, i) => {
    const psd = curves.subarray((1 + i) * nf + from, (1 + i) * nf + to);
    if (!allZero(psd)) terms.push({ id: g.id, label: g.label, owner: g.owner, category: g.category, psd });
  });
  // Each reference curve is computed when it is first read (a figure of merit reads one, a
  // noise band none): from the angular frequencies and factors of this call, so it has the
  // same bits as when computed here, whatever happens to the caller's frequency array since.
  const references = signal.curves.map((curve) => new LazyReference(curve, omegas, factors));
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

/** Frequencies from which a one-output budget is solved in blocks. */
const BLOCK_FROM = 16;

/**
 * The total (first nf entries of `curves`) and each group's referred noise (the next nf each),
 * one frequency at a time (several outputs combined optimally, or one output); a point where the
 * readout is blind gets a total of Infinity.
 */
function oneAtATimeCurves(
  model: StateSpaceModel,
  readoutRows: readonly number[],
  entries: GroupEntries,
  frequencies: Float64Array,
  omegas: Float64Array,
  factors: Float64Array,
  curves: Float64Array,
): void {
  const nf = frequencies.length;
  const nGroups = model.groups.length;
  const evaluator = new TransferEvaluator(model, readoutRows);
  try {
    const referral: SignalReferral = readoutRows.length === 1 ? new SingleOutput(entries) : new OptimalCombination(entries, nGroups, readoutRows.length);
    const referred = new Float64Array(nGroups);
    for (let f = 0; f < nf; f++) {
      evaluator.at(omegas[f]);
      entries.atFrequency(frequencies[f]);
      let sum = Infinity;
      if (referral.refer(evaluator, referred)) {
        sum = 0;
        for (let g = 0; g < nGroups; g++) {
          const v = referred[g] * factors[f];
          curves[(1 + g) * nf + f] = v;
          sum += v;
        }
      }
      curves[f] = sum;
    }
  } finally {
    evaluator.release();
  }
}

/**
 * The same for one output, a block of frequencies at a time (TransferBlock): S_g = Σ N_ij H_i
 * conj(H_j) over the group's entries, over |h|², times the referral factor; the total sums the
 * groups in order. Every frequency gets the operations of the one-at-a-time path, so the same bits.
 */
function singleOutputCurves(
  model: StateSpaceModel,
  readoutRows: readonly number[],
  entries: GroupEntries,
  frequencies: Float64Array,
  omegas: Float64Array,
  factors: Float64Array,
  curves: Float64Array,
): void {
  const nf = frequencies.length;
  const size = Math.min(nf, TRANSFER_BLOCK);
  const transfer = new TransferBlock(model, readoutRows, size, 2);
  try {
    blockCurves(transfer, entries, frequencies, factors, omegas, curves, size);
  } finally {
    transfer.release();
  }
}

/** singleOutputCurves' loop over the blocks of frequencies, with the block solver it made. */
function blockCurves(transfer: TransferBlock, entries: GroupEntries, frequencies: Float64Array, factors: Float64Array, omegas: Float64Array, curves: Float64Array, size: number): void {
  const nf = frequencies.length;
  const { hRe, hIm, sRe, sIm } = transfer;
  const [h2, sr] = transfer.work;
  const { start, ni, nj, nv } = entries;
  const classical = entries.classicalBlock(size);
  for (let from = 0; from < nf; from += size) {
    const count = Math.min(size, nf - from);
    transfer.solve(omegas, from, count);
    classical.fill(frequencies, from, count);
    for (let f = 0; f < count; f++) {
      h2[f] = sRe[f] * sRe[f] + sIm[f] * sIm[f];
      curves[from + f] = 0;
    }
    for (let g = 0; g + 1 < start.length; g++) {
      const o = (1 + g) * nf + from;
      const first = start[g];
      if (start[g + 1] === first + 1 && classical.spectrumOf(first) === undefined) {
        // One white entry (an uncorrelated input): its sum and its share in one pass, the sum
        // still started from 0 (0 + x is +0 where x is −0, as the sum of several entries would be).
        const i = ni[first] * size;
        const j = nj[first] * size;
        const w = nv[first];
        for (let f = 0; f < count; f++) {
          const ar = hRe[i + f];
          const ai = hIm[i + f];
          const br = hRe[j + f];
          const bi = -hIm[j + f];
          const v = ((0 + w * (ar * br - ai * bi)) / h2[f]) * factors[from + f];
          curves[o + f] = v;
          curves[from + f] += v;
        }
        continue;
      }
      sr.fill(0, 0, count);
      for (let e = first; e < start[g + 1]; e++) {
        const i = ni[e] * size;
        const j = nj[e] * size;
        const spectrum = classical.spectrumOf(e);
        const w = nv[e];
        for (let f = 0; f < count; f++) {
          // Re(H_i N_ij conj(H_j)), written as the p×p product of OptimalCombination writes it.
          const ar = hRe[i + f];
          const ai = hIm[i + f];
          const br = hRe[j + f];
          const bi = -hIm[j + f];
          sr[f] += (spectrum ? spectrum[f] : w) * (ar * br - ai * bi);
        }
      }
      for (let f = 0; f < count; f++) {
        const v = (sr[f] / h2[f]) * factors[from + f];
        curves[o + f] = v;
        curves[from + f] += v;
      }
    }
    // A readout blind to the signal here: the total is infinite, whatever the groups gave.
    for (let f = 0; f < count; f++) if (h2[f] === 0) curves[from + f] = Infinity;
  }
}

function allZero(xs: Float64Array): boolean {
  for (let i = 0; i < xs.length; i++) if (xs[i] !== 0) return false;
  return true;
}

/**
 * A reference curve whose PSD (curve × referral factor at each frequency) is computed on first
 * read; a class rather than an object with a getter each (see docs/performance.md on getters).
 */
class LazyReference implements ReferenceSpectrum {
  readonly id: string;
  readonly label: string;
  readonly #curve: ReferenceCurve;
  readonly #omegas: Float64Array;
  readonly #factors: Float64Array;
  #psd: Float64Array | undefined;

  constructor(curve: ReferenceCurve, omegas: Float64Array, factors: Float64Array) {
    this.id = curve.id;
    this.label = curve.label;
    this.#curve = curve;
    this.#omegas = omegas;
    this.#factors = factors;
  }

  get psd(): Float64Array {
    if (this.#psd === undefined) {
      const omegas = this.#omegas;
      const factors = this.#factors;
      const curve = this.#curve;
      const psd = new Float64Array(omegas.length);
      for (let f = 0; f < omegas.length; f++) psd[f] = curve.psd(omegas[f]) * factors[f];
      this.#psd = psd;
    }
    return this.#psd;
  }

  /** In JSON as a plain object would be: id, label, psd. */
  toJSON(): ReferenceSpectrum {
    const { id, label, psd } = this;
    return { id, label, psd };
  }
}

/** Several detectors whose noise matrix cannot be inverted: two of them see exactly the same noise. */
export function singularCombinationError(): QuietframeError {
  return new QuietframeError({
    path: "readout",
    problem: "the combined outputs have a singular noise matrix (two detectors see exactly the same noise)",
    allowed: "detectors with independent noise (each homodyne efficiency below 1, or different light)",
  });
}

/**
 * The non-zero entries N_ij of every group, listed once in the order the sums visit them
 * (group by group; within a group, i then j over its columns), with where each group starts.
 */
class GroupEntries {
  readonly start: Int32Array;
  readonly ni: Int32Array;
  readonly nj: Int32Array;
  readonly nv: Float64Array;
  /** The entries of classical inputs (each its own column's diagonal) and their spectra. */
  private readonly classical: { readonly entry: number; readonly psdAt: (frequency: number) => number }[] = [];
  constructor(model: StateSpaceModel, groups: readonly NoiseGroup[]) {
    const m = model.nInputs;
    const N = model.N;
    // The entries are counted first, so the arrays are written in place.
    let count = 0;
    for (const g of groups) for (const i of g.columns) for (const j of g.columns) if (N[i * m + j] !== 0) count++;
    this.start = new Int32Array(groups.length + 1);
    this.ni = new Int32Array(count);
    this.nj = new Int32Array(count);
    this.nv = new Float64Array(count);
    const classical = model.classicalInputs ?? [];
    let e = 0;
    groups.forEach((g, k) => {
      for (const i of g.columns) {
        for (const j of g.columns) {
          const nij = N[i * m + j];
          if (nij === 0) continue;
          const psdAt = i === j && classical.length > 0 ? classical.find((c) => c.column === i)?.psdAt : undefined;
          if (psdAt) this.classical.push({ entry: e, psdAt });
          this.ni[e] = i;
          this.nj[e] = j;
          this.nv[e++] = nij;
        }
      }
      this.start[k + 1] = e;
    });
  }

  /** Puts each classical input's PSD at this frequency (Hz) in place of its white-noise placeholder. */
  atFrequency(frequency: number): void {
    for (const c of this.classical) this.nv[c.entry] = c.psdAt(frequency);
  }

  /** The classical inputs' PSDs over a block of up to `size` frequencies, in place of their placeholders. */
  classicalBlock(size: number): ClassicalBlock {
    const spectra = new Map(this.classical.map((c) => [c.entry, { psdAt: c.psdAt, values: new Float64Array(size) }]));
    return {
      fill(frequencies, from, count) {
        for (const s of spectra.values()) for (let f = 0; f < count; f++) s.values[f] = s.psdAt(frequencies[from + f]);
      },
      spectrumOf: (entry) => spectra.get(entry)?.values,
    };
  }
}

interface ClassicalBlock {
  /** Takes the PSDs at frequencies[from … from + count − 1] (Hz). */
  fill(frequencies: Float64Array, from: number, count: number): void;
  /** The PSDs of the entry at the block's frequencies, or undefined for a white input's entry. */
  spectrumOf(entry: number): Float64Array | undefined;
}

/** Turns the transfer functions at one frequency into each group's signal-referred noise. */
interface SignalReferral {
  /** Fills `referred` (one value per group); false when the readout is blind to the signal. */
  refer(transfer: TransferEvaluator, referred: Float64Array): boolean;
}

/** One output, one frequency at a time: S_g / |h|², with S_g = Σ N_ij H_i conj(H_j) over the group's entries (blockCurves' arithmetic). */
class SingleOutput implements SignalReferral {
  constructor(private readonly entries: GroupEntries) {}

  refer(transfer: TransferEvaluator, referred: Float64Array): boolean {
    const { hRe, hIm, sRe, sIm } = transfer;
    const h2 = sRe[0] * sRe[0] + sIm[0] * sIm[0];
    if (h2 === 0) return false;
    const { start, ni, nj, nv } = this.entries;
    for (let g = 0; g + 1 < start.length; g++) {
      let sr = 0;
      for (let e = start[g]; e < start[g + 1]; e++) {
        // Re(H_i N_ij conj(H_j)), written as the p×p product of OptimalCombination writes it.
        const i = ni[e];
        const j = nj[e];
        const ar = hRe[i];
        const ai = hIm[i];
        const br = hRe[j];
        const bi = -hIm[j];
        sr += nv[e] * (ar * br - ai * bi);
      }
      referred[g] = sr / h2;
    }
    return true;
  }
}

/**
 * Optimal frequency-dependent combination of several outputs: S_g = H_g N_g H_g† (p×p
 * Hermitian) for each group, w = S_y⁻¹h with S_y = Σ_g S_g, and each group's weight w†S_g w/q².
 */
class OptimalCombination implements SignalReferral {
  /** Each group's p×p spectrum, real and imaginary parts, one after another. */
  private readonly gRe: Float64Array;
  private readonly gIm: Float64Array;
  private readonly sRe: Float64Array;
  private readonly sIm: Float64Array;
  private readonly wRe: Float64Array;
  private readonly wIm: Float64Array;
  private readonly piv: Int32Array;
  constructor(
    private readonly entries: GroupEntries,
    nGroups: number,
    private readonly p: number,
  ) {
    this.gRe = new Float64Array(nGroups * p * p);
    this.gIm = new Float64Array(nGroups * p * p);
    this.sRe = new Float64Array(p * p);
    this.sIm = new Float64Array(p * p);
    this.wRe = new Float64Array(p);
    this.wIm = new Float64Array(p);
    this.piv = new Int32Array(p);
  }

  refer(transfer: TransferEvaluator, referred: Float64Array): boolean {
    const { p, sRe, sIm, wRe, wIm, gRe, gIm } = this;
    const { hRe, hIm } = transfer;
    const m = hRe.length / p;
    const nGroups = referred.length;
    const pp = p * p;
    this.groupSpectra(hRe, hIm, m);
    sRe.fill(0);
    sIm.fill(0);
    for (let g = 0; g < nGroups; g++) {
      for (let i = 0; i < pp; i++) {
        sRe[i] += gRe[g * pp + i];
        sIm[i] += gIm[g * pp + i];
      }
    }
    wRe.set(transfer.sRe.subarray(0, p));
    wIm.set(transfer.sIm.subarray(0, p));
    if (wRe.every((v) => v === 0) && wIm.every((v) => v === 0)) return false;
    try {
      complexLuFactor(sRe, sIm, p, this.piv);
    } catch (e) {
      if (e instanceof SingularMatrixError) throw singularCombinationError();
      throw e;
    }
    complexLuSolve(sRe, sIm, p, this.piv, wRe, wIm, 1);
    let q = 0;
    for (let k = 0; k < p; k++) q += transfer.sRe[k] * wRe[k] + transfer.sIm[k] * wIm[k];
    if (q === 0) return false;
    for (let g = 0; g < nGroups; g++) referred[g] = this.weighted(g * pp) / (q * q);
    return true;
  }

  /** S_g = H_g N_g H_g† of every group: the upper triangle summed over the entries, mirrored. */
  private groupSpectra(hRe: Float64Array, hIm: Float64Array, m: number): void {
    const { p, gRe, gIm } = this;
    const { start, ni, nj, nv } = this.entries;
    for (let g = 0; g + 1 < start.length; g++) {
      const o = g * p * p;
      // Every entry is written below (upper triangle and its mirror), so no clearing is needed.
      for (let a = 0; a < p; a++) {
        for (let b = a; b < p; b++) {
          let sr = 0;
          let si = 0;
          for (let e = start[g]; e < start[g + 1]; e++) {
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
          gRe[o + a * p + b] = sr;
          gIm[o + a * p + b] = a === b ? 0 : si;
          gRe[o + b * p + a] = sr;
          gIm[o + b * p + a] = a === b ? 0 : -si;
        }
      }
    }
  }

  /** Re(w† S_g w) for the group spectrum at offset o. */
  private weighted(o: number): number {
    const { p, wRe, wIm, gRe, gIm } = this;
    let sum = 0;
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        // conj(w_a) M_ab w_b
        const mr = gRe[o + a * p + b];
        const mi = gIm[o + a * p + b];
        const xr = mr * wRe[b] - mi * wIm[b];
        const xi = mr * wIm[b] + mi * wRe[b];
        sum += wRe[a] * xr + wIm[a] * xi;
      }
    }
    return sum;
  }
}
