import { describe, expect, it } from "vitest";
import { complexLuFactor } from "../../src/linalg/complex-lu";
import { realLuFactor } from "../../src/linalg/real-lu";
import { SingularMatrixError } from "../../src/linalg/singular-error";

describe("SingularMatrixError", () => {
  it("is an Error that names the elimination step and the reason", () => {
    const e = new SingularMatrixError(3);
    expect(e).toBeInstanceOf(Error);
    expect(e.name).toBe("SingularMatrixError");
    expect(e.pivotIndex).toBe(3);
    expect(e.message).toBe("matrix is singular at pivot 3 (pivot is exactly zero)");
    expect(new SingularMatrixError(0, "pivot is not finite").message).toBe("matrix is singular at pivot 0 (pivot is not finite)");
  });

  it("both LU factorizations raise it at step 1 for the rank-one [[1, 2], [2, 4]] (second row = 2 × first, elementary algebra)", () => {
    const catchFrom = (f: () => void): SingularMatrixError => {
      try {
        f();
      } catch (e) {
        if (e instanceof SingularMatrixError) return e;
        throw e;
      }
      throw new Error("no SingularMatrixError");
    };
    const real = catchFrom(() => realLuFactor(Float64Array.of(1, 2, 2, 4), 2, new Int32Array(2)));
    expect(real.pivotIndex).toBe(1);
    const complex = catchFrom(() => complexLuFactor(Float64Array.of(1, 2, 2, 4), new Float64Array(4), 2, new Int32Array(2)));
    expect(complex.pivotIndex).toBe(1);
  });

  it("reports a pivot that is not finite", () => {
    expect(() => realLuFactor(Float64Array.of(Infinity, 1, 1, 1), 2, new Int32Array(2))).toThrow(/pivot 0 \(pivot is not finite\)/);
  });
});
