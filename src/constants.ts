/**
 * Physical constants in SI units.
 *
 * Values are the CODATA 2018 recommended values (Tiesinga et al., Rev. Mod. Phys. 93,
 * 025010 (2021); NIST online database at physics.nist.gov/constants) unless stated
 * otherwise. Constants marked "exact" are fixed by the 2019 definition of the SI.
 */

/** Planck constant h, in J s (exact, 2019 SI definition). */
export const PLANCK_H = 6.62607015e-34;

/**
 * Reduced Planck constant ħ = h/2π, in J s.
 * CODATA 2018 value 1.054 571 817... × 10⁻³⁴ J s. CODATA prints it truncated (the "..."),
 * so it sits just below h/2π = 1.054 571 817 646… × 10⁻³⁴ J s (relative offset 6.13e-10); we
 * keep the published digits so results compare digit-for-digit with hand calculations that
 * use the tabulated ħ.
 */
export const HBAR = 1.054571817e-34;

/** Boltzmann constant k_B, in J/K (exact, 2019 SI definition). */
export const BOLTZMANN = 1.380649e-23;

/** Speed of light in vacuum c, in m/s (exact, 2019 SI definition). */
export const SPEED_OF_LIGHT = 299792458;

/** Newtonian constant of gravitation G, in m³ kg⁻¹ s⁻² (CODATA 2018; relative uncertainty 2.2e-5). */
export const GRAVITATIONAL_CONSTANT = 6.6743e-11;

/**
 * Nominal solar mass parameter GM☉, in m³ s⁻² (exact by definition: IAU 2015 Resolution B3,
 * 1.327 124 4 × 10²⁰ m³ s⁻²). Astrophysical formulas that need G·M use this directly: the
 * product is known far better than G or M☉ alone.
 */
export const SOLAR_MASS_PARAMETER = 1.3271244e20;

/**
 * Solar mass M☉, in kg: 1.98847 × 10³⁰ kg.
 *
 * Not a CODATA or IAU-defined constant. The IAU (2015 Resolution B3) fixes only the
 * nominal solar mass *parameter* GM☉ = 1.3271244 × 10²⁰ m³ s⁻²; the mass in kg is that
 * product divided by G, and so is only as good as G (≈ 2e-5). This is the commonly
 * quoted value (1.98847 ± 0.00007) × 10³⁰ kg, which equals GM☉ / G with the CODATA 2014
 * G; with the CODATA 2018 G above it would be 1.98841 × 10³⁰ kg (3e-5 lower). Where
 * precision matters, work with GM☉ directly (SOLAR_MASS_PARAMETER, as the reach does).
 */
export const SOLAR_MASS = 1.98847e30;

/** Bohr magneton μ_B = eħ/2mₑ, in J/T (CODATA 2018). */
export const BOHR_MAGNETON = 9.2740100783e-24;
