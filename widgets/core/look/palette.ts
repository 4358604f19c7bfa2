/**
 * The colours of quietframe's charts: one colour family per role a curve plays (what the
 * noise is), taken from a published colour-blind-safe set, plus the neutral inks of axes,
 * grids and the shaded band below the SQL. Every chart takes its colours from here.
 */

/**
 * The Okabe–Ito set (Okabe & Ito, "Color Universal Design", 2008): seven hues chosen to stay
 * apart for protan, deutan and tritan viewers. Yellow (#F0E442) is left out: it vanishes on white.
 */
export const OKABE_ITO = {
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  bluishGreen: "#009E73",
  blue: "#0072B2",
  vermillion: "#D55E00",
  reddishPurple: "#CC79A7",
} as const;

/** What a curve is, which decides its colour family. */
export const CURVE_ROLES = ["total", "sql", "zero-point", "imprecision", "back-action", "quantum-light", "thermal", "loss-vacuum", "classical"] as const;
export type CurveRole = (typeof CURVE_ROLES)[number];

/**
 * Base colour of each role. The total is a deep ink rather than black; the SQL a mid grey (it
 * is also the edge of the shaded band); the zero-point reference a light grey.
 * test/widgets/core/look.test.ts holds every pair apart by CIELAB ΔE, also under simulated
 * colour-vision deficiencies.
 */
export const ROLE_COLOURS: Readonly<Record<CurveRole, string>> = {
  total: "#1F2A44",
  sql: "#5E5E5E",
  "zero-point": "#BDBDBD",
  imprecision: OKABE_ITO.blue,
  "back-action": OKABE_ITO.vermillion,
  "quantum-light": OKABE_ITO.reddishPurple,
  thermal: OKABE_ITO.orange,
  "loss-vacuum": OKABE_ITO.bluishGreen,
  classical: OKABE_ITO.skyBlue,
};

/** Neutral inks of the frame. */
export const INK = {
  text: "#2B2B2B",
  axis: "#8A8A8A",
  grid: "#ECECEC",
  /** Fill of the band below the SQL (the region a sub-SQL measurement reaches into). */
  belowSqlBand: "#E3EEF6",
  /** The 0 dB line and a target line of the ratio panel. */
  reference: "#5E5E5E",
  target: OKABE_ITO.bluishGreen,
  /** The halo under the total line, so it reads over the terms. */
  halo: "#FFFFFF",
} as const;

/**
 * Shades of a family: 0 is the base colour, 1 a tint (mixed 40 % with white), 2 a shade
 * (mixed 30 % with black), 3 a deeper shade (mixed 50 % with black). Terms of one role and
 * one source (e.g. a loss's two quadratures) differ by shade.
 */
export const SHADES = 4;

export function shadeOf(base: string, shade: number): string {
  const k = ((shade % SHADES) + SHADES) % SHADES;
  if (k === 0) return base;
  const [r, g, b] = hexChannels(base);
  const mix = (c: number): number => (k === 1 ? c + (255 - c) * 0.4 : k === 2 ? c * 0.7 : c * 0.5);
  return `#${[r, g, b].map((c) => Math.round(mix(c)).toString(16).padStart(2, "0").toUpperCase()).join("")}`;
}

/** The three 0–255 channels of "#RRGGBB". */
export function hexChannels(hex: string): [number, number, number] {
  if (!/^#[0-9A-Fa-f]{6}$/.test(hex)) throw new Error(`not a #RRGGBB colour: ${hex}`);
  return [1, 3, 5].map((i) => Number.parseInt(hex.slice(i, i + 2), 16)) as [number, number, number];
}
