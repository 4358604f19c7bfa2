/**
 * Units of a tabulated noise spectrum: the frequency column (Hz with an SI prefix) and the
 * amplitude spectral density column (newtons, metres, strain, relative intensity or hertz of
 * laser frequency per root hertz), each turned into the factor that brings a number in that
 * unit to SI.
 */
import { SI_PREFIXES } from "../units";

/** Ways of writing "per root hertz" that are accepted after the amplitude's own unit. */
const PER_ROOT_HZ = ["/√Hz", "/sqrt(Hz)", "/sqrtHz", "/rtHz", "/Hz^(1/2)", "/Hz^0.5"];

/** Ways of writing a dimensionless ASD as a bare power of hertz (relative intensity noise is often written so). */
const INVERSE_ROOT_HZ = ["Hz^-1/2", "Hz^(-1/2)", "Hz^-0.5", "Hz^(-0.5)"];

/**
 * Base amplitude unit of each place a classical noise can enter; "1" (strain, relative
 * intensity δP/P) takes no prefix. Laser frequency noise is in hertz of optical frequency.
 */
export const AMPLITUDE_BASE_UNITS: Readonly<Record<string, string>> = { force: "N", displacement: "m", strain: "1", "laser intensity": "1", "laser frequency": "Hz" };

/** What the amplitude of each place of entry is, in words for messages. */
const AMPLITUDE_WORDS: Readonly<Record<string, string>> = {
  force: "N",
  displacement: "m",
  strain: "strain",
  "laser intensity": "relative intensity noise (δP/P)",
  "laser frequency": "hertz of laser frequency",
};

/** The amplitude of a place of entry in words ("N", "strain", "relative intensity noise (δP/P)", …). */
export function amplitudeWords(entry: string): string {
  return AMPLITUDE_WORDS[entry] ?? entry;
}

/** Examples of the ASD unit for a base unit, for messages and docs. */
export function asdUnitExamples(base: string): string {
  return base === "1" ? '"1/√Hz" (also written 1/rtHz, 1/sqrtHz, 1/sqrt(Hz) or Hz^-1/2)' : `"${base}/√Hz", "p${base}/√Hz" (any SI prefix; /rtHz, /sqrtHz and /sqrt(Hz) also accepted)`;
}

/** Factor from the written ASD unit to SI (base/√Hz), or undefined when the text is not such a unit. */
export function asdUnitScale(text: string, base: string): number | undefined {
  const compact = text.replace(/\s+/g, "");
  if (base === "1" && INVERSE_ROOT_HZ.some((form) => form.toLowerCase() === compact.toLowerCase())) return 1;
  const suffix = PER_ROOT_HZ.find((s) => compact.toLowerCase().endsWith(s.toLowerCase()));
  if (suffix === undefined) return undefined;
  const amplitude = compact.slice(0, compact.length - suffix.length);
  if (base === "1") return amplitude === "1" || amplitude === "" ? 1 : undefined;
  for (const [prefix, pow10] of SI_PREFIXES) {
    if (amplitude === `${prefix}${base}`) return pow10 === 0 ? 1 : Number(`1e${pow10}`);
  }
  return undefined;
}

/** Factor from the written frequency unit to Hz, or undefined when it is not one. */
export function frequencyUnitScale(text: string): number | undefined {
  const compact = text.trim();
  for (const [prefix, pow10] of SI_PREFIXES) {
    if (compact === `${prefix}Hz`) return pow10 === 0 ? 1 : Number(`1e${pow10}`);
  }
  return undefined;
}
