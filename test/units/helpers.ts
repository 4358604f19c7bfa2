import { expect } from "vitest";
import { QuietframeError } from "../../src/errors";

export function relErr(a: number, b: number): number {
  if (a === b) return 0;
  return Math.abs(a - b) / Math.abs(b);
}

/** Run `fn`, return what it threw (or undefined). */
export function thrown(fn: () => unknown): unknown {
  try {
    fn();
  } catch (e) {
    return e;
  }
  return undefined;
}

/** Assert `fn` throws a QuietframeError for `path` whose problem matches `problem`. */
export function expectProblem(fn: () => unknown, path: string, problem: RegExp): QuietframeError {
  const e = thrown(fn);
  expect(e).toBeInstanceOf(QuietframeError);
  const q = e as QuietframeError;
  expect(q.path).toBe(path);
  expect(q.message.startsWith(path)).toBe(true);
  expect(q.problem).toMatch(problem);
  expect(q.message).toContain(q.problem);
  return q;
}
