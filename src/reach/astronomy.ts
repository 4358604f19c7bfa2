/**
 * Astronomical length units, in metres. Both are exact by definition: the astronomical unit
 * is fixed at 149 597 870 700 m (IAU 2012 Resolution B2) and the parsec at 648 000/π au
 * (IAU 2015 Resolution B2).
 */

/** Astronomical unit au, in m (exact). */
export const ASTRONOMICAL_UNIT = 149597870700;

/** Parsec, 648000/π au ≈ 3.0857e16 m. */
export const PARSEC = (648000 / Math.PI) * ASTRONOMICAL_UNIT;

/** Megaparsec, 1e6 pc. */
export const MEGAPARSEC = 1e6 * PARSEC;
