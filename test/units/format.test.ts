import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { SOLAR_MASS } from "../../src/constants";
import { formatQuantity, parseQuantity, type QuantityKind } from "../../src/units";
import { expectProblem, relErr } from "./helpers";

describe("formatQuantity examples", () => {
  const cases: Array<[number, QuantityKind, string, number?]> = [
    [1.3e6, "frequency", "1.3 MHz"],
    [-1.3e6, "frequency", "-1.3 MHz"],
    [999.96, "frequency", "1 kHz"], // rounding to 4 digits moves it to the next prefix
    [999.96, "frequency", "999.96 Hz", 6],
    [40, "mass", "40 kg"],
    [2.5e-12, "mass", "2.5 ng"],
    [1e-21, "mass", "1 ag"],
    [1000, "mass", "1000 kg"],
    [123456, "mass", "123456 kg", 6],
    [SOLAR_MASS, "mass", "1.988e+30 kg"],
    [0, "mass", "0 kg"],
    [6, "temperature", "6 K"],
    [0.02, "temperature", "20 mK"],
    [1500, "temperature", "1500 K"],
    [1.064e-6, "length", "1.064 µm"],
    [4000, "length", "4 km"],
    [1e-30, "length", "1e-30 m"],
    [2, "power", "2 W"],
    [0.125, "power", "125 mW"],
    [1.2e-3, "time", "1.2 ms"],
    [3600, "time", "3600 s"],
    [3.156e7, "time", "3.156e+7 s"],
    [Math.PI / 2, "angle", "90°"],
    [-Math.PI, "angle", "-180°"],
    [1e-3, "angle", "0.0573°"],
    [0, "angle", "0°"],
    [0.95, "fraction", "95 %"],
    [1, "fraction", "100 %"],
    [1e-6, "fraction", "0.0001 %"],
    [1e-9, "fraction", "1e-7 %"],
    [0, "fraction", "0 %"],
    [-10, "decibel", "-10 dB"],
    [3.0103, "decibel", "3.01 dB", 3],
    [5e-5, "magneticField", "50 µT"],
    [1.2, "magneticField", "1.2 T"],
    [2.8e10, "gyromagneticRatio", "28 GHz/T"],
    [1e12, "count", "1e+12"],
    [40, "count", "40"],
    [0.5, "number", "0.5"],
    [-1.23456789, "number", "-1.235"],
    [Number.NaN, "frequency", "NaN Hz"],
    [Number.POSITIVE_INFINITY, "mass", "Infinity kg"],
  ];
  for (const [si, kind, text, digits] of cases) {
    it(`${si} ${kind}${digits ? ` (${digits} digits)` : ""} → ${text}`, () => {
      expect(formatQuantity(si, kind, digits)).toBe(text);
    });
  }

  it("every finite example parses back to the value it shows (within its rounding)", () => {
    for (const [si, kind, , digits] of cases) {
      if (!Number.isFinite(si)) continue;
      const back = parseQuantity(formatQuantity(si, kind, digits), kind, "p");
      // Shown with `digits` (default 4) significant digits: half a unit in the last place.
      const tol = 0.5 * 10 ** (1 - (digits ?? 4));
      expect(si === 0 ? back : relErr(back, si)).toBeLessThanOrEqual(tol);
    }
  });

  it("rejects digits outside 1…17 or non-integers", () => {
    for (const d of [0, 18, 2.5, Number.NaN]) {
      expectProblem(() => formatQuantity(1, "mass", d), "digits", /integer/);
    }
  });
});

describe("round trip: parseQuantity(formatQuantity(x, kind, 17), kind) (fast-check, seed 7)", () => {
  const anyFinite = fc.double({ noNaN: true, noDefaultInfinity: true });
  // Kinds scaled by powers of ten round-trip exactly: scaling is done on the decimal text.
  const exactKinds: QuantityKind[] = ["mass", "frequency", "temperature", "length", "power", "time", "magneticField", "gyromagneticRatio", "decibel", "number"];
  const same = (a: number, b: number) => a === b; // treats -0 and 0 as equal

  for (const kind of exactKinds) {
    it(`${kind}: exact for every finite double`, () => {
      fc.assert(
        fc.property(anyFinite, (x) => same(parseQuantity(formatQuantity(x, kind, 17), kind, "p"), x)),
        { seed: 7, numRuns: 10000 },
      );
    });
  }

  it("fraction: exact for every double in [0, 1]", () => {
    fc.assert(
      fc.property(fc.double({ min: 0, max: 1, noNaN: true }), (x) => same(parseQuantity(formatQuantity(x, "fraction", 17), "fraction", "p"), x)),
      { seed: 7, numRuns: 10000 },
    );
  });

  it("count: exact for every positive double", () => {
    fc.assert(
      fc.property(fc.double({ min: Number.MIN_VALUE, noNaN: true, noDefaultInfinity: true }), (x) => same(parseQuantity(formatQuantity(x, "count", 17), "count", "p"), x)),
      { seed: 7, numRuns: 10000 },
    );
  });

  it("angle: within 1e-15 relative for 1e-300 ≤ |x| ≤ 1e300 rad (degrees ↔ radians costs a few roundings)", () => {
    const magnitude = fc.double({ min: 1e-300, max: 1e300, noNaN: true });
    fc.assert(
      fc.property(magnitude, fc.boolean(), (m, neg) => {
        const x = neg ? -m : m;
        return relErr(parseQuantity(formatQuantity(x, "angle", 17), "angle", "p"), x) <= 1e-15;
      }),
      { seed: 7, numRuns: 10000 },
    );
  });

  it("angle: values whose degrees overflow are shown in rad and still round-trip", () => {
    expect(formatQuantity(1e307, "angle")).toBe("1e+307 rad");
    expect(parseQuantity(formatQuantity(1.7976931348623157e308, "angle", 17), "angle", "p")).toBe(1.7976931348623157e308);
  });
});
