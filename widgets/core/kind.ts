/**
 * What every widget kind provides. The registry (widgets/registry.ts) lists one object of this
 * shape per kind, and the browser runtime, the state loader, the notebook API and
 * `quietframe render` go through it instead of knowing the kinds. A kind's object is safe in
 * both places it runs: its page writers are pure (Node reads the runtime and renders the
 * figure: render/kind-output.ts) and its view touches the DOM only once booted.
 */
import type { FragmentParts, PageParts } from "./page/parts";
import type { UncheckedField } from "./state/reproduction";

export type { UncheckedField };

/** Which of several widgets a document holds, where a kind's reader can choose (1-based). */
export interface LoadOptions {
  widget?: number;
}

/** A saved state, strictly read and (for kinds that compute) recomputed. */
export interface LoadedWidget<S = unknown> {
  readonly state: S;
  /**
   * The stored fingerprint (null when the state records none, e.g. one written before its kind
   * had one), this quietframe's, and who wrote the state.
   */
  readonly fingerprint: { readonly stored: string | null; readonly recomputed: string; readonly writtenBy: string };
  /** Fields the fingerprint does not cover because they cannot change the numbers; `render --strict` lists them. */
  readonly unchecked?: readonly UncheckedField[];
  /** Warnings of the recomputation (not errors: the widget shows them with its figure). */
  readonly warnings: readonly string[];
  /** Safety cautions of the set-up at the state's values. */
  readonly cautions: readonly string[];
}

/** The static figure of a loaded state: its Vega-Lite spec and the plotted numbers. */
export interface FigureSource {
  readonly spec: Record<string, unknown>;
  /** Every plotted number in shortest round-trip form. */
  readonly csv: string;
}

/** A live widget in a page: its root element, and how to let go of it. */
export interface LiveWidget {
  readonly element: HTMLElement;
  dispose(): void;
}

/** A saved state of any kind, checked and ready to be put in a page as a new live widget. */
export interface OpenedState {
  /** Class of the kind's root element (WidgetView.className). */
  readonly className: string;
  /** Class of the JSON script the kind's view boots from (WidgetView.stateScriptClass). */
  readonly stateScriptClass: string;
  /** The state as the kind's "Download state" saves it. */
  readonly stateText: string;
}

/** What the runtime offers a view while booting. */
export interface BootContext {
  /** Boots the new widgets of every kind under root (a view that opens others, e.g. a cell's explorer). */
  boot(root: ParentNode): void;
  /** Disposes the live widgets of every kind inside slot, before the slot's content is replaced. */
  release(slot: Element): void;
  /** Reads a saved state of any kind strictly and recomputes it (the registry finds its kind); errors name the field. */
  open(text: string, source: string): OpenedState;
}

/** A kind's browser side. */
export interface WidgetView {
  /** Class of the kind's root element in a page fragment. */
  readonly className: string;
  /** Class of the JSON script inside that root which holds the state the view boots from. */
  readonly stateScriptClass: string;
  /** Starts a live widget for each new element under root; returns those started. */
  boot(root: ParentNode, context: BootContext): readonly LiveWidget[];
  /** The live widgets, in boot order. */
  live(): readonly LiveWidget[];
  /** Disposes the live widgets inside slot. */
  release(slot: Element): void;
  /**
   * Where pages and tests read the live widgets: a property of window.quietframeRuntime
   * and/or a function on window returning the list.
   */
  readonly exposeAs?: { readonly runtime?: string; readonly window?: string };
}

export interface WidgetKind<L extends LoadedWidget = LoadedWidget> {
  /** Short name, e.g. "explorer". */
  readonly name: string;
  /** The `format` field of the kind's saved state, e.g. "quietframe.explorer". */
  readonly stateFormat: string;
  /** Whether parsed JSON is (or holds) a saved state of this kind; never throws. */
  recognises(value: unknown): boolean;
  /** Reads a saved state strictly (text or parsed) and recomputes it; errors name the field. */
  load(input: unknown, source: string, options?: LoadOptions): L;
  /**
   * For a kind whose recomputation is asynchronous (the tolerance map): computes the loaded
   * state's numbers again and returns it with them and their fingerprint. `render --strict`
   * calls it; `load` alone then checks only the stored numbers against the stored fingerprint.
   */
  recompute?(loaded: L, source: string): Promise<L>;
  figure(loaded: L): FigureSource;
  /** The state as the kind's "Download state" saves it (what its view boots from). */
  stateText(loaded: L): string;
  /** The fragment a notebook output or page embeds (static fallback, state, bootstrap). */
  fragment(loaded: L, parts: FragmentParts): string;
  /** A complete standalone page. */
  page(loaded: L, parts: PageParts): string;
  readonly view: WidgetView;
}
