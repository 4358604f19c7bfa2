import { describe, expect, it } from "vitest";
import { optimizeDesign, rankParameters, solveForTarget, spreadAnalysis, targetWindow } from "../../src/design";
import { quietframeErrorOf } from "../helpers/errors";
import { probedBody, setup } from "../helpers/setups";

/** Every bad input is a QuietframeError that names the field, the value and what is allowed. */
const probe = probedBody({ body: { mass: "1 g" }, probe: { power: "1 W" }, efficiency: 0.9 });
const margin = { kind: "margin-at" as const, frequency: "100 Hz" };
const squeezedProbe = setup(
  [
    { name: "light", type: "squeezed", params: { squeezing: "-10 dB", angle: "90 deg" } },
    { name: "body", type: "free-mass", params: { mass: "1 g" } },
    { name: "probe", type: "position-probe", params: { power: "1 W" } },
    { name: "detector", type: "homodyne", params: {} },
  ],
  [
    ["light.out", "probe.in"],
    ["probe.out", "detector.in"],
    ["probe.mechanics", "body.body"],
  ],
);

describe("bad input to the design searches", () => {
  it("an unknown figure of merit names figure.kind and lists the figures", () => {
    const e = quietframeErrorOf(() => rankParameters(probe, { kind: "loudness" } as never));
    expect(e.path).toBe("figure.kind");
    expect(e.value).toBe("loudness");
    expect(e.allowed).toBe("margin-at, margin-band, best-margin, range-gain, noise-at");
  });

  it("an unknown parameter, a choice and an optional parameter left out each say so and list the numeric parameters", () => {
    const unknown = quietframeErrorOf(() => solveForTarget(probe, margin, "probe.colour", "0 dB"));
    expect(unknown.path).toBe("parameter");
    expect(unknown.problem).toBe("is not a numeric parameter of this set-up");
    expect(unknown.allowed).toContain("probe.power");
    const leftOut = quietframeErrorOf(() => solveForTarget(probe, margin, "probe.measurementRate", "0 dB"));
    expect(leftOut.problem).toMatch(/has no value in this set-up/);
    const ranked = quietframeErrorOf(() => rankParameters(probe, margin, { parameters: ["body.mass", "nothing.here"] }));
    expect(ranked.path).toBe("options.parameters[1]");
  });

  it("reversed bounds and bounds outside a parameter's validity name the end at fault and the allowed range", () => {
    const reversed = quietframeErrorOf(() => solveForTarget(probe, margin, "detector.efficiency", "0 dB", { range: { min: "100 %", max: "50 %" } }));
    expect(reversed.path).toBe("range.max");
    expect(reversed.value).toBe("50 %");
    expect(reversed.problem).toBe("must be above min (100 %)");
    const fraction = quietframeErrorOf(() => optimizeDesign(probe, margin, [{ target: "detector.efficiency", min: "50 %", max: "120 %" }]));
    expect(fraction.path).toBe("parameters[0].max");
    expect(fraction.problem).toMatch(/between 0 and 1/);
    const negative = quietframeErrorOf(() => optimizeDesign(probe, margin, [{ target: "body.mass", min: "-1 kg", max: "1 kg" }]));
    expect(negative.path).toBe("parameters[0].min");
    expect(negative.problem).toBe("is outside the range of body.mass");
    expect(negative.allowed).toBe("0 kg < mass");
    const half = quietframeErrorOf(() => optimizeDesign(probe, margin, [{ target: "body.mass", min: "1 g" }]));
    expect(half.path).toBe("parameters[0].max");
    expect(half.problem).toBe("is missing");
  });

  it("a target in the wrong unit or of the wrong kind names `target`", () => {
    const unit = quietframeErrorOf(() => solveForTarget(probe, margin, "probe.power", "3 K"));
    expect(unit.path).toBe("target");
    expect(unit.problem).toMatch(/temperature/);
    const noise = quietframeErrorOf(() => solveForTarget(probe, { kind: "noise-at", frequency: "100 Hz" }, "probe.power", -1));
    expect(noise.path).toBe("target");
    expect(noise.allowed).toMatch(/m²\/Hz/);
  });

  it("an uncertainty in the wrong unit, larger than the allowed range, outside it or without a spread names uncertain.<parameter>", () => {
    const unit = quietframeErrorOf(() => spreadAnalysis(probe, margin, [{ target: "body.mass", value: "± 3 K" }], { samples: 2 }));
    expect(unit.path).toBe("uncertain.body.mass.spread");
    expect(unit.value).toBe("3 K");
    expect(unit.problem).toMatch(/unit "K" is a temperature, but this field is a mass/);
    const wide = quietframeErrorOf(() => spreadAnalysis(squeezedProbe, margin, [{ target: "light.squeezing", value: "-10 dB ± 100 dB" }], { samples: 2 }));
    expect(wide.path).toBe("uncertain.light.squeezing.spread");
    expect(wide.problem).toMatch(/is larger than the whole range of light.squeezing/);
    const outside = quietframeErrorOf(() => spreadAnalysis(probe, margin, [{ target: "detector.efficiency", value: "120 % ± 1 %" }], { samples: 2 }));
    expect(outside.path).toBe("uncertain.detector.efficiency.value");
    const noSpread = quietframeErrorOf(() => spreadAnalysis(probe, margin, [{ target: "body.mass", value: "1 g" }], { samples: 2 }));
    expect(noSpread.path).toBe("uncertain.body.mass");
    expect(noSpread.problem).toBe("is not a value ± a spread");
    const samples = quietframeErrorOf(() => spreadAnalysis(probe, margin, [{ target: "body.mass", value: "± 1 mg" }], { samples: 1 }));
    expect(samples.path).toBe("options.samples");
  });

  it("a target no value reaches is a result, not an error; so is a window around a value short of the target", () => {
    const never = solveForTarget(probe, margin, "detector.efficiency", "10 dB");
    expect(never.outcome).toBe("never");
    expect(never.best).toBeDefined();
    const noWindow = targetWindow(probe, margin, "detector.efficiency", "10 dB");
    expect(noWindow.low).toBeUndefined();
  });

  it("optimization: no parameter, a parameter twice, a bad seed", () => {
    expect(quietframeErrorOf(() => optimizeDesign(probe, margin, [])).path).toBe("parameters");
    expect(quietframeErrorOf(() => optimizeDesign(probe, margin, [{ target: "body.mass" }, { target: "body.mass" }])).path).toBe("parameters[1].target");
    expect(quietframeErrorOf(() => optimizeDesign(probe, margin, [{ target: "body.mass" }], { seed: -1 })).path).toBe("options.seed");
  });
});
