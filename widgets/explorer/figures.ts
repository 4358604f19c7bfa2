/** The explorer's static figure (Vega-Lite spec, SVG, PNG, CSV), rendered in Node from the spec the browser shows. */
import { tableToCsv } from "../../src/index";
import { renderFigures, type RenderPngOptions, type RenderSvgOptions, type StaticFigures } from "../core/render/static";
import { explorerFigureSpec } from "./budget-spec";
import type { ExplorerState } from "./format";
import type { ExplorerComputation } from "./model";

export type ExplorerFigures = StaticFigures;

/** Spec, SVG, PNG and CSV of an explorer's figure; the title is the state's, or the set-up's name. */
export async function explorerFigures(computation: ExplorerComputation, state: ExplorerState, options: RenderPngOptions & RenderSvgOptions = {}): Promise<ExplorerFigures> {
  return renderFigures(explorerFigureSpec(computation, state), tableToCsv(computation.table), options);
}
