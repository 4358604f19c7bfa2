import { QuietframeError } from "../errors";
import { CellStatus } from "../figures/outcome";
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { logGrid } from "../setup/grid";
import { GaussianSource } from "../timedomain/random";
import { parameterDerivative } from "./parameter-derivative";
import { designProblem, merit, type DesignFigure, type DesignGrid, type DesignProblem } from "./problem";
import { meanAndDeviation, quantileSorted } from "./quantile";
import { quantilesBySelection } from "./select-quantile";
import { runToEnd } from "./slices";
import { checkStopSignal, stopIfAborted } from "./stop";
import { targetMerit } from "./target";
import { resolveUncertainties, type ResolvedUncertainty, type SpreadDistribution, type UncertaintySpec } from "./uncertainty";

/**
 * What real-world spread does to a figure: seeded Monte Carlo over uncertain parameters
 * (xoshiro128** and ziggurat normals of src/timedomain/random.ts; same seed, same bits) gives
 * the figure's distribution, the probability of reaching a target and percentile bands of the
 * noise curve; beside it, first-order propagation from the derivatives at the centre, with a
 * verdict on whether that linear estimate holds.
 */

export interface SpreadOptions {
  /** Samples, 2 … 100 000 (default 1000). */
  readonly samples?: number;
  /** Seed, an integer 0 … 2³²−1 (default 1). */
  readonly seed?: number;
  /** A target for the figure (as in solve): the probability of reaching it is reported. */
  readonly target?: unknown;
  readonly grid?: DesignGrid;
  /** Percentile bands of the total noise over the grid (default true). */
  readonly bands?: boolean;
  /** Called after each block of samples (about a hundred blocks) with the samples done and their number. */
  readonly onProgress?: (done: number, total: number) => void;
  /** Stops the run between blocks of samples: it then throws a DesignRunStopped (stop.ts) and gives no result. */
  readonly signal?: AbortSignal;
}

export interface SpreadResult {
  readonly figure: DesignFigure;
  /** The figure at the centres of the uncertainties (the set-up's other values unchanged). */
  readonly nominal: number;
  readonly uncertain: readonly {
    readonly target: string;
    readonly shown: string;
    readonly centre: number;
    readonly spread: number;
    readonly distribution: SpreadDistribution;
    /** Truncation: draws outside the parameter's bounds are redrawn; how many were. */
    readonly truncated: boolean;
    readonly redrawn: number;
  }[];
  readonly samples: number;
  readonly seed: number;
  /** Samples without a value (unstable or refused settings), and the first reason. */
  readonly failed: { readonly unstable: number; readonly invalid: number; readonly message?: string };
  /** Over the samples with a value. */
  readonly distribution: { readonly median: number; readonly p5: number; readonly p95: number; readonly mean: number; readonly deviation: number };
  /** Fraction of all samples (failed ones count as not reaching) at or better than the target, with its binomial standard error. */
  readonly probability?: { readonly target: number; readonly reached: number; readonly standardError: number };
  /** First-order propagation: nominal ± √Σ(∂F/∂p σ_p)², σ_p the untruncated standard deviation. */
  readonly linear: {
    readonly mean: number;
    readonly deviation: number;
    readonly terms: readonly { readonly target: string; readonly derivative: number; readonly derivativeError: number; readonly deviation: number; readonly share: number }[];
    /** Mean and deviation of the Monte Carlo agree with it within three standard errors plus 10 % of its deviation. */
    readonly holds: boolean;
    readonly note: string;
  };
  /** The drawn values (SI) by target, and the figure of each sample (NaN: no value). */
  readonly draws: Readonly<Record<string, Float64Array>>;
  readonly values: Float64Array;
  /** 5th, 50th and 95th percentiles of the total noise at each grid frequency, over samples with a value. */
  readonly bands?: { readonly frequencies: Float64Array; readonly p5: Float64Array; readonly median: Float64Array; readonly p95: Float64Array; readonly unit: string };
  readonly evaluations: number;
}

/** Redraws allowed in a row for one value before the distribution is judged to lie outside the bounds. */
const MAX_REDRAWS = 1000;

export function spreadAnalysis(setup: SetupDescription | string, figure: FigureSpec, uncertain: readonly UncertaintySpec[], options: SpreadOptions = {}): SpreadResult {
  if (!options.onProgress && !options.signal) {
    const plan = planSpread(setup, figure, uncertain, options);
    return finishSpread(plan, [evaluateSamples(plan, 0, plan.samples)]);
  }
  return runToEnd(spreadSteps(setup, figure, uncertain, options));
}

/**
 * spreadAnalysis in blocks of samples (about a hundred): the generator yields the samples done
 * after each block but the last and returns the result; the parts cover every sample once, which
 * gives the same bits as one call. The signal is looked at before each block.
 */
export function* spreadSteps(setup: SetupDescription | string, figure: FigureSpec, uncertain: readonly UncertaintySpec[], options: SpreadOptions = {}): Generator<number, SpreadResult> {
  const signal = checkStopSignal(options.signal);
  return yield* planSteps(planSpread(setup, figure, uncertain, options), options.onProgress, signal);
}

/** The blocks of samples of a plan made already (spreadSteps without planning again). */
export function* planSteps(plan: SpreadPlan, onProgress: SpreadOptions["onProgress"], signal: AbortSignal | undefined): Generator<number, SpreadResult> {
  const block = Math.ceil(plan.samples / 100);
  const parts: SampleOutcomes[] = [];
  for (let from = 0; from < plan.samples; from += block) {
    stopIfAborted(signal, "spread", from, plan.samples, "samples");
    const to = Math.min(plan.samples, from + block);
    parts.push(evaluateSamples(plan, from, to));
    onProgress?.(to, plan.samples);
    if (to < plan.samples) yield to;
  }
  return finishSpread(plan, parts);
}

/**
 * A Monte Carlo run laid out before any sample is evaluated: the problem, the nominal figure
 * and every sample's draws (the seeded generator is used in sample order, here only, so where
 * the samples are then evaluated changes no bit).
 */
export interface SpreadPlan {
  readonly problem: DesignProblem;
  readonly list: readonly ResolvedUncertainty[];
  readonly samples: number;
  readonly seed: number;
  readonly target?: { readonly value: number; readonly merit: number };
  readonly nominal: number;
  readonly centres: Readonly<Record<string, number>>;
  /** Grid of the noise bands (Hz); absent when bands are off. */
  readonly frequencies?: Float64Array;
  /** Drawn SI values by target, one per sample. */
  readonly draws: Readonly<Record<string, Float64Array>>;
  readonly redrawn: readonly number[];
}

/** The outcomes of samples from, from + 1, …: figure and status of each, and the total noise of each on the band grid. */
export interface SampleOutcomes {
  readonly from: number;
  readonly values: Float64Array;
  readonly status: Uint8Array;
  /** Row k: the total noise of sample from + k on the band grid (rows of samples without a value are left 0); empty without bands. */
  readonly curves: Float64Array;
  /** The first sample of these without a value, and why. */
  readonly firstFailure?: { readonly sample: number; readonly message?: string };
}

/** What evaluating samples needs: the problem, the uncertainties, the band grid and the draws. */
export type SampleJob = Pick<SpreadPlan, "problem" | "list" | "frequencies" | "draws">;

/** The problem, the uncertainties and the band grid of a spread: checked first by planSpread, rebuilt by a worker thread. */
export function spreadSetting(setup: SetupDescription | string, figure: FigureSpec, uncertain: readonly UncertaintySpec[], options: Pick<SpreadOptions, "grid" | "bands">): Omit<SampleJob, "draws"> {
  const problem = designProblem(setup, figure, options.grid);
  const list = resolveUncertainties(problem.base, uncertain);
  const frequencies = options.bands === false ? undefined : logGrid(problem.grid);
  return { problem, list, frequencies };
}

/** Checks everything, evaluates the nominal figure and draws every sample. */
export function planSpread(setup: SetupDescription | string, figure: FigureSpec, uncertain: readonly UncertaintySpec[], options: SpreadOptions = {}): SpreadPlan {
  const { problem, list, frequencies } = spreadSetting(setup, figure, uncertain, options);
  const samples = wholeNumber(options.samples, 1000, 2, 100_000, "options.samples");
  const seed = wholeNumber(options.seed, 1, 0, 4294967295, "options.seed");
  const target = options.target === undefined ? undefined : targetMerit(problem.figure, options.target, "target");
  const params = list.map((u) => u.parameter);
  const centres = Object.fromEntries(list.map((u) => [u.parameter.target, u.centre]));
  const nominalOutcome = problem.evaluate(centres, params);
  if (nominalOutcome.status !== CellStatus.ok) {
    throw new QuietframeError({
      path: "uncertain",
      value: list.map((u) => u.shown),
      problem: `the centres give the figure no value: ${nominalOutcome.message}`,
      allowed: "centres at which the set-up evaluates",
    });
  }
  const random = new GaussianSource(seed);
  const draws: Record<string, Float64Array> = Object.fromEntries(list.map((u) => [u.parameter.target, new Float64Array(samples)]));
  const redrawn = list.map(() => 0);
  for (let s = 0; s < samples; s++) {
    list.forEach((u, k) => {
      const { value, redraws } = draw(u, random);
      redrawn[k] += redraws;
      draws[u.parameter.target][s] = value;
    });
  }
  return { problem, list, samples, seed, target, nominal: nominalOutcome.value, centres, frequencies, draws, redrawn };
}

/** Evaluates samples from … to − 1 (in this thread; a worker thread runs the same on its own copy of the job). */
export function evaluateSamples(plan: SampleJob, from: number, to: number): SampleOutcomes {
  const { problem, list, frequencies, draws } = plan;
  const params = list.map((u) => u.parameter);
  const count = to - from;
  const nf = frequencies?.length ?? 0;
  const values = new Float64Array(count);
  const status = new Uint8Array(count);
  const curves = new Float64Array(count * nf);
  let firstFailure: SampleOutcomes["firstFailure"];
  for (let s = from; s < to; s++) {
    const setting: Record<string, number> = {};
    for (const u of list) setting[u.parameter.target] = draws[u.parameter.target][s];
    const outcome = problem.evaluateWithCurve(setting, params, frequencies ?? problem.figureFrequencies);
    values[s - from] = outcome.value;
    status[s - from] = outcome.status;
    if (outcome.status !== CellStatus.ok) {
      firstFailure ??= { sample: s, message: outcome.message };
      continue;
    }
    if (frequencies && outcome.curve) curves.set(outcome.curve, (s - from) * nf);
  }
  return { from, values, status, curves, firstFailure };
}

/**
 * The result from every sample's outcome (`parts` cover the samples once, in any order);
 * `evaluatedElsewhere`: how many of them worker threads evaluated (they count as evaluations too).
 */
export function finishSpread(plan: SpreadPlan, parts: readonly SampleOutcomes[], evaluatedElsewhere = 0): SpreadResult {
  const { problem, list, samples, seed, target, nominal, centres, frequencies, draws, redrawn } = plan;
  const whole = parts.length === 1 && parts[0].values.length === samples;
  // The parts' curves (hundreds of megabytes in a large run) are read where they are, never joined.
  const values = whole ? parts[0].values : new Float64Array(samples);
  const status = whole ? parts[0].status : new Uint8Array(samples);
  let firstFailure: SampleOutcomes["firstFailure"];
  for (const part of parts) {
    if (!whole) {
      values.set(part.values, part.from);
      status.set(part.status, part.from);
    }
    if (part.firstFailure && (!firstFailure || part.firstFailure.sample < firstFailure.sample)) firstFailure = part.firstFailure;
  }
  let unstable = 0;
  let invalid = 0;
  let reached = 0;
  let withValue = 0;
  for (let s = 0; s < samples; s++) {
    if (status[s] === CellStatus.unstable) unstable++;
    if (status[s] === CellStatus.invalid) invalid++;
    if (status[s] !== CellStatus.ok) continue;
    if (target && merit(problem.figure, { value: values[s], status: CellStatus.ok }) >= target.merit) reached++;
    withValue++;
  }
  const ok = values.filter((v) => !Number.isNaN(v)).sort();
  const stats = meanAndDeviation(ok);
  const distribution = { median: quantileSorted(ok, 0.5), p5: quantileSorted(ok, 0.05), p95: quantileSorted(ok, 0.95), mean: stats.mean, deviation: stats.deviation };
  const linear = linearPropagation(problem, list, centres, nominal, distribution, ok.length);
  const probability = target ? { target: target.value, reached: reached / samples, standardError: Math.sqrt(((reached / samples) * (1 - reached / samples)) / samples) } : undefined;
  return {
    figure: problem.figure,
    nominal,
    uncertain: list.map((u, k) => ({ target: u.parameter.target, shown: u.shown, centre: u.centre, spread: u.spread, distribution: u.distribution, truncated: u.truncated, redrawn: redrawn[k] })),
    samples,
    seed,
    failed: { unstable, invalid, message: firstFailure?.message },
    distribution,
    probability,
    linear,
    draws,
    values,
    bands: frequencies && withValue > 0 ? percentileBands(frequencies, parts, status, withValue, problem.noiseUnit) : undefined,
    evaluations: problem.evaluations + evaluatedElsewhere,
  };
}

function draw(u: ResolvedUncertainty, random: GaussianSource): { value: number; redraws: number } {
  for (let redraws = 0; redraws <= MAX_REDRAWS; redraws++) {
    const value = u.distribution === "normal" ? u.centre + u.spread * random.normal() : u.centre + u.spread * (2 * random.uniform() - 1);
    const p = u.parameter;
    const inside = (!p.lower || (p.lower.inclusive ? value >= p.lower.value : value > p.lower.value)) && (!p.upper || (p.upper.inclusive ? value <= p.upper.value : value < p.upper.value));
    if (inside) return { value, redraws };
  }
  throw new QuietframeError({ path: `uncertain.${u.parameter.target}`, value: u.shown, problem: `almost every draw falls outside the range of ${u.parameter.target}`, allowed: u.parameter.allowed });
}

function linearPropagation(
  problem: ReturnType<typeof designProblem>,
  list: readonly ResolvedUncertainty[],
  centres: Record<string, number>,
  nominal: number,
  mc: { mean: number; deviation: number },
  n: number,
): SpreadResult["linear"] {
  const params = list.map((u) => u.parameter);
  const terms = list.map((u) => {
    const p = u.parameter;
    const valueAt = (x: number): number => {
      const o = problem.evaluate({ ...centres, [p.target]: x }, params);
      return o.status === CellStatus.ok ? o.value : NaN;
    };
    // First step: the parameter's own deviation (the scale the propagation is about), at most half its distance to a bound.
    const d = parameterDerivative(valueAt, p, u.centre, u.deviation, nominal);
    const derivative = d?.value ?? NaN;
    return { target: p.target, derivative, derivativeError: d?.error ?? NaN, deviation: u.deviation, share: 0 };
  });
  const variance = terms.reduce((s, t) => s + t.derivative * t.deviation * (t.derivative * t.deviation), 0);
  const deviation = Math.sqrt(variance);
  const withShares = terms.map((t) => ({ ...t, share: variance > 0 ? (t.derivative * t.deviation * (t.derivative * t.deviation)) / variance : 0 }));
  const seMean = mc.deviation / Math.sqrt(n);
  const seDeviation = mc.deviation / Math.sqrt(2 * (n - 1));
  const holds = Number.isFinite(deviation) && n > 1 && Math.abs(mc.mean - nominal) <= 3 * seMean + 0.1 * deviation && Math.abs(mc.deviation - deviation) <= 3 * seDeviation + 0.1 * deviation;
  const truncated = list.some((u) => u.truncated);
  const note = !Number.isFinite(deviation)
    ? "no linear estimate: a derivative could not be taken at the centre"
    : holds
      ? "the linear estimate agrees with the Monte Carlo"
      : `the linear estimate fails: Monte Carlo mean ${mc.mean.toPrecision(4)} and deviation ${mc.deviation.toPrecision(4)} against ${nominal.toPrecision(4)} ± ${deviation.toPrecision(4)}` +
        (truncated ? " (a distribution is truncated at a bound, which the linear estimate ignores)" : " (the figure curves over the spread)");
  return { mean: nominal, deviation, terms: withShares, holds, note };
}

/** Columns of the noise bands gathered in one pass over the samples (a 64-byte memory line holds 8 values). */
const BAND_COLUMNS = 8;

/** The 5/50/95 % curves over the samples with a value, read from the parts' own curves. */
function percentileBands(frequencies: Float64Array, parts: readonly SampleOutcomes[], status: Uint8Array, withValue: number, unit: string): NonNullable<SpreadResult["bands"]> {
  const nf = frequencies.length;
  const p5 = new Float64Array(nf);
  const median = new Float64Array(nf);
  const p95 = new Float64Array(nf);
  // In sample order: the quantiles do not depend on it, but each column then holds what one joined array would.
  const ordered = [...parts].sort((a, b) => a.from - b.from);
  // Columns are gathered a few at a time: a sample's curve is one row, and one pass over the
  // rows fills several columns from the same memory lines.
  const columns = Array.from({ length: Math.min(nf, BAND_COLUMNS) }, () => new Float64Array(withValue));
  for (let first = 0; first < nf; first += columns.length) {
    const width = Math.min(columns.length, nf - first);
    let k = 0;
    for (const part of ordered) {
      const { curves } = part;
      for (let r = 0; r < part.values.length; r++) {
        if (status[part.from + r] !== CellStatus.ok) continue;
        const row = r * nf + first;
        for (let c = 0; c < width; c++) columns[c][k] = curves[row + c];
        k++;
      }
    }
    for (let c = 0; c < width; c++) [p5[first + c], median[first + c], p95[first + c]] = quantilesBySelection(columns[c], [0.05, 0.5, 0.95]);
  }
  return { frequencies, p5, median, p95, unit };
}

function wholeNumber(value: unknown, fallback: number, min: number, max: number, path: string): number {
  if (value === undefined) return fallback;
  if (typeof value !== "number" || !Number.isInteger(value) || value < min || value > max) {
    throw new QuietframeError({ path, value, problem: "is not a usable whole number", allowed: `an integer from ${min} to ${max}` });
  }
  return value;
}
