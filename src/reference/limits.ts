import { BOLTZMANN, HBAR } from "../constants";
import { expm1, tanh } from "../numeric/portable-math";

/**
 * Closed-form reference curves (one-sided PSDs, SI units). Each is the textbook formula,
 * written once here; components and tests use these, never re-derive them.
 * Ω is the angular frequency 2πf.
 */

/** Free-mass displacement SQL S_x = 2ħ/(mΩ²)  [m²/Hz]. */
export function freeMassDisplacementSql(mass: number, omega: number): number {
  return (2 * HBAR) / (mass * omega * omega);
}

/** Free-mass force SQL S_F = 2ħmΩ²  [N²/Hz]. */
export function freeMassForceSql(mass: number, omega: number): number {
  return 2 * HBAR * mass * omega * omega;
}

/** Strain SQL of a Michelson with four test masses m and arm length L: h² = 8ħ/(mΩ²L²)  [1/Hz]. */
export function strainSql(mass: number, armLength: number, omega: number): number {
  return (8 * HBAR) / (mass * omega * omega * armLength * armLength);
}

/** χ(Ω) = 1/(m(Ω_m² − Ω² − iγΩ)) for a signed mass m; returns [re, im] in m/N. */
export function oscillatorSusceptibility(mass: number, omegaM: number, gamma: number, omega: number): [number, number] {
  const dr = mass * (omegaM * omegaM - omega * omega);
  const di = -mass * gamma * omega;
  const d2 = dr * dr + di * di;
  return [dr / d2, -di / d2];
}

/** Added-noise SQL of a displacement measurement, 2ħ|χ(Ω)|  [m²/Hz]. */
export function displacementSql(chi: [number, number]): number {
  return 2 * HBAR * modulus(chi[0], chi[1]);
}

/**
 * |re + i·im| scaled by the larger part so squares cannot overflow or underflow. The same
 * operations, in the same order, as the portable hypot of two values, without its argument
 * list: this runs at every frequency of every budget.
 */
function modulus(re: number, im: number): number {
  const a = Math.abs(re);
  const b = Math.abs(im);
  if (Number.isNaN(a) || Number.isNaN(b)) return a === Infinity || b === Infinity ? Infinity : NaN;
  const max = a > b ? a : b;
  if (max === Infinity) return Infinity;
  if (max === 0) return 0;
  const qa = a / max;
  const qb = b / max;
  return Math.sqrt(qa * qa + qb * qb) * max;
}

/** Zero-point displacement spectrum 2ħ|Im χ(Ω)|  [m²/Hz]. */
export function zeroPointDisplacementPsd(chi: [number, number]): number {
  return 2 * HBAR * Math.abs(chi[1]);
}

/**
 * Quantum fluctuation-dissipation theorem for viscous damping, one-sided symmetrized:
 * S_F(Ω) = 2|m|γħΩ coth(ħΩ/2k_BT)  →  4|m|γk_BT when k_BT ≫ ħΩ   [N²/Hz].
 */
export function thermalForcePsd(mass: number, gamma: number, temperature: number, omega: number): number {
  const m = Math.abs(mass);
  const w = Math.abs(omega);
  if (w === 0) return 4 * m * gamma * BOLTZMANN * temperature;
  const zeroPoint = 2 * m * gamma * HBAR * w;
  if (temperature === 0) return zeroPoint;
  const u = (HBAR * w) / (2 * BOLTZMANN * temperature);
  // coth u for small u from its series, so the classical limit keeps full precision.
  const coth = u < 1e-4 ? 1 / u + u / 3 : 1 / tanh(u);
  return zeroPoint * coth;
}

/** Mean thermal occupation n̄ = 1/(e^{ħΩ/k_BT} − 1). */
export function thermalOccupation(omega: number, temperature: number): number {
  if (temperature === 0) return 0;
  return 1 / expm1((HBAR * Math.abs(omega)) / (BOLTZMANN * temperature));
}
