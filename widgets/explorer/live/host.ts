/** What the live explorer needs from the kernel's widget layer (tests give an in-memory one). */
import type { MimeBundle } from "../../core/notebook/display";

/**
 * What the live explorer needs from the kernel's widget layer: open a model on the Jupyter
 * widget protocol with its whole state, watch and change its keys, and display it. The
 * quietframe kernel provides it (see kernel-host.ts); tests provide an in-memory one, so the
 * explorer's logic is checked without a kernel.
 */
export interface LiveModel {
  /** The model id (the comm id), as front-ends and saved widget state know it. */
  readonly id: string;
  get(key: string): unknown;
  /** Changes keys here and sends them to every front-end. */
  set(patch: Record<string, unknown>): void;
  /** "change:<key>" or "change"; fired for changes from a front-end. "close" when either side closed it. */
  on(event: string, callback: (...args: unknown[]) => void): void;
  close(): void;
}

/** A standard control or container of @jupyter-widgets/controls. */
export type StandardControl = "FloatSlider" | "FloatLogSlider" | "Text" | "Dropdown";

export interface WidgetHost {
  /** A standard control; `state` holds only the keys that differ from the control's defaults. */
  control(kind: StandardControl, state: Record<string, unknown>): LiveModel;
  /** A VBox of the given models, in order. */
  vbox(children: readonly LiveModel[]): LiveModel;
  /** A model of our own; `state` is complete, with its _model_* and _view_* keys. */
  custom(state: Record<string, unknown>): LiveModel;
  /** Displays a model's view, with `fallback` for front-ends that cannot show it. */
  display(model: LiveModel, fallback: MimeBundle): void;
  /**
   * Runs `task` once the front-end messages already waiting are handled; a later task with the
   * same key replaces one not yet run. Without it (in-memory hosts) tasks run at once.
   */
  defer?(key: object, task: () => void): void;
}
