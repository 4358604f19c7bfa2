/** The tolerance map as a widget kind (see core/kind.ts): the registry's entry for it. */
import { toleranceMapInProcess, type ToleranceMap } from "../../src/index";
import type { LoadedWidget, UncheckedField, WidgetKind } from "../core/kind";
import { isRecord, rebasedErrors } from "../core/state/strict-read";
import { toleranceView } from "./browser/view";
import { toleranceFragment, tolerancePageDocument } from "./fragment";
import { toleranceHeatmapSpec } from "./heatmap-spec";
import { loadToleranceState, TOLERANCE_STATE_FORMAT, toleranceMapData, type ToleranceWidgetState } from "./model";
import { toleranceCsv, toleranceFingerprint } from "./numbers";

export const toleranceKind: WidgetKind<LoadedWidget<ToleranceWidgetState>> = {
  name: "tolerance",
  stateFormat: TOLERANCE_STATE_FORMAT,
  recognises: (value) => isRecord(value) && value.format === TOLERANCE_STATE_FORMAT,
  load(input, source) {
    // Loading checks the stored numbers against the stored fingerprint; computing the map again is
    // asynchronous, so it is `recompute` below (render --strict).
    const state = loadToleranceState(typeof input === "string" ? input : JSON.stringify(input));
    return {
      state,
      fingerprint: { stored: state.fingerprint ?? null, recomputed: toleranceFingerprint(state.map), writtenBy: state.quietframe },
      unchecked: toleranceUncheckedFields(state, source),
      warnings: [],
      cautions: [],
    };
  },
  async recompute(loaded, source) {
    // A merged sweep's map: computing it again is the whole sweep, so its stored numbers are checked against its fingerprint instead.
    if (loaded.state.sweep) return loaded;
    const { state } = loaded;
    const map = await computedMap(state, source);
    // The stored messages may hold more failed cells than the map keeps; they are text, not numbers.
    const data = { ...toleranceMapData(map), messages: state.map.messages };
    return { ...loaded, state: { ...state, map: data }, fingerprint: { stored: state.fingerprint ?? null, recomputed: toleranceFingerprint(data), writtenBy: state.quietframe } };
  },
  figure: ({ state }) => ({ spec: toleranceHeatmapSpec(state), csv: toleranceCsv(state.map) }),
  // A map is saved as its bare state, as the fragment carries it.
  stateText: ({ state }) => JSON.stringify(state),
  fragment: ({ state }, parts) => toleranceFragment(state, parts),
  page: ({ state }, parts) => tolerancePageDocument(state, parts),
  view: toleranceView,
};

/** The map computed again from the state; an engine error names its field in the state (spec.x.from, setup.components…). */
async function computedMap(state: ToleranceWidgetState, source: string): Promise<ToleranceMap> {
  try {
    return await toleranceMapInProcess(state.setup, state.spec);
  } catch (e) {
    return rebasedErrors(
      (path) => `${source}.${/^(spec|setup)(?=$|[.[])/.test(path) ? path : /^(x|y|grid|figure)(?=$|[.[])/.test(path) ? `spec.${path}` : `setup.${path}`}`,
      () => {
        throw e;
      },
    );
  }
}

/** The fields of a map's state its fingerprint does not cover, each with the reason it cannot change the numbers. */
function toleranceUncheckedFields(state: ToleranceWidgetState, path: string): UncheckedField[] {
  const out: UncheckedField[] = [];
  for (const key of ["name", "description"] as const) {
    if (state.setup[key] !== undefined) out.push({ path: `${path}.setup.${key}`, reason: "text shown with the map; no number depends on it" });
  }
  for (const axis of [state.map.x, state.map.y]) {
    const dot = axis.target.indexOf(".");
    const i = state.setup.components.findIndex((c) => c.name === axis.target.slice(0, dot));
    const params = i < 0 ? undefined : (state.setup.components[i].params as Record<string, unknown> | undefined);
    if (params && Object.prototype.hasOwnProperty.call(params, axis.target.slice(dot + 1))) {
      out.push({ path: `${path}.setup.components[${i}].params.${axis.target.slice(dot + 1)}`, reason: `every cell writes its own value of ${axis.target} from the spec's axis` });
    }
  }
  if (state.setup.grid !== undefined && state.spec.grid !== undefined) out.push({ path: `${path}.setup.grid`, reason: "the spec's grid replaces it in every cell" });
  out.push({ path: `${path}.settings`, reason: "title, axis labels and the summary's target: text and a threshold for counting cells, not the map's numbers" });
  out.push({ path: `${path}.map.messages`, reason: "why failed cells have no value: text; the cells' status codes are covered" });
  if (state.sweep) {
    const reason = "a merged sweep's map is checked against its stored fingerprint instead of computed again (that would be the whole sweep)";
    out.push({ path: `${path}.setup`, reason }, { path: `${path}.spec`, reason });
  }
  return out;
}
