import { renderPng, renderSvg, type RenderPngOptions, type RenderSvgOptions, type StaticFigures } from "../core/render/static";
import { trajectoryCsv } from "./csv";
import type { TrajectoryState } from "./format";
import { trajectoryTitle, type TrajectoryComputation } from "./model";
import { STATIC_POINTS, trajectoryRows } from "./series";
import { trajectoryPanelSpec } from "./specs";

/** The CSV holds every stored number of the run. */
export type TrajectoryFigures = StaticFigures;

/** Spec, SVG, PNG and CSV of a run, rendered in Node from the specs the browser shows. */
export async function trajectoryFigures(c: TrajectoryComputation, state: TrajectoryState, options: RenderPngOptions & RenderSvgOptions = {}): Promise<TrajectoryFigures> {
  const spec = trajectoryPanelSpec(trajectoryRows(c.result, STATIC_POINTS, state.joint), state.joint.map((j) => j.label), state.pair, trajectoryTitle(state));
  const svg = await renderSvg(spec, options);
  return { spec, svg, png: renderPng(svg, options), csv: trajectoryCsv(c.result, state.joint) };
}
