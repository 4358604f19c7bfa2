/** The plotted numbers of a design answer as CSV, in shortest round-trip form. */
import { decodeNumber } from "./answer";
import type { DesignAnswer, PlainNumber } from "./format";
import { bandRows, gainBars, histogramMarks, spreadHistogram } from "./specs";

/**
 * Every plotted number: the ranked gains with their errors; the noise before and after an
 * optimum; for a spread, every sample's figure, the histogram bins and marks and the noise band.
 * Numbers are written with String(x) (shortest digits that read back to the same double).
 */
export function designCsv(answer: DesignAnswer): string {
  switch (answer.kind) {
    case "ranking":
      return table(
        ["rank", "parameter", "value", "gain_dB_per_1_percent", "low_dB", "high_dB", "helps"],
        gainBars(answer).map((b) => [b.rank, b.target, b.value, b.gain, b.low, b.high, b.direction]),
      );
    case "optimum": {
      const c = answer.curves;
      const unit = c?.unit ?? "";
      return table(["frequency_Hz", `as_given_${unit}`, `at_optimum_${unit}`], c ? c.frequencies.map((f, i) => [f, number(c.before[i]), number(c.after[i])]) : []);
    }
    case "spread": {
      // One long table: what each row is, its position (sample number, bin edges, frequency) and its values.
      const rows: (string | number)[][] = [];
      answer.values.forEach((v, i) => rows.push(["sample", i, "", number(v), "", ""]));
      for (const b of spreadHistogram(answer)) rows.push(["bin", b.x0, b.x1, b.count, "", ""]);
      for (const m of histogramMarks(answer)) rows.push([`mark ${m.mark}`, "", "", m.value, "", ""]);
      for (const r of bandRows(answer)) rows.push(["band", r.f, "", r.p5, r.median, r.p95]);
      return table(["row", "x", "x_end", "value", "median", "p95"], rows);
    }
  }
}

function number(x: PlainNumber): string | number {
  const v = decodeNumber(x);
  return Number.isNaN(v) ? "" : v;
}

function table(header: readonly string[], rows: readonly (readonly (string | number)[])[]): string {
  const cell = (v: string | number): string => {
    const s = String(v);
    return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
  };
  return `${[header, ...rows].map((r) => r.map(cell).join(",")).join("\n")}\n`;
}
