import { QuietframeError } from "../errors";
import { combine, combineFields, type Field } from "../network/linear-form";
import type { ModeInfo } from "../network/model";
import { MAX_SQUEEZE_FACTOR, squeezeFactorFromDb } from "./light-sources";
import { parametricPump, whiteTwoModeNoise, type TwoModeSqueezing } from "../physics/two-mode-squeezing";
import { maybeNum, num, type ComponentKind, type ResolvedComponent } from "./types";

interface EntangledHandle {
  /** First input column of the block (white: 4 columns; with a bandwidth: 8). */
  column: number;
  /** The two cavity modes of the parametric oscillator, when a bandwidth is given. */
  modes?: [ModeInfo, ModeInfo];
}

/**
 * Two-mode squeezed (EPR-entangled) vacuum in two beams, possibly at two different carrier
 * wavelengths. The amplitude quadratures of the two beams are correlated and the phase
 * quadratures anti-correlated: Var(X1 − X2) = Var(P1 + P2) = e^{−2r} (vacuum variance 1/2
 * per quadrature), so the sum of the two is below 2 for any r > 0.
 *
 * White (no bandwidth): one block of four white inputs with the noise matrix of
 * two-mode-squeezing.ts, arm losses included. With a bandwidth the source is a
 * non-degenerate parametric oscillator below threshold: two cavity modes of linewidth κ,
 *   dX_a/dt = −(κ/2) X_a + ε X_b + √κ v_Xa,   dP_a/dt = −(κ/2) P_a − ε P_b + √κ v_Pa  (a ↔ b)
 *   out = v − √κ (mode)            (the input–output relation of the cavity component),
 * pumped at ε = (κ/2) tanh(r/2) so that the squeezing at zero sideband frequency is e^{−2r};
 * each arm then passes its loss. All vacua of the source and of its losses form one block,
 * and so one budget term: the noise of the entangled light.
 */
export const entangledSource: ComponentKind<EntangledHandle> = {
  type: "entangled-source",
  summary: "Two-colour entangled light: two-mode squeezed vacuum in two beams (r or dB, per-arm efficiency, optional finite bandwidth).",
  params: [
    {
      name: "squeezing",
      kind: "decibel",
      doc: 'Two-mode squeezing 10·log10 e^{−2r}: noise of X1 − X2 and of P1 + P2 relative to vacuum (at zero sideband frequency with a bandwidth), e.g. "-10 dB" (give this or r).',
      optional: true,
      max: 0,
    },
    { name: "r", kind: "number", doc: "Two-mode squeeze factor r ≥ 0 (give this or squeezing).", optional: true, min: 0, max: MAX_SQUEEZE_FACTOR },
    { name: "wavelength1", kind: "length", doc: "Carrier wavelength of beam 1 (documentary; the model is linear in the fluctuations).", optional: true, min: 0, minExclusive: true },
    { name: "wavelength2", kind: "length", doc: "Carrier wavelength of beam 2 (documentary).", optional: true, min: 0, minExclusive: true },
    { name: "efficiency1", kind: "fraction", doc: "Power transmission η1 of arm 1 from the source to its output port (vacuum enters in 1 − η1).", default: 1, min: 0, max: 1 },
    { name: "efficiency2", kind: "fraction", doc: "Power transmission η2 of arm 2.", default: 1, min: 0, max: 1 },
    {
      name: "bandwidth",
      kind: "frequency",
      doc: "Linewidth κ/2π (FWHM) of each of the two cavity modes of a parametric oscillator below threshold; absent: a white (broadband) source.",
      optional: true,
      min: 0,
      minExclusive: true,
    },
  ],
  ports: [
    { name: "out1", kind: "optical-out", doc: "Beam 1 (amplitude quadrature correlated, phase quadrature anti-correlated with beam 2)." },
    { name: "out2", kind: "optical-out", doc: "Beam 2." },
  ],
  crossCheck: (c) => {
    if (c.given.has("squeezing") === c.given.has("r")) {
      const both = c.given.has("squeezing");
      throw new QuietframeError({
        path: `${c.path}.squeezing`,
        value: both ? c.raw.squeezing : undefined,
        problem: both ? "both squeezing and r are given" : "neither squeezing nor r is given",
        allowed: 'exactly one of squeezing (e.g. "-10 dB", ≤ 0 dB) or r (e.g. 1.15, 0 ≤ r ≤ 10)',
      });
    }
    if (c.given.has("squeezing") && squeezeFactorFromDb(num(c, "squeezing")) > MAX_SQUEEZE_FACTOR) {
      throw new QuietframeError({
        path: `${c.path}.squeezing`,
        value: c.raw.squeezing,
        problem: "is out of range",
        allowed: "-86.85 dB ≤ squeezing ≤ 0 dB (r ≤ 10)",
      });
    }
  },
  allocate: (b, c) => {
    const p = twoModeSqueezing(c);
    if (p.bandwidth === undefined) {
      const labels = ["beam 1 amplitude quadrature", "beam 1 phase quadrature", "beam 2 amplitude quadrature", "beam 2 phase quadrature"];
      return { column: b.addInputs(c.name, labels, whiteTwoModeNoise(p), "quantum-light", `${c.name}: entangled light`, true) };
    }
    const modes: [ModeInfo, ModeInfo] = [b.addMode(c.name, "optical", `${c.name} signal mode`), b.addMode(c.name, "optical", `${c.name} idler mode`)];
    const labels = [
      "mode 1 input vacuum (amplitude)",
      "mode 1 input vacuum (phase)",
      "mode 2 input vacuum (amplitude)",
      "mode 2 input vacuum (phase)",
      "arm 1 loss vacuum (amplitude)",
      "arm 1 loss vacuum (phase)",
      "arm 2 loss vacuum (amplitude)",
      "arm 2 loss vacuum (phase)",
    ];
    const identity = new Float64Array(64);
    for (let i = 0; i < 8; i++) identity[i * 9] = 1;
    return { column: b.addInputs(c.name, labels, identity, "quantum-light", `${c.name}: entangled light`, true), modes };
  },
  wire: ({ builder, component: c, handle }) => {
    const p = twoModeSqueezing(c);
    const col = handle.column;
    if (!handle.modes) return { out1: builder.inputField(col), out2: builder.inputField(col + 2) };
    const [a, b] = handle.modes;
    const kappa = 2 * Math.PI * (p.bandwidth as number);
    const eps = parametricPump(kappa, p.r);
    const rootKappa = Math.sqrt(kappa);
    for (const m of [a, b]) {
      builder.couple(m.x, m.x, -kappa / 2);
      builder.couple(m.p, m.p, -kappa / 2);
    }
    builder.couple(a.x, b.x, eps);
    builder.couple(b.x, a.x, eps);
    builder.couple(a.p, b.p, -eps);
    builder.couple(b.p, a.p, -eps);
    const emitted = (m: ModeInfo, vacuum: number): Field => {
      builder.drive(m.x, builder.input(vacuum), rootKappa);
      builder.drive(m.p, builder.input(vacuum + 1), rootKappa);
      return {
        amplitude: combine(1, builder.input(vacuum), -rootKappa, builder.state(m.x)),
        phase: combine(1, builder.input(vacuum + 1), -rootKappa, builder.state(m.p)),
      };
    };
    const lossy = (f: Field, eta: number, vacuum: number): Field => combineFields(Math.sqrt(eta), f, Math.sqrt(1 - eta), builder.inputField(vacuum));
    return {
      out1: lossy(emitted(a, col), p.efficiency1, col + 4),
      out2: lossy(emitted(b, col + 2), p.efficiency2, col + 6),
    };
  },
};

/** The component's parameters as the noise description of two-mode-squeezing.ts. */
export function twoModeSqueezing(c: ResolvedComponent): TwoModeSqueezing {
  const r = c.given.has("r") ? num(c, "r") : squeezeFactorFromDb(num(c, "squeezing"));
  return { r, efficiency1: num(c, "efficiency1"), efficiency2: num(c, "efficiency2"), bandwidth: maybeNum(c, "bandwidth") };
}
