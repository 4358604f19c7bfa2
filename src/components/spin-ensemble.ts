import { QuietframeError } from "../errors";
import { larmorFieldCautions, magneticFieldCautions } from "../safety/cautions";
import { combine } from "../network/linear-form";
import type { ModeInfo } from "../network/model";
import { isValidSpin, MAX_SPIN, occupationFromPolarization, polarizationFromOccupation } from "../physics/spin-statistics";
import { maybeNum, num, type ComponentKind, type ResolvedComponent } from "./types";

interface SpinHandle {
  mode: ModeInfo;
  /** Two columns (X, P) of the noise that comes with the intrinsic decoherence. */
  intrinsicColumn: number;
  /** Two columns (X, P) of the noise that comes with the probe-induced decoherence. */
  probeColumn: number;
}

/**
 * Collective spin oscillator of a polarized atomic ensemble (Holstein–Primakoff), read by
 * travelling light through the Faraday interaction.
 *
 * The transverse spin components, scaled by √|⟨J_x⟩|, form one bosonic mode X, P with
 * [X, P] = i. In the frame of the light's quadratures the mode precesses at the Larmor
 * frequency Ω_L in the sense set by the orientation s (+1: spin in its energetically lowest
 * state, a positive-mass oscillator; −1: highest state, negative mass):
 *   dX/dt = s Ω_L P − (γ/2) X + √γ_0 ξ_X + √γ_p ζ_X
 *   dP/dt = −s Ω_L X − (γ/2) P + √γ_0 ξ_P + √γ_p ζ_P + k q1_in      (back-action)
 *   q1_out = q1_in,   q2_out = q2_in + k X                            (QND readout)
 * with γ = γ_0 + γ_p the total linewidth (intrinsic plus probe broadening, FWHM of the spin
 * noise peak in rad/s) and ξ, ζ white noises of one-sided PSD 2n_s + 1 each, so the lone
 * ensemble relaxes to variance n_s + 1/2 in both quadratures. Its response of X to a drive on
 * P is χ_s(Ω) = s Ω_L / (Ω_L² + γ²/4 − Ω² − iγΩ), the form of a symmetric-damped oscillator,
 * so a negative-mass ensemble has the mirrored response of a matched mechanical oscillator.
 *
 * The coupling k = 2√Γ follows from the readout rate Γ = x_zpf² S̄_FF/ħ², the definition used
 * for the position probe (x_zpf² = 1/2 in these units, S̄_FF = k²/2 double-sided), so equal
 * readout rates mean equal back-action. The Faraday interaction couples the light's
 * polarization quadratures; they are taken to be mapped onto the beam's amplitude and phase
 * quadratures by ideal polarization optics, so the ensemble can share a beam with a
 * mechanical position probe.
 */
export const spinEnsemble: ComponentKind<SpinHandle> = {
  type: "spin-ensemble",
  summary: "Collective spin oscillator of a polarized atomic ensemble (Holstein–Primakoff), read by the Faraday interaction; either orientation.",
  params: [
    {
      name: "atoms",
      kind: "count",
      doc: "Number of atoms N; with spin and polarization it sets the macroscopic spin |⟨J_x⟩| = pNF, used to check that the linearized (Holstein–Primakoff) picture holds.",
      min: 1,
    },
    {
      name: "spin",
      kind: "number",
      doc: "Spin F of each atom in the addressed hyperfine level: a positive integer or half-integer, e.g. 4 or 0.5.",
      min: 0.5,
      max: MAX_SPIN,
    },
    {
      name: "polarization",
      kind: "fraction",
      doc: "Polarization p = |⟨J_x⟩|/(NF), 0 < p ≤ 1 (give this or occupation); the occupation follows from a spin-temperature distribution over the sublevels, (1 − p)/(2p) for F = 1/2.",
      optional: true,
      min: 0,
      minExclusive: true,
      max: 1,
    },
    {
      name: "occupation",
      kind: "number",
      doc: "Thermal-like occupation n_s ≥ 0 of the spin oscillator: stationary variance n_s + 1/2 of each quadrature without probing (give this or polarization).",
      optional: true,
      min: 0,
    },
    {
      name: "larmorFrequency",
      kind: "frequency",
      doc: "Larmor frequency f_L = Ω_L/2π (give this, or field with gyromagneticRatio).",
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "field",
      kind: "magneticField",
      doc: "Magnitude of the static bias field B; with gyromagneticRatio it gives f_L = γ_g·B (linear Zeeman regime).",
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "gyromagneticRatio",
      kind: "gyromagneticRatio",
      doc: "Magnitude of the gyromagnetic ratio γ_g of the addressed level, in Hz/T (cyclic), used with field.",
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "linewidth",
      kind: "frequency",
      doc: "Intrinsic linewidth γ_0/2π (FWHM of the spin noise peak without probe light), give this or t2; γ_0 = 2/T2.",
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "t2",
      kind: "time",
      doc: "Transverse coherence time T2, the 1/e time of the transverse spin's amplitude (give this or linewidth): γ_0 = 2/T2, linewidth 1/(πT2).",
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "probeBroadening",
      kind: "frequency",
      doc: "Extra linewidth γ_p/2π from the probe light (spontaneous scattering); it damps toward the same occupation n_s and brings its own noise.",
      default: "0 Hz",
      min: 0,
    },
    {
      name: "readoutRate",
      kind: "frequency",
      doc: "Readout rate Γ/2π with Γ = x_zpf² S̄_FF/ħ², the position probe's measurementRate definition: equal rates mean equal back-action.",
      min: 0,
    },
    {
      name: "orientation",
      kind: "choice",
      choices: ["positive-mass", "negative-mass"],
      doc: '"positive-mass": spin in its energetically lowest state (χ as a mechanical oscillator); "negative-mass": highest state, χ → −χ.',
    },
  ],
  ports: [
    { name: "in", kind: "optical-in", doc: "Probe light (its fluctuations); its amplitude quadrature drives the spin." },
    { name: "out", kind: "optical-out", doc: "Light carrying the spin quadrature X in its phase quadrature." },
  ],
  crossCheck: (c) => {
    if (!isValidSpin(num(c, "spin"))) {
      throw new QuietframeError({
        path: `${c.path}.spin`,
        value: c.raw.spin,
        problem: "is not a whole or half-integer spin",
        allowed: `F = 0.5, 1, 1.5, … up to ${MAX_SPIN}`,
      });
    }
    exactlyOne(c, ["polarization", "occupation"], "polarization (e.g. 0.9) or occupation (e.g. 0.05)");
    exactlyOne(c, ["linewidth", "t2"], 'linewidth (e.g. "200 Hz") or t2 (e.g. "1.5 ms")');
    const hasField = c.given.has("field");
    const hasRatio = c.given.has("gyromagneticRatio");
    if (hasField !== hasRatio) {
      const missing = hasField ? "gyromagneticRatio" : "field";
      throw new QuietframeError({
        path: `${c.path}.${missing}`,
        problem: `is required with ${hasField ? "field" : "gyromagneticRatio"}`,
        allowed: 'field and gyromagneticRatio together (e.g. "314 uT" and "3.5 GHz/T"), or larmorFrequency alone',
      });
    }
    if (c.given.has("larmorFrequency") === hasField) {
      throw new QuietframeError({
        path: `${c.path}.larmorFrequency`,
        value: c.raw.larmorFrequency,
        problem: hasField ? "both larmorFrequency and field are given" : "neither larmorFrequency nor field is given",
        allowed: 'exactly one of larmorFrequency (e.g. "1.1 MHz") or field with gyromagneticRatio',
      });
    }
    checkLinearRegime(c);
  },
  allocate: (b, c) => {
    const mode = b.addMode(c.name, "spin", `${c.name} collective spin (X, P)`);
    const n = 2 * spinOccupation(c) + 1;
    const intrinsicColumn = b.addInputs(c.name, ["spin noise (X)", "spin noise (P)"], [n, 0, 0, n], "thermal", `${c.name}: spin decoherence noise`, true);
    const probeColumn = b.addInputs(c.name, ["probe-induced spin noise (X)", "probe-induced spin noise (P)"], [n, 0, 0, n], "thermal", `${c.name}: probe-induced decoherence noise`, true);
    return { mode, intrinsicColumn, probeColumn };
  },
  wire: ({ builder, component: c, handle, inputs }) => {
    const { x, p } = handle.mode;
    const s = c.values.orientation === "negative-mass" ? -1 : 1;
    const omegaL = 2 * Math.PI * larmorFrequency(c);
    const g0 = intrinsicDamping(c);
    const gp = 2 * Math.PI * num(c, "probeBroadening");
    const gamma = g0 + gp;
    builder.couple(x, p, s * omegaL);
    builder.couple(p, x, -s * omegaL);
    builder.couple(x, x, -gamma / 2);
    builder.couple(p, p, -gamma / 2);
    builder.drive(x, builder.input(handle.intrinsicColumn), Math.sqrt(g0));
    builder.drive(p, builder.input(handle.intrinsicColumn + 1), Math.sqrt(g0));
    builder.drive(x, builder.input(handle.probeColumn), Math.sqrt(gp));
    builder.drive(p, builder.input(handle.probeColumn + 1), Math.sqrt(gp));
    const k = readoutCoupling(c);
    builder.pushByLight(p, inputs.in.amplitude, k);
    return { out: { amplitude: inputs.in.amplitude, phase: combine(1, inputs.in.phase, k, builder.state(x)) } };
  },
  cautions: (c) => {
    const field = maybeNum(c, "field");
    return field !== undefined ? magneticFieldCautions(c.name, field) : larmorFieldCautions(c.name, num(c, "larmorFrequency"));
  },
};

/** Largest allowed ratio of the stationary transverse variance to the macroscopic spin (a 0.1 rad spread). */
const LINEAR_REGIME_LIMIT = 0.01;

function exactlyOne(c: ResolvedComponent, names: [string, string], example: string): void {
  const [a, b] = names;
  if (c.given.has(a) === c.given.has(b)) {
    const both = c.given.has(a);
    throw new QuietframeError({
      path: `${c.path}.${a}`,
      value: both ? c.raw[a] : undefined,
      problem: both ? `both ${a} and ${b} are given` : `neither ${a} nor ${b} is given`,
      allowed: `exactly one of ${example}`,
    });
  }
}

/** f_L in Hz: given directly, or γ_g·B. */
export function larmorFrequency(c: ResolvedComponent): number {
  const f = maybeNum(c, "larmorFrequency");
  return f !== undefined ? f : num(c, "gyromagneticRatio") * num(c, "field");
}

/** γ_0 in rad/s: 2π·linewidth, or 2/T2 (the transverse amplitude decays as e^{−t/T2}, energy-like quantities at 2/T2). */
export function intrinsicDamping(c: ResolvedComponent): number {
  const lw = maybeNum(c, "linewidth");
  return lw !== undefined ? 2 * Math.PI * lw : 2 / num(c, "t2");
}

/** Light–spin coupling k = 2√Γ in the dimensionless quadratures. */
export function readoutCoupling(c: ResolvedComponent): number {
  return 2 * Math.sqrt(2 * Math.PI * num(c, "readoutRate"));
}

/** n_s, given or from the polarization. */
export function spinOccupation(c: ResolvedComponent): number {
  const n = maybeNum(c, "occupation");
  return n !== undefined ? n : occupationFromPolarization(num(c, "spin"), num(c, "polarization"));
}

function spinPolarization(c: ResolvedComponent): number {
  const p = maybeNum(c, "polarization");
  return p !== undefined ? p : polarizationFromOccupation(num(c, "spin"), num(c, "occupation"));
}

/**
 * The Holstein–Primakoff mode is a good model while the transverse spread stays small
 * against the macroscopic spin: stationary variance (n_s + 1/2 plus the back-action heating
 * Γ/γ) at most 1 % of |⟨J_x⟩| = pNF.
 */
function checkLinearRegime(c: ResolvedComponent): void {
  const macroscopic = spinPolarization(c) * num(c, "atoms") * num(c, "spin");
  const gamma = intrinsicDamping(c) + 2 * Math.PI * num(c, "probeBroadening");
  const variance = spinOccupation(c) + 0.5 + (2 * Math.PI * num(c, "readoutRate")) / gamma;
  if (variance > LINEAR_REGIME_LIMIT * macroscopic) {
    throw new QuietframeError({
      path: `${c.path}.atoms`,
      value: c.raw.atoms,
      problem:
        `the ensemble is too small for the linearized spin model: its transverse variance ` +
        `(${variance.toPrecision(3)}, occupation plus back-action heating) exceeds 1 % of the macroscopic spin pNF = ${macroscopic.toPrecision(3)}`,
      allowed: `atoms ≥ ${Math.ceil(variance / (LINEAR_REGIME_LIMIT * spinPolarization(c) * num(c, "spin")))} for these parameters (or a lower readout rate or occupation)`,
    });
  }
}
