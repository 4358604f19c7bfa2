import { figureAndCurveOfPrepared } from "../figures/of-setup";
import { CellStatus, type CellStatusCode, type FigureOutcome } from "../figures/outcome";
import { SetupPreparer, type SetupValues } from "../prepare";
import type { TolerancePlan } from "./spec";

/**
 * One cell of a tolerance map: the set-up with the two axis values written in, through the
 * ordinary pipeline (prepare, evaluate), reduced to one number. The set-up is validated once per
 * plan (a SetupPreparer) and each cell revalidates only the components its two values name: the
 * same bits and the same refusals as preparing the cell's whole set-up (the preparer's promise,
 * test/engine/prepared-equivalence.test.ts). A cell is refused with the same message any other
 * caller gets for that set-up.
 * Pure and platform-free: the in-process run, every worker and a browser run this code.
 */

// Cell status codes of `ToleranceMap.status` are the shared figure outcomes.
export { CellStatus, type CellStatusCode } from "../figures/outcome";
export { figureValue } from "../figures/value";

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

/** The values of cell (i, j): x value i and y value j as written into their parameters. */
export function cellValues(plan: Pick<TolerancePlan, "x" | "y">, i: number, j: number): SetupValues {
  return { [plan.x.target]: plan.x.written[i], [plan.y.target]: plan.y.written[j] };
}

// One preparer per plan: a worker keeps its map's plan object for every row it is sent.
const preparers = new WeakMap<TolerancePlan, SetupPreparer>();

function preparerOf(plan: TolerancePlan): SetupPreparer {
  let preparer = preparers.get(plan);
  if (!preparer) {
    preparer = new SetupPreparer(plan.setup);
    preparers.set(plan, preparer);
  }
  return preparer;
}

/** Value and status of one cell; failures carry a message. */
export function evaluateCell(plan: TolerancePlan, frequencies: Float64Array, i: number, j: number): FigureOutcome {
  const preparer = preparerOf(plan);
  return figureAndCurveOfPrepared(() => preparer.prepare(cellValues(plan, i, j)), plan.figure, frequencies, undefined);
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
