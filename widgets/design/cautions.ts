/** Safety cautions of a design answer: those of the set-up as given and, for an optimum, at the settings it recommends. */
import { applyValues, prepare } from "../../src/index";
import type { DesignState } from "./format";

/**
 * The components' cautions (laser power, cryogenics, magnetic fields) of the set-up as given and
 * of the optimum's settings (an optimizer may well recommend a higher power), each once. A setting
 * that does not prepare has no cautions of its own: the answer already says it has no value.
 */
export function designCautions(state: DesignState): string[] {
  const all = new Set<string>(cautionsOf(() => prepare(state.setup).cautions));
  const a = state.answer;
  if (a.kind === "optimum" && a.optimum) {
    const values = Object.fromEntries(a.optimum.values.map((v) => [v.target, v.shown]));
    for (const c of cautionsOf(() => prepare(applyValues(state.setup, values)).cautions)) all.add(c);
  }
  return [...all];
}

function cautionsOf(read: () => readonly string[]): readonly string[] {
  try {
    return read();
  } catch {
    return [];
  }
}
