/** Vega-Lite spec of a tolerance map's heat map. */
import { figureConfig } from "../core/look/layout";
import { axisTitle, heatmapCells, neutralValue, type HeatmapCell, type ToleranceWidgetState } from "./model";

/**
 * The Vega-Lite spec of a tolerance map: one rect per cell over the two scanned parameters
 * (log or linear axes in the written unit), computed cells coloured on a diverging scale
 * centred at 0 dB (1 for gains), cells without a value in neutral greys with a legend of
 * their own. The rows travel inline in the named dataset `cells`.
 */
export const CELLS_DATASET = "cells";

/** Worse than the neutral value, neutral, better: our own palette, readable in grey print. */
export const DIVERGING_RANGE = ["#7f3b08", "#f3eee6", "#1b4f72"] as const;

/** Greys for cells without a value, by status. */
export const NO_VALUE_COLOURS: Readonly<Record<string, string>> = { unstable: "#5f5f5f", invalid: "#a7a7a7", infinite: "#d2d2d2" };
export const NO_VALUE_TITLES: Readonly<Record<string, string>> = { unstable: "unstable", invalid: "invalid set-up", infinite: "infinite figure" };

export interface HeatmapOptions {
  width?: number;
  height?: number;
}

export function toleranceHeatmapSpec(state: ToleranceWidgetState, options: HeatmapOptions = {}): Record<string, unknown> {
  const { map } = state;
  const cells = heatmapCells(state);
  const xTitle = axisTitle(state, map.x);
  const yTitle = axisTitle(state, map.y);
  const figureTitle = map.figure.unit ? `${map.figure.label} (${map.figure.unit})` : map.figure.label;
  const legendTitle = map.figure.unit === "dB" ? "margin (dB)" : "gain (×)";
  const position = {
    x: { field: "x0", type: "quantitative", title: xTitle, scale: { type: map.x.scale, zero: false, nice: false, domain: domainOf(cells, "x") } },
    x2: { field: "x1" },
    y: { field: "y0", type: "quantitative", title: yTitle, scale: { type: map.y.scale, zero: false, nice: false, domain: domainOf(cells, "y") } },
    y2: { field: "y1" },
  };
  const tooltip = [
    { field: "xText", type: "nominal", title: xTitle },
    { field: "yText", type: "nominal", title: yTitle },
    { field: "figureText", type: "nominal", title: figureTitle },
    { field: "status", type: "nominal", title: "status" },
    { field: "message", type: "nominal", title: "note" },
  ];
  const finite = cells.filter((c) => c.value !== null).map((c) => c.value as number);
  const mid = neutralValue(map.figure);
  let lo = finite.length ? Math.min(...finite) : mid - 1;
  let hi = finite.length ? Math.max(...finite) : mid + 1;
  if (map.figure.unit === "dB") {
    const m = Math.max(Math.abs(lo), Math.abs(hi)) || 1;
    lo = -m;
    hi = m;
  } else {
    lo = Math.min(lo, mid);
    hi = Math.max(hi, mid);
    if (lo === hi) hi = lo + 1;
  }
  const layers: Record<string, unknown>[] = [
    {
      transform: [{ filter: "isValid(datum.value)" }],
      mark: { type: "rect", stroke: "#ffffff", strokeWidth: 0.4 },
      encoding: {
        ...position,
        color: {
          field: "value",
          type: "quantitative",
          title: legendTitle,
          scale: { type: "linear", domain: [lo, hi], domainMid: mid, range: [...DIVERGING_RANGE] },
          legend: { type: "symbol", symbolType: "square", values: legendValues(lo, mid, hi), orient: "right" },
        },
        tooltip,
      },
    },
  ];
  const failed = Object.keys(NO_VALUE_COLOURS).filter((s) => cells.some((c) => c.status === s));
  if (failed.length > 0) {
    layers.push({
      transform: [{ filter: "!isValid(datum.value)" }],
      mark: { type: "rect", stroke: "#ffffff", strokeWidth: 0.4 },
      encoding: {
        ...position,
        color: {
          field: "status",
          type: "nominal",
          title: "no value",
          scale: { domain: failed, range: failed.map((s) => NO_VALUE_COLOURS[s]) },
          legend: { symbolType: "square", orient: "right", labelExpr: labelExpression(failed) },
        },
        tooltip,
      },
    });
  }
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    title: { text: state.settings.title ?? state.setup.name ?? "", subtitle: figureTitle },
    width: options.width ?? 440,
    height: options.height ?? 320,
    datasets: { [CELLS_DATASET]: cells },
    data: { name: CELLS_DATASET },
    layer: layers,
    resolve: { scale: { color: "independent" }, legend: { color: "independent" } },
    config: figureConfig(),
  };
}

/** Five legend samples from the worst to the best value, through the neutral one. */
function legendValues(lo: number, mid: number, hi: number): number[] {
  const round = (v: number): number => Number(v.toPrecision(3));
  return [...new Set([round(lo), round((lo + mid) / 2), mid, round((mid + hi) / 2), round(hi)])].sort((a, b) => b - a);
}

/** Legend labels for the status names: fixed words only, chosen by index (no state text reaches the expression). */
function labelExpression(failed: readonly string[]): string {
  return failed.map((s) => `datum.label === ${JSON.stringify(s)} ? ${JSON.stringify(NO_VALUE_TITLES[s])} : `).join("") + "datum.label";
}

function domainOf(cells: readonly HeatmapCell[], axis: "x" | "y"): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of cells) {
    const a = axis === "x" ? c.x0 : c.y0;
    const b = axis === "x" ? c.x1 : c.y1;
    lo = Math.min(lo, a, b);
    hi = Math.max(hi, a, b);
  }
  return [lo, hi];
}
