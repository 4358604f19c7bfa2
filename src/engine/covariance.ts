/**
 * Covariances of the model's states: the stationary one (Lyapunov), the diffusion matrix
 * it is built from, and the uncertainty-relation margin that says whether a covariance
 * belongs to a physical state.
 */
import { hermitianEmbedding, minEigenvalueHermitian, smallestSymmetricEigenvalue, solveLyapunov } from "../linalg";
import type { ModeInfo, StateSpaceModel } from "../network/model";

/**
 * Stationary covariance of the states, V_ij = ⟨{z_i, z_j}⟩/2, from
 *   A V + V Aᵀ + B (N/2) Bᵀ = 0,
 * where N/2 appears because N holds one-sided spectral densities: the white inputs have
 * symmetrized correlation (N/2) δ(t − t'). Needs a stable A.
 */
export function stationaryCovariance(model: StateSpaceModel): Float64Array {
  return solveLyapunov(model.A, diffusionMatrix(model), model.nStates);
}

/** Q = B (N/2) Bᵀ. */
export function diffusionMatrix(model: StateSpaceModel): Float64Array {
  const n = model.nStates;
  const m = model.nInputs;
  const bn = new Float64Array(n * m);
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < m; k++) {
      const b = model.B[i * m + k];
      if (b === 0) continue;
      for (let j = 0; j < m; j++) bn[i * m + j] += b * model.N[k * m + j] * 0.5;
    }
  }
  const q = new Float64Array(n * n);
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
function halfSymplecticForm(modes: readonly Pick<ModeInfo, "x" | "p">[], n: number): Float64Array {
  const im = new Float64Array(n * n);
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

/** Rounding in the Lyapunov solve is about this fraction of the largest variance. */
const PHYSICALITY_TOLERANCE = 1e-9;

/** Checks that the stationary state obeys the uncertainty relation; a violation means the model left its validity range. */
export function checkPhysicality(model: StateSpaceModel): PhysicalityReport {
  const v = stationaryCovariance(model);
  const n = model.nStates;
  let largestVariance = 0;
  for (let i = 0; i < n; i++) largestVariance = Math.max(largestVariance, v[i * n + i]);
  const margin = n > 0 ? uncertaintyMargin(model, v) : 0;
  const physical = margin >= -PHYSICALITY_TOLERANCE * largestVariance;
  const summary = physical
    ? "the stationary state satisfies the uncertainty relation"
    : `the stationary state violates the uncertainty relation (smallest eigenvalue of V + iΣ/2 is ${margin.toPrecision(3)}): ` +
      `viscous damping is not a valid quantum model at low Q and low temperature; use damping "symmetric" there`;
  return { margin, largestVariance, physical, summary };
}
