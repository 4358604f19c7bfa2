/** The trajectory widget's state format. */
import type { SetupDescription, InitialState, JointVariable } from "../../src/index";
import type { ControlSpec } from "../core/controls/control-spec";

/**
 * The state of a trajectory widget: everything needed to run the same simulation again and
 * get the same bits (set-up, control values, seed, step, duration, stored points, initial
 * state, and where a stopped run ended). It travels inside a Jupyter widget-state document.
 */
export const TRAJECTORY_STATE_FORMAT = "quietframe.trajectory";
export const TRAJECTORY_STATE_VERSION = 1;
export const TRAJECTORY_MODEL_NAME = "TrajectoryWidgetModel";

export const INITIAL_STATES = ["stationary", "ground"] as const satisfies readonly InitialState[];

/** Simulation settings as a user writes them: times with their units ("200 us") or seconds as numbers. */
export interface SimulationSpec {
  /** Simulated time (> 0), e.g. "200 us". */
  duration: string | number;
  /** Integration step (> 0, ≤ duration), e.g. "10 ns". */
  step: string | number;
  /** Seed of the pseudo-random generator: an integer 0 … 2³²−1. */
  seed: number;
  /** Stored time points, 2 … 20001 (default min(steps + 1, 2001)). */
  samples?: number;
  /** Where the run starts (default "stationary"). */
  initial?: InitialState;
  /** Steps after which the run was stopped by the reader; absent or null for a complete run. */
  stoppedAfter?: number | null;
}

export interface TrajectoryState {
  format: typeof TRAJECTORY_STATE_FORMAT;
  version: number;
  /** quietframe version that computed the fingerprint. */
  quietframe: string;
  setup: SetupDescription;
  controls: ControlSpec[];
  /** Current value of each control, keyed by target, written as in a set-up ("6 K"). */
  values: Record<string, string | number>;
  simulation: SimulationSpec;
  /** Joint variables followed along the run (at least one). */
  joint: JointVariable[];
  /** Two components whose entanglement is followed, or null. */
  pair: [string, string] | null;
  /** Title shown above the widget; defaults to the set-up's name. */
  title?: string;
  /** "sha256:<hex>" of the simulated curves (see fingerprint.ts). */
  fingerprint: string;
}
