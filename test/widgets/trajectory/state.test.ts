import Ajv from "ajv";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { createExplorerState } from "../../../widgets/explorer/model";
import { stateDocumentText } from "../../../widgets/explorer/document";
import { isTrajectoryInput, loadTrajectoryState, parseTrajectoryState, toTrajectoryDocument, trajectoryDocumentText } from "../../../widgets/trajectory/document";
import type { TrajectoryState } from "../../../widgets/trajectory/format";
import { computeTrajectory, createTrajectoryState, finishTrajectory, prepareTrajectory, withComputation } from "../../../widgets/trajectory/model";
import { quietframeErrorOf } from "../../helpers/errors";
import { REPO_ROOT } from "../../jupyter/env";
import { hybrid, shortRun } from "./fixtures";

// Outside reference for the documents: the Jupyter widget-state schema v2 as @jupyter-widgets/schema ships it.
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

const state = createTrajectoryState(hybrid, shortRun());

describe("trajectory state documents", () => {
  it("are Jupyter widget-state 2.0 documents that the published schema accepts", () => {
    const doc = JSON.parse(trajectoryDocumentText(state));
    expect(validateWidgetState(doc), JSON.stringify(validateWidgetState.errors)).toBe(true);
    const models = Object.values(doc.state) as { model_name: string; model_module: string; state: TrajectoryState }[];
    expect(models).toHaveLength(1);
    expect(models[0]).toMatchObject({ model_name: "TrajectoryWidgetModel", model_module: "quietframe" });
    expect(models[0].state).toEqual(state);
  });

  it("store seed, step, duration, stored points and the starting state", () => {
    expect(state.simulation).toEqual({ duration: "20 us", step: "10 ns", seed: 7, samples: 401, initial: "stationary" });
  });

  it("reproduce the same curves bit for bit when loaded (text or object, document or bare state)", () => {
    for (const input of [trajectoryDocumentText(state), toTrajectoryDocument(state), state, JSON.stringify(state)]) {
      const loaded = loadTrajectoryState(input);
      expect(loaded.fingerprintMatches).toBe(true);
      expect(loaded.computation.fingerprint).toBe(state.fingerprint);
      expect(loaded.state).toEqual(state);
    }
  });

  it("give a different fingerprint for another seed, and the same for the same seed", () => {
    const again = createTrajectoryState(hybrid, shortRun());
    const other = createTrajectoryState(hybrid, shortRun(8));
    expect(again.fingerprint).toBe(state.fingerprint);
    expect(other.fingerprint).not.toBe(state.fingerprint);
  });

  it("report a stored fingerprint that the rerun does not reproduce", () => {
    const tampered = { ...state, fingerprint: `sha256:${"0".repeat(64)}` };
    expect(loadTrajectoryState(tampered).fingerprintMatches).toBe(false);
  });

  it("are told apart from explorer states", () => {
    const explorerText = stateDocumentText(createExplorerState(hybrid));
    expect(isTrajectoryInput(explorerText)).toBe(false);
    expect(isTrajectoryInput(trajectoryDocumentText(state))).toBe(true);
    expect(isTrajectoryInput(state)).toBe(true);
    expect(isTrajectoryInput("not json")).toBe(false);
  });

  it("refuse unknown fields, naming them", () => {
    const e = quietframeErrorOf(() => parseTrajectoryState({ ...state, extra: 1 }));
    expect(e.path).toBe("state.extra");
    const s = quietframeErrorOf(() => parseTrajectoryState({ ...state, simulation: { ...state.simulation, speed: 2 } }));
    expect(s.path).toBe("state.simulation.speed");
  });

  it("keep nothing that could reach a prototype", () => {
    const text = trajectoryDocumentText(state).replace('"format": "quietframe.setup"', '"__proto__": {"polluted": true}, "format": "quietframe.setup"');
    expect(quietframeErrorOf(() => parseTrajectoryState(text)).path).toMatch(/setup\.__proto__$/);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });
});

describe("bad simulation settings in a state", () => {
  const withSim = (sim: Record<string, unknown>) => ({ ...state, simulation: { ...state.simulation, ...sim } });
  it.each([
    [{ step: "30 us" }, "state.simulation.step", /longer than the duration/],
    [{ duration: "-20 us" }, "state.simulation.duration", /positive/],
    [{ duration: "0 s" }, "state.simulation.duration", /positive/],
    [{ seed: 1.5 }, "state.simulation.seed", /not a seed/],
    [{ seed: -1 }, "state.simulation.seed", /not a seed/],
    [{ seed: 2 ** 32 }, "state.simulation.seed", /not a seed/],
    [{ step: "10 kg" }, "state.simulation.step", /.+/],
    [{ samples: 5000 }, "state.simulation.samples", /stored points/],
    [{ initial: "excited" }, "state.simulation.initial", /starting state/],
    [{ stoppedAfter: 2000 }, "state.simulation.stoppedAfter", /not a step/],
  ])("%j is refused at %s", (sim, path, problem) => {
    const e = quietframeErrorOf(() => loadTrajectoryState(withSim(sim)));
    expect(e.path).toBe(path);
    expect(e.problem).toMatch(problem);
    expect(e.message).toContain(path);
  });

  it("a set-up value out of its control's range names the value", () => {
    const e = quietframeErrorOf(() => loadTrajectoryState({ ...state, values: { "cell.field": "1 T" } }));
    expect(e.path).toBe("state.values.cell.field");
  });

  it("an unknown component in a joint variable is refused, not simulated", () => {
    const joint = [{ label: "x nowhere", terms: [{ component: "nowhere", quadrature: "x", weight: 1 }] }];
    expect(() => loadTrajectoryState({ ...state, joint })).toThrow();
  });
});

describe("runs in slices and stopped runs", () => {
  it("give the same bits whatever the slice size", () => {
    const { fingerprint: _f, ...base } = state;
    expect(computeTrajectory(base, { sliceSteps: 7 }).fingerprint).toBe(state.fingerprint);
    expect(computeTrajectory(base, { sliceSteps: 1999 }).fingerprint).toBe(state.fingerprint);
  });

  it("report progress between slices, up to 1", () => {
    const { fingerprint: _f, ...base } = state;
    const seen: number[] = [];
    computeTrajectory(base, { sliceSteps: 500, onProgress: (f) => seen.push(f) });
    expect(seen).toEqual([0.25, 0.5, 0.75, 1]);
  });

  it("a stopped run's state replays to the same partial curves", () => {
    const { fingerprint: _f, ...base } = state;
    const p = prepareTrajectory(base);
    p.run.advance(300);
    p.run.advance(333);
    p.run.stop();
    const partial = finishTrajectory(p);
    expect(partial.result.stopped).toBe(true);
    expect(partial.result.stepsTaken).toBe(633);
    expect(partial.result.stepsPlanned).toBe(2000);
    const saved = withComputation(base, partial);
    expect(saved.simulation.stoppedAfter).toBe(633);
    expect(partial.fingerprint).not.toBe(state.fingerprint);
    const again = loadTrajectoryState(trajectoryDocumentText(saved));
    expect(again.fingerprintMatches).toBe(true);
    expect(again.computation.result.stepsTaken).toBe(633);
  });
});

describe("the starting state", () => {
  it("is the engine's choice when not given, and the saved state names it", async () => {
    const freeMass = JSON.parse(readFileSync(join(REPO_ROOT, "examples", "free-test-mass.json"), "utf8"));
    // A free mass has no stationary state (its position diffuses without bound), so the run starts from the ground state.
    const s = createTrajectoryState(freeMass, { simulation: { duration: "1 ms", step: "1 us", seed: 3 } });
    expect(s.simulation.initial).toBe("ground");
    expect(state.simulation.initial).toBe("stationary");
    expect(loadTrajectoryState(s).fingerprintMatches).toBe(true);
  });

  it("unknown options are named", () => {
    expect(() => createTrajectoryState(hybrid, { ...shortRun(), simulaton: {} } as never)).toThrow(/options\.simulaton: is not an option of a trajectory widget/);
    expect(() => createTrajectoryState(hybrid, { ...shortRun(), simulation: { duration: "1 us", step: "1 ns", sed: 3 } } as never)).toThrow(/options\.simulation\.sed: is not a simulation setting/);
  });
});
