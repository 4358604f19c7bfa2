/**
 * Every widget kind, once. The browser runtime boots each kind's view from this list, the state
 * loader and `quietframe render` find a saved state's kind here, and the notebook API offers
 * the loader. Adding a kind: a folder with its kind.ts, and one line below.
 */
import type { LoadedWidget, LoadOptions, WidgetKind } from "./core/kind";
import { designKind } from "./design/kind";
import { entangledKind } from "./entangled/kind";
import { explorerKind } from "./explorer/kind";
import { toleranceKind } from "./tolerance/kind";
import { trajectoryKind } from "./trajectory/kind";

/**
 * In the order a saved state is matched against them. The explorer comes last and also reads
 * input no other kind recognises, so that its reader says what is wrong with it.
 */
export const WIDGET_KINDS: readonly WidgetKind[] = [trajectoryKind, toleranceKind, entangledKind, designKind, explorerKind];

/** The kind of a saved state (text or parsed); the last kind when none recognises it. */
export function kindOf(input: unknown): WidgetKind {
  const value = typeof input === "string" ? parsedOrUndefined(input) : input;
  return WIDGET_KINDS.find((k) => k.recognises(value)) ?? WIDGET_KINDS[WIDGET_KINDS.length - 1];
}

/** Reads any saved widget state strictly and recomputes it; errors name the field in the input. */
export function loadWidgetState(input: unknown, source = "state", options: LoadOptions = {}): { kind: WidgetKind; loaded: LoadedWidget } {
  const kind = kindOf(input);
  return { kind, loaded: kind.load(input, source, options) };
}

function parsedOrUndefined(text: string): unknown {
  try {
    return JSON.parse(text);
  } catch {
    // Not JSON: the fallback kind's reader reports where it fails.
    return undefined;
  }
}
