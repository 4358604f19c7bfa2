import { QuietframeError } from "../errors";
import { copyDescription } from "./copy-description";
import type { SetupDescription } from "./format";

/**
 * The set-up with parameter values written in, keyed "component.parameter" and written as a
 * set-up writes them ("6 K"). Returns a new object; the input is left as it was. Explorer
 * controls, tolerance-map cells and notebooks all derive their set-ups this one way.
 */
export function applyValues(setup: SetupDescription, values: Readonly<Record<string, string | number>>): SetupDescription {
  const copy = copyDescription(setup);
  for (const [target, value] of Object.entries(values)) {
    const { component: name, param } = splitTarget(target);
    const component = copy.components.find((c) => c.name === name);
    if (!component) throw new QuietframeError({ path: `values.${target}`, value, problem: "names no component of the set-up" });
    component.params = { ...(component.params ?? {}), [param]: value };
  }
  return copy;
}

/** "component.parameter" split at its first dot, as applyValues reads a target. */
export function splitTarget(target: string): { component: string; param: string } {
  const dot = target.indexOf(".");
  return { component: target.slice(0, dot), param: target.slice(dot + 1) };
}
