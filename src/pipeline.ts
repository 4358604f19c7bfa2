import { assemble, type AssembledSetup } from "./setup/assemble";
import { DEFAULT_GRID_POINTS, logGrid, type FrequencyGridSpec } from "./setup/grid";
import { noiseBudget, type NoiseBudget } from "./engine/budget";
import { analyzeStability, requireNoGrowingModes, type StabilityReport } from "./engine/stability";
import { checkPhysicality, type PhysicalityReport } from "./engine/covariance";
import { parseJsonText } from "./setup/parse-json";
import { requireSomeDetection, validateSetup, type ResolvedSetup } from "./setup/validate";

/**
 * The one-way pipeline every entry point (CLI, notebook API, widgets) goes through:
 *   1. parse     JSON text → plain object (errors carry line and column)
 *   2. validate  units → SI numbers, ports resolved (errors carry the field path)
 *   3. assemble  components → state-space model (A, B, C, D, N, signal)
 *   4. check     eigenvalues of A: growing modes are an error that says where and why
 *   5. evaluate  noise budget and reference curves on a log-spaced frequency grid
 */

/** Grid used when neither the set-up nor the caller gives one. */
export const FALLBACK_GRID: FrequencyGridSpec = { from: 1, to: 1e5, points: DEFAULT_GRID_POINTS };

export function loadSetup(input: string | unknown, source = "setup"): ResolvedSetup {
  return validateSetup(typeof input === "string" ? parseJsonText(input, source) : input);
}

export interface Evaluation {
  readonly assembled: AssembledSetup;
  readonly stability: StabilityReport;
  /** Uncertainty-relation check of the stationary state (absent when there is none, e.g. a free mass). */
  readonly physicality?: PhysicalityReport;
  readonly budget: NoiseBudget;
  readonly cautions: readonly string[];
  readonly warnings: readonly string[];
}

export function evaluateSetup(setup: ResolvedSetup, grid?: FrequencyGridSpec): Evaluation {
  requireSomeDetection(setup);
  const assembled = assemble(setup);
  const stability = requireNoGrowingModes(assembled, analyzeStability(assembled));
  const budget = noiseBudget(assembled, logGrid(grid ?? setup.grid ?? FALLBACK_GRID));
  const warnings = [...budget.warnings];
  if (stability.undamped.length > 0) warnings.push(stability.summary);
  const physicality = stability.stable ? checkPhysicality(assembled.model) : undefined;
  if (physicality && !physicality.physical) warnings.push(physicality.summary);
  return { assembled, stability, physicality, budget, cautions: assembled.cautions, warnings };
}
