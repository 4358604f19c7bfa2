import type { FrequencyGridSpec } from "./setup/grid";
import { evaluate, type Evaluation } from "./evaluate";
import { prepare } from "./prepare";
import type { ResolvedSetup } from "./setup/validate";

/**
 * The one-way pipeline every entry point (CLI, notebook API, widgets, tolerance cells) goes
 * through, one module per step:
 *   1. parse     src/setup/parse-json.ts  JSON text → plain object (errors carry line and column)
 *   2. validate  src/setup/validate.ts    units → SI numbers, ports resolved (errors carry the field path)
 *                                         (1 and 2 together: loadSetup, src/setup/load.ts)
 *   3. assemble  src/setup/assemble.ts    components → state-space model (A, B, C, D, N, signal)
 *   4. check     src/engine/stability.ts  a readout that detects something; eigenvalues of A: growing
 *                                         modes are an error that says where and why; the uncertainty
 *                                         relation of the stationary state (a warning)
 *                → prepare(setup, values?) in src/prepare.ts runs 1–4 once: a PreparedSetup
 *   5. evaluate  src/evaluate.ts          evaluate(prepared, grid?): noise budget and reference
 *                                         curves on a log-spaced frequency grid
 *      or simulate src/simulate.ts        simulate(prepared, settings, request) / startSimulation:
 *                                         seeded trajectories in time (src/timedomain)
 */

export { loadSetup } from "./setup/load";
export { prepare, type PreparedSetup, type SetupValues } from "./prepare";
export { evaluate, evaluateMechanisms, FALLBACK_GRID, type Evaluation } from "./evaluate";
export { simulate, startSimulation } from "./simulate";

/** prepare then evaluate, for a set-up evaluated once. */
export function evaluateSetup(setup: ResolvedSetup, grid?: FrequencyGridSpec): Evaluation {
  return evaluate(prepare(setup), grid);
}
