/** Tolerance maps: a figure of merit over a grid of two parameters of a set-up. */
export { toleranceMap } from "./map";
export { TolerancePool } from "./parallel";
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
