/**
 * The set-up description: plain, versioned JSON that a person can write and a paper can
 * quote. Units live in strings ("40 kg", "1.3 MHz"); the engine never sees them.
 * The JSON Schema in schema/setup.schema.json describes the same shape.
 */
import type { ClassicalNoiseDescription } from "./classical-noise";

export type { ClassicalNoiseDescription } from "./classical-noise";
export type { SpectrumDescription } from "./spectrum-table";

export const SETUP_FORMAT = "quietframe.setup";
export const SETUP_VERSION = 1;

export interface SetupDescription {
  format: typeof SETUP_FORMAT;
  version: number;
  name?: string;
  description?: string;
  components: ComponentDescription[];
  /** Pairs "component.port" → "component.port": light flows from the first to the second; mechanical links go probe ↔ body. */
  connections: [string, string][];
  /** Detector components whose outputs are used; several are combined optimally. */
  readout: string[];
  signal: SignalDescription;
  /** Default frequency grid for evaluation. */
  grid?: GridDescription;
  /** Classical noise terms: measured or modelled spectra entering at named places, each a budget term of its own. */
  classicalNoise?: ClassicalNoiseDescription[];
}

export interface ComponentDescription {
  name: string;
  type: string;
  params?: Record<string, string | number>;
}

export interface SignalDescription {
  /** What the signal is, e.g. "force". */
  kind: string;
  /** The component it acts on. */
  on: string;
  /** Quantity the noise is expressed in, e.g. "displacement" or "force"; defaults to the first the target offers. */
  referTo?: string;
}

export interface GridDescription {
  from: string;
  to: string;
  points?: number;
}

export const SETUP_KEYS = ["format", "version", "name", "description", "components", "connections", "readout", "signal", "grid", "classicalNoise"] as const;
