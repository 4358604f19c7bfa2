import { UnstableSetupError } from "../engine/stability";
import { QuietframeError, QuietframeErrors } from "../errors";
import { evaluate } from "../evaluate";
import { NonDecayingModeError } from "../linalg/non-decaying-mode";
import { prepare, type PreparedSetup } from "../prepare";
import type { SetupDescription } from "../setup/format";
import { CellStatus, type FigureOutcome } from "./outcome";
import type { FigurePlan } from "./spec";
import { figureValue } from "./value";

/**
 * One setting of a set-up through the ordinary pipeline (prepare, evaluate), reduced to one
 * figure of merit. A set-up that cannot be evaluated is an outcome with a status, not a throw:
 * searches and maps treat it as a point without a value. Pure and platform-free.
 */
export function figureOfSetup(setup: SetupDescription, figure: FigurePlan, frequencies: Float64Array): FigureOutcome {
  return figureAndCurveOfSetup(setup, figure, frequencies, undefined);
}

/**
 * As figureOfSetup, and with `curveFrequencies` also the total noise there (one more evaluation of
 * the same prepared set-up unless they are the figure's own frequencies), for noise bands.
 */
export function figureAndCurveOfSetup(
  setup: SetupDescription,
  figure: FigurePlan,
  frequencies: Float64Array,
  curveFrequencies: Float64Array | undefined,
): FigureOutcome & { readonly curve?: Float64Array } {
  return figureAndCurveOfPrepared(() => prepare(setup), figure, frequencies, curveFrequencies);
}

/**
 * As figureAndCurveOfSetup, with the set-up prepared by `prepareSetup` (a SetupPreparer writing
 * a value set, for a search that evaluates many): whatever it throws is an outcome the same way.
 */
export function figureAndCurveOfPrepared(
  prepareSetup: () => PreparedSetup,
  figure: FigurePlan,
  frequencies: Float64Array,
  curveFrequencies: Float64Array | undefined,
): FigureOutcome & { readonly curve?: Float64Array } {
  try {
    const prepared = prepareSetup();
    // Elsewhere a warning beside the curves; a single figure has nowhere to show one, and it would mean nothing.
    if (prepared.physicality && !prepared.physicality.physical) return { value: NaN, status: CellStatus.invalid, message: prepared.physicality.summary };
    const budget = evaluate(prepared, frequencies).budget;
    const value = figureValue(figure, budget, frequencies);
    if (Number.isNaN(value)) {
      return { value: NaN, status: CellStatus.invalid, message: "the figure of merit is undefined here (the noise or its reference is 0/0 or ∞/∞)" };
    }
    if (curveFrequencies === undefined) return { value, status: CellStatus.ok };
    const curve = curveFrequencies === frequencies ? budget.total : evaluate(prepared, curveFrequencies).budget.total;
    return { value, status: CellStatus.ok, curve };
  } catch (e) {
    if (e instanceof UnstableSetupError) return { value: NaN, status: CellStatus.unstable, message: e.message };
    // A mode that grows more slowly than the stability check resolves passes it, and then has no stationary state.
    if (e instanceof NonDecayingModeError) {
      return { value: NaN, status: CellStatus.unstable, message: `setup: a mode at the edge of stability does not decay (eigenvalue ${e.mode.re} ± ${Math.abs(e.mode.im)}i /s): no stationary state` };
    }
    if (e instanceof QuietframeError || e instanceof QuietframeErrors) return { value: NaN, status: CellStatus.invalid, message: e.message };
    throw e;
  }
}
