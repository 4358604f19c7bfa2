/**
 * quietframe: one engine for linear quantum noise.
 * Pipeline (see pipeline.ts): parse → validate → assemble → check (prepare) → evaluate or simulate.
 *
 * This entry is browser-safe (no Node module behind it, a test bundles it for a browser);
 * the worker pool and file reading are in "quietframe/node" (src/node.ts).
 */
export { QUIETFRAME_VERSION } from "./version";
export { QuietframeError, QuietframeErrors } from "./errors";
export {
  loadSetup,
  prepare,
  evaluate,
  simulate,
  startSimulation,
  evaluateSetup,
  FALLBACK_GRID,
  type PreparedSetup,
  type SetupValues,
  type Evaluation,
} from "./pipeline";
export { SETUP_FORMAT, SETUP_VERSION, type SetupDescription, type ComponentDescription } from "./setup/format";
export { validateSetup, type ResolvedSetup } from "./setup/validate";
export { assemble, type AssembledSetup } from "./setup/assemble";
export type { StateSpaceModel, ModeInfo, NoiseGroup } from "./network/model";
export { noiseBudget, type NoiseBudget, type BudgetTerm, type ReferenceSpectrum } from "./engine/budget";
export { outputSpectra, signalResponse, inputTransfer, type ComplexSeries } from "./engine/spectra";
export { analyzeStability, UnstableSetupError, type StabilityReport, type Eigenmode } from "./engine/stability";
export { stationaryCovariance, uncertaintyMargin, diffusionMatrix, checkPhysicality, type PhysicalityReport } from "./engine/covariance";
export * from "./engine/entanglement";
export { logGrid, parseGrid, type FrequencyGridSpec } from "./setup/grid";
export { headlineFigures, describeHeadline, type HeadlineFigures } from "./engine/headline";
export { tabulateBudget, tableToCsv, type BudgetTable } from "./engine/tabulate";
export * from "./reference/limits";
export * as constants from "./constants";
export { parseQuantity, formatQuantity, type QuantityKind } from "./units";
export { applyValues } from "./setup/apply-values";
export { COMPONENT_KINDS } from "./components/registry";
export type { ComponentKind } from "./components/types";
export * from "./reach";
export * from "./tolerance";
export * from "./design";
export { ALL_FIGURE_KINDS, type AnyFigureKind, type FigureSpec, type NoiseAtSpec } from "./figures/spec";
export * from "./timedomain";
