/**
 * The one error class users see. Every problem with their input is reported with the
 * path of the offending field (e.g. `components[2].mass`), the value as they wrote it,
 * and what would have been accepted, so that a message can be acted on without reading code.
 */
import { didYouMean } from "./nearest-name";

export interface ProblemDetails {
  /** Dotted path of the field, e.g. `components.membrane.mass` or `grid.from`. */
  path: string;
  /** The offending value as the user wrote it (string with unit, number, ...). */
  value?: unknown;
  /** One sentence on what is wrong. */
  problem: string;
  /** What would have been accepted, e.g. "a mass such as \"40 kg\"" or "0 ≤ efficiency ≤ 1". */
  allowed?: string;
  /**
   * The names a refused name was checked against (component types, components, ports, …): the
   * nearest one, when close enough to be a typo of `value`, is added to the problem.
   */
  choices?: readonly string[];
}

export class QuietframeError extends Error {
  readonly path: string;
  readonly value: unknown;
  readonly problem: string;
  readonly allowed: string | undefined;

  constructor(details: ProblemDetails) {
    const problem = typeof details.value === "string" && details.choices ? `${details.problem}${didYouMean(details.value, details.choices)}` : details.problem;
    super(formatProblem({ ...details, problem }));
    this.name = "QuietframeError";
    this.path = details.path;
    this.value = details.value;
    this.problem = problem;
    this.allowed = details.allowed;
  }
}

/** Several problems found in one pass (validation reports all it can, not just the first). */
export class QuietframeErrors extends Error {
  readonly problems: QuietframeError[];
  constructor(problems: QuietframeError[]) {
    super(problems.map((p) => p.message).join("\n"));
    this.name = "QuietframeErrors";
    this.problems = problems;
  }
}

export function formatProblem(d: ProblemDetails): string {
  const shown = d.value === undefined ? "" : ` = ${showValue(d.value)}`;
  const allowed = d.allowed ? `; allowed: ${d.allowed}` : "";
  return `${d.path}${shown}: ${d.problem}${allowed}`;
}

/** Short, single-line rendering of a user value for messages. */
export function showValue(v: unknown): string {
  if (typeof v === "string") return JSON.stringify(v.length > 80 ? v.slice(0, 77) + "..." : v);
  if (typeof v === "number") return String(v);
  try {
    const s = JSON.stringify(v);
    if (s === undefined) return String(v);
    return s.length > 80 ? s.slice(0, 77) + "..." : s;
  } catch {
    return String(v);
  }
}
