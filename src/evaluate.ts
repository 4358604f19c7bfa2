import { noiseBudget, noiseBudgets, type NoiseBudget } from "./engine/budget";
import { budgetByMechanism, type MechanismBudget } from "./engine/mechanisms";
import type { PhysicalityReport } from "./engine/covariance";
import { checkGrid, DEFAULT_GRID_POINTS, logGrid, type FrequencyGridSpec } from "./setup/grid";
import type { StabilityReport } from "./engine/stability";
import { QuietframeError } from "./errors";
import type { AssembledSetup } from "./setup/assemble";
import type { PreparedSetup } from "./prepare";

/**
 * Pass 5 of the pipeline: a prepared set-up's signal-referred noise budget and reference
 * curves on a frequency grid. Pure arithmetic on the prepared model: the same prepared set-up
 * on the same grid gives the same bits as preparing it afresh.
 */

/** Grid used when neither the set-up nor the caller gives one. */
export const FALLBACK_GRID: FrequencyGridSpec = { from: 1, to: 1e5, points: DEFAULT_GRID_POINTS };

export interface Evaluation {
  readonly assembled: AssembledSetup;
  readonly stability: StabilityReport;
  /** Uncertainty-relation check of the stationary state (absent when there is none, e.g. a free mass). */
  readonly physicality?: PhysicalityReport;
  readonly budget: NoiseBudget;
  readonly cautions: readonly string[];
  /** The budget's own warnings (frequencies where the readout is blind) first, then the set-up's. */
  readonly warnings: readonly string[];
}

/**
 * The budget of a prepared set-up. `grid`: a log-spaced grid in Hz ({ from > 0, to > from,
 * points 2 … 100 000 }), or the frequencies themselves (Hz, each finite and > 0); default the
 * set-up's own grid, else FALLBACK_GRID (1 Hz … 100 kHz, 400 points). Throws QuietframeError
 * for a bad grid (path `grid.*` or `frequencies`) and for a readout the signal never reaches
 * (path `readout`).
 */
export function evaluate(prepared: PreparedSetup, grid?: FrequencyGridSpec | Float64Array): Evaluation {
  return new Evaluated(prepared, noiseBudget(prepared.assembled, frequenciesOf(grid ?? prepared.setup.grid ?? FALLBACK_GRID)));
}

/** An evaluation whose warnings are written when read (a class: see docs/performance.md on getters). */
class Evaluated implements Evaluation {
  readonly #prepared: PreparedSetup;
  #warnings: readonly string[] | undefined;
  readonly assembled: AssembledSetup;
  readonly stability: StabilityReport;
  readonly physicality: PhysicalityReport | undefined;

  constructor(
    prepared: PreparedSetup,
    readonly budget: NoiseBudget,
  ) {
    this.#prepared = prepared;
    this.assembled = prepared.assembled;
    this.stability = prepared.stability;
    this.physicality = prepared.physicality;
  }

  get cautions(): readonly string[] {
    return this.#prepared.cautions;
  }

  get warnings(): readonly string[] {
    return (this.#warnings ??= [...this.budget.warnings, ...this.#prepared.warnings]);
  }

  /** In JSON as a plain object would be: its fields, cautions and warnings. */
  toJSON(): Evaluation {
    const { assembled, stability, physicality, budget, cautions, warnings } = this;
    return { assembled, stability, physicality, budget, cautions, warnings };
  }
}

/**
 * The budgets of a prepared set-up on several lists of frequencies (Hz, each checked as evaluate
 * checks one), solved in one pass over all of them: each has the bits of evaluate(prepared,
 * list).budget. Throws what evaluate throws for one of the lists (not necessarily the first).
 */
export function evaluateBudgets(prepared: PreparedSetup, lists: readonly Float64Array[]): NoiseBudget[] {
  return noiseBudgets(prepared.assembled, lists.map(frequenciesOf));
}

/**
 * The light sources' budget terms of a prepared set-up split into imprecision, back-action and
 * their signed cross-correlation (src/engine/mechanisms.ts), on the same grids as `evaluate`
 * and with the same errors; each term's parts add up to the term of `evaluate`'s budget.
 */
export function evaluateMechanisms(prepared: PreparedSetup, grid?: FrequencyGridSpec | Float64Array): MechanismBudget {
  return budgetByMechanism(prepared.assembled, frequenciesOf(grid ?? prepared.setup.grid ?? FALLBACK_GRID));
}

function frequenciesOf(grid: FrequencyGridSpec | Float64Array): Float64Array {
  if (!(grid instanceof Float64Array)) {
    if (typeof grid !== "object" || grid === null) {
      throw new QuietframeError({ path: "grid", value: grid, problem: "must be a grid or a list of frequencies", allowed: "{ from, to, points } in Hz, or a Float64Array of frequencies in Hz" });
    }
    return logGrid(checkGrid(grid, "grid"));
  }
  if (grid.length === 0) throw new QuietframeError({ path: "frequencies", value: [], problem: "is empty", allowed: "at least one frequency" });
  for (let i = 0; i < grid.length; i++) {
    if (!(grid[i] > 0) || !Number.isFinite(grid[i])) {
      throw new QuietframeError({ path: `frequencies[${i}]`, value: grid[i], problem: "is not a usable frequency", allowed: "a finite frequency above 0 Hz" });
    }
  }
  return grid;
}
