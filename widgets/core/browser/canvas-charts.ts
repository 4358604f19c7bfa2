/** A row of static Vega-Lite charts drawn on canvases, replaced whole when their data change. */
import type { View } from "vega";
import { el } from "./dom";
import { vega } from "./vega";

/**
 * Draws each spec into a new canvas host, then swaps the hosts into `container` and finalizes
 * the `previous` views (only once the new ones are drawn, so the panel never shows an empty
 * row). Returns the new views, which the caller keeps for the next swap and for disposal.
 */
export async function replaceCanvasCharts(container: HTMLElement, specs: readonly object[], previous: readonly View[]): Promise<View[]> {
  const hosts = specs.map(() => el("div", { class: "qf-canvas" }));
  const { View, parse, compile } = vega();
  const views = specs.map((spec) => new View(parse(compile(spec as unknown as Parameters<typeof compile>[0]).spec), { renderer: "canvas", hover: false }));
  await Promise.all(views.map((v, i) => v.initialize(hosts[i]).runAsync()));
  for (const v of previous) v.finalize();
  container.replaceChildren(...hosts);
  return views;
}
