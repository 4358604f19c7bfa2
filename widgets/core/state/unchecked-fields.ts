/**
 * The fields of a saved state that cannot change its numbers, found from the state itself, so
 * that `render --strict` can say which fields its fingerprint check does not cover and why.
 * Shared by the kinds whose state holds a set-up and control values (explorer, trajectory).
 */
import type { UncheckedField } from "./reproduction";
import { isRecord } from "./strict-read";

/** Set-up parameters that a control value replaces, and the set-up's descriptive texts. */
export function setupUncheckedFields(setup: unknown, values: Readonly<Record<string, unknown>>, path: string): UncheckedField[] {
  const out: UncheckedField[] = [];
  if (!isRecord(setup)) return out;
  for (const key of ["name", "description"]) {
    if (setup[key] !== undefined) out.push({ path: `${path}.setup.${key}`, reason: "text shown with the figure; no number depends on it" });
  }
  const components = Array.isArray(setup.components) ? setup.components : [];
  for (const target of Object.keys(values)) {
    const dot = target.indexOf(".");
    const [name, parameter] = [target.slice(0, dot), target.slice(dot + 1)];
    components.forEach((c, i) => {
      if (isRecord(c) && c.name === name && isRecord(c.params) && Object.prototype.hasOwnProperty.call(c.params, parameter)) {
        out.push({
          path: `${path}.setup.components[${i}].params.${parameter}`,
          reason: `the control value values["${target}"] replaces it, and the fingerprint covers the numbers computed with that value`,
        });
      }
    });
  }
  return out;
}

/** A set-up's own frequency grid, where the state evaluates on a grid of its own (or in time). */
export function setupGridUnchecked(setup: unknown, path: string, instead: string): UncheckedField[] {
  return isRecord(setup) && setup.grid !== undefined ? [{ path: `${path}.setup.grid`, reason: instead }] : [];
}
