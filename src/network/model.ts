/**
 * The state-space form every set-up is assembled into (one-sided, symmetrized conventions):
 *
 *   dz/dt = A z + B w + b_s s,     y = C z + D w + d_s s
 *
 * z: dimensionless quadratures in conjugate pairs with [X, P] = i (ground-state variance 1/2);
 * w: white inputs whose one-sided (cross-)spectral densities form the constant real symmetric
 * matrix N (vacuum = 1); s: the signal in SI units (newtons, strain, ...).
 * Fourier convention z(t) = ∫ z(Ω) e^{-iΩt} dΩ/2π, so d/dt → −iΩ and
 * H(Ω) = C (−iΩ I − A)^{-1} B + D.
 */
export interface StateSpaceModel {
  readonly nStates: number;
  readonly nInputs: number;
  readonly nOutputs: number;
  /** Row-major n×n. */
  readonly A: Float64Array;
  /** Row-major n×m. */
  readonly B: Float64Array;
  /** Row-major p×n. */
  readonly C: Float64Array;
  /** Row-major p×m. */
  readonly D: Float64Array;
  /** Row-major m×m, one-sided spectral densities of the white inputs. */
  readonly N: Float64Array;
  /** Signal column into the states (length n) and into the outputs (length p). */
  readonly signalB: Float64Array;
  readonly signalD: Float64Array;
  readonly modes: readonly ModeInfo[];
  readonly inputs: readonly InputInfo[];
  readonly groups: readonly NoiseGroup[];
  readonly outputs: readonly OutputInfo[];
  /**
   * The forces of light on bodies (radiation pressure, spin-readout back-action), present when
   * the set-up has any: their terms of A and B alone, and A and B without them (restA, restB).
   * Light's path to a detector through the rest is its imprecision; its path through these
   * forces and the bodies' motion is its back-action.
   */
  readonly lightForce?: { readonly A: Float64Array; readonly B: Float64Array; readonly restA: Float64Array; readonly restB: Float64Array };
}

export const MODE_KINDS = ["mechanical", "optical", "spin"] as const;
export type ModeKind = (typeof MODE_KINDS)[number];

/** One bosonic mode: a conjugate pair of states (x, p) with [x, p] = i. */
export interface ModeInfo {
  readonly owner: string;
  readonly kind: ModeKind;
  readonly label: string;
  /** Index of the position-like (amplitude) quadrature. */
  readonly x: number;
  /** Index of the momentum-like (phase) quadrature. */
  readonly p: number;
}

export interface InputInfo {
  readonly owner: string;
  readonly label: string;
}

/**
 * Inputs that are correlated with each other form one group; different groups are
 * uncorrelated, so the output spectrum is the sum of the groups' contributions.
 */
export interface NoiseGroup {
  readonly id: string;
  readonly owner: string;
  readonly label: string;
  /** What the noise physically is, for legends and budgets. */
  readonly category: NoiseCategory;
  readonly columns: readonly number[];
}

export const NOISE_CATEGORIES = ["quantum-light", "loss", "thermal", "technical"] as const;
export type NoiseCategory = (typeof NOISE_CATEGORIES)[number];

export interface OutputInfo {
  /** Name of the detector component that produces this output. */
  readonly owner: string;
  readonly label: string;
}
