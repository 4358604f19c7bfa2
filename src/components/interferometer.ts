import { HBAR, SPEED_OF_LIGHT } from "../constants";
import { QuietframeError } from "../errors";
import { laserPowerCautions } from "../safety/cautions";
import { formatQuantity } from "../units";
import type { NetworkBuilder } from "../network/builder";
import { combine, combineFields, type Field } from "../network/linear-form";
import type { ModeInfo } from "../network/model";
import { strainSql } from "../reference/limits";
import { applyForceSignal, wireBody } from "../physics/mechanics";
import { opticalAngularFrequency, pushOnBody } from "../physics/optomechanics";
import { type QuadratureFactor, type SignalRecyclingLoop, signalRecyclingLoop, signalRecyclingLoopFromPole, springIsRestoring } from "../physics/signal-recycling";
import { maybeNum, num, type ComponentKind, type MechanicalBody, type NoiseEntry, type ResolvedComponent, type SignalReference } from "./types";

/**
 * Michelson interferometer with a Fabry–Perot cavity in each arm and an optional
 * signal-recycling mirror, seen from its dark port, in the two-photon picture.
 *
 * Only the antisymmetric (differential) degrees of freedom talk to the dark port, so the
 * component is built from two modes of the engine:
 *
 * - The differential arm-cavity mode d = (c_N − c_E)/√2 of the two arm fields. Each arm
 *   cavity has amplitude half-width γ = 2π·armBandwidth (the field decays as e^{−γt}); the
 *   mode couples to the dark port at γ_in and to arm losses at γ_0 = γ − γ_in.
 * - The differential arm length ΔL = δL_N − δL_E of the four free test masses (mass m each),
 *   δL = x_end − x_input. The kinetic energy Σ m ẋ²/2 along this normal mode is (m/8) ΔL̇²,
 *   and the generalized force conjugate to ΔL is (F_N − F_E)/2 (from −F_N δL_N − F_E δL_E),
 *   so ΔL moves like a free mass of reduced mass μ = m/4.
 *
 * Linearized around the carrier (ā = √n per arm, n the circulating photon number of one
 * arm, G = ω0/L the frequency pull per metre of arm length; arm N sees iGā·δL_N, arm E
 * iGā·δL_E, so d sees iGā·ΔL/√2), in quadratures with [d1, d2] = i:
 *   dd1/dt = −γ d1 + √(2γ_in) a1 + √(2γ_0) v1
 *   dd2/dt = −γ d2 + √(2γ_in) a2 + √(2γ_0) v2 + G ā (ΔL + L h)
 *   b1,2   = a1,2 − √(2γ_in) d1,2                    (dark-port output)
 *   μ d²ΔL/dt² = ħ G ā d1                            (generalized radiation-pressure force)
 * In the engine's dimensionless quadratures X = ΔL/x_s both couplings are g = G ā x_s, the
 * structure of the cavity component, acting on the reduced-mass body.
 *
 * Strain enters as what the light sees: a change L·h of the differential arm length added to
 * the mechanical ΔL in the optical phase quadrature (a frequency-independent column, so the
 * response is exact at every Ω; as a force it would have to be μΩ²L·h). This is the
 * long-wavelength limit (ΩL/c ≪ 1) for an optimally oriented wave. Classical force and
 * displacement noise of the test masses enter beside it (testMassForceEntry below).
 *
 * Solving these equations gives (d/dt → −iΩ, β = arctan(Ω/γ), η = γ_in/γ)
 *   b1 = −e^{2iβ} a1 + (loss terms),  b2 = −e^{2iβ}(a2 − K a1) + (loss terms) + signal,
 *   K = 2γħG²n/(μΩ²(γ² + Ω²)) = 16 ω0 γ P_arm / (m L c Ω² (γ² + Ω²)),
 * which, without loss, is the conventional-interferometer input-output relation of the
 * two-photon literature up to an overall sign of both quadratures; with I0 the power at the
 * beam splitter, K = (I0/I_SQL) 2γ⁴/(Ω²(γ² + Ω²)) and I_SQL = mL²γ⁴/(4ω0).
 *
 * Power: `power` is the circulating power P_arm in EACH arm cavity. For lossless arms whose
 * input mirrors have power transmission T ≪ 1 (so γ = Tc/(4L)) the power arriving at the beam
 * splitter is I0 = 2 L γ P_arm / c, i.e. P_arm = I0 c /(2 L γ) (each arm receives I0/2 and
 * builds it up by 4/T). The photon number of one arm is n = 2 L P_arm /(ħ ω0 c).
 *
 * Loss: `opticalLoss` is the round-trip power loss ε of each arm cavity (scatter, absorption,
 * transmission of the end mirror). With the total half-width γ fixed, γ_0 = εc/(4L) and
 * γ_in = γ − γ_0; the unsqueezed phase readout is then S_h = (h_SQL²/2)(K + 1/(ηK)),
 * η = 1 − εc/(4Lγ) (the same as a detector of efficiency η after a lossless interferometer).
 *
 * Signal recycling (optional): a mirror of power transmission T_s at the dark port, with the
 * one-way detuning phase φ of the short cavity it forms with the arms' input mirrors
 * (src/physics/signal-recycling.ts; the convention of Buonanno & Chen, Phys. Rev. D 64,
 * 042006 (2001): φ = 0 tuned signal recycling, φ = 90° tuned resonant sideband extraction).
 * The mirror closes a loop around the arm mode, so the light entering the arms is
 * e = α a + β d and the dark-port output b = ρ' a + λ d. A detuned mirror (sin 2φ ≠ 0)
 * turns the arm mode's response to ΔL into a force on ΔL: the optical spring. For free test
 * masses one of its resonances always grows (restoring for 0 < φ < 90°, anti-damped by the
 * light's delay; anti-restoring for 90° < φ < 180°), so such a set-up needs a servo on the
 * arm length: `lengthControl: "servo"` declares one. A servo that reads the readout acts on
 * signal and noise alike, so the noise referred to strain is the one computed here; the
 * engine then accepts the growing modes and names them in the stability summary. Without a
 * mirror (srmTransmission absent) the component is exactly the one above. The same loop can be
 * given by the arm mode it leaves: signalBandwidth ε and signalDetuning λ, with
 * ρe^{2iφ} = (1 − w)/(1 + w), w = (ε − γ_0 − iλ)/γ_in (see signalRecyclingLoopFromPole).
 *
 * Second carrier (optional): an idler beam at another carrier frequency, e.g. the second beam of
 * an entangled source, enters the dark port beside the signal beam (port `idlerIn`) and leaves
 * it at `idlerOut`. Its carrier sits a whole number of free spectral ranges plus a small
 * detuning Δ_i (`idlerDetuning`, sign of a cavity's Δ = ω_carrier − ω_resonance) away from the
 * signal carrier, so the arms act on its sidebands as a detuned cavity: a second differential arm
 * mode with the same half-widths, detuning Δ_i, its own arm-loss vacua, and the signal-recycling
 * loop with the idler's own one-way phase φ_i (`idlerSrDetuning`, default the signal's: the
 * recycling cavity's phase depends on the carrier frequency). Instead of φ_i the recycling cavity's
 * length ℓ (`srcLength`) may be given, for an idler one free spectral range above the signal
 * carrier: the offset Δω = 2π(c/2L + Δ_i/2π) adds Δω·ℓ/c to the one-way phase, so
 * φ_i = φ + Δω·ℓ/c (mod 2π) (idlerRecyclingPhase below). No bright field sits at the
 * idler's frequency, so its sidebands neither push the test masses (their beat with the signal
 * carrier falls near the free spectral range, far above the band) nor carry the strain: the
 * interferometer is a filter that turns the idler's quadratures by frequency. Read both beams
 * with homodynes and list both in the readout; the optimal combination of the two outputs is the
 * signal beam's noise conditioned on the idler's measurement.
 *
 * Validity: single-mode arms (frequencies and γ well below the free spectral range c/2L),
 * T = 4Lγ/c < 1, a signal-recycling cavity short against c/Ω, and radiation-pressure physics
 * linearized around a locked carrier.
 */
interface InterferometerHandle {
  readonly optical: ModeInfo;
  readonly body: MechanicalBody;
  readonly lossColumn: number;
  readonly mass: number;
  readonly armLength: number;
  /** Amplitude half-width γ of each arm in rad/s, its dark-port and loss parts. */
  readonly gamma: number;
  readonly gammaIn: number;
  readonly gammaLoss: number;
  /** g = G ā x_s, the quadrature coupling of the optical mode and the ΔL body. */
  readonly coupling: number;
  /** dd2/dt per unit strain: G ā L. */
  readonly signalGain: number;
  /** The signal-recycling loop, when there is a mirror. */
  readonly recycling?: SignalRecyclingLoop;
  /** The idler carrier's arm mode, when there is one. */
  readonly idler?: IdlerHandle;
}

/** The second carrier's differential arm mode: its own detuning and recycling phase. */
interface IdlerHandle {
  readonly optical: ModeInfo;
  readonly lossColumn: number;
  /** Δ_i in rad/s. */
  readonly detuning: number;
  readonly recycling?: SignalRecyclingLoop;
}

export const interferometer: ComponentKind<InterferometerHandle> = {
  type: "interferometer",
  summary: "Michelson with arm cavities and optional (detuned) signal recycling, dark-port light in and out, strain signal.",
  params: [
    { name: "mass", kind: "mass", doc: 'Mass m of each of the four test masses, e.g. "40 kg".', min: 0, minExclusive: true },
    { name: "armLength", kind: "length", doc: 'Arm length L, e.g. "4 km".', min: 0, minExclusive: true },
    {
      name: "armBandwidth",
      kind: "frequency",
      doc: "Arm-cavity half-width γ/2π in Hz (half width at half maximum; the intracavity field decays at γ). Must stay below c/(8πL) (input-mirror transmission 4Lγ/c < 1).",
      min: 0,
      minExclusive: true,
    },
    {
      name: "power",
      kind: "power",
      doc: "Circulating power P_arm in each arm cavity (not the input power: for lossless arms the power at the beam splitter is I0 = 2Lγ·P_arm/c).",
      min: 0,
      minExclusive: true,
    },
    { name: "wavelength", kind: "length", doc: "Laser wavelength.", default: "1064 nm", min: 0, minExclusive: true },
    {
      name: "opticalLoss",
      kind: "fraction",
      doc: "Round-trip power loss ε of each arm cavity (e.g. 75e-6); at fixed armBandwidth it leaves the fraction η = 1 − εc/(4Lγ) of the arm width coupled to the dark port. Must stay below 4Lγ/c.",
      default: 0,
      min: 0,
      max: 1,
      maxExclusive: true,
    },
    {
      name: "srmTransmission",
      kind: "fraction",
      doc: "Power transmission T_s of a signal-recycling mirror at the dark port (e.g. 0.2); absent: no mirror. 1 is a mirror that reflects nothing.",
      optional: true,
      min: 0,
      minExclusive: true,
      max: 1,
    },
    {
      name: "srDetuning",
      kind: "angle",
      doc: 'One-way detuning phase φ of the signal-recycling cavity (needs srmTransmission; default 0): 0 = tuned signal recycling, 90 deg = tuned resonant sideband extraction, between them an optical spring, e.g. "80 deg".',
      optional: true,
    },
    {
      name: "signalBandwidth",
      kind: "frequency",
      doc: 'Instead of srmTransmission and srDetuning: the half-width ε/2π of the signal-recycled arm mode, e.g. "400 Hz"; must exceed the arm-loss part εc/(8πL).',
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "signalDetuning",
      kind: "frequency",
      doc: 'With signalBandwidth: the detuning λ/2π of the signal-recycled arm mode (sign as a cavity\'s detuning), e.g. "-100 Hz"; 0 is tuned.',
      optional: true,
    },
    {
      name: "idlerDetuning",
      kind: "frequency",
      doc: 'Detuning Δ_i/2π of a second (idler) carrier from the nearest arm resonance, its offset from the signal carrier being whole free spectral ranges plus this (sign as a cavity\'s detuning, Δ = ω_carrier − ω_resonance), e.g. "30 Hz"; absent: no idler. Needs idlerIn connected.',
      optional: true,
    },
    {
      name: "idlerSrDetuning",
      kind: "angle",
      doc: 'One-way detuning phase φ_i of the signal-recycling cavity at the idler carrier (needs idlerDetuning and srmTransmission; default srDetuning), e.g. "0 deg".',
      optional: true,
    },
    {
      name: "srcLength",
      kind: "length",
      doc: 'Instead of idlerSrDetuning: the signal-recycling cavity length ℓ, e.g. "56 m" (needs idlerDetuning and srmTransmission). The idler carrier sits one free spectral range above the signal carrier, Δω = 2π(c/2L + Δ_i/2π), and picks up Δω·ℓ/c more one-way phase, so φ_i = φ + Δω·ℓ/c (mod 2π; φ = srDetuning, growing with the carrier frequency). Like the arms, the cavity is taken as short against c/Ω.',
      optional: true,
      min: 0,
      minExclusive: true,
    },
    {
      name: "lengthControl",
      kind: "choice",
      doc: '"servo": a control loop reading the dark port holds the arm length, so growing optical-spring modes are accepted (it changes signal and noise alike, not the noise referred to strain); "none": growing modes are an error.',
      choices: ["none", "servo"],
      default: "none",
    },
  ],
  ports: [
    { name: "in", kind: "optical-in", doc: "Light entering the dark port (vacuum, squeezed light, one arm of an entangled source)." },
    { name: "out", kind: "optical-out", doc: "Light leaving the dark port, strain in its phase quadrature (read it with a homodyne)." },
    { name: "idlerIn", kind: "optical-in", optional: true, doc: "Idler beam entering the dark port at the idler carrier (with idlerDetuning), e.g. the second beam of an entangled source." },
    { name: "idlerOut", kind: "optical-out", optional: true, doc: "Idler beam leaving the dark port, its quadratures turned by the detuned arms; carries no strain." },
  ],
  crossCheck: (c) => {
    const L = num(c, "armLength");
    const gamma = 2 * Math.PI * num(c, "armBandwidth");
    const transmission = (4 * L * gamma) / SPEED_OF_LIGHT;
    if (!(transmission < 1)) {
      throw new QuietframeError({
        path: `${c.path}.armBandwidth`,
        value: c.raw.armBandwidth,
        problem: `is too wide for ${L} m arms: it needs an input-mirror transmission 4Lγ/c = ${round(transmission)} ≥ 1`,
        allowed: `below c/(8πL) = ${round(SPEED_OF_LIGHT / (8 * Math.PI * L))} Hz for this arm length`,
      });
    }
    const eps = num(c, "opticalLoss");
    if (!(eps < transmission)) {
      throw new QuietframeError({
        path: `${c.path}.opticalLoss`,
        value: c.raw.opticalLoss,
        problem: "the arm loss alone would make the arms wider than armBandwidth",
        allowed: `0 ≤ opticalLoss < 4Lγ/c = ${round(transmission)} for these arms`,
      });
    }
    const mirror = c.given.has("srmTransmission") || c.given.has("srDetuning");
    const pole = c.given.has("signalBandwidth") || c.given.has("signalDetuning");
    if (mirror && pole) {
      throw new QuietframeError({
        path: `${c.path}.${c.given.has("signalBandwidth") ? "signalBandwidth" : "signalDetuning"}`,
        problem: "signal recycling is described twice: by the mirror (srmTransmission, srDetuning) and by the arm mode (signalBandwidth, signalDetuning)",
        allowed: "one description: srmTransmission with srDetuning, or signalBandwidth with signalDetuning",
      });
    }
    if (c.given.has("signalDetuning") && !c.given.has("signalBandwidth")) {
      throw new QuietframeError({
        path: `${c.path}.signalDetuning`,
        value: c.raw.signalDetuning,
        problem: "a signal detuning needs the signal bandwidth beside it",
        allowed: 'signalBandwidth (e.g. "400 Hz") beside signalDetuning',
      });
    }
    if (c.given.has("signalBandwidth") && !(2 * Math.PI * num(c, "signalBandwidth") > (eps * SPEED_OF_LIGHT) / (4 * L))) {
      const floor = (eps * SPEED_OF_LIGHT) / (8 * Math.PI * L);
      throw new QuietframeError({
        path: `${c.path}.signalBandwidth`,
        value: c.raw.signalBandwidth,
        problem: `is not above the arms' own loss width εc/(8πL) = ${round(floor)} Hz: no signal-recycling mirror narrows the arms that far`,
        allowed: `signalBandwidth > ${round(floor)} Hz for this arm loss`,
      });
    }
    if (c.given.has("idlerSrDetuning") && !(c.given.has("idlerDetuning") && c.given.has("srmTransmission"))) {
      throw new QuietframeError({
        path: `${c.path}.idlerSrDetuning`,
        value: c.raw.idlerSrDetuning,
        problem: "an idler recycling phase needs an idler carrier (idlerDetuning) and a signal-recycling mirror (srmTransmission)",
        allowed: "idlerDetuning and srmTransmission beside idlerSrDetuning, or no idlerSrDetuning",
      });
    }
    if (c.given.has("srcLength") && c.given.has("idlerSrDetuning")) {
      throw new QuietframeError({
        path: `${c.path}.srcLength`,
        value: c.raw.srcLength,
        problem: "the idler's recycling phase is given twice: by srcLength (derived from the cavity length) and by idlerSrDetuning",
        allowed: "one of srcLength and idlerSrDetuning",
      });
    }
    if (c.given.has("srcLength") && !(c.given.has("idlerDetuning") && c.given.has("srmTransmission"))) {
      throw new QuietframeError({
        path: `${c.path}.srcLength`,
        value: c.raw.srcLength,
        problem: "a signal-recycling cavity length sets the idler's recycling phase, so it needs an idler carrier (idlerDetuning) and a signal-recycling mirror (srmTransmission)",
        allowed: "idlerDetuning and srmTransmission beside srcLength, or no srcLength",
      });
    }
    if (c.given.has("srDetuning") && !c.given.has("srmTransmission")) {
      throw new QuietframeError({
        path: `${c.path}.srDetuning`,
        value: c.raw.srDetuning,
        problem: "a signal-recycling detuning needs a signal-recycling mirror",
        allowed: "srmTransmission (e.g. 0.2) beside srDetuning, or no srDetuning",
      });
    }
  },
  allocate: (builder, c) => {
    const mass = num(c, "mass");
    const L = num(c, "armLength");
    const gamma = 2 * Math.PI * num(c, "armBandwidth");
    const gammaLoss = (num(c, "opticalLoss") * SPEED_OF_LIGHT) / (4 * L);
    const omega0 = opticalAngularFrequency(num(c, "wavelength"));
    const photons = (2 * L * num(c, "power")) / (HBAR * omega0 * SPEED_OF_LIGHT);
    const abar = Math.sqrt(photons);
    const optical = builder.addMode(c.name, "optical", `${c.name} differential arm-cavity mode`);
    const body = differentialBody(builder, c, mass / 4, gamma);
    const lossColumn = builder.addInputs(c.name, ["arm loss (amplitude)", "arm loss (phase)"], [1, 0, 0, 1], "loss", `${c.name}: arm loss`);
    const G = omega0 / L;
    const gammaIn = gamma - gammaLoss;
    const recycling = optionalLoop(c, gammaIn, gammaLoss).recycling;
    return {
      optical,
      body,
      lossColumn,
      mass,
      armLength: L,
      gamma,
      gammaIn,
      gammaLoss,
      coupling: G * abar * body.xScale,
      signalGain: G * abar * L,
      ...(recycling && { recycling }),
      ...optionalIdler(builder, c, gammaIn, recycling),
    };
  },
  wire: ({ builder, component: c, handle: h, inputs }): Record<string, Field> => {
    const out = wireArmMode(builder, h, h.optical, 0, h.lossColumn, h.recycling, inputs.in);
    wireBody(builder, h.body);
    pushOnBody(builder, h.body, builder.state(h.optical.x), h.coupling);
    builder.couple(h.optical.p, h.body.mode.x, h.coupling);
    const idlerIn = inputs.idlerIn as Field | undefined;
    if (!h.idler) {
      if (idlerIn) {
        throw new QuietframeError({
          path: `${c.path}.idlerDetuning`,
          problem: `light is connected to '${c.name}.idlerIn' but the interferometer has no idler carrier`,
          allowed: 'idlerDetuning (e.g. "30 Hz") beside a connected idlerIn, or no connection to idlerIn',
        });
      }
      return { out };
    }
    if (!idlerIn) {
      throw new QuietframeError({
        path: "connections",
        value: `${c.name}.idlerIn`,
        problem: `port is left unconnected while '${c.name}' has an idler carrier (idlerDetuning ${String(c.raw.idlerDetuning)})`,
        allowed: "connect the idler beam (e.g. the second beam of an entangled source) to idlerIn, or remove idlerDetuning",
      });
    }
    const idlerOut = wireArmMode(builder, h, h.idler.optical, h.idler.detuning, h.idler.lossColumn, h.idler.recycling, idlerIn);
    return { out, idlerOut };
  },
  instabilityHint: (c) => {
    const gamma = 2 * Math.PI * num(c, "armBandwidth");
    const gammaLoss = (num(c, "opticalLoss") * SPEED_OF_LIGHT) / (4 * num(c, "armLength"));
    const loop = optionalLoop(c, gamma - gammaLoss, gammaLoss).recycling;
    const restoring = loop && springIsRestoring(loop);
    if (restoring === undefined) return undefined;
    const how = c.given.has("signalDetuning") ? `signal detuning ${round(num(c, "signalDetuning"))} Hz` : `φ = ${round(((maybeNum(c, "srDetuning") ?? 0) * 180) / Math.PI)}°`;
    const detuned = `interferometer '${c.name}' has detuned signal recycling (${how})`;
    const servo =
      c.values.lengthControl === "servo" ? "" : '; a servo on the arm length holds it in practice: declare one with lengthControl: "servo" (the noise referred to strain does not depend on it)';
    return restoring
      ? `${detuned}: its optical spring is restoring and the light's delayed response anti-damps it, so the spring resonance grows${servo}`
      : `${detuned}: its optical spring is anti-restoring (negative rigidity) and pulls the test masses statically away${servo}`;
  },
  heldByControl: (c) => c.values.lengthControl === "servo",
  signals: ["strain"],
  applySignal: enterAsStrain,
  noiseEntries: { force: testMassForceEntry(), displacement: testMassDisplacementEntry() },
  signalReference: (h) => strainSignalReference(h.mass, h.armLength),
  cautions: (c) => {
    const arm = num(c, "power");
    // I0 = 2Lγ·P_arm/c: the power at the beam splitter for lossless arms (see the header).
    const input = (2 * num(c, "armLength") * 2 * Math.PI * num(c, "armBandwidth") * arm) / SPEED_OF_LIGHT;
    return laserPowerCautions(`'${c.name}' circulates`, arm, `in each arm (about ${formatQuantity(input, "power", 3)} at the beam splitter without losses)`);
  },
};

/**
 * The differential arm length as a free body of reduced mass μ = m/4. Its quadratures are
 * scaled with the arm half-width (x_s = √(ħ/(μγ))): any positive scale gives the same
 * spectra, and this one keeps the entries of A of similar size.
 */
function differentialBody(builder: NetworkBuilder, c: ResolvedComponent, mu: number, scaleOmega: number): MechanicalBody {
  const mode = builder.addMode(c.name, "mechanical", `${c.name} differential arm length`);
  return {
    owner: c.name,
    mode,
    xScale: Math.sqrt(HBAR / (mu * scaleOmega)),
    pScale: Math.sqrt(HBAR * mu * scaleOmega),
    mass: mu,
    massSign: 1,
    omega: 0,
    baths: [],
  };
}

/**
 * Classical noise of the test masses. A spectrum given as "force" or "displacement" on an
 * interferometer is that of ONE test mass, along its arm's axis; the four test masses are taken as
 * independent and alike, each with that spectrum.
 *
 * Differential mode: ΔL = (x_1e − x_1i) − (x_2e − x_2i) (e end, i input mirror of arms 1 and 2),
 * so four independent displacements of PSD S_x each give S_ΔL = 4 S_x. Along this mode every
 * mirror moves by ±ΔL/4, so the generalized force on ΔL is Q = (F_1e − F_1i − F_2e + F_2i)/4, of
 * PSD 4 S_F/16 = S_F/4, acting on the reduced mass μ = m/4 (see differentialBody). A free body
 * answers ΔL = −Q/(μΩ²) = −4Q/(mΩ²), so S_ΔL = 16 (S_F/4)/(m²Ω⁴) = 4 S_F/(m²Ω⁴), and with
 * h = ΔL/L the free-mass strain equivalents are S_h = 4 S_F/(m²Ω⁴L²) and S_h = 4 S_x/L².
 *
 * A force enters where the test masses' motion does: Q drives the ΔL body, which answers the arm
 * mode's radiation pressure too, so the optical spring of detuned signal recycling acts on it. A
 * displacement enters where the signal does: the light sees ΔL + L·h. Since ΔL = χ₀(Q + F_rp),
 * χ₀ = −1/(μΩ²), every output answers Q exactly as it answers the strain χ₀Q/L: the spring changes
 * the response to a force and to the signal by the same factor, so referred to strain a force term
 * is the free-mass conversion above at every detuning (and a displacement entering as the signal
 * is the same as the force ΔL/χ₀, the bodies' convention for displacement noise).
 */
function testMassForceEntry(): NoiseEntry<InterferometerHandle> {
  return {
    label: "force on each test mass of",
    // Q of PSD S_F/4 on the ΔL body, which the arm mode's radiation pressure (and, detuned, the
    // optical spring) acts on as on any motion of the test masses.
    psdScale: () => 1 / 4,
    apply: (builder, h) => applyForceSignal(builder, h.body),
  };
}

function testMassDisplacementEntry(): NoiseEntry<InterferometerHandle> {
  return {
    label: "displacement of each test mass of",
    // ΔL of PSD 4 S_x seen by the light where the strain signal is seen, as L·h: h = ΔL/L.
    psdScale: (h) => 4 / (h.armLength * h.armLength),
    apply: enterAsStrain,
  };
}

/** The signal column (or a classical one standing in for it) per unit strain: L·h added to ΔL in the optical phase quadrature. */
function enterAsStrain(builder: NetworkBuilder, h: InterferometerHandle): void {
  builder.driveBySignal(h.optical.p, h.signalGain);
}

/**
 * Strain h (dimensionless) of an optimally oriented wave; the noise can also be shown as the
 * equivalent differential arm-length change ΔL = L·h. Reference: the strain SQL
 * h_SQL² = 8ħ/(mΩ²L²), which is the free-mass SQL 2ħ/(μΩ²) of ΔL divided by L².
 */
export function strainSignalReference(mass: number, armLength: number): SignalReference {
  return {
    signalUnit: "1",
    quantities: [
      { name: "strain", unit: "1", psdFactor: () => 1 },
      { name: "displacement", unit: "m", psdFactor: () => armLength * armLength },
    ],
    curves: [{ id: "sql", label: "SQL (strain, 8ħ/(mΩ²L²))", psd: (omega) => strainSql(mass, armLength, omega) }],
  };
}

/**
 * One carrier's differential arm mode: half-width γ, detuning Δ (0 for the signal carrier),
 * driven through the dark port (and the signal-recycling loop, when there is one) and by its
 * own arm-loss vacua. Returns the light leaving the dark port at that carrier.
 */
function wireArmMode(builder: NetworkBuilder, h: InterferometerHandle, mode: ModeInfo, detuning: number, lossColumn: number, recycling: SignalRecyclingLoop | undefined, field: Field): Field {
  const { x: d1, p: d2 } = mode;
  const kIn = Math.sqrt(2 * h.gammaIn);
  const kLoss = Math.sqrt(2 * h.gammaLoss);
  builder.couple(d1, d1, -h.gamma);
  builder.couple(d2, d2, -h.gamma);
  // Only a detuned carrier gets the rotation terms, so the signal carrier's model is unchanged.
  if (detuning !== 0) {
    builder.couple(d1, d2, -detuning);
    builder.couple(d2, d1, detuning);
  }
  const arm: Field = { amplitude: builder.state(d1), phase: builder.state(d2) };
  // Light entering the arms: the dark-port input, or with a signal-recycling mirror its
  // transmitted part plus the recycled arm output.
  const entering = recycling ? addFields(times(recycling.arrivingInput, field), times(recycling.recycled, arm)) : field;
  builder.drive(d1, entering.amplitude, kIn);
  builder.drive(d2, entering.phase, kIn);
  builder.drive(d1, builder.input(lossColumn), kLoss);
  builder.drive(d2, builder.input(lossColumn + 1), kLoss);
  return recycling
    ? addFields(times(recycling.reflected, field), times(recycling.leaving, arm))
    : {
        amplitude: combine(1, field.amplitude, -kIn, builder.state(d1)),
        phase: combine(1, field.phase, -kIn, builder.state(d2)),
      };
}

/**
 * The idler carrier's arm mode and loss vacua, claimed only when idlerDetuning is given (a set-up
 * without an idler keeps exactly its modes and inputs). Its recycling loop is the signal's mirror at
 * the idler's own phase; with the signalBandwidth description the mirror is the one that description
 * implies, at the same phase unless idlerSrDetuning (needing srmTransmission) says otherwise.
 */
function optionalIdler(builder: NetworkBuilder, c: ResolvedComponent, gammaIn: number, signalLoop: SignalRecyclingLoop | undefined): { idler?: IdlerHandle } {
  const detuningHz = maybeNum(c, "idlerDetuning");
  if (detuningHz === undefined) return {};
  const optical = builder.addMode(c.name, "optical", `${c.name} differential arm-cavity mode at the idler carrier`);
  const lossColumn = builder.addInputs(c.name, ["idler arm loss (amplitude)", "idler arm loss (phase)"], [1, 0, 0, 1], "loss", `${c.name}: arm loss at the idler carrier`);
  const srm = maybeNum(c, "srmTransmission");
  const recycling = srm === undefined ? signalLoop : signalRecyclingLoop(srm, idlerPhase(c, detuningHz), Math.sqrt(2 * gammaIn));
  return { idler: { optical, lossColumn, detuning: 2 * Math.PI * detuningHz, ...(recycling && { recycling }) } };
}

/** φ_i: given (idlerSrDetuning), derived from srcLength, or the signal's φ. */
function idlerPhase(c: ResolvedComponent, idlerDetuningHz: number): number {
  const phi = maybeNum(c, "srDetuning") ?? 0;
  const given = maybeNum(c, "idlerSrDetuning");
  if (given !== undefined) return given;
  const ell = maybeNum(c, "srcLength");
  return ell === undefined ? phi : idlerRecyclingPhase(phi, num(c, "armLength"), idlerDetuningHz, ell);
}

/**
 * The one-way phase φ_i (rad, in [0, 2π)) of a signal-recycling cavity of length ℓ (m) at an idler
 * carrier one free spectral range c/2L plus Δ_i/2π (Hz) above the signal carrier, whose one-way
 * phase is φ (rad). Sign: φ is the carrier's one-way phase ω·ℓ/c modulo 2π (the envelope of a field
 * e^{−iωt} gains e^{iωℓ/c} over ℓ, the rotation e^{iφ} the loop applies), so a higher carrier
 * frequency has the larger phase: φ_i = φ + Δω·ℓ/c, Δω = 2π(c/2L + Δ_i/2π).
 */
export function idlerRecyclingPhase(srDetuning: number, armLength: number, idlerDetuningHz: number, srcLength: number): number {
  const offset = 2 * Math.PI * (SPEED_OF_LIGHT / (2 * armLength) + idlerDetuningHz);
  const turn = 2 * Math.PI;
  const phase = (srDetuning + (offset * srcLength) / SPEED_OF_LIGHT) % turn;
  return phase < 0 ? phase + turn : phase;
}

/** The signal-recycling loop from whichever description the component has, if any. */
function optionalLoop(c: ResolvedComponent, gammaIn: number, gammaLoss: number): { recycling?: SignalRecyclingLoop } {
  const srm = maybeNum(c, "srmTransmission");
  if (srm !== undefined) return { recycling: signalRecyclingLoop(srm, maybeNum(c, "srDetuning") ?? 0, Math.sqrt(2 * gammaIn)) };
  const bandwidth = maybeNum(c, "signalBandwidth");
  if (bandwidth === undefined) return {};
  return { recycling: signalRecyclingLoopFromPole(2 * Math.PI * bandwidth, 2 * Math.PI * (maybeNum(c, "signalDetuning") ?? 0), gammaIn, gammaLoss) };
}

/** A complex factor acting on both quadratures of a field: (q1 + i q2) → z (q1 + i q2). */
function times(z: QuadratureFactor, f: Field): Field {
  return { amplitude: combine(z[0], f.amplitude, -z[1], f.phase), phase: combine(z[1], f.amplitude, z[0], f.phase) };
}

function addFields(f: Field, g: Field): Field {
  return combineFields(1, f, 1, g);
}

/** Four significant digits for messages. */
function round(x: number): string {
  return Number(x.toPrecision(4)).toString();
}
