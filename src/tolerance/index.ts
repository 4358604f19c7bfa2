/**
 * Tolerance maps: a figure of merit over a grid of two parameters of a set-up. This entry is
 * platform-free (cells, in-process maps); the worker pool is Node-only, in ./node.
 */
export {
  toleranceMapInProcess,
  toleranceCellSetup,
  ToleranceMapCancelled,
  type ToleranceMap,
  type ToleranceAxis,
  type ToleranceMapOptions,
} from "./run";
export { CellStatus, MAX_CELL_MESSAGES, type CellMessage, type CellStatusCode } from "./evaluate";
export {
  MAX_TOLERANCE_CELLS,
  FIGURE_KINDS,
  type AxisScale,
  type FigureKind,
  type FigureInfo,
  type ToleranceMapSpec,
  type ToleranceAxisSpec,
  type ToleranceFigureSpec,
  type MarginAtSpec,
  type MarginBandSpec,
  type BestMarginSpec,
  type RangeGainSpec,
} from "./spec";
