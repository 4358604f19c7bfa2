/**
 * The methods export of every widget kind, by the kind's name: what `quietframe methods`, the
 * notebook API and the pages call. A test checks that every registered kind has one.
 */
import type { LoadedWidget, LoadOptions } from "./core/kind";
import type { MethodsDocument, MethodsOptions } from "./core/methods/document";
import { designMethodsDocument } from "./design/methods/document";
import type { DesignState } from "./design/format";
import { entangledMethods } from "./entangled/methods/methods";
import type { LoadedEntangled } from "./entangled/kind";
import { explorerMethods } from "./explorer/methods/methods";
import type { LoadedExplorer } from "./explorer/kind";
import { loadWidgetState } from "./registry";
import { toleranceMethods } from "./tolerance/methods/methods";
import type { ToleranceWidgetState } from "./tolerance/model";
import { trajectoryMethods } from "./trajectory/methods/methods";
import type { LoadedTrajectory } from "./trajectory/kind";

export type { MethodsDocument, MethodsOptions } from "./core/methods/document";

type MethodsWriter = (loaded: LoadedWidget, options: MethodsOptions) => MethodsDocument;

/** By kind name (widgets/registry.ts). */
export const KIND_METHODS: Readonly<Record<string, MethodsWriter>> = {
  explorer: (l, o) => explorerMethods((l as LoadedExplorer).state, (l as LoadedExplorer).computation, o),
  trajectory: (l, o) => trajectoryMethods((l as LoadedTrajectory).state, (l as LoadedTrajectory).computation, o),
  entangled: (l, o) => entangledMethods((l as LoadedEntangled).state, (l as LoadedEntangled).computation, o),
  tolerance: (l, o) => toleranceMethods(l.state as ToleranceWidgetState, o),
  design: (l, o) => designMethodsDocument(l.state as DesignState, o),
};

/** The methods export of a loaded widget of the named kind. */
export function methodsOfLoaded(kindName: string, loaded: LoadedWidget, options: MethodsOptions = {}): MethodsDocument {
  const write = KIND_METHODS[kindName];
  if (!write) throw new Error(`internal: no methods export for widget kind "${kindName}"`);
  return write(loaded, options);
}

/**
 * The methods export of a saved widget state of any kind (text or parsed JSON): read strictly
 * and recomputed like `quietframe render`, so the text describes the numbers this quietframe gets.
 */
export function widgetMethods(input: unknown, options: MethodsOptions & LoadOptions & { source?: string } = {}): MethodsDocument {
  const { kind, loaded } = loadWidgetState(input, options.source ?? "state", { widget: options.widget });
  return methodsOfLoaded(kind.name, loaded, options);
}
