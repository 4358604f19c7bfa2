/**
 * Shapes shared by the time-domain engine (covariances, filter, trajectories) and the
 * widgets that show it. Units: time in seconds; states are the model's dimensionless
 * quadratures ([x, p] = i, ground-state variance 1/2), so every variance below is in
 * those units and the zero-point level of a single quadrature is 1/2.
 */

/** One quadrature of one mode, named by the component that owns the mode. */
export interface QuadratureRef {
  /** Component name (ModeInfo.owner). */
  readonly component: string;
  /** Mode label (ModeInfo.label); needed only when the component owns several modes. */
  readonly mode?: string;
  readonly quadrature: "x" | "p";
}

/** A joint variable Σ weight·quadrature, e.g. x_probe + x_reference. */
export interface JointVariable {
  readonly label: string;
  readonly terms: readonly (QuadratureRef & { readonly weight: number })[];
}

/** Where the simulation starts. */
export type InitialState =
  /** The unconditional stationary state (Lyapunov); conditioning starts at t = 0. */
  | "stationary"
  /** Every mode in its ground state (covariance I/2). */
  | "ground";

export interface SimulationSettings {
  /** Simulated time, s (≥ step); rounded up to a whole number of steps (the result's settings show the value used). */
  readonly duration: number;
  /** Integration step, s (> 0, ≤ duration). */
  readonly step: number;
  /** Seed of the pseudo-random generator (integer 0 … 2³²−1); same seed, same bits. */
  readonly seed: number;
  /** Number of stored time points (decimation of the steps), 2 … 10⁵; default min(steps + 1, 2001); at most steps + 1 are kept. */
  readonly samples?: number;
  readonly initial?: InitialState;
}

/** What to follow along the run. */
export interface TrajectoryRequest {
  readonly joint: readonly JointVariable[];
  /** Two components whose modes' entanglement is followed over time. */
  readonly pair?: readonly [string, string];
}

/** Per joint variable, on the stored time points. */
export interface JointSeries {
  readonly label: string;
  /** The hidden (true) value of the simulated system. */
  readonly truth: Float64Array;
  /**
   * Conditional mean: the Kalman filter of the exactly discretized model reading the
   * simulated records (the Kalman–Bucy estimate as the step → 0).
   */
  readonly estimate: Float64Array;
  /**
   * Conditional variance: that filter's error covariance (the Riccati solution as the step → 0,
   * never below it); the ±1σ band is estimate ± √conditional.
   */
  readonly conditional: Float64Array;
  /** Unconditional variance (transient Lyapunov from the initial state). */
  readonly unconditional: Float64Array;
  /** Zero-point variance of this combination: Σ weight² / 2. */
  readonly zeroPoint: number;
  /**
   * Conditional variance of each system's part of the combination alone
   * (the terms that belong to one component), keyed by component name.
   */
  readonly parts: Readonly<Record<string, Float64Array>>;
}

/** Entanglement measures of the requested pair over time, from the conditional covariance. */
export interface EntanglementSeries {
  readonly pair: readonly [string, string];
  readonly eprX: Float64Array;
  readonly eprP: Float64Array;
  readonly duanSum: Float64Array;
  readonly duanBound: number;
  /** ebits */
  readonly logNegativity: Float64Array;
  /** The same measures from the unconditional covariance, for comparison. */
  readonly unconditionalLogNegativity: Float64Array;
}

export interface TrajectoryResult {
  readonly settings: Required<SimulationSettings>;
  /** Stored time points, s. */
  readonly time: Float64Array;
  /** Steps actually taken (less than planned when the run was stopped). */
  readonly stepsTaken: number;
  readonly stepsPlanned: number;
  readonly stopped: boolean;
  /** Measurement records per detector output: Δy/Δt averaged over each stored interval. */
  readonly records: readonly { readonly output: string; readonly values: Float64Array }[];
  readonly joint: readonly JointSeries[];
  readonly entanglement?: EntanglementSeries;
  /** Smallest uncertainty margin (min eigenvalue of V + iΣ/2) met by any conditional covariance. */
  readonly minUncertaintyMargin: number;
  /**
   * Step after which the filter's covariance no longer changed (its steady state; later steps
   * reuse one gain), or undefined if it was still settling when the run ended.
   */
  readonly filterSettledAtStep?: number;
}

/** A run that can be advanced in slices (for progress bars and a stop button). */
export interface TrajectoryRun {
  /** Fraction of the planned steps done, 0 … 1. */
  readonly progress: number;
  readonly done: boolean;
  /** Takes up to `maxSteps` steps; returns true when the run has finished. */
  advance(maxSteps: number): boolean;
  /** Stops early; result() then covers the steps taken. */
  stop(): void;
  result(): TrajectoryResult;
}
