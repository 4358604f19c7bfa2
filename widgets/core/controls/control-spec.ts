/**
 * A control as every widget state writes it: one slider, number field or dropdown bound to
 * one parameter of the set-up ("component.parameter"). Explorers and trajectory widgets hold
 * a list of these; setup-controls.ts resolves them against a set-up.
 */
export const CONTROL_TYPES = ["slider", "number", "dropdown"] as const;
export type ControlType = (typeof CONTROL_TYPES)[number];

export const SLIDER_SCALES = ["linear", "log"] as const;
export type SliderScale = (typeof SLIDER_SCALES)[number];

/** One control bound to one parameter of the set-up. */
export interface ControlSpec {
  /** "component.parameter", e.g. "membrane.temperature". */
  target: string;
  /** Shown beside the control; defaults to the target. */
  label?: string;
  /** Default: slider for quantities, dropdown for choice parameters. */
  control?: ControlType;
  /** Slider scale; default log when both bounds are positive and a decade or more apart. */
  scale?: SliderScale;
  /** Bounds with units as the set-up writes them, e.g. "1 K" (slider and number). */
  min?: string | number;
  max?: string | number;
  /** Slider positions between min and max (default 200). */
  steps?: number;
  /** Dropdown options as the set-up would write them, e.g. ["0 deg", "90 deg"]. */
  choices?: (string | number)[];
}
