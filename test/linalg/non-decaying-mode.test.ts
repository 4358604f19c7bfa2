import { describe, expect, it } from "vitest";
import { findNonDecayingMode } from "../../src/linalg/non-decaying-mode";
import { fromRows, matMul, randomOrthogonal, seededRandom, transpose, uniform } from "./helpers";

describe("findNonDecayingMode", () => {
  it("finds an undamped oscillator hidden by random rotations among damped ones (200 cases, n ≤ 40)", () => {
    const rand = seededRandom(5);
    for (let rep = 0; rep < 200; rep++) {
      const n = 2 + 2 * Math.floor(rand() * 20);
      const d = new Float64Array(n * n);
      // Undamped frequency spread over e^±8 relative to the other modes.
      const w0 = Math.exp(8 * uniform(rand));
      d[1] = w0;
      d[n] = -w0;
      for (let b = 2; b < n; b += 2) {
        const w = Math.exp(3 * uniform(rand));
        const g = Math.exp(2 * uniform(rand));
        d[b * n + b + 1] = w;
        d[(b + 1) * n + b] = -w;
        d[(b + 1) * n + b + 1] = -g;
      }
      const q = randomOrthogonal(rand, n);
      const a = matMul(matMul(q, d, n, n, n), transpose(q, n), n, n, n);
      const mode = findNonDecayingMode(a, n);
      expect(mode, `rep ${rep}, n = ${n}`).not.toBeNull();
      expect(mode!.kind).toBe("undamped");
      // It must be the undamped oscillator itself, not a damped mode misjudged.
      expect(Math.abs(Math.abs(mode!.im) - w0) / w0, `rep ${rep}`).toBeLessThan(1e-8);
    }
  });

  it("accepts all-damped rotated systems with damping well above rounding", () => {
    const rand = seededRandom(6);
    for (let rep = 0; rep < 50; rep++) {
      const n = 2 + 2 * Math.floor(rand() * 10);
      const d = new Float64Array(n * n);
      for (let b = 0; b < n; b += 2) {
        const w = Math.exp(3 * uniform(rand));
        d[b * n + b + 1] = w;
        d[(b + 1) * n + b] = -w;
        d[(b + 1) * n + b + 1] = -1e-6 * w; // quality factor 1e6
      }
      const q = randomOrthogonal(rand, n);
      const a = matMul(matMul(q, d, n, n, n), transpose(q, n), n, n, n);
      expect(findNonDecayingMode(a, n), `rep ${rep}`).toBeNull();
    }
  });

  it("keeps a 1e-8 damping next to an uncoupled 1e9 cavity (block norms, not ‖A‖)", () => {
    const a = fromRows([
      [-5e7, 0, 1e9, 0],
      [0, 0, 0, 1],
      [-1e9, 0, -5e7, 0],
      [0, -1, 0, -1e-8],
    ]);
    expect(findNonDecayingMode(a, 4)).toBeNull();
  });

  it("classifies growing modes and zero eigenvalues", () => {
    expect(findNonDecayingMode(Float64Array.from([0.5, 1, -1, 0.1]), 2)?.kind).toBe("growing");
    expect(findNonDecayingMode(Float64Array.from([-1, 5, 0, 0]), 2)).toEqual({ re: 0, im: 0, kind: "undamped" });
  });
});
