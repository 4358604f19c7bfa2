/** The trajectory widget's static figure (spec, SVG, PNG, CSV), rendered in Node from the specs the browser shows. */
import { renderFigures, type RenderPngOptions, type RenderSvgOptions, type StaticFigures } from "../core/render/static";
import { trajectoryCsv } from "./csv";
import type { TrajectoryState } from "./format";
import type { TrajectoryComputation } from "./model";
import { trajectoryFigureSpec } from "./specs";

/** The CSV holds every stored number of the run. */
export type TrajectoryFigures = StaticFigures;

/** Spec, SVG, PNG and CSV of a run, rendered in Node from the specs the browser shows. */
export async function trajectoryFigures(c: TrajectoryComputation, state: TrajectoryState, options: RenderPngOptions & RenderSvgOptions = {}): Promise<TrajectoryFigures> {
  return renderFigures(trajectoryFigureSpec(c, state), trajectoryCsv(c.result, state.joint), options);
}
