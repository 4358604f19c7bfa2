/** The inspiral reach gauge of a strain budget, against the initial set-up. */
import { QuietframeError, QuietframeErrors, inspiralHorizon, inspiralRange, strainCurve, type InspiralDistance } from "../../src/index";
import type { ExplorerState } from "./format";
import { computeExplorer, initialValues, type ExplorerComputation } from "./model";

/**
 * The explorer's reach gauge: how far the current strain curve sees a compact-binary
 * inspiral, and how that compares with a reference curve (by default the state's initial
 * set-up). Pure, like the rest of the explorer's model: the kernel, the static fallback and
 * the browser runtime all show these numbers. Nothing here enters the fingerprint, which
 * covers the curves alone.
 */

/** The source the gauge looks for: component masses (solar masses) and the SNR threshold. */
export interface ReachSource {
  readonly m1: number;
  readonly m2: number;
  readonly snr: number;
}

/** Two 1.4 M☉ neutron stars, detected at an optimal matched-filter SNR of 8. */
export const DEFAULT_REACH_SOURCE: ReachSource = Object.freeze({ m1: 1.4, m2: 1.4, snr: 8 });

/** How explorerReach names its reference curve in summaries. */
export const INITIAL_SETUP = "the initial set-up";

export interface ReachComparison {
  /** What the reference curve is, for summaries ("the initial set-up"). */
  readonly against: string;
  /** Orientation-averaged range of the reference curve. */
  readonly referenceRange: InspiralDistance;
  /** Range of the current curve divided by the reference's (same source and threshold). */
  readonly rangeRatio: number;
  /** Ratio of surveyed volumes, rangeRatio³. */
  readonly volumeGain: number;
}

interface ReachBase {
  readonly source: ReachSource;
}

/** Reach of a curve that reaches into the inspiral band. */
export interface ReachAvailable extends ReachBase {
  readonly available: true;
  /** Distance at which an optimally oriented source reaches the threshold. */
  readonly horizon: InspiralDistance;
  /** Sky- and orientation-averaged range (horizon / 2.2648). */
  readonly range: InspiralDistance;
  /** Against the reference curve, when one was given and has a reach of its own. */
  readonly comparison?: ReachComparison;
  /** Why a reference was asked for but could not be compared (e.g. it does not compute). */
  readonly comparisonProblem?: string;
}

/** A strain curve whose reach cannot be computed (its grid misses the inspiral band). */
export interface ReachUnavailable extends ReachBase {
  readonly available: false;
  readonly problem: string;
}

export type ReachFigures = ReachAvailable | ReachUnavailable;

export interface ReachOptions {
  /** Masses and threshold; each defaults to DEFAULT_REACH_SOURCE. */
  readonly source?: Partial<ReachSource>;
  /** Name of the reference curve in summaries (default "the reference curve"). */
  readonly against?: string;
}

/** True when the budget is referred to strain, the only quantity with an astrophysical reach. */
export function hasReach(computation: ExplorerComputation): boolean {
  return computation.evaluation.budget.quantity.name === "strain";
}

/**
 * Horizon and range of the computation's total noise (src/reach on its strain curve), and,
 * with a reference, the range ratio and volume gain against it. Undefined for a budget not
 * referred to strain. Bad source options throw; a curve that misses the inspiral band gives
 * `available: false` with the reason.
 */
export function reachFigures(computation: ExplorerComputation, reference?: ExplorerComputation, options: ReachOptions = {}): ReachFigures | undefined {
  if (!hasReach(computation)) return undefined;
  const source: ReachSource = { ...DEFAULT_REACH_SOURCE, ...options.source };
  let distances: { horizon: InspiralDistance; range: InspiralDistance };
  try {
    distances = reachOf(computation, source);
  } catch (e) {
    return { available: false, source, problem: curveProblem(e) };
  }
  if (!reference) return { available: true, source, ...distances };
  if (!hasReach(reference)) {
    return { available: true, source, ...distances, comparisonProblem: `${options.against ?? "the reference curve"} is not referred to strain` };
  }
  let referenceRange: InspiralDistance;
  try {
    referenceRange = reachOf(reference, source).range;
  } catch (e) {
    return { available: true, source, ...distances, comparisonProblem: curveProblem(e) };
  }
  const rangeRatio = distances.range.metres / referenceRange.metres;
  return {
    available: true,
    source,
    ...distances,
    comparison: { against: options.against ?? "the reference curve", referenceRange, rangeRatio, volumeGain: rangeRatio * rangeRatio * rangeRatio },
  };
}

/**
 * The gauge as the explorer shows it: the reach of the current computation against the
 * state's initial set-up (every control at the value the set-up itself gives it, the values
 * a fresh state starts from). That reference is the same in the kernel, the saved page and
 * after reloading a saved state, since the set-up a state carries never changes.
 */
export function explorerReach(state: Omit<ExplorerState, "fingerprint">, computation: ExplorerComputation, options: Omit<ReachOptions, "against"> = {}): ReachFigures | undefined {
  if (!hasReach(computation)) return undefined;
  let reference: ExplorerComputation | undefined;
  let problem: string | undefined;
  try {
    reference = initialComputation(state, computation);
  } catch (e) {
    if (!(e instanceof QuietframeError || e instanceof QuietframeErrors)) throw e;
    problem = `${INITIAL_SETUP} does not compute (${e.message})`;
  }
  const figures = reachFigures(computation, reference, { ...options, against: INITIAL_SETUP });
  return figures?.available && problem !== undefined ? { ...figures, comparisonProblem: problem } : figures;
}

/** Reference computations by state (set-up, controls, settings, values); a few are kept. */
const REFERENCE_CACHE_SIZE = 4;
const referenceCache = new Map<string, ExplorerComputation>();

/**
 * The computation of the state at its initial values: `current` itself when the state is
 * there already, otherwise computed once and kept, so a dragged slider costs one budget per
 * step, not two.
 */
export function initialComputation(state: Omit<ExplorerState, "fingerprint">, current?: ExplorerComputation): ExplorerComputation {
  const values = initialValues(state);
  if (current && sameValues(values, state.values)) return current;
  const key = JSON.stringify([state.setup, state.controls, state.settings, values]);
  const cached = referenceCache.get(key);
  if (cached) return cached;
  const computed = computeExplorer({ ...state, values });
  referenceCache.set(key, computed);
  while (referenceCache.size > REFERENCE_CACHE_SIZE) referenceCache.delete(referenceCache.keys().next().value as string);
  return computed;
}

function reachOf(computation: ExplorerComputation, source: ReachSource): { horizon: InspiralDistance; range: InspiralDistance } {
  const curve = strainCurve(computation.evaluation.budget);
  return {
    horizon: inspiralHorizon(curve.frequencies, curve.strainPsd, source),
    range: inspiralRange(curve.frequencies, curve.strainPsd, source),
  };
}

/** A curve's problem as text; a bad source option is the caller's mistake and is thrown on. */
function curveProblem(e: unknown): string {
  if (!(e instanceof QuietframeError)) throw e;
  if (e.path.startsWith("options.")) throw e;
  return e.message;
}

function sameValues(a: Readonly<Record<string, string | number>>, b: Readonly<Record<string, string | number>>): boolean {
  const keys = Object.keys(a);
  return keys.length === Object.keys(b).length && keys.every((k) => Object.prototype.hasOwnProperty.call(b, k) && a[k] === b[k]);
}
