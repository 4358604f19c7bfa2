/** Explorer controls as standard Jupyter controls, and the values between them. */
import { QuietframeError, log10, pow, parseQuantity, type QuantityKind } from "../../../src/index";
import { checkValue, sliderPosition, sliderValue, writeValue, type ResolvedControl } from "../../core/controls/setup-controls";
import type { StandardControl } from "./host";

/** Two slider values closer than this fraction of one step are the same position. */
export const SAME_POSITION_FRACTION = 1e-6;

/**
 * One explorer control as a standard Jupyter control: which widget, its initial state, and
 * the two conversions between a value as a set-up writes it ("6.5 K") and what the widget
 * holds (a number in the unit shown in its description, or a dropdown index).
 *
 * Slider values coming back from a front-end are snapped to the control's slider positions
 * with the same functions the kernel-free page uses, so a live notebook and a saved page
 * write the same values and therefore compute the same curves bit for bit.
 *
 * A front-end slider computes its positions in its own floating-point steps, a few ulps away
 * from the kernel's number for the same position ("63.75 %" reads back as 63.74999999999999).
 * Such a value already shows the right position (`shows`) and is never corrected: a slider
 * given the kernel's number snaps it to its own and sends that again, which starts an endless
 * exchange and replaces a newer move still waiting in the front-end's send buffer.
 */
export interface ControlWidget {
  readonly control: ResolvedControl;
  readonly widget: StandardControl;
  /** The state key that holds the value ("value", or "index" for dropdowns). */
  readonly key: "value" | "index";
  /** Initial state (description, bounds, step, the value). */
  initialState(written: string | number): Record<string, unknown>;
  /** Widget value of a (checked) written value. */
  toWidget(written: string | number): number | string;
  /** Written value of what the widget holds; QuietframeError when it holds nothing usable. */
  fromWidget(held: unknown): string | number;
  /** Whether a widget holding `held` already shows `written` (fromWidget's answer), so no correction goes back. */
  shows(held: unknown, written: string | number): boolean;
}

export function controlWidget(c: ResolvedControl): ControlWidget {
  if (c.control === "dropdown") return dropdownWidget(c);
  return numericWidget(c);
}

/** Label with its unit, as the description of a standard control shows it. */
export function describeControl(c: ResolvedControl): string {
  return c.unit ? `${c.label} [${c.unit}]` : c.label;
}

function numericWidget(c: ResolvedControl): ControlWidget {
  const kind = c.kind as QuantityKind;
  // SI value of one display unit ("1 MHz" → 1e6); every unit of a kind is a plain factor.
  const factor = c.unit ? parseQuantity(`1 ${c.unit}`, kind, `controls.${c.target}`) : 1;
  const display = (si: number): number => si / factor;
  const min = display(c.min!);
  const max = display(c.max!);
  const toWidget = (written: string | number): number => display(parseQuantity(written, kind, `values.${c.target}`));
  const fromNumber = (held: unknown): number => {
    if (typeof held !== "number" || !Number.isFinite(held)) {
      throw new QuietframeError({ path: `values.${c.target}`, value: held, problem: "the control holds no number", allowed: `a number in ${c.unit || "the control's unit"}` });
    }
    return held * factor;
  };
  const description = describeControl(c);
  if (c.control === "number") {
    const asText = (written: string | number): string => String(written);
    return {
      control: c,
      widget: "Text",
      key: "value",
      // Sent on Enter or leaving the field, not on every key: half-typed numbers are not values.
      initialState: (written) => ({ description, value: String(written), continuous_update: false }),
      toWidget: asText,
      fromWidget: (held) => {
        if (typeof held !== "string")
          throw new QuietframeError({ path: `values.${c.target}`, value: held, problem: "the field holds no text", allowed: `a value such as "${c.unit ? `1 ${c.unit}` : "1"}"` });
        const text = held.trim();
        // A bare number is taken in the unit shown in the description, as on the kernel-free page.
        if (/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(text)) return c.unit ? `${text} ${c.unit}` : Number(text);
        return text;
      },
      shows: sameWidgetValue(asText),
    };
  }
  const snap = (held: unknown): string => writeValue(c, sliderValue(c, sliderPosition(c, fromNumber(held))));
  // Sliders compare positions on their own axis (the exponent for a log slider), to a tiny fraction of a step.
  const samePosition =
    (axis: (v: number) => number, step: number) =>
    (held: unknown, written: string | number): boolean =>
      typeof held === "number" && Math.abs(axis(held) - axis(toWidget(written))) <= SAME_POSITION_FRACTION * step;
  if (c.scale === "log") {
    const [lo, hi] = exponentsAround(min, max);
    return {
      control: c,
      widget: "FloatLogSlider",
      key: "value",
      initialState: (written) => ({ description, base: 10, min: lo, max: hi, step: (hi - lo) / c.steps, value: toWidget(written), readout_format: ".4~g" }),
      toWidget,
      fromWidget: snap,
      shows: samePosition(log10, (hi - lo) / c.steps),
    };
  }
  return {
    control: c,
    widget: "FloatSlider",
    key: "value",
    initialState: (written) => ({ description, min, max, step: (max - min) / c.steps, value: toWidget(written), readout_format: ".4~g" }),
    toWidget,
    fromWidget: snap,
    shows: samePosition((v) => v, (max - min) / c.steps),
  };
}

function dropdownWidget(c: ResolvedControl): ControlWidget {
  const choices = c.choices ?? [];
  const indexOf = (written: string | number): number => {
    const si = checkValue(c, written, `values.${c.target}`);
    const k = choices.findIndex((choice) => String(choice) === String(written) || (c.kind !== "choice" && parseQuantity(choice, c.kind as QuantityKind, "choice") === si));
    return Math.max(0, k);
  };
  return {
    control: c,
    widget: "Dropdown",
    key: "index",
    initialState: (written) => ({ description: describeControl(c), _options_labels: choices.map(String), index: indexOf(written) }),
    toWidget: indexOf,
    fromWidget: (held) => {
      if (typeof held !== "number" || !Number.isInteger(held) || held < 0 || held >= choices.length) {
        throw new QuietframeError({ path: `values.${c.target}`, value: held, problem: "is not an option of the dropdown", allowed: `an index from 0 to ${choices.length - 1}` });
      }
      return choices[held];
    },
    shows: sameWidgetValue(indexOf),
  };
}

/** `shows` for controls without positions: the widget holds exactly the widget value of the written one. */
function sameWidgetValue(toWidget: (written: string | number) => number | string): ControlWidget["shows"] {
  return (held, written) => Object.is(toWidget(written), held);
}

/**
 * Exponents of 10 whose powers enclose [min, max]: log10 then pow may land a last bit inside
 * the range, and a front-end or kernel that checks the slider value against 10^min … 10^max
 * would then refuse the control's own end values.
 */
function exponentsAround(min: number, max: number): [number, number] {
  let lo = log10(min);
  let hi = log10(max);
  for (let i = 0; i < 8 && pow(10, lo) > min; i++) lo -= Math.max(Math.abs(lo), 1) * Number.EPSILON;
  for (let i = 0; i < 8 && pow(10, hi) < max; i++) hi += Math.max(Math.abs(hi), 1) * Number.EPSILON;
  return [lo, hi];
}
