/** The time-domain engine: covariances over time, the measured (conditional) state, simulated runs. */
export * from "./types";
export { stationaryCovariance } from "../engine/covariance";
export { groundCovariance, transientCovariance } from "./transient";
export { conditionalSteadyState, conditionalTransient, riccatiResidual } from "./riccati";
export { resolveJointVariable, jointVariance } from "./joint";
export { startTrajectory, simulateTrajectory } from "./trajectory";
export { MAX_STEPS, MAX_SAMPLES, MIN_SAMPLES, DEFAULT_SAMPLES } from "./settings";
