/** Vega-Lite specs of the trajectory widget's charts. */
import type { TrajectoryState } from "./format";
import { trajectoryTitle, type TrajectoryComputation } from "./model";
import { CURVES, MEASURES, STATIC_POINTS, trajectoryRows, type TrajectoryRows } from "./series";

/**
 * Vega-Lite specs of the trajectory widget. Each chart reads named datasets, so the page
 * can swap numbers in place; the static figure (Node) uses the very same specs.
 */
export const DATASETS = { joint: "joint", records: "records", variance: "variance", zeroPoints: "zeroPoints", logNeg: "logNeg", duan: "duan" } as const;

/** The one quadrature convention of every quietframe widget, stated on each axis that shows quadratures. */
const QUADRATURE_UNITS = "dimensionless quadrature; vacuum variance ½";

type Spec = Record<string, unknown>;

const SCHEMA = "https://vega.github.io/schema/vega-lite/v5.json";
const FONT = "DejaVu Sans, sans-serif";
// Our own palette: one hue per joint variable.
const PALETTE = ["#1f5f8b", "#b5472a", "#3f7f3a", "#7a4b94", "#8c6d1f", "#2b7a78", "#9b3d62", "#555555"];
const WIDTH = 380;
const HEIGHT = 210;
const LEGEND = { orient: "bottom", title: null, direction: "vertical", labelLimit: 360 } as const;

function timeField(rows: TrajectoryRows): Spec {
  return { field: "t", type: "quantitative", title: `time (${rows.axis.unit})`, scale: { nice: false } };
}

function seriesColor(labels: readonly string[]): Spec {
  return { field: "series", type: "nominal", scale: { domain: [...labels], range: PALETTE.slice(0, Math.max(1, labels.length)) }, legend: LEGEND };
}

/** Half-height of the normalised-error axis, in standard deviations; points beyond it are clipped. */
export const ERROR_AXIS_SIGMAS = 4;

/**
 * The estimation error of each joint variable (estimate − true value) in units of the
 * conditional state's standard deviation, with the ±1σ band: one row per variable, all on the
 * same scale, so the band stays visible however far the variance falls from its starting value.
 * The error is plotted rather than the variable itself, which oscillates at its mode's frequency
 * and would fill a static figure as a solid block. A consistent filter keeps the line inside the
 * band about 68 % of the time. Estimates, true values and variances are in the CSV.
 */
export function jointSpec(rows: TrajectoryRows, labels: readonly string[]): Spec {
  const band = [
    { t: rows.joint.length ? rows.joint[0].t : 0, lower: -1, upper: 1 },
    { t: rows.joint.length ? rows.joint[rows.joint.length - 1].t : 1, lower: -1, upper: 1 },
  ];
  return {
    $schema: SCHEMA,
    title: { text: "Estimation error (estimate − true value) in units of its σ; band ±1σ", font: FONT, fontSize: 13 },
    data: { name: DATASETS.joint, values: rows.joint },
    facet: {
      row: {
        field: "series",
        type: "nominal",
        sort: [...labels],
        title: null,
        header: { labelAngle: 0, labelAlign: "left", labelAnchor: "start", labelOrient: "top", labelFont: FONT, labelFontSize: 11 },
      },
    },
    spec: {
      width: WIDTH,
      height: Math.max(60, Math.round(HEIGHT / Math.max(1, labels.length)) + 20),
      layer: [
        {
          data: { values: band },
          mark: { type: "area", color: "#8fa9bf", opacity: 0.45 },
          encoding: { x: timeField(rows), y: { field: "lower", type: "quantitative" }, y2: { field: "upper" } },
        },
        {
          mark: { type: "line", strokeWidth: 0.9, clip: true },
          encoding: {
            x: timeField(rows),
            y: {
              field: "normalizedError",
              type: "quantitative",
              title: "error / σ (σ = √conditional variance)",
              scale: { domain: [-ERROR_AXIS_SIGMAS, ERROR_AXIS_SIGMAS], nice: false },
              axis: { values: [-4, -2, -1, 0, 1, 2, 4] },
            },
            color: { ...seriesColor(labels), legend: null },
          },
        },
      ],
    },
    spacing: 8,
    config: { font: FONT },
  };
}

/** The measurement records as the filter reads them: each output averaged over the interval between stored points. */
export function recordSpec(rows: TrajectoryRows): Spec {
  const outputs = [...new Set(rows.records.map((r) => r.output))];
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: 150,
    title: { text: "Measurement record (mean over each stored interval)", font: FONT, fontSize: 13 },
    data: { name: DATASETS.records, values: rows.records },
    mark: { type: "line", strokeWidth: 0.8 },
    encoding: {
      x: timeField(rows),
      y: { field: "value", type: "quantitative", title: "record dy/dt (√Hz; white noise of one-sided density 1)" },
      color: { field: "output", type: "nominal", scale: { domain: outputs, range: PALETTE.slice(PALETTE.length - outputs.length) }, legend: LEGEND },
    },
    config: { font: FONT },
  };
}

/** Conditional, unconditional and each system's part alone, with the zero-point level. */
export function varianceSpec(rows: TrajectoryRows, labels: readonly string[]): Spec {
  const curves = [...new Set(rows.variance.map((r) => r.curve))];
  // Solid conditional, dashed unconditional, dash-dot patterns for the parts; the zero-point rules are dotted.
  const partDashes = [
    [9, 3, 2, 3],
    [3, 2],
    [12, 3, 2, 3, 2, 3],
  ];
  let part = 0;
  const dashes = curves.map((c) => (c === CURVES.conditional ? [1, 0] : c === CURVES.unconditional ? [6, 3] : partDashes[part++ % partDashes.length]));
  // The conditional variance is drawn first and widest, so a part that equals it stays visible on top of it.
  const widths = curves.map((c) => (c === CURVES.conditional ? 3.2 : c === CURVES.unconditional ? 1.6 : 1.3));
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: HEIGHT,
    title: { text: "Variances (zero-point: dotted)", font: FONT, fontSize: 13 },
    layer: [
      {
        data: { name: DATASETS.variance, values: rows.variance },
        mark: { type: "line", strokeWidth: 1.6 },
        encoding: {
          x: timeField(rows),
          y: { field: "value", type: "quantitative", scale: { type: "log" }, title: `variance (${QUADRATURE_UNITS}; log scale)` },
          color: seriesColor(labels),
          strokeDash: { field: "curve", type: "nominal", scale: { domain: curves, range: dashes }, legend: { ...LEGEND, title: null } },
          strokeWidth: { field: "curve", type: "nominal", scale: { domain: curves, range: widths }, legend: null },
          opacity: { condition: { test: `datum.curve === '${CURVES.conditional}'`, value: 0.55 }, value: 1 },
          detail: { field: "curve", type: "nominal" },
        },
      },
      {
        data: { name: DATASETS.zeroPoints, values: rows.zeroPoints },
        mark: { type: "rule", strokeDash: [1, 3], strokeWidth: 1.4 },
        encoding: { y: { field: "value", type: "quantitative" }, color: seriesColor(labels) },
      },
    ],
    config: { font: FONT },
  };
}

/** Logarithmic negativity of the pair over time, from the conditional and the unconditional state. */
export function logNegSpec(rows: TrajectoryRows, pair: readonly [string, string]): Spec {
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: 170,
    title: { text: `Entanglement of ${pair[0]} and ${pair[1]}`, font: FONT, fontSize: 13 },
    data: { name: DATASETS.logNeg, values: rows.logNeg },
    mark: { type: "line", strokeWidth: 1.6 },
    encoding: {
      x: timeField(rows),
      y: { field: "value", type: "quantitative", title: "log-negativity (ebits)" },
      color: { field: "measure", type: "nominal", scale: { domain: [MEASURES.logNeg, MEASURES.logNegUnconditional], range: ["#5b3f8c", "#9a9a9a"] }, legend: LEGEND },
    },
    config: { font: FONT },
  };
}

/** Duan sum over time with the separability bound (below it: entangled). */
export function duanSpec(rows: TrajectoryRows, pair: readonly [string, string]): Spec {
  const bound = rows.duanBound ?? 2;
  return {
    $schema: SCHEMA,
    width: WIDTH,
    height: 170,
    title: { text: `Duan sums, 1 = ${pair[0]}, 2 = ${pair[1]} (separable: ≥ bound)`, font: FONT, fontSize: 13 },
    layer: [
      {
        data: { name: DATASETS.duan, values: rows.duan },
        mark: { type: "line", strokeWidth: 1.6 },
        encoding: {
          x: timeField(rows),
          // Log scale: the two sign conventions can differ by orders of magnitude.
          y: { field: "value", type: "quantitative", title: "Duan sum, conditional (vacuum 2; log scale)", scale: { type: "log" } },
          color: { field: "measure", type: "nominal", scale: { domain: rows.duanMeasures, range: rows.duanMeasures.length > 1 ? ["#9a9a9a", "#5b3f8c"] : ["#5b3f8c"] }, legend: LEGEND },
        },
      },
      { data: { values: [{ bound }] }, mark: { type: "rule", color: "#c2571a", strokeDash: [6, 3], strokeWidth: 1.6 }, encoding: { y: { field: "bound", type: "quantitative" } } },
      {
        data: { values: [{ bound, label: `bound ${bound}` }] },
        mark: { type: "text", align: "right", dy: -6, color: "#c2571a", x: "width" },
        encoding: { y: { field: "bound", type: "quantitative" }, text: { field: "label" } },
      },
    ],
    config: { font: FONT },
  };
}

/** The charts a state shows: two always, two more when a pair is followed. */
export function trajectorySpecs(rows: TrajectoryRows, labels: readonly string[], pair: readonly [string, string] | null): Spec[] {
  const specs = [jointSpec(rows, labels), varianceSpec(rows, labels)];
  if (rows.records.length > 0) specs.push(recordSpec(rows));
  if (pair && rows.logNeg.length > 0) specs.push(logNegSpec(rows, pair), duanSpec(rows, pair));
  return specs;
}

/** All charts in one figure (two per row), for static SVG/PNG. */
export function trajectoryPanelSpec(rows: TrajectoryRows, labels: readonly string[], pair: readonly [string, string] | null, title: string): Spec {
  const strip = (s: Spec): Spec => {
    const { $schema: _schema, config: _config, ...rest } = s;
    return rest;
  };
  const charts = trajectorySpecs(rows, labels, pair).map(strip);
  const lines: Spec[] = [];
  for (let i = 0; i < charts.length; i += 2) lines.push({ hconcat: charts.slice(i, i + 2), resolve: { scale: { color: "independent", strokeDash: "independent" } } });
  return { $schema: SCHEMA, title: { text: title, font: FONT, fontSize: 15 }, vconcat: lines, resolve: { scale: { color: "independent", strokeDash: "independent" } }, config: { font: FONT } };
}

/** The Vega-Lite spec of the static figure: every chart of the run, each curve thinned to STATIC_POINTS. */
export function trajectoryFigureSpec(c: TrajectoryComputation, state: TrajectoryState): Record<string, unknown> {
  return trajectoryPanelSpec(
    trajectoryRows(c.result, STATIC_POINTS, state.joint),
    state.joint.map((j) => j.label),
    state.pair,
    trajectoryTitle(state),
  );
}
