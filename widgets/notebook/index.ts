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
export { displayBundle, displayMarkdown, encodeBundle, kernelDisplayWriter, type DisplayOptions, type DisplayResult, type MimeBundle } from "./display";
export { explorer, NotebookExplorer, type ExplorerInput, type ShowOptions } from "./explorer";
export type { ControlValues, LiveChange } from "../live/live-explorer";
export { entangledPanel, EntangledPanel, type EntangledFigures, type EntangledShowOptions } from "./entangled";
export { trajectoryWidget, NotebookTrajectory, type TrajectoryChanges, type TrajectoryFiguresPlain, type TrajectoryShowOptions } from "./trajectory";
export { chartBundle, showChart, VEGA_LITE_MIME } from "./chart";
export { toleranceWidget, NotebookTolerance, type ToleranceWidgetOptions, type ToleranceShowOptions } from "./tolerance";
export { notebookFigures, summaryText, type NotebookFigures } from "./figures";
export { resetDisplaySession } from "./session";
export { applyValues, type ExplorerOptions } from "../explorer/model";
export type { ControlSpec, ExplorerSettings, ExplorerState } from "../state/format";
export type { SetupDescription } from "../../src/setup/format";

/**
 * Reads a set-up file (relative paths from the kernel's working directory, which is the
 * notebook's folder) and checks it; errors name the file, the field and the value.
 */
export function loadSetupFile(path: string): SetupDescription {
  return readSetupFile(path, "a set-up JSON file; relative paths start at the notebook's folder");
}
