/** Checks of front-end updates to standard controls, from the control table (control-specs.generated.ts). */
import { QuietframeError } from "../../../../src/index";
import type { Validator } from "../widget-model";
import type { ControlSpec } from "./control-spec-types";

/**
 * Type checks for every attribute of a standard control, from the types the widget model
 * specification gives (float, int, bool, string with or without a list of choices, array).
 * A front-end that sends `value: "abc"` to a slider is refused before anything changes.
 */

function typeCheck(modelName: string, key: string, a: ControlSpec["attributes"][string]): Validator {
  const path = `${modelName}.${key}`;
  const fail = (value: unknown, allowed: string): never => {
    throw new QuietframeError({ path, value, problem: "has the wrong type or is not allowed", allowed });
  };
  return (value) => {
    if (value === null) return a.allowNone ? null : fail(value, `not null; ${a.type}`);
    switch (a.type) {
      case "float":
        return typeof value === "number" && Number.isFinite(value) ? value : fail(value, "a finite number");
      case "int":
        return Number.isInteger(value) ? value : fail(value, "an integer");
      case "bool":
        return typeof value === "boolean" ? value : fail(value, "true or false");
      case "string":
        if (typeof value !== "string") return fail(value, "a string");
        if (a.enum && !a.enum.includes(value)) return fail(value, `one of ${a.enum.map((e) => JSON.stringify(e)).join(", ")}`);
        return value;
      case "array":
        return Array.isArray(value) ? value : fail(value, "a list");
      default:
        return value;
    }
  };
}

/** Validators for all typed attributes of a model, plus extra checks run after the type check. */
export function specValidators(spec: ControlSpec, extra: Readonly<Record<string, Validator>> = {}): Record<string, Validator> {
  const out: Record<string, Validator> = {};
  for (const [key, a] of Object.entries(spec.attributes)) out[key] = typeCheck(spec.model.name, key, a);
  for (const key of Object.keys(spec.refs)) out[key] = refCheck(spec.model.name, key);
  for (const [key, check] of Object.entries(extra)) {
    const base = out[key];
    out[key] = base ? (value, next) => check(base(value, next), next) : check;
  }
  return out;
}

export const MODEL_REF = /^IPY_MODEL_[0-9A-Za-z_-]+$/;

function refCheck(modelName: string, key: string): Validator {
  return (value) => {
    if (typeof value === "string" && MODEL_REF.test(value)) return value;
    throw new QuietframeError({ path: `${modelName}.${key}`, value, problem: "must refer to another widget model", allowed: '"IPY_MODEL_<model id>"' });
  };
}
