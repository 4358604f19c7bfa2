import type { SetupDescription } from "../../src/setup/format";
import { loadSetupFile as readSetupFile } from "../../src/setup/load-file";

/**
 * The notebook API (kernel side, for tslab TypeScript notebooks):
 *
 *   const w = explorer(loadSetupFile("../examples/cryogenic-membrane.json"), { controls: [...] });
 *   await w.show();      // live widget, PNG fallback, text summary
 *   w.state;             // plain, shareable state
 *   w.figures;           // headline figures and the plotted table
 */
export { displayBundle, displayMarkdown, encodeBundle, kernelDisplayWriter, type DisplayOptions, type DisplayResult, type MimeBundle } from "../core/notebook/display";
export { explorer, NotebookExplorer, type ExplorerInput, type ShowOptions } from "../explorer/notebook/explorer";
export type { ControlValues, LiveChange } from "../explorer/live/live-explorer";
export { entangledPanel, EntangledPanel, type EntangledFigures, type EntangledShowOptions } from "../entangled/notebook";
export { trajectoryWidget, NotebookTrajectory, type TrajectoryChanges, type TrajectoryFiguresPlain, type TrajectoryShowOptions } from "../trajectory/notebook";
export { chartBundle, showChart, VEGA_LITE_MIME } from "../explorer/notebook/chart";
export { toleranceWidget, NotebookTolerance, type ToleranceWidgetOptions, type ToleranceShowOptions } from "../tolerance/notebook";
export { notebookFigures, summaryText, type NotebookFigures } from "../explorer/notebook/figures";
export { resetDisplaySession } from "../core/notebook/session";
export { applyValues, type ExplorerOptions } from "../explorer/model";
export type { ControlSpec, ExplorerSettings, ExplorerState } from "../explorer/format";
export type { SetupDescription } from "../../src/setup/format";

/**
 * Reads a set-up file (relative paths from the kernel's working directory, which is the
 * notebook's folder) and checks it; errors name the file, the field and the value.
 */
export function loadSetupFile(path: string): SetupDescription {
  return readSetupFile(path, "a set-up JSON file; relative paths start at the notebook's folder");
}
