/** The tolerance map's HTML in Node: the pure writers with the runtime bundle read from the build. */
import { runtimeSource } from "../core/page/runtime-source";
import type { FigureParts } from "../core/page/parts";
import { toleranceFragment, tolerancePageDocument } from "./fragment";
import type { ToleranceWidgetState } from "./model";

export interface ToleranceHtmlOptions extends FigureParts {
  /** Carry the browser runtime in this fragment (once per page or notebook; see ExplorerHtmlOptions). */
  includeRuntime: boolean;
}

/**
 * A self-contained HTML fragment for one tolerance map: the static heat map and its summary,
 * the map's state as JSON (data, base set-up and spec: the page recomputes nothing to draw
 * it), and the bootstrap that turns it into the live heat map when the runtime is present.
 */
export function toleranceHtml(state: ToleranceWidgetState, options: ToleranceHtmlOptions): string {
  return toleranceFragment(state, { svg: options.svg, png: options.png, runtime: options.includeRuntime ? runtimeSource() : undefined });
}

/** A complete HTML document with one live tolerance map; needs no network. */
export function tolerancePage(state: ToleranceWidgetState, figures: FigureParts = {}): string {
  return tolerancePageDocument(state, { svg: figures.svg, png: figures.png, runtime: runtimeSource() });
}
