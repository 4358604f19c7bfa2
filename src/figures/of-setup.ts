import { UnstableSetupError } from "../engine/stability";
import { QuietframeError, QuietframeErrors } from "../errors";
import { evaluate, evaluateBudgets } from "../evaluate";
import type { NoiseBudget } from "../engine/budget";
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
 * As figureOfSetup, and with `curveFrequencies` also the total noise there, for noise bands: one
 * budget when they hold the figure's own frequencies, else budgets on both solved in one pass.
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
    const same = curveFrequencies === undefined || sameFrequencies(curveFrequencies, frequencies);
    const together = same ? undefined : figureAndCurveTogether(prepared, figure, frequencies, curveFrequencies);
    if (together) return together;
    const budget = evaluate(prepared, frequencies).budget;
    const value = figureValue(figure, budget, frequencies);
    if (Number.isNaN(value)) return undefinedFigure();
    if (curveFrequencies === undefined) return { value, status: CellStatus.ok };
    const curve = same ? budget.total : evaluate(prepared, curveFrequencies).budget.total;
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

function undefinedFigure(): FigureOutcome {
  return { value: NaN, status: CellStatus.invalid, message: "the figure of merit is undefined here (the noise or its reference is 0/0 or ∞/∞)" };
}

/** Whether two lists hold the same frequencies (a grid laid out twice is two arrays). */
function sameFrequencies(a: Float64Array, b: Float64Array): boolean {
  if (a === b) return true;
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (a[i] !== b[i]) return false;
  return true;
}

/**
 * The figure and the curve from budgets on both lists solved in one pass: the same bits as one
 * evaluation after the other. Undefined when that pass throws: the caller then evaluates one after
 * the other, which reports what it always reported (the figure's list first).
 */
function figureAndCurveTogether(
  prepared: PreparedSetup,
  figure: FigurePlan,
  frequencies: Float64Array,
  curveFrequencies: Float64Array,
): (FigureOutcome & { readonly curve?: Float64Array }) | undefined {
  let budgets: NoiseBudget[];
  try {
    budgets = evaluateBudgets(prepared, [frequencies, curveFrequencies]);
  } catch {
    return undefined;
  }
  const value = figureValue(figure, budgets[0], frequencies);
  if (Number.isNaN(value)) return undefinedFigure();
  return { value, status: CellStatus.ok, curve: budgets[1].total };
}
