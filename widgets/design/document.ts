/** The design widget's state file: strict reading, widget-state document, recomputation and its fingerprint. */
import { QuietframeError, QUIETFRAME_VERSION, type FigureSpec, type SetupDescription } from "../../src/index";
import { holdsSingleModelState, locateSingleModelState, type SingleModelKind } from "../core/state/single-model-read";
import type { JupyterWidgetStateDocument } from "../core/state/widget-state";
import { copyJson, expectFingerprint, expectRecord, FINGERPRINT_PATTERN, modelIdOf, rebasedErrors, rejectUnknownKeys, singleModelDocument, VERSION_PATTERN } from "../core/state/strict-read";
import { computeAnswer } from "./answer";
import { checkAnswer } from "./answer-read";
import { answerFingerprint } from "./fingerprint";
import type { UncheckedField } from "../core/state/reproduction";
import { setupUncheckedFields } from "../core/state/unchecked-fields";
import { DESIGN_MODEL_NAME, DESIGN_STATE_FORMAT, DESIGN_STATE_VERSION, type DesignAnswer, type DesignQuestion, type DesignState, type GridText } from "./format";
import { checkGrid, checkQuestion, withDefined } from "./question-read";

/**
 * A design widget's state file: a Jupyter widget-state document (format 2.0) holding one design
 * model, or the bare state. Reading is strict (unknown or mistyped fields are errors with their
 * path) and builds fresh objects. The page reads the answer it carries (readDesignState); Node
 * computes it again from the question and compares fingerprints (loadDesignState).
 */

const STATE_KEYS = ["format", "version", "quietframe", "setup", "figure", "grid", "question", "title", "answer", "fingerprint", "sweep"] as const;

/** A new state: the question, its answer and the answer's fingerprint. */
export function designState(
  setup: SetupDescription,
  figure: FigureSpec,
  question: DesignQuestion,
  answer: DesignAnswer,
  options: { grid?: GridText; title?: string; sweep?: DesignState["sweep"] } = {},
): DesignState {
  return withDefined({
    format: DESIGN_STATE_FORMAT,
    version: DESIGN_STATE_VERSION,
    quietframe: QUIETFRAME_VERSION,
    setup: structuredClone(setup),
    figure: structuredClone(figure),
    grid: options.grid && structuredClone(options.grid),
    question: structuredClone(question),
    title: options.title,
    answer,
    fingerprint: answerFingerprint(answer),
    sweep: options.sweep && { ...options.sweep },
  });
}

/** Deterministic model id: the same answer always gets the same id. */
export function designModelId(fingerprint: string): string {
  return modelIdOf("quietframe-design-", fingerprint);
}

export function toDesignDocument(state: DesignState): JupyterWidgetStateDocument {
  const clean = checkDesignState(state, "state");
  return singleModelDocument(designModelId(clean.fingerprint), DESIGN_MODEL_NAME, clean);
}

/** The state file's text: two-space JSON and a final newline. */
export function designDocumentText(state: DesignState): string {
  return `${JSON.stringify(toDesignDocument(state), null, 2)}\n`;
}

/** True when the input (text or parsed) is a design state or a document holding one; never throws. */
export function isDesignInput(input: unknown): boolean {
  return holdsSingleModelState(input, STATE_KIND);
}

/** Reads a state as it is (the answer it carries, nothing computed): what the page draws. */
export function readDesignState(input: unknown, source = "state"): DesignState {
  return locate(input, source).state;
}

export interface LoadedDesignState {
  /** The state with the answer computed again (and the stored fingerprint, so a page can tell a mismatch). */
  readonly state: DesignState;
  readonly recomputedFingerprint: string;
  readonly fingerprintMatches: boolean;
  /** Where the state sits in the input (for messages about its fields). */
  readonly path: string;
}

/** Reads a state and computes its answer again from the question; errors name the field in the file. */
export function loadDesignState(input: unknown, source = "state"): LoadedDesignState {
  const { state, path } = locate(input, source);
  if (state.sweep) {
    // A sweep's answer: computing it again is the whole sweep, so its stored numbers are checked against its fingerprint instead.
    const recomputedFingerprint = answerFingerprint(state.answer);
    return { state, recomputedFingerprint, fingerprintMatches: recomputedFingerprint === state.fingerprint, path };
  }
  const answer = rebasedErrors(
    (p) => `${path}.${fieldOfState(p)}`,
    () => computeAnswer(state.setup, state.figure, state.question, state.grid),
  );
  const recomputedFingerprint = answerFingerprint(answer);
  return { state: { ...state, answer }, recomputedFingerprint, fingerprintMatches: recomputedFingerprint === state.fingerprint, path };
}

/** The fields of a design state its fingerprint does not cover, each with the reason it cannot change the answer. */
export function designUncheckedFields(state: DesignState, path: string): UncheckedField[] {
  return [...setupUncheckedFields(state.setup, {}, path), ...(state.title === undefined ? [] : [{ path: `${path}.title`, reason: "the figure's title, text only" }])];
}

/**
 * Where an engine error's path lies in the state: figure, grid and set-up fields as they are; the
 * options and lists of the engine's calls (options.seed, parameters[0].min, uncertain[1].target,
 * target) are fields of the question; anything else is inside the set-up.
 */
export function fieldOfState(enginePath: string): string {
  if (/^(question|figure|grid|setup)(?=$|[.[])/.test(enginePath)) return enginePath;
  if (/^(options\.|parameters(?=$|[.[])|uncertain(?=$|[.[])|target$)/.test(enginePath)) return `question.${enginePath.replace(/^options\./, "")}`;
  return `setup.${enginePath}`;
}

function locate(input: unknown, source: string): { state: DesignState; path: string } {
  return locateSingleModelState(input, source, STATE_KIND);
}

const STATE_KIND: SingleModelKind<DesignState> = { what: "design", format: DESIGN_STATE_FORMAT, modelName: DESIGN_MODEL_NAME, check: (input, path) => checkDesignState(input, path) };

/** Checks a design state field by field and returns a fresh copy. */
export function checkDesignState(input: unknown, path: string): DesignState {
  const o = expectRecord(input, path, `a design state {"format": "${DESIGN_STATE_FORMAT}", …}`);
  if (o.format !== DESIGN_STATE_FORMAT) throw new QuietframeError({ path: `${path}.format`, value: o.format, problem: "is not a quietframe design state", allowed: `"${DESIGN_STATE_FORMAT}"` });
  const version = o.version;
  if (typeof version !== "number" || !Number.isInteger(version) || version < 1)
    throw new QuietframeError({ path: `${path}.version`, value: version, problem: "must be a positive integer", allowed: String(DESIGN_STATE_VERSION) });
  if (version > DESIGN_STATE_VERSION)
    throw new QuietframeError({
      path: `${path}.version`,
      value: version,
      problem: "was written by a newer quietframe than this one",
      allowed: `versions up to ${DESIGN_STATE_VERSION}; upgrade quietframe to read it`,
    });
  rejectUnknownKeys(o, STATE_KEYS, path, "a design state");
  if (typeof o.quietframe !== "string" || !VERSION_PATTERN.test(o.quietframe))
    throw new QuietframeError({ path: `${path}.quietframe`, value: o.quietframe, problem: "is not a quietframe version", allowed: `a version such as "${QUIETFRAME_VERSION}"` });
  const setup = copyJson(expectRecord(o.setup, `${path}.setup`, "a set-up object (docs/setup-format.md)"), `${path}.setup`, 0) as unknown as SetupDescription;
  const figure = copyJson(expectRecord(o.figure, `${path}.figure`, 'a figure of merit such as { "kind": "best-margin" }'), `${path}.figure`, 0) as unknown as FigureSpec;
  const question = checkQuestion(o.question, `${path}.question`);
  if (o.title !== undefined && (typeof o.title !== "string" || o.title.length > 200))
    throw new QuietframeError({ path: `${path}.title`, value: o.title, problem: "must be text of at most 200 characters", allowed: "plain text" });
  const fingerprint = expectFingerprint(o.fingerprint, `${path}.fingerprint`, "answer");
  return withDefined({
    format: DESIGN_STATE_FORMAT,
    version,
    quietframe: o.quietframe,
    setup,
    figure,
    grid: checkGrid(o.grid, `${path}.grid`),
    question,
    title: o.title as string | undefined,
    answer: checkAnswer(o.answer, `${path}.answer`, question.kind),
    fingerprint,
    sweep: checkSweepMark(o.sweep, `${path}.sweep`),
  });
}

function checkSweepMark(input: unknown, path: string): DesignState["sweep"] {
  if (input === undefined) return undefined;
  const o = expectRecord(input, path, '{ "fingerprint": "sha256:…", "result": "sha256:…" }');
  rejectUnknownKeys(o, ["fingerprint", "result"], path, "a sweep's mark");
  for (const key of ["fingerprint", "result"] as const) {
    if (typeof o[key] !== "string" || !FINGERPRINT_PATTERN.test(o[key]))
      throw new QuietframeError({ path: `${path}.${key}`, value: o[key], problem: "is not a sweep fingerprint", allowed: '"sha256:" followed by 64 lowercase hex digits' });
  }
  return { fingerprint: o.fingerprint as string, result: o.result as string };
}
