/**
 * Exact discretization of a simulated run: the hidden state and its integrated homodyne
 * records, sampled over each step with the right statistics for any step length.
 *
 * The state and the integrated records y(t) = ∫ dy obey the joint linear SDE
 * d[z; y] = [[A, 0], [C, 0]] [z; y] dt + [B; D] dw, so over a step h (discretize.ts, Van Loan):
 *   z_{k+1} = Φ z_k + ξ_k,   Δy_k = Γ z_k + η_k,   (ξ_k, η_k) ~ N(0, Σ),
 * with Φ = e^{Ah}, Γ = ∫₀ʰ C e^{As} ds and Σ the joint covariance of the state noise and the
 * record noise gathered over the step (correlated whenever the light that carries the
 * record also pushes the system). No Euler error: any step gives the right statistics at
 * the step times.
 */
import { applyFactor, psdFactor, type Factor } from "../linalg/psd-factor";
import { block, congruence, multiply, transpose } from "../linalg/real-matrix";
import type { StateSpaceModel } from "../network/model";
import { discreteStep, repeatStep, type DiscreteStep } from "./discretize";
import type { GaussianSource } from "./random";

/** The blocks of one exact step of state (n) and records (p). */
export interface ExactStep {
  readonly n: number;
  readonly p: number;
  /** Φ = e^{Ah}, n×n. */
  readonly phi: Float64Array;
  /** Γ = ∫₀ʰ C e^{As} ds, p×n. */
  readonly gam: Float64Array;
  /** Σ_zz, n×n: state noise gathered over the step. */
  readonly szz: Float64Array;
  /** Σ_zy, n×p: its correlation with the record noise. */
  readonly szy: Float64Array;
  /** Σ_yy, p×p: record noise. */
  readonly syy: Float64Array;
  /** Square-root factor of the joint (n+p)×(n+p) noise covariance, for drawing it. */
  readonly noise: Factor;
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

/** The exact step of the model's state and records over h seconds. */
export function exactStep(model: StateSpaceModel, h: number): ExactStep {
  const n = model.nStates;
  const p = model.nOutputs;
  const na = n + p;
  const aug = augmented(model);
  const step = discreteStep(aug.a, aug.q, na, h);
  return {
    n,
    p,
    phi: block(step.phi, na, 0, 0, n, n),
    gam: block(step.phi, na, n, 0, p, n),
    szz: block(step.w, na, 0, 0, n, n),
    szy: block(step.w, na, 0, n, n, p),
    syy: block(step.w, na, n, n, p, p),
    noise: psdFactor(step.w, na),
  };
}

/** A hidden state drawn from the covariance v0 (n×n), the estimate's prior having mean 0. */
export function drawInitialState(v0: ArrayLike<number>, n: number, rng: GaussianSource): Float64Array {
  const start = psdFactor(v0, n);
  const g = new Float64Array(start.r);
  for (let i = 0; i < start.r; i++) g[i] = rng.normal();
  const z = new Float64Array(n);
  applyFactor(start, g, z);
  return z;
}

/** The simulated truth: the hidden state, moved on by exact steps with drawn noise. */
export class HiddenState {
  /** Record increments Δy of the latest step (p). */
  readonly dy: Float64Array;
  private readonly g: Float64Array;
  private readonly draw: Float64Array;
  private readonly next: Float64Array;

  constructor(
    private readonly step: ExactStep,
    /** The hidden state z (n), updated in place. */
    readonly z: Float64Array,
  ) {
    this.g = new Float64Array(Math.max(step.noise.r, 1));
    this.draw = new Float64Array(step.n + step.p);
    this.dy = new Float64Array(step.p);
    this.next = new Float64Array(step.n);
  }

  /** One step: the records from the state at its start, then the state moves on. */
  advance(rng: GaussianSource): void {
    const { n, p, phi, gam, noise } = this.step;
    const { z, g, draw, dy, next } = this;
    for (let i = 0; i < noise.r; i++) g[i] = rng.normal();
    applyFactor(noise, g, draw);
    for (let i = 0; i < p; i++) {
      let s = draw[n + i];
      for (let j = 0; j < n; j++) s += gam[i * n + j] * z[j];
      dy[i] = s;
    }
    for (let i = 0; i < n; i++) {
      let s = draw[i];
      for (let j = 0; j < n; j++) s += phi[i * n + j] * z[j];
      next[i] = s;
    }
    z.set(next);
  }
}

/**
 * The unconditional covariance at the stored points, moved on by the exact step repeated
 * over each stride (one map per distinct stride, by binary powering).
 */
export class UnconditionalCovariance {
  private cov: Float64Array;
  private readonly n: number;
  private readonly stateStep: DiscreteStep;
  private readonly strideMaps = new Map<number, DiscreteStep>();

  constructor(step: ExactStep, v0: ArrayLike<number>) {
    this.n = step.n;
    this.stateStep = { phi: step.phi, w: step.szz };
    this.cov = Float64Array.from(v0);
  }

  get value(): Float64Array {
    return this.cov;
  }

  /** V ← Φ_s V Φ_sᵀ + W_s for the step repeated `stride` times. */
  advance(stride: number): void {
    const n = this.n;
    let map = this.strideMaps.get(stride);
    if (!map) {
      map = repeatStep(this.stateStep, stride, n);
      this.strideMaps.set(stride, map);
    }
    const u = congruence(map.phi, this.cov, n);
    for (let i = 0; i < u.length; i++) u[i] += map.w[i];
    this.cov = u;
  }
}
