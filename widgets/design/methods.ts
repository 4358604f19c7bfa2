/** The methods paragraph of a design widget: method, seed, samples, bounds and tolerances, for a paper's methods section. */
import { QUIETFRAME_VERSION, unicodeQuantity } from "../../src/index";
import { parameterKind } from "../core/methods/parameter-names";
import type { DesignState } from "./format";
import { designTitle } from "./summary";

/** Defaults of the engine's design searches (src/design), written out so the paragraph states what was used. */
const DEFAULTS = { scanPoints: 25, relativeStep: 0.02, starts: 4, seed: 1, tolerance: 1e-10, samples: 1000 };

/** "target from a to b" with both ends in quietframe's units ("arm.power from 1 mW to 1 W"). */
function rangeText(state: DesignState, target: string, range: readonly [number, number] | readonly number[]): string {
  const kind = parameterKind(state.setup, target);
  const shown = (x: number): string => (kind ? unicodeQuantity(x, kind, 6) : String(x));
  return `${target} from ${shown(range[0])} to ${shown(range[1])}`;
}

/** A paragraph of plain text; every number the reader needs to repeat the computation is in it. */
export function designMethods(state: DesignState): string {
  const q = state.question;
  const a = state.answer;
  const grid = state.grid ? `a grid from ${state.grid.from} to ${state.grid.to}${state.grid.points ? ` (${state.grid.points} points)` : ""}` : "the set-up's frequency grid";
  const head = `${designTitle(state)}. Figure of merit: ${a.figure.label}, evaluated through the noise budget on ${grid}.`;
  const tail = `Computed with quietframe ${state.quietframe}${state.quietframe === QUIETFRAME_VERSION ? "" : ` (read by quietframe ${QUIETFRAME_VERSION})`}; answer fingerprint ${state.fingerprint}.`;
  switch (q.kind) {
    case "ranking": {
      if (a.kind !== "ranking") break;
      const ranges = a.rows.filter((r) => r.best).map((r) => rangeText(state, r.target, r.best!.range));
      return [
        head,
        `Method: sensitivities of the figure's level in dB by Ridders-extrapolated central differences (first relative step ${q.relativeStep ?? DEFAULTS.relativeStep} of each value, reduced by a factor 1.4 per extrapolation row, with the extrapolation's error estimate), reported as the gain for a 1 % change; the best value of each parameter alone from a scan of ${q.scanPoints ?? DEFAULTS.scanPoints} points refined by Brent's method within its search range.`,
        `Bounds: ${ranges.length ? ranges.join("; ") : "none reached"}; a range ends at the parameter's physical bound or, where it has none, a factor 1000 from the current value.`,
        `${a.evaluations} evaluations. ${tail}`,
      ].join(" ");
    }
    case "optimum": {
      if (a.kind !== "optimum") break;
      const bounds = a.optimum
        ? a.optimum.values.map((v) => rangeText(state, v.target, v.range))
        : q.parameters.map((p) => (p.min === undefined ? `${p.target} over its own range` : `${p.target} from ${p.min} to ${p.max}`));
      return [
        head,
        `Method: bounded Nelder–Mead simplex search in the unit box of the parameter ranges (equal ratios on ranges spanning a factor 10 or more), ${q.starts ?? DEFAULTS.starts} starts (the set-up's values, then seeded uniform random points; seed ${q.seed ?? DEFAULTS.seed}), at most ${q.maxEvaluationsPerStart ?? `400 + 200 × ${q.parameters.length}`} evaluations per start, converged when the simplex is smaller than ${q.tolerance ?? DEFAULTS.tolerance} in unit-box coordinates; settings without a value (unstable or refused) count as infeasible.`,
        `Bounds: ${bounds.join("; ")}.`,
        `${a.evaluations} evaluations. ${tail}`,
      ].join(" ");
    }
    case "spread": {
      if (a.kind !== "spread") break;
      const spreads = a.uncertain.map((u) => `${u.target} ${u.shown}${u.truncated ? ", truncated at its bounds by redrawing" : ""}`);
      return [
        head,
        `Method: Monte Carlo with ${a.samples} samples, seed ${a.seed} (xoshiro128** uniform numbers and ziggurat normals); uncertain parameters: ${spreads.join("; ")}.`,
        `Percentiles (5 %, 50 %, 95 %) of the figure and of the total noise at each frequency by linear interpolation between order statistics (Hyndman and Fan 1996, definition 7); beside them, first-order propagation from Ridders-extrapolated derivatives at the centres.`,
        `${a.failed.unstable + a.failed.invalid} samples without a value (unstable or refused). ${a.evaluations} evaluations. ${tail}`,
      ].join(" ");
    }
  }
  throw new Error("internal: a design state's answer does not fit its question");
}
