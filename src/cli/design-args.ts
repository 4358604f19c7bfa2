import { readFileSync } from "node:fs";
import type { DesignGrid } from "../design";
import { QuietframeError } from "../errors";
import type { FigureSpec } from "../figures/spec";
import { FALLBACK_GRID } from "../pipeline";
import type { SetupDescription } from "../setup/format";
import { loadSetup } from "../setup/load";
import { parseJsonText } from "../setup/parse-json";
import { readSpectrumFiles } from "../setup/spectrum-files";
import { gridFromOptions } from "./grid-options";

/** What the design commands (rank, solve, optimize, spread) share: the set-up file, the figure, the grid and the output format. */

export const DESIGN_USAGE = `  quietframe rank <setup.json> [--figure F] [--param T]... [--scan N] [--from F] [--to F] [--points N] [--format text|json]
      Which parameter to improve first: for each numeric parameter (or each --param), the figure's
      gain in dB per 1 % (from the derivative, ± its error) and for 10 % (computed), which way
      helps, the bound on that side and the best the parameter reaches alone.
  quietframe solve <setup.json> --param T --target X [--window] [--range MIN:MAX] [--figure F] [--format text|json]
      The value of T at which the figure reaches X (the crossing nearest the current value), or
      the best it reaches when no value does; --window: the interval around the current value
      in which the figure stays at X or better.
  quietframe optimize <setup.json> --param T[=MIN:MAX]... [--figure F] [--starts N] [--seed S] [--format text|json]
      The best figure over the given parameters within their ranges (default: their bounds, or
      a factor 1000 where they have none), from the current values and seeded random starts.
  quietframe spread <setup.json> --uncertain "T=95 % ± 2 %"... [--samples N] [--seed S] [--target X] [--figure F] [--threads N] [--format text|json]
      Monte Carlo of the figure under uncertain parameters ("value ± spread", or "± spread" around
      the set-up's value; "normal", the default: spread = standard deviation; "uniform": half-width;
      draws beyond a parameter's bounds are redrawn) beside first-order propagation, with
      percentile bands of the noise; --threads N: samples on N worker threads (same result).
    Figures F: best-margin (default), "margin-at=1.16 MHz", "margin-band=1.1 MHz:1.2 MHz",
      "noise-at=1 kHz" (total noise PSD, lower is better), range-gain[=volume|range] (strain).
    Targets X: a margin or a gain in dB ("3 dB"), a noise in the budget's PSD unit (1e-36).
`;

export const DESIGN_OPTIONS = {
  figure: { type: "string" },
  from: { type: "string" },
  to: { type: "string" },
  points: { type: "string" },
  format: { type: "string", default: "text" },
} as const;

/** The set-up description from a file, with JSON errors that name the file. */
export function readSetupDescription(positionals: readonly string[]): { description: SetupDescription; path: string } {
  const [path, ...extra] = positionals;
  if (!path) throw new QuietframeError({ path: "<setup.json>", problem: "no set-up file given", allowed: "a path to a set-up JSON file" });
  if (extra.length) throw new QuietframeError({ path: "<setup.json>", value: positionals, problem: "only one set-up file at a time", allowed: "one path" });
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new QuietframeError({ path, problem: `cannot be read (${(e as NodeJS.ErrnoException).code ?? "error"})`, allowed: "a readable file" });
  }
  const description = readSpectrumFiles(parseJsonText(text, path), path) as SetupDescription;
  // Validate once here so that a set-up's own problems are reported before any option's.
  loadSetup(description);
  return { description, path };
}

/** --figure as a figure spec; default best-margin. */
export function figureOption(text: string | undefined): FigureSpec {
  if (text === undefined) return { kind: "best-margin" };
  const eq = text.indexOf("=");
  const kind = (eq < 0 ? text : text.slice(0, eq)).trim();
  const arg = eq < 0 ? undefined : text.slice(eq + 1).trim();
  const allowed = 'best-margin, "margin-at=1.16 MHz", "margin-band=1.1 MHz:1.2 MHz", "noise-at=1 kHz", range-gain[=volume|range]';
  const need = (what: string): string => {
    if (!arg) throw new QuietframeError({ path: "--figure", value: text, problem: `${kind} needs ${what}`, allowed });
    return arg;
  };
  switch (kind) {
    case "best-margin":
      if (arg !== undefined) throw new QuietframeError({ path: "--figure", value: text, problem: "best-margin takes no value", allowed });
      return { kind };
    case "margin-at":
    case "noise-at":
      return { kind, frequency: need('a frequency, e.g. "1 kHz"') };
    case "margin-band": {
      const parts = need('a band "FROM:TO"').split(":");
      if (parts.length !== 2) throw new QuietframeError({ path: "--figure", value: text, problem: "a band is two frequencies FROM:TO", allowed });
      return { kind, from: parts[0].trim(), to: parts[1].trim() };
    }
    case "range-gain":
      if (arg !== undefined && arg !== "volume" && arg !== "range")
        throw new QuietframeError({ path: "--figure", value: text, problem: "is not a measure of reach", allowed: "range-gain, range-gain=volume or range-gain=range" });
      return arg === undefined ? { kind } : { kind, measure: arg };
    default:
      throw new QuietframeError({ path: "--figure", value: text, problem: "is not a figure of merit", allowed });
  }
}

/** The grid from --from/--to/--points over the set-up's own (undefined: the set-up's). */
export function gridOption(description: SetupDescription, values: { from?: string; to?: string; points?: string }): DesignGrid | undefined {
  if (values.from === undefined && values.to === undefined && values.points === undefined) return undefined;
  return gridFromOptions(loadSetup(description).grid ?? FALLBACK_GRID, values);
}

export function formatOption(format: string | undefined): "text" | "json" {
  if (format !== "text" && format !== "json") throw new QuietframeError({ path: "--format", value: format, problem: "is not an output format", allowed: "text or json" });
  return format;
}

/** A whole-number option (--samples 500); undefined when not given. */
export function wholeOption(text: string | undefined, path: string): number | undefined {
  if (text === undefined) return undefined;
  if (!/^\d+$/.test(text.trim())) throw new QuietframeError({ path, value: text, problem: "is not a whole number", allowed: "digits, e.g. 500" });
  return Number(text);
}

/** A count the user typed (threads, tasks at once): an integer ≥ 1; `what` says what it counts in the error. */
export function countOption(text: string, path: string, what: string): number {
  if (!/^\d+$/.test(text) || Number(text) < 1) throw new QuietframeError({ path, value: text, problem: `is not a usable number of ${what}`, allowed: "an integer ≥ 1" });
  return Number(text);
}

/** "NAME=REST" split at the first "=" (REST undefined when there is none). */
export function splitAssignment(text: string): [string, string | undefined] {
  const eq = text.indexOf("=");
  return eq < 0 ? [text.trim(), undefined] : [text.slice(0, eq).trim(), text.slice(eq + 1).trim()];
}

/** "MIN:MAX" into its two ends; `path` names the option. */
export function rangeOption(text: string, path: string): { min: string; max: string } {
  const parts = text.split(":");
  if (parts.length !== 2 || parts[0].trim() === "" || parts[1].trim() === "") {
    throw new QuietframeError({ path, value: text, problem: "is not a range MIN:MAX", allowed: 'two values with units, e.g. "50 %:100 %" or "1 mW:10 W"' });
  }
  return { min: parts[0].trim(), max: parts[1].trim() };
}

/**
 * Runs a design search with the API's field names turned into the options a user typed
 * ("parameter" → "--param", "range.min" → "--range", "parameters[1].max" → "--param[1]").
 */
/** withOptionNames around each step of a stepped run (optimizeSteps, spreadSteps): their checks run in the first step. */
export function* stepsWithOptionNames<T>(names: Readonly<Record<string, string>>, steps: Generator<unknown, T>): Generator<unknown, T> {
  for (;;) {
    const step = withOptionNames(names, () => steps.next());
    if (step.done) return step.value;
    yield step.value;
  }
}

export function withOptionNames<T>(names: Readonly<Record<string, string>>, run: () => T): T {
  try {
    return run();
  } catch (e) {
    if (!(e instanceof QuietframeError)) throw e;
    for (const [field, option] of Object.entries(names)) {
      if (e.path === field || e.path.startsWith(`${field}.`) || e.path.startsWith(`${field}[`)) {
        const rest = e.path
          .slice(field.length)
          .replace(/^\[(\d+)\]\.?.*$/, "[$1]")
          .replace(/^\..*$/, "");
        throw new QuietframeError({ path: `${option}${rest}`, value: e.value, problem: e.problem, allowed: e.allowed });
      }
    }
    throw e;
  }
}
