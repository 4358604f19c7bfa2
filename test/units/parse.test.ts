import { beforeAll, describe, expect, it } from "vitest";
import { parseQuantity, SI_PREFIXES, type QuantityKind } from "../../src/units";
import { expectProblem, relErr } from "./helpers";
import { loadMathjs, type MathJs } from "../helpers/mathjs";

let math: MathJs;
beforeAll(async () => {
  math = await loadMathjs();
});

// mathjs only knows ASCII "u" for micro.
const ascii = (prefix: string) => (prefix === "\u00b5" || prefix === "\u03bc" ? "u" : prefix);
const PREFIXES = SI_PREFIXES.map(([p]) => p);
const SUBMULTIPLE_PREFIXES = SI_PREFIXES.filter(([, e]) => e <= 0).map(([p]) => p);
const NUMBERS = ["1.5", "-3.25e2", "7", ".125e-3"];

/**
 * mathjs multiplies binary floats (e.g. it gives 1 ng = 1.0000000000000002e-12 kg) while we
 * scale the decimal text exactly, so the two may differ by a few ulp; 1e-15 relative is 4.5 ulp.
 */
const REF_TOL = 1e-15;

describe("every prefix of every base unit agrees with mathjs unit().toNumber() (mathjs 15 as reference)", () => {
  const prefixed: Array<[kind: QuantityKind, base: string, si: string, prefixes: string[]]> = [
    ["mass", "g", "kg", PREFIXES],
    ["frequency", "Hz", "Hz", PREFIXES],
    ["temperature", "K", "K", PREFIXES],
    ["length", "m", "m", PREFIXES],
    ["power", "W", "W", PREFIXES],
    ["time", "s", "s", PREFIXES],
    ["magneticField", "T", "T", PREFIXES],
    ["angle", "rad", "rad", SUBMULTIPLE_PREFIXES],
  ];
  for (const [kind, base, si, prefixes] of prefixed) {
    it(`${kind}: ${prefixes.map((p) => p + base).join(", ")}`, () => {
      for (const p of prefixes) {
        for (const n of NUMBERS) {
          const ours = parseQuantity(`${n} ${p}${base}`, kind, "f");
          const ref = math.unit(`${n} ${ascii(p)}${base}`).toNumber(si);
          expect(relErr(ours, ref), `${n} ${p}${base}`).toBeLessThanOrEqual(REF_TOL);
        }
      }
    });
  }

  it("angular frequency <prefix>rad/s → cyclic Hz (mathjs: toNumber('cycle/s'))", () => {
    for (const p of PREFIXES) {
      for (const n of NUMBERS) {
        const ours = parseQuantity(`${n} ${p}rad/s`, "frequency", "f");
        const ref = math.unit(`${n} ${ascii(p)}rad/s`).toNumber("cycle/s");
        expect(relErr(ours, ref), `${n} ${p}rad/s`).toBeLessThanOrEqual(REF_TOL);
      }
    }
  });

  it("length: the centimetre (mathjs cm)", () => {
    for (const n of NUMBERS) {
      expect(relErr(parseQuantity(`${n} cm`, "length", "f"), math.unit(`${n} cm`).toNumber("m"))).toBeLessThanOrEqual(REF_TOL);
    }
  });

  it("time: min and h (mathjs min, h)", () => {
    for (const u of ["min", "h"]) {
      for (const n of NUMBERS) {
        expect(relErr(parseQuantity(`${n} ${u}`, "time", "f"), math.unit(`${n} ${u}`).toNumber("s"))).toBeLessThanOrEqual(REF_TOL);
      }
    }
  });

  it("angle: deg and ° (mathjs deg)", () => {
    for (const u of ["deg", "°"]) {
      for (const n of NUMBERS) {
        expect(relErr(parseQuantity(`${n} ${u}`, "angle", "f"), math.unit(`${n} deg`).toNumber("rad"))).toBeLessThanOrEqual(REF_TOL);
      }
    }
  });

  it("fraction: percentages (mathjs evaluate('95%'))", () => {
    for (const n of ["95", "0.5", "100", "0", "12.345", "1e-3"]) {
      const ref = math.evaluate(`${n}%`) as number;
      expect(relErr(parseQuantity(`${n} %`, "fraction", "f"), ref)).toBeLessThanOrEqual(REF_TOL);
      expect(relErr(parseQuantity(`${n}%`, "fraction", "f"), ref)).toBeLessThanOrEqual(REF_TOL);
    }
  });

  it("gyromagnetic ratio: <prefix>Hz/<prefix>T (mathjs toNumber('Hz/T'))", () => {
    for (const num of PREFIXES) {
      for (const den of PREFIXES) {
        const text = `2.5 ${num}Hz/${den}T`;
        const ref = math.unit(`2.5 ${ascii(num)}Hz/${ascii(den)}T`).toNumber("Hz/T");
        expect(relErr(parseQuantity(text, "gyromagneticRatio", "f"), ref), text).toBeLessThanOrEqual(REF_TOL);
      }
    }
  });

  it("gyromagnetic ratio in angular units: rad/s/T, rad/(s T) (mathjs toNumber('cycle/(s T)'))", () => {
    for (const [ours, theirs] of [
      ["1.76e11 rad/s/T", "1.76e11 rad/(s T)"],
      ["1.76e11 rad/(s T)", "1.76e11 rad/(s T)"],
      ["1.76e11 rad/(s·T)", "1.76e11 rad/(s T)"],
      ["176 Grad/(s T)", "176 Grad/(s T)"],
      ["2.0e8 rad/s/mT", "2.0e8 rad/(s mT)"],
      ["6.7 krad/s/uT", "6.7 krad/(s uT)"],
    ]) {
      const ref = math.unit(theirs).toNumber("cycle/(s T)");
      expect(relErr(parseQuantity(ours, "gyromagneticRatio", "f"), ref), ours).toBeLessThanOrEqual(REF_TOL);
    }
  });
});

describe("gauss (mathjs has no gauss; 1 G = 1e-4 T, SI Brochure 8th ed. (2006), Table 9)", () => {
  it("every prefix of G is 1e-4 of the same prefix of T (prefix scaling checked via mathjs)", () => {
    for (const p of PREFIXES) {
      for (const n of NUMBERS) {
        const ref = math.unit(`${n} ${ascii(p)}T`).toNumber("T") * 1e-4;
        expect(relErr(parseQuantity(`${n} ${p}G`, "magneticField", "f"), ref), `${n} ${p}G`).toBeLessThanOrEqual(REF_TOL);
      }
    }
  });
  it("spelled-out gauss and common field values", () => {
    expect(parseQuantity("0.5 G", "magneticField", "f")).toBe(5e-5);
    expect(parseQuantity("0.5 gauss", "magneticField", "f")).toBe(5e-5);
    expect(parseQuantity("700 mG", "magneticField", "f")).toBe(7e-5);
    expect(parseQuantity("2 kG", "magneticField", "f")).toBe(0.2);
  });
  it("gyromagnetic ratios per gauss (mathjs for the Hz/T part, times 1e4 T/G)", () => {
    for (const [ours, theirsPerTesla] of [
      ["700 kHz/G", "700 kHz/T"],
      ["2.8 MHz/G", "2.8 MHz/T"],
      ["4.2 kHz/gauss", "4.2 kHz/T"],
      ["3 Hz/mG", "3 Hz/mT"],
    ]) {
      const ref = math.unit(theirsPerTesla).toNumber("Hz/T") * 1e4;
      expect(relErr(parseQuantity(ours, "gyromagneticRatio", "f"), ref), ours).toBeLessThanOrEqual(REF_TOL);
    }
  });
});

describe("decimal scaling is exact: results equal the JS literal of the same decimal (correctly rounded, ECMAScript spec)", () => {
  const cases: Array<[string, QuantityKind, number]> = [
    ["1.3 MHz", "frequency", 1.3e6],
    ["40 kg", "mass", 40],
    ["2.5 ng", "mass", 2.5e-12],
    ["1e-21 kg", "mass", 1e-21],
    ["3 yg", "mass", 3e-27],
    ["1064 nm", "length", 1.064e-6],
    ["6 K", "temperature", 6],
    ["20 mK", "temperature", 0.02],
    ["100 nK", "temperature", 1e-7],
    ["2 W", "power", 2],
    ["1.2 ms", "time", 1.2e-3],
    ["50 uT", "magneticField", 5e-5],
    ["50 µT", "magneticField", 5e-5],
    ["50 μT", "magneticField", 5e-5],
    ["7 GHz/T", "gyromagneticRatio", 7e9],
    ["3.5 Hz/nT", "gyromagneticRatio", 3.5e9],
    ["700 kHz/G", "gyromagneticRatio", 7e9],
    ["95 %", "fraction", 0.95],
    ["-10 dB", "decibel", -10],
    ["1.3 mHz", "frequency", 1.3e-3],
    ["1.3 EHz", "frequency", 1.3e18],
  ];
  for (const [text, kind, expected] of cases) {
    it(`${text} (${kind}) → ${expected}`, () => {
      expect(parseQuantity(text, kind, "f")).toBe(expected);
    });
  }
});

describe("accepted spellings", () => {
  const cases: Array<[unknown, QuantityKind, number]> = [
    ["40kg", "mass", 40],
    ["40   kg", "mass", 40],
    ["40\tkg", "mass", 40],
    ["40\u00a0kg", "mass", 40],
    ["40\u202fkg", "mass", 40],
    ["  40 kg  ", "mass", 40],
    ["+40 kg", "mass", 40],
    [".5 kg", "mass", 0.5],
    ["5. kg", "mass", 5],
    ["1E-21 kg", "mass", 1e-21],
    ["-10dB", "decibel", -10],
    ["-1.3 MHz", "frequency", -1.3e6],
    [0.95, "fraction", 0.95],
    ["0.95", "fraction", 0.95],
    ["95%", "fraction", 0.95],
    [0, "fraction", 0],
    [1, "fraction", 1],
    ["100 %", "fraction", 1],
    [1e12, "count", 1e12],
    ["1e12", "count", 1e12],
    [0.5, "count", 0.5],
    [-0.7, "number", -0.7],
    ["1.2", "number", 1.2],
    ["0", "number", 0],
    ["28 GHz / T", "gyromagneticRatio", 2.8e10],
    ["90°", "angle", Math.PI / 2],
    ["90 °", "angle", Math.PI / 2],
    ["1.5 mrad", "angle", 1.5e-3],
    ["2 h", "time", 7200],
    ["30 min", "time", 1800],
    ["0e-400 kg", "mass", 0],
  ];
  for (const [value, kind, expected] of cases) {
    it(`${JSON.stringify(value)} as ${kind}`, () => {
      // Literals on the right are exact here (or π/2 computed the same way for degrees).
      expect(parseQuantity(value, kind, "f")).toBe(expected);
    });
  }
});

describe("errors are QuietframeErrors naming the path and what is wrong", () => {
  const P = "components.membrane.mass";
  const cases: Array<[unknown, QuantityKind, RegExp]> = [
    // wrong dimension
    ["40 Hz", "mass", /^unit "Hz" is a frequency, but this field is a mass$/],
    ["7 GHz/T", "frequency", /unit "GHz\/T" is a gyromagnetic ratio, but this field is a frequency/],
    ["50 uT", "gyromagneticRatio", /unit "uT" is a magnetic field, but this field is a gyromagnetic ratio/],
    ["95 %", "mass", /unit "%" is a fraction, but this field is a mass/],
    ["-10 dB", "fraction", /unit "dB" is a level in decibels, but this field is a fraction/],
    ["40 kg", "count", /unit "kg" is a mass, but this field is a count/],
    ["1.2 dB", "number", /unit "dB" is a level in decibels, but this field is a plain number/],
    ["3 rad/s", "angle", /unit "rad\/s" is a frequency, but this field is an angle/],
    // missing unit
    [40, "mass", /needs a unit; did you mean "40 kg"\?/],
    ["40", "mass", /needs a unit; did you mean "40 kg"\?/],
    [-10, "decibel", /needs a unit; did you mean "-10 dB"\?/],
    ["90", "angle", /did you mean "90 deg"/],
    [1.3e6, "frequency", /did you mean "1300000 Hz"/],
    // ambiguous per-second
    ["10 1/s", "frequency", /ambiguous.*"Hz".*"rad\/s"/],
    ["10 /s", "frequency", /ambiguous/],
    ["10 s^-1", "frequency", /ambiguous/],
    ["10 s-1", "frequency", /ambiguous/],
    ["10 s⁻¹", "frequency", /ambiguous/],
    ["10 1/ms", "frequency", /ambiguous/],
    ["10 1/(s T)", "gyromagneticRatio", /ambiguous/],
    ["10 /s/T", "gyromagneticRatio", /ambiguous/],
    ["10 s^-1 T^-1", "gyromagneticRatio", /ambiguous/],
    // unknown units and junk
    ["40 kgg", "mass", /unknown unit "kgg" for a mass/],
    ["40 KG", "mass", /case-sensitive; did you mean "kg"\?/],
    ["1.3 MHZ", "frequency", /did you mean "MHz" or "mHz"\?/],
    ["-10 db", "decibel", /did you mean "dB"/],
    ["40 kg extra", "mass", /unknown unit "kg extra"/],
    ["40 k g", "mass", /unknown unit "k g"/],
    ["1,5 kg", "mass", /unknown unit ",5 kg"/],
    ["1.2.3 kg", "mass", /unknown unit/],
    ["90 grad", "angle", /unknown unit "grad"/],
    ["1 Grad", "angle", /unknown unit "Grad"/],
    ["20 °C", "temperature", /relative temperature scale.*kelvin/],
    ["20 degC", "temperature", /relative temperature scale/],
    ["0.5 Gs", "magneticField", /gigaseconds.*"G" or "gauss"/],
    ["0x10 kg", "mass", /hexadecimal/],
    ["0b101 kg", "mass", /hexadecimal, binary and octal/],
    ["abc", "mass", /does not start with a number/],
    ["kg 40", "mass", /does not start with a number/],
    ["e5 kg", "mass", /does not start with a number/],
    ["1_000 kg", "mass", /unknown unit "_000 kg"/],
    // NaN, infinity, empty
    ["NaN kg", "mass", /NaN and infinity are not allowed/],
    ["NaN", "number", /NaN and infinity/],
    ["Infinity", "count", /NaN and infinity/],
    ["-Infinity kg", "mass", /NaN and infinity/],
    ["inf K", "temperature", /NaN and infinity/],
    [Number.NaN, "number", /NaN is not a finite number/],
    [Number.POSITIVE_INFINITY, "fraction", /Infinity is not a finite number/],
    ["", "mass", /empty string is not a mass/],
    ["   ", "frequency", /empty string is not a frequency/],
    // overflow / underflow
    ["1e400 kg", "mass", /too large/],
    ["1e308 EHz", "frequency", /too large/],
    ["1e-400 kg", "mass", /too small.*underflows/],
    ["1e-310 yg", "mass", /underflows/],
    // non-strings
    [null, "mass", /expected a mass, got null/],
    [undefined, "mass", /no value given for a mass/],
    [true, "fraction", /expected a fraction, got a boolean/],
    [{}, "mass", /expected a mass, got an object/],
    [{ value: 40, unit: "kg" }, "mass", /got an object/],
    [[40, "kg"], "mass", /got an array/],
    [[], "count", /got an array/],
    [BigInt(5), "count", /got a bigint/],
    // range of bounded kinds
    [1.5, "fraction", /between 0 and 1/],
    ["150 %", "fraction", /between 0 and 1/],
    [-0.1, "fraction", /between 0 and 1/],
    [0, "count", /must be positive/],
    ["-5", "count", /must be positive/],
    ["0", "count", /must be positive/],
  ];
  for (const [value, kind, problem] of cases) {
    const label = typeof value === "bigint" ? `${value}n` : (JSON.stringify(value) ?? String(value));
    it(`${label} as ${kind}`, () => {
      const q = expectProblem(() => parseQuantity(value, kind, P), P, problem);
      expect(q.value).toEqual(value);
      expect(q.allowed).toBeTruthy();
    });
  }

  it("the message lists example units", () => {
    const q = expectProblem(() => parseQuantity("40 Hz", "mass", "m"), "m", /frequency/);
    expect(q.message).toBe('m = "40 Hz": unit "Hz" is a frequency, but this field is a mass; allowed: a mass such as "40 kg" or "2.5 ng" (gram with an SI prefix)');
  });

  it("an unknown kind from untyped callers is reported, not crashed on", () => {
    expectProblem(() => parseQuantity("40 kg", "weight" as QuantityKind, "x"), "x", /unknown quantity kind "weight"/);
  });
});
