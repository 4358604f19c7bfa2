import { describe, expect, it } from "vitest";
import { headlineFigures } from "../../src/engine/headline";
import { parseGrid } from "../../src/setup/grid";
import { log10 } from "../../src/numeric/portable-math";
import { parseQuantity } from "../../src/units";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { strainCurve, volumeGain, inspiralRange } from "../../src/reach";
import { CellStatus, toleranceCellSetup, toleranceMap, toleranceMapInProcess, type ToleranceMapSpec } from "../../src/node";
import { resolveControls, sliderValue, writeValue } from "../../widgets/core/controls/setup-controls";
import { applyValues } from "../../widgets/explorer/model";
import { example, firstDifference } from "./helpers";

const squeezed = example("cryogenic-membrane-squeezed.json");
const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 96 };

/** A 5 × 4 map over squeezing and input coupling. */
const SPEC: ToleranceMapSpec = {
  x: { target: "squeezer.squeezing", from: "-15 dB", to: "-3 dB", points: 5 },
  y: { target: "cavity.inputCoupling", from: "70 %", to: "99 %", points: 4 },
  grid: GRID,
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

/** The cell evaluated the way a user would: the explorer's applyValues, then the ordinary pipeline. */
function direct(i: number, j: number, xWritten: readonly string[], yWritten: readonly string[]) {
  const cell = applyValues(squeezed, { [SPEC.x.target]: xWritten[i], [SPEC.y.target]: yWritten[j] });
  return evaluateSetup(loadSetup(cell), parseGrid(GRID, "grid")).budget;
}

describe("a tolerance map is the pipeline evaluated cell by cell", () => {
  it("margin-at equals 10·log10(SQL/total) of each cell's own evaluation at the nearest grid point, bit for bit", async () => {
    const map = await toleranceMap(squeezed, SPEC, { workers: 1 });
    expect(map.values.length).toBe(20);
    expect(map.status.every((s) => s === CellStatus.ok)).toBe(true);
    const nearest = (f: Float64Array, at: number) => f.reduce((best, v, k) => (Math.abs(Math.log(v / at)) < Math.abs(Math.log(f[best] / at)) ? k : best), 0);
    const expected = new Float64Array(20);
    for (let j = 0; j < 4; j++) {
      for (let i = 0; i < 5; i++) {
        const b = direct(i, j, map.x.written, map.y.written);
        const k = nearest(b.frequencies, 1.16e6);
        expect(map.figure.frequency).toBe(b.frequencies[k]);
        const sql = b.references.find((r) => r.id === "sql")!.psd;
        expected[j * 5 + i] = 10 * log10(sql[k] / b.total[k]);
      }
    }
    expect(firstDifference(map.values, expected)).toBe(-1);
    // The map is not flat: more squeezing and less loss both matter at 1.16 MHz.
    expect(new Set(map.values).size).toBe(20);
  });

  it("best-margin equals the headline figure of each cell, bit for bit", async () => {
    const map = await toleranceMap(squeezed, { ...SPEC, figure: { kind: "best-margin" } }, { workers: 2 });
    const expected = new Float64Array(20);
    for (let j = 0; j < 4; j++) for (let i = 0; i < 5; i++) expected[j * 5 + i] = headlineFigures(direct(i, j, map.x.written, map.y.written)).bestMarginDb;
    expect(firstDifference(map.values, expected)).toBe(-1);
    expect(map.figure).toMatchObject({ kind: "best-margin", unit: "dB" });
  });

  it("margin-band is 10·log10 of the band-summed SQL over the band-summed total (grid points inside the band)", async () => {
    const map = await toleranceMapInProcess(squeezed, { ...SPEC, figure: { kind: "margin-band", from: "1.15 MHz", to: "1.19 MHz" } });
    const b = direct(3, 2, map.x.written, map.y.written);
    const inBand = Array.from(b.frequencies.keys()).filter((k) => b.frequencies[k] >= 1.15e6 && b.frequencies[k] <= 1.19e6);
    const sql = b.references.find((r) => r.id === "sql")!.psd;
    let s = 0;
    let t = 0;
    for (const k of inBand) {
      s += sql[k];
      t += b.total[k];
    }
    expect(map.figure.bandPoints).toBe(inBand.length);
    expect(map.figure.band).toEqual([b.frequencies[inBand[0]], b.frequencies[inBand[inBand.length - 1]]]);
    expect(map.values[2 * 5 + 3]).toBe(10 * log10(s / t));
  });

  it("writes the values an explorer slider with points − 1 steps writes, and each cell is an ordinary set-up", async () => {
    const map = await toleranceMap(squeezed, SPEC, { workers: 1 });
    const [cx, cy] = resolveControls(squeezed, [
      { target: SPEC.x.target, min: SPEC.x.from, max: SPEC.x.to, steps: 4, scale: "linear" },
      { target: SPEC.y.target, min: SPEC.y.from, max: SPEC.y.to, steps: 3, scale: "linear" },
    ]);
    expect(map.x.written).toEqual([0, 1, 2, 3, 4].map((k) => writeValue(cx, sliderValue(cx, k))));
    expect(map.y.written).toEqual([0, 1, 2, 3].map((k) => writeValue(cy, sliderValue(cy, k))));
    expect(map.x.written).toEqual(["-15 dB", "-12 dB", "-9 dB", "-6 dB", "-3 dB"]);
    // SI values are what the written strings parse to: exactly what each cell computed with.
    expect(Array.from(map.y.values)).toEqual(map.y.written.map((w) => parseQuantity(w, "fraction", "y")));
    expect(map.y.written[1]).toBe("79.6667 %");
    const cell = toleranceCellSetup(squeezed, map, 3, 1);
    expect(cell).toEqual(applyValues(squeezed, { "squeezer.squeezing": "-6 dB", "cavity.inputCoupling": map.y.written[1] }));
    // The original set-up is untouched.
    expect(squeezed.components.find((c) => c.name === "squeezer")!.params!.squeezing).toBe("-10 dB");
  });

  it("log axes are geometric (a slider's log positions)", async () => {
    const map = await toleranceMap(
      squeezed,
      { ...SPEC, x: { target: "cavity.photons", from: 1e4, to: 1e8, points: 5 }, y: { target: "membrane.temperature", from: "10 mK", to: "10 K", points: 4, scale: "log" } },
      { workers: 1 },
    );
    expect(map.x.scale).toBe("log");
    const [photons] = resolveControls(squeezed, [{ target: "cavity.photons", min: 1e4, max: 1e8, steps: 4 }]);
    expect(photons.scale).toBe("log");
    expect(map.x.written).toEqual([0, 1, 2, 3, 4].map((k) => writeValue(photons, sliderValue(photons, k))));
    expect(map.y.written).toEqual(["10 mK", "100 mK", "1 K", "10 K"]);
    expect(map.counts.ok).toBe(20);
  });
});

describe("range-gain on a strain budget", () => {
  const detector = example("long-baseline-detector.json");
  const spec: ToleranceMapSpec = {
    x: { target: "ifo.power", from: "500 kW", to: "1 MW", points: 3 },
    y: { target: "squeezer.squeezing", from: "-9 dB", to: "-3 dB", points: 3 },
    grid: { from: "5 Hz", to: "5 kHz", points: 120 },
    figure: { kind: "range-gain" },
  };

  it("is the volume gain (range/range of the unmodified set-up)³ of src/reach, cell by cell, and exactly 1 at the unmodified values", async () => {
    const map = await toleranceMap(detector, spec, { workers: 2 });
    expect(map.x.written).toEqual(["500 kW", "750 kW", "1 MW"]);
    expect(map.y.written).toEqual(["-9 dB", "-6 dB", "-3 dB"]);
    const grid = parseGrid(spec.grid, "grid");
    const reference = strainCurve(evaluateSetup(loadSetup(detector), grid).budget);
    const expected = new Float64Array(9);
    for (let j = 0; j < 3; j++) {
      for (let i = 0; i < 3; i++) {
        const cell = applyValues(detector, { "ifo.power": map.x.written[i], "squeezer.squeezing": map.y.written[j] });
        expected[j * 3 + i] = volumeGain(strainCurve(evaluateSetup(loadSetup(cell), grid).budget), reference);
      }
    }
    expect(firstDifference(map.values, expected)).toBe(-1);
    expect(map.values[4]).toBe(1);
    // At fixed squeezing, more power sees further (shot noise dominates the inspiral band).
    expect(map.values[1]).toBeGreaterThan(map.values[0]);
    expect(map.values[2]).toBeGreaterThan(map.values[1]);
    expect(map.figure.unit).toBe("");
    expect(map.figure.referenceRangeMpc).toBe(inspiralRange(reference.frequencies, reference.strainPsd).megaparsecs);
  });

  it("measure 'range' gives the range ratio, against another set-up when one is given", async () => {
    const other = applyValues(detector, { "ifo.power": "400 kW" });
    const map = await toleranceMap(detector, { ...spec, figure: { kind: "range-gain", measure: "range", reference: other, m1: 10, m2: 10 } }, { workers: 1 });
    const grid = parseGrid(spec.grid, "grid");
    const ref = strainCurve(evaluateSetup(loadSetup(other), grid).budget);
    const cell = strainCurve(evaluateSetup(loadSetup(applyValues(detector, { "ifo.power": "1 MW", "squeezer.squeezing": "-3 dB" })), grid).budget);
    const opts = { m1: 10, m2: 10 };
    expect(map.values[2 * 3 + 2]).toBe(inspiralRange(cell.frequencies, cell.strainPsd, opts).metres / inspiralRange(ref.frequencies, ref.strainPsd, opts).metres);
    expect(map.figure.label).toMatch(/range/);
  });
});

describe("cells without a value", () => {
  // Detuning −4 … +4 MHz: blue detuning anti-damps the membrane; input coupling 0 % is outside its range.
  const spec: ToleranceMapSpec = {
    x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 5 },
    y: { target: "cavity.inputCoupling", from: "0 %", to: "100 %", points: 3 },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: 48 },
    figure: { kind: "margin-at", frequency: "1.16 MHz" },
  };

  it("are NaN with status 1 (unstable, naming the growing mode) or 2 (invalid, naming the field); the rest are finite", async () => {
    const map = await toleranceMap(squeezed, spec, { workers: 2 });
    const status = Array.from(map.status);
    // Row 0: inputCoupling 0 % is invalid whatever the detuning.
    expect(status.slice(0, 5)).toEqual([2, 2, 2, 2, 2]);
    // Rows 1, 2: red and zero detuning stable, blue detuning (+2, +4 MHz) unstable.
    expect(status.slice(5)).toEqual([0, 0, 0, 1, 1, 0, 0, 0, 1, 1]);
    map.values.forEach((v, k) => {
      if (map.status[k] === CellStatus.ok) expect(Number.isFinite(v)).toBe(true);
      else expect(Number.isNaN(v)).toBe(true);
    });
    expect(map.counts).toEqual({ ok: 6, unstable: 4, invalid: 5 });
    // Messages come in row-major order, the first few only.
    expect(map.messages.map((m) => [m.x, m.y, m.status])).toEqual([
      [0, 0, 2],
      [1, 0, 2],
      [2, 0, 2],
      [3, 0, 2],
      [4, 0, 2],
      [3, 1, 1],
      [4, 1, 1],
      [3, 2, 1],
    ]);
    const invalid = map.messages[0];
    expect(invalid.setting).toEqual({ "cavity.detuning": "-4 MHz", "cavity.inputCoupling": "0 %" });
    expect(invalid.message).toMatch(/^components\.cavity\.inputCoupling = "0 %": .*allowed: 0 % < inputCoupling ≤ 100 %/);
    const unstable = map.messages[5];
    expect(unstable.setting["cavity.detuning"]).toBe("2 MHz");
    // The same text as the error every other caller gets for this set-up (field path "setup").
    expect(unstable.message).toMatch(/^setup: unstable: a mode at 1\.\d+e\+6 Hz grows at .* living in 'membrane'/);
    expect(unstable.message).toMatch(/blue-detuned/);
  });

  it("a blind readout is an invalid cell", async () => {
    // Homodyne angle 0°: the amplitude quadrature of a resonant readout carries no signal.
    const map = await toleranceMap(
      squeezed,
      { ...spec, x: { target: "detector.angle", from: "0 deg", to: "90 deg", points: 3 }, y: { target: "detector.efficiency", from: "50 %", to: "90 %", points: 2 } },
      { workers: 1 },
    );
    expect(Array.from(map.status)).toEqual([2, 0, 0, 2, 0, 0]);
    expect(map.messages[0].message).toMatch(/^readout.*sees no signal/);
  });
});
