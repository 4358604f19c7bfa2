/**
 * Quantiles by selection against quantiles of the sorted data (quantileSorted: Hyndman & Fan
 * 1996, definition 7, the default of R and NumPy), bit for bit, on random data with ties,
 * infinities, sorted and reversed runs; data with NaN or −0 is sorted instead. Fixed seeds.
 */
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { quantileSorted } from "../../src/design/quantile";
import { quantilesBySelection } from "../../src/design/select-quantile";

const PS = [0, 0.05, 0.25, 0.5, 0.95, 1];

function bySorting(values: number[]): number[] {
  const sorted = Float64Array.from(values).sort();
  return PS.map((p) => quantileSorted(sorted, p));
}

describe("quantilesBySelection", () => {
  it("gives quantileSorted of the sorted data, bit for bit (random data, ties and infinities)", () => {
    const value = fc.oneof(
      fc.double({ min: 0, max: 1e-30, noNaN: true, noDefaultInfinity: true }),
      fc.constantFrom(Infinity, 1e-35, 2e-35, 0),
      fc.integer({ min: 1, max: 5 }).map((k) => k * 1e-36),
    );
    fc.assert(
      fc.property(fc.array(value, { minLength: 1, maxLength: 300 }), (values) => {
        const got = quantilesBySelection(Float64Array.from(values), PS);
        const expected = bySorting(values);
        expect(got.map((x, i) => Object.is(x, expected[i]))).toEqual(PS.map(() => true));
      }),
      { seed: 20261204, numRuns: 400 },
    );
  });

  it("gives the same quantiles asked in any order (later selections reuse earlier ones only when they lie to the right)", () => {
    const shuffled = [0.95, 0.05, 1, 0.5, 0, 0.25, 0.25, 0.9];
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -20, max: 20 }), { minLength: 1, maxLength: 200 }), (ints) => {
        const values = ints.map((k) => k * 0.25 + 0.125);
        const sorted = Float64Array.from(values).sort();
        const expected = shuffled.map((p) => quantileSorted(sorted, p));
        expect(quantilesBySelection(Float64Array.from(values), shuffled)).toEqual(expected);
      }),
      { seed: 20261205, numRuns: 300 },
    );
  });

  it("sorted, reversed and constant columns of 100,001 values", () => {
    const n = 100_001;
    const up = Float64Array.from({ length: n }, (_, i) => 1 + i * 1e-3);
    const cases = [up, up.slice().reverse(), new Float64Array(n).fill(3.5)];
    for (const c of cases) {
      const expected = bySorting(Array.from(c));
      expect(quantilesBySelection(c.slice(), PS)).toEqual(expected);
    }
  });

  it("sorts data holding NaN or −0, as Float64Array.prototype.sort orders them", () => {
    for (const values of [[3, Number.NaN, 1, 2], [0, -0, 0, -0, 1], [-0]]) {
      const got = quantilesBySelection(Float64Array.from(values), PS);
      const expected = bySorting(values);
      expect(got.map((x, i) => Object.is(x, expected[i]))).toEqual(PS.map(() => true));
    }
    expect(quantilesBySelection(new Float64Array(0), [0.5])).toEqual([Number.NaN]);
  });
});
