/**
 * The classical noise terms of a set-up in a methods text: each term's name, where and how it
 * enters the model (a force, a displacement, a strain, or the noise of the laser that drives a
 * cavity or probe, with the conversion used), and how its spectrum is read between and beyond
 * its points.
 */
import type { ResolvedSetup } from "../../../src/index";
import type { Writer } from "./writers";

type ClassicalTerm = ResolvedSetup["classical"][number];

/** One sentence per term, then one on interpolation (nothing when the set-up has no classical term). */
export function classicalSentences(w: Writer, setup: ResolvedSetup): string[] {
  if (setup.classical.length === 0) return [];
  const terms = setup.classical.map((t) => termSentence(w, t));
  const extension = (t: ClassicalTerm): string =>
    t.spectrum.extension === "hold" ? "held at its end values" : t.spectrum.extension === "power-law" ? "continued as the power laws of its end segments" : "not extended (the grid lies within it)";
  const ranges = setup.classical.map((t) => `${w.code(t.name)} is tabulated from ${w.qty(t.spectrum.lowest, "frequency")} to ${w.qty(t.spectrum.highest, "frequency")} and ${extension(t)}`);
  return [
    ...terms,
    `Each classical spectrum is interpolated as a power law between its points (straight lines in log-log coordinates); ${ranges.join("; ")}. Each classical term is an independent input of its own and one term of the budget.`,
  ];
}

function termSentence(w: Writer, t: ClassicalTerm): string {
  const name = w.code(t.name);
  const on = w.code(t.on);
  switch (t.enters) {
    case "force":
      return `${name} is a classical force noise on ${on}, entering as a force signal on it does.`;
    case "displacement":
      return `${name} is a classical displacement noise of ${on}, entering as the force ${w.math("x/χ₀", "x/\\chi_0")} with ${w.math("χ₀", "\\chi_0")} the body's own susceptibility.`;
    case "strain":
      return `${name} is a classical strain noise on ${on}, adding directly to the strain-referred noise.`;
    case "laser intensity":
      return (
        `${name} is the relative intensity noise ${w.math("S_RIN", "S_{\\mathrm{RIN}}")} of the laser driving ${on}: an independent input added to the drive's amplitude quadrature with one-sided PSD ` +
        `${w.math("P_in S_RIN/(2ħω_L)", "P_{\\mathrm{in}} S_{\\mathrm{RIN}}/(2\\hbar\\omega_L)")} in units of vacuum noise (shot noise of the power is ${w.math("2ħω_L P_in", "2\\hbar\\omega_L P_{\\mathrm{in}}")}${w.cite("caves1981")}), ` +
        `so that it becomes radiation-pressure force noise and readout noise through the same input–output relations as the vacuum of that port.`
      );
    case "laser frequency":
      return (
        `${name} is the frequency noise ${w.math("S_ν", "S_\\nu")} of the laser driving ${on}; with the homodyne reference taken from the same laser it is indistinguishable from a change of the cavity length ` +
        `${w.math("δL = Lλδν/c", "\\delta L = L\\lambda\\,\\delta\\nu/c")}, and enters the cavity's detuning as ${w.math("2πδν", "2\\pi\\,\\delta\\nu")}.`
      );
    default:
      return `${name} is a classical noise entering ${on} as ${w.text(t.enters)}.`;
  }
}
