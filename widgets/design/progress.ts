/**
 * How far a design run is, in words shared by the kernel's progress lines, the notebook's Stop
 * row and the page's run line: "optimum: 2 of 4 starts (50 %)". Platform-free.
 */
import type { DesignQuestion } from "./format";

/** What a progress line counts, by question: parameters ranked, optimizer starts, Monte Carlo samples. */
export const PROGRESS_LABELS = {
  ranking: { name: "ranking", unit: "parameters" },
  optimum: { name: "optimum", unit: "starts" },
  spread: { name: "spread", unit: "samples" },
} as const satisfies Record<DesignQuestion["kind"], ProgressWords>;

export interface ProgressWords {
  readonly name: string;
  readonly unit: string;
}

/** "optimum: 2 of 4 starts (50 %)". */
export function progressLine(words: ProgressWords, done: number, total: number): string {
  return `${words.name}: ${done} of ${total} ${words.unit} (${((100 * done) / total).toFixed(0)} %)`;
}
