/**
 * The onChange listeners of a notebook widget, called in order; one that throws does not stop the
 * rest.
 */
import { QuietframeError } from "../../../src/index";

/** The onChange listeners of one widget, called in the order they were added. */
export class ChangeListeners<C> {
  readonly #listeners: ((change: C) => void)[] = [];

  /** Adds a listener; returns a function that removes it. */
  add(listener: (change: C) => void): () => void {
    if (typeof listener !== "function") {
      throw new QuietframeError({ path: "onChange", value: typeof listener, problem: "needs a function", allowed: "(change) => { … }" });
    }
    this.#listeners.push(listener);
    return () => {
      const i = this.#listeners.indexOf(listener);
      if (i >= 0) this.#listeners.splice(i, 1);
    };
  }

  /** Calls every listener; one that throws is reported and the others still run. */
  notify(change: C): void {
    for (const listener of [...this.#listeners]) {
      try {
        listener(change);
      } catch (e) {
        // A user's own computation failing must not stop the widget or the other listeners.
        console.error(`quietframe: an onChange listener failed: ${e instanceof Error ? e.message : String(e)}`);
      }
    }
  }

  clear(): void {
    this.#listeners.length = 0;
  }
}
