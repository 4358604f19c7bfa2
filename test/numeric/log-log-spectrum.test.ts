import { describe, expect, it } from "vitest";
import { LogLogSpectrum } from "../../src/numeric/log-log-spectrum";
import { log, pow } from "../../src/numeric/portable-math";
import { expectAllClose } from "../helpers/close";

/** A power law a(f) = c·f^k; straight in log-log coordinates, so log-log interpolation must reproduce it (definition of a power law, no source needed). */
const powerLaw = (c: number, k: number) => (f: number) => c * f ** k;

function tabulate(a: (f: number) => number, fs: number[], extension: "refuse" | "hold" | "power-law" = "refuse"): LogLogSpectrum {
  return new LogLogSpectrum(Float64Array.from(fs), Float64Array.from(fs, a), extension);
}

describe("log-log interpolated spectrum", () => {
  const probe = Array.from({ length: 301 }, (_, i) => 2 * 10 ** (i / 100)); // 2 Hz … 2 kHz

  it("is exact for a power law between its points (ASD and PSD)", () => {
    for (const k of [-7 / 3, -2, -0.5, 0, 1.5]) {
      const a = powerLaw(3e-15, k);
      const s = tabulate(a, [1, 7, 100, 2500]);
      expectAllClose(
        probe.map((f) => s.asdAt(f)),
        probe.map(a),
        4e-15,
        `ASD, slope ${k}`,
      );
      expectAllClose(
        probe.map((f) => s.psdAt(f)),
        probe.map((f) => a(f) ** 2),
        8e-15,
        `PSD, slope ${k}`,
      );
    }
  });

  it("follows a different power law on each segment of a broken power law", () => {
    const broken = (f: number) => (f < 10 ? 1e-12 * f ** -2 : 1e-14 * (f / 10) ** 0.5);
    const s = tabulate(broken, [1, 10, 1000]);
    const fs = [1.5, 3, 9.9, 10, 11, 200, 999];
    expectAllClose(
      fs.map((f) => s.asdAt(f)),
      fs.map(broken),
      4e-15,
      "broken power law",
    );
  });

  it("returns tabulated values exactly at the tabulated frequencies", () => {
    const s = new LogLogSpectrum(Float64Array.from([1, 2, 5]), Float64Array.from([3e-15, 7e-16, 2e-16]), "refuse");
    expect([s.asdAt(1), s.asdAt(2), s.asdAt(5)]).toEqual([3e-15, 7e-16, 2e-16]);
  });

  it("has no value outside its range unless told how to extend it", () => {
    const a = powerLaw(1e-15, -2);
    const refuse = tabulate(a, [10, 100]);
    expect(refuse.covers(9.999)).toBe(false);
    expect(refuse.covers(100.001)).toBe(false);
    expect(refuse.covers(10)).toBe(true);
    expect(Number.isNaN(refuse.asdAt(5))).toBe(true);
    const hold = tabulate(a, [10, 100], "hold");
    expect(hold.covers(1)).toBe(true);
    expect([hold.asdAt(1), hold.asdAt(1e4)]).toEqual([a(10), a(100)]);
    const extended = tabulate(a, [10, 20, 100], "power-law");
    expectAllClose([extended.asdAt(1), extended.asdAt(1e4)], [a(1), a(1e4)], 4e-15, "power-law extension");
  });

  it("gives the formula's bits on every read, first or repeated, inside and beyond the table, past what it remembers", () => {
    // a_i (f/f_i)^k, k = ln(a_{i+1}/a_i)/ln(f_{i+1}/f_i) on the segment holding f (the definition above).
    const fs = [1, 7, 100, 2500];
    const as = [4e-12, 9e-13, 2e-14, 3e-15];
    const formula = (f: number): number => {
      let i = 0;
      while (i < fs.length - 2 && f >= fs[i + 1]) i++;
      const k = log(as[i + 1] / as[i]) / log(fs[i + 1] / fs[i]);
      return as[i] * pow(f / fs[i], k);
    };
    const s = new LogLogSpectrum(Float64Array.from(fs), Float64Array.from(as), "power-law");
    const reads = Array.from({ length: 20_000 }, (_, i) => 0.5 * 10 ** ((4 * i) / 20_000)); // 0.5 Hz … 5 kHz, more than it keeps
    for (const round of [1, 2]) {
      const wrong = reads.filter((f) => (fs.includes(f) ? s.asdAt(f) !== as[fs.indexOf(f)] : !Object.is(s.asdAt(f), formula(f))));
      expect(wrong, `round ${round}`).toEqual([]);
    }
    const f = 42.5;
    expect(s.psdAt(f)).toBe(formula(f) * formula(f));
    expect(s.psdAt(f)).toBe(s.psdAt(f));
  });
});
