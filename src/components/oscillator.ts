import { addSymmetricBath, addViscousBath, allocateBody, applyForceSignal, forceSignalReference, THERMAL_TERM_NAME, thermalQuadratureNoise, wireBody } from "../physics/mechanics";
import { cryogenicCautions } from "../safety/cautions";
import { num, type ComponentKind, type MechanicalBody } from "./types";

/** Above this Q the resonance is narrower than double precision resolves Ω_m² − Ω² (relative error ~ 2e-16·Q on resonance). */
export const MAX_QUALITY_FACTOR = 1e12;

interface OscillatorHandle {
  body: MechanicalBody;
  bathColumn: number;
}

/** A damped mechanical oscillator of either sign of effective mass, in its own thermal bath. */
export const oscillator: ComponentKind<OscillatorHandle> = {
  type: "oscillator",
  summary: "Damped mechanical oscillator (m, f_m, Q, T; either sign of mass).",
  params: [
    { name: "mass", kind: "mass", doc: 'Effective mass magnitude, e.g. "2 ng".', min: 0, minExclusive: true },
    { name: "frequency", kind: "frequency", doc: 'Resonance frequency f_m = Ω_m/2π, e.g. "1.3 MHz".', min: 0, minExclusive: true },
    {
      name: "Q",
      kind: "number",
      doc: "Mechanical quality factor Q = Ω_m/γ, at most 1e12 (on resonance the response is resolved to about 2e-16·Q in double precision).",
      min: 0,
      minExclusive: true,
      max: MAX_QUALITY_FACTOR,
      rangeReason:
        "above Q = 1e12 the resonance is narrower than double precision resolves (on resonance Ω_m² − Ω² is rounded to about 2e-16·Ω_m², which the damping term γΩ_m = Ω_m²/Q no longer dominates)",
    },
    { name: "temperature", kind: "temperature", doc: 'Temperature of the intrinsic bath, e.g. "6 K".', min: 0 },
    {
      name: "massSign",
      kind: "choice",
      choices: ["positive", "negative"],
      default: "positive",
      doc: '"negative" makes an inverted oscillator (effective negative mass): χ → −χ.',
    },
    {
      name: "damping",
      kind: "choice",
      choices: ["viscous", "symmetric"],
      default: "viscous",
      doc: '"viscous": Brownian motion, χ = 1/(m(Ω_m² − Ω² − iγΩ)), accurate for high Q; "symmetric": amplitude damping (Lindblad form), always a physical quantum state.',
    },
  ],
  ports: [{ name: "body", kind: "mechanical-body", doc: "Where probes and baths act on the oscillator." }],
  allocate: (builder, c) => {
    const omega = 2 * Math.PI * num(c, "frequency");
    const sign = c.values.massSign === "negative" ? -1 : 1;
    const body = allocateBody(builder, c.name, num(c, "mass"), sign, omega);
    const gamma = omega / num(c, "Q");
    const temperature = num(c, "temperature");
    if (c.values.damping === "symmetric") {
      body.baths.push({ owner: c.name, kind: "symmetric", gamma, temperature });
      const n = thermalQuadratureNoise(omega, temperature);
      const bathColumn = builder.addInputs(c.name, ["thermal noise (X)", "thermal noise (P)"], [n, 0, 0, n], "thermal", `${c.name}: ${THERMAL_TERM_NAME}`, true);
      return { body, bathColumn };
    }
    body.baths.push({ owner: c.name, kind: "viscous", gamma, temperature });
    const bathColumn = builder.addInputs(c.name, ["thermal force"], [1], "thermal", `${c.name}: thermal force`, false, `${c.name}: ${THERMAL_TERM_NAME}`);
    return { body, bathColumn };
  },
  wire: ({ builder, handle }) => {
    wireBody(builder, handle.body);
    const bath = handle.body.baths[0];
    if (bath.kind === "symmetric") addSymmetricBath(builder, handle.body, bath, handle.bathColumn);
    else addViscousBath(builder, handle.body, bath, handle.bathColumn);
    return {};
  },
  body: (h) => h.body,
  signals: ["force"],
  applySignal: (builder, h) => applyForceSignal(builder, h.body),
  signalReference: (h) => forceSignalReference(h.body),
  cautions: (c) => cryogenicCautions(c.name, num(c, "temperature")),
};
