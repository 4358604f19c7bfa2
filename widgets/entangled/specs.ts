/** Vega-Lite specs of the entangled-light panel (spectrum, EPR variances, quadrature ellipses). */
import { ELLIPSE_SERIES, EPR_LABELS, SPECTRUM_SERIES, type EntangledComputation } from "./model";

/**
 * Vega-Lite specs of the entangled-light panel. Each chart reads one named dataset, so the
 * page can swap numbers in place; the static figure (Node) uses the very same specs.
 */
export const SPECTRUM_DATASET = "spectrum";
export const EPR_DATASET = "epr";
export const ELLIPSE_DATASET = "ellipses";

type Spec = Record<string, unknown>;

const FONT = "DejaVu Sans, sans-serif";
const PALETTE = ["#5b3f8c", "#c2571a", "#2a7f62", "#8a8a8a"];

/** The axis texts state the one quadrature convention of every quietframe widget: vacuum variance ½ (DEVELOPERS.md). */
export const VACUUM_CONVENTION = "vacuum quadrature variance ½";

export function spectrumSpec(c: EntangledComputation, white: boolean): Spec {
  // The axis spans exactly the computed band: no empty decade before the first point.
  const frequencies = c.spectrum.map((row) => row.f);
  const band = [Math.min(...frequencies), Math.max(...frequencies)];
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    width: 340,
    height: 200,
    title: { text: white ? "Squeezing spectrum (white source)" : "Squeezing spectrum", font: FONT, fontSize: 13 },
    data: { name: SPECTRUM_DATASET, values: c.spectrum },
    layer: [
      {
        mark: { type: "line", strokeWidth: 2 },
        encoding: {
          x: { field: "f", type: "quantitative", scale: { type: "log", domain: band, nice: false }, title: "sideband frequency Ω/2π (Hz)", axis: { format: "~s" } },
          y: { field: "db", type: "quantitative", title: `noise relative to vacuum (dB; ${VACUUM_CONVENTION})` },
          color: {
            field: "series",
            type: "nominal",
            scale: { domain: [SPECTRUM_SERIES.conditional, SPECTRUM_SERIES.epr], range: PALETTE.slice(0, 2) },
            legend: { orient: "bottom", title: null, direction: "vertical", labelLimit: 320 },
          },
        },
      },
      { mark: { type: "rule", strokeDash: [4, 3], color: "#444" }, data: { values: [{ y: 0 }] }, encoding: { y: { field: "y", type: "quantitative" } } },
    ],
    config: { font: FONT },
  };
}

export function eprSpec(c: EntangledComputation): Spec {
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    width: 220,
    height: 200,
    title: { text: "EPR variances and Duan sum", font: FONT, fontSize: 13 },
    data: { name: EPR_DATASET, values: c.epr },
    layer: [
      {
        mark: { type: "bar", color: PALETTE[0] },
        encoding: {
          x: { field: "quantity", type: "nominal", sort: [EPR_LABELS.x, EPR_LABELS.p, EPR_LABELS.duan], title: null, axis: { labelAngle: 0 } },
          y: { field: "value", type: "quantitative", title: `variance (vacuum 1 each, bound 2; ${VACUUM_CONVENTION})`, stack: null },
        },
      },
      {
        mark: { type: "rule", color: PALETTE[1], strokeWidth: 2, strokeDash: [6, 3] },
        data: { values: [{ bound: c.duanBound, label: "separable ≥ 2" }] },
        encoding: { y: { field: "bound", type: "quantitative" } },
      },
      {
        mark: { type: "text", align: "right", dx: 0, dy: -6, color: PALETTE[1], x: "width" },
        data: { values: [{ bound: c.duanBound, label: "separable ≥ 2" }] },
        encoding: { y: { field: "bound", type: "quantitative" }, text: { field: "label" } },
      },
    ],
    config: { font: FONT },
  };
}

export function ellipseSpec(c: EntangledComputation): Spec {
  const m = c.ellipseExtent;
  const series = [ELLIPSE_SERIES.vacuum, ELLIPSE_SERIES.arm1, ELLIPSE_SERIES.arm2, ELLIPSE_SERIES.conditional];
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    width: 220,
    height: 220,
    title: { text: "Quadrature noise (1σ contours)", font: FONT, fontSize: 13 },
    data: { name: ELLIPSE_DATASET, values: c.ellipses },
    mark: { type: "line", strokeWidth: 2 },
    encoding: {
      x: { field: "x", type: "quantitative", scale: { domain: [-m, m], nice: false }, title: `X (amplitude; ${VACUUM_CONVENTION})` },
      y: { field: "y", type: "quantitative", scale: { domain: [-m, m], nice: false }, title: `P (phase; ${VACUUM_CONVENTION})` },
      order: { field: "i", type: "quantitative" },
      color: {
        field: "series",
        type: "nominal",
        scale: { domain: series, range: [PALETTE[3], PALETTE[2], PALETTE[1], PALETTE[0]] },
        legend: { orient: "bottom", title: null, direction: "vertical", labelLimit: 320 },
      },
      strokeDash: {
        field: "series",
        type: "nominal",
        scale: {
          domain: series,
          range: [
            [3, 3],
            [1, 0],
            [6, 2],
            [10, 3, 2, 3],
          ],
        },
        legend: null,
      },
    },
    config: { font: FONT },
  };
}

/** The three charts side by side, for the static figure. */
export function panelSpec(c: EntangledComputation, title: string, white: boolean): Spec {
  const strip = (s: Spec): Spec => {
    const { $schema: _schema, config: _config, ...rest } = s;
    return rest;
  };
  return {
    $schema: "https://vega.github.io/schema/vega-lite/v5.json",
    title: { text: title, font: FONT, fontSize: 15 },
    hconcat: [strip(spectrumSpec(c, white)), strip(eprSpec(c)), strip(ellipseSpec(c))],
    resolve: { scale: { color: "independent", strokeDash: "independent" } },
    config: { font: FONT },
  };
}
