/**
 * Shared model of a mechanical degree of freedom with a signed mass m (negative mass =
 * inverted oscillator). In dimensionless quadratures x = x_s X, p = p_s P with x_s p_s = ħ:
 *   dX/dt = ±Ω_s P,  dP/dt = ∓(Ω_m²/Ω_s) X + F/p_s,
 * plus damping of one of two kinds:
 * - viscous (Brownian motion): −γ P and a white thermal force; χ = 1/(m(Ω_m² − Ω² − iγΩ)),
 *   the textbook form, but not a valid quantum Markov model: at low Q and low temperature
 *   the stationary state can break the uncertainty relation by O(1/Q);
 * - symmetric (amplitude damping, the Lindblad form): −(γ/2)X and −(γ/2)P with noise on
 *   both; always physical; χ = 1/(m(Ω_m² + γ²/4 − Ω² − iγΩ)).
 */
import { BOLTZMANN, HBAR } from "../constants";
import { displacementSql, thermalForcePsd, thermalOccupation, zeroPointDisplacementPsd } from "../reference/limits";
import type { NetworkBuilder } from "../network/builder";
import type { MechanicalBody, ThermalBathInfo } from "./mechanical-body";
import type { ReferenceCurve, SignalReference } from "./signal-reference";

/**
 * The one name a body's thermal term has in budgets, whatever the damping model or bath (the
 * term ids stay as they were, "thermal force" for viscous baths: fingerprints hash them).
 */
export const THERMAL_TERM_NAME = "thermal noise";

/** Scale frequency for a free mass; any positive value gives the same spectra. */
const FREE_MASS_SCALE_OMEGA = 2 * Math.PI;

export function allocateBody(builder: NetworkBuilder, owner: string, mass: number, massSign: 1 | -1, omega: number): MechanicalBody {
  const mode = builder.addMode(owner, "mechanical", `${owner} position/momentum`);
  const scaleOmega = omega > 0 ? omega : FREE_MASS_SCALE_OMEGA;
  return {
    owner,
    mode,
    xScale: Math.sqrt(HBAR / (mass * scaleOmega)),
    pScale: Math.sqrt(HBAR * mass * scaleOmega),
    mass,
    massSign,
    omega,
    baths: [],
  };
}

/** Writes the free dynamics (no damping; baths add theirs). */
export function wireBody(builder: NetworkBuilder, body: MechanicalBody): void {
  const { x, p } = body.mode;
  const s = body.massSign;
  // dx/dt = p/m  →  dX/dt = s · p_s/(|m| x_s) · P
  builder.couple(x, p, (s * body.pScale) / (body.mass * body.xScale));
  // dp/dt = −m Ω_m² x  →  dP/dt = −s |m| Ω_m² x_s/p_s · X
  if (body.omega > 0) builder.couple(p, x, (-s * body.mass * body.omega * body.omega * body.xScale) / body.pScale);
}

/**
 * Adds viscous damping γ and its thermal force. The force noise is white: the quantum
 * fluctuation-dissipation theorem S_F = 2|m|γħΩ coth(ħΩ/2k_BT) evaluated at the body's
 * resonance (the usual Markov approximation for a high-Q mode), or its classical limit
 * 4|m|γk_BT for a free mass, which has no resonance to evaluate it at.
 */
export function addViscousBath(builder: NetworkBuilder, body: MechanicalBody, bath: ThermalBathInfo, inputColumn: number): void {
  const { p } = body.mode;
  builder.couple(p, p, -bath.gamma);
  builder.drive(p, builder.input(inputColumn), Math.sqrt(whiteThermalForcePsd(body, bath)) / body.pScale);
}

/**
 * Adds symmetric (amplitude) damping at rate γ with thermal noise on both quadratures,
 * each with one-sided PSD coth(ħΩ_m/2k_BT) = 2n̄ + 1 entering through √γ: the lone mode then
 * relaxes to variance n̄ + 1/2, the quantum fluctuation-dissipation result. Uses two input columns.
 */
export function addSymmetricBath(builder: NetworkBuilder, body: MechanicalBody, bath: ThermalBathInfo, inputColumn: number): void {
  const { x, p } = body.mode;
  builder.couple(x, x, -bath.gamma / 2);
  builder.couple(p, p, -bath.gamma / 2);
  builder.drive(x, builder.input(inputColumn), Math.sqrt(bath.gamma));
  builder.drive(p, builder.input(inputColumn + 1), Math.sqrt(bath.gamma));
}

/** 2n̄ + 1 = coth(ħΩ/2k_BT): one-sided PSD of a thermal input quadrature (vacuum = 1). */
export function thermalQuadratureNoise(omega: number, temperature: number): number {
  return 2 * thermalOccupation(omega, temperature) + 1;
}

/** One-sided force PSD (N²/Hz) of a bath in the white (Markov) approximation used by the engine. */
export function whiteThermalForcePsd(body: MechanicalBody, bath: ThermalBathInfo): number {
  if (body.omega > 0) return thermalForcePsd(body.mass, bath.gamma, bath.temperature, body.omega);
  return 4 * body.mass * bath.gamma * BOLTZMANN * bath.temperature;
}

export function totalDamping(body: MechanicalBody): number {
  return body.baths.reduce((sum, b) => sum + b.gamma, 0);
}

/**
 * Bare mechanical susceptibility of the body (all its baths' damping, no optical spring);
 * [re, im] in m/N. With viscous damping γ_v and symmetric damping γ_s:
 * χ = 1/(m(Ω_m² + (γ_s/2 − iΩ)(γ_s/2 + γ_v − iΩ))), which is the textbook form when γ_s = 0.
 */
export function susceptibility(body: MechanicalBody, omega: number): [number, number] {
  return susceptibilityInto(body, omega, [0, 0]);
}

/**
 * susceptibility() written into `out` and returned: the same operations in the same order, so
 * the same bits, without a new pair. Reference curves call it at every frequency of every budget.
 */
function susceptibilityInto(body: MechanicalBody, omega: number, out: [number, number]): [number, number] {
  // Sums in bath order from 0, as totalDamping() does, so the damping rates keep their bits.
  let gs = 0;
  let total = 0;
  for (let k = 0; k < body.baths.length; k++) {
    const bath = body.baths[k]!;
    if (bath.kind === "symmetric") gs += bath.gamma;
    total += bath.gamma;
  }
  const m = body.massSign * body.mass;
  let dr: number;
  let di: number;
  if (gs === 0) {
    // The textbook form, as oscillatorSusceptibility(m, Ω_m, γ, Ω) writes it.
    dr = m * (body.omega * body.omega - omega * omega);
    di = -m * total * omega;
  } else {
    const gv = total - gs;
    // (γ_s/2 − iΩ)(γ_s/2 + γ_v − iΩ) = γ_s/2 (γ_s/2 + γ_v) − Ω² − iΩ(γ_s + γ_v)
    dr = m * (body.omega * body.omega + (gs / 2) * (gs / 2 + gv) - omega * omega);
    di = -m * omega * (gs + gv);
  }
  const d2 = dr * dr + di * di;
  out[0] = dr / d2;
  out[1] = -di / d2;
  return out;
}

/** |χ|² of a pair susceptibilityInto has just filled (read after the call that fills it). */
function modulusSquared(chi: [number, number]): number {
  return chi[0] * chi[0] + chi[1] * chi[1];
}

/** Signal "force" on a body: noise can be referred to force (N) or displacement (m = force·|χ|). */
export function forceSignalReference(body: MechanicalBody): SignalReference {
  // Each closure owns its pair of scratch numbers: nothing is allocated per frequency.
  const referralChi: [number, number] = [0, 0];
  const abs2 = (omega: number): number => modulusSquared(susceptibilityInto(body, omega, referralChi));
  const sqlChi: [number, number] = [0, 0];
  const curves: ReferenceCurve[] = [
    {
      id: "sql",
      label: body.omega > 0 ? "SQL (oscillator, 2ħ|χ|)" : "SQL (free mass, 2ħ/(mΩ²))",
      // Force SQL 2ħ/|χ|; displacement 2ħ|χ| follows through the |χ|² referral.
      psd: (omega) => displacementSql(susceptibilityInto(body, omega, sqlChi)) / modulusSquared(sqlChi),
    },
  ];
  if (body.baths.length > 0) {
    const zeroPointChi: [number, number] = [0, 0];
    curves.push({
      id: "zero-point",
      label: "zero-point motion (2ħ|Im χ|)",
      psd: (omega) => zeroPointDisplacementPsd(susceptibilityInto(body, omega, zeroPointChi)) / modulusSquared(zeroPointChi),
    });
    if (body.baths.some((b) => b.temperature > 0)) {
      curves.push({
        id: "thermal",
        label: "thermal force (quantum FDT)",
        psd: (omega) => {
          let sum = 0;
          for (let k = 0; k < body.baths.length; k++) {
            const bath = body.baths[k]!;
            sum += thermalForcePsd(body.mass, bath.gamma, bath.temperature, omega);
          }
          return sum;
        },
      });
    }
  }
  return {
    signalUnit: "N",
    quantities: [
      { name: "displacement", unit: "m", psdFactor: abs2 },
      { name: "force", unit: "N", psdFactor: () => 1 },
    ],
    curves,
  };
}

export function applyForceSignal(builder: NetworkBuilder, body: MechanicalBody): void {
  builder.driveBySignal(body.mode.p, 1 / body.pScale);
}
