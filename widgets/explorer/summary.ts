/** The explorer's headline figures and reach as summary lines. */
import { formatQuantity, type HeadlineFigures } from "../../src/index";
import type { ReachFigures } from "./reach";
import type { SummaryLine } from "../core/page/summary-line";

/** The explorer's headline figures and reach gauge as summary lines (see core/page/summary-line.ts). */

const hz = (f: number): string => formatQuantity(f, "frequency", 5);

export function headlineSummary(h: HeadlineFigures): SummaryLine[] {
  const lines: SummaryLine[] = [];
  if (Number.isFinite(h.bestMarginDb)) {
    lines.push(
      h.bestMarginDb > 0
        ? { label: "Largest margin below the SQL", text: `${h.bestMarginDb.toFixed(2)} dB at ${hz(h.bestMarginAt)}` }
        : { label: "Closest approach to the SQL", text: `${(-h.bestMarginDb).toFixed(2)} dB above it at ${hz(h.bestMarginAt)}` },
    );
  } else {
    lines.push({ label: "SQL", text: "no SQL reference for this signal" });
  }
  lines.push({
    label: "Below the SQL",
    text: h.belowSqlBands.length ? h.belowSqlBands.map(([a, b]) => (a === b ? hz(a) : `${hz(a)} – ${hz(b)}`)).join(", ") : "nowhere on this grid",
  });
  lines.push({
    label: "Largest term",
    text: h.dominant.map((d) => `${d.term} (${d.from === d.to ? hz(d.from) : `${hz(d.from)} – ${hz(d.to)}`})`).join("; "),
  });
  return lines;
}

/** The label of the reach line, e.g. "Inspiral reach (1.4 + 1.4 M☉, SNR 8)". */
export function reachLabel(reach: ReachFigures): string {
  const { m1, m2, snr } = reach.source;
  return `Inspiral reach (${m1} + ${m2} M☉, SNR ${snr})`;
}

/**
 * The reach gauge as one labelled line, e.g.
 * "range 182 Mpc (×1.26 range, ×2.0 volume vs the initial set-up); horizon 412 Mpc".
 */
export function reachSummary(reach: ReachFigures): SummaryLine[] {
  const label = reachLabel(reach);
  if (!reach.available) return [{ label, text: `not available: ${reach.problem}` }];
  const c = reach.comparison;
  const against = c
    ? ` (×${rangeRatioText(c.rangeRatio)} range, ×${volumeGainText(c.volumeGain)} volume vs ${c.against})`
    : reach.comparisonProblem !== undefined
      ? ` (no comparison: ${reach.comparisonProblem})`
      : "";
  return [{ label, text: `range ${distanceText(reach.range.megaparsecs)}${against}; horizon ${distanceText(reach.horizon.megaparsecs)}` }];
}

const DISTANCE_UNITS: readonly { readonly unit: string; readonly megaparsecs: number }[] = [
  { unit: "Gpc", megaparsecs: 1e3 },
  { unit: "Mpc", megaparsecs: 1 },
  { unit: "kpc", megaparsecs: 1e-3 },
  { unit: "pc", megaparsecs: 1e-6 },
];

/** A distance given in Mpc, to 3 significant digits in the largest unit that keeps it ≥ 1 (pc at the smallest). */
export function distanceText(megaparsecs: number): string {
  if (!Number.isFinite(megaparsecs)) return `${megaparsecs} Mpc`;
  if (megaparsecs === 0) return "0 Mpc";
  for (const u of DISTANCE_UNITS) {
    const v = Number((megaparsecs / u.megaparsecs).toPrecision(3));
    if (v >= 1 || u.unit === "pc") return `${v.toPrecision(3)} ${u.unit}`;
  }
  throw new Error("internal: no distance unit");
}

/** A range ratio to 3 significant digits ("1.26"). */
export function rangeRatioText(ratio: number): string {
  return Number.isFinite(ratio) ? ratio.toPrecision(3) : String(ratio);
}

/** A volume ratio to 2 significant digits ("2.0"), whole numbers up to a million. */
export function volumeGainText(gain: number): string {
  if (!Number.isFinite(gain)) return String(gain);
  if (gain < 100 || gain >= 1e6) return gain.toPrecision(2);
  return String(Math.round(gain));
}
