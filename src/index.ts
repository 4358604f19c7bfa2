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
  evaluateMechanisms,
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
export { budgetByMechanism, type MechanismBudget, type MechanismTerm } from "./engine/mechanisms";
export {
  designFilterCavities,
  filterShortfall,
  type FilterDesign,
  type FilterCavityDesign,
  type FilterOptions,
  type FilterShortfall,
  type FilteredInterferometer,
} from "./physics/filter-design";
export { outputSpectra, signalResponse, inputTransfer, type ComplexSeries } from "./engine/spectra";
export { analyzeStability, UnstableSetupError, type StabilityReport, type Eigenmode } from "./engine/stability";
export { stationaryCovariance, uncertaintyMargin, diffusionMatrix, checkPhysicality, type PhysicalityReport } from "./engine/covariance";
export * from "./engine/entanglement";
export { logGrid, parseGrid, type FrequencyGridSpec } from "./setup/grid";
export { headlineFigures, describeHeadline, type HeadlineFigures } from "./engine/headline";
export { tabulateBudget, tableToCsv, csvField, type BudgetTable } from "./engine/tabulate";
export * from "./reference/limits";
export * as constants from "./constants";
export { parseQuantity, formatQuantity, quantityParts, siunitxQuantity, unicodeQuantity, type QuantityKind } from "./units";
export { applyValues } from "./setup/apply-values";
export { COMPONENT_KINDS } from "./components/registry";
export type { ComponentKind } from "./components/types";
export * from "./reach";
export * from "./tolerance";
export * from "./design";
export { ALL_FIGURE_KINDS, type AnyFigureKind, type FigureSpec, type NoiseAtSpec } from "./figures/spec";
export * from "./timedomain";

// What the widgets (widgets/) use of the engine besides the exports above: they reach the
// engine only through this entry (and, in Node, through src/node.ts).
export { showValue } from "./errors";
export { parseJsonText } from "./setup/parse-json";
export { componentKind } from "./components/registry";
export type { ParamSpec } from "./components/types";
export { squeezeFactorFromDb } from "./components/light-sources";
export type { TwoModeSqueezing } from "./physics/two-mode-squeezing";
export { requireNoGrowingModes } from "./engine/stability";
export { checkSettings } from "./timedomain/settings";
export { evaluateCell } from "./tolerance/evaluate";
export { resolveToleranceSpec } from "./tolerance/spec";
/** Elementary functions that give the same bits in every JavaScript engine (see src/numeric/portable-math.ts). */
export { cos, log, log10, pow, sin } from "./numeric/portable-math";
