/** The number of threads a caller asks for (tolerance maps, Monte Carlo spreads), checked. Platform-free. */
import { QuietframeError } from "../errors";

/** `workers` if it is an integer ≥ 1, `fallback` when it is absent; otherwise a QuietframeError naming options.workers. */
export function checkWorkers(workers: unknown, fallback: number): number {
  if (workers === undefined) return fallback;
  if (typeof workers !== "number" || !Number.isInteger(workers) || workers < 1) {
    throw new QuietframeError({ path: "options.workers", value: workers, problem: "is not a usable number of threads", allowed: "an integer ≥ 1" });
  }
  return workers;
}
