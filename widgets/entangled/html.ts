/** The entangled-light panel's HTML in Node: the pure writers with the runtime bundle read from the build. */
import { runtimeSource } from "../core/page/runtime-source";
import type { FigureParts } from "../core/page/parts";
import { entangledFragment, entangledPageDocument } from "./fragment";
import { computeEntangled, type EntangledComputation, type EntangledState } from "./model";

export interface EntangledHtmlOptions extends FigureParts {
  /** Carry the browser runtime in this fragment (once per page or notebook). */
  includeRuntime: boolean;
}

/** A self-contained fragment for one entangled-light panel (see entangledFragment). */
export function entangledHtml(state: EntangledState, options: EntangledHtmlOptions, computation: EntangledComputation = computeEntangled(state)): string {
  return entangledFragment(state, { svg: options.svg, png: options.png, runtime: options.includeRuntime ? runtimeSource() : undefined }, computation);
}

/** A standalone page holding one live entangled-light panel; it needs no network. */
export function entangledPage(state: EntangledState, figures: FigureParts = {}): string {
  return entangledPageDocument(state, { svg: figures.svg, png: figures.png, runtime: runtimeSource() });
}
