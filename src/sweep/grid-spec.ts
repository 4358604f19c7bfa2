/** The tolerance-map spec a grid sweep stands for (its axes, figure and grid). */
import type { ToleranceFigureSpec, ToleranceMapSpec } from "../tolerance/spec";
import type { SweepDescription } from "./format";

export function gridSpec(d: SweepDescription): ToleranceMapSpec {
  if (d.vary.kind !== "grid") throw new Error("internal: not a grid sweep");
  // A grid's figure is checked against the map's figure kinds when the sweep is resolved.
  return { x: d.vary.x, y: d.vary.y, figure: d.figure as ToleranceFigureSpec, ...(d.grid === undefined ? {} : { grid: d.grid }) };
}
