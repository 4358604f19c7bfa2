import { QuietframeError } from "../errors";
import { compactText, plainText, scientificText, toDecimalDigits } from "./decimal";
import { isQuantityKind, QUANTITY_KIND_INFO, QUANTITY_KINDS, type QuantityKind } from "./kinds";
import { FORMAT_PREFIX } from "./units";

/** Prefixed display: `base` takes SI prefixes from 10^minPrefix to 10^maxPrefix. */
interface PrefixedStyle {
  /** Symbol the prefix attaches to ("g" for mass; "Hz/T" gets its prefix on Hz). */
  readonly base: string;
  /** SI value of one `base` is 10^basePow10 (the gram is 10^-3 kg). */
  readonly basePow10: number;
  readonly minPrefix: number;
  readonly maxPrefix: number;
}

const PREFIXED: Partial<Record<QuantityKind, PrefixedStyle>> = {
  // Up to kg only: "1000 kg" reads better than "1 Mg".
  mass: { base: "g", basePow10: -3, minPrefix: -24, maxPrefix: 3 },
  frequency: { base: "Hz", basePow10: 0, minPrefix: -24, maxPrefix: 18 },
  // No kK or ks: "1500 K" and "3600 s" are what people write.
  temperature: { base: "K", basePow10: 0, minPrefix: -24, maxPrefix: 0 },
  length: { base: "m", basePow10: 0, minPrefix: -24, maxPrefix: 18 },
  power: { base: "W", basePow10: 0, minPrefix: -24, maxPrefix: 18 },
  time: { base: "s", basePow10: 0, minPrefix: -24, maxPrefix: 0 },
  magneticField: { base: "T", basePow10: 0, minPrefix: -24, maxPrefix: 18 },
  gyromagneticRatio: { base: "Hz/T", basePow10: 0, minPrefix: -24, maxPrefix: 18 },
};

// Above the largest prefix, plain digits are used while the number stays below 10^6 ("3600 s").
const PLAIN_ABOVE_MAX = 6;

/**
 * Human-readable text for an SI value of the given kind, rounded to `digits` significant
 * digits (1…17) with trailing zeros dropped. The text parses back with `parseQuantity`.
 *
 * - mass, frequency, temperature, length, power, time, magnetic field, gyromagnetic ratio:
 *   engineering SI prefix so the number is in [1, 1000): "1.3 MHz", "2.5 ng", "1.064 µm",
 *   "50 µT", "28 GHz/T". Micro is printed as "µ" (U+00B5). Mass stops at kg and
 *   temperature/time at the base unit ("1000 kg", "1500 K", "3600 s"). Values outside the
 *   prefix range use exponent notation in the SI unit ("1.988e+30 kg").
 * - angle: degrees with the degree sign and no space (SI style): "90°".
 * - fraction: percent: "95 %".
 * - decibel: "-10 dB". count, number: the bare number ("1e+12", "0.5").
 *
 * Non-finite values are shown as "NaN Hz", "Infinity kg" etc. rather than throwing, so a
 * display of a broken computation still renders (they do not parse back).
 */
export function formatQuantity(si: number, kind: QuantityKind, digits = 4): string {
  const q = quantityParts(si, kind, digits);
  if (q.unit === "°") return `${q.sign}${q.number}°`;
  return q.unit === "" ? `${q.sign}${q.number}` : `${q.sign}${q.number} ${q.unit}`;
}

/**
 * The pieces of `formatQuantity`'s text, so that other notations (typeset LaTeX with siunitx,
 * a methods text's "2 × 10⁷") say exactly the same value in exactly the same unit.
 */
export interface QuantityParts {
  /** "-" for a negative value, "" otherwise. */
  readonly sign: "" | "-";
  /** The magnitude as formatQuantity writes it: plain digits ("1.467") or exponent notation ("1.988e+30"), or "NaN"/"Infinity". */
  readonly number: string;
  /** The unit as written ("MHz", "kg", "°", "rad", "%", "dB", or "" for a bare number). */
  readonly unit: string;
  /** For a prefixed unit: the power of ten of its prefix and the symbol it attaches to ("MHz": 6 and "Hz"). */
  readonly prefixed?: { readonly pow10: number; readonly base: string };
}

/** The parts of the text `formatQuantity(si, kind, digits)` returns (same checks, same rounding). */
export function quantityParts(si: number, kind: QuantityKind, digits = 4): QuantityParts {
  if (!isQuantityKind(kind)) {
    throw new QuietframeError({
      path: "kind",
      value: kind,
      problem: "internal error: unknown quantity kind",
      allowed: QUANTITY_KINDS.join(", "),
    });
  }
  if (!Number.isInteger(digits) || digits < 1 || digits > 17) {
    throw new QuietframeError({ path: "digits", value: digits, problem: "significant digits must be an integer", allowed: "1 to 17" });
  }
  const siUnit = QUANTITY_KIND_INFO[kind].siUnit;
  if (!Number.isFinite(si)) {
    const sign = si < 0 ? "-" : "";
    return { sign, number: String(Math.abs(si)), unit: kind === "angle" ? "°" : siUnit };
  }
  if (si === 0) {
    if (kind === "angle") return { sign: "", number: "0", unit: "°" };
    if (kind === "fraction") return { sign: "", number: "0", unit: "%" };
    return { sign: "", number: "0", unit: siUnit };
  }

  const d = toDecimalDigits(si, digits);
  const sign = d.negative ? "-" : "";
  const style = PREFIXED[kind];
  if (style) {
    const e = d.exp - style.basePow10; // power of ten of the first digit, in base units
    const p = 3 * Math.floor(e / 3);
    if (p >= style.minPrefix && p <= style.maxPrefix) {
      return { sign, number: plainText(d.digits, e - p), unit: `${FORMAT_PREFIX.get(p)}${style.base}`, prefixed: { pow10: p, base: style.base } };
    }
    if (p > style.maxPrefix && e - style.maxPrefix < PLAIN_ABOVE_MAX) {
      const top = style.maxPrefix;
      return { sign, number: plainText(d.digits, e - top), unit: `${FORMAT_PREFIX.get(top)}${style.base}`, prefixed: { pow10: top, base: style.base } };
    }
    return { sign, number: scientificText(d.digits, d.exp), unit: siUnit };
  }
  switch (kind) {
    case "angle": {
      const degrees = si * (180 / Math.PI);
      // Beyond ~3e306 rad the degree value overflows; radians still say it faithfully.
      if (!Number.isFinite(degrees)) return { sign, number: scientificText(d.digits, d.exp), unit: "rad" };
      const deg = toDecimalDigits(degrees, digits);
      return { sign, number: compactText(deg.digits, deg.exp), unit: "°" };
    }
    case "fraction":
      // Shifting the decimal exponent (not multiplying by 100) keeps the round trip exact.
      return { sign, number: compactText(d.digits, d.exp + 2), unit: "%" };
    case "decibel":
      return { sign, number: compactText(d.digits, d.exp), unit: "dB" };
    default:
      return { sign, number: compactText(d.digits, d.exp), unit: "" };
  }
}
