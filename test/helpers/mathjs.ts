/**
 * mathjs is the outside reference in these tests. Its type declarations are ESM-only, so
 * from our CommonJS-compiled tests it is loaded with a dynamic import (call once in beforeAll).
 */
export const loadMathjs = () => import("mathjs");
export type MathJs = Awaited<ReturnType<typeof loadMathjs>>;
export type MathComplex = import("mathjs", { with: { "resolution-mode": "import" }}).Complex;
export type MathMatrix = import("mathjs", { with: { "resolution-mode": "import" }}).Matrix;
