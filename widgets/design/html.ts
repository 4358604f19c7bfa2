/** The design widget's HTML in Node: the pure writers with the runtime bundle read from the build. */
import { runtimeSource } from "../core/page/runtime-source";
import type { FigureParts } from "../core/page/parts";
import { designFragment, designPageDocument } from "./fragment";
import type { DesignState } from "./format";

export interface DesignHtmlOptions extends FigureParts {
  /** Carry the browser runtime in this fragment (once per page or notebook). */
  includeRuntime: boolean;
}

/** A self-contained HTML fragment for one design widget. */
export function designHtml(state: DesignState, options: DesignHtmlOptions): string {
  return designFragment(state, { svg: options.svg, png: options.png, runtime: options.includeRuntime ? runtimeSource() : undefined });
}

/** A complete HTML document with one live design widget; needs no network. */
export function designPage(state: DesignState, figures: FigureParts = {}): string {
  return designPageDocument(state, { svg: figures.svg, png: figures.png, runtime: runtimeSource() });
}
