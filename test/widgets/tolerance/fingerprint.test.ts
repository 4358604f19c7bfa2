import { readFileSync } from "node:fs";
import { join } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { CellStatus, toleranceMapInProcess, type ToleranceMapSpec } from "../../../src/tolerance";
import { loadToleranceState, toleranceWidgetState, type ToleranceWidgetState } from "../../../widgets/tolerance/model";
import { toleranceCsv, toleranceFingerprint } from "../../../widgets/tolerance/numbers";

/**
 * The fingerprint of a map's numbers (docs/fingerprint.md) on a map with failed cells: it survives
 * the JSON a state is saved as, covers every figure and status, and the CSV gives its numbers back.
 * Common practice, no outside source: the checks compare the tool with itself.
 */
const ROOT = join(__dirname, "..", "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;

// Detuning −4 … +4 MHz through 0 Hz (blue detuning is unstable), input coupling 0 … 100 % (0 % is invalid).
const MIXED: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 5 },
  y: { target: "cavity.inputCoupling", from: "0 %", to: "100 %", points: 3 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 48 },
  figure: { kind: "margin-at", frequency: "1.16 MHz" },
};

let state: ToleranceWidgetState;
beforeAll(async () => {
  state = toleranceWidgetState(squeezed, MIXED, await toleranceMapInProcess(squeezed, MIXED));
});

describe("tolerance-map fingerprint", () => {
  it("is stored with a new state and is the same after the state is saved as JSON and read back", () => {
    expect(state.map.counts.unstable).toBeGreaterThan(0);
    expect(state.map.counts.invalid).toBeGreaterThan(0);
    expect(state.fingerprint).toMatch(/^sha256:[0-9a-f]{64}$/);
    const loaded = loadToleranceState(JSON.stringify(state));
    expect(toleranceFingerprint(loaded.map)).toBe(state.fingerprint);
  });

  it("changes with any figure, any status or any axis value, and not with −0 written for +0", () => {
    const edited = (edit: (m: { values: unknown[]; status: number[]; x: { values: number[] } }) => void): string => {
      const copy = structuredClone(state.map);
      edit(copy as unknown as { values: unknown[]; status: number[]; x: { values: number[] } });
      return toleranceFingerprint(copy);
    };
    const ok = state.map.status.indexOf(CellStatus.ok);
    expect(edited((m) => (m.values[ok] = (m.values[ok] as number) * (1 + Number.EPSILON)))).not.toBe(state.fingerprint);
    expect(edited((m) => (m.status[m.status.indexOf(CellStatus.unstable)] = CellStatus.invalid))).not.toBe(state.fingerprint);
    expect(edited((m) => (m.x.values[0] = m.x.values[0] * (1 + Number.EPSILON)))).not.toBe(state.fingerprint);
    const zero = state.map.x.values.indexOf(0);
    expect(zero).toBeGreaterThanOrEqual(0);
    expect(edited((m) => (m.x.values[zero] = -0))).toBe(state.fingerprint);
  });

  it("the CSV gives every axis value, figure and status back exactly, in fingerprint order", () => {
    const [axes, cells] = toleranceCsv(state.map).trimEnd().split("\n\n");
    const axisRows = axes
      .split("\n")
      .slice(1)
      .map((r) => r.split(","));
    expect(axisRows.slice(0, 5).map((r) => Number(r[0]))).toEqual(state.map.x.values);
    expect(axisRows.slice(0, 3).map((r) => Number(r[1]))).toEqual(state.map.y.values);
    const rows = cells
      .split("\n")
      .slice(1)
      .map((r) => r.split(","));
    expect(rows.map((r) => (r[2] === "" ? null : Number(r[2])))).toEqual(state.map.values);
    expect(rows.map((r) => Number(r[3]))).toEqual(state.map.status);
    expect(rows.map((r) => [Number(r[0]), Number(r[1])])).toEqual(state.map.values.map((_, k) => [k % 5, Math.floor(k / 5)]));
  });
});
