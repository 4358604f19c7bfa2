/**
 * Units of a tabulated noise spectrum: the frequency column (Hz with an SI prefix) and the
 * amplitude spectral density column (newtons, metres or strain per root hertz), each turned
 * into the factor that brings a number in that unit to SI.
 */
import { SI_PREFIXES } from "../units";

/** Ways of writing "per root hertz" that are accepted after the amplitude's own unit. */
const PER_ROOT_HZ = ["/√Hz", "/sqrt(Hz)", "/rtHz", "/Hz^(1/2)", "/Hz^0.5"];

/** Base amplitude unit of each place a classical noise can enter; "1" (strain) takes no prefix. */
export const AMPLITUDE_BASE_UNITS: Readonly<Record<string, string>> = { force: "N", displacement: "m", strain: "1" };

/** Examples of the ASD unit for a base unit, for messages and docs. */
export function asdUnitExamples(base: string): string {
  return base === "1" ? '"1/√Hz" (also written 1/rtHz or 1/sqrt(Hz))' : `"${base}/√Hz", "p${base}/√Hz" (any SI prefix; /rtHz and /sqrt(Hz) also accepted)`;
}

/** Factor from the written ASD unit to SI (base/√Hz), or undefined when the text is not such a unit. */
export function asdUnitScale(text: string, base: string): number | undefined {
  const compact = text.replace(/\s+/g, "");
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
