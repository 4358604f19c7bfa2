/**
 * mathjs (reference library for tests) is an ES module while this project compiles as
 * CommonJS, so it is loaded with a dynamic import and its types with resolution-mode.
 */
import type * as MathJs from "mathjs" with { "resolution-mode": "import" };

export type MathJsStatic = typeof MathJs;
export type Complex = MathJs.Complex;

let cached: MathJsStatic | undefined;

export async function loadMathjs(): Promise<MathJsStatic> {
  cached ??= await import("mathjs");
  return cached;
}
