export { SingularMatrixError } from "./singular-error";
export { complexLuFactor, complexLuSolve, complexLuSolveTransposed } from "./complex-lu";
export { realLuFactor, realLuSolve } from "./real-dense";
export { realEigenvalues, eigenvectorFor } from "./eigen";
export type { ComplexVector, EigenvalueOptions } from "./eigen";
export { solveLyapunov } from "./lyapunov";
export { minEigenvalueHermitian, symmetricEigenvalues } from "./hermitian";
export { findNonDecayingMode } from "./stability";
export type { NonDecayingMode } from "./stability";
