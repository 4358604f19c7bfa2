/** The explorer's state format. */
import type { SetupDescription } from "../../src/index";
import type { ControlSpec } from "../core/controls/control-spec";

/**
 * The state of a noise-budget explorer: everything needed to recompute its figure bit for
 * bit. It travels inside a Jupyter widget-state document (v2), so one file serves the
 * kernel-free HTML output, the standalone page, the CLI and notebook metadata.
 */
export const EXPLORER_STATE_FORMAT = "quietframe.explorer";
export const EXPLORER_STATE_VERSION = 1;
export const EXPLORER_MODEL_NAME = "NoiseBudgetExplorerModel";

export interface ExplorerSettings {
  /** Log-spaced evaluation grid. */
  grid: { from: string; to: string; points: number };
  /** Plot amplitude (√PSD) or power spectral densities. */
  spectralDensity: "amplitude" | "power";
  /** Chart title; defaults to the set-up's name. */
  title?: string;
  /**
   * A target level relative to the SQL in dB of power (−3 is a factor 2 below it), drawn as a
   * line on the ratio panel. Display only: the fingerprint does not cover it.
   */
  targetDb?: number;
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
