import { noiseBudget, type NoiseBudget } from "../engine/budget";
import { headlineFigures } from "../engine/headline";
import { analyzeStability } from "../engine/stability";
import { QuietframeError, QuietframeErrors } from "../errors";
import { assemble } from "../setup/assemble";
import { log10 } from "../numeric/portable-math";
import { loadSetup } from "../pipeline";
import { inspiralRange } from "../reach";
import { applyValues } from "../setup/apply-values";
import type { SetupDescription } from "../setup/format";
import type { FigurePlan, TolerancePlan } from "./spec";

/**
 * One cell of a tolerance map: the set-up with the two axis values written in, through the
 * ordinary pipeline (validate, assemble, stability, budget), reduced to one number.
 * Pure and platform-free: the in-process run, every worker and a browser run this code.
 */

/** Cell status codes of `ToleranceMap.status`. */
export const CellStatus = {
  /** The figure was computed. */
  ok: 0,
  /** The set-up has a growing mode: its spectra mean nothing. */
  unstable: 1,
  /** The set-up is rejected (a value outside its range, a blind readout, …) or the figure is undefined there. */
  invalid: 2,
} as const;
export type CellStatusCode = (typeof CellStatus)[keyof typeof CellStatus];

/** Why a cell has no value. */
export interface CellMessage {
  /** Column and row of the cell. */
  readonly x: number;
  readonly y: number;
  readonly status: CellStatusCode;
  /** The two values as written into the cell's set-up, by target. */
  readonly setting: Readonly<Record<string, string>>;
  readonly message: string;
}

/** Failed cells whose messages a row (and the whole map) keeps, first in row-major order. */
export const MAX_CELL_MESSAGES = 8;

export interface RowResult {
  readonly values: Float64Array;
  readonly status: Uint8Array;
  /** Failed cells of the row, by status (counted in full). */
  readonly unstable: number;
  readonly invalid: number;
  /** Messages of the row's first failed cells (at most MAX_CELL_MESSAGES). */
  readonly messages: CellMessage[];
}

/** The set-up of cell (i, j): a copy with x value i and y value j written into their parameters. */
export function cellSetup(plan: Pick<TolerancePlan, "setup" | "x" | "y">, i: number, j: number): SetupDescription {
  return applyValues(plan.setup, { [plan.x.target]: plan.x.written[i], [plan.y.target]: plan.y.written[j] });
}

/** Value and status of one cell; failures carry a message. */
export function evaluateCell(plan: TolerancePlan, frequencies: Float64Array, i: number, j: number): { value: number; status: CellStatusCode; message?: string } {
  try {
    const assembled = assemble(loadSetup(cellSetup(plan, i, j)));
    const stability = analyzeStability(assembled);
    if (stability.growing.length > 0) return { value: NaN, status: CellStatus.unstable, message: stability.summary };
    const budget = noiseBudget(assembled, frequencies);
    const value = figureValue(plan.figure, budget, frequencies);
    if (Number.isNaN(value)) {
      return { value: NaN, status: CellStatus.invalid, message: "the figure of merit is undefined here (the noise or its reference is 0/0 or ∞/∞)" };
    }
    return { value, status: CellStatus.ok };
  } catch (e) {
    if (e instanceof QuietframeError || e instanceof QuietframeErrors) return { value: NaN, status: CellStatus.invalid, message: e.message };
    throw e;
  }
}

/** Row j of the map (all x values at y value j). */
export function evaluateRow(plan: TolerancePlan, frequencies: Float64Array, j: number): RowResult {
  const nx = plan.x.written.length;
  const values = new Float64Array(nx);
  const status = new Uint8Array(nx);
  const messages: CellMessage[] = [];
  let unstable = 0;
  let invalid = 0;
  for (let i = 0; i < nx; i++) {
    const cell = evaluateCell(plan, frequencies, i, j);
    values[i] = cell.value;
    status[i] = cell.status;
    if (cell.status === CellStatus.ok) continue;
    if (cell.status === CellStatus.unstable) unstable++;
    else invalid++;
    if (messages.length < MAX_CELL_MESSAGES) {
      messages.push({
        x: i,
        y: j,
        status: cell.status,
        setting: { [plan.x.target]: plan.x.written[i], [plan.y.target]: plan.y.written[j] },
        message: cell.message ?? "",
      });
    }
  }
  return { values, status, unstable, invalid, messages };
}

/** The figure of merit of one budget (see the figure specs in spec.ts for the definitions). */
export function figureValue(figure: FigurePlan, budget: NoiseBudget, frequencies: Float64Array): number {
  switch (figure.kind) {
    case "margin-at": {
      const sql = sqlOf(budget);
      // The same expression as the headline margin.
      return 10 * log10(sql[figure.index] / budget.total[figure.index]);
    }
    case "margin-band": {
      const sql = sqlOf(budget);
      let reference = 0;
      let noise = 0;
      for (let i = figure.first; i <= figure.last; i++) {
        reference += sql[i];
        noise += budget.total[i];
      }
      return 10 * log10(reference / noise);
    }
    case "best-margin":
      return headlineFigures(budget).bestMarginDb;
    case "range-gain": {
      if (budget.quantity.name !== "strain") throw new Error(`internal: a range-gain cell is referred to ${budget.quantity.name}`);
      const ratio = inspiralRange(frequencies, budget.total, figure.inspiral).metres / figure.referenceMetres;
      return figure.measure === "range" ? ratio : ratio * ratio * ratio;
    }
  }
}

function sqlOf(budget: NoiseBudget): Float64Array {
  const sql = budget.references.find((r) => r.id === "sql");
  if (!sql) throw new Error("internal: a margin cell has no SQL reference");
  return sql.psd;
}
