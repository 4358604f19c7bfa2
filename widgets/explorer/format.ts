import type { SetupDescription } from "../../src/setup/format";

/**
 * The state of a noise-budget explorer: everything needed to recompute its figure bit for
 * bit. It travels inside a Jupyter widget-state document (v2), so one file serves the
 * kernel-free HTML output, the standalone page, the CLI and notebook metadata.
 */
export const EXPLORER_STATE_FORMAT = "quietframe.explorer";
export const EXPLORER_STATE_VERSION = 1;
export const EXPLORER_MODEL_NAME = "NoiseBudgetExplorerModel";
export const WIDGET_MODULE = "quietframe";

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

export interface ExplorerSettings {
  /** Log-spaced evaluation grid. */
  grid: { from: string; to: string; points: number };
  /** Plot amplitude (√PSD) or power spectral densities. */
  spectralDensity: "amplitude" | "power";
  /** Chart title; defaults to the set-up's name. */
  title?: string;
}

export interface ExplorerState {
  format: typeof EXPLORER_STATE_FORMAT;
  version: number;
  /** quietframe version that computed the fingerprint. */
  quietframe: string;
  setup: SetupDescription;
  controls: ControlSpec[];
  /** Current value of each control, keyed by target, written as in a set-up ("6 K"). */
  values: Record<string, string | number>;
  settings: ExplorerSettings;
  /** "sha256:<hex>" of the curves these values give (see fingerprint.ts). */
  fingerprint: string;
}

/** Jupyter widget state, format 2.0, as stored in notebook metadata and state files. */
export interface JupyterWidgetStateDocument {
  version_major: 2;
  version_minor: 0;
  state: Record<
    string,
    {
      model_name: string;
      model_module: string;
      model_module_version: string;
      state: Record<string, unknown>;
    }
  >;
}
