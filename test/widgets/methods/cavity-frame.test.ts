/**
 * The methods text states the quadrature frame of a detuned cavity (src/components/cavity.ts:
 * ports in the drive laser's frame, mode in its mean field's, ā = √κ_in ā_in/(κ/2 − iΔ) of
 * Aspelmeyer, Kippenberg & Marquardt, Rev. Mod. Phys. 86, 1391 (2014), Sec. II.B), and a
 * resonant set-up's text is left as it was.
 */
import { describe, expect, it } from "vitest";
import { explorerMethods } from "../../../widgets/explorer/methods/methods";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { cavityReadout } from "../../helpers/setups";

function methodsOf(detuning: string) {
  const setup = {
    ...cavityReadout({
      body: { mass: "1e-9 kg", frequency: "1e5 Hz", Q: 1e5, temperature: "0 K" },
      cavity: { linewidth: "200 kHz", wavelength: "1064 nm", length: "1 cm", power: "1 µW", detuning },
    }),
    grid: { from: "50 kHz", to: "2 MHz", points: 11 },
  };
  const state = createExplorerState(setup);
  return explorerMethods(state, computeExplorer(state));
}

describe("methods text: a detuned cavity's quadrature frame", () => {
  it("says that angles refer to the drive laser and gives the turn θ = arg(κ/2 + iΔ), in markdown and LaTeX", () => {
    const { markdown, latex } = methodsOf("-100 kHz");
    expect(markdown).toContain("refer to the carrier of the laser that drives it");
    expect(markdown).toContain("θ = arg(κ/2 + iΔ)");
    expect(latex).toContain("\\theta = \\arg(\\kappa/2 + i\\Delta)");
    expect(latex).toContain("\\bar a = \\sqrt{\\kappa_{\\mathrm{in}}}\\,\\bar a_{\\mathrm{in}}/(\\kappa/2 - i\\Delta)");
  });

  it("says nothing of frames for a resonant cavity", () => {
    const { markdown } = methodsOf("0 Hz");
    expect(markdown).toContain("Each cavity is a single optical mode");
    expect(markdown).not.toContain("arg(κ/2 + iΔ)");
  });
});
