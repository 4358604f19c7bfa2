import { QuietframeError } from "../errors";
import { laserPowerCautions } from "../safety/cautions";
import { formatQuantity } from "../units";
import type { NetworkBuilder } from "../network/builder";
import { combine, type Field } from "../network/linear-form";
import type { ModeInfo } from "../network/model";
import { cavityInputPower, intracavityPhotons, opticalAngularFrequency, pushOnBody, zeroPointDisplacement } from "../physics/optomechanics";
import { wireOpticalMode } from "../physics/optical-mode";
import { maybeNum, num, type ComponentKind, type MechanicalBody, type ResolvedComponent } from "./types";

export interface CavityHandle {
  mode: ModeInfo;
  lossColumn: number;
}

/**
 * Single optical cavity mode with radiation-pressure coupling to a linked body. The mode's
 * quadratures δa1, δa2 are those of its own mean field ā (taken real, so δa1 is the
 * fluctuation of the intracavity amplitude that pushes the body):
 *   dδa1/dt = −(κ/2) δa1 − Δ δa2 + √κ_in q1 + √κ_0 v1
 *   dδa2/dt = −(κ/2) δa2 + Δ δa1 + √κ_in q2 + √κ_0 v2 + g X
 *   r       = q − √κ_in δa        (Gardiner & Collett input-output relation; q, r in the mode's frame)
 * Δ = ω_laser − ω_cavity (positive: blue detuning). With a linked body the radiation
 * pressure g·δa1 acts on it; unlinked, the cavity is a plain filter.
 *
 * Frames. The light at the ports (in and out) is in the frame of the drive laser's carrier,
 * like every other quadrature of a set-up: a squeezer's angle, a coherent source's excess
 * noise, a laser's intensity noise and a homodyne's angle (its local oscillator taken from
 * the drive laser) all refer to it. The steady state ā = √κ_in ā_in/(κ/2 − iΔ) (Aspelmeyer,
 * Kippenberg & Marquardt, Rev. Mod. Phys. 86, 1391 (2014), Sec. II.B), with ā_in real, is
 * ā = |ā| e^{iθ}, θ = arg(κ/2 + iΔ); writing δa = e^{iθ}(δa1 + iδa2)/√2 and the port fields
 * likewise, the mode sees the incoming field turned by −θ and the reflected field leaves
 * turned by +θ:
 *   q1 + iq2 = e^{−iθ} (in1 + i in2),   out1 + i out2 = e^{iθ} (r1 + i r2).
 * The reflected carrier ā_out = ā_in (κ/2 − κ_in − iΔ)/(κ/2 − iΔ) has a phase of its own; the
 * out port does not follow it (it vanishes at critical coupling on resonance); a homodyne whose
 * angle is counted from the reflected carrier is modelled with arg(ā_out/ā_in) added to its angle.
 * On resonance (θ = 0) and without a mean field (no drive: nothing to refer to but the
 * carrier) the two frames are one, and the ports are wired to the mode unchanged.
 */
export const cavity: ComponentKind<CavityHandle> = {
  type: "cavity",
  summary:
    "Optical cavity mode with linearized radiation-pressure coupling to a linked body. The light at its ports is in the frame of the drive laser's carrier (squeezing and readout angles, excess noise), also when detuned; the radiation pressure follows the intracavity amplitude, whose phase is turned from the laser's by arg(κ/2 + iΔ).",
  params: [
    { name: "linewidth", kind: "frequency", doc: "Full linewidth κ/2π (FWHM) in Hz.", min: 0, minExclusive: true },
    { name: "detuning", kind: "frequency", doc: "Δ/2π = (ω_laser − ω_cavity)/2π; positive is blue.", default: "0 Hz" },
    {
      name: "inputCoupling",
      kind: "fraction",
      doc: "κ_in/κ: fraction of the linewidth due to the coupling mirror (1 = no internal loss).",
      default: 1,
      min: 0,
      max: 1,
      minExclusive: true,
    },
    { name: "wavelength", kind: "length", doc: "Laser wavelength.", default: "1064 nm", min: 0, minExclusive: true },
    {
      name: "photons",
      kind: "count",
      doc: "Mean intracavity photon number n (give this or power).",
      optional: true,
      min: 0,
      minExclusive: true,
    },
    { name: "power", kind: "power", doc: "Input power P_in (give this or photons).", optional: true, min: 0 },
    {
      name: "g0",
      kind: "frequency",
      doc: "Vacuum optomechanical coupling g0/2π = G·x_zpf/2π (needs an oscillator); give this or length.",
      optional: true,
      min: 0,
    },
    {
      name: "length",
      kind: "length",
      doc: "Cavity length L for a moving end mirror, G = ω_c/L; give this or g0.",
      optional: true,
      min: 0,
      minExclusive: true,
    },
  ],
  ports: [
    { name: "in", kind: "optical-in", doc: "Light driving the cavity through the coupling mirror; quadratures in the drive laser's frame." },
    {
      name: "out",
      kind: "optical-out",
      doc: "Light leaving through the coupling mirror; quadratures in the drive laser's frame (for a homodyne whose angle is counted from the reflected carrier, add arg(ā_out/ā_in) to its angle).",
    },
    { name: "mechanics", kind: "mechanical-probe", doc: "The body whose position shifts the cavity.", optional: true },
  ],
  crossCheck: (c) => {
    if (c.given.has("photons") && c.given.has("power")) {
      throw new QuietframeError({
        path: `${c.path}.power`,
        value: c.raw.power,
        problem: "both photons and power are given",
        allowed: "one of photons or power",
      });
    }
    if (c.given.has("g0") && c.given.has("length")) {
      throw new QuietframeError({
        path: `${c.path}.length`,
        problem: "both g0 and length are given",
        allowed: "one of g0 or length",
      });
    }
  },
  allocate: (b, c) => ({
    mode: b.addMode(c.name, "optical", `${c.name} intracavity field`),
    lossColumn: b.addInputs(c.name, ["internal loss (amplitude)", "internal loss (phase)"], [1, 0, 0, 1], "loss", `${c.name}: internal loss`),
  }),
  wire: ({ builder, component: c, handle, inputs, bodies }) => {
    const kappa = 2 * Math.PI * num(c, "linewidth");
    const delta = 2 * Math.PI * num(c, "detuning");
    const kIn = kappa * num(c, "inputCoupling");
    const k0 = kappa - kIn;
    const rates = { halfWidth: kappa / 2, detuning: delta, inputCoupling: Math.sqrt(kIn), lossCoupling: Math.sqrt(k0) };
    const turn = meanFieldTurn(c);
    const incoming = turn ? turnField(inputs.in, turn[0], -turn[1]) : inputs.in;
    const reflected = wireOpticalMode(builder, handle.mode, rates, incoming, handle.lossColumn);
    const out = turn ? turnField(reflected, turn[0], turn[1]) : reflected;
    const body = bodies.mechanics;
    if (body) {
      const g = quadratureCoupling(c, body);
      pushOnBody(builder, body, builder.state(handle.mode.x), g);
      builder.couple(handle.mode.p, body.mode.x, g);
    }
    return { out };
  },
  instabilityHint: (c) => {
    const d = c.values.detuning;
    if (typeof d !== "number" || d === 0) return undefined;
    return d > 0
      ? `cavity '${c.name}' is blue-detuned (Δ/2π = +${d} Hz): radiation pressure anti-damps a positive-mass body`
      : `cavity '${c.name}' is red-detuned (Δ/2π = ${d} Hz): its optical spring softens a positive-mass body and, when strong, pulls it statically unstable`;
  },
  cautions: (c) => {
    const power = maybeNum(c, "power");
    if (power !== undefined) return laserPowerCautions(`'${c.name}' is driven with`, power, "of input light");
    const photons = maybeNum(c, "photons");
    if (photons === undefined) return [];
    const input = cavityDrivePower(c)!;
    const drive = `${formatQuantity(photons, "count")} intracavity photons at ${formatQuantity(num(c, "wavelength"), "length")}, linewidth ${formatQuantity(num(c, "linewidth"), "frequency")}, detuning ${formatQuantity(num(c, "detuning"), "frequency")} and input coupling ${formatQuantity(num(c, "inputCoupling"), "fraction")}`;
    return laserPowerCautions(`'${c.name}' holds ${drive}, which implies`, input, "of input light");
  },
};

/** κ, Δ and κ_in of a cavity in rad/s. */
function cavityRates(c: ResolvedComponent): { kappa: number; delta: number; kIn: number } {
  const kappa = 2 * Math.PI * num(c, "linewidth");
  return { kappa, delta: 2 * Math.PI * num(c, "detuning"), kIn: kappa * num(c, "inputCoupling") };
}

/** Mean intracavity photon number: given, or held by the given input power; undefined when the cavity has no drive. */
export function cavityPhotons(c: ResolvedComponent): number | undefined {
  if (c.given.has("photons")) return num(c, "photons");
  if (!c.given.has("power")) return undefined;
  const { kappa, delta, kIn } = cavityRates(c);
  return intracavityPhotons(num(c, "power"), num(c, "wavelength"), kappa, delta, kIn);
}

/** Input power P_in of the drive: given, or the one that holds the given photons; undefined when the cavity has no drive. */
export function cavityDrivePower(c: ResolvedComponent): number | undefined {
  const power = maybeNum(c, "power");
  if (power !== undefined) return power;
  const photons = maybeNum(c, "photons");
  if (photons === undefined) return undefined;
  const { kappa, delta, kIn } = cavityRates(c);
  return cavityInputPower(photons, num(c, "wavelength"), kappa, delta, kIn);
}

/**
 * [cos θ, sin θ] of the angle θ = arg(κ/2 + iΔ) by which the mean field ā is turned from the
 * drive laser's carrier (see the header); undefined where the two frames are one: on resonance
 * or without a mean field. A plain square root, not hypot, so every engine gives the same bits.
 */
function meanFieldTurn(c: ResolvedComponent): [number, number] | undefined {
  const { kappa, delta } = cavityRates(c);
  if (delta === 0 || !cavityPhotons(c)) return undefined;
  const norm = Math.sqrt((kappa * kappa) / 4 + delta * delta);
  return [kappa / 2 / norm, delta / norm];
}

/** The field multiplied by e^{iφ}, given cos φ and sin φ: (a1 + ia2) → (cos φ a1 − sin φ a2) + i(sin φ a1 + cos φ a2). */
function turnField(field: Field, cos: number, sin: number): Field {
  return {
    amplitude: combine(cos, field.amplitude, -sin, field.phase),
    phase: combine(sin, field.amplitude, cos, field.phase),
  };
}

/**
 * Drives the mode with a fluctuation of its detuning δΔ = 2π·`column` (the column in hertz):
 * dδa2/dt += √2·ā·δΔ, which is what a change of the cavity length δL = L·δΔ/ω_c does through
 * the coupling G = ω_c/L (see quadratureCoupling: the body's position enters as √2·G·ā·x).
 */
export function driveDetuningNoise(builder: NetworkBuilder, handle: CavityHandle, column: number, photons: number): void {
  builder.drive(handle.mode.p, builder.input(column), Math.SQRT2 * Math.sqrt(photons) * 2 * Math.PI);
}

function quadratureCoupling(c: ResolvedComponent, body: MechanicalBody): number {
  const wavelength = num(c, "wavelength");
  const photons = cavityPhotons(c) ?? missing(c, "photons", 'the drive: photons (e.g. 1e8) or power (e.g. "10 mW")');
  let G: number; // dω_c/dx in rad/s per metre
  if (c.given.has("g0")) {
    if (body.omega <= 0) {
      throw new QuietframeError({
        path: `${c.path}.g0`,
        value: c.raw.g0,
        problem: `g0 is defined through the zero-point motion of an oscillator, but '${body.owner}' is a free mass`,
        allowed: "length (G = ω_c/L) for a free mass",
      });
    }
    G = (2 * Math.PI * num(c, "g0")) / zeroPointDisplacement(body);
  } else if (c.given.has("length")) {
    G = opticalAngularFrequency(wavelength) / num(c, "length");
  } else {
    return missing(c, "g0", 'the coupling: g0 (e.g. "20 Hz") or length (e.g. "1 cm")');
  }
  // g = √2 G ā x_s (see optomechanics.ts)
  return Math.SQRT2 * G * Math.sqrt(photons) * body.xScale;
}

function missing(c: ResolvedComponent, field: string, allowed: string): never {
  throw new QuietframeError({
    path: `${c.path}.${field}`,
    problem: "a cavity linked to a body needs its drive and its coupling",
    allowed,
  });
}
