/** A widget model on the Jupyter widget message protocol 2.1, kept in step with every front-end. */
import { QuietframeError, showValue } from "../../../src/index";
import { RESERVED_KEYS } from "../state/strict-read";
import { clip, echoable } from "./bounded-text";
import { bytesOf, checkBufferPaths, putBuffers, removeBuffers, type BufferPath } from "./buffers";
import type { Comm, CommMessage } from "./comm";
import type { CommManager } from "./comm-manager";
import { kernelComms } from "./kernel-comms";
import { widgetRegistry } from "./widget-registry";

/**
 * A kernel-side model of the Jupyter widget message protocol 2.1 (@jupyter-widgets/schema,
 * messages.md, "Widget messaging protocol, version 2"): opened on the "jupyter.widget" target
 * with its full state, kept in step with the front-ends by `update` / `echo_update`,
 * answering `request_state`, and exchanging `custom` messages.
 *
 * Front-end input is checked before anything changes: an unknown key, a key the protocol
 * holds immutable, or a value the model's validator rejects leaves the state as it was;
 * the front-end gets a `custom` message with the error and an `update` restoring what the
 * kernel holds, and the kernel log gets a line. Nothing a front-end sends throws here, and
 * the names and values it sent are echoed cut to a stated length (bounded-text.ts).
 */

export const WIDGET_TARGET = "jupyter.widget";
/** Protocol version in comm_open metadata. */
export const WIDGET_PROTOCOL_VERSION = "2.1.0";

/** Keys set at creation and never changed (messages.md, "Widget state"). */
export const IMMUTABLE_KEYS: readonly string[] = ["_model_module", "_model_module_version", "_model_name", "_view_module", "_view_module_version", "_view_name"];

/**
 * Checks one value for a key; returns the value to store (possibly normalised) or throws
 * (a QuietframeError says best what is allowed). Gets the state as it will be after the
 * whole patch, so ranges can depend on other keys (value within min…max).
 */
export type Validator = (value: unknown, next: Readonly<Record<string, unknown>>) => unknown;

export type ChangeSource = "kernel" | "frontend";
export type KeyListener = (value: unknown, old: unknown, source: ChangeSource) => void;
export type ChangesListener = (changes: Readonly<Record<string, unknown>>, source: ChangeSource) => void;
export type CustomListener = (content: unknown, buffers: readonly Uint8Array[]) => void;

export interface WidgetModelOptions {
  /** Validators by key; keys without one take any JSON value or binary data. */
  validators?: Readonly<Record<string, Validator>>;
  /** Comm manager to open on; default: the running quietframe kernel's. */
  comms?: CommManager;
  /** Send echo_update after accepting a front-end update (protocol 2.1). Default true. */
  echo?: boolean;
}

/** What a front-end receives in a `custom` message when its message was refused. */
export interface WidgetErrorContent {
  error: { method: string; message: string; path?: string; problem?: string; allowed?: string };
}

export class WidgetModel {
  readonly id: string;
  private readonly comm: Comm;
  private current: Record<string, unknown>;
  private readonly validators: Readonly<Record<string, Validator>>;
  private readonly echo: boolean;
  private readonly keyListeners = new Map<string, KeyListener[]>();
  private readonly changeListeners: ChangesListener[] = [];
  private readonly customListeners: CustomListener[] = [];
  private readonly closeListeners: (() => void)[] = [];
  private readonly comms: CommManager;

  constructor(state: Record<string, unknown>, options: WidgetModelOptions = {}) {
    const comms = options.comms ?? kernelComms();
    if (!comms) {
      throw new QuietframeError({
        path: "kernel",
        problem: "live widget models need a kernel with comms, and this process is not the quietframe kernel",
        allowed: 'the "TypeScript (quietframe)" kernel (quietframe kernel install), or the kernel-free output',
      });
    }
    for (const key of ["_model_name", "_model_module", "_model_module_version"]) {
      if (typeof state[key] !== "string") throw new QuietframeError({ path: `state.${key}`, value: state[key], problem: "is required to create a widget model", allowed: "a string" });
    }
    this.comms = comms;
    this.validators = options.validators ?? {};
    this.echo = options.echo ?? true;
    this.current = { ...state };
    const split = removeBuffers(this.current);
    this.comm = comms.open(WIDGET_TARGET, { state: split.state, buffer_paths: split.buffer_paths }, { version: WIDGET_PROTOCOL_VERSION }, split.buffers);
    this.id = this.comm.id;
    widgetRegistry().set(this.id, { id: this.id, fullState: () => removeBuffers(this.current) });
    this.comm.onMessage((msg) => this.receive(msg));
    this.comm.onInvalid((problem) => this.refuse("comm_msg", problem));
    this.comm.onClose(() => this.closed());
  }

  /** "IPY_MODEL_<id>": how another model's state refers to this one (children, layout, style). */
  get ref(): string {
    return `IPY_MODEL_${this.id}`;
  }

  get isClosed(): boolean {
    return this.comm.isClosed;
  }

  get(key: string): unknown {
    return this.current[key];
  }

  /** A copy of the whole state. */
  get state(): Record<string, unknown> {
    return { ...this.current };
  }

  /**
   * Changes keys from the kernel and sends an `update` to the front-ends. Throws a
   * QuietframeError (and changes nothing) when a key is unknown or a validator refuses.
   */
  set(patch: Record<string, unknown>): void {
    this.assertOpen();
    const checked = this.check(patch);
    if ("error" in checked) throw checked.error;
    const changes = this.apply(checked.accepted);
    this.sendState("update", checked.accepted);
    this.notify(changes, "kernel");
  }

  /** Sends a `custom` message to the front-end model. */
  send(content: unknown, buffers: readonly Uint8Array[] = []): void {
    this.assertOpen();
    this.comm.send({ method: "custom", content }, {}, buffers);
  }

  on(event: "change", cb: ChangesListener): void;
  on(event: `change:${string}`, cb: KeyListener): void;
  on(event: "custom", cb: CustomListener): void;
  on(event: "close", cb: () => void): void;
  on(event: string, cb: ChangesListener | KeyListener | CustomListener | (() => void)): void {
    if (event === "change") this.changeListeners.push(cb as ChangesListener);
    else if (event === "custom") this.customListeners.push(cb as CustomListener);
    else if (event === "close") this.closeListeners.push(cb as () => void);
    else if (event.startsWith("change:")) {
      const key = event.slice("change:".length);
      const list = this.keyListeners.get(key) ?? [];
      list.push(cb as KeyListener);
      this.keyListeners.set(key, list);
    } else throw new QuietframeError({ path: "event", value: event, problem: "is not a widget model event", allowed: '"change", "change:<key>", "custom", "close"' });
  }

  /** Closes the comm; the front-end's views go away. Closing twice does nothing. */
  close(): void {
    this.comm.close();
  }

  // --- front-end → kernel ---------------------------------------------------------------

  private receive(msg: CommMessage): void {
    const method = msg.data.method;
    switch (method) {
      case "update":
        return this.receiveUpdate(msg);
      case "request_state":
        // messages.md, "State requests": answer with an update holding the entire state.
        return this.sendState("update", this.current);
      case "custom":
        for (const cb of [...this.customListeners]) this.guard("custom listener", () => cb(msg.data.content, msg.buffers));
        return;
      default:
        return this.refuse(
          typeof method === "string" ? method : "(no method)",
          typeof method === "string" ? `unknown method "${clip(method)}"` : "data.method is missing",
          "update, request_state or custom",
        );
    }
  }

  private receiveUpdate(msg: CommMessage): void {
    const state = msg.data.state;
    if (typeof state !== "object" || state === null || Array.isArray(state)) return this.refuse("update", "data.state must be an object of key → value");
    const pathsProblem = checkBufferPaths(msg.data.buffer_paths, msg.buffers.length);
    if (pathsProblem) return this.refuse("update", pathsProblem);
    const patch = { ...(state as Record<string, unknown>) };
    try {
      putBuffers(patch, (msg.data.buffer_paths ?? []) as BufferPath[], msg.buffers);
    } catch (e) {
      return this.refuse("update", (e as Error).message);
    }
    const checked = this.check(patch);
    if ("error" in checked) {
      this.refuse("update", checked.error);
      // Put the front-end's controls back where the kernel's state is.
      const restore: Record<string, unknown> = {};
      for (const key of Object.keys(patch)) if (Object.prototype.hasOwnProperty.call(this.current, key)) restore[key] = this.current[key];
      if (Object.keys(restore).length > 0) this.sendState("update", restore);
      return;
    }
    const changes = this.apply(checked.accepted);
    // messages.md, "Synchronizing multiple frontends: echo_update" (2.1): echo what was applied.
    if (this.echo) this.sendState("echo_update", checked.accepted);
    // A normalised value differs from what the front-end shows: a plain update sets it there.
    const normalised: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(checked.accepted)) if (!sameValue(value, patch[key])) normalised[key] = value;
    if (Object.keys(normalised).length > 0) this.sendState("update", normalised);
    this.notify(changes, "frontend");
  }

  // --- shared ----------------------------------------------------------------------------

  private check(patch: Record<string, unknown>): { accepted: Record<string, unknown> } | { error: QuietframeError } {
    if (typeof patch !== "object" || patch === null || Array.isArray(patch)) {
      return { error: new QuietframeError({ path: this.where(""), value: patch, problem: "a state change must be an object of key → value" }) };
    }
    const next = { ...this.current, ...patch };
    const accepted: Record<string, unknown> = {};
    for (const [key, value] of Object.entries(patch)) {
      if (RESERVED_KEYS.has(key)) {
        return { error: new QuietframeError({ path: this.where(key), problem: "is a name reserved by JavaScript objects, never a key of a widget model", allowed: "keys of this model's state" }) };
      }
      if (!Object.prototype.hasOwnProperty.call(this.current, key)) {
        return {
          error: new QuietframeError({
            path: this.where(key),
            value: echoable(value),
            problem: "is not a key of this model",
            allowed: Object.keys(this.current)
              .filter((k) => !k.startsWith("_"))
              .join(", "),
          }),
        };
      }
      if (IMMUTABLE_KEYS.includes(key) && !sameValue(value, this.current[key])) {
        return { error: new QuietframeError({ path: this.where(key), value: echoable(value), problem: "is fixed when the model is created", allowed: showValue(this.current[key]) }) };
      }
      const validator = this.validators[key];
      if (!validator) {
        accepted[key] = value;
        continue;
      }
      try {
        accepted[key] = validator(value, next);
      } catch (e) {
        const error = e instanceof QuietframeError ? e : new QuietframeError({ path: this.where(key), value: echoable(value), problem: clip(e instanceof Error ? e.message : String(e)) });
        return { error };
      }
    }
    return { accepted };
  }

  private apply(accepted: Record<string, unknown>): Record<string, { value: unknown; old: unknown }> {
    const changes: Record<string, { value: unknown; old: unknown }> = {};
    for (const [key, value] of Object.entries(accepted)) {
      const old = this.current[key];
      this.current[key] = value;
      if (!sameValue(value, old)) changes[key] = { value, old };
    }
    return changes;
  }

  private notify(changes: Record<string, { value: unknown; old: unknown }>, source: ChangeSource): void {
    const keys = Object.keys(changes);
    if (keys.length === 0) return;
    for (const key of keys) {
      for (const cb of [...(this.keyListeners.get(key) ?? [])]) this.guard(`change:${key} listener`, () => cb(changes[key].value, changes[key].old, source));
    }
    const values = Object.fromEntries(keys.map((k) => [k, changes[k].value]));
    for (const cb of [...this.changeListeners]) this.guard("change listener", () => cb(values, source));
  }

  private sendState(method: "update" | "echo_update", state: Record<string, unknown>): void {
    if (this.comm.isClosed) return;
    const split = removeBuffers(state);
    this.comm.send({ method, state: split.state, buffer_paths: split.buffer_paths }, {}, split.buffers);
  }

  /** Reports a refused front-end message on the comm and in the kernel log. */
  private refuse(method: string, problem: string | QuietframeError, allowed?: string): void {
    const err = typeof problem === "string" ? new QuietframeError({ path: this.where(""), problem, ...(allowed ? { allowed } : {}) }) : problem;
    const shownMethod = clip(method);
    this.comms.log(`widget ${this.id} (${String(this.current._model_name)}): ${shownMethod} refused: ${err.message}`);
    const content: WidgetErrorContent = {
      error: { method: shownMethod, message: err.message, path: err.path, problem: err.problem, ...(err.allowed ? { allowed: err.allowed } : {}) },
    };
    if (!this.comm.isClosed) this.comm.send({ method: "custom", content });
  }

  private guard(what: string, fn: () => void): void {
    try {
      fn();
    } catch (e) {
      this.comms.log(`widget ${this.id}: ${what} failed: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
    }
  }

  private where(key: string): string {
    const name = String(this.current._model_name);
    return key === "" ? name : `${name}.${clip(key)}`;
  }

  private assertOpen(): void {
    if (this.comm.isClosed) throw new QuietframeError({ path: this.where(""), problem: "is closed", allowed: "a model that is still open (create a new one)" });
  }

  private closed(): void {
    widgetRegistry().delete(this.id);
    for (const cb of [...this.closeListeners]) this.guard("close listener", cb);
  }
}

/**
 * Equality for change detection: same primitive, same bytes, or the same JSON-like structure
 * (arrays, plain objects). Binary values are compared byte for byte, never through JSON text
 * (JSON.stringify writes every byte of a typed array as a key of its own).
 */
function sameValue(a: unknown, b: unknown): boolean {
  if (Object.is(a, b)) return true;
  if (typeof a !== "object" || typeof b !== "object" || a === null || b === null) return false;
  const aBinary = a instanceof ArrayBuffer || ArrayBuffer.isView(a);
  const bBinary = b instanceof ArrayBuffer || ArrayBuffer.isView(b);
  if (aBinary || bBinary) return aBinary && bBinary && sameBytes(a as ArrayBuffer | ArrayBufferView, b as ArrayBuffer | ArrayBufferView);
  if (Array.isArray(a) || Array.isArray(b)) {
    if (!Array.isArray(a) || !Array.isArray(b) || a.length !== b.length) return false;
    return a.every((item, i) => sameValue(item, b[i]));
  }
  const aKeys = Object.keys(a);
  if (aKeys.length !== Object.keys(b).length) return false;
  return aKeys.every((k) => Object.prototype.hasOwnProperty.call(b, k) && sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

function sameBytes(a: ArrayBuffer | ArrayBufferView, b: ArrayBuffer | ArrayBufferView): boolean {
  const x = bytesOf(a);
  const y = bytesOf(b);
  if (x.byteLength !== y.byteLength) return false;
  for (let i = 0; i < x.byteLength; i++) if (x[i] !== y[i]) return false;
  return true;
}
