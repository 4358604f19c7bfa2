/**
 * The explorer's HTML in Node: the pure fragment and page writers with the runtime bundle read
 * from the build (dist/widgets/runtime.js) where they carry it.
 */
import { runtimeSource } from "../core/page/runtime-source";
import type { FigureParts } from "../core/page/parts";
import type { ExplorerState } from "./format";
import { explorerFragment } from "./fragment";
import type { ExplorerComputation } from "./model";
import { explorerPage } from "./standalone";

export interface ExplorerHtmlOptions extends FigureParts {
  /**
   * Carry the browser runtime (about 0.8 MB) in this fragment. A page or notebook needs it
   * once: set it for the first widget only; later fragments boot with the same runtime.
   */
  includeRuntime: boolean;
}

/** Static figures for the page's fallback (see ExplorerHtmlOptions). */
export type StandaloneFigures = FigureParts;

/**
 * A self-contained HTML fragment for one explorer: static figure and summary, the state as
 * JSON, and a bootstrap that turns it into the live widget when the runtime is present.
 */
export function explorerHtml(state: ExplorerState, computation: ExplorerComputation, options: ExplorerHtmlOptions): string {
  return explorerFragment(state, computation, { svg: options.svg, png: options.png, runtime: options.includeRuntime ? runtimeSource() : undefined });
}

/** A complete HTML document: one live explorer and a panel to open another state; needs no network. */
export function standalonePage(state: ExplorerState, computation: ExplorerComputation, figures: StandaloneFigures = {}): string {
  return explorerPage(state, computation, { svg: figures.svg, png: figures.png, runtime: runtimeSource() });
}
