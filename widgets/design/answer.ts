/** Computes a design question through the engine and returns the answer as plain JSON values. */
import {
  CellStatus,
  designParameter,
  designProblem,
  logGrid,
  optimizeSteps,
  rankSteps,
  runToEnd,
  spreadSteps,
  type DesignFigure,
  type FigureSpec,
  type OptimizeResult,
  type ProvisionalOptimum,
  type Ranking,
  type SetupDescription,
  type SpreadResult,
} from "../../src/index";
import type { DesignAnswer, DesignQuestion, FigureLabel, GridText, NoiseCurves, OptimumAnswer, PlainNumber, RankingAnswer, RankingQuestion, SpreadAnswer } from "./format";

/**
 * The one place the widget asks the engine (rankSteps, optimizeSteps, spreadSteps):
 * the kernel, `quietframe render` and the state loader all compute through `computeAnswer`, so a
 * saved question gives the same answer, bit for bit, wherever it is computed again.
 */

/** A number for JSON: NaN becomes null, infinities text (decodeNumber reverses it). */
export function plainNumber(x: number): PlainNumber {
  if (Number.isNaN(x)) return null;
  if (x === Infinity) return "Infinity";
  if (x === -Infinity) return "-Infinity";
  return x;
}

export function decodeNumber(x: PlainNumber): number {
  if (x === null) return NaN;
  if (x === "Infinity") return Infinity;
  if (x === "-Infinity") return -Infinity;
  return x;
}

function plainArray(values: ArrayLike<number>): PlainNumber[] {
  return Array.from(values, plainNumber);
}

function figureLabel(f: DesignFigure): FigureLabel {
  return { kind: f.kind, label: f.label, unit: f.unit, better: f.better };
}

/** Told after each step of a long computation: steps done of all there are (parameters of a ranking). */
export type StepReport = (done: number, total: number) => void;

/**
 * Computes the answer to a question; bad input throws a QuietframeError naming the field (`options.*`, `parameters[…]`, `figure.*`, `grid.*`, `setup`).
 * An aborted `signal` stops the run between parameters, starts or blocks of samples with a DesignRunStopped, and no answer.
 */
export function computeAnswer(setup: SetupDescription, figure: FigureSpec, question: DesignQuestion, grid?: GridText, onStep?: StepReport, signal?: AbortSignal): DesignAnswer {
  return runToEnd(answerSteps(setup, figure, question, grid, onStep, signal));
}

/**
 * computeAnswer one step at a time (a parameter of a ranking, an optimizer start, a block of
 * Monte Carlo samples): the generator yields between steps and returns the answer, so a page can
 * run it in slices (runInSlices) and stay responsive, with the same bits. An optimum tells
 * `onBestSoFar` the best of the starts so far after each start but the last.
 */
export function* answerSteps(
  setup: SetupDescription,
  figure: FigureSpec,
  question: DesignQuestion,
  grid?: GridText,
  onStep?: StepReport,
  signal?: AbortSignal,
  onBestSoFar?: (best: ProvisionalOptimum) => void,
): Generator<number, DesignAnswer> {
  switch (question.kind) {
    case "ranking":
      return rankingAnswer(yield* rankingSteps(setup, figure, question, grid, onStep, signal));
    case "optimum": {
      const options = {
        starts: question.starts,
        seed: question.seed,
        maxEvaluationsPerStart: question.maxEvaluationsPerStart,
        tolerance: question.tolerance,
        grid,
        onProgress: onStep,
        signal,
        onBestSoFar,
      };
      return optimumAnswer(setup, figure, grid, yield* optimizeSteps(setup, figure, question.parameters, options));
    }
    case "spread":
      return spreadAnswer(yield* spreadSteps(setup, figure, question.uncertain, { samples: question.samples, seed: question.seed, target: question.target, grid, onProgress: onStep, signal }));
  }
}

/** The ranking one parameter at a time (rankSteps), run to the end: exactly the rows of one rankParameters call. */
export function rankOneByOne(setup: SetupDescription, figure: FigureSpec, question: RankingQuestion, grid: GridText | undefined, onStep?: StepReport, signal?: AbortSignal): Ranking {
  return runToEnd(rankingSteps(setup, figure, question, grid, onStep, signal));
}

function rankingSteps(setup: SetupDescription, figure: FigureSpec, question: RankingQuestion, grid: GridText | undefined, onStep?: StepReport, signal?: AbortSignal): Generator<number, Ranking> {
  return rankSteps(setup, figure, { parameters: question.parameters, scanPoints: question.scanPoints, relativeStep: question.relativeStep, grid, onProgress: onStep, signal });
}

export function rankingAnswer(r: Ranking): RankingAnswer {
  return {
    kind: "ranking",
    figure: figureLabel(r.figure),
    current: plainNumber(r.current),
    rows: r.parameters.map((p) => ({
      target: p.target,
      value: p.value,
      shown: p.shown,
      gainPer1Percent: p.gainPer1Percent === null ? null : plainNumber(p.gainPer1Percent),
      gainError: p.gainPer1PercentError === null ? null : plainNumber(p.gainPer1PercentError),
      gainFor10Percent: p.gainFor10Percent === null ? null : plainNumber(p.gainFor10Percent),
      helps: p.helps,
      bound: p.bound ? `${p.bound.inclusive ? "" : "(open) "}${p.bound.shown}` : null,
      best: p.best
        ? { value: p.best.value, shown: p.best.shown, figure: plainNumber(p.best.figure), gainDb: plainNumber(p.best.gainDb), at: p.best.at, range: [p.best.range[0], p.best.range[1]] }
        : null,
      message: p.message ?? null,
    })),
    evaluations: r.evaluations,
  };
}

/** An optimization's result as the widget's answer (also what a merged sweep of starts becomes). */
export function optimumAnswer(setup: SetupDescription, figure: FigureSpec, grid: GridText | undefined, r: OptimizeResult): OptimumAnswer {
  return {
    kind: "optimum",
    figure: figureLabel(r.figure),
    status: r.status,
    current: plainNumber(r.current),
    optimum: r.optimum
      ? {
          figure: plainNumber(r.optimum.figure),
          values: r.optimum.values.map((v) => ({
            target: v.target,
            value: v.value,
            shown: v.shown,
            range: [v.range[0], v.range[1]],
            onBound: v.onBound ? `${v.onBound.end} (${v.onBound.kind})` : null,
          })),
        }
      : null,
    starts: r.starts.map((s) => ({ status: s.status, figure: plainNumber(s.figure), evaluations: s.evaluations, message: s.message ?? null })),
    curves: r.optimum ? noiseCurves(setup, figure, grid, r.optimum.values) : null,
    evaluations: r.evaluations,
    message: r.message,
  };
}

/** The total noise over the grid before (the set-up's values) and after (the optimum), through the same pipeline. */
function noiseCurves(setup: SetupDescription, figure: FigureSpec, grid: GridText | undefined, optimum: NonNullable<OptimizeResult["optimum"]>["values"]): NoiseCurves | null {
  const problem = designProblem(setup, figure, grid);
  const frequencies = logGrid(problem.grid);
  const params = optimum.map((v, i) => designParameter(problem.base, v.target, `question.parameters[${i}].target`));
  const values = Object.fromEntries(optimum.map((v) => [v.target, v.value]));
  const before = problem.evaluateWithCurve({}, [], frequencies);
  const after = problem.evaluateWithCurve(values, params, frequencies);
  if (before.status !== CellStatus.ok || after.status !== CellStatus.ok || !before.curve || !after.curve) return null;
  return { frequencies: Array.from(frequencies), before: plainArray(before.curve), after: plainArray(after.curve), unit: problem.noiseUnit };
}

/** A spread's result as the widget's answer (also what a merged sweep of samples becomes). */
export function spreadAnswer(r: SpreadResult): SpreadAnswer {
  const d = r.distribution;
  return {
    kind: "spread",
    figure: figureLabel(r.figure),
    nominal: plainNumber(r.nominal),
    samples: r.samples,
    seed: r.seed,
    uncertain: r.uncertain.map((u) => ({ target: u.target, shown: u.shown, centre: u.centre, spread: u.spread, distribution: u.distribution, truncated: u.truncated, redrawn: u.redrawn })),
    failed: { unstable: r.failed.unstable, invalid: r.failed.invalid, message: r.failed.message ?? null },
    distribution: { median: plainNumber(d.median), p5: plainNumber(d.p5), p95: plainNumber(d.p95), mean: plainNumber(d.mean), deviation: plainNumber(d.deviation) },
    probability: r.probability ? { target: r.probability.target, reached: r.probability.reached, standardError: r.probability.standardError } : null,
    linear: { mean: plainNumber(r.linear.mean), deviation: plainNumber(r.linear.deviation), holds: r.linear.holds, note: r.linear.note },
    values: plainArray(r.values),
    bands: r.bands ? { frequencies: Array.from(r.bands.frequencies), p5: plainArray(r.bands.p5), median: plainArray(r.bands.median), p95: plainArray(r.bands.p95), unit: r.bands.unit } : null,
    evaluations: r.evaluations,
  };
}
