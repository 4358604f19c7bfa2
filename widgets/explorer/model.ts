import { checkTargetDb } from "./target";
import {
  QuietframeError,
  headlineFigures,
  parseGrid,
  tabulateBudget,
  evaluate,
  evaluateMechanisms,
  prepare,
  loadSetup,
  applyValues,
  QUIETFRAME_VERSION,
  type HeadlineFigures,
  type BudgetTable,
  type Evaluation,
  type SetupDescription,
  type ResolvedSetup,
  type MechanismBudget,
} from "../../src/index";
import { budgetFingerprint } from "./fingerprint";
import { EXPLORER_STATE_FORMAT, EXPLORER_STATE_VERSION, type ExplorerSettings, type ExplorerState } from "./format";
import type { ControlSpec } from "../core/controls/control-spec";
import { resolveControls, resolveStateControls, type ResolvedControl } from "../core/controls/setup-controls";

/** Re-exported: widgets and notebooks write control values into set-ups with it. */
export { applyValues };

/**
 * The noise-budget explorer's model: state in, figures out. Pure (no DOM, no Jupyter), so
 * the kernel, the CLI and the browser runtime run exactly this code.
 */
export interface ExplorerComputation {
  readonly controls: readonly ResolvedControl[];
  readonly setup: ResolvedSetup;
  readonly evaluation: Evaluation;
  readonly table: BudgetTable;
  readonly headline: HeadlineFigures;
  readonly fingerprint: string;
  /** The light sources' terms split into imprecision, back-action and correlation (computed on first use). */
  readonly mechanisms: MechanismBudget;
}

/** Evaluates a state's set-up at its current values; throws QuietframeError for bad values or an unstable set-up. */
export function computeExplorer(state: Omit<ExplorerState, "fingerprint">): ExplorerComputation {
  // Validate the set-up itself first, so controls are only ever resolved against a well-formed one.
  loadSetup(state.setup);
  const controls = resolveStateControls(state.setup, state.controls, state.values);
  const prepared = prepare(state.setup, state.values);
  const setup = prepared.setup;
  const grid = parseGrid(state.settings.grid, "settings.grid");
  const evaluation = evaluate(prepared, grid);
  // The fingerprint (SHA-256 over every plotted number) is computed on first use and kept:
  // a dragged slider needs the curves at once, the fingerprint only when a state is shown or saved.
  let fingerprint: string | undefined;
  let mechanisms: MechanismBudget | undefined;
  return {
    controls,
    setup,
    evaluation,
    table: tabulateBudget(evaluation.budget, state.settings.spectralDensity),
    headline: headlineFigures(evaluation.budget),
    get fingerprint(): string {
      fingerprint ??= budgetFingerprint(evaluation.budget);
      return fingerprint;
    },
    get mechanisms(): MechanismBudget {
      mechanisms ??= evaluateMechanisms(prepared, evaluation.budget.frequencies);
      return mechanisms;
    },
  };
}

export interface ExplorerOptions {
  controls?: ControlSpec[];
  /** Overrides of the default settings (grid from the set-up, amplitude spectral densities). */
  settings?: Partial<ExplorerSettings>;
}

/** A fresh state for a set-up: current values are the set-up's own parameter values. */
export function createExplorerState(setup: SetupDescription, options: ExplorerOptions = {}): ExplorerState {
  const controls = options.controls ?? [];
  const values = setupValues(setup, controls);
  const grid = setup.grid ?? { from: "1 Hz", to: "100 kHz", points: 400 };
  const settings: ExplorerSettings = {
    grid: { from: String(grid.from), to: String(grid.to), points: grid.points ?? 400 },
    spectralDensity: "amplitude",
    ...options.settings,
  };
  if (settings.targetDb !== undefined) checkTargetDb(settings.targetDb, "settings.targetDb");
  const base = {
    format: EXPLORER_STATE_FORMAT,
    version: EXPLORER_STATE_VERSION,
    quietframe: QUIETFRAME_VERSION,
    setup: structuredClone(setup),
    controls: structuredClone(controls),
    values,
    settings,
  } as const;
  return { ...base, fingerprint: computeExplorer(base).fingerprint };
}

/**
 * The value each control starts from: the parameter as the set-up writes it, or the
 * parameter's default. These are a fresh state's values, and they stay recoverable from any
 * later state, because moving a control never changes the set-up it carries.
 */
export function setupValues(setup: SetupDescription, controls: readonly ControlSpec[]): Record<string, string | number> {
  const resolved = loadSetup(setup);
  const values: Record<string, string | number> = {};
  for (const c of resolveControls(setup, controls)) {
    const component = resolved.components.find((x) => x.name === c.component)!;
    const written = component.raw[c.param];
    const kind = resolved.kinds.get(c.component)!;
    const spec = kind.params.find((p) => p.name === c.param)!;
    const value = written ?? spec.default;
    if (value === undefined) {
      throw new QuietframeError({ path: `controls.${c.target}`, problem: "the set-up gives this parameter no value", allowed: "a parameter the set-up sets or defaults" });
    }
    values[c.target] = value as string | number;
  }
  return values;
}

/** A state's initial values: those of a fresh state for its set-up and controls (see setupValues). */
export function initialValues(state: Pick<ExplorerState, "setup" | "controls">): Record<string, string | number> {
  return setupValues(state.setup, state.controls);
}
