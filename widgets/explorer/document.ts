/** The explorer's state file: strict reading, widget-state document, recomputation. */
import { checkTargetDb } from "./target";
import { QuietframeError, loadSetup, QUIETFRAME_VERSION, type SetupDescription } from "../../src/index";
import { computeExplorer, type ExplorerComputation } from "./model";
import { EXPLORER_MODEL_NAME, EXPLORER_STATE_FORMAT, EXPLORER_STATE_VERSION, type ExplorerSettings, type ExplorerState } from "./format";
import { WIDGET_MODULE, type JupyterWidgetStateDocument } from "../core/state/widget-state";
import { copyJson, expectArray, expectFingerprint, expectRecord, isRecord, modelIdOf, rebasedErrors, rejectUnknownKeys, singleModelDocument, VERSION_PATTERN } from "../core/state/strict-read";
import { parseStateText } from "../core/state/state-text";
import { checkControlSpec, checkControlValues, expectString, expectWord } from "../core/state/control-read";
import type { UncheckedField } from "../core/state/reproduction";
import { setupGridUnchecked, setupUncheckedFields } from "../core/state/unchecked-fields";

/**
 * The state file users keep beside a figure: a Jupyter widget-state document (format 2.0)
 * holding one explorer model. Reading is strict (unknown or mistyped fields are errors with
 * their path) and builds fresh objects, so nothing in the input can reach a prototype.
 */

const STATE_KEYS = ["format", "version", "quietframe", "setup", "controls", "values", "settings", "fingerprint"] as const;
const SETTINGS_KEYS = ["grid", "spectralDensity", "title", "targetDb"] as const;
const GRID_KEYS = ["from", "to", "points"] as const;
const DENSITIES = ["amplitude", "power"] as const;
// Model error paths that already start at a field of the state rather than of the set-up.
const STATE_FIELD = /^(values|controls|settings|setup)(?=$|[.[])/;

/** Deterministic model id: the same curves always get the same id. */
export function explorerModelId(fingerprint: string): string {
  return modelIdOf("quietframe-", fingerprint);
}

/** The widget-state envelope with the state as its one model (the state is checked first). */
export function toWidgetStateDocument(state: ExplorerState): JupyterWidgetStateDocument {
  const clean = checkState(state, "state");
  return singleModelDocument(explorerModelId(clean.fingerprint), EXPLORER_MODEL_NAME, clean);
}

/** The state file's text: two-space JSON and a final newline, so diffs stay readable. */
export function stateDocumentText(state: ExplorerState): string {
  return `${JSON.stringify(toWidgetStateDocument(state), null, 2)}\n`;
}

/** Reads a state document (or a bare explorer state), text or parsed. Shape only: see loadExplorerState. */
export function parseExplorerState(input: string | unknown, source = "state"): ExplorerState {
  return locateState(input, source).state;
}

export interface LoadedExplorerState {
  readonly state: ExplorerState;
  /** The state recomputed by this quietframe. */
  readonly computation: ExplorerComputation;
  /** Whether the recomputed curves are bit for bit those the file records; the caller decides what a mismatch means. */
  readonly fingerprintMatches: boolean;
  /** Where the state sits in the input (for messages about its fields). */
  readonly path: string;
}

/** Parses and recomputes a state; errors name the field in the file (e.g. `state.values.membrane.temperature`). */
export function loadExplorerState(input: string | unknown, source = "state"): LoadedExplorerState {
  const { state, path } = locateState(input, source);
  // The set-up first: the controls are resolved against it and assume it is well formed.
  rebasedErrors(
    (p) => `${path}.setup.${p}`,
    () => loadSetup(state.setup),
  );
  // Model paths are relative to the state (`values.…`, `controls[0]…`, `settings.…`) or, for set-up problems, to the set-up.
  const computation = rebasedErrors(
    (p) => `${path}.${STATE_FIELD.test(p) ? "" : "setup."}${p}`,
    () => computeExplorer(state),
  );
  return { state, computation, fingerprintMatches: computation.fingerprint === state.fingerprint, path };
}

/** The fields of an explorer state its fingerprint does not cover, each with the reason it cannot change the curves. */
export function explorerUncheckedFields(state: ExplorerState, path: string): UncheckedField[] {
  return [
    ...setupUncheckedFields(state.setup, state.values, path),
    ...setupGridUnchecked(state.setup, path, `the curves are computed on ${path}.settings.grid, which the fingerprint covers (its frequencies are hashed)`),
    ...state.controls.map((_control, i) => ({ path: `${path}.controls[${i}]`, reason: "a slider's label, range and scale; the value computed is in values" })),
    {
      path: `${path}.settings.spectralDensity`,
      reason: "chooses whether the fingerprinted power spectral densities are drawn and exported as they are or as their square roots (amplitude densities); no computed number changes",
    },
    ...(state.settings.title === undefined ? [] : [{ path: `${path}.settings.title`, reason: "the chart's title, text only" }]),
    ...(state.settings.targetDb === undefined ? [] : [{ path: `${path}.settings.targetDb`, reason: "a target line drawn on the ratio panel; no computed number changes" }]),
  ];
}

function locateState(input: unknown, source: string): { state: ExplorerState; path: string } {
  const value = typeof input === "string" ? parseStateText(input, source) : input;
  const top = expectRecord(value, source, "a widget-state document or an explorer state (a JSON object)");
  if (hasOwn(top, "format")) return { state: checkState(top, source), path: source };
  if (!hasOwn(top, "version_major")) {
    throw new QuietframeError({
      path: source,
      problem: "is neither a Jupyter widget-state document nor a quietframe explorer state",
      allowed: `{"version_major": 2, "version_minor": 0, "state": {…}} or {"format": "${EXPLORER_STATE_FORMAT}", …}`,
    });
  }
  if (top.version_major !== 2) {
    throw new QuietframeError({ path: `${source}.version_major`, value: top.version_major, problem: "is not a widget-state format this quietframe reads", allowed: "2" });
  }
  const minor = top.version_minor;
  if (typeof minor !== "number" || !Number.isInteger(minor) || minor < 0) {
    throw new QuietframeError({ path: `${source}.version_minor`, value: minor, problem: "must be a non-negative integer", allowed: "0" });
  }
  const models = expectRecord(top.state, `${source}.state`, "an object of widget models keyed by model id");
  const ours = Object.keys(models).filter((id) => {
    const m = models[id];
    return isRecord(m) && m.model_module === WIDGET_MODULE && m.model_name === EXPLORER_MODEL_NAME;
  });
  if (ours.length !== 1) {
    throw new QuietframeError({
      path: `${source}.state`,
      value: ours.length ? ours : undefined,
      problem: ours.length ? `holds ${ours.length} quietframe explorer models` : "holds no quietframe explorer model",
      allowed: `exactly one model with model_module "${WIDGET_MODULE}" and model_name "${EXPLORER_MODEL_NAME}" (or pass one model's state on its own)`,
    });
  }
  const id = ours[0];
  const modelPath = `${source}.state${/^[A-Za-z0-9_-]+$/.test(id) ? `.${id}` : `[${JSON.stringify(id)}]`}`;
  const model = models[id] as Record<string, unknown>;
  if (model.model_module_version !== undefined && typeof model.model_module_version !== "string") {
    throw new QuietframeError({ path: `${modelPath}.model_module_version`, value: model.model_module_version, problem: "must be a string", allowed: `a version such as "${QUIETFRAME_VERSION}"` });
  }
  if (model.buffers !== undefined && !(Array.isArray(model.buffers) && model.buffers.length === 0)) {
    throw new QuietframeError({ path: `${modelPath}.buffers`, problem: "must be empty", allowed: "no binary buffers (an explorer state is plain JSON)" });
  }
  const statePath = `${modelPath}.state`;
  return { state: checkState(model.state, statePath), path: statePath };
}

/** Checks an explorer state field by field and returns a fresh copy of it. */
function checkState(input: unknown, path: string): ExplorerState {
  const obj = expectRecord(input, path, `an explorer state {"format": "${EXPLORER_STATE_FORMAT}", …}`);
  if (obj.format !== EXPLORER_STATE_FORMAT) {
    throw new QuietframeError({ path: `${path}.format`, value: obj.format, problem: "is not a quietframe explorer state", allowed: `"${EXPLORER_STATE_FORMAT}"` });
  }
  // The version before the keys: a newer file may have fields this version does not know.
  const version = obj.version;
  if (typeof version !== "number" || !Number.isInteger(version) || version < 1) {
    throw new QuietframeError({ path: `${path}.version`, value: version, problem: "must be a positive integer", allowed: String(EXPLORER_STATE_VERSION) });
  }
  if (version > EXPLORER_STATE_VERSION) {
    throw new QuietframeError({
      path: `${path}.version`,
      value: version,
      problem: "was written by a newer quietframe than this one",
      allowed: `versions up to ${EXPLORER_STATE_VERSION}; upgrade quietframe to read it`,
    });
  }
  rejectUnknownKeys(obj, STATE_KEYS, path, "an explorer state");
  const quietframe = obj.quietframe;
  if (typeof quietframe !== "string" || !VERSION_PATTERN.test(quietframe)) {
    throw new QuietframeError({ path: `${path}.quietframe`, value: quietframe, problem: "is not a quietframe version", allowed: `a version such as "${QUIETFRAME_VERSION}"` });
  }
  const setupRecord = expectRecord(obj.setup, `${path}.setup`, "a set-up object (docs/setup-format.md)");
  const setup = copyJson(setupRecord, `${path}.setup`, 0) as unknown as SetupDescription;
  const controls = expectArray(obj.controls, `${path}.controls`, "an array of controls (may be empty)").map((c, i) => checkControlSpec(c, `${path}.controls[${i}]`));
  const values = checkControlValues(obj.values, `${path}.values`);
  const settings = checkSettings(obj.settings, `${path}.settings`);
  const fingerprint = expectFingerprint(obj.fingerprint, `${path}.fingerprint`, "curve");
  return { format: EXPLORER_STATE_FORMAT, version, quietframe, setup, controls, values, settings, fingerprint };
}

function checkSettings(input: unknown, path: string): ExplorerSettings {
  const obj = expectRecord(input, path, '{"grid": {…}, "spectralDensity": "amplitude"}');
  rejectUnknownKeys(obj, SETTINGS_KEYS, path, "the settings");
  const grid = expectRecord(obj.grid, `${path}.grid`, '{"from": "10 Hz", "to": "10 kHz", "points": 400}');
  rejectUnknownKeys(grid, GRID_KEYS, `${path}.grid`, "a grid");
  const points = grid.points;
  if (typeof points !== "number" || !Number.isFinite(points)) {
    throw new QuietframeError({ path: `${path}.grid.points`, value: points, problem: "must be a number", allowed: "an integer number of grid points, e.g. 400" });
  }
  const out: ExplorerSettings = {
    grid: {
      from: expectString(grid.from, `${path}.grid.from`, 'a frequency with its unit, e.g. "10 Hz"'),
      to: expectString(grid.to, `${path}.grid.to`, 'a frequency with its unit, e.g. "10 kHz"'),
      points,
    },
    spectralDensity: expectWord(obj.spectralDensity, DENSITIES, `${path}.spectralDensity`),
  };
  if (obj.title !== undefined) out.title = expectString(obj.title, `${path}.title`, "text");
  if (obj.targetDb !== undefined) out.targetDb = checkTargetDb(obj.targetDb, `${path}.targetDb`);
  return out;
}

function hasOwn(obj: object, key: string): boolean {
  return Object.prototype.hasOwnProperty.call(obj, key);
}
