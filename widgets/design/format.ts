/** The design widget's state format: the question asked of the engine and its answer as plain values. */
import type { FigureSpec, OptimizeParameter, SetupDescription, UncertaintySpec } from "../../src/index";

/**
 * A design widget answers one design question about a set-up and a figure of merit: which
 * parameter to improve first (ranking), the best settings within bounds (optimum) or what
 * real-world spread does (spread). Its state holds the question (enough to compute the same
 * answer again, bit for bit: the engine is deterministic with its seeds), the answer as plain
 * JSON values (the page draws it without computing) and the fingerprint of the answer's numbers.
 */
export const DESIGN_STATE_FORMAT = "quietframe.design";
export const DESIGN_STATE_VERSION = 1;
export const DESIGN_MODEL_NAME = "DesignWidgetModel";

export const QUESTION_KINDS = ["ranking", "optimum", "spread"] as const;
export type QuestionKind = (typeof QUESTION_KINDS)[number];

/** A frequency grid as a user writes it: values with units or hertz as numbers. */
export interface GridText {
  from: string | number;
  to: string | number;
  points?: number;
}

/** Which parameter to improve first: sensitivities and the best each parameter reaches alone. */
export interface RankingQuestion {
  kind: "ranking";
  /** Parameters to rank ("component.parameter"); absent: every numeric parameter. */
  parameters?: string[];
  /** Positions scanned for the best value of each parameter (3 … 10000, default 25). */
  scanPoints?: number;
  /** First relative step of the derivatives (0 < step ≤ 0.5, default 0.02). */
  relativeStep?: number;
}

/** The best settings of several parameters within their ranges. */
export interface OptimumQuestion {
  kind: "optimum";
  parameters: OptimizeParameter[];
  /** Starts: the current values, then seeded random points (1 … 100, default 4). */
  starts?: number;
  /** Seed of the random starts, 0 … 2³²−1 (default 1). */
  seed?: number;
  /** Evaluations allowed per start (default 400 + 200 × the number of parameters). */
  maxEvaluationsPerStart?: number;
  /** Convergence: simplex size in the unit box (default 1e-10). */
  tolerance?: number;
}

/** What the spread of uncertain parameters does to the figure (seeded Monte Carlo). */
export interface SpreadQuestion {
  kind: "spread";
  uncertain: UncertaintySpec[];
  /** Samples, 2 … 100000 (default 1000). */
  samples?: number;
  /** Seed, 0 … 2³²−1 (default 1). */
  seed?: number;
  /** A target for the figure ("3 dB", 1.5, 1e-36): the probability of reaching it is reported. */
  target?: string | number;
}

export type DesignQuestion = RankingQuestion | OptimumQuestion | SpreadQuestion;

/**
 * A number of an answer in JSON: finite numbers as they are, null for "no value" (NaN), and
 * infinities as text (JSON has neither).
 */
export type PlainNumber = number | null | "Infinity" | "-Infinity";

/** The figure of merit as the answer shows it. */
export interface FigureLabel {
  readonly kind: string;
  readonly label: string;
  /** "dB", "" (a ratio) or the noise's PSD unit. */
  readonly unit: string;
  readonly better: "higher" | "lower";
}

export interface RankingRow {
  readonly target: string;
  readonly value: number;
  readonly shown: string;
  /** Improvement in dB (positive: better) per +1 % of the value; null where there is none. */
  readonly gainPer1Percent: PlainNumber;
  readonly gainError: PlainNumber;
  readonly gainFor10Percent: PlainNumber;
  readonly helps: "increase" | "decrease" | "neither";
  /** The physical bound in the helping direction, as text; null: none. */
  readonly bound: string | null;
  /** The best this parameter reaches alone over its search range; null when nothing has a value. */
  readonly best: { readonly value: number; readonly shown: string; readonly figure: PlainNumber; readonly gainDb: PlainNumber; readonly at: string; readonly range: [number, number] } | null;
  readonly message: string | null;
}

export interface RankingAnswer {
  readonly kind: "ranking";
  readonly figure: FigureLabel;
  readonly current: PlainNumber;
  /** Largest |gain per 1 %| first. */
  readonly rows: RankingRow[];
  readonly evaluations: number;
}

export interface OptimumValue {
  readonly target: string;
  readonly value: number;
  readonly shown: string;
  readonly range: [number, number];
  /** "low (bound)", "high (search-limit)", … or null when inside its range. */
  readonly onBound: string | null;
}

/** Total noise over the grid at the set-up's values and at the optimum. */
export interface NoiseCurves {
  readonly frequencies: number[];
  readonly before: PlainNumber[];
  readonly after: PlainNumber[];
  readonly unit: string;
}

export interface OptimumAnswer {
  readonly kind: "optimum";
  readonly figure: FigureLabel;
  readonly status: "ok" | "infeasible";
  readonly current: PlainNumber;
  readonly optimum: { readonly figure: PlainNumber; readonly values: OptimumValue[] } | null;
  readonly starts: { readonly status: string; readonly figure: PlainNumber; readonly evaluations: number; readonly message: string | null }[];
  readonly curves: NoiseCurves | null;
  readonly evaluations: number;
  readonly message: string;
}

export interface SpreadAnswer {
  readonly kind: "spread";
  readonly figure: FigureLabel;
  readonly nominal: PlainNumber;
  readonly samples: number;
  readonly seed: number;
  readonly uncertain: {
    readonly target: string;
    readonly shown: string;
    readonly centre: number;
    readonly spread: number;
    readonly distribution: string;
    readonly truncated: boolean;
    readonly redrawn: number;
  }[];
  readonly failed: { readonly unstable: number; readonly invalid: number; readonly message: string | null };
  readonly distribution: { readonly median: PlainNumber; readonly p5: PlainNumber; readonly p95: PlainNumber; readonly mean: PlainNumber; readonly deviation: PlainNumber };
  readonly probability: { readonly target: number; readonly reached: number; readonly standardError: number } | null;
  readonly linear: { readonly mean: PlainNumber; readonly deviation: PlainNumber; readonly holds: boolean; readonly note: string };
  /** The figure of each sample, in draw order (null: the sample had no value). */
  readonly values: PlainNumber[];
  /** 5th, 50th and 95th percentiles of the total noise over the grid. */
  readonly bands: { readonly frequencies: number[]; readonly p5: PlainNumber[]; readonly median: PlainNumber[]; readonly p95: PlainNumber[]; readonly unit: string } | null;
  readonly evaluations: number;
}

export type DesignAnswer = RankingAnswer | OptimumAnswer | SpreadAnswer;

export interface DesignState {
  format: typeof DESIGN_STATE_FORMAT;
  version: number;
  /** quietframe version that computed the answer. */
  quietframe: string;
  setup: SetupDescription;
  figure: FigureSpec;
  /** Grid of the curves and grid-based figures; absent: the set-up's. */
  grid?: GridText;
  question: DesignQuestion;
  /** Shown above the widget; defaults to the question and the set-up's name. */
  title?: string;
  answer: DesignAnswer;
  /** "sha256:<hex>" of the answer's numbers (see fingerprint.ts). */
  fingerprint: string;
  /**
   * Present on an answer merged from a sweep's chunks (`quietframe sweep`): the sweep's
   * fingerprint and that of its result's numbers. Such an answer is not computed again on
   * loading (that would be the whole sweep); its numbers are checked against `fingerprint`.
   */
  sweep?: { readonly fingerprint: string; readonly result: string };
}
