import { describe, expect, it } from "vitest";
import { brentMinimum } from "../../src/design/brent-minimum";
import { brentRoot } from "../../src/design/brent-root";
import { minimizeInBox } from "../../src/design/nelder-mead";
import { meanAndDeviation, quantileSorted } from "../../src/design/quantile";
import { riddersDerivative } from "../../src/design/ridders-derivative";

/** Maps the unit box onto [lo, hi]ⁿ so that the test functions keep their published domains. */
function onBox(f: (x: number[]) => number, lo: number[], hi: number[]) {
  const x = (u: Float64Array): number[] => Array.from(u, (v, k) => lo[k] + v * (hi[k] - lo[k]));
  return { f: (u: Float64Array) => f(x(u)), x, u: (p: number[]) => Float64Array.from(p, (v, k) => (v - lo[k]) / (hi[k] - lo[k])) };
}

describe("bounded Nelder–Mead on standard test functions", () => {
  it("Rosenbrock's function 100(y − x²)² + (1 − x)² has its minimum 0 at (1, 1) (Rosenbrock, Computer J. 3 (1960) 175; Moré, Garbow & Hillstrom, ACM TOMS 7 (1981) 17, problem 1), from the classic start (−1.2, 1)", () => {
    const box = onBox(([x, y]) => 100 * (y - x * x) ** 2 + (1 - x) ** 2, [-2, -2], [2, 2]);
    const r = minimizeInBox(box.f, box.u([-1.2, 1]), { xTolerance: 1e-12, maxEvaluations: 5000 });
    const [x, y] = box.x(r.u);
    expect(r.converged).toBe(true);
    expect(Math.abs(x - 1)).toBeLessThan(1e-6);
    expect(Math.abs(y - 1)).toBeLessThan(1e-6);
    expect(r.f).toBeLessThan(1e-12);
  });

  it("Beale's function (1.5 − x + xy)² + (2.25 − x + xy²)² + (2.625 − x + xy³)² has its minimum 0 at (3, 0.5) (Beale 1958; Moré, Garbow & Hillstrom 1981, problem 5), from (1, 1) on [−4.5, 4.5]²", () => {
    const beale = ([x, y]: number[]) => (1.5 - x + x * y) ** 2 + (2.25 - x + x * y * y) ** 2 + (2.625 - x + x * y ** 3) ** 2;
    const box = onBox(beale, [-4.5, -4.5], [4.5, 4.5]);
    const r = minimizeInBox(box.f, box.u([1, 1]), { xTolerance: 1e-12, maxEvaluations: 5000 });
    const [x, y] = box.x(r.u);
    expect(Math.abs(x - 3)).toBeLessThan(1e-6);
    expect(Math.abs(y - 0.5)).toBeLessThan(1e-6);
    expect(r.f).toBeLessThan(1e-12);
  });

  it("a quadratic (x − 2)² + (y − 0.5)² on [0, 1]² has its bounded minimum on the edge x = 1 at (1, 0.5), value 1 (the projection of the free minimum (2, 0.5) onto the box, by the KKT conditions)", () => {
    const box = onBox(([x, y]) => (x - 2) ** 2 + (y - 0.5) ** 2, [0, 0], [1, 1]);
    const r = minimizeInBox(box.f, box.u([0.2, 0.9]), { xTolerance: 1e-12 });
    const [x, y] = box.x(r.u);
    expect(x).toBe(1);
    expect(Math.abs(y - 0.5)).toBeLessThan(1e-6);
    expect(Math.abs(r.f - 1)).toBeLessThan(1e-12);
  });

  it("moves away from infeasible points (+Infinity) like from any worse point: (x − 0.9)² + (y − 0.9)² with x + y > 1.2 infeasible ends on the line x + y = 1.2 at (0.6, 0.6), value 0.18 (the projection of (0.9, 0.9) onto the half-plane)", () => {
    const box = onBox(([x, y]) => (x + y > 1.2 ? Infinity : (x - 0.9) ** 2 + (y - 0.9) ** 2), [0, 0], [1, 1]);
    for (const start of [
      [0.1, 0.1],
      [0.9, 0.1],
      [0.05, 0.9],
    ]) {
      const r = minimizeInBox(box.f, box.u(start), { xTolerance: 1e-12, maxEvaluations: 4000 });
      const [x, y] = box.x(r.u);
      expect(Math.abs(x - 0.6), `from ${start}`).toBeLessThan(1e-6);
      expect(Math.abs(y - 0.6), `from ${start}`).toBeLessThan(1e-6);
      expect(Math.abs(r.f - 0.18)).toBeLessThan(1e-12);
    }
  });
});

describe("Brent's root and minimum", () => {
  it("finds the root of x³ − 2x − 5 near 2.0945514815423265 (Wallis's equation; the value of Brent 1973, ch. 4 test problems)", () => {
    const f = (x: number) => x ** 3 - 2 * x - 5;
    const r = brentRoot(f, 2, 3, f(2), f(3), 1e-15);
    expect(Math.abs(r.x - 2.0945514815423265)).toBeLessThan(1e-14);
  });

  it("takes the sign of an infinite value and bisects there: a step function from −∞ to +1 at x = 0.3 has its edge found to the tolerance", () => {
    const f = (x: number) => (x < 0.3 ? -Infinity : 1);
    const r = brentRoot(f, 0, 1, f(0), f(1), 1e-12);
    expect(Math.abs(r.x - 0.3)).toBeLessThan(1e-11);
    expect(r.fx).toBe(1);
  });

  it("minimizes cos x on [3, 4] at π and x⁴ − 2x on [0, 2] at (1/2)^(1/3) (from df/dx = 0)", () => {
    const a = brentMinimum(Math.cos, 3, 4, 3.5, Math.cos(3.5), 1e-10, 1e-12);
    expect(Math.abs(a.x - Math.PI)).toBeLessThan(1e-7);
    const g = (x: number) => x ** 4 - 2 * x;
    const b = brentMinimum(g, 0, 2, 1.5, g(1.5), 1e-10, 1e-12);
    expect(Math.abs(b.x - Math.cbrt(0.5))).toBeLessThan(1e-7);
  });
});

describe("Ridders' extrapolated differences", () => {
  it("d/dx eˣ at 1 is e, central and one-sided, each within its stated error (and the error is small)", () => {
    for (const kind of ["central", "forward", "backward"] as const) {
      const d = riddersDerivative(Math.exp, 1, 0.1, kind, Math.exp(1))!;
      expect(Math.abs(d.value - Math.E), kind).toBeLessThanOrEqual(Math.max(d.error, 4e-16 * Math.E) * 2);
      expect(d.error, kind).toBeLessThan(kind === "central" ? 1e-11 : 1e-8);
    }
  });

  it("d/dx log x at 2 is 1/2 (central), within the stated error", () => {
    const d = riddersDerivative(Math.log, 2, 0.2, "central", Math.log(2))!;
    expect(Math.abs(d.value - 0.5)).toBeLessThanOrEqual(2 * d.error);
    expect(d.error).toBeLessThan(1e-11);
  });

  it("is undefined when no difference is finite, and keeps the rows it has when a smaller step fails", () => {
    expect(riddersDerivative(() => NaN, 1, 0.1, "central", NaN)).toBeUndefined();
  });
});

describe("sample quantiles (definition 7 of Hyndman & Fan 1996)", () => {
  it("interpolates between order statistics: for 1, 2, 3, 4, 10 the 0.5, 0.25, 0.05 and 0.95 quantiles are 3, 2, 1.2 and 8.8", () => {
    // h = (n − 1)p: 2 → x₂ = 3; 1 → x₁ = 2; 0.2 → 1 + 0.2·(2 − 1); 3.8 → 4 + 0.8·(10 − 4).
    const x = [1, 2, 3, 4, 10];
    expect(quantileSorted(x, 0.5)).toBe(3);
    expect(quantileSorted(x, 0.25)).toBe(2);
    expect(quantileSorted(x, 0.05)).toBeCloseTo(1.2, 14);
    expect(quantileSorted(x, 0.95)).toBeCloseTo(8.8, 14);
  });

  it("mean and sample deviation of 2, 4, 4, 4, 5, 5, 7, 9 are 5 and √(32/7)", () => {
    const s = meanAndDeviation([2, 4, 4, 4, 5, 5, 7, 9]);
    expect(s.mean).toBe(5);
    expect(Math.abs(s.deviation - Math.sqrt(32 / 7))).toBeLessThan(1e-15);
  });
});
