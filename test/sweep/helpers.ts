/** Small sweeps over an example set-up for the sweep suites, and a temporary directory per test file. */
import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { SetupDescription } from "../../src/setup/format";
import type { SweepDescription } from "../../src/sweep";

export const squeezed = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;

/** A 4 × 5 map over squeezing and input coupling, two rows per chunk (3 chunks, the last one short). */
export function gridSweep(extra: Partial<SweepDescription> = {}): SweepDescription {
  return {
    format: "quietframe.sweep",
    version: 1,
    name: "membrane-grid",
    setup: squeezed,
    vary: {
      kind: "grid",
      x: { target: "squeezer.squeezing", from: "-15 dB", to: "-3 dB", points: 4 },
      y: { target: "cavity.inputCoupling", from: "70 %", to: "99 %", points: 5 },
    },
    figure: { kind: "margin-at", frequency: "1.16 MHz" },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: 48 },
    chunkSize: 2,
    ...extra,
  };
}

/**
 * 60 Monte Carlo samples, 16 per chunk (4 chunks). A detuning spread reaches the blue side,
 * where the membrane is anti-damped, so some samples fail: failures travel through the chunks too.
 */
export function sampleSweep(extra: Partial<SweepDescription> = {}): SweepDescription {
  return {
    format: "quietframe.sweep",
    version: 1,
    name: "membrane-spread",
    setup: squeezed,
    vary: {
      kind: "samples",
      uncertain: [
        { target: "squeezer.squeezing", value: "-10 dB ± 1 dB" },
        { target: "cavity.detuning", value: "0 Hz ± 20 kHz" },
        { target: "cavity.inputCoupling", value: "95 % ± 2 %", distribution: "uniform" },
      ],
      samples: 60,
      seed: 11,
      target: "2 dB",
    },
    figure: { kind: "margin-at", frequency: "1.16 MHz" },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: 24 },
    chunkSize: 16,
    ...extra,
  };
}

/** Five optimizer starts over squeezing and input coupling, two per chunk (3 chunks). */
export function startSweep(extra: Partial<SweepDescription> = {}): SweepDescription {
  return {
    format: "quietframe.sweep",
    version: 1,
    name: "membrane-optimum",
    setup: squeezed,
    vary: {
      kind: "starts",
      parameters: [
        { target: "squeezer.squeezing", min: "-15 dB", max: "-3 dB" },
        { target: "cavity.inputCoupling", min: "70 %", max: "99 %" },
      ],
      starts: 5,
      seed: 7,
      maxEvaluationsPerStart: 150,
    },
    figure: { kind: "margin-at", frequency: "1.16 MHz" },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: 24 },
    chunkSize: 2,
    ...extra,
  };
}

/** A fresh temporary directory; `cleanup` removes every one made. */
export function scratch(): { make: (label: string) => string; cleanup: () => void } {
  const made: string[] = [];
  return {
    make: (label) => {
      const d = mkdtempSync(join(tmpdir(), `quietframe-sweep-${label}-`));
      made.push(d);
      return d;
    },
    cleanup: () => {
      for (const d of made) rmSync(d, { recursive: true, force: true });
    },
  };
}
