/** Booting the widgets of a page: each new element once, dropping widgets whose element left, failure text. */
import { QuietframeError, QuietframeErrors } from "../../../src/index";

/** Marks an element whose widget has started, so a later boot() leaves it alone. */
export const BOOTED = "data-quietframe-booted";

/**
 * Disposes the widgets in `live` whose element left the page, then starts one widget for each
 * element of `className` under root that has not booted yet. Returns the widgets started.
 */
export function bootNew<W extends { readonly element: HTMLElement; dispose(): void }>(root: ParentNode, className: string, live: W[], start: (element: HTMLElement) => W): W[] {
  pruneDisconnected(live);
  const started: W[] = [];
  for (const element of root.querySelectorAll<HTMLElement>(`.${className}:not([${BOOTED}])`)) {
    element.setAttribute(BOOTED, "");
    const widget = start(element);
    live.push(widget);
    started.push(widget);
  }
  return started;
}

/** Disposes (and drops from `live`) the widgets whose element is inside slot. */
export function releaseWithin<W extends { readonly element: HTMLElement; dispose(): void }>(live: W[], slot: Element): void {
  for (let i = live.length - 1; i >= 0; i--) if (slot.contains(live[i].element)) live.splice(i, 1)[0].dispose();
}

/** Disposes (and drops from `live`) the widgets whose element left the page. */
export function pruneDisconnected<W extends { readonly element: HTMLElement; dispose(): void }>(live: W[]): void {
  for (let i = live.length - 1; i >= 0; i--) if (!live[i].element.isConnected) live.splice(i, 1)[0].dispose();
}

/** The text a widget shows for a failure: the user's problem as stated, anything else as internal. */
export function messageOf(e: unknown): string {
  if (e instanceof QuietframeError || e instanceof QuietframeErrors) return e.message;
  return `internal error: ${e instanceof Error ? e.message : String(e)}`;
}
