/**
 * The kinds of quantity a user-facing field can hold. A field declares its kind once;
 * `parseQuantity` then turns whatever the user wrote into a plain SI number.
 */
export const QUANTITY_KINDS = ["mass", "frequency", "temperature", "length", "power", "time", "angle", "fraction", "decibel", "magneticField", "gyromagneticRatio", "count", "number"] as const;

export type QuantityKind = (typeof QUANTITY_KINDS)[number];

export function isQuantityKind(x: unknown): x is QuantityKind {
  return typeof x === "string" && (QUANTITY_KINDS as readonly string[]).includes(x);
}

export interface QuantityKindInfo {
  /** Noun phrase with article, used in messages: "a mass", "an angle". */
  readonly phrase: string;
  /** Unit of the number `parseQuantity` returns ("" for dimensionless kinds). */
  readonly siUnit: string;
  /** Whether a string value must carry a unit (a bare number is rejected). */
  readonly needsUnit: boolean;
  /** Unit appended to a bare number when suggesting a fix ("40" → "40 kg"). */
  readonly suggestUnit: string;
  /** Text for the `allowed` part of error messages. */
  readonly allowed: string;
}

export const QUANTITY_KIND_INFO: Readonly<Record<QuantityKind, QuantityKindInfo>> = {
  mass: {
    phrase: "a mass",
    siUnit: "kg",
    needsUnit: true,
    suggestUnit: "kg",
    allowed: 'a mass such as "40 kg" or "2.5 ng" (gram with an SI prefix)',
  },
  frequency: {
    phrase: "a frequency",
    siUnit: "Hz",
    needsUnit: true,
    suggestUnit: "Hz",
    allowed: 'a frequency such as "1.3 MHz" (cyclic) or "8.2e6 rad/s" (angular)',
  },
  temperature: {
    phrase: "a temperature",
    siUnit: "K",
    needsUnit: true,
    suggestUnit: "K",
    allowed: 'an absolute temperature in kelvin such as "6 K" or "20 mK"',
  },
  length: {
    phrase: "a length",
    siUnit: "m",
    needsUnit: true,
    suggestUnit: "m",
    allowed: 'a length such as "1064 nm" or "4 km"',
  },
  power: {
    phrase: "a power",
    siUnit: "W",
    needsUnit: true,
    suggestUnit: "W",
    allowed: 'a power such as "2 W" or "125 mW"',
  },
  time: {
    phrase: "a time",
    siUnit: "s",
    needsUnit: true,
    suggestUnit: "s",
    allowed: 'a time such as "1.2 ms", "30 min" or "2 h"',
  },
  angle: {
    phrase: "an angle",
    siUnit: "rad",
    needsUnit: true,
    suggestUnit: "deg",
    allowed: 'an angle such as "90 deg", "90°", "1.57 rad" or "1.5 mrad"',
  },
  fraction: {
    phrase: "a fraction",
    siUnit: "",
    needsUnit: false,
    suggestUnit: "",
    allowed: 'a number from 0 to 1 such as 0.95 or "0.95", or a percentage such as "95 %"',
  },
  decibel: {
    phrase: "a level in decibels",
    siUnit: "dB",
    needsUnit: true,
    suggestUnit: "dB",
    allowed: 'a level in decibels such as "-10 dB"',
  },
  magneticField: {
    phrase: "a magnetic field",
    siUnit: "T",
    needsUnit: true,
    suggestUnit: "T",
    allowed: 'a magnetic field such as "50 uT", "50 µT", "1.2 T" or "0.5 G" (gauss)',
  },
  gyromagneticRatio: {
    phrase: "a gyromagnetic ratio",
    siUnit: "Hz/T",
    needsUnit: true,
    suggestUnit: "Hz/T",
    allowed: 'a frequency per field such as "28 GHz/T", "700 kHz/G", "3.5 Hz/nT" or "1.76e11 rad/s/T"',
  },
  count: {
    phrase: "a count",
    siUnit: "",
    needsUnit: false,
    suggestUnit: "",
    allowed: 'a positive number such as 1e12 or "1e12"',
  },
  number: {
    phrase: "a plain number",
    siUnit: "",
    needsUnit: false,
    suggestUnit: "",
    allowed: 'a real number such as 1.2 or "1.2"',
  },
};
