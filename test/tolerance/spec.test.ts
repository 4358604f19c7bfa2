import { describe, expect, it } from "vitest";
import { MAX_TOLERANCE_CELLS, toleranceMap, type ToleranceMapSpec } from "../../src/node";
import { example, rejection } from "./helpers";

const squeezed = example("cryogenic-membrane-squeezed.json");
const GOOD: ToleranceMapSpec = {
  x: { target: "squeezer.squeezing", from: "-15 dB", to: "0 dB", points: 4 },
  y: { target: "cavity.inputCoupling", from: "50 %", to: "100 %", points: 3 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 32 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

/** A spec with some fields replaced (plain objects, as a user's JSON would be). */
function spec(change: Record<string, unknown>): ToleranceMapSpec {
  return { ...GOOD, ...change } as unknown as ToleranceMapSpec;
}

describe("bad tolerance-map specs are QuietframeErrors naming the field, the value and what is allowed", () => {
  const cases: [string, ToleranceMapSpec, string, RegExp][] = [
    ["unknown component", spec({ x: { ...GOOD.x, target: "pump.squeezing" } }), "x.target", /is not a parameter of this set-up; allowed: .*squeezer\.squeezing/],
    ["unknown parameter", spec({ y: { ...GOOD.y, target: "cavity.finesse" } }), "y.target", /"cavity\.finesse": is not a parameter/],
    ["no dot", spec({ x: { ...GOOD.x, target: "squeezing" } }), "x.target", /is not a parameter/],
    ["a choice, not a quantity", spec({ x: { ...GOOD.x, target: "membrane.massSign", from: 0, to: 1 } }), "x.target", /is a choice \(positive, negative\)/],
    ["the same parameter twice", spec({ y: { ...GOOD.x } }), "y.target", /same parameter as x\.target/],
    ["reversed bounds", spec({ x: { ...GOOD.x, from: "0 dB", to: "-15 dB" } }), "x.to", /= "-15 dB": must be above from \(0 dB\)/],
    ["equal bounds", spec({ y: { ...GOOD.y, from: "90 %", to: "90 %" } }), "y.to", /must be above from/],
    ["a unit of the wrong kind", spec({ x: { ...GOOD.x, from: "-15 Hz" } }), "x.from", /-15 Hz/],
    [
      "log axis through zero",
      spec({ x: { target: "cavity.detuning", from: "-1 MHz", to: "1 MHz", points: 5, scale: "log" } }),
      "x.from",
      /a log axis cannot start at or below zero; allowed: from > 0/,
    ],
    ["log axis from zero", spec({ x: { target: "membrane.temperature", from: "0 K", to: "10 K", points: 5, scale: "log" } }), "x.from", /= "0 K"/],
    ["unknown scale", spec({ x: { ...GOOD.x, scale: "logarithmic" } }), "x.scale", /allowed: linear or log/],
    ["too few points", spec({ x: { ...GOOD.x, points: 1 } }), "x.points", /allowed: an integer from 2/],
    ["fractional points", spec({ y: { ...GOOD.y, points: 2.5 } }), "y.points", /2\.5/],
    [
      "too many cells",
      spec({ x: { ...GOOD.x, points: 2000 }, y: { ...GOOD.y, points: 501 } }),
      "y.points",
      new RegExp(`2000 × 501 = 1002000 cells is above the limit; allowed: at most ${MAX_TOLERANCE_CELLS} cells`),
    ],
    ["values closer than six digits", spec({ x: { target: "membrane.frequency", from: "1.2 MHz", to: "1.200001 MHz", points: 50 } }), "x.points", /written the same at 6 significant digits/],
    ["a misspelt axis field", spec({ x: { ...GOOD.x, form: "-15 dB" } }), "x.form", /is not a field here; allowed: target, from, to, points, scale/],
    ["a missing axis", spec({ y: undefined }), "y", /must be an object/],
    ["unknown figure kind", spec({ figure: { kind: "margin-peak" } }), "figure.kind", /"margin-peak": is not a figure of merit; allowed: margin-at, margin-band, best-margin, range-gain/],
    ["margin-at outside the grid", spec({ figure: { kind: "margin-at", frequency: "2 MHz" } }), "figure.frequency", /outside the frequency grid; allowed: 1\.1 MHz … 1\.3 MHz/],
    ["margin-band reversed", spec({ figure: { kind: "margin-band", from: "1.2 MHz", to: "1.15 MHz" } }), "figure.to", /must be above figure\.from/],
    ["margin-band without a grid point", spec({ figure: { kind: "margin-band", from: "1.15 MHz", to: "1.1501 MHz" } }), "figure.to", /holds no grid point/],
    ["range-gain on a displacement budget", spec({ figure: { kind: "range-gain" } }), "figure.kind", /needs a budget referred to strain; this set-up's noise is referred to displacement/],
    ["a bad grid", spec({ grid: { from: "1.3 MHz", to: "1.1 MHz", points: 10 } }), "grid.to", /must be above from/],
  ];

  it.each(cases)("%s", async (_, bad, path, message) => {
    const e = await rejection(toleranceMap(squeezed, bad, { workers: 1 }));
    expect(e.path).toBe(path);
    expect(e.message).toMatch(message);
  });

  it("range-gain options and references are checked", async () => {
    const detector = example("long-baseline-detector.json");
    const base: ToleranceMapSpec = {
      x: { target: "ifo.power", from: "500 kW", to: "1 MW", points: 2 },
      y: { target: "squeezer.squeezing", from: "-9 dB", to: "-3 dB", points: 2 },
      grid: { from: "5 Hz", to: "5 kHz", points: 40 },
      figure: { kind: "range-gain" },
    };
    const withFigure = (figure: unknown) => ({ ...base, figure }) as ToleranceMapSpec;
    expect((await rejection(toleranceMap(detector, withFigure({ kind: "range-gain", reference: "original" })))).path).toBe("figure.reference");
    expect((await rejection(toleranceMap(detector, withFigure({ kind: "range-gain", measure: "area" })))).path).toBe("figure.measure");
    expect((await rejection(toleranceMap(detector, withFigure({ kind: "range-gain", m1: -1 })))).path).toBe("figure.m1");
    const e = await rejection(toleranceMap(detector, withFigure({ kind: "range-gain", reference: squeezed })));
    expect(e.path).toBe("figure.reference");
    expect(e.message).toMatch(/cannot be evaluated on the map's grid: .*not referred to strain/);
    // A grid entirely above the end of a heavy binary's inspiral.
    const high = await rejection(toleranceMap(detector, { ...base, grid: { from: "2 kHz", to: "5 kHz", points: 20 }, figure: { kind: "range-gain", m1: 30, m2: 30 } }));
    expect(high.path).toBe("grid");
    expect(high.message).toMatch(/does not overlap the inspiral band/);
  });

  it("bad options and a bad set-up are reported before anything runs", async () => {
    expect((await rejection(toleranceMap(squeezed, GOOD, { workers: 0 }))).path).toBe("options.workers");
    expect((await rejection(toleranceMap(squeezed, GOOD, { workers: 1.5 }))).path).toBe("options.workers");
    expect((await rejection(toleranceMap(squeezed, GOOD, { onProgress: 3 as unknown as () => void }))).path).toBe("options.onProgress");
    const broken = structuredClone(squeezed);
    broken.components[1].params!.mass = "5 nm";
    const e = await rejection(toleranceMap(broken, GOOD, { workers: 1 }));
    expect(e.path).toBe("components.membrane.mass");
  });
});
