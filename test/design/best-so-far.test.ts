/**
 * The best so far of a running optimization (what the design page draws after each start, marked
 * provisional): reported after every start but the last, never worse than the one before, chosen
 * as the final result chooses (after every start it is the final optimum's point), and asking for
 * it changes no number of the result. In the page's slicing, each report ends its slice and the
 * pause draws the newest one, so each start's best is drawn exactly once, in order, before the
 * final answer. References: the rules of the run itself, counted by hand (common practice, no
 * source).
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { optimizeDesign, optimizeSteps, runInSlices, runToEnd, type ProvisionalOptimum } from "../../src/design";
import { bestSoFar, planOptimize, runStart, type StartOutcome } from "../../src/design/optimize";
import type { SetupDescription } from "../../src/setup/format";
import { answerSteps, computeAnswer } from "../../widgets/design/answer";
import type { OptimumAnswer, OptimumQuestion } from "../../widgets/design/format";
import { NewestBest, provisionalLabel } from "../../widgets/design/provisional";
import { answerSpecs } from "../../widgets/design/specs";

const squeezed = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;
const FIGURE = { kind: "margin-at", frequency: "1.16 MHz" } as const;
const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 32 };
const PARAMETERS = [{ target: "squeezer.angle", min: "0 deg", max: "180 deg" }];
const OPTIONS = { starts: 4, seed: 2, grid: GRID };
const exact = (value: unknown): string => JSON.stringify(value, (_k, v) => (typeof v === "number" && !Number.isFinite(v) ? String(v) : v instanceof Float64Array ? Array.from(v) : v));

describe("the best so far of a running optimization", () => {
  it("is reported after each start but the last, never gets worse, and changes nothing in the result", () => {
    const told: ProvisionalOptimum[] = [];
    const withHook = runToEnd(optimizeSteps(squeezed, FIGURE, PARAMETERS, { ...OPTIONS, onBestSoFar: (b) => told.push(b) }));
    expect(exact(withHook)).toBe(exact(optimizeDesign(squeezed, FIGURE, PARAMETERS, OPTIONS)));
    expect(told.map((b) => [b.done, b.total])).toEqual([
      [1, 4],
      [2, 4],
      [3, 4],
    ]);
    for (const [i, b] of told.entries()) {
      expect(b.result.status).toBe("ok");
      expect(b.result.starts).toHaveLength(i + 1);
      expect(b.result.message).toMatch(new RegExp(`^best of ${i + 1} of 4 starts so far \\(provisional\\): `));
      if (i > 0) expect(b.result.optimum!.figure).toBeGreaterThanOrEqual(told[i - 1].result.optimum!.figure);
    }
    // The margin is "higher is better": the final optimum is at least as good as any best so far.
    expect(withHook.optimum!.figure).toBeGreaterThanOrEqual(told[2].result.optimum!.figure - 1e-12);
  });

  it("after every start it is the final optimum's point, bit for bit, and the run's evaluation count is untouched", () => {
    const plan = planOptimize(squeezed, FIGURE, PARAMETERS, OPTIONS);
    const outcomes: StartOutcome[] = [];
    for (let s = 0; s < plan.starts; s++) outcomes.push(runStart(plan, s));
    const before = plan.problem.evaluations;
    const best = bestSoFar(plan, outcomes)!;
    expect(plan.problem.evaluations).toBe(before);
    const final = optimizeDesign(squeezed, FIGURE, PARAMETERS, OPTIONS);
    expect(exact(best.result.optimum!.values)).toBe(exact(final.optimum!.values));
    expect(best.result.evaluations).toBe(before);
    // The figure comes back from the search's dB value; the final result evaluates it once more (from memory: a round trip through 10 log10 keeps about 1e-13).
    expect(Math.abs(best.result.optimum!.figure - final.optimum!.figure)).toBeLessThan(1e-9);
  });

  it("is undefined while no start has a value", () => {
    const plan = planOptimize(squeezed, FIGURE, PARAMETERS, OPTIONS);
    expect(bestSoFar(plan, [])).toBeUndefined();
    expect(bestSoFar(plan, [{ report: { start: {}, status: "infeasible-start", figure: NaN, evaluations: 1, message: "unstable" } }])).toBeUndefined();
  });
});

describe("the design page's slicing draws each best so far once, then the final answer", () => {
  const question: OptimumQuestion = { kind: "optimum", parameters: PARAMETERS, starts: 4, seed: 2 };

  it("a report ends the slice, the pause draws the newest, and the answer is the one computed at once", async () => {
    const newest = new NewestBest(squeezed, FIGURE, GRID);
    const drawn: { label: string; answer: OptimumAnswer }[] = [];
    let pauses = 0;
    const pause = async (): Promise<void> => {
      pauses++;
      const best = newest.next();
      if (best) drawn.push(best);
    };
    // Slices far longer than the run: only the reports end them.
    const steps = answerSteps(squeezed, FIGURE, question, GRID, undefined, undefined, newest.report);
    const answer = await runInSlices(steps, { sliceMs: 1e9, now: () => 0, pause, endSliceAfter: () => newest.waiting });
    expect(exact(answer)).toBe(exact(computeAnswer(squeezed, FIGURE, question, GRID)));
    expect(pauses).toBe(3);
    expect(drawn.map((d) => d.label)).toEqual([provisionalLabel(1, 4), provisionalLabel(2, 4), provisionalLabel(3, 4)]);
    expect(drawn[0].label).toBe("best of 1 of 4 starts (provisional)");
    expect(newest.waiting).toBe(false);
    expect(newest.next()).toBeUndefined();
    for (const d of drawn) {
      // The curve at the best so far is drawn through the same pipeline as the final one: the same grid, the same "as given" curve.
      expect(d.answer.curves!.frequencies).toEqual((answer as OptimumAnswer).curves!.frequencies);
      expect(d.answer.curves!.before).toEqual((answer as OptimumAnswer).curves!.before);
      expect(d.answer.curves!.after.every((x) => typeof x === "number" && x > 0)).toBe(true);
      expect(JSON.stringify(answerSpecs(d.answer, d.label)[0].title)).toContain(`at the ${d.label}`);
    }
    expect(JSON.stringify(answerSpecs(answer)[0].title)).not.toContain("provisional");
  });
});
