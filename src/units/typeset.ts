/**
 * Typeset forms of a formatted quantity for texts a person reads in print: Unicode with a true
 * minus sign and "× 10ⁿ" for Markdown and pages, and siunitx macros for LaTeX. Both start from
 * `quantityParts`, so they state the same rounded value in the same unit as `formatQuantity`
 * (the CLI's and the controls' text).
 */
import { quantityParts, type QuantityParts } from "./format";
import type { QuantityKind } from "./kinds";

const SUPERSCRIPT: Readonly<Record<string, string>> = {
  "-": "⁻",
  "0": "⁰",
  "1": "¹",
  "2": "²",
  "3": "³",
  "4": "⁴",
  "5": "⁵",
  "6": "⁶",
  "7": "⁷",
  "8": "⁸",
  "9": "⁹",
};

/** siunitx prefix macros by power of ten (siunitx 3 manual, "Prefixes"). */
const SIUNITX_PREFIX: ReadonlyMap<number, string> = new Map([
  [18, "\\exa"],
  [15, "\\peta"],
  [12, "\\tera"],
  [9, "\\giga"],
  [6, "\\mega"],
  [3, "\\kilo"],
  [0, ""],
  [-3, "\\milli"],
  [-6, "\\micro"],
  [-9, "\\nano"],
  [-12, "\\pico"],
  [-15, "\\femto"],
  [-18, "\\atto"],
  [-21, "\\zepto"],
  [-24, "\\yocto"],
]);

/** siunitx unit macros for the base symbols quietframe writes (siunitx 3 manual, "Units"). */
const SIUNITX_UNIT: Readonly<Record<string, string>> = {
  g: "\\gram",
  kg: "\\kilo\\gram",
  Hz: "\\hertz",
  K: "\\kelvin",
  m: "\\metre",
  W: "\\watt",
  s: "\\second",
  T: "\\tesla",
  "Hz/T": "\\hertz\\per\\tesla",
  rad: "\\radian",
  "%": "\\percent",
  dB: "\\decibel",
};

/** "1.988e+30" → "1.988 × 10³⁰"; plain digits stay as they are. */
function unicodeNumber(number: string): string {
  const m = /^([0-9.]+)e([+-])(\d+)$/.exec(number);
  if (!m) return number;
  const exponent = `${m[2] === "-" ? "-" : ""}${m[3]}`.replace(/[-0-9]/g, (c) => SUPERSCRIPT[c]);
  return m[1] === "1" ? `10${exponent}` : `${m[1]} × 10${exponent}`;
}

/** "1.988e+30" → "1.988e30" (siunitx reads e as the exponent marker and typesets × 10^30 itself). */
function siunitxNumber(sign: string, number: string): string {
  return `${sign}${number.replace(/e\+?/, "e")}`;
}

/** Unicode text of a quantity: true minus sign, "× 10ⁿ" instead of "e+n" ("−10 dB", "2 × 10⁷", "1.467 MHz", "90°"). */
export function unicodeQuantity(si: number, kind: QuantityKind, digits = 4): string {
  return unicodeParts(quantityParts(si, kind, digits));
}

export function unicodeParts(q: QuantityParts): string {
  const number = `${q.sign === "-" ? "−" : ""}${unicodeNumber(q.number)}`;
  if (q.unit === "") return number;
  return q.unit === "°" ? `${number}°` : `${number} ${q.unit}`;
}

/**
 * LaTeX for a quantity with siunitx 3: \qty{1.467}{\mega\hertz}, \num{2e7}, \ang{90},
 * \qty{-10}{\decibel}. siunitx prints the true minus sign and the × 10ⁿ form.
 */
export function siunitxQuantity(si: number, kind: QuantityKind, digits = 4): string {
  const q = quantityParts(si, kind, digits);
  if (!/^[0-9.e+-]+$/.test(q.number)) throw new Error(`internal: ${q.number} cannot be typeset as a number`);
  const number = siunitxNumber(q.sign, q.number);
  if (q.unit === "") return `\\num{${number}}`;
  if (q.unit === "°") return `\\ang{${number}}`;
  const unit = q.prefixed ? `${SIUNITX_PREFIX.get(q.prefixed.pow10)}${SIUNITX_UNIT[q.prefixed.base]}` : SIUNITX_UNIT[q.unit];
  if (unit === undefined) throw new Error(`internal: no siunitx unit for "${q.unit}"`);
  return `\\qty{${number}}{${unit}}`;
}
