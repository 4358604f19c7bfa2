/**
 * Budgets on several lists of frequencies solved in one pass (noiseBudgets; a design problem's
 * figure beside its noise curve) against each list evaluated alone, bit for bit: totals, terms,
 * reference curves and warnings on every example; and a figure with its curve against the two
 * evaluations one after the other, refusals and their messages included. Reference: the
 * one-list path itself (common practice, no outside source: the claim under test is identity
 * with it).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { designProblem } from "../../src/design/problem";
import { type NoiseBudget, noiseBudget, noiseBudgets } from "../../src/engine/budget";
import { evaluate } from "../../src/evaluate";
import { figureValue } from "../../src/figures/value";
import { prepare } from "../../src/prepare";
import { logGrid } from "../../src/setup/grid";

const EXAMPLES = join(__dirname, "..", "..", "examples");
const examples = readdirSync(EXAMPLES).filter((f) => f.endsWith(".json"));

function readExample(file: string): string {
  return readFileSync(join(EXAMPLES, file), "utf8");
}

/** The bytes of every number, so that −0 and +0 count as different. */
function bytes(xs: Float64Array): string {
  return Buffer.from(xs.buffer, xs.byteOffset, xs.byteLength).toString("hex");
}

/** Everything a budget holds, as text that differs when any bit does. */
function fingerprint(b: NoiseBudget): string {
  return JSON.stringify({
    frequencies: bytes(b.frequencies),
    quantity: b.quantity,
    readout: b.readout,
    total: bytes(b.total),
    terms: b.terms.map((t) => [t.id, t.label, t.owner, t.category, bytes(t.psd)]),
    references: b.references.map((r) => [r.id, r.label, bytes(r.psd)]),
    warnings: b.warnings,
  });
}

describe("budgets on several lists of frequencies at once give each list's own budget", () => {
  it.each(examples)("%s: one frequency, a 200-point grid and a 5-point list, in both orders and alone", (file) => {
    const { assembled, setup } = prepare(readExample(file));
    const range = setup.grid ?? { from: 1, to: 1e5 };
    const grid = logGrid({ from: range.from, to: range.to, points: 200 });
    const one = Float64Array.of(Math.sqrt(range.from * range.to) * 1.01);
    const five = logGrid({ from: range.from * 1.3, to: range.to / 1.3, points: 5 });
    const alone = [one, grid, five].map((list) => fingerprint(noiseBudget(assembled, list)));
    expect(noiseBudgets(assembled, [one, grid, five]).map(fingerprint)).toEqual(alone);
    expect(noiseBudgets(assembled, [five, grid, one]).map(fingerprint)).toEqual([alone[2], alone[1], alone[0]]);
    // Few frequencies in all: solved one at a time, as each list alone.
    expect(noiseBudgets(assembled, [one, five]).map(fingerprint)).toEqual([alone[0], alone[2]]);
  });

  it("refuses a list its classical noise spectrum does not cover, with noiseBudget's error for that list", () => {
    const { assembled } = prepare(readExample("test-mirror-classical-noise.json"));
    const inside = logGrid({ from: 10, to: 1e4, points: 50 });
    const beyond = logGrid({ from: 10, to: 5e4, points: 50 });
    const expected = (() => {
      try {
        noiseBudget(assembled, beyond);
      } catch (e) {
        return (e as Error).message;
      }
      return undefined;
    })();
    expect(expected).toMatch(/coil-driver/);
    expect(() => noiseBudgets(assembled, [inside, beyond])).toThrow(expected);
  });
});

describe("a figure with its noise curve is the figure's evaluation followed by the curve's", () => {
  /** What an evaluation gave: the figure and the curve's bytes, or the refusal's message. */
  type Seen = { value?: number; curve?: string; message?: string };

  /** The two evaluations one after the other, as an outcome. */
  function oneAfterTheOther(setup: string, problem: ReturnType<typeof designProblem>, curveFrequencies: Float64Array): Seen {
    const prepared = prepare(setup);
    const figureOutcome = ((): Seen => {
      try {
        return { value: figureValue(problem.plan, evaluate(prepared, problem.figureFrequencies).budget, problem.figureFrequencies) };
      } catch (e) {
        return { message: (e as Error).message };
      }
    })();
    if (figureOutcome.message !== undefined) return figureOutcome;
    try {
      return { value: figureOutcome.value, curve: bytes(evaluate(prepared, curveFrequencies).budget.total) };
    } catch (e) {
      return { message: (e as Error).message };
    }
  }

  function outcome(problem: ReturnType<typeof designProblem>, curveFrequencies: Float64Array): Seen {
    const o = problem.evaluateWithCurve({}, [], curveFrequencies);
    return o.message !== undefined ? { message: o.message } : { value: o.value, curve: o.curve && bytes(o.curve) };
  }

  it.each(examples)("%s: the margin at one frequency and a 256-point curve, and the best margin on a grid laid out twice", (file) => {
    const setup = readExample(file);
    const { setup: resolved } = prepare(setup);
    const range = resolved.grid ?? { from: 1, to: 1e5 };
    const grid = { from: range.from, to: range.to, points: 256 };
    const atOne = designProblem(setup, { kind: "margin-at", frequency: `${Math.sqrt(range.from * range.to)} Hz` }, grid);
    const curve = logGrid(grid);
    expect(outcome(atOne, curve)).toEqual(oneAfterTheOther(setup, atOne, curve));
    const best = designProblem(setup, { kind: "best-margin" }, grid);
    // The figure's frequencies and the curve's are two arrays with the same values.
    expect(best.figureFrequencies).not.toBe(curve);
    expect(outcome(best, curve)).toEqual(oneAfterTheOther(setup, best, curve));
  });

  it("a curve beyond a classical noise spectrum: the figure's value is computed, then the curve is refused with its message", () => {
    const setup = readExample("test-mirror-classical-noise.json");
    const problem = designProblem(setup, { kind: "margin-at", frequency: "1 kHz" });
    const beyond = logGrid({ from: 10, to: 5e4, points: 100 });
    const expected = oneAfterTheOther(setup, problem, beyond);
    expect(expected.message).toMatch(/coil-driver/);
    expect(outcome(problem, beyond)).toEqual(expected);
  });

  it("a figure beyond a classical noise spectrum and a curve inside it: the figure's refusal", () => {
    const setup = readExample("test-mirror-classical-noise.json");
    const problem = designProblem(setup, { kind: "noise-at", frequency: "30 kHz" }, { from: 10, to: 5e4, points: 100 });
    const inside = logGrid({ from: 10, to: 1e4, points: 100 });
    const expected = oneAfterTheOther(setup, problem, inside);
    expect(expected.message).toMatch(/coil-driver/);
    expect(outcome(problem, inside)).toEqual(expected);
  });
});
