import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { parseQuantity, QUANTITY_KINDS, type QuantityKind } from "../../src/units";
import { unitSymbols } from "../../src/units/units";
import { thrown } from "./helpers";

const PATH = "some.field[3]";
const kindArb = fc.constantFrom<QuantityKind>(...QUANTITY_KINDS);

/** A finite number back, or a QuietframeError naming the path; anything else fails the property. */
function finiteOrQuietframeError(value: unknown, kind: QuantityKind): boolean {
  let result: unknown;
  const e = thrown(() => {
    result = parseQuantity(value, kind, PATH);
  });
  if (e === undefined) return typeof result === "number" && Number.isFinite(result);
  return e instanceof QuietframeError && e.path === PATH && e.message.startsWith(PATH);
}

// Strings that look nearly right: number-ish text, odd spacing, real and broken unit symbols.
const knownUnits = [...new Set(QUANTITY_KINDS.flatMap((k) => unitSymbols(k)))];
const unitish = fc.oneof(fc.constantFrom(...knownUnits, "Hz/T", "kHz/G", "rad/s/T", "rad/(s T)", "1/s", "s^-1", "°C", "Gs", "", "%", "dB"), fc.string({ maxLength: 6 }));
const numberish = fc.oneof(fc.double().map(String), fc.integer().map(String), fc.constantFrom("1e400", "-1e-400", ".5", "5.", "+1", "-0", "0x1F", "NaN", "Infinity", "1e", "1.2.3", "", "-"));
const spacing = fc.constantFrom("", " ", "  ", "\t", "\u00a0", "\n");
const quantityish = fc.tuple(spacing, numberish, spacing, unitish, spacing).map((parts) => parts.join(""));

describe("parseQuantity never throws anything but QuietframeError and never returns NaN (fast-check, seed 7)", () => {
  it("arbitrary JSON-like and JS values", () => {
    fc.assert(fc.property(fc.anything(), kindArb, finiteOrQuietframeError), { seed: 7, numRuns: 10000 });
  });
  it("arbitrary Unicode strings", () => {
    fc.assert(fc.property(fc.string({ unit: "binary", maxLength: 40 }), kindArb, finiteOrQuietframeError), {
      seed: 7,
      numRuns: 10000,
    });
  });
  it("number + unit lookalikes", () => {
    fc.assert(fc.property(quantityish, kindArb, finiteOrQuietframeError), { seed: 7, numRuns: 10000 });
  });
  it("all doubles including NaN and ±Infinity", () => {
    fc.assert(fc.property(fc.double(), kindArb, finiteOrQuietframeError), { seed: 7, numRuns: 10000 });
  });
  it("the property itself rejects a non-QuietframeError (guards against a vacuous check)", () => {
    expect(finiteOrQuietframeError("40 kg", "mass")).toBe(true);
    expect(finiteOrQuietframeError("40 Hz", "mass")).toBe(true);
    expect(thrown(() => parseQuantity("40 Hz", "mass", PATH))).toBeInstanceOf(QuietframeError);
  });
});
