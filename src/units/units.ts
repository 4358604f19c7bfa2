import { QUANTITY_KINDS, type QuantityKind } from "./kinds";

/**
 * How a unit maps to SI: SI value = number × 10^pow10 × factor.
 * Decimal scales go into `pow10` so they can be applied exactly to the decimal text
 * (see `decimal.ts`); only non-decimal scales (π/180, 60, 1/2π) use `factor`.
 */
export interface UnitScale {
  readonly pow10: number;
  readonly factor: number;
}

/**
 * SI prefixes from exa down to yocto. Hecto, deca, deci and centi are left out on
 * purpose (except "cm", added to lengths by name): "da", "h" and "d" collide with other symbols (h is the hour) and nobody
 * writes hHz. Both micro signs are accepted: U+00B5 (keyboard "µ") and U+03BC (Greek mu),
 * plus ASCII "u". Case matters: "m" is milli, "M" is mega.
 */
export const SI_PREFIXES: ReadonlyArray<readonly [symbol: string, pow10: number]> = [
  ["E", 18],
  ["P", 15],
  ["T", 12],
  ["G", 9],
  ["M", 6],
  ["k", 3],
  ["", 0],
  ["m", -3],
  ["u", -6],
  ["\u00b5", -6],
  ["\u03bc", -6],
  ["n", -9],
  ["p", -12],
  ["f", -15],
  ["a", -18],
  ["z", -21],
  ["y", -24],
];

/** Prefix symbol used when formatting, by power of ten. Micro is printed as U+00B5. */
export const FORMAT_PREFIX: ReadonlyMap<number, string> = new Map(SI_PREFIXES.filter(([s]) => s !== "u" && s !== "\u03bc").map(([s, p]) => [p, s] as const));

const TWO_PI = 2 * Math.PI;
const DEG = Math.PI / 180;

type UnitTable = Map<string, UnitScale>;

function add(table: UnitTable, symbol: string, scale: UnitScale): void {
  // A duplicate would mean one spelling silently means two things.
  if (table.has(symbol)) throw new Error(`unit table: duplicate symbol "${symbol}"`);
  table.set(symbol, scale);
}

/** `base` with every SI prefix (or those with pow10 ≤ maxPrefix). */
function addPrefixed(table: UnitTable, base: string, pow10: number, factor = 1, maxPrefix = Infinity): void {
  for (const [p, e] of SI_PREFIXES) if (e <= maxPrefix) add(table, p + base, { pow10: pow10 + e, factor });
}

function build(fill: (t: UnitTable) => void): UnitTable {
  const t: UnitTable = new Map();
  fill(t);
  return t;
}

/** Units of each kind that are single tokens (gyromagnetic ratios are compound, see below). */
const SIMPLE_UNITS: Readonly<Record<QuantityKind, UnitTable>> = {
  // Prefixes attach to the gram, so "kg" is kilo+gram and "ag"…"yg" reach single molecules.
  mass: build((t) => addPrefixed(t, "g", -3)),
  frequency: build((t) => {
    addPrefixed(t, "Hz", 0);
    // Angular frequency: the prefix goes on rad ("Mrad/s"), the result is cyclic Hz.
    addPrefixed(t, "rad/s", 0, 1 / TWO_PI);
  }),
  temperature: build((t) => addPrefixed(t, "K", 0)),
  length: build((t) => {
    addPrefixed(t, "m", 0);
    // The centimetre is the one centi- unit in daily use here (cavity lengths).
    add(t, "cm", { pow10: -2, factor: 1 });
  }),
  power: build((t) => addPrefixed(t, "W", 0)),
  time: build((t) => {
    addPrefixed(t, "s", 0);
    add(t, "min", { pow10: 0, factor: 60 });
    add(t, "h", { pow10: 0, factor: 3600 });
  }),
  angle: build((t) => {
    // Only sub-multiples of the radian: "Grad" would read as gradians to many people.
    addPrefixed(t, "rad", 0, 1, 0);
    add(t, "deg", { pow10: 0, factor: DEG });
    add(t, "\u00b0", { pow10: 0, factor: DEG });
  }),
  fraction: build((t) => add(t, "%", { pow10: -2, factor: 1 })),
  decibel: build((t) => add(t, "dB", { pow10: 0, factor: 1 })),
  magneticField: build((t) => {
    addPrefixed(t, "T", 0);
    // Gauss: 1 G = 1e-4 T. "Gs" is deliberately absent: with SI prefixes it is the gigasecond.
    addPrefixed(t, "G", -4);
    add(t, "gauss", { pow10: -4, factor: 1 });
  }),
  gyromagneticRatio: new Map(),
  count: new Map(),
  number: new Map(),
};

const HZ_ONLY: UnitTable = build((t) => addPrefixed(t, "Hz", 0));
const RAD_ONLY: UnitTable = build((t) => addPrefixed(t, "rad", 0));

/** All single-token symbols of a kind (for tests and "did you mean" hints). */
export function unitSymbols(kind: QuantityKind): string[] {
  return [...SIMPLE_UNITS[kind].keys()];
}

/**
 * Scale of a gyromagnetic-ratio unit: "<prefix>Hz/<field>", "<prefix>rad/s/<field>" or
 * "<prefix>rad/(s <field>)" where <field> is any magnetic-field unit.
 */
function gyromagneticScale(unit: string): UnitScale | undefined {
  const slash = unit.indexOf("/");
  if (slash < 0) return undefined;
  const num = unit.slice(0, slash);
  const rest = unit.slice(slash + 1);
  const fields = SIMPLE_UNITS.magneticField;
  const hz = HZ_ONLY.get(num);
  if (hz) {
    const b = fields.get(rest);
    return b ? { pow10: hz.pow10 - b.pow10, factor: hz.factor / b.factor } : undefined;
  }
  const rad = RAD_ONLY.get(num);
  if (!rad) return undefined;
  const m = /^s\/(.+)$/.exec(rest) ?? /^\(s[ \u00b7\u22c5*](.+)\)$/.exec(rest);
  const b = m ? fields.get(m[1]) : undefined;
  return b ? { pow10: rad.pow10 - b.pow10, factor: 1 / (TWO_PI * b.factor) } : undefined;
}

/** Scale of `unit` (already whitespace-normalised) for `kind`, or undefined if not a unit of that kind. */
export function unitScale(kind: QuantityKind, unit: string): UnitScale | undefined {
  if (kind === "gyromagneticRatio") return gyromagneticScale(unit);
  return SIMPLE_UNITS[kind].get(unit);
}

/** The kind a unit belongs to, if any (used to say "that is a frequency, not a mass"). */
export function kindOfUnit(unit: string): QuantityKind | undefined {
  return QUANTITY_KINDS.find((k) => unitScale(k, unit) !== undefined);
}

const PREFIX_ALT = SI_PREFIXES.map(([p]) => p)
  .filter((p) => p !== "")
  .join("|");

/**
 * "1/s", "/s", "s^-1", "s-1", "s⁻¹" (optionally prefixed: "1/ms"). These are rejected for
 * frequencies because they do not say whether cycles or radians are meant, a factor 2π.
 */
const PER_SECOND = new RegExp(`^(?:1?/(?:${PREFIX_ALT})?s|(?:${PREFIX_ALT})?s(?:\\^-1|\\^\\(-1\\)|-1|\\u207b\\u00b9|\\*\\*-1))$`);
/** The same ambiguity at the start of a gyromagnetic ratio: "1/(s T)", "/s/T", "s^-1/T", "s^-1 T^-1". */
const PER_SECOND_START = new RegExp(`^(?:1?/\\(?(?:${PREFIX_ALT})?s|(?:${PREFIX_ALT})?s(?:\\^-1|\\^\\(-1\\)|-1|\\u207b\\u00b9|\\*\\*-1))`);

export function isAmbiguousPerSecond(unit: string, kind: QuantityKind): boolean {
  const compact = unit.replace(/\s+/g, "");
  if (kind === "gyromagneticRatio") return PER_SECOND_START.test(compact);
  return PER_SECOND.test(compact);
}

/** Celsius and Fahrenheit spellings: named so the message can ask for kelvin instead. */
const RELATIVE_TEMPERATURE = new Set(["\u00b0C", "degC", "\u2103", "\u00b0F", "degF", "\u2109", "celsius", "Celsius"]);

export function isRelativeTemperatureUnit(unit: string): boolean {
  return RELATIVE_TEMPERATURE.has(unit);
}

/** Units of `kind` that equal `unit` ignoring case, for a "units are case-sensitive" hint. */
export function caseInsensitiveMatches(kind: QuantityKind, unit: string): string[] {
  const lower = unit.toLowerCase();
  return unitSymbols(kind).filter((s) => s.toLowerCase() === lower && s !== unit);
}

export function crossKindCollisions(): string[] {
  // Used by tests: a symbol accepted by two kinds would make "wrong kind" messages lie.
  const seen = new Map<string, QuantityKind>();
  const clashes: string[] = [];
  for (const k of QUANTITY_KINDS) {
    for (const s of unitSymbols(k)) {
      const prev = seen.get(s);
      if (prev !== undefined) clashes.push(`${s}: ${prev} and ${k}`);
      else seen.set(s, k);
    }
  }
  return clashes;
}
