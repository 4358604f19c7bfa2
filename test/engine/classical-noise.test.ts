import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { evaluate, prepare } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { stationaryCovariance } from "../../src/engine/covariance";
import { QuietframeError } from "../../src/errors";
import { tabulateBudget } from "../../src/engine/tabulate";
import { inspiralRange } from "../../src/reach/inspiral";
import { expectAllClose } from "../helpers/close";
import { probedBody, sumTerms } from "../helpers/setups";

const MASS = 2e-9; // kg
const F_M = 1.3e6; // Hz
const Q = 1e6;

/** Force ASD as a power law c·f^k tabulated at a few points: log-log interpolation gives it back exactly between them. */
const forceAsd = (f: number) => 2e-17 * (f / 1e6) ** -0.5;
const forcePoints: [number, number][] = [1e5, 4e5, 1.3e6, 5e6, 2e7].map((f) => [f, forceAsd(f)]);

function oscillatorWithForceNoise(referTo: "displacement" | "force"): SetupDescription {
  return {
    ...probedBody({
      bodyType: "oscillator",
      body: { mass: `${MASS} kg`, frequency: `${F_M} Hz`, Q, temperature: "4 K" },
      probe: { power: "1 mW", wavelength: "1064 nm" },
      referTo,
    }),
    classicalNoise: [{ name: "actuator", enters: "force", on: "body", spectrum: { unit: "N/√Hz", points: forcePoints } }],
  };
}

const grid = { from: 2e5, to: 1e7, points: 301 };

describe("classical noise terms", () => {
  it("a force-noise term on an oscillator is |χ|²·S_F in displacement and S_F in force", () => {
    const budget = evaluate(prepare(oscillatorWithForceNoise("displacement")), grid).budget;
    const term = sumTerms(budget.terms, "actuator");
    // Mechanical susceptibility of a viscously damped oscillator, χ(Ω) = 1/(m(Ω_m² − Ω² − iγΩ)), γ = Ω_m/Q
    // (Aspelmeyer, Kippenberg & Marquardt, Rev. Mod. Phys. 86, 1391 (2014), section II; Fourier sign e^{−iΩt}).
    const omegaM = 2 * Math.PI * F_M;
    const gamma = omegaM / Q;
    const chi2 = (f: number) => {
      const w = 2 * Math.PI * f;
      const re = MASS * (omegaM ** 2 - w ** 2);
      const im = -MASS * gamma * w;
      return 1 / (re * re + im * im);
    };
    expectAllClose(
      term,
      Array.from(budget.frequencies, (f) => chi2(f) * forceAsd(f) ** 2),
      1e-12,
      "|χ|² S_F",
    );
    const inForce = evaluate(prepare(oscillatorWithForceNoise("force")), grid).budget;
    expectAllClose(
      sumTerms(inForce.terms, "actuator"),
      Array.from(inForce.frequencies, (f) => forceAsd(f) ** 2),
      1e-12,
      "S_F",
    );
  });

  it("is a budget term of its own with the category 'classical', and the total is the quantum total plus it", () => {
    const quiet = evaluate(prepare({ ...oscillatorWithForceNoise("force"), classicalNoise: [] }), grid).budget;
    const noisy = evaluate(prepare(oscillatorWithForceNoise("force")), grid).budget;
    const term = noisy.terms.find((t) => t.owner === "actuator")!;
    expect(term.category).toBe("classical");
    expect(term.label).toBe("actuator: force on body (classical)");
    // The quantum and thermal terms are untouched, bit for bit.
    for (const t of quiet.terms) expect(noisy.terms.find((u) => u.id === t.id)!.psd).toEqual(t.psd);
    expectAllClose(
      noisy.total,
      Array.from(quiet.total, (v, i) => v + term.psd[i]),
      1e-15,
      "total",
    );
  });

  it("a displacement-noise term on a free mass adds directly in displacement (it enters as the force x/χ₀)", () => {
    const asd = (f: number) => 1e-16 * (f / 100) ** -2;
    const setup: SetupDescription = {
      ...probedBody({ body: { mass: "1 g" }, probe: { power: "1 mW", wavelength: "1064 nm" } }),
      classicalNoise: [
        { name: "ground", enters: "displacement", on: "body", spectrum: { frequencyUnit: "kHz", unit: "fm/rtHz", points: [0.001, 0.01, 0.1, 1, 10].map((k) => [k, asd(k * 1e3) * 1e15]) } },
      ],
    };
    const budget = evaluate(prepare(setup), { from: 1, to: 1e4, points: 101 }).budget;
    expectAllClose(
      sumTerms(budget.terms, "ground"),
      Array.from(budget.frequencies, (f) => asd(f) ** 2),
      1e-12,
      "S_x",
    );
  });

  it("a strain-noise term on an interferometer adds directly in strain", () => {
    const example = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "long-baseline-detector.json"), "utf8")) as SetupDescription;
    const hAsd = (f: number) => 3e-24 * (f / 10) ** -4;
    const withStrain: SetupDescription = {
      ...example,
      classicalNoise: [{ name: "newtonian", enters: "strain", on: "ifo", spectrum: { unit: "1/√Hz", points: [1, 10, 100, 1e4].map((f) => [f, hAsd(f)]) } }],
    };
    const quiet = evaluate(prepare(example)).budget;
    const noisy = evaluate(prepare(withStrain)).budget;
    const term = sumTerms(noisy.terms, "newtonian");
    expectAllClose(
      term,
      Array.from(noisy.frequencies, (f) => hAsd(f) ** 2),
      1e-12,
      "S_h",
    );
    expectAllClose(
      noisy.total,
      Array.from(quiet.total, (v, i) => v + term[i]),
      1e-15,
      "total",
    );
    // The export carries it as a column of its own, and the reach is that of the total with it.
    const table = tabulateBudget(noisy, "power");
    expect(Array.from(table.columns.find((c) => c.label.startsWith("newtonian"))!.values)).toEqual(Array.from(term));
    const reach = (b: typeof noisy) => inspiralRange(b.frequencies, b.total).megaparsecs;
    expect(reach(noisy)).toBeLessThan(reach(quiet));
  });

  it("refuses a grid beyond the spectrum unless told how to extend it, naming the end point and the options", () => {
    const setup = oscillatorWithForceNoise("displacement");
    const prepared = prepare(setup);
    let error: unknown;
    try {
      evaluate(prepared, { from: 1e5, to: 3e7, points: 11 });
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(QuietframeError);
    const message = (error as QuietframeError).message;
    expect((error as QuietframeError).path).toBe("classicalNoise[0].spectrum.points[4]");
    expect(message).toContain("covers 100 kHz to 20 MHz");
    expect(message).toContain('"beyondRange": "hold"');
    expect(() => evaluate(prepared, { from: 5e4, to: 1e6, points: 11 })).toThrow(/classicalNoise\[0\]\.spectrum\.points\[0\]/);
    const held = prepare({ ...setup, classicalNoise: [{ ...setup.classicalNoise![0], beyondRange: "hold" }] });
    const budget = evaluate(held, { from: 1e5, to: 3e7, points: 11 }).budget;
    expect(budget.total.every((v) => Number.isFinite(v) && v > 0)).toBe(true);
  });

  it("is refused by the time-domain passes, which take white noise only", () => {
    const prepared = prepare(oscillatorWithForceNoise("displacement"));
    expect(() => stationaryCovariance(prepared.assembled.model)).toThrow(/classical noise terms are spectra, not white noise/);
    // The uncertainty-relation check concerns the quantum noise and still runs.
    expect(prepared.physicality?.physical).toBe(true);
  });
});
