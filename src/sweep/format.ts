/**
 * The sweep description: versioned JSON beside the set-up format (schema/sweep.schema.json
 * describes the same shape). One description says what a large computation is — the set-up,
 * what varies (a grid of two parameters, or seeded random samples of uncertain parameters),
 * the figure of merit, what to keep — and how it is cut into chunks, so that it runs the same
 * on one machine's worker threads or as array jobs on a cluster.
 */
import type { FigureSpec } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import type { ToleranceAxisSpec } from "../tolerance/spec";
import type { UncertaintySpec } from "../design/uncertainty";
import type { OptimizeParameter } from "../design/optimize";

export const SWEEP_FORMAT = "quietframe.sweep";
export const SWEEP_VERSION = 1;

/** The kinds of variation a sweep knows. */
export const VARY_KINDS = ["grid", "samples", "starts"] as const;
export type VaryKind = (typeof VARY_KINDS)[number];

/** Two parameters over a grid of values: a tolerance map, cut into chunks of rows. */
export interface GridVariation {
  kind: "grid";
  /** Columns of the map. */
  x: ToleranceAxisSpec;
  /** Rows of the map (a chunk is a block of rows). */
  y: ToleranceAxisSpec;
}

/** Seeded Monte Carlo samples of uncertain parameters, cut into chunks of samples. */
export interface SampleVariation {
  kind: "samples";
  /** Uncertain parameters, written as for `quietframe spread` ("95 % ± 2 %"). */
  uncertain: UncertaintySpec[];
  /** Number of samples, 2 … 100 000 (default 1000). */
  samples?: number;
  /** Seed, an integer 0 … 2³²−1 (default 1): the same seed gives the same draws. */
  seed?: number;
  /** A target for the figure ("3 dB", 1.5): the merged result reports the probability of reaching it. */
  target?: string | number;
}

/** Optimizer starts: the current values, then seeded random points; a chunk is a block of starts. */
export interface StartVariation {
  kind: "starts";
  /** Parameters to optimize, as for `quietframe optimize` ({ target, min?, max? }). */
  parameters: OptimizeParameter[];
  /** Number of starts, 1 … 100 (default 4). */
  starts?: number;
  /** Seed of the random starts, 0 … 2³²−1 (default 1). */
  seed?: number;
  /** Evaluations allowed per start (default 400 + 200 × the number of parameters). */
  maxEvaluationsPerStart?: number;
  /** Convergence: simplex size in the unit box (default 1e-10). */
  tolerance?: number;
}

export type Variation = GridVariation | SampleVariation | StartVariation;

/** What a sweep keeps besides one figure per cell or sample. */
export interface KeepSpec {
  /**
   * Samples only: the total noise of every sample over the frequency grid, from which the
   * merged result draws percentile bands (default true). Costs grid points × 8 bytes per sample.
   */
  curves?: boolean;
}

export interface SweepDescription {
  format: typeof SWEEP_FORMAT;
  version: number;
  /** Short title (job names, result titles). */
  name?: string;
  /** The set-up, as in a set-up file (a CLI reading a sweep file also takes a path to one, relative to the sweep file). */
  setup: SetupDescription;
  vary: Variation;
  figure: FigureSpec;
  /** Frequency grid of every evaluation ({from, to, points}); default the set-up's grid. */
  grid?: { from: string | number; to: string | number; points?: number };
  keep?: KeepSpec;
  /**
   * Rows (grid), samples (samples) or starts (starts) per chunk, an integer ≥ 1. Default: as many as give at
   * most DEFAULT_CHUNKS chunks.
   */
  chunkSize?: number;
}

export const SWEEP_KEYS = ["format", "version", "name", "setup", "vary", "figure", "grid", "keep", "chunkSize"] as const;
export const GRID_VARY_KEYS = ["kind", "x", "y"] as const;
export const SAMPLE_VARY_KEYS = ["kind", "uncertain", "samples", "seed", "target"] as const;
export const START_VARY_KEYS = ["kind", "parameters", "starts", "seed", "maxEvaluationsPerStart", "tolerance"] as const;
export const KEEP_KEYS = ["curves"] as const;

/** Chunks a sweep is cut into when it does not say its chunk size. */
export const DEFAULT_CHUNKS = 100;
