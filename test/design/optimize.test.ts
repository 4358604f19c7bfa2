import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { optimizeDesign } from "../../src/design";
import { probedBody } from "../helpers/setups";

const OMEGA_LASER = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const MASS = 1e-3;

describe("optimization against published optima", () => {
  it("a free mass read by a QND probe without correlations: the best probe power at Ω puts the noise exactly on the SQL there, S_F = ħmΩ² (Braginsky & Khalili, Quantum Measurement, 1992; Kimble et al., PRD 65, 022002 (2001))", () => {
    const f = 100;
    const pSql = (HBAR * MASS * (2 * Math.PI * f) ** 2 * SPEED_OF_LIGHT ** 2) / (8 * HBAR * OMEGA_LASER);
    const s = probedBody({ body: { mass: `${MASS} kg` }, probe: { power: "1 W", wavelength: "1064 nm" } });
    const r = optimizeDesign(s, { kind: "margin-at", frequency: `${f} Hz` }, [{ target: "probe.power", min: "1 mW", max: "1 MW" }], { starts: 3, seed: 5 });
    expect(r.status).toBe("ok");
    expect(Math.abs(r.optimum!.figure)).toBeLessThan(1e-9);
    expect(Math.abs(r.optimum!.values[0].value / pSql - 1)).toBeLessThan(1e-6);
    expect(r.optimum!.values[0].onBound).toBeUndefined();
    expect(r.starts).toHaveLength(3);
    expect(r.starts.every((st) => st.status === "converged")).toBe(true);
  });

  it("squeezed input at one frequency: the best squeeze angle is the frequency-dependent angle θ = −arccot K of Kimble et al. 2001 in the project's convention (noise ∝ cosh 2r − cos 2(θ + Φ) sinh 2r, Φ = arccot K)", () => {
    // 1 kW on 1 g: K = S_F/(ħmΩ²) runs from about 1 at 60 Hz to 0.02 at 400 Hz.
    const power = 1000;
    const sBa = (8 * HBAR * OMEGA_LASER * power) / SPEED_OF_LIGHT ** 2;
    for (const f of [60, 150, 400]) {
      const K = sBa / (HBAR * MASS * (2 * Math.PI * f) ** 2);
      // −Φ lies in (−90°, 0°), inside the range; the noise repeats every 180°.
      const expected = -Math.atan(1 / K);
      const s = probedBody({
        body: { mass: `${MASS} kg` },
        probe: { power: `${power} W` },
        light: { name: "light", type: "squeezed", params: { r: 1, angle: "0 deg" } },
      });
      const r = optimizeDesign(s, { kind: "noise-at", frequency: `${f} Hz` }, [{ target: "light.angle", min: "-170 deg", max: "10 deg" }], { starts: 2 });
      expect(Math.abs(r.optimum!.values[0].value - expected), `${f} Hz`).toBeLessThan(1e-6);
      // The noise there: (S_SQL/2)(K + 1/K) e^(−2r).
      const sql = (2 * HBAR) / (MASS * (2 * Math.PI * f) ** 2);
      expect(Math.abs(r.optimum!.figure / ((sql / 2) * (K + 1 / K) * Math.exp(-2)) - 1), `${f} Hz`).toBeLessThan(1e-9);
    }
  });

  it("reports which parameters sit on a bound: the efficiency at 100 % (its bound), the power inside; at the optimum the noise is the SQL", () => {
    const s = probedBody({ body: { mass: `${MASS} kg` }, probe: { power: "1 W", wavelength: "1064 nm" }, efficiency: 0.7 });
    const r = optimizeDesign(
      s,
      { kind: "margin-at", frequency: "100 Hz" },
      [
        { target: "detector.efficiency", min: "50 %", max: "100 %" },
        { target: "probe.power", min: "1 W", max: "100 kW" },
      ],
      { starts: 2 },
    );
    const [eta, power] = r.optimum!.values;
    expect(eta.onBound).toEqual({ end: "high", kind: "given" });
    expect(eta.value).toBe(1);
    expect(power.onBound).toBeUndefined();
    expect(Math.abs(r.optimum!.figure)).toBeLessThan(1e-8);
    expect(r.message).toMatch(/on a bound: detector\.efficiency \(high end, given\)/);
  });

  it("the same seed gives the same bits; starts beyond the first are seeded random points", () => {
    const s = probedBody({ body: { mass: `${MASS} kg` }, probe: { power: "1 W" }, efficiency: 0.8 });
    const run = (seed: number) => optimizeDesign(s, { kind: "margin-at", frequency: "100 Hz" }, [{ target: "probe.power", min: "1 W", max: "100 kW" }], { starts: 3, seed });
    const a = run(9);
    const b = run(9);
    expect(a.optimum!.values[0].value).toBe(b.optimum!.values[0].value);
    expect(a.starts.map((st) => st.start["probe.power"])).toEqual(b.starts.map((st) => st.start["probe.power"]));
    expect(run(10).starts[1].start["probe.power"]).not.toBe(a.starts[1].start["probe.power"]);
  });

  it("an optimization whose every start is unstable is reported with the reason, not thrown", () => {
    // A blue-detuned cavity anti-damps the free mirror (radiation pressure): every detuning in 1 … 100 Hz is unstable.
    const text = readFileSync(join(__dirname, "..", "..", "examples", "free-test-mass.json"), "utf8");
    const r = optimizeDesign(text, { kind: "best-margin" }, [{ target: "arm.detuning", min: "1 Hz", max: "100 Hz" }], { starts: 3 });
    expect(r.status).toBe("infeasible");
    expect(r.optimum).toBeUndefined();
    expect(r.starts.every((st) => st.status === "infeasible-start")).toBe(true);
    expect(r.message).toMatch(/every start \(3\) has no value for the figure: .*unstable.*grows/);
  });
});
