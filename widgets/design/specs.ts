/** Vega-Lite specs of the design widget: ranked gains, the figure's histogram, noise bands, noise before and after an optimum. */
import { decodeNumber } from "./answer";
import type { DesignAnswer, OptimumAnswer, PlainNumber, RankingAnswer, SpreadAnswer } from "./format";
import { histogramBins, type HistogramBin } from "./histogram";
import { figureConfig, FIGURE, frequencyAxis, frequencyX } from "../core/look/layout";
import { OKABE_ITO, ROLE_COLOURS } from "../core/look/palette";

/**
 * The charts of a design answer, drawn from the answer alone (the page computes nothing to
 * draw them); the static figure (Node) uses the very same specs. The rows each chart plots are
 * exported for the CSV and for tests that hold them to the engine's numbers.
 */

type Spec = Record<string, unknown>;

const SCHEMA = "https://vega.github.io/schema/vega-lite/v5.json";
/** The budget charts' look (docs/widgets.md, "Visual identity"): the total's ink, Okabe–Ito hues, shared fonts and axes. */
const INK = { main: ROLE_COLOURS.total, second: OKABE_ITO.vermillion, band: "#C9D9E8", mark: "#3C3C3C", target: OKABE_ITO.bluishGreen };
const DIRECTION_COLOURS = { "increase ↑": OKABE_ITO.blue, "decrease ↓": OKABE_ITO.vermillion, "either way": "#8C8C8C" };

function title(text: string): Spec {
  return { text, fontSize: FIGURE.titleFontSize, anchor: "start" };
}

function unitSuffix(unit: string): string {
  return unit ? ` (${unit})` : "";
}

// ---------------------------------------------------------------------------------------------
// Ranking: gain per 1 % with its error, which way helps.

export interface GainBar {
  readonly rank: number;
  readonly target: string;
  /** Improvement in dB for a 1 % change the helping way: |gain per +1 %|. */
  readonly gain: number;
  readonly low: number;
  readonly high: number;
  readonly direction: keyof typeof DIRECTION_COLOURS;
  readonly value: string;
}

/** One bar per ranked parameter with a finite gain, in rank order. */
export function gainBars(answer: RankingAnswer): GainBar[] {
  const bars: GainBar[] = [];
  answer.rows.forEach((row, i) => {
    const g = row.gainPer1Percent === null ? NaN : decodeNumber(row.gainPer1Percent);
    if (!Number.isFinite(g)) return;
    const e = row.gainError === null ? 0 : decodeNumber(row.gainError);
    const gain = Math.abs(g);
    const error = Number.isFinite(e) ? e : 0;
    const direction = row.helps === "increase" ? "increase ↑" : row.helps === "decrease" ? "decrease ↓" : "either way";
    bars.push({ rank: i + 1, target: row.target, gain, low: gain - error, high: gain + error, direction, value: row.shown });
  });
  return bars;
}

export function rankingSpec(answer: RankingAnswer): Spec {
  const bars = gainBars(answer);
  const order = bars.map((b) => b.target);
  const y = { field: "target", type: "nominal", sort: order, title: null, axis: { labelLimit: 260 } };
  return {
    $schema: SCHEMA,
    width: 420,
    height: { step: 22 },
    title: title(`What to improve first: ${answer.figure.label}`),
    data: { values: bars },
    layer: [
      {
        mark: { type: "bar", height: { band: 0.7 } },
        encoding: {
          y,
          x: { field: "gain", type: "quantitative", title: "improvement for a 1 % change the helping way (dB)" },
          color: { field: "direction", type: "nominal", title: "helps", scale: { domain: Object.keys(DIRECTION_COLOURS), range: Object.values(DIRECTION_COLOURS) }, legend: { orient: "bottom" } },
          tooltip: [
            { field: "target", title: "parameter" },
            { field: "value", title: "now" },
            { field: "gain", title: "dB per 1 %", format: ".4g" },
            { field: "direction", title: "helps" },
          ],
        },
      },
      { mark: { type: "rule", color: INK.mark, strokeWidth: 1.5 }, encoding: { y, x: { field: "low", type: "quantitative" }, x2: { field: "high" } } },
    ],
    config: figureConfig(),
  };
}

// ---------------------------------------------------------------------------------------------
// Spread: histogram of the figure with median, 5–95 % and the target; noise bands.

export interface HistogramMark {
  readonly mark: "median" | "5 %" | "95 %" | "target";
  readonly value: number;
}

/** The bins of the samples' figures (samples without a value are left out). */
export function spreadHistogram(answer: SpreadAnswer): HistogramBin[] {
  return histogramBins(answer.values.map(decodeNumber));
}

/** The vertical marks of the histogram: median, 5 % and 95 % percentiles, and the target when one was given. */
export function histogramMarks(answer: SpreadAnswer): HistogramMark[] {
  const d = answer.distribution;
  const marks: HistogramMark[] = [
    { mark: "5 %", value: decodeNumber(d.p5) },
    { mark: "median", value: decodeNumber(d.median) },
    { mark: "95 %", value: decodeNumber(d.p95) },
  ];
  if (answer.probability) marks.push({ mark: "target", value: answer.probability.target });
  return marks.filter((m) => Number.isFinite(m.value));
}

export function histogramSpec(answer: SpreadAnswer): Spec {
  const x = { field: "x0", type: "quantitative", title: `${answer.figure.label}${unitSuffix(answer.figure.unit)}`, scale: { zero: false } };
  return {
    $schema: SCHEMA,
    width: 360,
    height: 220,
    title: title(`${answer.samples} samples, seed ${answer.seed}`),
    layer: [
      {
        data: { values: spreadHistogram(answer) },
        mark: { type: "rect", color: INK.main, opacity: 0.8, stroke: "#fff", strokeWidth: 0.5 },
        encoding: { x, x2: { field: "x1" }, y: { field: "count", type: "quantitative", title: "samples" }, tooltip: [{ field: "count", title: "samples" }] },
      },
      {
        data: { values: histogramMarks(answer) },
        mark: { type: "rule", strokeWidth: 2 },
        encoding: {
          x: { field: "value", type: "quantitative" },
          color: {
            field: "mark",
            type: "nominal",
            title: null,
            scale: { domain: ["5 %", "median", "95 %", "target"], range: [INK.second, INK.mark, INK.second, INK.target] },
            legend: { orient: "bottom" },
          },
          strokeDash: {
            field: "mark",
            type: "nominal",
            scale: {
              domain: ["5 %", "median", "95 %", "target"],
              range: [
                [5, 3],
                [1, 0],
                [5, 3],
                [2, 2],
              ],
            },
            legend: null,
          },
          tooltip: [{ field: "mark" }, { field: "value", format: ".5g" }],
        },
      },
    ],
    config: figureConfig(),
  };
}

export interface BandRow {
  readonly f: number;
  readonly p5: number;
  readonly median: number;
  readonly p95: number;
}

/** The band at each frequency where all three percentiles are positive and finite (a log axis shows nothing else). */
export function bandRows(answer: SpreadAnswer): BandRow[] {
  const b = answer.bands;
  if (!b) return [];
  const rows: BandRow[] = [];
  b.frequencies.forEach((f, i) => {
    const row = { f, p5: decodeNumber(b.p5[i]), median: decodeNumber(b.median[i]), p95: decodeNumber(b.p95[i]) };
    if (positive(row.p5) && positive(row.median) && positive(row.p95)) rows.push(row);
  });
  return rows;
}

export function bandSpec(answer: SpreadAnswer): Spec {
  const x = { field: "f", type: "quantitative", scale: { type: "log" }, title: "frequency (Hz)", axis: { format: "~s" } };
  const unit = answer.bands?.unit ?? "";
  return {
    $schema: SCHEMA,
    width: 360,
    height: 220,
    title: title("Total noise: median and 5–95 % band"),
    data: { values: bandRows(answer) },
    layer: [
      {
        mark: { type: "area", color: INK.band, opacity: 0.7 },
        encoding: { x, y: { field: "p5", type: "quantitative", scale: { type: "log" }, title: `noise PSD${unitSuffix(unit)}` }, y2: { field: "p95" } },
      },
      { mark: { type: "line", color: INK.main, strokeWidth: 2 }, encoding: { x, y: { field: "median", type: "quantitative" } } },
    ],
    config: figureConfig(),
  };
}

// ---------------------------------------------------------------------------------------------
// Optimum: the total noise at the set-up's values and at the optimum.

export const CURVE_NAMES = { before: "as given", after: "at the optimum" } as const;

export interface CurvePoint {
  readonly f: number;
  readonly curve: (typeof CURVE_NAMES)[keyof typeof CURVE_NAMES];
  readonly psd: number;
}

/** Both curves as long rows, points without a positive finite value left out. */
export function curvePoints(answer: OptimumAnswer): CurvePoint[] {
  const c = answer.curves;
  if (!c) return [];
  const points: CurvePoint[] = [];
  const add = (name: CurvePoint["curve"], values: readonly PlainNumber[]): void => {
    c.frequencies.forEach((f, i) => {
      const psd = decodeNumber(values[i]);
      if (positive(psd)) points.push({ f, curve: name, psd });
    });
  };
  add(CURVE_NAMES.before, c.before);
  add(CURVE_NAMES.after, c.after);
  return points;
}

/** `provisional`: the label of a best so far during a run ("best of 2 of 4 starts (provisional)"), shown in the title. */
export function curvesSpec(answer: OptimumAnswer, provisional?: string): Spec {
  const unit = answer.curves?.unit ?? "";
  const heading =
    answer.status !== "ok"
      ? "No optimum: every start was refused or unstable"
      : provisional
        ? `Total noise as given and at the ${provisional}: ${answer.figure.label}`
        : `Total noise before and after: ${answer.figure.label}`;
  return {
    $schema: SCHEMA,
    width: 460,
    height: 260,
    title: title(heading),
    data: { values: curvePoints(answer) },
    mark: { type: "line", strokeWidth: 2 },
    encoding: {
      x: curvesFrequencyX(answer),
      y: { field: "psd", type: "quantitative", scale: { type: "log" }, title: `noise PSD${unitSuffix(unit)}` },
      color: { field: "curve", type: "nominal", title: null, scale: { domain: [CURVE_NAMES.before, CURVE_NAMES.after], range: [INK.second, INK.main] }, legend: { orient: "bottom" } },
      strokeDash: {
        field: "curve",
        type: "nominal",
        scale: {
          domain: [CURVE_NAMES.before, CURVE_NAMES.after],
          range: [
            [6, 3],
            [1, 0],
          ],
        },
        legend: null,
      },
    },
    config: figureConfig(),
  };
}

/** The frequency axis of the before/after curves, in the unit of their band. */
function curvesFrequencyX(answer: OptimumAnswer): Spec {
  const f = answer.curves?.frequencies ?? [];
  if (f.length === 0) return { field: "f", type: "quantitative", scale: { type: "log" }, title: "frequency [Hz]" };
  return frequencyX(frequencyAxis(f[0], f[f.length - 1]), true);
}

/** The charts of an answer, in the order the page shows them (`provisional`: see curvesSpec). */
export function answerSpecs(answer: DesignAnswer, provisional?: string): Spec[] {
  switch (answer.kind) {
    case "ranking":
      return [rankingSpec(answer)];
    case "optimum":
      return [curvesSpec(answer, provisional)];
    case "spread":
      return answer.bands ? [histogramSpec(answer), bandSpec(answer)] : [histogramSpec(answer)];
  }
}

/** One spec of every chart (the static figure): the charts side by side. */
export function designFigureSpec(answer: DesignAnswer): Spec {
  const specs = answerSpecs(answer).map(({ $schema: _schema, config: _config, ...rest }) => rest);
  return specs.length === 1 ? { $schema: SCHEMA, ...specs[0], config: figureConfig() } : { $schema: SCHEMA, hconcat: specs, config: figureConfig() };
}

function positive(x: number): boolean {
  return Number.isFinite(x) && x > 0;
}
