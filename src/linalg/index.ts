/** Dense linear algebra over Float64Array, no dependencies (it runs in the browser too). */
export { SingularMatrixError } from "./singular-error";
export { complexLuFactor, complexLuSolve, complexLuSolveTransposed } from "./complex-lu";
export { realLuFactor, realLuSolve, solve } from "./real-lu";
export { realEigenvalues, eigenvectorFor } from "./eigen";
export type { ComplexVector, EigenvalueOptions } from "./eigen";
export { solveLyapunov } from "./lyapunov";
export { symmetricEigenvalues } from "./symmetric-eigen";
export { smallestSymmetricEigenvalue } from "./smallest-eigenvalue";
export { hermitianEmbedding, minEigenvalueHermitian, shiftedPositiveDefinite } from "./hermitian";
export { findNonDecayingMode } from "./non-decaying-mode";
export { WorkArray } from "./work-array";
export type { NonDecayingMode } from "./non-decaying-mode";
export { expm } from "./expm";
export { psdFactor, applyFactor, type Factor } from "./psd-factor";
