/**
 * The classical noise terms of a set-up in a methods text: each term's name, where and how it
 * enters the model (a force, a displacement, a strain, the force on or displacement of each test
 * mass of an interferometer, or the noise of the laser that drives a cavity or probe, with the
 * conversion used), and how its spectrum is read between and beyond its points.
 */
import type { ResolvedSetup } from "../../../src/index";
import type { Writer } from "./writers";

type ClassicalTerm = ResolvedSetup["classical"][number];

/** One sentence per term, then one on interpolation (nothing when the set-up has no classical term). */
export function classicalSentences(w: Writer, setup: ResolvedSetup): string[] {
  if (setup.classical.length === 0) return [];
  const terms = setup.classical.map((t) => (setup.kinds.get(t.on)?.type === "interferometer" ? interferometerSentence(w, t) : termSentence(w, t)));
  const extension = (t: ClassicalTerm): string =>
    t.spectrum.extension === "hold" ? "held at its end values" : t.spectrum.extension === "power-law" ? "continued as the power laws of its end segments" : "not extended (the grid lies within it)";
  const ranges = setup.classical.map((t) => `${w.code(t.name)} is tabulated from ${w.qty(t.spectrum.lowest, "frequency")} to ${w.qty(t.spectrum.highest, "frequency")} and ${extension(t)}`);
  return [
    ...terms,
    `Each classical spectrum is interpolated as a power law between its points (straight lines in log-log coordinates); ${ranges.join("; ")}. Each classical term is an independent input of its own and one term of the budget.`,
  ];
}

/** A term on an interferometer: strain, or the force on or displacement of each test mass with its conversion to strain. */
function interferometerSentence(w: Writer, t: ClassicalTerm): string {
  const name = w.code(t.name);
  const on = w.code(t.on);
  const oneMass = "its spectrum is that of one test mass along its arm, and the four test masses are taken as independent and alike";
  switch (t.enters) {
    case "force":
      return (
        `${name} is a classical force noise on each test mass of ${on} (${oneMass}): it drives the differential arm length ` +
        `${w.math("ΔL = (x₁ₑ − x₁ᵢ) − (x₂ₑ − x₂ᵢ)", "\\Delta L = (x_{1e} - x_{1i}) - (x_{2e} - x_{2i})")} as the force ` +
        `${w.math("(F₁ₑ − F₁ᵢ − F₂ₑ + F₂ᵢ)/4", "(F_{1e} - F_{1i} - F_{2e} + F_{2i})/4")} on its reduced mass ${w.math("m/4", "m/4")}, so radiation pressure and any optical spring act on it as on the signal; ` +
        `referred to strain it is ${w.math("S_h = 4S_F/(m²Ω⁴L²)", "S_h = 4S_F/(m^2\\Omega^4L^2)")}, with or without an optical spring, which changes the response to this force and to the signal alike.`
      );
    case "displacement":
      return (
        `${name} is a classical displacement noise of each test mass of ${on} (${oneMass}): the differential arm length changes by each of four such motions with its sign, ` +
        `which the light sees where it sees the signal, so it adds ${w.math("S_h = 4S_x/L²", "S_h = 4S_x/L^2")} to the strain-referred noise.`
      );
    default:
      return termSentence(w, t);
  }
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
