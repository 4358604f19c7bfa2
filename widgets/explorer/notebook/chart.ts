/** A static budget chart in a notebook (Vega-Lite, SVG, text). */
import { explorerFigureSpec } from "../budget-spec";
import type { ExplorerOptions } from "../model";
import { renderSvg } from "../../core/render/static";
import { displayBundle, type MimeBundle } from "../../core/notebook/display";
import { explorer, NotebookExplorer, type ExplorerInput } from "./explorer";
import { summaryText } from "./figures";

/** Vega-Lite (v5) media type; JupyterLab renders it natively. */
export const VEGA_LITE_MIME = "application/vnd.vegalite.v5+json";

/**
 * A static chart's bundle: the Vega-Lite spec as a JSON object (front ends that render it
 * get an interactive chart), the same chart as SVG, and the key figures as text.
 */
export async function chartBundle(input: NotebookExplorer | ExplorerInput, options: ExplorerOptions = {}): Promise<MimeBundle> {
  const w = input instanceof NotebookExplorer ? input : explorer(input, options);
  const { computation } = w;
  const state = w.state;
  const spec = explorerFigureSpec(computation, state);
  return {
    [VEGA_LITE_MIME]: spec,
    "image/svg+xml": await renderSvg(spec),
    "text/plain": summaryText(computation, state),
  };
}

/** Displays the noise-budget chart of an explorer, a set-up or a saved state (write `await showChart(...)`). */
export async function showChart(input: NotebookExplorer | ExplorerInput, options: ExplorerOptions = {}): Promise<void> {
  displayBundle(await chartBundle(input, options));
}
