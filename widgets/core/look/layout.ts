/**
 * One figure layout for every chart, in the page, `quietframe render` and the notebook's
 * static image: sizes fit for a journal column, fixed margins that do not depend on how wide a
 * renderer believes its text to be, tick values chosen here (never dropped for overlap), and a
 * key of line samples drawn as marks, so each entry shows the curve's own colour and dash.
 */
import { log10, pow } from "../../../src/index";
import { INK } from "./palette";

/** Pixel sizes; at 86 mm (one journal column) 11 px text prints at about 6.5 pt. */
export const FIGURE = {
  /** Width of a plot panel. */
  plotWidth: 330,
  /** Height of the main (absolute) panel. */
  plotHeight: 210,
  /** Height of the ratio and mechanism panels. */
  panelHeight: 96,
  /** Between stacked panels. */
  spacing: 10,
  /** Outer padding of the whole figure. */
  padding: { left: 8, right: 12, top: 6, bottom: 6 },
  /** Where the y-axis title sits, left of the plot (fixed, so no measured label width moves it). */
  yTitleX: -62,
  fontSize: 11,
  titleFontSize: 12,
  /** Room above the key for the frequency axis's labels and title. */
  keyTop: 40,
  /** One row of the key. */
  keyRow: 15,
  /** Length of a key's line sample. */
  keySample: 26,
  font: "DejaVu Sans, Verdana, sans-serif",
} as const;

/** The Vega-Lite config every chart shares. */
export function figureConfig(): Record<string, unknown> {
  return {
    font: FIGURE.font,
    padding: FIGURE.padding,
    view: { stroke: null },
    title: { fontSize: FIGURE.titleFontSize, fontWeight: "normal", anchor: "start", color: INK.text, offset: 8 },
    axis: {
      labelFontSize: FIGURE.fontSize,
      titleFontSize: FIGURE.fontSize,
      titleFontWeight: "normal",
      labelColor: INK.text,
      titleColor: INK.text,
      domainColor: INK.axis,
      tickColor: INK.axis,
      gridColor: INK.grid,
      tickSize: 4,
      labelPadding: 3,
    },
    legend: { labelFontSize: FIGURE.fontSize, titleFontSize: FIGURE.fontSize, titleFontWeight: "normal", labelColor: INK.text, titleColor: INK.text },
    line: { strokeCap: "butt", strokeJoin: "round" },
    concat: { spacing: FIGURE.spacing },
  };
}

/** A y axis with its title at the fixed place left of the plot. */
export function leftAxis(title: string, extra: Record<string, unknown> = {}): Record<string, unknown> {
  return { title, titleX: FIGURE.yTitleX, titleAnchor: "middle", titleAngle: -90, titleBaseline: "bottom", ...extra };
}

export interface FrequencyAxis {
  /** "Hz", "kHz", "MHz" or "GHz": the unit of the band. */
  readonly unit: string;
  /** Hz per unit. */
  readonly divisor: number;
  /** Tick positions in Hz, inside the band (to rounding). */
  readonly ticks: number[];
  /** The scale's domain in Hz: the band, widened to a tick that rounding put just outside it. */
  readonly domain: [number, number];
}

const FREQUENCY_UNITS: readonly [string, number][] = [
  ["GHz", 1e9],
  ["MHz", 1e6],
  ["kHz", 1e3],
  ["Hz", 1],
];

/**
 * The unit and ticks of a frequency band [low, high] in Hz: the unit of the band's geometric
 * middle, decade ticks (with 2 and 5 between them when the band spans fewer than three decades)
 * on a band of a decade or more, evenly stepped ticks (1, 2 or 5 × 10ⁿ) on a narrower one.
 */
export function frequencyAxis(low: number, high: number): FrequencyAxis {
  if (!(low > 0 && high >= low && Number.isFinite(high))) throw new Error(`not a frequency band: ${low} … ${high}`);
  const middle = Math.sqrt(low * high);
  const [unit, divisor] = FREQUENCY_UNITS.find(([, d]) => middle >= d) ?? FREQUENCY_UNITS[FREQUENCY_UNITS.length - 1];
  const ticks = high / low >= 10 ? logTicks(low, high) : linearTicks(low, high);
  // A grid computed in logarithms can end at 9999.999999999995 Hz; Vega drops a tick outside its domain.
  return { unit, divisor, ticks, domain: [Math.min(low, ticks[0] ?? low), Math.max(high, ticks[ticks.length - 1] ?? high)] };
}

function logTicks(low: number, high: number): number[] {
  const first = Math.floor(log10(low));
  const last = Math.ceil(log10(high));
  const multiples = last - first <= 3 ? [1, 2, 5] : [1];
  const ticks: number[] = [];
  for (let e = first; e <= last; e++) {
    for (const m of multiples) {
      const t = Number(`${m}e${e}`);
      if (t >= low * (1 - 1e-12) && t <= high * (1 + 1e-12)) ticks.push(t);
    }
  }
  return ticks;
}

function linearTicks(low: number, high: number): number[] {
  if (high === low) return [low];
  const rough = (high - low) / 5;
  const power = pow(10, Math.floor(log10(rough)));
  const step = [1, 2, 5, 10].map((m) => m * power).find((s) => s >= rough) ?? 10 * power;
  const ticks: number[] = [];
  for (let k = Math.ceil(low / step - 1e-9); k * step <= high * (1 + 1e-12); k++) ticks.push(Number((k * step).toPrecision(12)));
  return ticks;
}

/** The x encoding of a frequency axis; `labels: false` for a panel stacked above another. */
export function frequencyX(axis: FrequencyAxis, labels: boolean): Record<string, unknown> {
  return {
    field: "f",
    type: "quantitative",
    // nice: false keeps a narrow band (1.1–1.3 MHz) from being stretched to whole decades.
    scale: { type: "log", nice: false, domain: axis.domain },
    axis: {
      values: axis.ticks,
      labelOverlap: false,
      grid: true,
      labels,
      ticks: true,
      title: labels ? `frequency [${axis.unit}]` : null,
      // Numbers only (no expression text from the state): the divisor is one of four constants.
      labelExpr: `format(datum.value / ${axis.divisor}, '.4~r')`,
    },
  };
}

/** One entry of a key: the curve's name as the `series` scales know it. */
export interface KeyEntry {
  readonly series: string;
}

/**
 * A key below the plots: one row per curve, a line sample in the curve's colour, dash and
 * width (the same `series` scales as the plot), then its name. Rows are placed by index, so
 * the key looks the same whatever text widths a renderer measures.
 */
export function keyPanel(entries: readonly KeyEntry[]): Record<string, unknown> {
  const rows = entries.map((e, i) => ({ series: e.series, y: FIGURE.keyTop + (i + 0.5) * FIGURE.keyRow }));
  const height = FIGURE.keyTop + entries.length * FIGURE.keyRow;
  const series = { field: "series", type: "nominal", legend: null };
  const y = { field: "y", type: "quantitative", scale: { domain: [0, height], range: [0, height] }, axis: null };
  return {
    width: FIGURE.plotWidth,
    height,
    data: { values: rows },
    layer: [
      {
        mark: { type: "rule", aria: false },
        encoding: { x: { value: 0 }, x2: { value: FIGURE.keySample }, y, color: series, strokeDash: series, strokeWidth: series },
      },
      {
        mark: { type: "text", align: "left", baseline: "middle", dx: FIGURE.keySample + 6, fontSize: FIGURE.fontSize, color: INK.text },
        encoding: { x: { value: 0 }, y, text: { field: "series" } },
      },
    ],
  };
}
