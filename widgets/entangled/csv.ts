/** Every number of the entangled-light panel, as the labelled series its CSV and its fingerprint are written from. */
import { csvField } from "../../src/index";
import { seriesFingerprint } from "../core/state/series-fingerprint";
import type { EntangledComputation } from "./model";
import { ELLIPSE_SERIES, SPECTRUM_SERIES } from "./series-names";

/**
 * The panel's numbers in one order and with one set of names, shared by the CSV and the
 * fingerprint (docs/fingerprint.md), so that a reader recomputes the fingerprint from the CSV:
 * each series' label is the CSV's column header, row name or contour name.
 */
interface Series {
  readonly label: string;
  readonly values: readonly number[];
}

const FREQUENCY = "sideband frequency [Hz]";
const SPECTRUM_LABELS = { conditional: `${SPECTRUM_SERIES.conditional} [dB re vacuum]`, epr: `${SPECTRUM_SERIES.epr} [dB re vacuum]` } as const;
const COVARIANCE = "covariance X1 P1 X2 P2 (row-major, vacuum 1/2)";
const QUADRATURES = ["X1", "P1", "X2", "P2"] as const;

function summary(c: EntangledComputation): Series[] {
  return [
    { label: "Var(X1 - X2) at zero sideband frequency [vacuum 1]", values: [c.eprX] },
    { label: "Var(P1 + P2) at zero sideband frequency [vacuum 1]", values: [c.eprP] },
    { label: "Duan sum [vacuum 2]", values: [c.duanSum] },
    { label: "Duan bound for separable states", values: [c.duanBound] },
    { label: "logarithmic negativity [ebit]", values: [c.logNegativity] },
    { label: "Var(X1 | X2) [vacuum 1/2]", values: [c.conditionalVariance] },
  ];
}

function spectrum(c: EntangledComputation): Series[] {
  const of = (series: string) => c.spectrum.filter((row) => row.series === series);
  return [
    { label: FREQUENCY, values: of(SPECTRUM_SERIES.conditional).map((row) => row.f) },
    { label: SPECTRUM_LABELS.conditional, values: of(SPECTRUM_SERIES.conditional).map((row) => row.db) },
    { label: SPECTRUM_LABELS.epr, values: of(SPECTRUM_SERIES.epr).map((row) => row.db) },
  ];
}

function contours(c: EntangledComputation): { name: string; x: number[]; y: number[] }[] {
  return Object.values(ELLIPSE_SERIES).map((name) => {
    const points = c.ellipses.filter((p) => p.series === name);
    return { name, x: points.map((p) => p.x), y: points.map((p) => p.y) };
  });
}

/** Fingerprint of a computed panel: the CSV's numbers, in the CSV's order, under the CSV's names. */
export function entangledFingerprint(c: EntangledComputation): string {
  return seriesFingerprint(({ label, series }) => {
    label("quietframe entangled-panel fingerprint 1");
    for (const s of [...spectrum(c), ...summary(c)]) series(s.label, s.values);
    series(COVARIANCE, c.covariance);
    for (const k of contours(c)) {
      series(`${k.name}: X`, k.x);
      series(`${k.name}: P`, k.y);
    }
  });
}

/**
 * The panel's numbers as CSV, each in shortest round-trip form so the file gives the computed
 * doubles back exactly. Four tables, separated by an empty line: the spectra (one row per
 * sideband frequency, dB relative to the vacuum level of the same quantity), the summary
 * numbers, the covariance at zero sideband frequency, and the 1σ contours point by point.
 */
export function entangledCsv(c: EntangledComputation): string {
  const [f, conditional, epr] = spectrum(c);
  const lines = [[f.label, conditional.label, epr.label].map(csvField).join(",")];
  f.values.forEach((x, i) => lines.push([x, conditional.values[i], epr.values[i]].map(String).join(",")));
  lines.push("", "quantity,value");
  for (const s of summary(c)) lines.push(`${csvField(s.label)},${s.values[0]}`);
  lines.push("", [csvField(COVARIANCE), ...QUADRATURES].join(","));
  QUADRATURES.forEach((q, row) => lines.push([q, ...Array.from(c.covariance.subarray(4 * row, 4 * row + 4), String)].join(",")));
  lines.push("", "contour,point,X,P");
  for (const k of contours(c)) k.x.forEach((x, i) => lines.push([csvField(k.name), i, x, k.y[i]].join(",")));
  return `${lines.join("\n")}\n`;
}
