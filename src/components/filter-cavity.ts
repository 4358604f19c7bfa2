import { SPEED_OF_LIGHT } from "../constants";
import { QuietframeError } from "../errors";
import type { ModeInfo } from "../network/model";
import { filterCavityRates } from "../physics/filter-design";
import { wireOpticalMode } from "../physics/optical-mode";
import { num, type ComponentKind, type ResolvedComponent } from "./types";

interface FilterCavityHandle {
  mode: ModeInfo;
  lossColumn: number;
}

/**
 * A filter cavity: a detuned optical cavity with no mechanics, used in reflection, that
 * rotates and mixes the two quadratures of the light by an angle that depends on frequency.
 * On the input of an interferometer it turns squeezed light into frequency-dependent
 * squeezing; on its output, before the homodyne, it makes a variational readout.
 *
 * Described as it is built: length L, detuning Δ/2π = (ω_carrier − ω_cavity)/2π, power
 * transmission T of the input mirror and round-trip loss ε (everything else: the end mirror's
 * transmission, scatter, absorption). High-finesse single-mode model: amplitude half-width
 * γ = c(T + ε)/(4L), of which γ_in = cT/(4L) couples to the light and γ_0 = cε/(4L) to loss
 * (the dynamics in src/physics/optical-mode.ts), valid for T + ε ≪ 1, |Δ| and the signal
 * frequencies well below the free spectral range c/(2L).
 *
 * A plain `cavity` with nothing linked is the same filter described by linewidth and input
 * coupling (κ = 2γ, κ_in/κ = T/(T + ε)); `designFilterCavities` gives the ideal pair for an
 * interferometer (src/physics/filter-design.ts).
 */
export const filterCavity: ComponentKind<FilterCavityHandle> = {
  type: "filter-cavity",
  summary:
    "Filter cavity in reflection (length, detuning, input transmission, round-trip loss): frequency-dependent squeezing or variational readout. " +
    "A plain `cavity` with nothing linked is the same filter (linewidth c(T + ε)/(4πL), inputCoupling T/(T + ε)); designFilterCavities gives the ideal pair for an interferometer.",
  params: [
    { name: "length", kind: "length", doc: 'Cavity length L, e.g. "300 m".', min: 0, minExclusive: true },
    { name: "detuning", kind: "frequency", doc: "Δ/2π = (ω_carrier − ω_cavity)/2π; the sign sets the sense of the rotation.", default: "0 Hz" },
    {
      name: "inputTransmission",
      kind: "fraction",
      doc: "Power transmission T of the input mirror, e.g. 66e-6.",
      min: 0,
      minExclusive: true,
      max: 1,
      maxExclusive: true,
    },
    {
      name: "roundTripLoss",
      kind: "fraction",
      doc: "Round-trip power loss ε besides the input mirror (end-mirror transmission, scatter, absorption), e.g. 1e-6.",
      default: 0,
      min: 0,
      max: 1,
      maxExclusive: true,
    },
  ],
  ports: [
    { name: "in", kind: "optical-in", doc: "Light arriving at the input mirror." },
    { name: "out", kind: "optical-out", doc: "Light reflected by the cavity, its quadratures rotated by frequency." },
  ],
  crossCheck: (c) => {
    const total = num(c, "inputTransmission") + num(c, "roundTripLoss");
    if (!(total < 1)) {
      throw new QuietframeError({
        path: `${c.path}.inputTransmission`,
        value: c.raw.inputTransmission,
        problem: `with roundTripLoss the cavity loses T + ε = ${total.toPrecision(4)} per round trip: the single-mode (high-finesse) model needs much less`,
        allowed: "inputTransmission + roundTripLoss < 1 (well below, e.g. 1e-4)",
      });
    }
    const fsr = SPEED_OF_LIGHT / (2 * num(c, "length"));
    if (!(Math.abs(num(c, "detuning")) < fsr / 2)) {
      throw new QuietframeError({
        path: `${c.path}.detuning`,
        value: c.raw.detuning,
        problem: `is not inside half the free spectral range c/(2L) = ${fsr.toPrecision(4)} Hz of this cavity`,
        allowed: `|detuning| < ${(fsr / 2).toPrecision(4)} Hz for this length`,
      });
    }
  },
  allocate: (b, c) => ({
    mode: b.addMode(c.name, "optical", `${c.name} filter-cavity field`),
    lossColumn: b.addInputs(c.name, ["round-trip loss (amplitude)", "round-trip loss (phase)"], [1, 0, 0, 1], "loss", `${c.name}: filter loss`),
  }),
  wire: ({ builder, component: c, handle, inputs }) => ({ out: wireOpticalMode(builder, handle.mode, ratesOf(c), inputs.in, handle.lossColumn) }),
};

function ratesOf(c: ResolvedComponent) {
  return filterCavityRates(num(c, "length"), num(c, "inputTransmission"), num(c, "roundTripLoss"), 2 * Math.PI * num(c, "detuning"));
}
