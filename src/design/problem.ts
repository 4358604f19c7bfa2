import { spectralDensityUnit } from "../engine/tabulate";
import { QuietframeError } from "../errors";
import { assemble } from "../setup/assemble";
import { figureAndCurveOfPrepared } from "../figures/of-setup";
import { CellStatus, type FigureOutcome } from "../figures/outcome";
import { ALL_FIGURE_KINDS, resolveFigure, type FigureInfo, type FigureSpec, type FigurePlan } from "../figures/spec";
import { log10, pow } from "../numeric/portable-math";
import { FALLBACK_GRID } from "../pipeline";
import type { SetupDescription } from "../setup/format";
import { checkGrid, logGrid, parseGrid, type FrequencyGridSpec } from "../setup/grid";
import { loadSetup } from "../setup/load";
import { SetupPreparer } from "../prepare";
import { parseJsonText } from "../setup/parse-json";
import type { ResolvedSetup } from "../setup/validate";
import { exactText, type DesignParameter } from "./parameters";

/**
 * A design question's fixed part: the set-up as given, the figure of merit (every kind of
 * src/figures, figures at one frequency evaluated at that exact frequency) and the grid. It
 * evaluates the figure at trial values of parameters through the one pipeline (prepare →
 * evaluate), and puts every figure on one scale in dB so searches can compare and step.
 */

/** A grid as a user writes it ({ from: "1 Hz", to: "1 kHz", points: 400 }) or in SI numbers. */
export type DesignGrid = { from: string | number; to: string | number; points?: number } | FrequencyGridSpec;

export interface DesignFigure extends FigureInfo {
  /** "higher": margins and reach gains; "lower": the noise at a frequency. */
  readonly better: "higher" | "lower";
}

export interface DesignProblem {
  readonly setup: SetupDescription;
  readonly base: ResolvedSetup;
  readonly figure: DesignFigure;
  readonly plan: FigurePlan;
  /** Frequencies (Hz) the figure is evaluated on. */
  readonly figureFrequencies: Float64Array;
  /** Unit of the total noise (one-sided PSD), e.g. "m²/Hz". */
  readonly noiseUnit: string;
  /** The grid of the set-up's curves (and of grid-based figures). */
  readonly grid: FrequencyGridSpec;
  /** The figure with the given parameters (SI values by target) written into the set-up. */
  evaluate(values: Readonly<Record<string, number>>, parameters: readonly DesignParameter[]): FigureOutcome;
  /** As evaluate, with the total noise on `curveFrequencies` too. */
  evaluateWithCurve(values: Readonly<Record<string, number>>, parameters: readonly DesignParameter[], curveFrequencies: Float64Array): FigureOutcome & { readonly curve?: Float64Array };
  /** Evaluations so far. */
  readonly evaluations: number;
}

/**
 * Checks the set-up (a description or its JSON text), the figure (path `figure.*`) and the grid
 * (path `grid.*`; default the set-up's, else 1 Hz … 100 kHz).
 */
export function designProblem(setup: SetupDescription | string, figure: FigureSpec, grid?: DesignGrid): DesignProblem {
  const description = (typeof setup === "string" ? parseJsonText(setup, "setup") : setup) as SetupDescription;
  const base = loadSetup(description);
  const g = grid === undefined ? (base.grid ?? FALLBACK_GRID) : resolveGrid(grid);
  const resolved = resolveFigure(description, base, figure, g, { kinds: ALL_FIGURE_KINDS, atFrequency: "exact" });
  const designFigure: DesignFigure = { ...resolved.info, better: resolved.info.kind === "noise-at" ? "lower" : "higher" };
  let evaluations = 0;
  // Each trial is written into the set-up validated once (the same result as writing it into the description and preparing that).
  const preparer = new SetupPreparer(description);
  const written = (values: Readonly<Record<string, number>>, parameters: readonly DesignParameter[]) => {
    const text: Record<string, string | number> = {};
    for (const p of parameters) {
      const v = values[p.target];
      if (v !== undefined) text[p.target] = exactText(v, p);
    }
    return () => preparer.prepare(text);
  };
  return {
    setup: description,
    base,
    figure: designFigure,
    plan: resolved.plan,
    figureFrequencies: resolved.frequencies,
    noiseUnit: spectralDensityUnit(assemble(base).referredTo.unit, "power"),
    grid: g,
    evaluate(values, parameters) {
      evaluations++;
      return figureAndCurveOfPrepared(written(values, parameters), resolved.plan, resolved.frequencies, undefined);
    },
    evaluateWithCurve(values, parameters, curveFrequencies) {
      evaluations++;
      return figureAndCurveOfPrepared(written(values, parameters), resolved.plan, resolved.frequencies, curveFrequencies);
    },
    get evaluations() {
      return evaluations;
    },
  };
}

function resolveGrid(grid: DesignGrid): FrequencyGridSpec {
  if (typeof grid !== "object" || grid === null) {
    throw new QuietframeError({ path: "grid", value: grid, problem: "must be a grid", allowed: '{ from: "1 Hz", to: "1 kHz", points: 400 }' });
  }
  if (typeof grid.from === "number" && typeof grid.to === "number" && typeof grid.points === "number") return checkGrid(grid as FrequencyGridSpec, "grid");
  return parseGrid(grid, "grid");
}

/** The figure in dB: margins as they are, the noise and reach ratios as 10·log10 of the value. */
export function levelDb(figure: DesignFigure, value: number): number {
  return figure.unit === "dB" ? value : 10 * log10(value);
}

/** A value back from its level in dB (inverse of levelDb). */
export function valueOfLevel(figure: DesignFigure, level: number): number {
  return figure.unit === "dB" ? level : pow(10, level / 10);
}

/**
 * Improvement in dB, higher is better on every figure: the level for margins and gains, minus the
 * level for the noise. An outcome without a value scores −Infinity.
 */
export function merit(figure: DesignFigure, outcome: FigureOutcome): number {
  if (outcome.status !== CellStatus.ok) return -Infinity;
  const level = levelDb(figure, outcome.value);
  if (Number.isNaN(level)) return -Infinity;
  return figure.better === "higher" ? level : -level;
}

/** The figure as display text: "3.21 dB", "1.23e-36 m²/Hz", "1.07". */
export function shownFigure(figure: DesignFigure, value: number): string {
  if (!Number.isFinite(value)) return String(value);
  if (figure.unit === "dB") return `${value.toFixed(3)} dB`;
  return figure.unit === "" ? value.toPrecision(6) : `${value.toPrecision(6)} ${figure.unit}`;
}

/** The grid's frequencies (Hz). */
export function gridFrequencies(problem: DesignProblem): Float64Array {
  return logGrid(problem.grid);
}
