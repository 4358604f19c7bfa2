/** A trajectory state's simulation settings, checked and resolved. */
import { QuietframeError, checkSettings, MAX_STEPS, formatQuantity, parseQuantity, type SimulationSettings } from "../../src/index";
import { INITIAL_STATES, type SimulationSpec } from "./format";

/**
 * The simulation settings of a trajectory widget, checked once at the edge: times with their
 * units become seconds, and every problem names the field, the value and what is allowed.
 */

export { MAX_STEPS };
/** Stored time points: at least both ends, at most what a chart can draw. */
export const MIN_SAMPLES = 2;
export const MAX_SAMPLES = 20_001;
/** Default stored points when a state does not say. */
export const DEFAULT_SAMPLES = 2001;
const MAX_SEED = 0xffffffff;

export interface ResolvedSimulation {
  /** What the engine is given (no `initial`: the engine's choice, stationary where a stationary state exists). */
  readonly settings: SimulationSettings & { readonly samples: number };
  /** Planned steps, counted as the engine counts them (a whole number of steps up to rounding, else rounded up). */
  readonly steps: number;
  /** Steps after which the run stops early, or null for a complete run. */
  readonly stoppedAfter: number | null;
}

/** Steps the run plans for a duration and a step (seconds), exactly as the engine plans them. */
export function plannedSteps(duration: number, step: number): number {
  return checkSettings({ duration, step, seed: 0, samples: 2 }).steps;
}

export function resolveSimulation(spec: SimulationSpec, path = "simulation"): ResolvedSimulation {
  if (typeof spec !== "object" || spec === null || Array.isArray(spec)) {
    throw new QuietframeError({ path, value: spec, problem: "must be an object", allowed: '{"duration": "200 us", "step": "10 ns", "seed": 1}' });
  }
  const duration = parseQuantity(spec.duration, "time", `${path}.duration`);
  if (!(duration > 0)) {
    throw new QuietframeError({ path: `${path}.duration`, value: spec.duration, problem: "must be a positive time", allowed: 'a simulated time above 0, e.g. "200 us"' });
  }
  const step = parseQuantity(spec.step, "time", `${path}.step`);
  if (!(step > 0)) {
    throw new QuietframeError({ path: `${path}.step`, value: spec.step, problem: "must be a positive time", allowed: 'an integration step above 0, e.g. "10 ns"' });
  }
  if (step > duration) {
    throw new QuietframeError({
      path: `${path}.step`,
      value: spec.step,
      problem: `is longer than the duration (${formatQuantity(duration, "time")})`,
      allowed: `a step of at most ${formatQuantity(duration, "time")}`,
    });
  }
  const steps = Math.ceil(duration / step - 1e-9 * (duration / step));
  if (steps > MAX_STEPS) {
    throw new QuietframeError({
      path: `${path}.step`,
      value: spec.step,
      problem: `gives ${steps} steps over ${formatQuantity(duration, "time")}, more than ${MAX_STEPS}`,
      allowed: `a step of at least ${formatQuantity(duration / MAX_STEPS, "time")}, or a shorter duration`,
    });
  }
  const seed = spec.seed;
  if (typeof seed !== "number" || !Number.isInteger(seed) || seed < 0 || seed > MAX_SEED) {
    throw new QuietframeError({ path: `${path}.seed`, value: seed, problem: "is not a seed", allowed: `an integer from 0 to ${MAX_SEED}` });
  }
  const planned = plannedSteps(duration, step);
  const samples = spec.samples ?? defaultSamples(planned);
  if (typeof samples !== "number" || !Number.isInteger(samples) || samples < MIN_SAMPLES || samples > Math.min(MAX_SAMPLES, planned + 1)) {
    throw new QuietframeError({
      path: `${path}.samples`,
      value: samples,
      problem: "is not a usable number of stored points",
      allowed: `an integer from ${MIN_SAMPLES} to ${Math.min(MAX_SAMPLES, planned + 1)} (at most one per step, plus the start)`,
    });
  }
  const initial = spec.initial;
  if (initial !== undefined && !(INITIAL_STATES as readonly string[]).includes(initial)) {
    throw new QuietframeError({ path: `${path}.initial`, value: initial, problem: "is not a starting state", allowed: INITIAL_STATES.join(", ") });
  }
  const stopped = spec.stoppedAfter ?? null;
  if (stopped !== null && (typeof stopped !== "number" || !Number.isInteger(stopped) || stopped < 0 || stopped >= planned)) {
    throw new QuietframeError({ path: `${path}.stoppedAfter`, value: stopped, problem: "is not a step of this run", allowed: `null for a complete run, or an integer from 0 to ${planned - 1}` });
  }
  return { settings: { duration, step, seed, samples, ...(initial === undefined ? {} : { initial }) }, steps: planned, stoppedAfter: stopped };
}

/** min(steps + 1, 2001): every step when there are few, otherwise enough for a smooth chart. */
export function defaultSamples(steps: number): number {
  return Math.min(steps + 1, DEFAULT_SAMPLES);
}

/** A time as the widget shows and writes it: six significant digits with an SI prefix. */
export function writeTime(seconds: number): string {
  return formatQuantity(seconds, "time", 6);
}
