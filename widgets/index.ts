/**
 * "quietframe/widgets": the widgets' pure code for Node (state files, figures, HTML), the
 * widget kinds and their registry. The notebook API is "quietframe/notebook".
 */
// Every kind, and reading any saved state through them.
export { WIDGET_KINDS, kindOf, loadWidgetState } from "./registry";
export type { WidgetKind, WidgetView, LoadedWidget, LoadOptions, FigureSource } from "./core/kind";

// Shared: state text, static figures, summary lines.
export { WIDGET_STATE_MIME } from "./core/state/widget-state";
export { MAX_STATE_TEXT_BYTES, parseUntrustedJson } from "./core/state/state-text";
export * from "./core/render/static";
export type { SummaryLine } from "./core/page/summary-line";

// The noise-budget explorer.
export * from "./explorer/document";
export { explorerFigures, type ExplorerFigures } from "./explorer/figures";
export * from "./explorer/methods/methods";
export { KIND_METHODS, methodsOfLoaded, widgetMethods, type MethodsDocument, type MethodsOptions } from "./methods";
export { explorerHtml, standalonePage, type ExplorerHtmlOptions, type StandaloneFigures } from "./explorer/html";
export { headlineSummary } from "./explorer/summary";

// Tolerance maps.
export { toleranceHtml, tolerancePage, type ToleranceHtmlOptions } from "./tolerance/html";
export { toleranceHeatmapSpec } from "./tolerance/heatmap-spec";

// Entangled-light panels.
export { entangledHtml, entangledPage, type EntangledHtmlOptions } from "./entangled/html";
export {
  computeEntangled,
  createEntangledState,
  loadEntangledState,
  entangledStateText,
  ENTANGLED_STATE_FORMAT,
  ENTANGLED_STATE_VERSION,
  type EntangledComputation,
  type EntangledOptions,
  type EntangledState,
} from "./entangled/model";
export { panelSpec as entangledPanelSpec } from "./entangled/specs";

// Trajectory widgets.
export { trajectoryHtml, trajectoryPage, type TrajectoryHtmlOptions } from "./trajectory/html";
export { computeTrajectory, createTrajectoryState, prepareTrajectory, finishTrajectory, type TrajectoryComputation, type TrajectoryOptions } from "./trajectory/model";
export { loadTrajectoryState, parseTrajectoryState, trajectoryDocumentText, isTrajectoryInput } from "./trajectory/document";
export { TRAJECTORY_STATE_FORMAT, TRAJECTORY_STATE_VERSION, type TrajectoryState, type SimulationSpec } from "./trajectory/format";
export { trajectoryPanelSpec } from "./trajectory/specs";

// Design answers (ranking, optimum, spread).
export { designHtml, designPage, type DesignHtmlOptions } from "./design/html";
export { loadDesignState, readDesignState, designDocumentText, isDesignInput, type LoadedDesignState } from "./design/document";
export { DESIGN_STATE_FORMAT, DESIGN_STATE_VERSION, type DesignState, type DesignQuestion } from "./design/format";
