/**
 * The Vega functions the browser views draw with, handed in by the bundle's entry (the runtime
 * or the live front-end module) instead of imported by the views: the views then load in Node,
 * where the registry lists them, without loading Vega, and each bundle chooses the Vega it carries.
 */
import type { changeset, parse, View } from "vega";
import type { compile } from "vega-lite";

export interface VegaFunctions {
  readonly parse: typeof parse;
  readonly View: typeof View;
  readonly changeset: typeof changeset;
  readonly compile: typeof compile;
}

let provided: VegaFunctions | undefined;

/** Called once by a bundle's entry; a second copy of the runtime on a page keeps the first's. */
export function provideVega(functions: VegaFunctions): void {
  provided ??= functions;
}

export function vega(): VegaFunctions {
  if (!provided) throw new Error("quietframe: no Vega was provided to the browser views");
  return provided;
}
