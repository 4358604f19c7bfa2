/** The trajectory widget's HTML in Node: the pure writers with the runtime bundle read from the build. */
import { runtimeSource } from "../core/page/runtime-source";
import type { FigureParts } from "../core/page/parts";
import type { TrajectoryState } from "./format";
import { trajectoryFragment, trajectoryPageDocument } from "./fragment";
import type { TrajectoryComputation } from "./model";

export interface TrajectoryHtmlOptions extends FigureParts {
  /** Carry the browser runtime in this fragment (once per page or notebook). */
  includeRuntime: boolean;
}

/** A self-contained fragment for one trajectory widget (see trajectoryFragment). */
export function trajectoryHtml(state: TrajectoryState, computation: TrajectoryComputation, options: TrajectoryHtmlOptions): string {
  return trajectoryFragment(state, computation, { svg: options.svg, png: options.png, runtime: options.includeRuntime ? runtimeSource() : undefined });
}

/** A standalone page holding one live trajectory widget; it needs no network. */
export function trajectoryPage(state: TrajectoryState, computation: TrajectoryComputation, figures: FigureParts = {}): string {
  return trajectoryPageDocument(state, computation, { svg: figures.svg, png: figures.png, runtime: runtimeSource() });
}
