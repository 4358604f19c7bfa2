/**
 * Controls resolved against a set-up: parameter, unit, bounds, slider positions and the checks of
 * a value.
 */
import { QuietframeError, componentKind, formatQuantity, parseQuantity, log, pow, type ParamSpec, type SetupDescription, type QuantityKind } from "../../../src/index";
import type { ControlSpec, ControlType, SliderScale } from "./control-spec";

export const DEFAULT_SLIDER_STEPS = 200;
const MAX_SLIDER_STEPS = 100_000;

/** A control checked against the set-up, with its bounds in SI. */
export interface ResolvedControl {
  readonly target: string;
  readonly component: string;
  readonly param: string;
  readonly label: string;
  readonly control: ControlType;
  /** Quantity kind of the parameter, or "choice". */
  readonly kind: QuantityKind | "choice";
  readonly scale: SliderScale;
  readonly steps: number;
  /** SI bounds (slider and number controls). */
  readonly min?: number;
  readonly max?: number;
  /** Dropdown options exactly as written. */
  readonly choices?: readonly (string | number)[];
  /** Unit shown beside the control, from the formatted minimum (e.g. "K", "MHz"). */
  readonly unit: string;
}

/** Checks every control against the set-up and fills in defaults. */
export function resolveControls(setup: SetupDescription, specs: readonly ControlSpec[]): ResolvedControl[] {
  const seen = new Set<string>();
  return specs.map((spec, i) => {
    const path = `controls[${i}]`;
    const resolved = resolveControl(setup, spec, path);
    if (seen.has(resolved.target)) {
      throw new QuietframeError({ path: `${path}.target`, value: spec.target, problem: "is controlled twice", allowed: "one control per parameter" });
    }
    seen.add(resolved.target);
    return resolved;
  });
}

function resolveControl(setup: SetupDescription, spec: ControlSpec, path: string): ResolvedControl {
  if (typeof spec !== "object" || spec === null || typeof spec.target !== "string") {
    throw new QuietframeError({ path: `${path}.target`, value: spec?.target, problem: "must name a parameter", allowed: '"component.parameter", e.g. "membrane.temperature"' });
  }
  const dot = spec.target.indexOf(".");
  const componentName = dot > 0 ? spec.target.slice(0, dot) : "";
  const paramName = dot > 0 ? spec.target.slice(dot + 1) : "";
  const component = setup.components.find((c) => c.name === componentName);
  const kind = component ? componentKind(component.type) : undefined;
  const param: ParamSpec | undefined = kind?.params.find((p) => p.name === paramName);
  if (!component || !kind || !param) {
    const options = setup.components.flatMap((c) => (componentKind(c.type)?.params ?? []).map((p) => `${c.name}.${p.name}`));
    throw new QuietframeError({ path: `${path}.target`, value: spec.target, problem: "is not a parameter of this set-up", allowed: options.join(", ") });
  }
  const label = typeof spec.label === "string" ? spec.label : spec.target;
  if (param.kind === "choice") {
    const choices = spec.choices ?? [...param.choices];
    for (const c of choices) {
      if (!param.choices.includes(String(c))) {
        throw new QuietframeError({ path: `${path}.choices`, value: c, problem: "is not a choice of this parameter", allowed: param.choices.join(", ") });
      }
    }
    return { target: spec.target, component: componentName, param: paramName, label, control: "dropdown", kind: "choice", scale: "linear", steps: 0, choices, unit: "" };
  }
  const control = spec.control ?? (spec.choices ? "dropdown" : "slider");
  if (control === "dropdown") {
    const choices = spec.choices ?? [];
    if (choices.length === 0) {
      throw new QuietframeError({ path: `${path}.choices`, problem: "a dropdown needs choices", allowed: 'values with units, e.g. ["0 deg", "90 deg"]' });
    }
    choices.forEach((c, k) => parseQuantity(c, param.kind, `${path}.choices[${k}]`));
    return { target: spec.target, component: componentName, param: paramName, label, control, kind: param.kind, scale: "linear", steps: 0, choices, unit: "" };
  }
  if (control !== "slider" && control !== "number") {
    throw new QuietframeError({ path: `${path}.control`, value: control, problem: "is not a control type", allowed: "slider, number, dropdown" });
  }
  const bound = (given: string | number | undefined, fallback: number | undefined, which: "min" | "max"): number => {
    if (given !== undefined) return parseQuantity(given, param.kind, `${path}.${which}`);
    if (fallback !== undefined && Number.isFinite(fallback)) return fallback;
    throw new QuietframeError({ path: `${path}.${which}`, problem: `a ${control} control needs ${which}`, allowed: `a value with its unit, e.g. "${formatQuantity(1, param.kind)}"` });
  };
  const min = bound(spec.min, param.min, "min");
  const max = bound(spec.max, param.max, "max");
  if (!(max > min)) {
    throw new QuietframeError({ path: `${path}.max`, value: spec.max, problem: "must be above min", allowed: `max > ${formatQuantity(min, param.kind)}` });
  }
  const scale: SliderScale = spec.scale ?? (min > 0 && max / min >= 10 ? "log" : "linear");
  if (scale === "log" && !(min > 0)) {
    throw new QuietframeError({ path: `${path}.scale`, value: scale, problem: "a log slider needs a positive minimum", allowed: "linear, or min > 0" });
  }
  if (scale !== "log" && scale !== "linear") {
    throw new QuietframeError({ path: `${path}.scale`, value: scale, problem: "is not a slider scale", allowed: "linear or log" });
  }
  const steps = spec.steps ?? DEFAULT_SLIDER_STEPS;
  if (!Number.isInteger(steps) || steps < 1 || steps > MAX_SLIDER_STEPS) {
    throw new QuietframeError({ path: `${path}.steps`, value: steps, problem: "is not a usable number of slider steps", allowed: `an integer from 1 to ${MAX_SLIDER_STEPS}` });
  }
  const unit = formatQuantity(max, param.kind).replace(/^[-+0-9.e]+\s*/, "");
  return { target: spec.target, component: componentName, param: paramName, label, control, kind: param.kind, scale, steps, min, max, unit };
}

/** SI value at slider position k (0 … steps). */
export function sliderValue(c: ResolvedControl, k: number): number {
  const t = Math.min(Math.max(k, 0), c.steps) / c.steps;
  if (k <= 0) return c.min!;
  if (k >= c.steps) return c.max!;
  return c.scale === "log" ? c.min! * pow(c.max! / c.min!, t) : c.min! + (c.max! - c.min!) * t;
}

/** Nearest slider position of an SI value. */
export function sliderPosition(c: ResolvedControl, value: number): number {
  const t = c.scale === "log" ? log(value / c.min!) / log(c.max! / c.min!) : (value - c.min!) / (c.max! - c.min!);
  return Math.min(c.steps, Math.max(0, Math.round(t * c.steps)));
}

/** The value as a set-up would write it; six significant digits, parsed back exactly as written. */
export function writeValue(c: ResolvedControl, si: number): string {
  return formatQuantity(si, c.kind as QuantityKind, 6);
}

/** Parses a control's current value (as written) and checks it against the control's bounds. */
export function checkValue(c: ResolvedControl, value: unknown, path: string): number | string {
  if (c.kind === "choice") {
    if (typeof value !== "string" || !c.choices!.includes(value)) {
      throw new QuietframeError({ path, value, problem: "is not one of the control's choices", allowed: c.choices!.join(", ") });
    }
    return value;
  }
  const v = parseQuantity(value, c.kind, path);
  if (c.control === "dropdown") {
    if (!c.choices!.some((choice) => parseQuantity(choice, c.kind as QuantityKind, path) === v)) {
      throw new QuietframeError({ path, value, problem: "is not one of the control's choices", allowed: c.choices!.join(", ") });
    }
  } else if (v < c.min! || v > c.max!) {
    throw new QuietframeError({
      path,
      value,
      problem: "is outside the control's range",
      allowed: `${formatQuantity(c.min!, c.kind)} … ${formatQuantity(c.max!, c.kind)}`,
    });
  }
  return v;
}

/** The label a page shows beside a control: its label with the unit its values are written in ("bath temperature [K]"). */
export function labelWithUnit(c: ResolvedControl): string {
  return c.unit ? `${c.label} [${c.unit}]` : c.label;
}

/** A number without a unit, as typed into a control ("6.5", "1e-3"). */
export const BARE_NUMBER = /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i;

/**
 * What a user typed into a control's exact-value field, checked like any value of the control:
 * a bare number is taken in the unit shown beside the control ("6.5" next to [K] is "6.5 K").
 * Returns the value as a set-up writes it and in SI; throws a QuietframeError naming the
 * control, the value, its unit and the range allowed.
 */
export function exactValue(c: ResolvedControl, typed: string): { written: string; si: number } {
  if (c.kind === "choice") throw new Error("internal: a choice control has no exact-value field");
  const written = typedValue(c, typed);
  const si = checkValue(c, written, c.label === c.target ? c.target : `${c.label} (${c.target})`);
  return { written, si: si as number };
}

/** Typed text as a value: trimmed, and a bare number gets the unit shown beside the control. */
export function typedValue(c: ResolvedControl, typed: string): string {
  const text = typed.trim();
  return c.unit && BARE_NUMBER.test(text) ? `${text} ${c.unit}` : text;
}

/** Resolves a state's controls and checks its values: exactly one allowed value per control. */
export function resolveStateControls(setup: SetupDescription, specs: readonly ControlSpec[], values: Readonly<Record<string, unknown>>): ResolvedControl[] {
  const controls = resolveControls(setup, specs);
  for (const c of controls) {
    if (!(c.target in values)) throw new QuietframeError({ path: `values.${c.target}`, problem: "has no current value", allowed: "a value for every control" });
    checkValue(c, values[c.target], `values.${c.target}`);
  }
  for (const target of Object.keys(values)) {
    if (!controls.some((c) => c.target === target)) {
      throw new QuietframeError({ path: `values.${target}`, problem: "has no control", allowed: controls.map((c) => c.target).join(", ") || "no values" });
    }
  }
  return controls;
}
