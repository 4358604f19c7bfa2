/** Strict readers of the controls and values every widget state holds. */
import { QuietframeError } from "../../../src/index";
import { CONTROL_TYPES, SLIDER_SCALES, type ControlSpec } from "../controls/control-spec";
import { define, expectArray, expectRecord, RESERVED_KEYS, rejectUnknownKeys } from "./strict-read";

/**
 * Strict readers for the parts every widget state shares: control definitions, the current
 * values keyed by control target, and the small typed fields they are made of. Each builds
 * fresh objects and names the offending path.
 */

const CONTROL_KEYS = ["target", "label", "control", "scale", "min", "max", "steps", "choices"] as const;

export function checkControlSpec(input: unknown, path: string): ControlSpec {
  const obj = expectRecord(input, path, '{"target": "component.parameter", …}');
  rejectUnknownKeys(obj, CONTROL_KEYS, path, "a control");
  const out: ControlSpec = { target: expectString(obj.target, `${path}.target`, '"component.parameter", e.g. "membrane.temperature"') };
  if (obj.label !== undefined) out.label = expectString(obj.label, `${path}.label`, "text");
  if (obj.control !== undefined) out.control = expectWord(obj.control, CONTROL_TYPES, `${path}.control`);
  if (obj.scale !== undefined) out.scale = expectWord(obj.scale, SLIDER_SCALES, `${path}.scale`);
  if (obj.min !== undefined) out.min = expectQuantity(obj.min, `${path}.min`);
  if (obj.max !== undefined) out.max = expectQuantity(obj.max, `${path}.max`);
  if (obj.steps !== undefined) {
    if (typeof obj.steps !== "number" || !Number.isInteger(obj.steps)) {
      throw new QuietframeError({ path: `${path}.steps`, value: obj.steps, problem: "must be an integer", allowed: "a number of slider steps, e.g. 200" });
    }
    out.steps = obj.steps;
  }
  if (obj.choices !== undefined) {
    out.choices = expectArray(obj.choices, `${path}.choices`, 'values as the set-up writes them, e.g. ["0 deg", "90 deg"]').map((c, k) => expectQuantity(c, `${path}.choices[${k}]`));
  }
  return out;
}

export function checkControlValues(input: unknown, path: string): Record<string, string | number> {
  const obj = expectRecord(input, path, 'current values keyed by control target, e.g. {"membrane.temperature": "6 K"}');
  const out: Record<string, string | number> = {};
  for (const key of Object.keys(obj)) {
    // Targets are "component.parameter"; this also keeps "__proto__" and friends out.
    if (!/^[A-Za-z_][A-Za-z0-9_-]{0,63}\.[A-Za-z_][A-Za-z0-9_]{0,63}$/.test(key) || RESERVED_KEYS.has(key.slice(0, key.indexOf(".")))) {
      throw new QuietframeError({ path: `${path}.${key}`, problem: "is not a control target", allowed: '"component.parameter", e.g. "membrane.temperature"' });
    }
    define(out, key, expectQuantity(obj[key], `${path}.${key}`));
  }
  return out;
}

export function expectString(v: unknown, path: string, allowed: string): string {
  if (typeof v !== "string") throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be a string", allowed });
  return v;
}

export function expectWord<W extends string>(v: unknown, words: readonly W[], path: string): W {
  if (typeof v !== "string" || !(words as readonly string[]).includes(v)) {
    throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "is not one of the choices", allowed: words.join(", ") });
  }
  return v as W;
}

/** A value as a set-up writes it: text with its unit, or a finite number. */
export function expectQuantity(v: unknown, path: string): string | number {
  if (typeof v === "string" || (typeof v === "number" && Number.isFinite(v))) return v;
  throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be a value with its unit or a number", allowed: 'e.g. "6 K", "200 us" or 0.95' });
}
