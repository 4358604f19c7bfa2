import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { cavity } from "../../src/components/cavity";
import { cavityInputPower, intracavityPhotons, probePowerForMeasurementRate, reflectionForcePsd } from "../../src/physics/optomechanics";
import { evaluate, loadSetup, prepare } from "../../src/pipeline";
import { CLASS_3B_POWER, CLASS_4_POWER, ELECTRON_GYROMAGNETIC_RATIO } from "../../src/safety/limits";
import { cavitySetup, component, freeMassSetup } from "../setup/fixtures";

/**
 * Safety cautions that follow the physics: a laser power implied by a cavity's photon number,
 * by a position probe's measurement rate or by an interferometer's arm power is classed like a
 * power written directly (Class 4 above 0.5 W, Class 3B above 5 mW: IEC 60825-1 class limits
 * for continuous beams, common practice quoted from memory); cryogenic temperatures and
 * magnetic fields, also those implied by a Larmor frequency, get cautions of their own.
 *
 * Hand computations use CODATA 2018 values written out here: ħ = 1.054571817e-34 J s,
 * c = 299792458 m/s, μ_B = 9.2740100783e-24 J/T, h = 6.62607015e-34 J s.
 */
const HBAR = 1.054571817e-34;
const C = 299792458;
const TWO_PI = 2 * Math.PI;

const EXAMPLES = join(__dirname, "..", "..", "examples");
const example = (name: string): any => JSON.parse(readFileSync(join(EXAMPLES, name), "utf8"));

function cautionsOf(setup: unknown): readonly string[] {
  return prepare(loadSetup(JSON.stringify(setup))).cautions;
}

/** Each caution is one sentence: one full stop, at the end, and it defers to local rules. */
function expectOneSentence(caution: string): void {
  expect(caution.endsWith(".")).toBe(true);
  expect(caution.slice(0, -1)).not.toMatch(/\.\s/);
  expect(caution).toMatch(/local rules|safety rules/);
  expect(caution).toMatch(/licensed practice/);
}

describe("laser power implied by a cavity's intracavity photon number", () => {
  // Aspelmeyer, Kippenberg & Marquardt, Rev. Mod. Phys. 86, 1391 (2014), Sec. II.B: the driven
  // steady state ā = √κ_ex ā_in/(κ/2 − iΔ) with |ā_in|² = P/(ħω_L), so n = κ_ex P/(ħω_L(κ²/4 + Δ²)).
  const handInputPower = (n: number, lambda: number, kappa: number, delta: number, kEx: number): number => {
    const omegaL = (TWO_PI * C) / lambda;
    return (n * HBAR * omegaL * (kappa ** 2 / 4 + delta ** 2)) / kEx;
  };

  it("matches the relation solved for P by hand, and inverts the photon number", () => {
    const kappa = TWO_PI * 5.5e6;
    const cases: [number, number, number, number][] = [
      [1e12, 1064e-9, 0, 1],
      [3e9, 1550e-9, TWO_PI * 2e6, 0.7],
      [1e6, 780e-9, -TWO_PI * 1e7, 0.95],
    ];
    for (const [n, lambda, delta, eta] of cases) {
      const p = cavityInputPower(n, lambda, kappa, delta, eta * kappa);
      expect(p).toBeCloseTo(handInputPower(n, lambda, kappa, delta, eta * kappa), 12);
      expect(Math.abs(p / handInputPower(n, lambda, kappa, delta, eta * kappa) - 1)).toBeLessThan(1e-13);
      expect(Math.abs(intracavityPhotons(p, lambda, kappa, delta, eta * kappa) / n - 1)).toBeLessThan(1e-13);
    }
  });

  it("1e12 photons in a 5.5 MHz cavity at 1064 nm imply about 1.61 W of input light: the Class 4 caution", () => {
    // By hand: ħω_L = 1.054571817e-34 · 2π · 299792458 / 1.064e-6 = 1.8670e-19 J;
    // P = 1e12 · 1.8670e-19 J · (2π · 5.5 MHz)/4 = 1.613 W (Δ = 0, κ_ex = κ).
    const hand = handInputPower(1e12, 1064e-9, TWO_PI * 5.5e6, 0, TWO_PI * 5.5e6);
    expect(hand).toBeGreaterThan(1.6);
    expect(hand).toBeLessThan(1.62);
    const setup = cavitySetup();
    component(setup, "cavity").params = { linewidth: "5.5 MHz", inputCoupling: 1, g0: "150 Hz", photons: 1e12 };
    const cautions = cautionsOf(setup).filter((c) => c.startsWith("'cavity'"));
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toContain("1e+12 intracavity photons");
    expect(cautions[0]).toContain("which implies 1.61 W of input light");
    expect(cautions[0]).toContain("above the Class 4 threshold of 0.5 W");
    expect(cautions[0]).toContain("hazardous laser power");
    expectOneSentence(cautions[0]);
  });

  it("the same caution as the implied power written directly", () => {
    const byPhotons = cavitySetup();
    component(byPhotons, "cavity").params = { linewidth: "5.5 MHz", inputCoupling: 1, g0: "150 Hz", photons: 1e12 };
    const byPower = cavitySetup();
    component(byPower, "cavity").params = { linewidth: "5.5 MHz", inputCoupling: 1, g0: "150 Hz", power: "1.61 W" };
    const implied = cautionsOf(byPhotons).find((c) => c.startsWith("'cavity'"))!;
    const direct = cautionsOf(byPower).find((c) => c.startsWith("'cavity'"))!;
    expect(direct).toContain("'cavity' is driven with 1.61 W of input light");
    // Everything after the power (class, threshold, advice) reads the same.
    expect(implied.slice(implied.indexOf("1.61 W"))).toBe(direct.slice(direct.indexOf("1.61 W")));
  });

  it("detuning and input coupling raise the implied power; the threshold sits at 0.5 W", () => {
    // n for exactly 0.5 W on resonance, then 1 % more and 1 % less.
    const kappa = TWO_PI * 8e6;
    const nAt = (p: number): number => (p * 0.9 * kappa) / (HBAR * ((TWO_PI * C) / 1064e-9) * (kappa ** 2 / 4));
    const classOf = (photons: number, extra: Record<string, unknown> = {}): readonly string[] => {
      const setup = cavitySetup();
      Object.assign(component(setup, "cavity").params, { photons, ...extra });
      return cautionsOf(setup).filter((c) => c.startsWith("'cavity'"));
    };
    expect(classOf(nAt(0.5) * 1.01)[0]).toMatch(/Class 4 threshold of 0\.5 W/);
    expect(classOf(nAt(0.5) * 0.99)[0]).toMatch(/within Class 3B \(above 5 mW and up to 0\.5 W/);
    expect(classOf(nAt(CLASS_3B_POWER) * 0.99)).toEqual([]);
    // Detuned by κ/2 the same photon number needs twice the power (κ²/4 + Δ² doubles). A
    // detuned cavity on the membrane would be unstable, so this asks the component alone.
    const detuned = { linewidth: 8e6, detuning: -4e6, inputCoupling: 0.9, wavelength: 1064e-9, photons: nAt(0.3) };
    const resolved = { name: "cavity", type: "cavity", values: detuned, given: new Set(Object.keys(detuned)), raw: detuned, path: "components.cavity" };
    expect(cavity.cautions!(resolved, {})[0]).toMatch(/which implies 600 mW of input light.*Class 4/);
  });
});

describe("laser power implied by a position probe's measurement rate", () => {
  // Γ_meas = x_zpf² S̄_FF/ħ² (Clerk et al., Rev. Mod. Phys. 82, 1155 (2010)) with the double-sided
  // S̄_FF = S_F/2, x_zpf² = ħ/(2mΩ_m), and the radiation-pressure shot noise of reflected light
  // S_F = 8ħωP/c² (momentum 2ħk per photon, one-sided photon-flux PSD 2P/(ħω); Caves, Phys. Rev. D
  // 23, 1693 (1981)). Solved for P: P = mΩ_mΓc²/(2ω) = mΩ_mΓcλ/(4π).
  const handProbePower = (rate: number, lambda: number, mass: number, omegaM: number): number => (mass * omegaM * rate * C * lambda) / (4 * Math.PI);

  it("matches mΩ_mΓcλ/(4π) by hand and gives back the back-action of the rate", () => {
    const p = probePowerForMeasurementRate(TWO_PI * 30e3, 852e-9, 4e-12, TWO_PI * 1.1e6);
    // By hand: 4e-12 kg · 6.9115e6 s⁻¹ · 1.8850e5 s⁻¹ · 299792458 m/s · 852e-9 m / (4π) = 106.0 W.
    expect(p).toBeGreaterThan(105.5);
    expect(p).toBeLessThan(106.5);
    expect(Math.abs(p / handProbePower(TWO_PI * 30e3, 852e-9, 4e-12, TWO_PI * 1.1e6) - 1)).toBeLessThan(1e-13);
    // S_F of that power against 2Γħ²/x_zpf² = 4mΩ_mħΓ.
    const sF = reflectionForcePsd(p, 852e-9);
    expect(Math.abs(sF / (4 * 4e-12 * TWO_PI * 1.1e6 * HBAR * TWO_PI * 30e3) - 1)).toBeLessThan(1e-12);
  });

  it("a rate implying hundreds of kW raises the Class 4 caution naming the body, the rate and the power", () => {
    // 10 µg at 2 MHz read at 30 kHz through 1064 nm light: by hand
    // 1e-8 · 1.2566e7 · 1.8850e5 · 299792458 · 1.064e-6 / (4π) = 6.01e5 W.
    const hand = handProbePower(TWO_PI * 30e3, 1064e-9, 1e-8, TWO_PI * 2e6);
    expect(hand).toBeGreaterThan(6.0e5);
    expect(hand).toBeLessThan(6.02e5);
    const setup = example("hybrid-spin-reference.json");
    component(setup, "membrane").params = { mass: "10 ug", frequency: "2 MHz", Q: 1e6, temperature: "300 K" };
    component(setup, "probe").params = { measurementRate: "30 kHz", wavelength: "1064 nm" };
    const cautions = cautionsOf(setup).filter((c) => c.startsWith("'probe'"));
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toContain("'probe' reaches a measurement rate of 30 kHz on 'membrane' (10 µg, 2 MHz), which implies 601 kW of probe light at 1.064 µm");
    expect(cautions[0]).toContain("above the Class 4 threshold of 0.5 W");
    expectOneSentence(cautions[0]);
  });

  it("the implied power, written as the probe's power, gives the same noise budget", () => {
    const byRate = example("hybrid-spin-reference.json");
    const byPower = example("hybrid-spin-reference.json");
    const implied = probePowerForMeasurementRate(TWO_PI * 30e3, 852e-9, 4e-12, TWO_PI * 1.1e6);
    component(byPower, "probe").params = { power: `${implied} W`, wavelength: "852 nm" };
    const grid = { from: 1.05e6, to: 1.15e6, points: 7 };
    const a = evaluate(prepare(loadSetup(JSON.stringify(byRate))), grid).budget.total;
    const b = evaluate(prepare(loadSetup(JSON.stringify(byPower))), grid).budget.total;
    for (let i = 0; i < a.length; i++) expect(Math.abs(b[i] / a[i] - 1)).toBeLessThan(1e-9);
    const direct = cautionsOf(byPower).find((c) => c.startsWith("'probe'"))!;
    expect(direct).toContain("'probe' uses 106 W of probe light");
  });

  it("the shipped hybrid example's 30 kHz rate on 4 ng at 1.1 MHz implies about 106 W", () => {
    const cautions = cautionsOf(example("hybrid-spin-reference.json"));
    expect(cautions.find((c) => c.startsWith("'probe'"))).toContain(
      "which implies 106 W of probe light at 852 nm reflected once off the body (a cavity's build-up lowers what the source must give): hazardous laser power",
    );
  });
});

describe("arm power of an interferometer", () => {
  it("750 kW per arm raises the Class 4 caution with the beam-splitter power I0 = 2Lγ·P_arm/c", () => {
    // By hand: 2 · 4000 m · 2π · 45 Hz · 750 kW / 299792458 m/s = 5659 W.
    const cautions = cautionsOf(example("long-baseline-detector.json"));
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toContain("'ifo' circulates 750 kW in each arm (about 5.66 kW at the beam splitter without losses)");
    expect(cautions[0]).toContain("above the Class 4 threshold of 0.5 W");
    expectOneSentence(cautions[0]);
  });
});

describe("Class 3B note for powers written directly", () => {
  const probeAt = (power: string): readonly string[] => {
    const setup = freeMassSetup();
    component(setup, "probe").params.power = power;
    return cautionsOf(setup);
  };

  it.each([
    ["5 mW", "none"],
    ["5.1 mW", "3B"],
    ["10 mW", "3B"],
    ["0.5 W", "3B"],
    ["0.51 W", "4"],
  ])("%s of probe light: %s", (power, expected) => {
    const cautions = probeAt(power);
    if (expected === "none") {
      expect(cautions).toEqual([]);
      return;
    }
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toMatch(expected === "4" ? /Class 4 threshold of 0\.5 W/ : /within Class 3B \(above 5 mW and up to 0\.5 W/);
    expectOneSentence(cautions[0]);
  });

  it("the thresholds are the IEC 60825-1 class limits for continuous beams (common practice)", () => {
    expect(CLASS_4_POWER).toBe(0.5);
    expect(CLASS_3B_POWER).toBe(5e-3);
  });
});

describe("cryogenic temperatures", () => {
  it("an oscillator or a bath at or below 4.2 K gets a caution naming it and its temperature", () => {
    const setup = cavitySetup();
    component(setup, "membrane").params.temperature = "20 mK";
    setup.components.push({ name: "gas", type: "thermal-bath", params: { temperature: "4 K", dampingRate: "1 Hz" } });
    setup.connections.push(["gas.mechanics", "membrane.body"]);
    const cautions = cautionsOf(setup);
    expect(cautions).toHaveLength(2);
    expect(cautions[0]).toContain("'membrane' is at 20 mK, at or below 4.2 K");
    expect(cautions[1]).toContain("'gas' is at 4 K, at or below 4.2 K");
    for (const c of cautions) {
      expect(c).toMatch(/displace oxygen/);
      expectOneSentence(c);
    }
  });

  it("6 K and room temperature get none", () => {
    expect(cautionsOf(cavitySetup())).toEqual([]);
    const warm = cavitySetup();
    component(warm, "membrane").params.temperature = "300 K";
    expect(cautionsOf(warm)).toEqual([]);
  });
});

describe("magnetic fields", () => {
  it("the free electron's gyromagnetic ratio is CODATA 2018's 28 024.951 4242 MHz/T", () => {
    expect(Math.abs(ELECTRON_GYROMAGNETIC_RATIO / 28024.9514242e6 - 1)).toBeLessThan(1e-10);
  });

  const cellWith = (params: Record<string, unknown>): any => {
    const setup = example("hybrid-spin-reference.json");
    const cell = component(setup, "cell");
    const { field: _f, gyromagneticRatio: _g, ...rest } = cell.params;
    cell.params = { ...rest, ...params };
    return setup;
  };

  it("a field given directly at or above 0.5 mT", () => {
    const cautions = cautionsOf(cellWith({ field: "2 mT", gyromagneticRatio: "3.5 GHz/T" })).filter((c) => c.startsWith("'cell'"));
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toContain("'cell' uses a static magnetic field of 2 mT, at or above 0.5 mT (5 G)");
    expectOneSentence(cautions[0]);
    expect(cautionsOf(cellWith({ field: "0.3143 mT", gyromagneticRatio: "3.5 GHz/T" })).filter((c) => c.startsWith("'cell'"))).toEqual([]);
  });

  it("a Larmor frequency implies at least f_L/(28.02 GHz/T)", () => {
    // By hand: 20 MHz / 28.025 GHz/T = 0.7136 mT ≥ 0.5 mT; 1.1 MHz gives 39 µT, below it.
    const cautions = cautionsOf(cellWith({ larmorFrequency: "20 MHz" })).filter((c) => c.startsWith("'cell'"));
    expect(cautions).toHaveLength(1);
    expect(cautions[0]).toContain("'cell' precesses at a Larmor frequency of 20 MHz, which implies a static magnetic field of at least 714 µT");
    expect(cautions[0]).toContain("at or above 0.5 mT (5 G)");
    expectOneSentence(cautions[0]);
    expect(cautionsOf(cellWith({ larmorFrequency: "1.1 MHz" })).filter((c) => c.startsWith("'cell'"))).toEqual([]);
  });
});
