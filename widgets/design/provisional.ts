/**
 * The best optimum so far while an optimization goes on: after each finished start the engine
 * hands over the best of the starts run so far; this keeps the newest one and turns it into an
 * answer to draw ("best of 2 of 4 starts", provisional: the final answer replaces it). Only the
 * newest is drawn, so a page that falls behind skips to it. Platform-free.
 */
import type { FigureSpec, ProvisionalOptimum, SetupDescription } from "../../src/index";
import { optimumAnswer } from "./answer";
import type { GridText, OptimumAnswer } from "./format";

/** "best of 2 of 4 starts (provisional)". */
export function provisionalLabel(done: number, total: number): string {
  return `best of ${done} of ${total} starts (provisional)`;
}

/** A best-so-far answer with the label that marks it provisional. */
export interface ProvisionalAnswer {
  readonly answer: OptimumAnswer;
  readonly label: string;
}

/** Collects the engine's best-so-far reports (`report`) and gives the newest once as an answer (`next`). */
export class NewestBest {
  #pending: ProvisionalOptimum | undefined;

  constructor(
    private readonly setup: SetupDescription,
    private readonly figure: FigureSpec,
    private readonly grid: GridText | undefined,
  ) {}

  /** The hook for answerSteps / optimizeSteps (onBestSoFar). */
  readonly report = (best: ProvisionalOptimum): void => {
    this.#pending = best;
  };

  /** Whether a best so far came since the last `next()`. */
  get waiting(): boolean {
    return this.#pending !== undefined;
  }

  /** The newest best so far as an answer (its curves computed now), or undefined when none came since the last call. */
  next(): ProvisionalAnswer | undefined {
    const best = this.#pending;
    if (!best) return undefined;
    this.#pending = undefined;
    return { answer: optimumAnswer(this.setup, this.figure, this.grid, best.result), label: provisionalLabel(best.done, best.total) };
  }
}
