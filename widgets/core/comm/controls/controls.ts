/**
 * The standard controls of @jupyter-widgets/controls (sliders, dropdown, text, boxes) as
 * kernel-side widget models.
 */
import { QuietframeError, pow } from "../../../../src/index";
import { WidgetModel, type Validator, type WidgetModelOptions } from "../widget-model";
import type { CommManager } from "../comm-manager";
import { CONTROL_SPECS, type StandardModelName } from "./control-specs.generated";
import { MODEL_REF, specValidators } from "./spec-validators";

/**
 * The standard controls of @jupyter-widgets/controls 2.0.0 that quietframe uses, created
 * with their complete default state from the widget model specification, so every
 * front-end with ipywidgets 8 renders them. Each control also opens its own LayoutModel and
 * style model, as the specification's "reference to new instance" defaults ask.
 */

/** Options every control accepts. */
export interface CommonControlOptions {
  description?: string;
  disabled?: boolean;
  tooltip?: string | null;
  /** LayoutModel keys, e.g. { width: "400px" }. */
  layout?: Record<string, unknown>;
  /** Style model keys, e.g. { description_width: "initial" }. */
  style?: Record<string, unknown>;
  /** Extra checks of front-end values, by key (after the type check). */
  validators?: Record<string, Validator>;
  comms?: CommManager;
}

/** A control model with the layout and style models it refers to; closing it closes them. */
export class ControlModel extends WidgetModel {
  readonly parts: Readonly<Record<string, WidgetModel>>;
  constructor(state: Record<string, unknown>, options: WidgetModelOptions, parts: Record<string, WidgetModel>) {
    super(state, options);
    this.parts = parts;
  }
  override close(): void {
    super.close();
    for (const part of Object.values(this.parts)) part.close();
  }
}

/** Creates any model of the specification's subset, with its referenced models; `state` overrides defaults. */
export function createControl(modelName: string, state: Record<string, unknown>, options: CommonControlOptions & { extra?: Record<string, Validator> } = {}): ControlModel {
  const spec = isStandardModelName(modelName) ? CONTROL_SPECS[modelName] : undefined;
  if (!spec) throw new QuietframeError({ path: "model", value: modelName, problem: "is not a standard control quietframe creates", allowed: Object.keys(CONTROL_SPECS).join(", ") });
  const validators = specValidators(spec, { ...options.extra, ...options.validators });
  const full: Record<string, unknown> = { ...structuredClone(spec.state), ...state };
  for (const key of ["description", "disabled", "tooltip"] as const) if (options[key] !== undefined && key in spec.state) full[key] = options[key];
  // Check what the caller gave before opening anything, so a bad option leaves no stray models.
  for (const key of Object.keys(full)) {
    if (!(key in spec.state))
      throw new QuietframeError({
        path: `${modelName}.${key}`,
        value: full[key],
        problem: "is not an attribute of this model",
        allowed: Object.keys(spec.state)
          .filter((k) => !k.startsWith("_"))
          .join(", "),
      });
    const v = validators[key];
    if (v) full[key] = v(full[key], full);
  }
  const parts: Record<string, WidgetModel> = {};
  try {
    for (const [key, partName] of Object.entries(spec.refs)) {
      const given = key === "layout" ? options.layout : key === "style" ? options.style : undefined;
      parts[key] = createControl(partName, given ?? {}, { comms: options.comms });
      full[key] = parts[key].ref;
    }
    return new ControlModel(full, { validators, comms: options.comms }, parts);
  } catch (e) {
    for (const p of Object.values(parts)) p.close();
    throw e;
  }
}

// --- range checks ------------------------------------------------------------------------

function within(
  modelName: string,
  lo: (next: Readonly<Record<string, unknown>>) => number,
  hi: (next: Readonly<Record<string, unknown>>) => number,
  shown: (next: Readonly<Record<string, unknown>>) => string,
): Validator {
  return (value, next) => {
    const v = value as number;
    if (v < lo(next) || v > hi(next)) throw new QuietframeError({ path: `${modelName}.value`, value: v, problem: "is outside the slider's range", allowed: shown(next) });
    return v;
  };
}

function ordered(modelName: string, key: "min" | "max"): Validator {
  return (value, next) => {
    if ((next.min as number) > (next.max as number))
      throw new QuietframeError({ path: `${modelName}.${key}`, value, problem: "would make min greater than max", allowed: `min ≤ max (now min ${String(next.min)}, max ${String(next.max)})` });
    return value;
  };
}

// --- the controls --------------------------------------------------------------------------

export interface FloatSliderOptions extends CommonControlOptions {
  value?: number;
  min?: number;
  max?: number;
  step?: number | null;
  /** d3-format string for the readout, e.g. ".3g". */
  readout_format?: string;
  continuous_update?: boolean;
  orientation?: "horizontal" | "vertical";
}

function sliderState(o: FloatSliderOptions): Record<string, unknown> {
  const s: Record<string, unknown> = {};
  for (const key of ["value", "min", "max", "step", "readout_format", "continuous_update", "orientation"] as const) if (o[key] !== undefined) s[key] = o[key];
  return s;
}

/** A linear slider; `value` must stay within min…max. */
export function floatSlider(options: FloatSliderOptions = {}): ControlModel {
  const name = "FloatSliderModel";
  return createControl(name, sliderState(options), {
    ...options,
    extra: {
      value: within(
        name,
        (n) => n.min as number,
        (n) => n.max as number,
        (n) => `${String(n.min)} ≤ value ≤ ${String(n.max)}`,
      ),
      min: ordered(name, "min"),
      max: ordered(name, "max"),
    },
  });
}

export interface FloatLogSliderOptions extends FloatSliderOptions {
  /** Base of the exponents min and max (default 10). */
  base?: number;
}

/** A log slider: `min` and `max` are exponents of `base`; `value` is the number itself. */
export function floatLogSlider(options: FloatLogSliderOptions = {}): ControlModel {
  const name = "FloatLogSliderModel";
  const state = sliderState(options);
  if (options.base !== undefined) state.base = options.base;
  const lo = (n: Readonly<Record<string, unknown>>): number => pow(n.base as number, n.min as number);
  const hi = (n: Readonly<Record<string, unknown>>): number => pow(n.base as number, n.max as number);
  return createControl(name, state, {
    ...options,
    extra: {
      value: within(name, lo, hi, (n) => `${String(lo(n))} ≤ value ≤ ${String(hi(n))} (${String(n.base)}^${String(n.min)} … ${String(n.base)}^${String(n.max)})`),
      min: ordered(name, "min"),
      max: ordered(name, "max"),
      base: (value) => {
        if ((value as number) <= 0 || value === 1) throw new QuietframeError({ path: `${name}.base`, value, problem: "cannot be the base of a log scale", allowed: "a number > 0 other than 1" });
        return value;
      },
    },
  });
}

export interface DropdownOptions extends CommonControlOptions {
  /** The labels shown, in order. */
  options: readonly string[];
  /** Index of the selected label, or null for none (default 0 when there are labels). */
  index?: number | null;
}

/** A dropdown; the front-end sends `index`, the position in `_options_labels`. */
export function dropdown(options: DropdownOptions): ControlModel {
  const name = "DropdownModel";
  if (!Array.isArray(options.options) || !options.options.every((o) => typeof o === "string")) {
    throw new QuietframeError({ path: `${name}.options`, value: options.options, problem: "must be a list of labels", allowed: 'e.g. ["positive", "negative"]' });
  }
  const index = options.index === undefined ? (options.options.length > 0 ? 0 : null) : options.index;
  return createControl(
    name,
    { _options_labels: [...options.options], index },
    {
      ...options,
      extra: {
        index: (value, next) => {
          const labels = next._options_labels as unknown[];
          if (value !== null && ((value as number) < 0 || (value as number) >= labels.length)) {
            throw new QuietframeError({
              path: `${name}.index`,
              value,
              problem: "is not the position of a label",
              allowed: labels.length === 0 ? "null (no labels)" : `null or 0 … ${labels.length - 1}`,
            });
          }
          return value;
        },
        _options_labels: (value) => {
          if (!(value as unknown[]).every((v) => typeof v === "string"))
            throw new QuietframeError({ path: `${name}._options_labels`, value, problem: "must hold only labels", allowed: "a list of strings" });
          return value;
        },
      },
    },
  );
}

/** The label a dropdown shows now, or undefined when none is selected. */
export function dropdownLabel(model: WidgetModel): string | undefined {
  const labels = model.get("_options_labels") as string[];
  const index = model.get("index");
  return typeof index === "number" ? labels[index] : undefined;
}

export interface TextOptions extends CommonControlOptions {
  value?: string;
  placeholder?: string;
  continuous_update?: boolean;
}

export function text(options: TextOptions = {}): ControlModel {
  const state: Record<string, unknown> = {};
  for (const key of ["value", "placeholder", "continuous_update"] as const) if (options[key] !== undefined) state[key] = options[key];
  return createControl("TextModel", state, options);
}

export interface HtmlOptions extends CommonControlOptions {
  value?: string;
}

/** Shows HTML (headline figures, an error text); the front-end renders it as given, so escape user text. */
export function html(options: HtmlOptions = {}): ControlModel {
  return createControl("HTMLModel", options.value === undefined ? {} : { value: options.value }, options);
}

export interface BoxOptions {
  box_style?: "success" | "info" | "warning" | "danger" | "";
  layout?: Record<string, unknown>;
  comms?: CommManager;
}

function box(modelName: string, children: readonly WidgetModel[], options: BoxOptions): ControlModel {
  const refs = children.map((c, i) => {
    if (!(c instanceof WidgetModel) && !(typeof (c as { ref?: unknown })?.ref === "string"))
      throw new QuietframeError({ path: `${modelName}.children[${i}]`, value: typeof c, problem: "is not a widget model", allowed: "models made by quietframe (floatSlider(), html(), …)" });
    return c.ref;
  });
  return createControl(
    modelName,
    { children: refs, ...(options.box_style !== undefined ? { box_style: options.box_style } : {}) },
    {
      layout: options.layout,
      comms: options.comms,
      extra: {
        children: (value) => {
          if (!(value as unknown[]).every((r) => typeof r === "string" && MODEL_REF.test(r)))
            throw new QuietframeError({ path: `${modelName}.children`, value, problem: "must list widget models", allowed: '["IPY_MODEL_<id>", …]' });
          return value;
        },
      },
    },
  );
}

export function vbox(children: readonly WidgetModel[], options: BoxOptions = {}): ControlModel {
  return box("VBoxModel", children, options);
}

export function hbox(children: readonly WidgetModel[], options: BoxOptions = {}): ControlModel {
  return box("HBoxModel", children, options);
}

/** Whether a name is a model of the control table (an own key: never a prototype property). */
function isStandardModelName(name: string): name is StandardModelName {
  return Object.hasOwn(CONTROL_SPECS, name);
}
