import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";
import { noiseBudget, type NoiseBudget } from "../../src/engine/budget";
import { logGrid, type FrequencyGridSpec } from "../../src/setup/grid";
import { UnstableSetupError } from "../../src/engine/stability";
import { QuietframeError } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import { evaluate, evaluateSetup, loadSetup, prepare, simulate, startSimulation, type SetupValues } from "../../src/pipeline";
import { applyValues } from "../../src/setup/apply-values";
import type { SetupDescription } from "../../src/setup/format";
import { validateSetup } from "../../src/setup/validate";
import { simulateTrajectory } from "../../src/timedomain";
import type { SimulationSettings, TrajectoryRequest } from "../../src/timedomain/types";
import { CellStatus, toleranceMapInProcess, type ToleranceMap } from "../../src/tolerance";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import type { ControlSpec } from "../../widgets/core/controls/control-spec";
import type { ExplorerState } from "../../widgets/explorer/format";
import { trajectoryFingerprint } from "../../widgets/trajectory/fingerprint";
import { createTrajectoryState, prepareTrajectory } from "../../widgets/trajectory/model";
import type { TrajectoryState } from "../../widgets/trajectory/format";
import { example, sameBits } from "../tolerance/helpers";

/**
 * One path through the engine: every caller prepares a set-up with prepare() and then
 * evaluates or simulates it. These checks are of the product against itself, so the
 * reference of each is the other route to the same answer: the same set-up refused with the
 * same text by the explorer, a tolerance cell, the trajectory model and the CLI (and by
 * evaluateSetup, the plain composition); a prepared set-up evaluated twice equal bit for bit
 * to fresh evaluations and to the passes called one by one (validate, assemble, budget).
 */

// A membrane read through a cavity (1.2 MHz mode, 8 MHz-wide cavity, 95 % detection).
const base = example("cryogenic-membrane.json");

const CONTROLS: ControlSpec[] = [
  { target: "detector.efficiency", min: "0 %", max: "100 %" },
  { target: "cavity.detuning", min: "-4 MHz", max: "4 MHz" },
];

/** The text every caller reports for a refused set-up: that of the error the plain composition throws. */
function refusal(values: SetupValues): string {
  try {
    evaluateSetup(loadSetup(applyValues(base, values)));
  } catch (e) {
    expect(e).toBeInstanceOf(QuietframeError);
    return (e as Error).message;
  }
  throw new Error("expected the set-up to be refused");
}

function thrownText(fn: () => unknown): string {
  try {
    fn();
  } catch (e) {
    expect(e).toBeInstanceOf(QuietframeError);
    return (e as Error).message;
  }
  throw new Error("expected a QuietframeError");
}

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-prepare-"));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function cli(command: string, setup: SetupDescription): { code: number; out: string; err: string } {
  const path = join(dir, `${command}.json`);
  writeFileSync(path, JSON.stringify(setup));
  let out = "";
  let err = "";
  const code = runCli([command, path], { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("the same set-up is refused with the same text by every caller", () => {
  // Efficiency 0 … 95 % across, detuning 0 … +2 MHz down: one blind column, one blue-detuned row.
  let map: ToleranceMap;
  let explorerState: ExplorerState;
  let trajectoryState: TrajectoryState;
  beforeAll(async () => {
    map = await toleranceMapInProcess(base, {
      x: { target: "detector.efficiency", from: "0 %", to: "95 %", points: 2 },
      y: { target: "cavity.detuning", from: "0 MHz", to: "2 MHz", points: 2 },
      grid: { from: "1.1 MHz", to: "1.3 MHz", points: 24 },
      figure: { kind: "best-margin" },
    });
    // The explorer on the map's grid, so that its best margin is the cell's figure.
    explorerState = createExplorerState(base, { controls: CONTROLS, settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 24 } } });
    trajectoryState = createTrajectoryState(base, { controls: CONTROLS, simulation: { duration: "2 us", step: "10 ns" } });
  });

  const cases = [
    // Detection efficiency 0: nothing is detected (checked before the dynamics).
    {
      name: "a blind readout (detector efficiency 0)",
      i: 0,
      j: 0,
      status: CellStatus.invalid,
      pattern: /^components\.detector\.efficiency = "0 %": detector 'detector' has efficiency 0: it sees no signal/,
    },
    { name: "a blind readout on an unstable set-up (detection is checked first)", i: 0, j: 1, status: CellStatus.invalid, pattern: /efficiency 0: it sees no signal/ },
    // Blue detuning anti-damps the membrane (radiation-pressure anti-damping).
    { name: "an unstable set-up (blue-detuned cavity)", i: 1, j: 1, status: CellStatus.unstable, pattern: /^setup: unstable: a mode at 1\.\d+e\+6 Hz grows .*blue-detuned/ },
  ] as const;

  it.each(cases)("$name", ({ i, j, status, pattern }) => {
    const values = { "detector.efficiency": map.x.written[i], "cavity.detuning": map.y.written[j] };
    const expected = refusal(values);
    expect(expected).toMatch(pattern);

    // Tolerance cell.
    const k = j * map.x.written.length + i;
    expect(map.status[k]).toBe(status);
    expect(Number.isNaN(map.values[k])).toBe(true);
    const message = map.messages.find((m) => m.x === i && m.y === j);
    expect(message?.message).toBe(expected);

    // Explorer (the same state with the cell's values).
    expect(thrownText(() => computeExplorer({ ...explorerState, values }))).toBe(expected);

    // Trajectory model.
    expect(thrownText(() => prepareTrajectory({ ...trajectoryState, values }))).toBe(expected);

    // CLI: exit status 1, nothing on stdout, the same text on stderr, for every command that evaluates.
    for (const command of ["check", "eval", "summary"]) {
      const run = cli(command, applyValues(base, values));
      expect(run).toEqual({ code: 1, out: "", err: `quietframe: ${expected}\n` });
    }
  });

  it("the good cell computes, and so do the explorer and the trajectory at its values", () => {
    const values = { "detector.efficiency": map.x.written[1], "cavity.detuning": map.y.written[0] };
    expect(map.status[1]).toBe(CellStatus.ok);
    expect(map.values[1]).toBe(computeExplorer({ ...explorerState, values }).headline.bestMarginDb);
    expect(prepareTrajectory({ ...trajectoryState, values }).run.planned).toBe(200);
  });

  it("an unstable set-up is an UnstableSetupError, still a QuietframeError with the field path 'setup'", () => {
    let caught: unknown;
    try {
      prepare(base, { "cavity.detuning": "2 MHz" });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(UnstableSetupError);
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe("setup");
    expect((caught as QuietframeError).name).toBe("QuietframeError");
    expect((caught as UnstableSetupError).report.growing.length).toBe(1);
  });
});

describe("a state that breaks the uncertainty relation", () => {
  // Viscous damping at Q = 2 and 0 K leaves the model's validity range (the stationary state's
  // V + iΣ/2 has a negative eigenvalue); at 6 K the same body is physical.
  it("is a warning beside the explorer's curves and an invalid tolerance cell with the same text", async () => {
    const map = await toleranceMapInProcess(base, {
      x: { target: "membrane.temperature", from: "0 K", to: "6 K", points: 2 },
      y: { target: "membrane.Q", from: "2", to: "4", points: 2 },
      grid: { from: "1.1 MHz", to: "1.3 MHz", points: 24 },
      figure: { kind: "best-margin" },
    });
    const values = { "membrane.temperature": map.x.written[0], "membrane.Q": map.y.written[0] };
    const evaluation = evaluateSetup(loadSetup(applyValues(base, values)));
    expect(evaluation.physicality?.physical).toBe(false);
    const warning = evaluation.warnings.find((w) => /violates the uncertainty relation/.test(w));
    expect(warning).toMatch(/use damping "symmetric"/);
    expect(map.status[0]).toBe(CellStatus.invalid);
    expect(map.messages[0]).toMatchObject({ x: 0, y: 0, status: CellStatus.invalid, message: warning });
    // 6 K: physical, so the cell has its figure.
    expect(map.status[1]).toBe(CellStatus.ok);
    expect(evaluateSetup(loadSetup(applyValues(base, { "membrane.temperature": map.x.written[1], "membrane.Q": map.y.written[0] }))).physicality?.physical).toBe(true);
  });
});

function expectSameBudget(a: NoiseBudget, b: NoiseBudget): void {
  expect(sameBits(a.frequencies, b.frequencies)).toBe(true);
  expect(sameBits(a.total, b.total)).toBe(true);
  expect(a.terms.map((t) => t.id)).toEqual(b.terms.map((t) => t.id));
  a.terms.forEach((t, k) => expect(sameBits(t.psd, b.terms[k].psd)).toBe(true));
  expect(a.references.map((r) => r.id)).toEqual(b.references.map((r) => r.id));
  a.references.forEach((r, k) => expect(sameBits(r.psd, b.references[k].psd)).toBe(true));
  expect(a.warnings).toEqual(b.warnings);
  expect(a.quantity).toEqual(b.quantity);
}

describe("prepare once, evaluate many times", () => {
  const wide: FrequencyGridSpec = { from: 1e5, to: 1e7, points: 301 };
  const narrow: FrequencyGridSpec = { from: 1.19e6, to: 1.21e6, points: 97 };

  it.each(["cryogenic-membrane.json", "free-test-mass.json", "hybrid-spin-reference.json", "long-baseline-detector.json"])(
    "%s: two grids on one prepared set-up equal two fresh evaluations and the passes called one by one, bit for bit",
    (name) => {
      const setup = example(name);
      const grids =
        name === "cryogenic-membrane.json" || name === "hybrid-spin-reference.json"
          ? [wide, narrow]
          : [
              { from: 5, to: 5000, points: 211 },
              { from: 20, to: 200, points: 33 },
            ];
      const prepared = prepare(setup);
      const once = grids.map((g) => evaluate(prepared, g));
      // In the other order, on the same prepared set-up: nothing an evaluation does stays behind.
      const reversed = [...grids]
        .reverse()
        .map((g) => evaluate(prepared, g))
        .reverse();
      grids.forEach((grid, k) => {
        const fresh = evaluateSetup(loadSetup(setup), grid);
        const passes = noiseBudget(assemble(validateSetup(setup)), logGrid(grid));
        expectSameBudget(once[k].budget, fresh.budget);
        expectSameBudget(once[k].budget, passes);
        expectSameBudget(reversed[k].budget, fresh.budget);
        expect(once[k].warnings).toEqual(fresh.warnings);
        expect(once[k].cautions).toEqual(fresh.cautions);
        expect(once[k].stability).toEqual(fresh.stability);
        // Written when read, so compared by reading them.
        expect(once[k].stability.summary).toBe(fresh.stability.summary);
        expect(once[k].stability.undamped.map((m) => m.participation)).toEqual(fresh.stability.undamped.map((m) => m.participation));
      });
    },
  );

  it("a grid given as frequencies gives the same bits as the grid spec", () => {
    const prepared = prepare(base);
    expectSameBudget(evaluate(prepared, logGrid(narrow)).budget, evaluate(prepared, narrow).budget);
  });

  it("without a grid: the set-up's own grid", () => {
    const prepared = prepare(base);
    expectSameBudget(evaluate(prepared).budget, evaluate(prepared, { from: 1.1e6, to: 1.3e6, points: 801 }).budget);
  });

  it("values are written into a copy of the set-up: the same bits as applying them first", () => {
    const values = { "membrane.temperature": "2 K", "detector.efficiency": "80 %" };
    const copy = structuredClone(base);
    const withValues = evaluate(prepare(base, values), narrow).budget;
    expect(base).toEqual(copy);
    expectSameBudget(withValues, evaluateSetup(loadSetup(applyValues(base, values)), narrow).budget);
    expectSameBudget(evaluate(prepare(JSON.stringify(base), values), narrow).budget, withValues);
  });
});

describe("prepare once, simulate", () => {
  const setup = example("hybrid-spin-reference.json");
  const settings: SimulationSettings = { duration: 2e-6, step: 1e-8, seed: 11, samples: 101 };
  const request: TrajectoryRequest = { joint: [{ label: "x membrane", terms: [{ component: "membrane", quadrature: "x", weight: 1 }] }], pair: ["membrane", "cell"] };

  it("simulate and a sliced startSimulation equal the time-domain engine on a freshly assembled model, bit for bit", () => {
    const prepared = prepare(setup);
    const reference = trajectoryFingerprint(simulateTrajectory(assemble(loadSetup(setup)).model, settings, request));
    expect(trajectoryFingerprint(simulate(prepared, settings, request))).toBe(reference);
    const run = startSimulation(prepared, settings, request);
    while (!run.advance(37));
    expect(trajectoryFingerprint(run.result())).toBe(reference);
    // The same prepared set-up again: nothing of the first runs stays behind.
    expect(trajectoryFingerprint(simulate(prepared, settings, request))).toBe(reference);
  });
});

describe("bad input to prepare and evaluate", () => {
  it("names the field and what is allowed", () => {
    const resolved = loadSetup(base);
    expect(() => prepare(resolved, { "membrane.temperature": "2 K" })).toThrow(/^values = .*cannot be written into a set-up that is already validated; allowed: /);
    expect(() => prepare(base, [] as unknown as SetupValues)).toThrow(/^values = \[\]: must be an object; allowed: /);
    expect(() => prepare(base, { "nothing.mass": "1 kg" })).toThrow(/^values\.nothing\.mass = "1 kg": names no component of the set-up/);
    // A malformed set-up with values: validation's own message, not a crash while writing the values.
    expect(() => prepare({ format: "quietframe.setup", version: 1, components: "none" } as unknown as SetupDescription, { "a.b": 1 })).toThrow(QuietframeError);
    expect(() => prepare("{ not json", { "a.b": 1 })).toThrow(/line 1/);
    const prepared = prepare(base);
    expect(() => evaluate(prepared, { from: 10, to: 1, points: 5 })).toThrow(/^grid\.to = 1: must be above from/);
    expect(() => evaluate(prepared, { from: 1, to: 10, points: 1 })).toThrow(/^grid\.points = 1: /);
    expect(() => evaluate(prepared, new Float64Array([1e6, 0]))).toThrow(/^frequencies\[1\] = 0: is not a usable frequency/);
    expect(() => evaluate(prepared, new Float64Array(0))).toThrow(/^frequencies = \[\]: is empty/);
  });
});
