import { beforeAll, describe, expect, it } from "vitest";
import { loadMathjs, type MathJs } from "../helpers/mathjs";
import { checkPhysicality, diffusionMatrix, fastUncertaintyMargin, stationaryCovariance, uncertaintyMargin } from "../../src/engine/covariance";
import { assemble } from "../../src/setup/assemble";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { thermalOccupation } from "../../src/reference/limits";
import { GaussianSource } from "../../src/timedomain/random";
import { cavityReadout, setup } from "../helpers/setups";
import { handModel } from "../timedomain/helpers";

function toRows(a: Float64Array, n: number): number[][] {
  return Array.from({ length: n }, (_, i) => Array.from(a.subarray(i * n, i * n + n)));
}

describe("stationary covariance", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });
  const membrane = assemble(
    loadSetup(
      cavityReadout({
        body: { mass: "5 ng", frequency: "1.2 MHz", Q: 1e6, temperature: "6 K" },
        cavity: { linewidth: "8 MHz", detuning: "-2 MHz", inputCoupling: 0.9, g0: "150 Hz", photons: 1e7 },
        efficiency: 0.9,
      }),
    ),
  );

  it("agrees with mathjs lyap on the same matrices (mathjs as reference)", () => {
    const { model } = membrane;
    const n = model.nStates;
    const v = stationaryCovariance(model);
    // mathjs lyap(A, Q) solves A P + P Aᵀ + Q = 0, the same equation as ours.
    const ref = math.lyap(toRows(model.A, n), toRows(diffusionMatrix(model), n)) as number[][];
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        const a = v[i * n + j];
        const b = ref[i][j];
        expect(Math.abs(a - b), `V[${i}][${j}]`).toBeLessThanOrEqual(1e-8 * Math.max(Math.abs(b), 1e-3 * Math.abs(ref[i][i])));
      }
    }
  });

  it("satisfies the uncertainty relation V + iΣ/2 ≥ 0 (physics notes §3)", () => {
    expect(uncertaintyMargin(membrane.model, stationaryCovariance(membrane.model))).toBeGreaterThanOrEqual(0);
  });

  it("puts a lone oscillator in its bath at variance n̄ + 1/2 in each quadrature (quantum FDT, Bose–Einstein occupation)", () => {
    for (const T of [0, 1e-3, 4]) {
      const lone = assemble(
        loadSetup(
          setup(
            [
              { name: "light", type: "vacuum" },
              { name: "body", type: "oscillator", params: { mass: "1 ng", frequency: "50 MHz", Q: 1e5, temperature: `${T} K` } },
              { name: "probe", type: "position-probe", params: { measurementRate: "0 Hz" } },
              { name: "detector", type: "homodyne" },
            ],
            [
              ["light.out", "probe.in"],
              ["probe.out", "detector.in"],
              ["probe.mechanics", "body.body"],
            ],
          ),
        ),
      );
      const v = stationaryCovariance(lone.model);
      const nbar = thermalOccupation(2 * Math.PI * 50e6, T);
      const body = lone.model.modes.find((m) => m.owner === "body")!;
      const n = lone.model.nStates;
      expect(Math.abs(v[body.x * n + body.x] / (nbar + 0.5) - 1)).toBeLessThan(1e-9);
      expect(Math.abs(v[body.p * n + body.p] / (nbar + 0.5) - 1)).toBeLessThan(1e-9);
      expect(Math.abs(v[body.x * n + body.p])).toBeLessThan(1e-12);
    }
  });

  it("a lossless cavity mode driven by vacuum sits at the vacuum variance 1/2", () => {
    const v = stationaryCovariance(membrane.model);
    const cav = membrane.model.modes.find((m) => m.kind === "optical")!;
    // With the mechanics coupled the cavity is not in vacuum; check the variance is at least 1/2.
    const n = membrane.model.nStates;
    expect(v[cav.x * n + cav.x]).toBeGreaterThanOrEqual(0.5 - 1e-12);
  });
});

describe("damping models and the uncertainty relation", () => {
  const strongLowQ = (damping: string) =>
    loadSetup(
      cavityReadout({
        body: { mass: "1 ng", frequency: "1 MHz", Q: 2, temperature: "0 K", damping },
        cavity: { linewidth: "2 MHz", detuning: "-1 MHz", g0: "100 Hz", photons: 1e6 },
      }),
    );

  it("flags the viscous (Brownian) model when it leaves its validity range (Q = 2 at 0 K)", () => {
    const e = evaluateSetup(strongLowQ("viscous"), { from: 1e5, to: 1e7, points: 5 });
    expect(e.physicality!.physical).toBe(false);
    expect(e.warnings.join(" ")).toMatch(/violates the uncertainty relation.*symmetric/);
  });

  it("decides as the smallest eigenvalue of V + iΣ/2 does, and reports that eigenvalue, on both sides of the validity range (common practice, no source: the rule itself)", () => {
    let physical = 0;
    let unphysical = 0;
    for (const damping of ["viscous", "symmetric"] as const) {
      for (const Q of [0.5, 2, 10, 100, 1e4]) {
        for (const temperature of ["0 K", "1 mK", "1 K", "300 K"]) {
          const s = cavityReadout({
            body: { mass: "1 ng", frequency: "1 MHz", Q, temperature, damping },
            cavity: { linewidth: "2 MHz", detuning: "-1 MHz", g0: "100 Hz", photons: 1e6 },
          });
          const model = assemble(loadSetup(s)).model;
          const v = stationaryCovariance(model);
          let largest = 0;
          for (let i = 0; i < model.nStates; i++) largest = Math.max(largest, v[i * model.nStates + i]);
          const margin = uncertaintyMargin(model, v);
          const report = checkPhysicality(model);
          const where = `${damping}, Q = ${Q}, ${temperature}`;
          expect(report.physical, where).toBe(margin >= -1e-9 * largest);
          expect(Object.is(report.margin, margin), where).toBe(true);
          expect(report.largestVariance, where).toBe(largest);
          if (report.physical) physical++;
          else unphysical++;
        }
      }
    }
    expect(physical).toBeGreaterThan(5);
    expect(unphysical).toBeGreaterThan(2);
  });

  it("keeps the symmetric (Lindblad) model physical in the same set-up", () => {
    const e = evaluateSetup(strongLowQ("symmetric"), { from: 1e5, to: 1e7, points: 5 });
    expect(e.physicality!.physical).toBe(true);
    expect(e.physicality!.margin).toBeGreaterThanOrEqual(-1e-9 * e.physicality!.largestVariance);
  });
});

/** Deterministic test matrices (seeded; invented data). */
function randomSymmetric(m: number, seed: number): Float64Array {
  const g = new GaussianSource(seed);
  const a = new Float64Array(m * m);
  for (let i = 0; i < m; i++) for (let j = 0; j <= i; j++) a[i * m + j] = a[j * m + i] = g.normal();
  return a;
}

describe("uncertainty margin by the faster solver", () => {
  it("the uncertainty margin equals uncertaintyMargin of engine/covariance.ts", () => {
    const model = handModel({
      modes: ["a", "b", "c"],
      A: Array.from({ length: 6 }, () => new Array(6).fill(0)),
      B: Array.from({ length: 6 }, () => []),
      N: [],
    });
    for (let seed = 0; seed < 10; seed++) {
      const r = randomSymmetric(6, seed);
      // V = RRᵀ/6 + I/2 (positive, near the quantum limit).
      const v = new Float64Array(36);
      for (let i = 0; i < 6; i++)
        for (let j = 0; j < 6; j++) {
          let s = i === j ? 0.5 : 0;
          for (let k = 0; k < 6; k++) s += (r[i * 6 + k] * r[j * 6 + k]) / 6;
          v[i * 6 + j] = s;
        }
      expect(Math.abs(fastUncertaintyMargin(model.modes, v, 6) - uncertaintyMargin(model, v))).toBeLessThan(1e-13);
    }
    // Vacuum: the margin is exactly 0 (pure state at the limit).
    const vacuum = new Float64Array(36);
    for (let i = 0; i < 6; i++) vacuum[i * 7] = 0.5;
    expect(Math.abs(fastUncertaintyMargin(model.modes, vacuum, 6))).toBeLessThan(1e-15);
  });
});
