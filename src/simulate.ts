import type { PreparedSetup } from "./prepare";
import { simulateTrajectory, startTrajectory, type SimulationSettings, type TrajectoryRequest, type TrajectoryResult, type TrajectoryRun } from "./timedomain";

/**
 * The time-domain pass of the pipeline: a prepared set-up followed in time (seeded
 * trajectories with the matching Kalman filter). Settings and request are checked by the
 * time-domain engine with the field's path (`simulation.step`, `joint[0].terms[1].component`, …).
 */

/** Starts a run that a UI advances in slices (`advance(maxSteps)`, `stop()`); no step is taken yet. */
export function startSimulation(prepared: PreparedSetup, settings: SimulationSettings, request: TrajectoryRequest): TrajectoryRun {
  return startTrajectory(prepared.assembled.model, settings, request);
}

/** Runs to the end in one call, reporting progress (0 … 1) about a hundred times. */
export function simulate(prepared: PreparedSetup, settings: SimulationSettings, request: TrajectoryRequest, onProgress?: (fraction: number) => void): TrajectoryResult {
  return simulateTrajectory(prepared.assembled.model, settings, request, onProgress);
}
