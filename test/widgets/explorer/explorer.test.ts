import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../../src/errors";
import { evaluateSetup, loadSetup } from "../../../src/pipeline";
import type { SetupDescription } from "../../../src/setup/format";
import { parseQuantity } from "../../../src/units";
import { checkValue, resolveControls, sliderPosition, sliderValue, writeValue } from "../../../widgets/core/controls/setup-controls";
import { applyValues, computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { budgetFingerprint } from "../../../widgets/explorer/fingerprint";

const membrane = JSON.parse(readFileSync(join(__dirname, "../../../examples/cryogenic-membrane.json"), "utf8")) as SetupDescription;

function thrown(fn: () => unknown): QuietframeError {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(QuietframeError);
    return e as QuietframeError;
  }
  throw new Error("expected a QuietframeError");
}

describe("controls bound to set-up parameters", () => {
  it("resolve with SI bounds, a log scale for wide positive ranges and the unit shown", () => {
    const [photons, temperature, angle] = resolveControls(membrane, [
      { target: "cavity.photons", min: 1e4, max: 1e8 },
      { target: "membrane.temperature", min: "10 mK", max: "300 K" },
      { target: "detector.angle", min: "0 deg", max: "180 deg" },
    ]);
    expect(photons).toMatchObject({ control: "slider", scale: "log", min: 1e4, max: 1e8 });
    expect(temperature).toMatchObject({ scale: "log", min: 0.01, max: 300, unit: "K" });
    expect(angle.scale).toBe("linear");
    expect(angle.max).toBeCloseTo(Math.PI, 15);
  });

  it("map slider positions to values: ends exact, log midpoint geometric, linear midpoint arithmetic", () => {
    const [log, lin] = resolveControls(membrane, [
      { target: "cavity.photons", min: 1e4, max: 1e8, steps: 100 },
      { target: "detector.efficiency", min: 0.5, max: 1, steps: 100 },
    ]);
    expect(sliderValue(log, 0)).toBe(1e4);
    expect(sliderValue(log, 100)).toBe(1e8);
    expect(Math.abs(sliderValue(log, 50) / 1e6 - 1)).toBeLessThan(1e-14);
    expect(sliderValue(lin, 50)).toBe(0.75);
    for (let k = 0; k <= 100; k += 7) {
      expect(sliderPosition(log, sliderValue(log, k))).toBe(k);
      expect(sliderPosition(lin, sliderValue(lin, k))).toBe(k);
    }
  });

  it("write values that parse back to exactly the number written (6 significant digits)", () => {
    const [t] = resolveControls(membrane, [{ target: "membrane.temperature", min: "10 mK", max: "300 K" }]);
    for (let k = 0; k <= 200; k += 13) {
      const text = writeValue(t, sliderValue(t, k));
      const back = parseQuantity(text, "temperature", "t");
      expect(Math.abs(back / sliderValue(t, k) - 1)).toBeLessThan(5e-6);
      expect(writeValue(t, back)).toBe(text);
    }
  });

  it("refuse unknown targets, reversed bounds, log scales through zero and duplicates, naming the field", () => {
    expect(thrown(() => resolveControls(membrane, [{ target: "membrane.colour", min: 0, max: 1 }])).message).toMatch(/controls\[0\]\.target.*membrane\.mass/);
    expect(thrown(() => resolveControls(membrane, [{ target: "membrane.temperature", min: "5 K", max: "1 K" }])).path).toBe("controls[0].max");
    expect(thrown(() => resolveControls(membrane, [{ target: "cavity.detuning", min: "-1 MHz", max: "1 MHz", scale: "log" }])).path).toBe("controls[0].scale");
    expect(
      thrown(() =>
        resolveControls(membrane, [
          { target: "membrane.Q", min: 1, max: 10 },
          { target: "membrane.Q", min: 1, max: 10 },
        ]),
      ).path,
    ).toBe("controls[1].target");
  });

  it("check values against the control's range and choices", () => {
    const [t, sign] = resolveControls(membrane, [{ target: "membrane.temperature", min: "1 K", max: "10 K" }, { target: "membrane.massSign" }]);
    expect(checkValue(t, "6 K", "v")).toBe(6);
    expect(thrown(() => checkValue(t, "20 K", "values.membrane.temperature")).message).toMatch(/outside the control's range.*1 K … 10 K/);
    expect(thrown(() => checkValue(t, "6 Hz", "v")).message).toMatch(/frequency/);
    expect(checkValue(sign, "negative", "v")).toBe("negative");
    expect(thrown(() => checkValue(sign, "sideways", "v")).message).toMatch(/positive, negative/);
  });
});

describe("the explorer model", () => {
  const controls = [
    { target: "cavity.photons", min: 1e4, max: 1e8 },
    { target: "membrane.temperature", min: "10 mK", max: "300 K" },
  ];

  it("starts from the set-up's own values and computes the same budget as the engine", () => {
    const state = createExplorerState(membrane, { controls });
    expect(state.values).toEqual({ "cavity.photons": 1e6, "membrane.temperature": "6 K" });
    const direct = evaluateSetup(loadSetup(membrane), { from: 1.1e6, to: 1.3e6, points: 801 }).budget;
    expect(state.fingerprint).toBe(budgetFingerprint(direct));
  });

  it("recomputes with new values, and the fingerprint follows the numbers", () => {
    const state = createExplorerState(membrane, { controls });
    const warmer = computeExplorer({ ...state, values: { ...state.values, "membrane.temperature": "300 K" } });
    expect(warmer.fingerprint).not.toBe(state.fingerprint);
    const again = computeExplorer({ ...state, values: { ...state.values, "membrane.temperature": "300 K" } });
    expect(again.fingerprint).toBe(warmer.fingerprint);
    const direct = evaluateSetup(loadSetup(applyValues(membrane, { "membrane.temperature": "300 K" })), { from: 1.1e6, to: 1.3e6, points: 801 }).budget;
    expect(warmer.fingerprint).toBe(budgetFingerprint(direct));
  });

  it("reports an unstable value as an error that says so, leaving the state untouched", () => {
    const state = createExplorerState(membrane, { controls: [{ target: "cavity.detuning", min: "-4 MHz", max: "4 MHz" }] });
    const before = JSON.stringify(state);
    const e = thrown(() => computeExplorer({ ...state, values: { "cavity.detuning": "2 MHz" }, controls: state.controls }));
    expect(e.message).toMatch(/unstable.*blue-detuned/);
    expect(JSON.stringify(state)).toBe(before);
  });

  it("refuses values without a control and controls without a value", () => {
    const state = createExplorerState(membrane, { controls });
    expect(thrown(() => computeExplorer({ ...state, values: { ...state.values, "membrane.Q": 5 } })).path).toBe("values.membrane.Q");
    expect(thrown(() => computeExplorer({ ...state, values: { "cavity.photons": 1e5 } })).path).toBe("values.membrane.temperature");
  });
});
