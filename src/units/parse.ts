import { QuietframeError } from "../errors";
import { hasNonZeroDigit, NUMBER_PREFIX, scaleDecimal } from "./decimal";
import { isQuantityKind, QUANTITY_KIND_INFO, QUANTITY_KINDS, type QuantityKind } from "./kinds";
import { caseInsensitiveMatches, isAmbiguousPerSecond, isRelativeTemperatureUnit, kindOfUnit, unitScale, type UnitScale } from "./units";

// Any run of whitespace (or none) is allowed between number and unit; inside a unit it
// collapses to one space, which matters only in "rad/(s T)".
const SPACES = /\s+/g;

/**
 * Parse a user-written quantity of the given kind into its SI value
 * (frequency → cyclic Hz, angle → rad, decibel → the dB number, fraction → 0…1,
 * gyromagnetic ratio → Hz/T). Throws `QuietframeError` naming `path` on any problem.
 *
 * Strings are "<number> <unit>" with a JS-style decimal number ("1.3e6", "-10", ".5"),
 * any whitespace (or none) before the unit, and a case-sensitive unit. Dimensioned
 * kinds require a unit; `fraction`, `count` and `number` also take bare JSON numbers or
 * numeric strings. `fraction` must lie in [0, 1] and `count` must be > 0; other kinds
 * accept any sign (range checks belong to the field).
 */
export function parseQuantity(value: unknown, kind: QuantityKind, path: string): number {
  if (!isQuantityKind(kind)) {
    throw new QuietframeError({
      path,
      value,
      problem: `internal error: unknown quantity kind ${JSON.stringify(String(kind))}`,
      allowed: QUANTITY_KINDS.join(", "),
    });
  }
  const info = QUANTITY_KIND_INFO[kind];
  const fail: (problem: string, allowed?: string) => never = (problem, allowed = info.allowed) => {
    throw new QuietframeError({ path, value, problem, allowed });
  };

  if (typeof value === "number") {
    if (!Number.isFinite(value)) fail(`${String(value)} is not a finite number`);
    if (info.needsUnit) fail(...missingUnit(kind, String(value)));
    return checkRange(kind, value, fail);
  }
  if (typeof value !== "string") {
    const what = describeType(value);
    fail(value === undefined ? `no value given for ${info.phrase}` : `expected ${info.phrase}, got ${what}`);
  }

  const text = value.trim();
  if (text === "") fail(`empty string is not ${info.phrase}`);
  const num = NUMBER_PREFIX.exec(text);
  if (!num) {
    if (/^[+-]?(?:nan|inf(?:inity)?)/i.test(text)) fail("NaN and infinity are not allowed");
    fail("does not start with a number");
  }
  const literal = num[0];
  if (/^[+-]?0[xXbBoO]/.test(text)) fail("hexadecimal, binary and octal numbers are not accepted; write a decimal number");

  const unit = text
    .slice(literal.length)
    .replace(SPACES, " ")
    .trim()
    .replace(/ ?\/ ?/g, "/");
  let scale: UnitScale = { pow10: 0, factor: 1 };
  if (unit === "") {
    if (info.needsUnit) fail(...missingUnit(kind, literal));
  } else {
    const found = unitScale(kind, unit);
    if (!found) fail(unitProblem(kind, unit));
    scale = found;
  }

  let si = scaleDecimal(literal, scale.pow10);
  if (scale.factor !== 1) si *= scale.factor;
  if (!Number.isFinite(si)) fail("is too large to represent as a double-precision number");
  if (si === 0 && hasNonZeroDigit(literal)) fail("is too small to represent as a double-precision number (it underflows to 0)");
  return checkRange(kind, si, fail);
}

function missingUnit(kind: QuantityKind, numberText: string): [string, string] {
  const info = QUANTITY_KIND_INFO[kind];
  return [`${info.phrase} needs a unit; did you mean "${numberText} ${info.suggestUnit}"?`, info.allowed];
}

function describeType(value: unknown): string {
  if (value === null) return "null";
  if (Array.isArray(value)) return "an array";
  const t = typeof value;
  return t === "object" ? "an object" : `a ${t}`;
}

function unitProblem(kind: QuantityKind, unit: string): string {
  const info = QUANTITY_KIND_INFO[kind];
  const shown = JSON.stringify(unit);
  if ((kind === "frequency" || kind === "gyromagneticRatio") && isAmbiguousPerSecond(unit, kind)) {
    return kind === "frequency"
      ? `unit ${shown} is ambiguous: it could mean cycles or radians per second (a factor 2π); write "Hz" for a cyclic frequency or "rad/s" for an angular one`
      : `unit ${shown} is ambiguous: it could mean cycles or radians per second (a factor 2π); write e.g. "Hz/T" for cyclic or "rad/s/T" for angular`;
  }
  if (kind === "temperature" && isRelativeTemperatureUnit(unit)) {
    return `unit ${shown} is a relative temperature scale; give an absolute temperature in kelvin (0 °C = 273.15 K)`;
  }
  if (kind === "magneticField" && unit === "Gs") {
    return `unit "Gs" would be gigaseconds; write "G" or "gauss" for gauss`;
  }
  const other = kindOfUnit(unit);
  if (other !== undefined) return `unit ${shown} is ${QUANTITY_KIND_INFO[other].phrase}, but this field is ${info.phrase}`;
  if (kind === "count" || kind === "number") return `${info.phrase} takes no unit, but ${shown} was given`;
  const hints = caseInsensitiveMatches(kind, unit);
  if (hints.length > 0) {
    return `unknown unit ${shown} (units are case-sensitive; did you mean ${hints.map((h) => `"${h}"`).join(" or ")}?)`;
  }
  return `unknown unit ${shown} for ${info.phrase}`;
}

function checkRange(kind: QuantityKind, x: number, fail: (problem: string, allowed?: string) => never): number {
  if (kind === "fraction" && !(x >= 0 && x <= 1)) fail("a fraction must be between 0 and 1 (0 % to 100 %)");
  if (kind === "count" && !(x > 0)) fail("a count must be positive");
  return x;
}
