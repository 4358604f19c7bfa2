import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { QuietframeError } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";
import { parseJsonText } from "../../src/setup/parse-json";
import { validateSetup } from "../../src/setup/validate";

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
  let text: string;
  try {
    text = readFileSync(resolve(path), "utf8");
  } catch (e) {
    const reason = (e as NodeJS.ErrnoException).code === "ENOENT" ? "does not exist" : "cannot be read";
    throw new QuietframeError({ path, problem: `${reason} (looked in ${process.cwd()})`, allowed: "a set-up JSON file; relative paths start at the notebook's folder" });
  }
  const setup = parseJsonText(text, path);
  validateSetup(setup);
  return setup as SetupDescription;
}
