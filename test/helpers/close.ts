import { expect } from "vitest";

/** Relative difference |a − b| / max(|a|, |b|) (0 when both are 0). */
export function relativeDifference(a: number, b: number): number {
  if (a === b) return 0;
  return Math.abs(a - b) / Math.max(Math.abs(a), Math.abs(b));
}

/** Asserts every pair agrees to a relative tolerance, reporting the worst index. */
export function expectAllClose(actual: ArrayLike<number>, expected: ArrayLike<number>, relTol: number, what = "values"): void {
  expect(actual.length, `${what}: length`).toBe(expected.length);
  let worst = 0;
  let at = -1;
  for (let i = 0; i < actual.length; i++) {
    const d = relativeDifference(actual[i], expected[i]);
    if (!(d <= worst)) {
      worst = d;
      at = i;
    }
  }
  expect(worst, `${what}: worst relative difference at index ${at} (${actual[at]} vs ${expected[at]})`).toBeLessThanOrEqual(relTol);
}
