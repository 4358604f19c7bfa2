/**
 * Running a stepped computation in slices (what the design widget's page does): a pause comes
 * after the step that passes the slice time, never inside a step, and the result is the one of
 * running every step at once; the design widget's answer computed in slices has the bits of the
 * one computed at once. Reference: counting by hand (common practice, no source).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runInSlices, runToEnd } from "../../src/design";
import type { FigureSpec, SetupDescription } from "../../src/index";
import { answerSteps, computeAnswer } from "../../widgets/design/answer";
import type { DesignQuestion } from "../../widgets/design/format";
import { progressText } from "../../widgets/design/browser/page-run";

/** Ten steps; each moves the fake clock on by 5 ms and logs itself. */
function* tenSteps(clock: { t: number }, log: string[]): Generator<number, string> {
  for (let k = 1; k <= 10; k++) {
    clock.t += 5;
    log.push(`step ${k}`);
    if (k < 10) yield k;
  }
  return "done";
}

describe("runInSlices", () => {
  it("pauses after the step that passes the slice time (12 ms of 5 ms steps: after steps 3, 6 and 9)", async () => {
    const clock = { t: 0 };
    const log: string[] = [];
    const result = await runInSlices(tenSteps(clock, log), { sliceMs: 12, now: () => clock.t, pause: async () => void log.push("pause") });
    expect(result).toBe("done");
    expect(log.filter((l) => l === "pause")).toHaveLength(3);
    expect(log.indexOf("pause")).toBe(3);
    expect(log.slice(3, 8)).toEqual(["pause", "step 4", "step 5", "step 6", "pause"]);
  });

  it("without a slice time pauses between every two steps (9 pauses for 10 steps) and returns what runToEnd returns", async () => {
    let pauses = 0;
    const clock = { t: 0 };
    expect(await runInSlices(tenSteps(clock, []), { pause: async () => void pauses++ })).toBe(runToEnd(tenSteps({ t: 0 }, [])));
    expect(pauses).toBe(9);
  });

  it("ends a slice after a step for which endSliceAfter says so, before the slice time is up", async () => {
    const clock = { t: 0 };
    const log: string[] = [];
    const result = await runInSlices(tenSteps(clock, log), {
      sliceMs: 1000,
      now: () => clock.t,
      pause: async () => void log.push("pause"),
      endSliceAfter: () => log[log.length - 1] === "step 4" || log[log.length - 1] === "step 7",
    });
    expect(result).toBe("done");
    expect(log.filter((l) => l === "pause")).toHaveLength(2);
    expect(log.slice(3, 9)).toEqual(["step 4", "pause", "step 5", "step 6", "step 7", "pause"]);
  });

  it("rejects with what a step throws, and runs no step after it", async () => {
    const log: string[] = [];
    function* failing(): Generator<number, string> {
      log.push("one");
      yield 1;
      throw new Error("step two failed");
    }
    await expect(runInSlices(failing())).rejects.toThrow("step two failed");
    expect(log).toEqual(["one"]);
  });
});

describe("the design widget's answer in slices", () => {
  const setup = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "free-test-mass.json"), "utf8")) as SetupDescription;
  const grid = { from: "10 Hz", to: "10 kHz", points: 31 };
  const figure: FigureSpec = { kind: "margin-at", frequency: "300 Hz" };
  const questions: DesignQuestion[] = [
    { kind: "ranking", parameters: ["arm.power", "detector.efficiency"], scanPoints: 5 },
    { kind: "optimum", parameters: [{ target: "arm.power", min: "1 mW", max: "1 W" }], starts: 2, seed: 3 },
    { kind: "spread", uncertain: [{ target: "detector.efficiency", value: "95 % ± 2 %" }], samples: 150, seed: 7 },
  ];
  for (const question of questions) {
    it(`${question.kind}: the same answer as computed at once`, async () => {
      const told: string[] = [];
      const sliced = await runInSlices(
        answerSteps(setup, figure, question, grid, (done, total) => told.push(progressText(question.kind, done, total))),
        { sliceMs: 12 },
      );
      expect(JSON.stringify(sliced)).toBe(JSON.stringify(computeAnswer(setup, figure, question, grid)));
      expect(told[told.length - 1]).toMatch(new RegExp(`^${question.kind}: (\\d+) of \\1 \\w+ \\(100 %\\)$`));
    });
  }
});
