/** "quietframe/notebook": the notebook API, each kind's from its own folder. */
import type { SetupDescription } from "../../src/index";
import { loadSetupFile as readSetupFile } from "../../src/node";

/**
 * The notebook API (kernel side, for tslab TypeScript notebooks):
 *
 *   const w = explorer(loadSetupFile("../examples/cryogenic-membrane.json"), { controls: [...] });
 *   await w.show();      // live widget, PNG fallback, text summary
 *   w.state;             // plain, shareable state
 *   w.figures;           // headline figures and the plotted table
 */
// Shared: displaying outputs, the per-kernel runtime flag, reading any saved widget state.
export { displayBundle, displayMarkdown, encodeBundle, kernelDisplayWriter, type DisplayOptions, type DisplayResult, type MimeBundle } from "../core/notebook/display";
export { resetDisplaySession } from "../core/notebook/session";
export { loadWidgetState } from "../registry";
export { methods, saveMethods, type MethodsSource } from "./methods";
export type { MethodsDocument, MethodsOptions } from "../methods";
export type { ControlSpec } from "../core/controls/control-spec";
export type { SetupDescription } from "../../src/index";

// Each kind's notebook API, from the kind's folder.
export { explorer, NotebookExplorer, type ExplorerInput, type ShowOptions } from "../explorer/notebook/explorer";
export { chartBundle, showChart, VEGA_LITE_MIME } from "../explorer/notebook/chart";
export { notebookFigures, summaryText, type NotebookFigures } from "../explorer/notebook/figures";
export type { ControlValues, LiveChange } from "../explorer/live/live-explorer";
export { applyValues, type ExplorerOptions } from "../explorer/model";
export type { ExplorerSettings, ExplorerState } from "../explorer/format";
export { entangledPanel, EntangledPanel, type EntangledFigures, type EntangledShowOptions } from "../entangled/notebook";
export { trajectoryWidget, NotebookTrajectory, type TrajectoryChanges, type TrajectoryFiguresPlain, type TrajectoryShowOptions } from "../trajectory/notebook";
export { toleranceWidget, NotebookTolerance, type ToleranceWidgetOptions, type ToleranceShowOptions } from "../tolerance/notebook";
export {
  rankingWidget,
  optimumWidget,
  spreadWidget,
  rankingWidgetAsync,
  optimumWidgetAsync,
  spreadWidgetAsync,
  designWidget,
  NotebookDesign,
  type DesignShowOptions,
  type DesignWidgetOptions,
  type RankingWidgetOptions,
  type OptimumWidgetOptions,
  type SpreadWidgetOptions,
  type QuestionChanges,
  type StoppableRunOptions,
} from "../design/notebook";
export type { DesignAnswer, DesignState, RankingAnswer, OptimumAnswer, SpreadAnswer } from "../design/format";

/**
 * Reads a set-up file (relative paths from the kernel's working directory, which is the
 * notebook's folder) and checks it; errors name the file, the field and the value.
 */
export function loadSetupFile(path: string): SetupDescription {
  return readSetupFile(path, "a set-up JSON file; relative paths start at the notebook's folder");
}
