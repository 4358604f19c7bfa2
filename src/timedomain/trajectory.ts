/**
 * Simulated measurement runs: ties the exact propagation of the hidden state and its
 * records (propagation.ts), the Kalman filter that reads them (filter.ts) and the stored
 * series (recording.ts) into a run that a UI advances in slices. Same settings, same bits.
 */
import { stationaryCovariance } from "../engine/covariance";
import { QuietframeError } from "../errors";
import type { StateSpaceModel } from "../network/model";
import { KalmanFilter } from "./filter";
import { measurementNoise } from "./measurement";
import { drawInitialState, exactStep, HiddenState, UnconditionalCovariance } from "./propagation";
import { GaussianSource } from "./random";
import { Recorder } from "./recording";
import { checkSettings, storedSteps } from "./settings";
import { groundCovariance } from "./transient";
import type { SimulationSettings, TrajectoryRequest, TrajectoryResult, TrajectoryRun } from "./types";

class Run implements TrajectoryRun {
  private readonly steps: number;
  private readonly settings: Required<SimulationSettings>;
  private readonly rng: GaussianSource;
  private readonly hidden: HiddenState;
  private readonly filter: KalmanFilter;
  private readonly unconditional: UnconditionalCovariance;
  private readonly recorder: Recorder;
  private k = 0;
  private stoppedEarly = false;

  constructor(model: StateSpaceModel, settings: SimulationSettings, request: TrajectoryRequest) {
    const checked = checkSettings(settings);
    const n = model.nStates;
    const p = model.nOutputs;
    if (n === 0) {
      throw new QuietframeError({ path: "components", problem: "the set-up has no modes to simulate", allowed: "a set-up with at least one mechanical, optical or spin mode" });
    }
    if (p > 0) measurementNoise(model); // refuses outputs without noise of their own, naming them
    this.steps = checked.steps;
    const h = checked.settings.step;
    const stored = storedSteps(checked.steps, checked.settings.samples);

    const v0 = initialCovariance(model, checked.settings.initial, checked.initialChosen);
    this.settings = { ...checked.settings, initial: v0.initial };
    this.recorder = new Recorder(model, request, stored, h);

    const step = exactStep(model, h);
    this.filter = new KalmanFilter(step, v0.v);
    this.unconditional = new UnconditionalCovariance(step, v0.v);
    this.rng = new GaussianSource(checked.settings.seed);
    // Hidden initial state drawn from the initial covariance; the estimate starts at its mean.
    this.hidden = new HiddenState(step, drawInitialState(v0.v, n, this.rng));
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
      this.hidden.advance(this.rng);
      this.recorder.accumulate(this.hidden.dy);
      this.filter.update(this.hidden.dy, this.k);
      this.k++;
      if (this.recorder.isDue(this.k)) this.store();
    }
    return this.done;
  }

  stop(): void {
    this.stoppedEarly = true;
  }

  /** Moves the unconditional covariance on to this step and stores the point. */
  private store(): void {
    const stride = this.recorder.stepsSinceStored(this.k);
    if (stride > 0) this.unconditional.advance(stride);
    this.recorder.store({
      step: this.k,
      z: this.hidden.z,
      zHat: this.filter.zHat,
      cov: this.filter.cov,
      covRevision: this.filter.revision,
      unconditionalCov: this.unconditional.value,
    });
  }

  result(): TrajectoryResult {
    const { time, records, joint, entanglement, minUncertaintyMargin } = this.recorder.series();
    const settledAt = this.filter.settledAt;
    return {
      settings: this.settings,
      time,
      stepsTaken: this.k,
      stepsPlanned: this.steps,
      stopped: this.stoppedEarly && this.k < this.steps,
      records,
      joint,
      ...(entanglement ? { entanglement } : {}),
      minUncertaintyMargin,
      ...(settledAt !== undefined ? { filterSettledAtStep: settledAt } : {}),
    };
  }
}

/** The initial covariance: the stationary state when asked for (or when left open and it exists), else the ground state. */
function initialCovariance(model: StateSpaceModel, initial: "stationary" | "ground", chosenByEngine: boolean): { v: Float64Array; initial: "stationary" | "ground" } {
  if (initial === "ground") return { v: groundCovariance(model), initial };
  try {
    return { v: stationaryCovariance(model), initial };
  } catch (e) {
    if (chosenByEngine) return { v: groundCovariance(model), initial: "ground" };
    throw new QuietframeError({
      path: "simulation.initial",
      value: "stationary",
      problem: `the set-up has no stationary state (${e instanceof Error ? e.message : String(e)})`,
      allowed: '"ground" for a set-up with undamped or growing modes (a free mass)',
    });
  }
}

/** Starts a run that a UI can advance in slices. */
export function startTrajectory(model: StateSpaceModel, settings: SimulationSettings, request: TrajectoryRequest): TrajectoryRun {
  return new Run(model, settings, request);
}

/** Runs to the end, reporting progress (0 … 1) about a hundred times. */
export function simulateTrajectory(model: StateSpaceModel, settings: SimulationSettings, request: TrajectoryRequest, onProgress?: (fraction: number) => void): TrajectoryResult {
  const run = new Run(model, settings, request);
  const chunk = Math.max(1000, Math.ceil(run.plannedSteps / 100));
  while (!run.advance(chunk)) onProgress?.(run.progress);
  onProgress?.(1);
  return run.result();
}
