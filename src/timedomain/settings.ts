/** Checks simulation settings and fills in the defaults; every problem names its field. */
import { QuietframeError } from "../errors";
import type { InitialState, SimulationSettings } from "./types";

/** Most integration steps one run may take (about a minute of work for a small set-up). */
export const MAX_STEPS = 10_000_000;
export const MIN_SAMPLES = 2;
export const MAX_SAMPLES = 100_000;
export const DEFAULT_SAMPLES = 2001;
const MAX_SEED = 4294967295;

export interface CheckedSettings {
  readonly settings: Required<SimulationSettings>;
  readonly steps: number;
  /** Whether `initial` was left to the engine (stationary when it exists, else ground). */
  readonly initialChosen: boolean;
}

function fail(field: string, value: unknown, problem: string, allowed: string): never {
  throw new QuietframeError({ path: `simulation.${field}`, value, problem, allowed });
}

export function checkSettings(s: SimulationSettings): CheckedSettings {
  const { duration, step, seed } = s;
  if (typeof step !== "number" || !Number.isFinite(step) || !(step > 0)) {
    fail("step", step, "the integration step must be a positive, finite time in seconds", "step > 0 s, e.g. 1e-6 (s)");
  }
  if (typeof duration !== "number" || !Number.isFinite(duration) || !(duration >= step)) {
    fail("duration", duration, `the simulated time must be a finite number of seconds, at least one step (${step} s)`, `${step} s ≤ duration ≤ ${MAX_STEPS} steps × ${step} s`);
  }
  // A duration that is a whole number of steps up to rounding gives exactly that many steps.
  const ratio = duration / step;
  const nearest = Math.round(ratio);
  const steps = Math.abs(ratio - nearest) <= 1e-9 * ratio ? nearest : Math.ceil(ratio);
  if (steps > MAX_STEPS) {
    fail(
      "duration",
      duration,
      `${duration} s in steps of ${step} s are ${steps} steps, more than the ${MAX_STEPS} one run may take`,
      `at most ${MAX_STEPS} steps: duration ≤ ${MAX_STEPS * step} s at this step, or a longer step`,
    );
  }
  if (typeof seed !== "number" || !Number.isInteger(seed) || seed < 0 || seed > MAX_SEED) {
    fail("seed", seed, "the seed must be an integer", `0 ≤ seed ≤ ${MAX_SEED} (2³²−1)`);
  }
  let samples = s.samples ?? Math.min(steps + 1, DEFAULT_SAMPLES);
  if (typeof samples !== "number" || !Number.isInteger(samples) || samples < MIN_SAMPLES || samples > MAX_SAMPLES) {
    fail("samples", s.samples, "the number of stored time points must be an integer", `${MIN_SAMPLES} ≤ samples ≤ ${MAX_SAMPLES}`);
  }
  // More stored points than time points would repeat values: keep one per step.
  samples = Math.min(samples, steps + 1);
  const initial: InitialState = s.initial ?? "stationary";
  if (initial !== "stationary" && initial !== "ground") {
    fail("initial", s.initial, "unknown initial state", '"stationary" (unconditional steady state) or "ground" (every mode in its ground state)');
  }
  return { settings: { duration: steps * step, step, seed, samples, initial }, steps, initialChosen: s.initial === undefined };
}

/** Step indices of the stored points: 0 = i₀ < i₁ < … < i_{S−1} = steps, spread evenly. */
export function storedSteps(steps: number, samples: number): Int32Array {
  const out = new Int32Array(samples);
  for (let j = 0; j < samples; j++) out[j] = Math.round((j * steps) / (samples - 1));
  return out;
}
