/** The noise-budget explorer as a widget kind (see core/kind.ts): the registry's entry for it. */
import { tableToCsv } from "../../src/index";
import type { LoadedWidget, WidgetKind } from "../core/kind";
import { isRecord } from "../core/state/strict-read";
import { WIDGET_MODULE } from "../core/state/widget-state";
import { explorerView } from "./browser/view";
import { explorerUncheckedFields, loadExplorerState, stateDocumentText } from "./document";
import { explorerFigureSpec } from "./budget-spec";
import { EXPLORER_MODEL_NAME, EXPLORER_STATE_FORMAT, type ExplorerState } from "./format";
import { explorerFragment } from "./fragment";
import { CHART_MODEL_NAME, LIVE_MODULE } from "./live/names";
import { liveStateSource } from "./live/saved-state";
import type { ExplorerComputation } from "./model";
import { explorerPage } from "./standalone";

export interface LoadedExplorer extends LoadedWidget<ExplorerState> {
  readonly computation: ExplorerComputation;
}

export const explorerKind: WidgetKind<LoadedExplorer> = {
  name: "explorer",
  stateFormat: EXPLORER_STATE_FORMAT,
  recognises: isExplorerInput,
  load(input, source, options = {}) {
    // Text may be a saved notebook whose live charts carry explorer states (`options.widget` picks one).
    const saved = typeof input === "string" ? liveStateSource(input, source, options.widget) : { value: input, source };
    const { state, computation, path } = loadExplorerState(saved.value, saved.source);
    return {
      state,
      computation,
      fingerprint: { stored: state.fingerprint, recomputed: computation.fingerprint, writtenBy: state.quietframe },
      unchecked: explorerUncheckedFields(state, path),
      warnings: computation.evaluation.warnings,
      cautions: computation.evaluation.cautions,
    };
  },
  figure: ({ state, computation }) => ({ spec: explorerFigureSpec(computation, state), csv: tableToCsv(computation.table) }),
  stateText: ({ state }) => stateDocumentText(state),
  fragment: ({ state, computation }, parts) => explorerFragment(state, computation, parts),
  page: ({ state, computation }, parts) => explorerPage(state, computation, parts),
  view: explorerView,
};

/** A bare explorer state, a widget-state document with an explorer or live chart model, or a notebook. */
function isExplorerInput(value: unknown): boolean {
  if (!isRecord(value)) return false;
  if (value.format === EXPLORER_STATE_FORMAT) return true;
  if (Array.isArray(value.cells) && isRecord(value.metadata)) return true;
  const models = isRecord(value.state) ? Object.values(value.state) : [];
  return models.some((m) => isRecord(m) && ((m.model_module === WIDGET_MODULE && m.model_name === EXPLORER_MODEL_NAME) || (m.model_module === LIVE_MODULE && m.model_name === CHART_MODEL_NAME)));
}
