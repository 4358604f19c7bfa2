/**
 * Covariances of the model's states: the stationary one (Lyapunov), the diffusion matrix
 * it is built from, and the uncertainty-relation margin that says whether a covariance
 * belongs to a physical state.
 */
import { hermitianEmbedding, minEigenvalueHermitian, shiftedPositiveDefinite, smallestSymmetricEigenvalue, solveLyapunov, WorkArray } from "../linalg";
import type { ModeInfo, StateSpaceModel } from "../network/model";
import { QuietframeError } from "../errors";

// Work arrays of checkPhysicality, which runs once per prepared value set: B·N/2, the diffusion matrix, Σ/2.
const productWork = new WorkArray();
const diffusionWork = new WorkArray();
const symplecticWork = new WorkArray();

/**
 * Stationary covariance of the states, V_ij = ⟨{z_i, z_j}⟩/2, from
 *   A V + V Aᵀ + B (N/2) Bᵀ = 0,
 * where N/2 appears because N holds one-sided spectral densities: the white inputs have
 * symmetrized correlation (N/2) δ(t − t'). Needs a stable A.
 */
export function stationaryCovariance(model: StateSpaceModel): Float64Array {
  return solveLyapunov(model.A, diffusionMatrix(model), model.nStates);
}

/**
 * Q = B (N/2) Bᵀ. Needs white inputs only: a classical noise term has a spectrum of its own,
 * which no constant diffusion matrix represents, so a model with one is refused here (and with
 * it every time-domain pass) rather than given a wrong covariance.
 */
export function diffusionMatrix(model: StateSpaceModel): Float64Array {
  const classical = model.classicalInputs ?? [];
  if (classical.length) {
    throw new QuietframeError({
      path: "classicalNoise",
      value: classical.map((c) => c.owner).join(", "),
      problem: "classical noise terms are spectra, not white noise, so the time-domain passes (stationary covariance, trajectories, entanglement of the state) cannot take them",
      allowed: "noise budgets, figures of merit and reach with classical terms; time-domain results for the set-up without its classicalNoise list",
    });
  }
  return whiteDiffusionMatrix(model);
}

/** B (N/2) Bᵀ into `q` (n×n zeros; a new array unless given). */
function whiteDiffusionMatrix(model: StateSpaceModel, q = new Float64Array(model.nStates * model.nStates)): Float64Array {
  const n = model.nStates;
  const m = model.nInputs;
  const bn = productWork.zeros(n * m);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < m; k++) {
      const b = model.B[i * m + k];
      if (b === 0) continue;
      for (let j = 0; j < m; j++) bn[i * m + j] += b * model.N[k * m + j] * 0.5;
    }
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let k = 0; k < m; k++) s += bn[i * m + k] * model.B[j * m + k];
      q[i * n + j] = s;
    }
  }
  return q;
}

/**
 * Smallest eigenvalue of V + (i/2)Σ, with Σ the symplectic form of the model's conjugate
 * pairs ([x, p] = i). A physical Gaussian state has it ≥ 0 (uncertainty relation); the
 * value is in units of the quadrature variance (vacuum: V = 1/2).
 */
export function uncertaintyMargin(model: StateSpaceModel, v: Float64Array): number {
  return minEigenvalueHermitian(v, halfSymplecticForm(model.modes, model.nStates), model.nStates);
}

/**
 * The same margin by the faster smallest-eigenvalue solver (tridiagonalization and
 * bisection instead of Jacobi), for a trajectory that checks it at every stored point.
 */
export function fastUncertaintyMargin(modes: readonly Pick<ModeInfo, "x" | "p">[], v: ArrayLike<number>, n: number): number {
  return smallestSymmetricEigenvalue(hermitianEmbedding(v, halfSymplecticForm(modes, n), n), 2 * n);
}

/** Σ/2: +1/2 at (x, p) and −1/2 at (p, x) of each conjugate pair ([x, p] = i). */
/** The model with its classical inputs' placeholder noise set to zero. */
function withoutClassicalInputs(model: StateSpaceModel): StateSpaceModel {
  const classical = model.classicalInputs ?? [];
  if (!classical.length) return model;
  const N = model.N.slice();
  for (const c of classical) N[c.column * model.nInputs + c.column] = 0;
  return { ...model, N };
}

/** Σ/2 into `im` (n×n zeros; a new array unless given). */
function halfSymplecticForm(modes: readonly Pick<ModeInfo, "x" | "p">[], n: number, im = new Float64Array(n * n)): Float64Array {
  for (const mode of modes) {
    im[mode.x * n + mode.p] = 0.5;
    im[mode.p * n + mode.x] = -0.5;
  }
  return im;
}

export interface PhysicalityReport {
  /** Smallest eigenvalue of V + iΣ/2 (quadrature-variance units). */
  readonly margin: number;
  /** Largest state variance, the scale against which the margin is judged. */
  readonly largestVariance: number;
  readonly physical: boolean;
  readonly summary: string;
}

const PHYSICAL_SUMMARY = "the stationary state satisfies the uncertainty relation";

/** Rounding in the Lyapunov solve is about this fraction of the largest variance. */
const PHYSICALITY_TOLERANCE = 1e-9;

/** Checks that the stationary state obeys the uncertainty relation; a violation means the model left its validity range. */
export function checkPhysicality(model: StateSpaceModel): PhysicalityReport {
  // The uncertainty relation concerns the quantum noise: classical terms (which can only add
  // to the covariance) are left out, so a set-up with them is checked as well as one without.
  const v = solveLyapunov(model.A, whiteDiffusionMatrix(withoutClassicalInputs(model), diffusionWork.zeros(model.nStates * model.nStates)), model.nStates);
  const n = model.nStates;
  let largestVariance = 0;
  for (let i = 0; i < n; i++) largestVariance = Math.max(largestVariance, v[i * n + i]);
  const tolerance = PHYSICALITY_TOLERANCE * largestVariance;
  // Most set-ups are plainly physical: a Cholesky factorisation of V + iΣ/2 + (tolerance/2)·I
  // shows that without eigenvalues (its backward error, below 1e-10 of the largest variance up
  // to the 40 states the Lyapunov solve takes, is far inside the other half of the tolerance), so
  // the smallest eigenvalue, the same number as always, is computed when it is read.
  if (n > 0 && shiftedPositiveDefinite(v, halfSymplecticForm(model.modes, n, symplecticWork.zeros(n * n)), n, tolerance / 2)) {
    return new PlainlyPhysical(model, v, largestVariance);
  }
  const margin = n > 0 ? uncertaintyMargin(model, v) : 0;
  const physical = margin >= -tolerance;
  const summary = physical
    ? PHYSICAL_SUMMARY
    : `the stationary state violates the uncertainty relation (smallest eigenvalue of V + iΣ/2 is ${margin.toPrecision(3)}): ` +
      `viscous damping is not a valid quantum model at low Q and low temperature; use damping "symmetric" there`;
  return { margin, largestVariance, physical, summary };
}

/**
 * The report of a plainly physical state, its margin computed when read (a class: see
 * docs/performance.md on getters).
 */
class PlainlyPhysical implements PhysicalityReport {
  readonly physical = true;
  readonly summary = PHYSICAL_SUMMARY;
  readonly #model: StateSpaceModel;
  readonly #covariance: Float64Array;
  #margin: number | undefined;

  constructor(
    model: StateSpaceModel,
    covariance: Float64Array,
    readonly largestVariance: number,
  ) {
    this.#model = model;
    this.#covariance = covariance;
  }

  get margin(): number {
    return (this.#margin ??= uncertaintyMargin(this.#model, this.#covariance));
  }

  /** In JSON as a plain object would be, margin included. */
  toJSON(): PhysicalityReport {
    const { margin, largestVariance, physical, summary } = this;
    return { margin, largestVariance, physical, summary };
  }
}
