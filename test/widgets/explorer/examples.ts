import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { SetupDescription } from "../../../src/setup/format";
import { createExplorerState } from "../../../widgets/explorer/model";
import type { ExplorerState } from "../../../widgets/explorer/format";
import type { ControlSpec } from "../../../widgets/core/controls/control-spec";

/** The shipped examples, each with a control or two as a user would add them. */
export const EXAMPLES_DIR = join(__dirname, "..", "..", "..", "examples");

const CONTROLS: Record<string, ControlSpec[]> = {
  "free-test-mass.json": [
    { target: "mirror.mass", min: "10 g", max: "10 kg" },
    { target: "detector.efficiency", min: "50 %", max: "100 %", control: "number" },
  ],
  "cryogenic-membrane.json": [
    { target: "membrane.temperature", min: "10 mK", max: "300 K", label: "bath temperature" },
    { target: "cavity.photons", min: 1e4, max: 1e8 },
  ],
  "cryogenic-membrane-squeezed.json": [
    { target: "squeezer.squeezing", min: "-15 dB", max: "0 dB", scale: "linear", steps: 30 },
    { target: "squeezer.angle", control: "dropdown", choices: ["0 deg", "60 deg", "90 deg"] },
  ],
  "hybrid-spin-reference.json": [
    { target: "transfer.transmission", min: "50 %", max: "100 %", label: "transmission between the systems" },
    { target: "cell.field", min: "0.312 mT", max: "0.3166 mT", scale: "linear", label: "bias field" },
  ],
  "test-mirror-classical-noise.json": [
    { target: "arm.power", min: "1 mW", max: "1 W", label: "input power" },
    { target: "mirror.mass", min: "10 g", max: "1 kg" },
  ],
  "test-mirror-laser-noise.json": [
    { target: "arm.power", min: "1 mW", max: "1 W", label: "input power" },
    { target: "arm.length", min: "1 cm", max: "1 m" },
  ],
  "long-baseline-detector.json": [
    { target: "ifo.power", min: "10 kW", max: "3 MW", label: "circulating arm power" },
    { target: "squeezer.squeezing", min: "-12 dB", max: "0 dB", scale: "linear", steps: 24 },
  ],
};

export function exampleFiles(): string[] {
  return readdirSync(EXAMPLES_DIR)
    .filter((f) => f.endsWith(".json"))
    .sort();
}

export function exampleSetup(file: string): SetupDescription {
  return JSON.parse(readFileSync(join(EXAMPLES_DIR, file), "utf8")) as SetupDescription;
}

export function exampleControls(file: string): ControlSpec[] {
  const controls = CONTROLS[file];
  if (!controls) throw new Error(`no controls chosen for examples/${file}; add them to test/widgets/explorer/examples.ts`);
  return controls;
}

const cache = new Map<string, ExplorerState>();

/** A fresh copy of the example's explorer state (computed once per file). */
export function exampleState(file: string): ExplorerState {
  let state = cache.get(file);
  if (!state) {
    state = createExplorerState(exampleSetup(file), { controls: exampleControls(file) });
    cache.set(file, state);
  }
  return structuredClone(state);
}
