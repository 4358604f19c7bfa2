/**
 * The thresholds at which a set-up gets a safety caution, each with where it comes from.
 * quietframe does not classify lasers or certify anything: these numbers only decide when
 * to point at the local rules.
 */
import { BOHR_MAGNETON, PLANCK_H } from "../constants";

/**
 * Upper end of Class 3B for continuous beams from 315 nm into the far infrared: 0.5 W
 * (IEC 60825-1 accessible emission limit; common practice, quoted from memory). More is Class 4.
 */
export const CLASS_4_POWER = 0.5;

/**
 * Lower end of Class 3B for continuous visible beams: 5 mW, five times the Class 2 limit of
 * 1 mW (IEC 60825-1, Class 3R; common practice, quoted from memory). Near-infrared limits
 * depend on the wavelength and are of the same order; 5 mW is the usual rule of thumb.
 */
export const CLASS_3B_POWER = 5e-3;

/**
 * Temperatures at or below liquid helium's boiling point at one atmosphere (4.22 K, rounded to
 * 4.2 K; from memory) need a liquid-helium cryostat, a closed-cycle cryocooler or a dilution
 * refrigerator.
 */
export const CRYOGENIC_TEMPERATURE = 4.2;

/**
 * Static field from which a caution is shown: 0.5 mT (5 G), the usual limit for people with
 * pacemakers and other implanted devices (common practice, no source).
 */
export const STATIC_FIELD = 5e-4;

/** Electron g-factor magnitude, CODATA 2018. */
const ELECTRON_G = 2.00231930436256;

/**
 * The free electron's gyromagnetic ratio γ_e/2π = g_e μ_B/h ≈ 28.025 GHz/T (CODATA 2018:
 * 28 024.951 4242 MHz/T). Atomic spins of electronic origin have at most about this ratio
 * (alkali ground states half of it or less), so f_L divided by it is the least field a Larmor
 * frequency can imply for them.
 */
export const ELECTRON_GYROMAGNETIC_RATIO = (ELECTRON_G * BOHR_MAGNETON) / PLANCK_H;
