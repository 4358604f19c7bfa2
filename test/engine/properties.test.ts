import { describe, expect, it } from "vitest";
import fc from "fast-check";
import { QuietframeError } from "../../src/errors";
import { stationaryCovariance, uncertaintyMargin } from "../../src/engine/covariance";
import { outputSpectra } from "../../src/engine/spectra";
import { assemble } from "../../src/setup/assemble";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import type { ComponentDescription } from "../../src/setup/format";
import { cavityReadout, setup } from "../helpers/setups";

/** Property tests over random valid parameters (fast-check, fixed seeds so CI is deterministic). */

const cavitySetups = fc.record({
  mass: fc.double({ min: -14, max: -6, noNaN: true }), // log10 kg
  fm: fc.double({ min: 3, max: 7, noNaN: true }), // log10 Hz
  q: fc.double({ min: 1, max: 9, noNaN: true }),
  temperature: fc.double({ min: 0, max: 300, noNaN: true }),
  linewidth: fc.double({ min: 4, max: 8, noNaN: true }),
  detuning: fc.double({ min: -3, max: 0, noNaN: true }), // in linewidths, red side only: stable by construction is not assumed
  coupling: fc.double({ min: 0.05, max: 1, noNaN: true }),
  g0: fc.double({ min: 0, max: 3, noNaN: true }),
  photons: fc.double({ min: 0, max: 9, noNaN: true }),
  efficiency: fc.double({ min: 0, max: 1, noNaN: true }),
  // Whole millidegrees: the unit parser rightly refuses subnormal numbers like "5e-324 deg".
  angle: fc.integer({ min: 0, max: 180_000 }).map((m) => m / 1000),
  squeezeDb: fc.integer({ min: -15_000, max: 0 }).map((m) => m / 1000),
  squeezeAngle: fc.integer({ min: 0, max: 180_000 }).map((m) => m / 1000),
  damping: fc.constantFrom("viscous", "symmetric"),
});

type CavityParams = typeof cavitySetups extends fc.Arbitrary<infer T> ? T : never;

function describeCavity(p: CavityParams) {
  const lw = 10 ** p.linewidth;
  return cavityReadout({
    body: { mass: `${10 ** p.mass} kg`, frequency: `${10 ** p.fm} Hz`, Q: 10 ** p.q, temperature: `${p.temperature} K`, damping: p.damping },
    cavity: {
      linewidth: `${lw} Hz`,
      detuning: `${p.detuning * lw} Hz`,
      inputCoupling: p.coupling,
      g0: `${10 ** p.g0} Hz`,
      photons: 10 ** p.photons,
    },
    efficiency: p.efficiency,
    angle: `${p.angle} deg`,
    light: { name: "light", type: "squeezed", params: { squeezing: `${p.squeezeDb} dB`, angle: `${p.squeezeAngle} deg` } },
  });
}

describe("random valid cavity set-ups", () => {
  it("give finite, non-negative spectra whose terms sum to the total, or a clear instability error", () => {
    fc.assert(
      fc.property(cavitySetups, (p) => {
        const s = loadSetup(describeCavity(p));
        const fm = 10 ** p.fm;
        let e;
        try {
          e = evaluateSetup(s, { from: fm / 10, to: fm * 10, points: 40 });
        } catch (err) {
          // A growing mode or a blind readout is the only acceptable refusal, and it must say so.
          expect(err).toBeInstanceOf(QuietframeError);
          expect((err as Error).message).toMatch(/unstable|sees no signal/);
          return;
        }
        const b = e.budget;
        for (let i = 0; i < b.total.length; i++) {
          expect(Number.isNaN(b.total[i])).toBe(false);
          if (!Number.isFinite(b.total[i])) {
            // Only a (nearly) blind readout may leave the finite range, and it must be flagged.
            expect(e.warnings.join(" ")).toMatch(/blind to the signal/);
            continue;
          }
          expect(b.total[i]).toBeGreaterThan(0);
          let sum = 0;
          for (const t of b.terms) {
            expect(t.psd[i]).toBeGreaterThanOrEqual(-1e-12 * b.total[i]);
            sum += t.psd[i];
          }
          expect(Math.abs(sum - b.total[i])).toBeLessThanOrEqual(1e-9 * b.total[i]);
          for (const r of b.references) expect(Number.isFinite(r.psd[i]) && r.psd[i] >= 0).toBe(true);
        }
      }),
      { seed: 20261201, numRuns: 300 },
    );
  });

  it("with symmetric damping, have stationary covariances that satisfy the uncertainty relation V + iΣ/2 ≥ 0", () => {
    fc.assert(
      fc.property(cavitySetups, (p) => {
        p = { ...p, damping: "symmetric" };
        const a = assemble(loadSetup(describeCavity(p)));
        let v: Float64Array;
        try {
          v = stationaryCovariance(a.model);
        } catch {
          return; // unstable or undamped: no stationary state to check
        }
        // Scale the tolerance by the largest variance: a thermal mode can sit at 1e9 quanta.
        let largest = 0;
        for (let i = 0; i < a.model.nStates; i++) largest = Math.max(largest, v[i * a.model.nStates + i]);
        expect(uncertaintyMargin(a.model, v)).toBeGreaterThanOrEqual(-1e-9 * largest);
      }),
      { seed: 4242, numRuns: 300 },
    );
  });
});

describe("lossless beam-splitter networks", () => {
  it("map vacuum inputs to unit output spectra at every frequency (passive optics conserve the vacuum)", () => {
    const splitters = fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 6 });
    fc.assert(
      fc.property(splitters, fc.integer({ min: 0, max: 360_000 }), (ts, milliDegrees) => {
        const angle = milliDegrees / 1000;
        // A chain: vacuum v0 and v1 meet at bs0; out1 goes on to meet v2 at bs1, and so on.
        const components: ComponentDescription[] = [{ name: "v0", type: "vacuum" }];
        const connections: [string, string][] = [];
        let carried = "v0.out";
        ts.forEach((t, k) => {
          components.push({ name: `v${k + 1}`, type: "vacuum" }, { name: `bs${k}`, type: "beam-splitter", params: { transmission: t } });
          connections.push([carried, `bs${k}.in1`], [`v${k + 1}.out`, `bs${k}.in2`]);
          components.push({ name: `d${k}`, type: "homodyne", params: { angle: `${angle} deg` } });
          connections.push([`bs${k}.out2`, `d${k}.in`]);
          carried = `bs${k}.out1`;
        });
        components.push({ name: "detector", type: "homodyne", params: { angle: `${angle} deg` } });
        connections.push([carried, "detector.in"]);
        // A body that nothing touches gives the set-up its required signal target.
        components.push({ name: "body", type: "free-mass", params: { mass: "1 kg" } });
        const a = assemble(loadSetup(setup(components, connections)));
        const rows = a.model.outputs.map((_, i) => i);
        const s = outputSpectra(a.model, rows, Float64Array.of(1, 1e3, 1e6));
        const p = rows.length;
        for (let f = 0; f < 3; f++) {
          for (let i = 0; i < p; i++) {
            for (let j = 0; j < p; j++) {
              const re = s.re[(f * p + i) * p + j];
              const im = s.im[(f * p + i) * p + j];
              expect(Math.abs(re - (i === j ? 1 : 0))).toBeLessThan(1e-12);
              expect(Math.abs(im)).toBeLessThan(1e-12);
            }
          }
        }
      }),
      { seed: 99, numRuns: 200 },
    );
  });
});
