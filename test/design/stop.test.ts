/**
 * Stopping long design runs: an AbortSignal aborted in the k-th progress call stops the run
 * right there with a DesignRunStopped naming k of the total, no result; a signal that is never
 * aborted, and running in slices, change no bit. Reference: the same call without a signal
 * (common practice, no outside source: the claim under test is identity with it).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { DesignRunStopped, optimizeDesign, optimizeSteps, runInSlices, spreadAnalysis, spreadSteps } from "../../src/design";
import { QuietframeError } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";
import { computeAnswer } from "../../widgets/design/answer";
import type { RankingQuestion } from "../../widgets/design/format";
import { optimumWidget } from "../../widgets/design/notebook";
import { stopAt } from "../helpers/stop-progress";

const squeezed = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const FIGURE = { kind: "margin-at", frequency: "1.16 MHz" } as const;
const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 32 };
const PARAMETERS = [{ target: "squeezer.angle", min: "0 deg", max: "180 deg" }];
const UNCERTAIN = [{ target: "detector.efficiency", value: "95 % ± 2 %" }];
const exact = (value: unknown): string => JSON.stringify(value, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? String(v) : v instanceof Float64Array ? Array.from(v) : v));

function caught(run: () => unknown): unknown {
  try {
    run();
  } catch (e) {
    return e;
  }
  throw new Error("the run was not stopped");
}

describe("stopping an optimization", () => {
  it("stops after the k-th start when the k-th progress call aborts, and says so", () => {
    const stop = stopAt(2);
    const e = caught(() => optimizeDesign(squeezed, FIGURE, PARAMETERS, { starts: 4, seed: 2, grid: GRID, ...stop }));
    expect(e).toBeInstanceOf(DesignRunStopped);
    expect(e).toMatchObject({ name: "AbortError", done: 2, total: 4, unit: "starts" });
    expect((e as Error).message).toBe("optimize stopped after 2 of 4 starts; no result is given for a stopped run");
    expect(stop.calls).toEqual([1, 2]);
  });

  it("an already aborted signal stops before the first start", () => {
    const e = caught(() => optimizeDesign(squeezed, FIGURE, PARAMETERS, { starts: 3, grid: GRID, signal: AbortSignal.abort() }));
    expect(e).toMatchObject({ done: 0, total: 3 });
  });

  it("a signal never aborted, and a run in slices, give the same bits as before", async () => {
    const options = { starts: 3, seed: 2, grid: GRID };
    const plain = exact(optimizeDesign(squeezed, FIGURE, PARAMETERS, options));
    expect(exact(optimizeDesign(squeezed, FIGURE, PARAMETERS, { ...options, signal: new AbortController().signal }))).toBe(plain);
    expect(exact(await runInSlices(optimizeSteps(squeezed, FIGURE, PARAMETERS, options)))).toBe(plain);
  });

  it("aborting in the last progress call stops nothing: every start is done and the result is whole", () => {
    const options = { starts: 2, seed: 2, grid: GRID };
    const stop = stopAt(2);
    expect(exact(optimizeDesign(squeezed, FIGURE, PARAMETERS, { ...options, ...stop }))).toBe(exact(optimizeDesign(squeezed, FIGURE, PARAMETERS, options)));
  });

  it("refuses a signal that is not an AbortSignal, naming the field", () => {
    const e = caught(() => optimizeDesign(squeezed, FIGURE, PARAMETERS, { grid: GRID, signal: "stop" as unknown as AbortSignal }));
    expect(e).toBeInstanceOf(QuietframeError);
    expect(e).toMatchObject({ path: "options.signal", allowed: "an AbortController's signal" });
  });
});

describe("stopping a Monte Carlo spread", () => {
  it("stops after the k-th block when the k-th progress call aborts", () => {
    const stop = stopAt(3);
    const e = caught(() => spreadAnalysis(squeezed, FIGURE, UNCERTAIN, { samples: 250, seed: 5, grid: GRID, ...stop }));
    // 250 samples in blocks of ⌈250 / 100⌉ = 3: three blocks are 9 samples.
    expect(e).toMatchObject({ name: "AbortError", done: 9, total: 250, unit: "samples" });
    expect((e as Error).message).toBe("spread stopped after 9 of 250 samples; no result is given for a stopped run");
    expect(stop.calls).toEqual([3, 6, 9]);
  });

  it("a signal never aborted, and a run in slices, give the same bits as before", async () => {
    const options = { samples: 120, seed: 5, grid: GRID };
    const plain = exact(spreadAnalysis(squeezed, FIGURE, UNCERTAIN, options));
    expect(exact(spreadAnalysis(squeezed, FIGURE, UNCERTAIN, { ...options, signal: new AbortController().signal }))).toBe(plain);
    expect(exact(await runInSlices(spreadSteps(squeezed, FIGURE, UNCERTAIN, options)))).toBe(plain);
  });
});

describe("stopping the design widget's computation", () => {
  it("a ranking stops between parameters", () => {
    const stop = stopAt(1);
    const question: RankingQuestion = { kind: "ranking", parameters: ["detector.efficiency", "squeezer.squeezing", "cavity.inputCoupling"] };
    const e = caught(() => computeAnswer(squeezed, FIGURE, question, GRID, stop.onProgress, stop.signal));
    expect(e).toMatchObject({ done: 1, total: 3, unit: "parameters" });
    expect((e as Error).message).toBe("ranking stopped after 1 of 3 parameters; no result is given for a stopped run");
  });

  it("the notebook API takes the signal; a stopped set() keeps the last answer", () => {
    const w = optimumWidget(squeezed, FIGURE, PARAMETERS, { starts: 2, seed: 2, grid: GRID });
    const before = w.fingerprint;
    const e = caught(() => w.set({ seed: 3 }, { signal: AbortSignal.abort() }));
    expect(e).toBeInstanceOf(DesignRunStopped);
    expect(w.fingerprint).toBe(before);
    expect(w.state.question).toMatchObject({ seed: 2 });
    expect(caught(() => optimumWidget(squeezed, FIGURE, PARAMETERS, { grid: GRID, signal: AbortSignal.abort() }))).toBeInstanceOf(DesignRunStopped);
  });
});
