import { describe, expect, it } from "vitest";
import { outputSpectra } from "../../src/engine/spectra";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { conditionalTransient, simulateTrajectory, stationaryCovariance, type JointVariable } from "../../src/timedomain";
import { probedBody } from "../helpers/setups";
import { stiffCavityBody } from "./helpers";

const oscillator = (extra: Record<string, string | number>, rate: string, efficiency = 0.9) =>
  assemble(
    loadSetup(
      probedBody({
        bodyType: "oscillator",
        body: { mass: "1 ng", damping: "symmetric", ...extra } as never,
        probe: { measurementRate: rate },
        efficiency,
      }),
    ),
  ).model;

const X: JointVariable = { label: "x", terms: [{ component: "body", quadrature: "x", weight: 1 }] };
const P: JointVariable = { label: "p", terms: [{ component: "body", quadrature: "p", weight: 1 }] };
const XP: JointVariable = {
  label: "x + p",
  terms: [
    { component: "body", quadrature: "x", weight: 1 },
    { component: "body", quadrature: "p", weight: 1 },
  ],
};

/**
 * Bound on a chi-square sum of M independent unit-variance terms: mean M, standard deviation
 * √(2M); five standard deviations (the distribution is near normal for M ≥ 500; Wilson &
 * Hilferty, PNAS 17, 684 (1931)). The seeds are fixed, so the outcome is deterministic.
 */
function expectChiSquare(sum: number, m: number, what: string): void {
  expect(Math.abs(sum - m), `${what}: χ² = ${sum.toFixed(1)} for ${m} degrees of freedom`).toBeLessThan(5 * Math.sqrt(2 * m));
}

describe("sampled runs have the statistics the covariances promise", () => {
  const model = oscillator({ frequency: "100 kHz", Q: 1e3, temperature: "1 mK" }, "10 kHz");
  const runs = 1000;
  const settings = { duration: 2e-5, step: 1e-7, samples: 11 };
  const finals = Array.from({ length: runs }, (_, seed) => simulateTrajectory(model, { ...settings, seed }, { joint: [X, P, XP] }));

  it("estimation error truth − estimate at the end of each run: Σ e²/P follows χ² with one degree per run (Kalman filter error covariance)", () => {
    for (let v = 0; v < 3; v++) {
      let sum = 0;
      for (const r of finals) {
        const s = r.joint[v];
        const last = s.truth.length - 1;
        const e = s.truth[last] - s.estimate[last];
        sum += (e * e) / s.conditional[last];
      }
      expectChiSquare(sum, runs, finals[0].joint[v].label);
    }
  });

  it("the hidden state itself: Σ truth²/V_unconditional follows χ² (stationary start, so V stays the Lyapunov solution)", () => {
    const v = stationaryCovariance(model);
    const n = model.nStates;
    for (let k = 0; k < 2; k++) {
      let sum = 0;
      for (const r of finals) {
        const s = r.joint[k];
        const last = s.truth.length - 1;
        expect(s.unconditional[last] / v[k * n + k]).toBeCloseTo(1, 10);
        sum += (s.truth[last] * s.truth[last]) / s.unconditional[last];
      }
      expectChiSquare(sum, runs, `${finals[0].joint[k].label} (unconditional)`);
    }
  });

  it("a mis-stated variance would fail the same bound: the estimation error against 80 % of the conditional variance is far outside it", () => {
    let sum = 0;
    for (const r of finals) {
      const s = r.joint[0];
      const last = s.truth.length - 1;
      const e = s.truth[last] - s.estimate[last];
      sum += (e * e) / (0.8 * s.conditional[last]);
    }
    expect(Math.abs(sum - runs)).toBeGreaterThan(5 * Math.sqrt(2 * runs));
  });

  it("the filter's covariance (records integrated per step) tends to the Kalman–Bucy solution as the step shrinks, at least at first order in h", () => {
    const t = 2e-5;
    const exact = conditionalTransient(model, stationaryCovariance(model), Float64Array.of(t))[0];
    const errorAt = (step: number): number => {
      const r = simulateTrajectory(model, { duration: t, step, seed: 1, samples: 2 }, { joint: [X] });
      return r.joint[0].conditional[1] - exact[0];
    };
    const coarse = errorAt(4e-7);
    const fine = errorAt(1e-7);
    // Less information than the continuous record: never below it.
    expect(coarse).toBeGreaterThan(0);
    expect(fine).toBeGreaterThan(0);
    // First order would give a ratio of 4 for a 4× shorter step; a smooth measured
    // coordinate loses less (about h², a ratio near 16, here). Either way at least 3.6.
    expect(coarse / fine).toBeGreaterThan(3.6);
    expect(fine / exact[0]).toBeLessThan(1e-3);
  });

  it("the filter is frozen once it has reached its steady state (doubling limit of the discrete Riccati map), without a jump", () => {
    const steps = 3000;
    const r = simulateTrajectory(model, { duration: steps * 1e-7, step: 1e-7, seed: 2, samples: steps + 1 }, { joint: [X, P] });
    const at = r.filterSettledAtStep!;
    expect(at).toBeGreaterThan(1);
    expect(at).toBeLessThan(steps);
    for (const s of r.joint) {
      const c = s.conditional;
      // The recursion had stopped moving (at the 1e-9 level) when it was frozen.
      expect(Math.abs(c[at] - c[at - 1])).toBeLessThan(1e-9 * c[at]);
      expect(c[at - 1]).not.toBe(c[at - 2]);
      expect(c[steps]).toBe(c[at]);
    }
  });

  it("every conditional covariance met in the runs satisfies the uncertainty relation", () => {
    for (const r of finals.slice(0, 20)) expect(r.minUncertaintyMargin).toBeGreaterThanOrEqual(-1e-12);
  });
});

/** In-place radix-2 FFT (test helper; common practice, no source). */
function fft(re: Float64Array, im: Float64Array): void {
  const n = re.length;
  for (let i = 1, j = 0; i < n; i++) {
    let bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) {
      [re[i], re[j]] = [re[j], re[i]];
      [im[i], im[j]] = [im[j], im[i]];
    }
  }
  for (let len = 2; len <= n; len <<= 1) {
    const ang = (-2 * Math.PI) / len;
    for (let i = 0; i < n; i += len) {
      for (let k = 0; k < len / 2; k++) {
        const wr = Math.cos(ang * k);
        const wi = Math.sin(ang * k);
        const a = i + k;
        const b = a + len / 2;
        const xr = re[b] * wr - im[b] * wi;
        const xi = re[b] * wi + im[b] * wr;
        re[b] = re[a] - xr;
        im[b] = im[a] - xi;
        re[a] += xr;
        im[a] += xi;
      }
    }
  }
}

describe("Wiener–Khinchin: the PSD of a long simulated record is the engine's output spectrum", () => {
  it("averaged Hann-windowed periodogram within 5 standard errors over 0.3 … 3 kHz bands", () => {
    // Broad resonance (Q = 4) so that the 12 Hz resolution resolves it; n̄ ≈ 10 at 1 kHz.
    const model = oscillator({ frequency: "1 kHz", Q: 4, temperature: "0.5 µK" }, "100 Hz", 0.8);
    const h = 2e-5;
    const seg = 4096;
    const runs = 30;
    const samples = 100_000;
    const bins = seg / 2;
    const psd = new Float64Array(bins);
    let segments = 0;
    // Hann window: its leakage falls as 1/f³, so the steep flanks of the resonance are not
    // lifted by the peak, as they are with no window (Harris, Proc. IEEE 66, 51 (1978)).
    const hann = Float64Array.from({ length: seg }, (_, i) => 0.5 - 0.5 * Math.cos((2 * Math.PI * i) / seg));
    const hannPower = hann.reduce((a, w) => a + w * w, 0);
    for (let seed = 0; seed < runs; seed++) {
      const r = simulateTrajectory(model, { duration: (samples - 1) * h, step: h, seed: 100 + seed, samples, initial: "stationary" }, { joint: [] });
      const y = r.records[0].values;
      // y[0] repeats y[1] (no interval ends at t = 0): start at 1.
      for (let start = 1; start + seg <= y.length; start += seg) {
        const re = Float64Array.from(y.subarray(start, start + seg), (x, i) => x * hann[i]);
        const im = new Float64Array(seg);
        fft(re, im);
        // One-sided periodogram of a sequence with sampling interval h, window w: (2h/Σw²)|X_k|².
        for (let k = 1; k < bins; k++) psd[k] += ((2 * h) / hannPower) * (re[k] * re[k] + im[k] * im[k]);
        segments++;
      }
    }
    for (let k = 0; k < bins; k++) psd[k] /= segments;
    const df = 1 / (seg * h);
    const freqs = Float64Array.from({ length: bins }, (_, k) => k * df);
    const engine = outputSpectra(
      model,
      [0],
      freqs.map((f) => Math.max(f, 1e-3)),
    ).re;
    // The record is y averaged over each step: the sequence has Σ_j S(f + j/h) sinc²(π(f + j/h)h).
    // The white floor (1) folds back to exactly 1; the resonant excess is negligible above Nyquist.
    const expected = (k: number): number => {
      const x = Math.PI * freqs[k] * h;
      const sinc2 = (Math.sin(x) / x) ** 2;
      return 1 + (engine[k] - 1) * sinc2;
    };
    const peak = Math.max(...Array.from({ length: bins }, (_, k) => (k > 0 ? expected(k) : 0)));
    expect(peak, "the resonance stands well above the vacuum floor, so the check is not only the floor").toBeGreaterThan(5);
    const band = 32;
    for (let k0 = Math.round(300 / df); k0 + band <= Math.round(3000 / df); k0 += band) {
      let got = 0;
      let want = 0;
      for (let k = k0; k < k0 + band; k++) {
        got += psd[k];
        want += expected(k);
      }
      // Each periodogram ordinate is S·χ²₂/2 (relative s.d. 1). With the Hann window,
      // neighbouring ordinates are correlated (coefficient correlation 2/3 at one bin, 1/6 at
      // two), which multiplies the variance of a band mean by 1 + 2(4/9) + 2(1/36) = 35/18
      // (Welch, IEEE Trans. Audio Electroacoust. 15, 70 (1967)); five standard errors.
      const tol = 5 * Math.sqrt(35 / 18 / (segments * band));
      expect(Math.abs(got / want - 1), `${(k0 * df).toFixed(0)}–${((k0 + band) * df).toFixed(0)} Hz`).toBeLessThan(tol);
    }
  });
});

describe("a stiff set-up simulated with a step far longer than its fastest time scale", () => {
  // Cavity field decays in ~1e-8 s, the Q = 1e7 oscillator in ~16 s; step 1 µs.
  const model = stiffCavityBody();
  const duration = 5e-3;
  const r = simulateTrajectory(model, { duration, step: 1e-6, seed: 9, samples: 51 }, { joint: [X] });

  it("stays finite and physical, keeps the stationary unconditional variance, and knows no more than the continuous record", () => {
    const s = r.joint[0];
    expect(s.truth.every(Number.isFinite) && s.estimate.every(Number.isFinite)).toBe(true);
    const v = stationaryCovariance(model);
    const n = model.nStates;
    const { x } = model.modes.find((m) => m.owner === "body")!;
    for (let j = 0; j < r.time.length; j++) expect(s.unconditional[j] / v[x * n + x]).toBeCloseTo(1, 8);
    expect(r.minUncertaintyMargin).toBeGreaterThanOrEqual(-1e-9 * v[x * n + x]);
    const continuous = conditionalTransient(model, v, Float64Array.of(duration))[0][x * n + x];
    const last = s.conditional[r.time.length - 1];
    expect(last).toBeGreaterThanOrEqual(continuous * (1 - 1e-9));
    // Measured well below the thermal variance (n̄ ≈ 8e5) by the end.
    expect(last).toBeLessThan(1e-2 * v[x * n + x]);
  });
});
