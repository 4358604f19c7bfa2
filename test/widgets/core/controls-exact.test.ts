/** The controls' labels with units and the exact-value field's checks (pure functions the page calls). */
import { describe, expect, test } from "vitest";
import { QuietframeError } from "../../../src/errors";
import { parseControlOption } from "../../../src/cli/render";
import { frequencyRange } from "../../../widgets/core/controls/frequency-range";
import { exactValue, labelWithUnit, resolveControls, typedValue } from "../../../widgets/core/controls/setup-controls";
import { freeMassSetup } from "../../setup/fixtures";
import { exampleSetup } from "../explorer/examples";

const membrane = exampleSetup("cryogenic-membrane.json");
const [temperature, photons] = resolveControls(membrane, [
  { target: "membrane.temperature", min: "10 mK", max: "300 K", label: "bath temperature" },
  { target: "cavity.photons", min: 1e4, max: 1e8 },
]);

describe("labels carry the unit", () => {
  test("a slider's label names its unit; a count has none", () => {
    expect(labelWithUnit(temperature)).toBe("bath temperature [K]");
    expect(labelWithUnit(photons)).toBe("cavity.photons");
  });

  test("the report's --control takes a label after @", () => {
    expect(parseControlOption("membrane.temperature=10 mK:300 K@bath temperature", 0)).toEqual({ target: "membrane.temperature", min: "10 mK", max: "300 K", label: "bath temperature" });
    expect(parseControlOption("membrane.temperature=10 mK:300 K:log@T", 0)).toEqual({ target: "membrane.temperature", min: "10 mK", max: "300 K", scale: "log", label: "T" });
    expect(parseControlOption("mirror.mass@test mass", 0)).toEqual({ target: "mirror.mass", label: "test mass" });
    expect(() => parseControlOption("mirror.mass@", 0)).toThrow(/--control\[0\].*empty or over-long label/);
  });

  test("a label on a free-mass control", () => {
    const [mass] = resolveControls(freeMassSetup(), [{ target: "mirror.mass", min: "10 g", max: "10 kg", label: "test mass" }]);
    expect(labelWithUnit(mass)).toBe("test mass [kg]");
  });
});

describe("the exact-value field", () => {
  test("a value with its unit, or a bare number in the unit shown, is taken exactly", () => {
    expect(exactValue(temperature, " 6.25 K ")).toEqual({ written: "6.25 K", si: 6.25 });
    expect(exactValue(temperature, "20 mK")).toEqual({ written: "20 mK", si: 0.02 });
    expect(exactValue(temperature, "7")).toEqual({ written: "7 K", si: 7 });
    expect(exactValue(photons, "2.5e6")).toEqual({ written: "2.5e6", si: 2.5e6 });
    expect(typedValue(temperature, "1e-2")).toBe("1e-2 K");
  });

  test.each([
    ["400 K", /bath temperature \(membrane\.temperature\) = "400 K": is outside the control's range; allowed: 10 mK … 300 K/],
    ["5 mK", /"5 mK": is outside the control's range; allowed: 10 mK … 300 K/],
    ["6 kg", /"6 kg".*allowed: an absolute temperature in kelvin/],
    ["warm", /"warm"/],
    ["", /bath temperature \(membrane\.temperature\)/],
  ])("%j is refused with the value, its unit and what is allowed", (typed, message) => {
    expect(() => exactValue(temperature, typed)).toThrow(QuietframeError);
    expect(() => exactValue(temperature, typed)).toThrow(message);
  });

  test("a count out of range names the bounds", () => {
    expect(() => exactValue(photons, "1e9")).toThrow(/cavity\.photons = "1e9": is outside the control's range; allowed: 10000 … 1e\+8/);
  });
});

describe("the frequency-range control's check", () => {
  test("ends with units, or bare numbers in Hz; the points are kept", () => {
    expect(frequencyRange(" 1 kHz", "2.5 MHz ", 240)).toEqual({ from: "1 kHz", to: "2.5 MHz", points: 240 });
    expect(frequencyRange("10", "1e5", 100)).toEqual({ from: "10 Hz", to: "1e5 Hz", points: 100 });
  });

  test.each([
    ["0 Hz", "1 kHz", /frequency range\.from = "0 Hz": must be a positive frequency; allowed: from > 0 Hz/],
    ["1 kHz", "10 Hz", /frequency range\.to = "10 Hz": must be above from/],
    ["1 kg", "1 kHz", /frequency range\.from = "1 kg"/],
  ])("%j to %j is refused naming the end, the value and what is allowed", (from, to, message) => {
    expect(() => frequencyRange(from, to, 100)).toThrow(QuietframeError);
    expect(() => frequencyRange(from, to, 100)).toThrow(message);
  });
});
