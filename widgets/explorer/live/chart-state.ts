/** The live chart model's state, from an explorer computation. */
import { budgetSpec, CURVES_DATASET, explorerMechanismPanel, MECHANISM_DATASET, RATIO_DATASET, type MechanismPanel } from "../budget-spec";
import type { ExplorerComputation } from "../model";
import { explorerReach } from "../reach";
import { chartTitle } from "../fragment";
import { headlineSummary, reachSummary } from "../summary";
import type { SummaryLine } from "../../core/page/summary-line";
import type { ExplorerState } from "../format";
import { curvesToWire, type WireCurves } from "./chart-wire";
import { chartModelIdentity } from "./names";

/**
 * The state of quietframe's chart model on the widget protocol. The kernel computes; the
 * view only draws what is here. `explorer_state` is the same explorer state the kernel-free
 * output and state files carry, so a notebook's saved widget state can be rendered by the CLI.
 */
export interface ChartModelState {
  /** Vega-Lite v5 spec of the chart; its datasets "curves" and "ratio" are empty here, filled from `curves`. */
  spec: Record<string, unknown>;
  /** The curves (float64 bytes; see chart-wire.ts). */
  curves: WireCurves;
  /** A light source's term by mechanism (rows of shares of the term), or null without a split. */
  mechanism: MechanismPanel | null;
  /** Quantity the noise is referred to, e.g. "displacement" (axis title). */
  quantity: string;
  title: string;
  /** Headline figures as labelled lines of text. */
  headline: SummaryLine[];
  /** Safety cautions of the components, shown above everything else. */
  cautions: string[];
  /** Why the controls' values could not be computed; empty when the curves match the controls. */
  error: string;
  /** The explorer state of the curves shown (the last valid one). */
  explorer_state: ExplorerState;
  /** Counts the computations pushed, so a view (and a test) can tell a new result from an old one. */
  revision: number;
}

/** Everything a computation changes in the chart model. */
export function chartPatch(state: ExplorerState, computation: ExplorerComputation, revision: number): Omit<ChartModelState, "error"> {
  const quantity = computation.evaluation.budget.quantity.name;
  const title = chartTitle(state);
  const reach = explorerReach(state, computation);
  const mechanism = explorerMechanismPanel(computation);
  const spec = budgetSpec(computation.table, quantity, { title, mechanism, targetDb: state.settings.targetDb });
  return {
    // The rows travel as binary curves; the spec names the datasets they fill.
    spec: { ...spec, datasets: { [CURVES_DATASET]: [], [RATIO_DATASET]: [], ...(mechanism ? { [MECHANISM_DATASET]: [] } : {}) } },
    curves: curvesToWire(computation.table),
    mechanism: mechanism ?? null,
    quantity,
    title,
    headline: [...headlineSummary(computation.headline), ...(reach ? reachSummary(reach) : [])],
    cautions: [...computation.evaluation.cautions],
    explorer_state: structuredClone(state),
    revision,
  };
}

/** The complete initial state of a chart model. */
export function initialChartState(state: ExplorerState, computation: ExplorerComputation): Record<string, unknown> {
  return { ...chartModelIdentity(), ...chartPatch(state, computation, 1), error: "" };
}
