/**
 * Thermal-like occupation of a polarized spin ensemble in the Holstein–Primakoff picture.
 *
 * The collective spin J = Σ F^(i) of N atoms of spin F is polarized along x with
 * ⟨J_x⟩ = p·N·F (p: polarization as a fraction of the maximum). The transverse components,
 * scaled as X = J_y/√|⟨J_x⟩| and P = J_z/√|⟨J_x⟩|, obey [X, P] = i, and
 *   Var(X) = Var(J_y)/|⟨J_x⟩| = n_s + 1/2
 * defines the thermal-like occupation n_s (zero for a fully polarized, coherent spin state).
 *
 * For one atom in a state that is symmetric about x (no transverse mean, ⟨F_y²⟩ = ⟨F_z²⟩),
 * Var(F_y) = (F(F+1) − ⟨F_x²⟩)/2, so
 *   n_s = (F(F+1) − ⟨F_x²⟩)/(2pF) − 1/2.
 * ⟨F_x²⟩ depends on how the atoms are spread over the 2F+1 sublevels, which p alone does not
 * fix for F > 1/2. We take the spin-temperature distribution, populations ∝ e^{βm}, the
 * equilibrium that optical pumping reaches when spin-exchange collisions dominate; for F = 1/2
 * every distribution gives n_s = (1 − p)/(2p). Users whose ensemble is prepared differently
 * give the occupation directly.
 */

/** 2F must be a positive integer; F up to this value is accepted (the sums are O(F)). */
export const MAX_SPIN = 100;

/** True when F is a positive integer or half-integer no larger than MAX_SPIN. */
export function isValidSpin(spin: number): boolean {
  const twice = 2 * spin;
  return Number.isFinite(spin) && spin > 0 && spin <= MAX_SPIN && Math.abs(twice - Math.round(twice)) < 1e-12;
}

interface SublevelMoments {
  /** ⟨F_x⟩ per atom. */
  readonly mean: number;
  /** ⟨F_x²⟩ per atom. */
  readonly meanSquare: number;
}

/** (1 − t)^j for j = 0…2F, reused from call to call: the bisections below take some fifty moments each. */
let powersOfOneMinusT = new Float64Array(2 * MAX_SPIN + 1);

/**
 * Moments of F_x for populations ∝ t^{m+F} (1 − t)^{F−m}, m = −F…F, with t ∈ [1/2, 1]:
 * this is e^{βm} with e^β = t/(1 − t), written so that full polarization (t = 1) is finite.
 */
function spinTemperatureMoments(spin: number, t: number): SublevelMoments {
  const levels = Math.round(2 * spin) + 1;
  if (powersOfOneMinusT.length < levels) powersOfOneMinusT = new Float64Array(levels);
  const down = powersOfOneMinusT;
  down[0] = 1;
  for (let k = 1; k < levels; k++) down[k] = down[k - 1] * (1 - t);
  let up = 1;
  let z = 0;
  let first = 0;
  let second = 0;
  for (let k = 0; k < levels; k++) {
    if (k > 0) up *= t;
    const w = up * down[levels - 1 - k];
    const m = k - spin;
    z += w;
    first += w * m;
    second += w * m * m;
  }
  return { mean: first / z, meanSquare: second / z };
}

function occupationFromMoments(spin: number, moments: SublevelMoments): number {
  return (spin * (spin + 1) - moments.meanSquare) / (2 * moments.mean) - 0.5;
}

/** Bisection on t ∈ [1/2, 1] until the interval stops shrinking; `increasing` says how f behaves. */
function bisect(f: (t: number) => number, target: number, increasing: boolean): number {
  let lo = 0.5;
  let hi = 1;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid <= lo || mid >= hi) break;
    const above = f(mid) > target;
    if (above === increasing) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

/** The last answer of occupationFromPolarization: a search assembles the same ensemble many times over. */
const lastOccupation = { spin: Number.NaN, polarization: Number.NaN, occupation: Number.NaN };

/** n_s of an ensemble of spin-F atoms with polarization p ∈ (0, 1] (spin-temperature distribution). */
export function occupationFromPolarization(spin: number, polarization: number): number {
  const last = lastOccupation;
  // Object.is: the very same inputs (a different zero or a NaN is another question).
  if (Object.is(spin, last.spin) && Object.is(polarization, last.polarization)) return last.occupation;
  const occupation = solvedOccupation(spin, polarization);
  last.spin = spin;
  last.polarization = polarization;
  last.occupation = occupation;
  return occupation;
}

function solvedOccupation(spin: number, polarization: number): number {
  if (polarization >= 1) return 0;
  if (Math.round(2 * spin) === 1) return (1 - polarization) / (2 * polarization);
  const t = bisect((x) => spinTemperatureMoments(spin, x).mean / spin, polarization, true);
  return Math.max(0, occupationFromMoments(spin, spinTemperatureMoments(spin, t)));
}

/** The polarization p ∈ (0, 1] whose spin-temperature distribution has occupation n_s ≥ 0. */
export function polarizationFromOccupation(spin: number, occupation: number): number {
  if (occupation <= 0) return 1;
  if (Math.round(2 * spin) === 1) return 1 / (2 * occupation + 1);
  // n_s falls monotonically from ∞ (t = 1/2, unpolarized) to 0 (t = 1, fully polarized).
  const t = bisect((x) => occupationFromMoments(spin, spinTemperatureMoments(spin, x)), occupation, false);
  return spinTemperatureMoments(spin, t).mean / spin;
}
