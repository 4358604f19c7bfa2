/**
 * Simulated measurement runs: the hidden state of the linear model and its homodyne records
 * are sampled exactly over each step, and a Kalman filter reads the records.
 *
 * Exact discretization (computed once per run). The state and the integrated records
 * y(t) = ∫ dy obey the joint linear SDE d[z; y] = [[A, 0], [C, 0]] [z; y] dt + [B; D] dw, so
 * over a step h (discretize.ts, Van Loan):
 *   z_{k+1} = Φ z_k + ξ_k,   Δy_k = Γ z_k + η_k,   (ξ_k, η_k) ~ N(0, Σ),
 * with Φ = e^{Ah}, Γ = ∫₀ʰ C e^{As} ds and Σ the joint covariance of the state noise and the
 * record noise gathered over the step (correlated whenever the light that carries the
 * record also pushes the system). No Euler error: any step gives the right statistics at
 * the step times.
 *
 * Filter. ẑ_k and P_k are the exact conditional mean and covariance of z_k given
 * Δy_0 … Δy_{k−1} for that discrete model (Kalman filter with correlated noise):
 *   S = Γ P Γᵀ + Σ_yy,  K = (Φ P Γᵀ + Σ_zy) S⁻¹,
 *   ẑ ← Φ ẑ + K (Δy − Γ ẑ),  P ← Φ P Φᵀ + Σ_zz − K S Kᵀ.
 * As h → 0, Γ → C h, Σ_zz → Q h, Σ_zy → S h, Σ_yy → R h, and this becomes the Kalman–Bucy
 * filter: K Δy-update → (P Cᵀ + S) R⁻¹ (dy − C ẑ dt), and P obeys the Riccati equation of
 * riccati.ts. For a finite step P is the covariance given the records integrated over each
 * step, at least the continuous-record covariance and equal to it up to O(h); it is the
 * true error covariance of the estimate shown, so the band ẑ ± √P is honest at any step.
 */
import { fastUncertaintyMargin, stationaryCovariance } from "../engine/covariance";
import { duanBound, duanSum, eprVariances, logarithmicNegativity, modePairCovariance } from "../engine/entanglement";
import { QuietframeError } from "../errors";
import { realLuFactor, realLuSolve, solve } from "../linalg/real-lu";
import type { StateSpaceModel } from "../network/model";
import { block, congruence, maxAbs, multiply, symmetrize, transpose } from "../linalg/real-matrix";
import { doublingLimit, relativeChange, type RiccatiMap } from "./riccati";
import { discreteStep, repeatStep, type DiscreteStep } from "./discretize";
import { applyFactor, psdFactor, type Factor } from "../linalg/psd-factor";
import { findMode, jointParts, jointVariance, resolveJointVariable, zeroPointVariance } from "./joint";
import { measurementNoise } from "./measurement";
import { GaussianSource } from "./random";
import { checkSettings, storedSteps } from "./settings";
import { groundCovariance } from "./transient";
import type { EntanglementSeries, JointSeries, SimulationSettings, TrajectoryRequest, TrajectoryResult, TrajectoryRun } from "./types";

/**
 * Distance of P from the filter's steady state (relative to √(P_ii P_jj)) below which P is
 * frozen. The step-by-step recursion and the doubling limit round differently and settle
 * up to ~1e-10 apart for hot, strongly measured set-ups, so the test is looser than that; P
 * then keeps its own current value, so the series has no jump.
 */
const FILTER_SETTLED = 1e-9;

interface JointTrack {
  readonly label: string;
  readonly weights: Float64Array;
  readonly zeroPoint: number;
  readonly parts: readonly [string, Float64Array][];
  readonly truth: Float64Array;
  readonly estimate: Float64Array;
  readonly conditional: Float64Array;
  readonly unconditional: Float64Array;
  readonly partSeries: Float64Array[];
}

interface PairTrack {
  readonly pair: readonly [string, string];
  readonly eprX: Float64Array;
  readonly eprP: Float64Array;
  readonly duanSum: Float64Array;
  readonly logNegativity: Float64Array;
  readonly unconditionalLogNegativity: Float64Array;
}

/** Augmented drift [[A, 0], [C, 0]] and diffusion [B; D](N/2)[B; D]ᵀ of the state and the integrated records. */
function augmented(model: StateSpaceModel): { a: Float64Array; q: Float64Array } {
  const n = model.nStates;
  const p = model.nOutputs;
  const m = model.nInputs;
  const na = n + p;
  const a = new Float64Array(na * na);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) a[i * na + j] = model.A[i * n + j];
  for (let i = 0; i < p; i++) for (let j = 0; j < n; j++) a[(n + i) * na + j] = model.C[i * n + j];
  const b = new Float64Array(na * m);
  b.set(model.B.subarray(0, n * m), 0);
  b.set(model.D.subarray(0, p * m), n * m);
  const halfN = model.N.map((x) => 0.5 * x);
  const q = multiply(multiply(b, halfN, na, m, m), transpose(b, na, m), na, m, na);
  return { a, q };
}

/**
 * The filter's covariance recursion as a linear-fractional map (the correlated record noise
 * taken out first): with Φ̃ = Φ − Σ_zy Σ_yy⁻¹ Γ, Σ̃ = Σ_zz − Σ_zy Σ_yy⁻¹ Σ_zyᵀ, G = Γᵀ Σ_yy⁻¹ Γ,
 *   P ← Σ̃ + Φ̃ P (I + G P)⁻¹ Φ̃ᵀ,
 * whose doubling limit is the filter's steady state (undefined when there is none).
 */
function filterSteadyState(d: { phi: Float64Array; gam: Float64Array; szz: Float64Array; szy: Float64Array; syy: Float64Array }, n: number, p: number): Float64Array | undefined {
  let map: RiccatiMap;
  if (p === 0) {
    map = { phi: d.phi, gamma: new Float64Array(n * n), w: d.szz };
  } else {
    const invGam = solve(d.syy, d.gam, p, n); // Σ_yy⁻¹Γ, p×n
    const invSzyT = solve(d.syy, transpose(d.szy, n, p), p, n); // Σ_yy⁻¹Σ_zyᵀ, p×n
    const phi = multiply(d.szy, invGam, n, p, n);
    for (let i = 0; i < n * n; i++) phi[i] = d.phi[i] - phi[i];
    const w = multiply(d.szy, invSzyT, n, p, n);
    for (let i = 0; i < n * n; i++) w[i] = d.szz[i] - w[i];
    const gamma = multiply(transpose(d.gam, p, n), invGam, n, p, n);
    map = { phi, gamma: symmetrize(gamma, n), w: symmetrize(w, n) };
  }
  const limit = doublingLimit(map, n);
  return "failed" in limit ? undefined : limit.w;
}

function outputNames(model: StateSpaceModel): string[] {
  return model.outputs.map((o) => (model.outputs.filter((x) => x.owner === o.owner).length > 1 ? `${o.owner}: ${o.label}` : o.owner));
}

class Run implements TrajectoryRun {
  private readonly n: number;
  private readonly p: number;
  private readonly steps: number;
  private readonly h: number;
  private readonly settings: Required<SimulationSettings>;
  private readonly stored: Int32Array;
  private readonly rng: GaussianSource;
  // Exact step.
  private readonly phi: Float64Array;
  private readonly gam: Float64Array;
  private readonly szz: Float64Array;
  private readonly szy: Float64Array;
  private readonly syy: Float64Array;
  private readonly noise: Factor;
  private readonly stateStep: DiscreteStep;
  private readonly strideMaps = new Map<number, DiscreteStep>();
  // Evolving quantities.
  private z: Float64Array;
  private zHat: Float64Array;
  private cov: Float64Array;
  private gain: Float64Array;
  private unconditionalCov: Float64Array;
  private frozen = false;
  private atSteady = false;
  private readonly steadyCov: Float64Array | undefined;
  private settledAt: number | undefined;
  private marginFresh = false;
  private k = 0;
  private count = 0;
  private stoppedEarly = false;
  private minMargin = Infinity;
  private readonly yAcc: Float64Array;
  private lastStoredStep = 0;
  // Work buffers.
  private readonly g: Float64Array;
  private readonly draw: Float64Array;
  private readonly dy: Float64Array;
  private readonly tmpN: Float64Array;
  private readonly phiP: Float64Array;
  private readonly pGt: Float64Array;
  private readonly sMat: Float64Array;
  private readonly luWork: Float64Array;
  private readonly gainT: Float64Array;
  private readonly piv: Int32Array;
  private readonly nextCov: Float64Array;
  // Series.
  private readonly time: Float64Array;
  private readonly records: Float64Array[];
  private readonly joints: JointTrack[];
  private readonly pairTrack: PairTrack | undefined;

  constructor(
    private readonly model: StateSpaceModel,
    settings: SimulationSettings,
    request: TrajectoryRequest,
  ) {
    const checked = checkSettings(settings);
    const n = model.nStates;
    const p = model.nOutputs;
    if (n === 0) {
      throw new QuietframeError({ path: "components", problem: "the set-up has no modes to simulate", allowed: "a set-up with at least one mechanical, optical or spin mode" });
    }
    if (p > 0) measurementNoise(model); // refuses outputs without noise of their own, naming them
    this.n = n;
    this.p = p;
    this.steps = checked.steps;
    this.h = checked.settings.step;
    this.stored = storedSteps(checked.steps, checked.settings.samples);

    const v0 = initialCovariance(model, checked.settings.initial, checked.initialChosen);
    this.settings = { ...checked.settings, initial: v0.initial };

    const joints = request.joint.map((jv, i): JointTrack => {
      const weights = resolveJointVariable(model, jv, `joint[${i}]`);
      const samples = this.stored.length;
      const parts = Object.entries(jointParts(model, jv, `joint[${i}]`));
      return {
        label: jv.label,
        weights,
        zeroPoint: zeroPointVariance(weights),
        parts,
        truth: new Float64Array(samples),
        estimate: new Float64Array(samples),
        conditional: new Float64Array(samples),
        unconditional: new Float64Array(samples),
        partSeries: parts.map(() => new Float64Array(samples)),
      };
    });
    this.joints = joints;
    if (request.pair) {
      request.pair.forEach((c, i) => findMode(model, { component: c, mode: model.modes.find((m) => m.owner === c)?.label }, `pair[${i}]`));
      if (request.pair[0] === request.pair[1]) {
        throw new QuietframeError({ path: "pair[1]", value: request.pair[1], problem: "entanglement needs two different components", allowed: "two distinct component names that own modes" });
      }
      const s = this.stored.length;
      this.pairTrack = {
        pair: [request.pair[0], request.pair[1]],
        eprX: new Float64Array(s),
        eprP: new Float64Array(s),
        duanSum: new Float64Array(s),
        logNegativity: new Float64Array(s),
        unconditionalLogNegativity: new Float64Array(s),
      };
    }

    const na = n + p;
    const aug = augmented(model);
    const step = discreteStep(aug.a, aug.q, na, this.h);
    this.phi = block(step.phi, na, 0, 0, n, n);
    this.gam = block(step.phi, na, n, 0, p, n);
    this.szz = block(step.w, na, 0, 0, n, n);
    this.szy = block(step.w, na, 0, n, n, p);
    this.syy = block(step.w, na, n, n, p, p);
    this.noise = psdFactor(step.w, na);
    this.stateStep = { phi: this.phi, w: this.szz };
    this.steadyCov = filterSteadyState({ phi: this.phi, gam: this.gam, szz: this.szz, szy: this.szy, syy: this.syy }, n, p);

    this.rng = new GaussianSource(checked.settings.seed);
    this.g = new Float64Array(Math.max(this.noise.r, psdFactor(v0.v, n).r, 1));
    this.draw = new Float64Array(na);
    this.dy = new Float64Array(p);
    this.yAcc = new Float64Array(p);
    this.tmpN = new Float64Array(n);
    this.phiP = new Float64Array(n * n);
    this.pGt = new Float64Array(n * p);
    this.sMat = new Float64Array(p * p);
    this.luWork = new Float64Array(p * p);
    this.gainT = new Float64Array(p * n);
    this.piv = new Int32Array(p);
    this.nextCov = new Float64Array(n * n);
    this.gain = new Float64Array(n * p);

    // Hidden initial state drawn from the initial covariance; the estimate starts at its mean.
    const start = psdFactor(v0.v, n);
    for (let i = 0; i < start.r; i++) this.g[i] = this.rng.normal();
    this.z = new Float64Array(n);
    applyFactor(start, this.g, this.z);
    this.zHat = new Float64Array(n);
    this.cov = Float64Array.from(v0.v);
    this.unconditionalCov = Float64Array.from(v0.v);

    const samples = this.stored.length;
    this.time = new Float64Array(samples);
    this.records = Array.from({ length: p }, () => new Float64Array(samples));
    this.store();
  }

  /** Steps the run will take if not stopped. */
  get plannedSteps(): number {
    return this.steps;
  }

  get progress(): number {
    return this.steps === 0 ? 1 : this.k / this.steps;
  }

  get done(): boolean {
    return this.stoppedEarly || this.k >= this.steps;
  }

  advance(maxSteps: number): boolean {
    const limit = Math.max(0, Math.floor(maxSteps));
    for (let i = 0; i < limit && !this.done; i++) {
      this.step();
      this.k++;
      if (this.count < this.stored.length && this.k === this.stored[this.count]) this.store();
    }
    return this.done;
  }

  stop(): void {
    this.stoppedEarly = true;
  }

  /** One exact step of the hidden state, its records and the filter. */
  private step(): void {
    const { n, p, phi, gam, z, zHat, draw, dy, tmpN } = this;
    for (let i = 0; i < this.noise.r; i++) this.g[i] = this.rng.normal();
    applyFactor(this.noise, this.g, draw);
    // Records of this step from the state at its start, then the state moves on.
    for (let i = 0; i < p; i++) {
      let s = draw[n + i];
      for (let j = 0; j < n; j++) s += gam[i * n + j] * z[j];
      dy[i] = s;
      this.yAcc[i] += s;
    }
    for (let i = 0; i < n; i++) {
      let s = draw[i];
      for (let j = 0; j < n; j++) s += phi[i * n + j] * z[j];
      tmpN[i] = s;
    }
    z.set(tmpN);

    if (!this.frozen) this.updateCovariance();
    // Estimate: ẑ ← Φ ẑ + K (Δy − Γ ẑ).
    for (let i = 0; i < p; i++) {
      let s = dy[i];
      for (let j = 0; j < n; j++) s -= gam[i * n + j] * zHat[j];
      dy[i] = s;
    }
    for (let i = 0; i < n; i++) {
      let s = 0;
      for (let j = 0; j < n; j++) s += phi[i * n + j] * zHat[j];
      for (let l = 0; l < p; l++) s += this.gain[i * p + l] * dy[l];
      tmpN[i] = s;
    }
    zHat.set(tmpN);
  }

  /** Gain K from the prior covariance, then P ← Φ P Φᵀ + Σ_zz − K S Kᵀ. */
  private updateCovariance(): void {
    const { n, p, phi, gam, cov, phiP, pGt, sMat, luWork, piv, nextCov, gain } = this;
    // ΦP
    phiP.fill(0);
    for (let i = 0; i < n; i++) {
      for (let l = 0; l < n; l++) {
        const x = phi[i * n + l];
        if (x === 0) continue;
        for (let j = 0; j < n; j++) phiP[i * n + j] += x * cov[l * n + j];
      }
    }
    // ΦPΦᵀ + Σ_zz
    for (let i = 0; i < n; i++) {
      for (let j = i; j < n; j++) {
        let s = this.szz[i * n + j];
        for (let l = 0; l < n; l++) s += phiP[i * n + l] * phi[j * n + l];
        nextCov[i * n + j] = s;
      }
    }
    if (p > 0) {
      // PΓᵀ, S = Γ P Γᵀ + Σ_yy, and M = Φ P Γᵀ + Σ_zy (kept in `gain` until divided by S).
      for (let i = 0; i < n; i++) {
        for (let l = 0; l < p; l++) {
          let s = 0;
          for (let j = 0; j < n; j++) s += cov[i * n + j] * gam[l * n + j];
          pGt[i * p + l] = s;
        }
      }
      for (let a = 0; a < p; a++) {
        for (let b = 0; b < p; b++) {
          let s = this.syy[a * p + b];
          for (let j = 0; j < n; j++) s += gam[a * n + j] * pGt[j * p + b];
          sMat[a * p + b] = s;
        }
      }
      for (let a = 0; a < p; a++) for (let b = a + 1; b < p; b++) sMat[a * p + b] = sMat[b * p + a] = 0.5 * (sMat[a * p + b] + sMat[b * p + a]);
      for (let i = 0; i < n; i++) {
        for (let l = 0; l < p; l++) {
          let s = this.szy[i * p + l];
          for (let j = 0; j < n; j++) s += phi[i * n + j] * pGt[j * p + l];
          gain[i * p + l] = s;
        }
      }
      // K = M S⁻¹: solve S Kᵀ = Mᵀ (S symmetric).
      const lu = luWork;
      lu.set(sMat);
      realLuFactor(lu, p, piv);
      const mt = this.gainT;
      for (let i = 0; i < n; i++) for (let l = 0; l < p; l++) mt[l * n + i] = gain[i * p + l];
      realLuSolve(lu, p, piv, mt, n);
      for (let i = 0; i < n; i++) for (let l = 0; l < p; l++) gain[i * p + l] = mt[l * n + i];
      // − K S Kᵀ
      for (let i = 0; i < n; i++) {
        for (let j = i; j < n; j++) {
          let s = 0;
          for (let a = 0; a < p; a++) {
            let ks = 0;
            for (let b = 0; b < p; b++) ks += gain[i * p + a] * sMat[a * p + b] * gain[j * p + b];
            s += ks;
          }
          nextCov[i * n + j] -= s;
        }
      }
    }
    // P reached the steady state last step: the gain just computed from it is kept from now on.
    if (this.atSteady) {
      this.frozen = true;
      return;
    }
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) nextCov[j * n + i] = nextCov[i * n + j];
    this.marginFresh = false;
    cov.set(nextCov);
    if (this.steadyCov && relativeChange(this.steadyCov, nextCov, n) <= FILTER_SETTLED) {
      this.atSteady = true;
      this.settledAt = this.k + 1;
    }
  }

  /** Stores the current point (index this.count). */
  private store(): void {
    const j = this.count;
    const { n, model } = this;
    this.time[j] = this.k * this.h;
    if (j > 0) {
      const dt = (this.k - this.lastStoredStep) * this.h;
      for (let i = 0; i < this.p; i++) {
        this.records[i][j] = this.yAcc[i] / dt;
        this.yAcc[i] = 0;
      }
      const stride = this.k - this.lastStoredStep;
      let map = this.strideMaps.get(stride);
      if (!map) {
        map = repeatStep(this.stateStep, stride, n);
        this.strideMaps.set(stride, map);
      }
      const u = congruence(map.phi, this.unconditionalCov, n);
      for (let i = 0; i < u.length; i++) u[i] += map.w[i];
      this.unconditionalCov = u;
    }
    this.lastStoredStep = this.k;
    for (const t of this.joints) {
      let truth = 0;
      let estimate = 0;
      for (let i = 0; i < n; i++) {
        truth += t.weights[i] * this.z[i];
        estimate += t.weights[i] * this.zHat[i];
      }
      t.truth[j] = truth;
      t.estimate[j] = estimate;
      t.conditional[j] = jointVariance(this.cov, t.weights);
      t.unconditional[j] = jointVariance(this.unconditionalCov, t.weights);
      t.parts.forEach(([, w], i) => (t.partSeries[i][j] = jointVariance(this.cov, w)));
    }
    if (this.pairTrack) {
      const e = this.pairTrack;
      const pc = modePairCovariance(model, this.cov, e.pair[0], e.pair[1]);
      const epr = eprVariances(pc);
      e.eprX[j] = epr.x;
      e.eprP[j] = epr.p;
      e.duanSum[j] = duanSum(pc);
      e.logNegativity[j] = logarithmicNegativity(pc);
      e.unconditionalLogNegativity[j] = logarithmicNegativity(modePairCovariance(model, this.unconditionalCov, e.pair[0], e.pair[1]));
    }
    if (!this.marginFresh) {
      this.minMargin = Math.min(this.minMargin, fastUncertaintyMargin(model.modes, this.cov, n));
      this.marginFresh = true;
    }
    // A growing mode overflows somewhere first; nothing non-finite may reach a plot.
    if (![this.z, this.zHat, this.cov, this.unconditionalCov].every((a) => Number.isFinite(maxAbs(a)))) throw overflow(this.k, this.h);
    this.count++;
  }

  result(): TrajectoryResult {
    const c = this.count;
    const cut = (a: Float64Array): Float64Array => a.slice(0, c);
    const names = outputNames(this.model);
    const records = this.records.map((values, i) => {
      const v = cut(values);
      // No interval ends at t = 0: show the first interval's average there.
      if (c > 1) v[0] = v[1];
      return { output: names[i], values: v };
    });
    const joint: JointSeries[] = this.joints.map((t) => ({
      label: t.label,
      truth: cut(t.truth),
      estimate: cut(t.estimate),
      conditional: cut(t.conditional),
      unconditional: cut(t.unconditional),
      zeroPoint: t.zeroPoint,
      parts: Object.fromEntries(t.parts.map(([name], i) => [name, cut(t.partSeries[i])])),
    }));
    let entanglement: EntanglementSeries | undefined;
    if (this.pairTrack) {
      const e = this.pairTrack;
      entanglement = {
        pair: e.pair,
        eprX: cut(e.eprX),
        eprP: cut(e.eprP),
        duanSum: cut(e.duanSum),
        duanBound: duanBound(),
        logNegativity: cut(e.logNegativity),
        unconditionalLogNegativity: cut(e.unconditionalLogNegativity),
      };
    }
    return {
      settings: this.settings,
      time: cut(this.time),
      stepsTaken: this.k,
      stepsPlanned: this.steps,
      stopped: this.stoppedEarly && this.k < this.steps,
      records,
      joint,
      ...(entanglement ? { entanglement } : {}),
      minUncertaintyMargin: this.minMargin,
      ...(this.settledAt !== undefined ? { filterSettledAtStep: this.settledAt } : {}),
    };
  }
}

function overflow(step: number, h: number): QuietframeError {
  return new QuietframeError({
    path: "simulation.duration",
    value: step * h,
    problem: `the simulated state left the floating-point range after ${step} steps (${step * h} s): the set-up has a growing mode`,
    allowed: "a shorter duration, or a stable set-up (see the stability report)",
  });
}

/** The initial covariance: the stationary state when asked for (or when left open and it exists), else the ground state. */
function initialCovariance(
  model: StateSpaceModel,
  initial: "stationary" | "ground",
  chosenByEngine: boolean,
): { v: Float64Array; initial: "stationary" | "ground" } {
  if (initial === "ground") return { v: groundCovariance(model), initial };
  try {
    return { v: stationaryCovariance(model), initial };
  } catch (e) {
    if (chosenByEngine) return { v: groundCovariance(model), initial: "ground" };
    throw new QuietframeError({
      path: "simulation.initial",
      value: "stationary",
      problem: `the set-up has no stationary state (${e instanceof Error ? e.message : String(e)})`,
      allowed: "\"ground\" for a set-up with undamped or growing modes (a free mass)",
    });
  }
}

/** Starts a run that a UI can advance in slices. */
export function startTrajectory(model: StateSpaceModel, settings: SimulationSettings, request: TrajectoryRequest): TrajectoryRun {
  return new Run(model, settings, request);
}

/** Runs to the end, reporting progress (0 … 1) about a hundred times. */
export function simulateTrajectory(
  model: StateSpaceModel,
  settings: SimulationSettings,
  request: TrajectoryRequest,
  onProgress?: (fraction: number) => void,
): TrajectoryResult {
  const run = new Run(model, settings, request);
  const chunk = Math.max(1000, Math.ceil(run.plannedSteps / 100));
  while (!run.advance(chunk)) onProgress?.(run.progress);
  onProgress?.(1);
  return run.result();
}
