/** Every number of the entangled-light panel's figure as CSV. */
import { SPECTRUM_SERIES, type EntangledComputation } from "./model";

/**
 * The panel's plotted numbers as CSV, each in shortest round-trip form so the file gives the
 * computed doubles back exactly: one row per sideband frequency with both spectra (dB relative
 * to the vacuum level of the same quantity), then the summary numbers (vacuum quadrature
 * variance 1/2) as rows of their own, after an empty line.
 */
export function entangledCsv(c: EntangledComputation): string {
  const conditional = c.spectrum.filter((row) => row.series === SPECTRUM_SERIES.conditional);
  const epr = c.spectrum.filter((row) => row.series === SPECTRUM_SERIES.epr);
  const lines = [["sideband frequency [Hz]", `${SPECTRUM_SERIES.conditional} [dB re vacuum]`, `${SPECTRUM_SERIES.epr} [dB re vacuum]`].map(quote).join(",")];
  conditional.forEach((row, i) => lines.push([row.f, row.db, epr[i].db].map(String).join(",")));
  lines.push("", "quantity,value");
  const summary: [string, number][] = [
    ["Var(X1 − X2) at zero sideband frequency [vacuum 1]", c.eprX],
    ["Var(P1 + P2) at zero sideband frequency [vacuum 1]", c.eprP],
    ["Duan sum [vacuum 2]", c.duanSum],
    ["Duan bound for separable states", c.duanBound],
    ["logarithmic negativity [ebit]", c.logNegativity],
    ["Var(X1 | X2) [vacuum 1/2]", c.conditionalVariance],
  ];
  for (const [name, value] of summary) lines.push(`${quote(name)},${value}`);
  return `${lines.join("\n")}\n`;
}

function quote(text: string): string {
  return /[",\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}
