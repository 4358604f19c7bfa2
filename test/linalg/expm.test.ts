import { beforeAll, describe, expect, it } from "vitest";
import { expm } from "../../src/linalg/expm";
import { loadMathjs, type MathJs, type MathMatrix } from "../helpers/mathjs";
import { fromRows, relativeMatrixError } from "../timedomain/helpers";

describe("matrix exponential (scaling and squaring Padé)", () => {
  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  it.each([0.01, 0.3, 2, 40, 3000])("agrees with mathjs expm for ‖A‖ scaled to about %f (mathjs as reference)", (scale) => {
    // Fixed non-normal test matrix (invented), scaled through every Padé degree and into squaring.
    const base = [
      [-0.3, 1.1, 0.2, 0],
      [-1.0, -0.2, 0, 0.4],
      [0.05, 0, -0.7, 2.0],
      [0, -0.1, -2.2, -0.5],
    ];
    const a = base.map((r) => r.map((x) => (x * scale) / 2.5));
    const ours = expm(fromRows(a), 4);
    const ref = (math.expm(math.matrix(a)) as MathMatrix).toArray() as number[][];
    expect(relativeMatrixError(ours, fromRows(ref))).toBeLessThan(1e-11);
  });

  it("is exact for a rotation generator: e^{θJ} = [[cos θ, sin θ], [−sin θ, cos θ]] (Euler's formula)", () => {
    const theta = 7.25;
    const e = expm(Float64Array.of(0, theta, -theta, 0), 2);
    expect(relativeMatrixError(e, [Math.cos(theta), Math.sin(theta), -Math.sin(theta), Math.cos(theta)])).toBeLessThan(1e-13);
  });
});
