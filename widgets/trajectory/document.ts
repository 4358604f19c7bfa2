/** The trajectory widget's state file: strict reading, widget-state document, rerun. */
import { QuietframeError, QUIETFRAME_VERSION, type SetupDescription } from "../../src/index";
import { holdsSingleModelState, locateSingleModelState, type SingleModelKind } from "../core/state/single-model-read";
import type { JupyterWidgetStateDocument } from "../core/state/widget-state";
import { copyJson, expectArray, expectFingerprint, expectRecord, modelIdOf, rebasedErrors, rejectUnknownKeys, singleModelDocument, VERSION_PATTERN } from "../core/state/strict-read";
import { checkControlSpec, checkControlValues, expectQuantity } from "../core/state/control-read";
import type { UncheckedField } from "../core/state/reproduction";
import { setupGridUnchecked, setupUncheckedFields } from "../core/state/unchecked-fields";
import { TRAJECTORY_MODEL_NAME, TRAJECTORY_STATE_FORMAT, TRAJECTORY_STATE_VERSION, type SimulationSpec, type TrajectoryState } from "./format";
import { checkJoint, checkPair } from "./joint";
import { computeTrajectory, type ComputeOptions, type TrajectoryComputation } from "./model";

/**
 * A trajectory widget's state file: a Jupyter widget-state document (format 2.0) holding one
 * trajectory model, or the bare state. Reading is strict (unknown or mistyped fields are
 * errors with their path) and builds fresh objects, so nothing in the input reaches a prototype.
 */

const STATE_KEYS = ["format", "version", "quietframe", "setup", "controls", "values", "simulation", "joint", "pair", "title", "fingerprint"] as const;
const SIMULATION_KEYS = ["duration", "step", "seed", "samples", "initial", "stoppedAfter"] as const;
// Model error paths that already start at a field of the state rather than of the set-up.
const STATE_FIELD = /^(values|controls|simulation|joint|pair|setup)(?=$|[.[])/;

/** Deterministic model id: the same curves always get the same id. */
export function trajectoryModelId(fingerprint: string): string {
  return modelIdOf("quietframe-trajectory-", fingerprint);
}

export function toTrajectoryDocument(state: TrajectoryState): JupyterWidgetStateDocument {
  const clean = checkTrajectoryState(state, "state");
  return singleModelDocument(trajectoryModelId(clean.fingerprint), TRAJECTORY_MODEL_NAME, clean);
}

/** The state file's text: two-space JSON and a final newline. */
export function trajectoryDocumentText(state: TrajectoryState): string {
  return `${JSON.stringify(toTrajectoryDocument(state), null, 2)}\n`;
}

/** True when the input (text or parsed) is a trajectory state or a document holding one; never throws. */
export function isTrajectoryInput(input: unknown): boolean {
  return holdsSingleModelState(input, STATE_KIND);
}

/** Reads a state document or a bare state, text or parsed. Shape only: see loadTrajectoryState. */
export function parseTrajectoryState(input: unknown, source = "state"): TrajectoryState {
  return locate(input, source).state;
}

export interface LoadedTrajectoryState {
  readonly state: TrajectoryState;
  readonly computation: TrajectoryComputation;
  /** Whether the rerun gives bit for bit the curves the file records. */
  readonly fingerprintMatches: boolean;
  /** Where the state sits in the input (for messages about its fields). */
  readonly path: string;
}

/** Parses a state and runs its simulation again; errors name the field in the file. */
export function loadTrajectoryState(input: unknown, source = "state", options: ComputeOptions = {}): LoadedTrajectoryState {
  const { state, path } = locate(input, source);
  const computation = rebased(path, () => computeTrajectory(state, options));
  return { state, computation, fingerprintMatches: computation.fingerprint === state.fingerprint, path };
}

/** The fields of a trajectory state its fingerprint does not cover, each with the reason it cannot change the run. */
export function trajectoryUncheckedFields(state: TrajectoryState, path: string): UncheckedField[] {
  return [
    ...setupUncheckedFields(state.setup, state.values, path),
    ...setupGridUnchecked(state.setup, path, "a trajectory is simulated in time from simulation.duration, step and seed; no frequency grid enters it"),
    ...state.controls.map((_control, i) => ({ path: `${path}.controls[${i}]`, reason: "a slider's label, range and scale; the value simulated is in values" })),
    ...(state.title === undefined ? [] : [{ path: `${path}.title`, reason: "the figure's title, text only" }]),
  ];
}

/** Re-throws model errors with paths into the file: state fields as they are, set-up problems under `setup.`. */
export function rebased<T>(path: string, fn: () => T): T {
  return rebasedErrors((p) => `${path}.${STATE_FIELD.test(p) ? "" : "setup."}${p}`, fn);
}

function locate(input: unknown, source: string): { state: TrajectoryState; path: string } {
  return locateSingleModelState(input, source, STATE_KIND);
}

const STATE_KIND: SingleModelKind<TrajectoryState> = {
  what: "trajectory",
  format: TRAJECTORY_STATE_FORMAT,
  modelName: TRAJECTORY_MODEL_NAME,
  check: (input, path) => checkTrajectoryState(input, path),
};

/** Checks a trajectory state field by field and returns a fresh copy. */
export function checkTrajectoryState(input: unknown, path: string): TrajectoryState {
  const o = expectRecord(input, path, `a trajectory state {"format": "${TRAJECTORY_STATE_FORMAT}", …}`);
  if (o.format !== TRAJECTORY_STATE_FORMAT)
    throw new QuietframeError({ path: `${path}.format`, value: o.format, problem: "is not a quietframe trajectory state", allowed: `"${TRAJECTORY_STATE_FORMAT}"` });
  const version = o.version;
  if (typeof version !== "number" || !Number.isInteger(version) || version < 1)
    throw new QuietframeError({ path: `${path}.version`, value: version, problem: "must be a positive integer", allowed: String(TRAJECTORY_STATE_VERSION) });
  if (version > TRAJECTORY_STATE_VERSION)
    throw new QuietframeError({
      path: `${path}.version`,
      value: version,
      problem: "was written by a newer quietframe than this one",
      allowed: `versions up to ${TRAJECTORY_STATE_VERSION}; upgrade quietframe to read it`,
    });
  rejectUnknownKeys(o, STATE_KEYS, path, "a trajectory state");
  if (typeof o.quietframe !== "string" || !VERSION_PATTERN.test(o.quietframe))
    throw new QuietframeError({ path: `${path}.quietframe`, value: o.quietframe, problem: "is not a quietframe version", allowed: `a version such as "${QUIETFRAME_VERSION}"` });
  const setup = copyJson(expectRecord(o.setup, `${path}.setup`, "a set-up object (docs/setup-format.md)"), `${path}.setup`, 0) as unknown as SetupDescription;
  const controls = expectArray(o.controls, `${path}.controls`, "an array of controls (may be empty)").map((c, i) => checkControlSpec(c, `${path}.controls[${i}]`));
  const values = checkControlValues(o.values, `${path}.values`);
  const simulation = checkSimulation(o.simulation, `${path}.simulation`);
  const joint = checkJoint(o.joint, `${path}.joint`);
  const pair = checkPair(o.pair, `${path}.pair`);
  if (o.title !== undefined && (typeof o.title !== "string" || o.title.length > 200))
    throw new QuietframeError({ path: `${path}.title`, value: o.title, problem: "must be text of at most 200 characters", allowed: "plain text" });
  const fingerprint = expectFingerprint(o.fingerprint, `${path}.fingerprint`, "curve");
  return {
    format: TRAJECTORY_STATE_FORMAT,
    version,
    quietframe: o.quietframe,
    setup,
    controls,
    values,
    simulation,
    joint,
    pair,
    ...(o.title === undefined ? {} : { title: o.title as string }),
    fingerprint,
  };
}

/** Shape of the simulation settings; their values are checked by resolveSimulation. */
function checkSimulation(input: unknown, path: string): SimulationSpec {
  const o = expectRecord(input, path, '{"duration": "200 us", "step": "10 ns", "seed": 1, …}');
  rejectUnknownKeys(o, SIMULATION_KEYS, path, "the simulation settings");
  const out: SimulationSpec = { duration: expectQuantity(o.duration, `${path}.duration`), step: expectQuantity(o.step, `${path}.step`), seed: o.seed as number };
  if (o.samples !== undefined) out.samples = o.samples as number;
  if (o.initial !== undefined) out.initial = o.initial as SimulationSpec["initial"];
  if (o.stoppedAfter !== undefined) out.stoppedAfter = o.stoppedAfter as number | null;
  return out;
}
