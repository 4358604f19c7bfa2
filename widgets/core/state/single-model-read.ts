/**
 * Finding a kind's state in what a user hands in: a bare state ({"format": …}) or a Jupyter
 * widget-state document holding exactly one model of the kind. Kinds whose saved state is one
 * widget model (trajectory, design) read it through here, with the same errors.
 */
import { QuietframeError, parseJsonText } from "../../../src/index";
import { MAX_STATE_TEXT_BYTES } from "./state-text";
import { expectRecord, isRecord } from "./strict-read";
import { WIDGET_MODULE } from "./widget-state";

export interface SingleModelKind<S> {
  /** The kind in words, as errors name it ("trajectory", "design"). */
  readonly what: string;
  readonly format: string;
  readonly modelName: string;
  /** The kind's strict reader of a bare state at `path`. */
  check(input: unknown, path: string): S;
}

/** True when the input (text or parsed) is a bare state of the kind or a document holding one; never throws. */
export function holdsSingleModelState(input: unknown, kind: Pick<SingleModelKind<unknown>, "format" | "modelName">): boolean {
  let value = input;
  if (typeof input === "string") {
    try {
      value = JSON.parse(input);
    } catch {
      return false;
    }
  }
  if (!isRecord(value)) return false;
  if (value.format === kind.format) return true;
  return isRecord(value.state) && Object.values(value.state).some((m) => isRecord(m) && m.model_module === WIDGET_MODULE && m.model_name === kind.modelName);
}

/** The kind's state, strictly read, and the path of the state inside the input (for errors of later checks). */
export function locateSingleModelState<S>(input: unknown, source: string, kind: SingleModelKind<S>): { state: S; path: string } {
  if (typeof input === "string" && input.length > MAX_STATE_TEXT_BYTES) {
    throw new QuietframeError({ path: source, problem: `is more than ${MAX_STATE_TEXT_BYTES} characters of text`, allowed: "a state document of at most 5 MiB" });
  }
  const value = typeof input === "string" ? parseJsonText(input, source) : input;
  const top = expectRecord(value, source, `a widget-state document or a ${kind.what} state (a JSON object)`);
  if (Object.prototype.hasOwnProperty.call(top, "format")) return { state: kind.check(top, source), path: source };
  if (top.version_major !== 2) {
    throw new QuietframeError({
      path: `${source}.version_major`,
      value: top.version_major,
      problem: "is not a widget-state format this quietframe reads",
      allowed: `2, or a bare state {"format": "${kind.format}", …}`,
    });
  }
  const models = expectRecord(top.state, `${source}.state`, "an object of widget models keyed by model id");
  const ours = Object.keys(models).filter((id) => {
    const m = models[id];
    return isRecord(m) && m.model_module === WIDGET_MODULE && m.model_name === kind.modelName;
  });
  if (ours.length !== 1) {
    throw new QuietframeError({
      path: `${source}.state`,
      problem: ours.length ? `holds ${ours.length} quietframe ${kind.what} models` : `holds no quietframe ${kind.what} model`,
      allowed: `exactly one model with model_module "${WIDGET_MODULE}" and model_name "${kind.modelName}"`,
    });
  }
  const id = ours[0];
  const path = `${source}.state${/^[A-Za-z0-9_-]+$/.test(id) ? `.${id}` : `[${JSON.stringify(id)}]`}.state`;
  return { state: kind.check((models[id] as Record<string, unknown>).state, path), path };
}
