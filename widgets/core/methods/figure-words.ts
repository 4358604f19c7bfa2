/**
 * A figure of merit in words and formula for a methods text (tolerance maps and design answers
 * evaluate the same figures, src/figures): margins in dB with their sign, band averages, reach.
 */
import type { Writer } from "./writers";

/** What the kinds store about a figure (src/figures FigureInfo, as saved in a state). */
export interface FigureFacts {
  readonly kind: string;
  readonly label: string;
  readonly unit: string;
  readonly frequency?: number;
  readonly band?: readonly [number, number];
  readonly bandPoints?: number;
}

export function figureSentence(w: Writer, f: FigureFacts): string {
  const margin = `${w.math("10 log₁₀(S_SQL/S_total)", "10\\log_{10}(S_{\\mathrm{SQL}}/S_{\\mathrm{total}})")} in dB of power, positive where the total noise is below the standard quantum limit`;
  switch (f.kind) {
    case "margin-at":
      return `The figure of merit is the margin below the SQL, ${margin}, at ${f.frequency === undefined ? "the chosen frequency" : w.qty(f.frequency, "frequency")} (the grid point nearest the requested frequency in log f).`;
    case "margin-band":
      return (
        `The figure of merit is the band margin ${w.math("10 log₁₀(Σ_i S_SQL,i / Σ_i S_total,i)", "10\\log_{10}\\bigl(\\sum_i S_{\\mathrm{SQL},i}/\\sum_i S_{\\mathrm{total},i}\\bigr)")} in dB of power over the ${f.bandPoints ?? ""} grid points ` +
        `${f.band ? `from ${w.qty(f.band[0], "frequency")} to ${w.qty(f.band[1], "frequency")}` : "of the band"} (each point weighs the same: an average over log-frequency); positive is below the SQL.`
      );
    case "best-margin":
      return `The figure of merit is the largest margin below the SQL anywhere on the grid, ${margin}.`;
    case "range-gain":
      return `The figure of merit is the binary-inspiral reach relative to the reference set-up on the same grid (${w.text(f.label)}).`;
    case "noise-at":
      return `The figure of merit is the total signal-referred noise PSD in ${w.unit(f.unit)} at ${f.frequency === undefined ? "the chosen frequency" : w.qty(f.frequency, "frequency")}; lower is better.`;
    default:
      return `The figure of merit is ${w.text(f.label)}.`;
  }
}
