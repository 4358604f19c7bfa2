import type { NoiseBudget } from "./budget";

/** A budget as named columns, ready for CSV or JSON: ASD (default) or PSD. */
export interface BudgetTable {
  readonly spectralDensity: "amplitude" | "power";
  /** Unit of every noise column, e.g. "m/√Hz" or "m²/Hz". */
  readonly unit: string;
  readonly columns: readonly { readonly id: string; readonly label: string; readonly values: Float64Array }[];
  readonly frequencies: Float64Array;
}

/** Unit of a spectral density of a quantity whose amplitude unit is `u` ("1" for strain). */
export function spectralDensityUnit(u: string, spectralDensity: "amplitude" | "power"): string {
  if (u === "1") return spectralDensity === "amplitude" ? "1/√Hz" : "1/Hz";
  return spectralDensity === "amplitude" ? `${u}/√Hz` : `${u}²/Hz`;
}

export function tabulateBudget(budget: NoiseBudget, spectralDensity: "amplitude" | "power" = "amplitude"): BudgetTable {
  const unit = spectralDensityUnit(budget.quantity.unit, spectralDensity);
  const conv = (psd: Float64Array): Float64Array => (spectralDensity === "amplitude" ? psd.map(Math.sqrt) : psd.slice());
  return {
    spectralDensity,
    unit,
    frequencies: budget.frequencies,
    columns: [
      { id: "total", label: "total", values: conv(budget.total) },
      ...budget.terms.map((t) => ({ id: t.id, label: t.label, values: conv(t.psd) })),
      ...budget.references.map((r) => ({ id: r.id, label: r.label, values: conv(r.psd) })),
    ],
  };
}

/** RFC 4180 CSV with units in the header; numbers in shortest round-trip form; infinite values as "inf". */
export function tableToCsv(table: BudgetTable): string {
  const head = ["frequency [Hz]", ...table.columns.map((c) => `${c.label} [${table.unit}]`)].map(csvField).join(",");
  const lines = [head];
  for (let i = 0; i < table.frequencies.length; i++) {
    lines.push([table.frequencies[i], ...table.columns.map((c) => c.values[i])].map(csvNumber).join(","));
  }
  return lines.join("\n") + "\n";
}

/** One CSV field (RFC 4180): quoted when it holds a quote, a comma or a line break. */
export function csvField(s: string): string {
  return /[",\n\r]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

function csvNumber(x: number): string {
  return Number.isFinite(x) ? String(x) : x > 0 ? "inf" : "nan";
}

/** JSON has no infinity: such points become null. */
export function jsonNumbers(values: Float64Array): (number | null)[] {
  return Array.from(values, (v) => (Number.isFinite(v) ? v : null));
}
