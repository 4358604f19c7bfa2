import type { HeadlineFigures } from "../../src/engine/headline";
import { formatQuantity } from "../../src/units";

/**
 * The headline figures as short labelled lines of plain text. The static fallback and the
 * live readout both show these, so a reader without scripts sees the same numbers.
 */
export interface SummaryLine {
  readonly label: string;
  readonly text: string;
}

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
