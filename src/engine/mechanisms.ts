/**
 * The noise budget by mechanism: where one light source both measures and drives a body, its
 * budget term splits into imprecision, back-action and their cross-correlation.
 *
 * Each input column's transfer to the readout, H = H_imp + H_ba, is split by path: H_imp is
 * the transfer of the model without the forces of light on bodies (the light's path to the
 * detector that never moves a body: shot noise), and H_ba = H − H_imp is the rest (the path
 * through the bodies' motion: radiation pressure, spin-readout back-action). H_ba is computed
 * from the resolvent identity R − R₀ = R (A − A₀) R₀, as H_ba = C R (ΔB + ΔA R₀ B₀) with ΔA, ΔB
 * the force terms, not as a difference: back-action far below shot noise keeps its digits. For a group of
 * inputs with one-sided noise matrix N, the term S = Re(H N H†)/|h|² is then exactly
 *   S_imp = Re(H_imp N H_imp†)/|h|²          (≥ 0)
 *   S_ba  = Re(H_ba N H_ba†)/|h|²            (≥ 0)
 *   S_corr = 2 Re(H_imp N H_ba†)/|h|²         (signed: negative where the two paths cancel)
 * with h the signal response of the full model (the bodies still respond to light). Several
 * detectors are combined with the budget's optimal weights w = S_y⁻¹h: each path's transfer is
 * then w†H and |h|² becomes (h†w)².
 *
 * A light source's quadratures are separate budget terms when uncorrelated (vacuum, squeezing
 * at 0° or 90°); the split sums them per source, so that its imprecision and back-action stand
 * side by side. Noise that reaches the readout only one way (a thermal bath, detection vacuum)
 * is one mechanism and is not listed: the budget shows it whole.
 */
import { QuietframeError } from "../errors";
import { complexLuFactor, complexLuSolve } from "../linalg/complex-lu";
import { SingularMatrixError } from "../linalg/singular-error";
import type { NoiseCategory, NoiseGroup, StateSpaceModel } from "../network/model";
import type { AssembledSetup } from "../setup/assemble";
import { TransferEvaluator } from "./transfer";

/** One light source's budget terms split by mechanism; each part is a one-sided PSD in (unit)²/Hz. */
export interface MechanismTerm {
  /** The source: one budget term's id, or the source's name when several of its terms are summed. */
  readonly id: string;
  readonly label: string;
  readonly owner: string;
  readonly category: NoiseCategory;
  /** Ids of the budget terms (NoiseBudget.terms) this sums: the source's uncorrelated quadratures. */
  readonly budgetTerms: readonly string[];
  /** Those terms summed: imprecision + backAction + correlation (to rounding). */
  readonly psd: Float64Array;
  /** Noise the light carries to the detector without moving a body (≥ 0). */
  readonly imprecision: Float64Array;
  /** Noise of the bodies' motion driven by the light's force (≥ 0). */
  readonly backAction: Float64Array;
  /** Cross-correlation of the two, 2 Re(…): may be negative (a squeeze angle or a variational readout makes it so). */
  readonly correlation: Float64Array;
}

export interface MechanismBudget {
  readonly frequencies: Float64Array;
  readonly quantity: { readonly name: string; readonly unit: string };
  /** One entry per light source (or lossy optic) whose noise moves a body, in budget order. */
  readonly terms: readonly MechanismTerm[];
}

/** The categories of noise that is light: a light source's quadratures and the vacuum of optical loss. */
const LIGHT_CATEGORIES: readonly NoiseCategory[] = ["quantum-light", "loss"];

/**
 * Splits the light sources' budget terms of an assembled set-up into imprecision, back-action
 * and correlation on the given frequencies (Hz). Frequencies where the readout is blind to
 * the signal give Infinity in every part, as the budget does. A set-up without forces of light
 * on bodies has no terms.
 */
export function budgetByMechanism(assembled: AssembledSetup, frequencies: Float64Array): MechanismBudget {
  const { model, readoutRows, referredTo } = assembled;
  const quantity = { name: referredTo.name, unit: referredTo.unit };
  if (model.lightForce === undefined) return { frequencies, quantity, terms: [] };
  const nf = frequencies.length;
  const groups = model.groups;
  const parts = groups.map(() => ({ psd: new Float64Array(nf), imprecision: new Float64Array(nf), backAction: new Float64Array(nf), correlation: new Float64Array(nf) }));
  const paths = new LightPaths(model, model.lightForce, readoutRows);
  const weights = new ReadoutWeights(model, readoutRows.length);
  const m = model.nInputs;
  const rows = new CombinedRows(m);

  for (let f = 0; f < nf; f++) {
    const omega = 2 * Math.PI * frequencies[f];
    paths.at(omega);
    const norm = weights.combine(paths, rows);
    const scale = norm > 0 ? referredTo.psdFactor(omega) / norm : Infinity;
    groups.forEach((g, k) => {
      const part = parts[k];
      if (!Number.isFinite(scale)) {
        part.psd[f] = part.imprecision[f] = part.backAction[f] = part.correlation[f] = Infinity;
        return;
      }
      const s = rows.split(g, model.N, m);
      part.psd[f] = s.whole * scale;
      part.imprecision[f] = s.imprecision * scale;
      part.backAction[f] = s.backAction * scale;
      part.correlation[f] = s.correlation * scale;
    });
  }
  return { frequencies, quantity, terms: bySource(groups, parts) };
}

type LightForce = NonNullable<StateSpaceModel["lightForce"]>;

/**
 * The readout's transfer from every input at one frequency, whole (H, from the full model) and
 * by path: direct (v = C R₀ B₀ + D) and through the bodies (d = C R (ΔB + ΔA R₀ B₀)). R₀ B₀ is
 * needed only in the states whose light pushes a body, so the direct model reads those states
 * as extra outputs.
 */
class LightPaths {
  readonly full: TransferEvaluator;
  /** p×m, row-major: the direct path and the path through the bodies. */
  readonly vRe: Float64Array;
  readonly vIm: Float64Array;
  readonly dRe: Float64Array;
  readonly dIm: Float64Array;
  private readonly direct: TransferEvaluator;
  private readonly p: number;
  private readonly m: number;
  private readonly n: number;
  /** States whose value a force term reads, and the rows (body states) the force terms drive. */
  private readonly pushing: readonly number[];
  private readonly driven: readonly number[];
  /** The force term's input to each driven row, per input column: ΔB + ΔA R₀ B₀ (complex, driven × m). */
  private readonly fRe: Float64Array;
  private readonly fIm: Float64Array;

  constructor(
    model: StateSpaceModel,
    private readonly force: LightForce,
    readoutRows: readonly number[],
  ) {
    const { nStates: n, nInputs: m } = model;
    const p = readoutRows.length;
    this.n = n;
    this.m = m;
    this.p = p;
    const pushing: number[] = [];
    const driven: number[] = [];
    for (let k = 0; k < n; k++) {
      let reads = false;
      let drives = false;
      for (let j = 0; j < n; j++) {
        if (force.A[j * n + k] !== 0) reads = true;
        if (force.A[k * n + j] !== 0) drives = true;
      }
      for (let i = 0; i < m; i++) if (force.B[k * m + i] !== 0) drives = true;
      if (reads) pushing.push(k);
      if (drives) driven.push(k);
    }
    this.pushing = pushing;
    this.driven = driven;
    const rows = p + pushing.length;
    const C = new Float64Array(rows * n);
    const D = new Float64Array(rows * m);
    readoutRows.forEach((r, a) => {
      C.set(model.C.subarray(r * n, (r + 1) * n), a * n);
      D.set(model.D.subarray(r * m, (r + 1) * m), a * m);
    });
    pushing.forEach((k, b) => {
      C[(p + b) * n + k] = 1;
    });
    const directModel: StateSpaceModel = { ...model, A: force.restA, B: force.restB, C, D, nOutputs: rows, signalD: new Float64Array(rows) };
    this.full = new TransferEvaluator(model, readoutRows);
    this.direct = new TransferEvaluator(
      directModel,
      Array.from({ length: rows }, (_, a) => a),
    );
    this.vRe = new Float64Array(p * m);
    this.vIm = new Float64Array(p * m);
    this.dRe = new Float64Array(p * m);
    this.dIm = new Float64Array(p * m);
    this.fRe = new Float64Array(driven.length * m);
    this.fIm = new Float64Array(driven.length * m);
  }

  at(omega: number): void {
    const { full, direct, n, m, p, pushing, driven, force, fRe, fIm } = this;
    full.at(omega);
    direct.at(omega);
    this.vRe.set(direct.hRe.subarray(0, p * m));
    this.vIm.set(direct.hIm.subarray(0, p * m));
    // F = ΔB + ΔA R₀ B₀ on the driven rows; R₀ B₀ of a pushing state is the direct model's extra output.
    driven.forEach((j, r) => {
      for (let i = 0; i < m; i++) {
        let re = force.B[j * m + i];
        let im = 0;
        pushing.forEach((k, b) => {
          const a = force.A[j * n + k];
          if (a === 0) return;
          re += a * direct.hRe[(p + b) * m + i];
          im += a * direct.hIm[(p + b) * m + i];
        });
        fRe[r * m + i] = re;
        fIm[r * m + i] = im;
      }
    });
    // d = G F with G = C R of the full model (transposed in full.gRe/gIm).
    for (let a = 0; a < p; a++) {
      for (let i = 0; i < m; i++) {
        let re = 0;
        let im = 0;
        driven.forEach((j, r) => {
          const gr = full.gRe[j * p + a];
          const gi = full.gIm[j * p + a];
          const xr = fRe[r * m + i];
          const xi = fIm[r * m + i];
          re += gr * xr - gi * xi;
          im += gr * xi + gi * xr;
        });
        this.dRe[a * m + i] = re;
        this.dIm[a * m + i] = im;
      }
    }
  }
}

interface GroupParts {
  readonly psd: Float64Array;
  readonly imprecision: Float64Array;
  readonly backAction: Float64Array;
  readonly correlation: Float64Array;
}

/**
 * Sums the groups of each light source (owner and category): its quadratures are separate,
 * uncorrelated budget terms, and only together do they show the source's imprecision beside
 * its back-action. A source is listed when its light moves a body somewhere on the grid.
 */
function bySource(groups: readonly NoiseGroup[], parts: readonly GroupParts[]): MechanismTerm[] {
  const sources = new Map<string, number[]>();
  groups.forEach((g, k) => {
    if (!LIGHT_CATEGORIES.includes(g.category) || !anyNonZero(parts[k].psd)) return;
    const key = `${g.owner}\u0000${g.category}`;
    const list = sources.get(key) ?? [];
    list.push(k);
    sources.set(key, list);
  });
  const terms: MechanismTerm[] = [];
  for (const members of sources.values()) {
    if (!members.some((k) => anyNonZero(parts[k].backAction))) continue;
    const first = groups[members[0]];
    const summed = members.length === 1 ? parts[members[0]] : sumParts(members.map((k) => parts[k]));
    const label = members.length === 1 ? first.label : `${first.owner}: ${members.map((k) => groups[k].label.replace(`${first.owner}: `, "")).join(" + ")}`;
    terms.push({
      id: members.length === 1 ? first.id : label,
      label,
      owner: first.owner,
      category: first.category,
      budgetTerms: members.map((k) => groups[k].id),
      ...summed,
    });
  }
  return terms;
}

function sumParts(list: readonly GroupParts[]): GroupParts {
  const nf = list[0].psd.length;
  const out = { psd: new Float64Array(nf), imprecision: new Float64Array(nf), backAction: new Float64Array(nf), correlation: new Float64Array(nf) };
  for (const p of list) {
    for (let f = 0; f < nf; f++) {
      out.psd[f] += p.psd[f];
      out.imprecision[f] += p.imprecision[f];
      out.backAction[f] += p.backAction[f];
      out.correlation[f] += p.correlation[f];
    }
  }
  return out;
}

function anyNonZero(xs: Float64Array): boolean {
  for (let i = 0; i < xs.length; i++) if (xs[i] !== 0 && Number.isFinite(xs[i])) return true;
  return false;
}

/** The combined readout's transfer from every input: whole (u), direct path (v), through the bodies (d). */
class CombinedRows {
  readonly uRe: Float64Array;
  readonly uIm: Float64Array;
  readonly vRe: Float64Array;
  readonly vIm: Float64Array;
  readonly dRe: Float64Array;
  readonly dIm: Float64Array;
  constructor(m: number) {
    this.uRe = new Float64Array(m);
    this.uIm = new Float64Array(m);
    this.vRe = new Float64Array(m);
    this.vIm = new Float64Array(m);
    this.dRe = new Float64Array(m);
    this.dIm = new Float64Array(m);
  }

  /** Σ_ij N_ij Re(x_i conj(y_j)) over a group's columns: whole, and the three pairs of paths. */
  split(g: NoiseGroup, N: Float64Array, m: number): { whole: number; imprecision: number; backAction: number; correlation: number } {
    const { uRe, uIm, vRe, vIm, dRe, dIm } = this;
    let whole = 0;
    let imprecision = 0;
    let backAction = 0;
    let correlation = 0;
    for (const i of g.columns) {
      for (const j of g.columns) {
        const nij = N[i * m + j];
        if (nij === 0) continue;
        whole += nij * (uRe[i] * uRe[j] + uIm[i] * uIm[j]);
        imprecision += nij * (vRe[i] * vRe[j] + vIm[i] * vIm[j]);
        backAction += nij * (dRe[i] * dRe[j] + dIm[i] * dIm[j]);
        // N is symmetric, so Σ N_ij Re(v_i d̄_j + d_i v̄_j) = 2 Σ N_ij Re(v_i d̄_j).
        correlation += 2 * nij * (vRe[i] * dRe[j] + vIm[i] * dIm[j]);
      }
    }
    return { whole, imprecision, backAction, correlation };
  }
}

/**
 * The weights that combine the readout's outputs: one output is taken as it is (norm |h|²);
 * several are combined as the budget does, w = S_y⁻¹ h with S_y = H N H† of the full model and
 * norm (h†w)².
 */
class ReadoutWeights {
  private readonly sRe: Float64Array;
  private readonly sIm: Float64Array;
  private readonly wRe: Float64Array;
  private readonly wIm: Float64Array;
  private readonly piv: Int32Array;
  constructor(
    private readonly model: StateSpaceModel,
    private readonly p: number,
  ) {
    this.sRe = new Float64Array(p * p);
    this.sIm = new Float64Array(p * p);
    this.wRe = new Float64Array(p);
    this.wIm = new Float64Array(p);
    this.piv = new Int32Array(p);
  }

  /** Fills the combined rows of every path; returns the norm (0 when the readout is blind here). */
  combine(paths: LightPaths, rows: CombinedRows): number {
    const { p, wRe, wIm } = this;
    const { full } = paths;
    const m = this.model.nInputs;
    if (p === 1) {
      wRe[0] = 1;
      wIm[0] = 0;
    } else if (!this.optimalWeights(full)) {
      return 0;
    }
    // conj(w)·x for each path's p×m transfer x.
    const weigh = (xRe: Float64Array, xIm: Float64Array, outRe: Float64Array, outIm: Float64Array) => {
      for (let i = 0; i < m; i++) {
        let re = 0;
        let im = 0;
        for (let a = 0; a < p; a++) {
          const hr = xRe[a * m + i];
          const hi = xIm[a * m + i];
          re += wRe[a] * hr + wIm[a] * hi;
          im += wRe[a] * hi - wIm[a] * hr;
        }
        outRe[i] = re;
        outIm[i] = im;
      }
    };
    weigh(full.hRe, full.hIm, rows.uRe, rows.uIm);
    weigh(paths.vRe, paths.vIm, rows.vRe, rows.vIm);
    weigh(paths.dRe, paths.dIm, rows.dRe, rows.dIm);
    if (p === 1) return full.sRe[0] * full.sRe[0] + full.sIm[0] * full.sIm[0];
    let q = 0;
    for (let a = 0; a < p; a++) q += full.sRe[a] * wRe[a] + full.sIm[a] * wIm[a];
    return q * q;
  }

  /** w = S_y⁻¹ h; false when the signal reaches no output. */
  private optimalWeights(full: TransferEvaluator): boolean {
    const { p, sRe, sIm, wRe, wIm, model } = this;
    const m = model.nInputs;
    const { hRe, hIm } = full;
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        let sr = 0;
        let si = 0;
        for (let i = 0; i < m; i++) {
          for (let j = 0; j < m; j++) {
            const nij = model.N[i * m + j];
            if (nij === 0) continue;
            // H[a,i] N_ij conj(H[b,j])
            const ar = hRe[a * m + i];
            const ai = hIm[a * m + i];
            const br = hRe[b * m + j];
            const bi = -hIm[b * m + j];
            sr += nij * (ar * br - ai * bi);
            si += nij * (ar * bi + ai * br);
          }
        }
        sRe[a * p + b] = sr;
        sIm[a * p + b] = si;
      }
    }
    wRe.set(full.sRe.subarray(0, p));
    wIm.set(full.sIm.subarray(0, p));
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
    return true;
  }
}
