import {
  QuietframeError,
  assemble,
  loadSetup,
  prepare,
  startSimulation,
  applyValues,
  QUIETFRAME_VERSION,
  type AssembledSetup,
  type SetupDescription,
  type ResolvedSetup,
  type JointVariable,
  type TrajectoryRequest,
  type TrajectoryResult,
  type TrajectoryRun,
} from "../../src/index";
import { resolveStateControls, type ResolvedControl } from "../core/controls/setup-controls";
import { setupValues } from "../explorer/model";
import type { ControlSpec } from "../core/controls/control-spec";
import { trajectoryFingerprint } from "./fingerprint";
import { TRAJECTORY_STATE_FORMAT, TRAJECTORY_STATE_VERSION, type SimulationSpec, type TrajectoryState } from "./format";
import { checkJoint, checkPair } from "./joint";
import { firstNonFinite } from "./series";
import { defaultSamples, resolveSimulation, writeTime, type ResolvedSimulation } from "./simulation";

/**
 * The trajectory widget's model: state in, simulated curves out. Pure (no DOM, no Jupyter):
 * the kernel, the CLI and the browser runtime run exactly this code, in three passes:
 *   1. prepare  set-up at the control values → state-space model, simulation settings checked
 *   2. advance  the engine's run, in slices (progress bars, a stop button)
 *   3. finish   result → fingerprint of every stored number
 */

export interface PreparedTrajectory {
  readonly controls: readonly ResolvedControl[];
  readonly setup: ResolvedSetup;
  readonly assembled: AssembledSetup;
  readonly simulation: ResolvedSimulation;
  readonly request: TrajectoryRequest;
  readonly run: SlicedRun;
}

export interface TrajectoryComputation {
  readonly controls: readonly ResolvedControl[];
  readonly setup: ResolvedSetup;
  readonly simulation: ResolvedSimulation;
  readonly result: TrajectoryResult;
  readonly cautions: readonly string[];
  readonly fingerprint: string;
}

/**
 * The engine's run with a step budget of our own: the run takes exactly the steps asked for
 * (so a stopped run can be replayed from its step count), and ends at `stoppedAfter` if set.
 */
export class SlicedRun {
  #taken = 0;
  #stopped = false;
  constructor(
    private readonly run: TrajectoryRun,
    readonly planned: number,
    readonly limit: number | null,
  ) {}

  /** Steps taken so far. */
  get taken(): number {
    return this.#taken;
  }

  get progress(): number {
    return this.#taken / this.planned;
  }

  get done(): boolean {
    return this.#stopped || this.run.done;
  }

  /** Takes up to `maxSteps` steps; true when the run is over (finished or at its stop). */
  advance(maxSteps: number): boolean {
    if (this.done) return true;
    const end = this.limit ?? this.planned;
    const n = Math.min(Math.max(1, Math.floor(maxSteps)), end - this.#taken);
    if (n > 0) {
      this.run.advance(n);
      this.#taken += n;
    }
    if (this.limit !== null && this.#taken >= this.limit) this.stop();
    return this.done;
  }

  /** Ends the run where it is; result() then covers the steps taken. */
  stop(): void {
    if (this.#stopped || this.run.done) return;
    this.#stopped = true;
    this.run.stop();
  }

  result(): TrajectoryResult {
    return this.run.result();
  }
}

/** Checks a state and starts its run (no steps taken yet). Throws QuietframeError for bad input. */
export function prepareTrajectory(state: Omit<TrajectoryState, "fingerprint">): PreparedTrajectory {
  // The set-up first, so controls are only ever resolved against a well-formed one.
  loadSetup(state.setup);
  const controls = resolveStateControls(state.setup, state.controls, state.values);
  const simulation = resolveSimulation(state.simulation, "simulation");
  const joint = checkJoint(state.joint, "joint");
  const pair = checkPair(state.pair, "pair");
  const prepared = prepare(state.setup, state.values);
  const request: TrajectoryRequest = pair ? { joint, pair } : { joint };
  const run = startSimulation(prepared, simulation.settings, request);
  return { controls, setup: prepared.setup, assembled: prepared.assembled, simulation, request, run: new SlicedRun(run, simulation.steps, simulation.stoppedAfter) };
}

/** The computation of a run that has ended (finished or stopped). */
export function finishTrajectory(p: PreparedTrajectory): TrajectoryComputation {
  const result = p.run.result();
  const bad = firstNonFinite(result);
  if (bad) {
    throw new QuietframeError({
      path: "simulation.step",
      value: writeTime(p.simulation.settings.step),
      problem: `the run produced a non-finite ${bad.series} at ${writeTime(bad.time)}; nothing is plotted`,
      allowed: "a shorter step (the fastest rate of the set-up times the step should stay well below 1)",
    });
  }
  return { controls: p.controls, setup: p.setup, simulation: p.simulation, result, cautions: p.assembled.cautions, fingerprint: trajectoryFingerprint(result) };
}

export interface ComputeOptions {
  /** Steps per slice between progress reports (default 20,000). */
  sliceSteps?: number;
  /** Called after every slice with the fraction done and the steps taken. */
  onProgress?: (fraction: number, taken: number, planned: number) => void;
}

/** Runs a state's simulation to its end (or to its recorded stop) in one go. */
export function computeTrajectory(state: Omit<TrajectoryState, "fingerprint">, options: ComputeOptions = {}): TrajectoryComputation {
  const p = prepareTrajectory(state);
  const slice = options.sliceSteps ?? 20_000;
  while (!p.run.advance(slice)) options.onProgress?.(p.run.progress, p.run.taken, p.run.planned);
  options.onProgress?.(p.run.progress, p.run.taken, p.run.planned);
  return finishTrajectory(p);
}

/** Simulation options as a notebook passes them (every field optional). */
export interface SimulationOptions {
  /** Simulated time, e.g. "200 us" (required: the right span depends on the set-up's rates). */
  duration: string | number;
  /** Integration step, e.g. "10 ns". */
  step: string | number;
  /** Integer seed, 0 … 2³²−1 (default 1). */
  seed?: number;
  /** Stored time points (default min(steps + 1, 2001)). */
  samples?: number;
  /** "stationary" or "ground" (default: stationary where a stationary state exists, else ground). */
  initial?: "stationary" | "ground";
}

export interface TrajectoryOptions {
  controls?: ControlSpec[];
  simulation: SimulationOptions;
  /** Joint variables to follow (default: x of every mechanical or spin mode). */
  joint?: JointVariable[];
  /** Two components whose entanglement is followed (default none). */
  pair?: [string, string] | null;
  title?: string;
}

/** A fresh state for a set-up: control values are the set-up's own, the run is complete. */
export function createTrajectoryState(setup: SetupDescription, options: TrajectoryOptions): TrajectoryState {
  return newTrajectory(setup, options).state;
}

/** A fresh state and its computation (one run). */
export function newTrajectory(setup: SetupDescription, options: TrajectoryOptions, compute: ComputeOptions = {}): { state: TrajectoryState; computation: TrajectoryComputation } {
  if (typeof options !== "object" || options === null || typeof options.simulation !== "object" || options.simulation === null) {
    throw new QuietframeError({ path: "options.simulation", value: options?.simulation, problem: "is required", allowed: '{ duration: "200 us", step: "10 ns", seed?: 1 }' });
  }
  const controls = structuredClone(options.controls ?? []);
  const values = setupValues(setup, controls);
  const s = options.simulation;
  for (const key of Object.keys(options))
    if (!["controls", "simulation", "joint", "pair", "title"].includes(key))
      throw new QuietframeError({ path: `options.${key}`, problem: "is not an option of a trajectory widget", allowed: "controls, simulation, joint, pair, title" });
  for (const key of Object.keys(s))
    if (!["duration", "step", "seed", "samples", "initial"].includes(key))
      throw new QuietframeError({ path: `options.simulation.${key}`, problem: "is not a simulation setting", allowed: "duration, step, seed, samples, initial" });
  const simulation: SimulationSpec = { duration: s.duration, step: s.step, seed: s.seed ?? 1, ...(s.initial === undefined ? {} : { initial: s.initial }) };
  // Resolve once without samples to learn the steps, then store the samples explicitly.
  const steps = resolveSimulation(simulation, "options.simulation").steps;
  simulation.samples = s.samples ?? defaultSamples(steps);
  const joint = options.joint ?? defaultJoint(setup, values);
  const base: Omit<TrajectoryState, "fingerprint"> = {
    format: TRAJECTORY_STATE_FORMAT,
    version: TRAJECTORY_STATE_VERSION,
    quietframe: QUIETFRAME_VERSION,
    setup: structuredClone(setup),
    controls,
    values,
    simulation,
    joint: structuredClone(joint),
    pair: options.pair ? [options.pair[0], options.pair[1]] : null,
    ...(options.title === undefined ? {} : { title: options.title }),
  };
  const computation = computeTrajectory(base, compute);
  return { state: withComputation(base, computation), computation };
}

/** x of every mechanical or spin mode, one joint variable each. */
export function defaultJoint(setup: SetupDescription, values: Record<string, string | number>): JointVariable[] {
  const model = assemble(loadSetup(applyValues(setup, values))).model;
  const joint = model.modes.filter((m) => m.kind !== "optical").map((m) => ({ label: `x ${m.owner}`, terms: [{ component: m.owner, quadrature: "x" as const, weight: 1 }] }));
  if (joint.length === 0) {
    throw new QuietframeError({
      path: "options.joint",
      problem: "is needed: the set-up has no mechanical or spin mode to follow by default",
      allowed: 'e.g. [{ label: "x cavity", terms: [{ component: "cavity", quadrature: "x", weight: 1 }] }]',
    });
  }
  return joint;
}

/** The title shown: the state's own, or the set-up's name. */
export function trajectoryTitle(state: Pick<TrajectoryState, "title" | "setup">): string {
  return state.title ?? state.setup.name ?? "Trajectories";
}

/** The run written out for summaries: "200 µs in 20000 steps of 10 ns, seed 1, …". */
export function simulationText(sim: ResolvedSimulation, result: TrajectoryResult): string {
  const s = result.settings;
  const base = `${writeTime(s.duration)} in ${sim.steps} steps of ${writeTime(s.step)}, seed ${s.seed}, ${s.samples} stored points, starting ${s.initial === "ground" ? "from the ground state" : "stationary"}`;
  if (result.stopped) return `${base}; stopped after ${result.stepsTaken} steps (${writeTime(result.stepsTaken * s.step)})`;
  return base;
}

/** The state whose stored curves are this computation's (values and a stop point may have changed). */
export function withComputation(state: Omit<TrajectoryState, "fingerprint">, c: TrajectoryComputation): TrajectoryState {
  const stoppedAfter = c.result.stopped ? c.result.stepsTaken : null;
  const { stoppedAfter: _old, ...rest } = state.simulation;
  // Stored points and starting state are written out, so the state says exactly what was run.
  const simulation: SimulationSpec = { ...rest, samples: c.simulation.settings.samples, initial: c.result.settings.initial };
  return { ...state, simulation: stoppedAfter === null ? simulation : { ...simulation, stoppedAfter }, fingerprint: c.fingerprint };
}
