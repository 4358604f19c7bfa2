/**
 * The Monte Carlo scenario the spread-on-threads tests share: the margin at 1.16 MHz of the
 * squeezed cryogenic membrane under three uncertain parameters, one of which reaches unstable
 * settings, and a spread result written with its Float64Arrays as their bytes.
 */
import type { SpreadResult, UncertaintySpec } from "../../src/design";

export const FIGURE = { kind: "margin-at", frequency: "1.16 MHz" } as const;
export const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 48 };
// A detuning spread reaches the blue side, where the membrane is anti-damped: some samples are unstable.
export const UNCERTAIN: UncertaintySpec[] = [
  { target: "squeezer.squeezing", value: "-10 dB ± 1 dB" },
  { target: "cavity.detuning", value: "0 Hz ± 20 kHz" },
  { target: "cavity.inputCoupling", value: "95 % ± 2 %", distribution: "uniform" },
];

/** Every field, Float64Arrays as their bytes. */
export function bits(result: SpreadResult): unknown {
  return JSON.parse(JSON.stringify(result, (_key, v) => (v instanceof Float64Array ? Buffer.from(v.buffer, v.byteOffset, v.byteLength).toString("hex") : v)));
}
