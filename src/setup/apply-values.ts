import { QuietframeError } from "../errors";
import type { SetupDescription } from "./format";

/**
 * The set-up with parameter values written in, keyed "component.parameter" and written as a
 * set-up writes them ("6 K"). Returns a new object; the input is left as it was. Explorer
 * controls, tolerance-map cells and notebooks all derive their set-ups this one way.
 */
export function applyValues(setup: SetupDescription, values: Readonly<Record<string, string | number>>): SetupDescription {
  const copy = structuredClone(setup);
  for (const [target, value] of Object.entries(values)) {
    const dot = target.indexOf(".");
    const component = copy.components.find((c) => c.name === target.slice(0, dot));
    if (!component) throw new QuietframeError({ path: `values.${target}`, value, problem: "names no component of the set-up" });
    component.params = { ...(component.params ?? {}), [target.slice(dot + 1)]: value };
  }
  return copy;
}
