import { HBAR } from "../constants";
import { QuietframeError } from "../errors";
import { combine } from "../network/linear-form";
import { probePowerForMeasurementRate, pushOnBody, reflectionForcePsd, zeroPointDisplacement } from "../physics/optomechanics";
import { laserPowerCautions } from "../safety/cautions";
import { formatQuantity } from "../units";
import { maybeNum, num, type ComponentKind, type MechanicalBody, type ResolvedComponent } from "./types";

/**
 * Direct QND position readout by travelling light (no cavity):
 *   q1_out = q1_in,  q2_out = q2_in + k X,  dP/dt += k q1_in,
 * a quantum-limited probe: imprecision × back-action = ħ² (one-sided) for any k.
 * k follows from the reflected power (S_F = 8ħωP/c²) or from a measurement rate.
 */
export const positionProbe: ComponentKind<null> = {
  type: "position-probe",
  summary: "Direct QND position readout by reflected light (power or measurement rate).",
  params: [
    { name: "power", kind: "power", doc: "Reflected probe power at normal incidence (give this or measurementRate).", optional: true, min: 0 },
    { name: "wavelength", kind: "length", doc: "Probe wavelength.", default: "1064 nm", min: 0, minExclusive: true },
    {
      name: "measurementRate",
      kind: "frequency",
      doc: "Γ_meas/2π with Γ_meas = x_zpf² S̄_FF/ħ² (double-sided back-action force PSD); oscillators only.",
      optional: true,
      min: 0,
    },
  ],
  ports: [
    { name: "in", kind: "optical-in", doc: "Probe light (its fluctuations)." },
    { name: "out", kind: "optical-out", doc: "Light carrying the position in its phase quadrature." },
    { name: "mechanics", kind: "mechanical-probe", doc: "The body being read." },
  ],
  crossCheck: (c) => {
    if (c.given.has("power") === c.given.has("measurementRate")) {
      throw new QuietframeError({
        path: `${c.path}.power`,
        problem: c.given.has("power") ? "both power and measurementRate are given" : "neither power nor measurementRate is given",
        allowed: 'exactly one of power (e.g. "1 W") or measurementRate (e.g. "3 kHz")',
      });
    }
  },
  allocate: () => null,
  wire: ({ builder, component: c, inputs, bodies }) => {
    const body = bodies.mechanics;
    if (!body) throw new Error(`internal: ${c.path}.mechanics is unlinked`);
    const forcePsd = backActionForcePsd(c, body);
    const k = Math.sqrt(forcePsd) / body.pScale;
    pushOnBody(builder, body, inputs.in.amplitude, k);
    return {
      out: { amplitude: inputs.in.amplitude, phase: combine(1, inputs.in.phase, k, builder.state(body.mode.x)) },
    };
  },
  cautions: (c, bodies) => {
    const power = maybeNum(c, "power");
    if (power !== undefined) return laserPowerCautions(`'${c.name}' uses`, power, "of probe light");
    const body = bodies.mechanics;
    const rate = maybeNum(c, "measurementRate");
    if (!body || body.omega <= 0 || rate === undefined) return [];
    const wavelength = num(c, "wavelength");
    const implied = probePowerForMeasurementRate(2 * Math.PI * rate, wavelength, body.mass, body.omega);
    const reading = `a measurement rate of ${formatQuantity(rate, "frequency")} on '${body.owner}' (${formatQuantity(body.mass, "mass")}, ${formatQuantity(body.omega / (2 * Math.PI), "frequency")})`;
    return laserPowerCautions(
      `'${c.name}' reaches ${reading}, which implies`,
      implied,
      `of probe light at ${formatQuantity(wavelength, "length")} reflected once off the body (a cavity's build-up lowers what the source must give)`,
    );
  },
};

/** One-sided back-action force PSD of the probe, in N²/Hz. */
function backActionForcePsd(c: ResolvedComponent, body: MechanicalBody): number {
  const power = maybeNum(c, "power");
  if (power !== undefined) return reflectionForcePsd(power, num(c, "wavelength"));
  if (body.omega <= 0) {
    throw new QuietframeError({
      path: `${c.path}.measurementRate`,
      value: c.raw.measurementRate,
      problem: `a measurement rate is defined through the zero-point motion of an oscillator, but '${body.owner}' is a free mass`,
      allowed: "power (with wavelength) for a free mass",
    });
  }
  const rate = 2 * Math.PI * num(c, "measurementRate");
  // Γ = x_zpf² S̄_FF / ħ² with the double-sided S̄ = S/2.
  const xzpf = zeroPointDisplacement(body);
  return (2 * rate * HBAR * HBAR) / (xzpf * xzpf);
}
