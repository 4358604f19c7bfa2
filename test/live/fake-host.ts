import type { MimeBundle } from "../../widgets/core/notebook/display";
import type { LiveModel, StandardControl, WidgetHost } from "../../widgets/explorer/live/host";

/**
 * An in-memory widget host: models hold their state and fire "change:<key>" and "change"
 * for updates that come from the (simulated) front-end, the way a kernel's widget layer
 * does for comm messages. Kernel-side `set` records what would be sent.
 */
export class FakeModel implements LiveModel {
  readonly sent: Record<string, unknown>[] = [];
  closed = false;
  private readonly state: Record<string, unknown>;
  private readonly listeners = new Map<string, ((...args: unknown[]) => void)[]>();

  constructor(
    readonly id: string,
    readonly kind: string,
    state: Record<string, unknown>,
  ) {
    this.state = { ...state };
  }

  get(key: string): unknown {
    return this.state[key];
  }

  set(patch: Record<string, unknown>): void {
    Object.assign(this.state, patch);
    this.sent.push(patch);
  }

  on(event: string, callback: (...args: unknown[]) => void): void {
    this.listeners.set(event, [...(this.listeners.get(event) ?? []), callback]);
  }

  /** Closes it, from either side, telling "close" listeners once (as a comm does). */
  close(): void {
    if (this.closed) return;
    this.closed = true;
    for (const cb of this.listeners.get("close") ?? []) cb();
  }

  /** An update as a front-end sends it when the user moves the control. */
  frontEndUpdate(patch: Record<string, unknown>): void {
    Object.assign(this.state, patch);
    for (const key of Object.keys(patch)) for (const cb of this.listeners.get(`change:${key}`) ?? []) cb(patch[key]);
    for (const cb of this.listeners.get("change") ?? []) cb(patch);
  }

  snapshot(): Record<string, unknown> {
    return { ...this.state };
  }
}

export class FakeHost implements WidgetHost {
  readonly models: FakeModel[] = [];
  readonly displayed: { model: LiveModel; fallback: MimeBundle }[] = [];

  control(kind: StandardControl, state: Record<string, unknown>): FakeModel {
    return this.add(kind, state);
  }

  vbox(children: readonly LiveModel[]): FakeModel {
    // Jupyter widget protocol: containers refer to children as "IPY_MODEL_<model id>".
    return this.add("VBox", { children: children.map((c) => `IPY_MODEL_${c.id}`) });
  }

  custom(state: Record<string, unknown>): FakeModel {
    return this.add(String(state._model_name), state);
  }

  display(model: LiveModel, fallback: MimeBundle): void {
    this.displayed.push({ model, fallback });
  }

  byKind(kind: string): FakeModel[] {
    return this.models.filter((m) => m.kind === kind);
  }

  private add(kind: string, state: Record<string, unknown>): FakeModel {
    const model = new FakeModel(`m${this.models.length + 1}`, kind, state);
    this.models.push(model);
    return model;
  }
}

/** A host that defers like the kernel during a burst: tasks wait, newest per key, until `settleAll`. */
export class DeferringHost extends FakeHost {
  readonly waiting = new Map<object, () => void>();

  defer(key: object, task: () => void): void {
    this.waiting.delete(key);
    this.waiting.set(key, task);
  }

  settleAll(): void {
    const tasks = [...this.waiting.values()];
    this.waiting.clear();
    for (const task of tasks) task();
  }
}
