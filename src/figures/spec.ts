import { spectralDensityUnit } from "../engine/tabulate";
import { QuietframeError, QuietframeErrors } from "../errors";
import { log } from "../numeric/portable-math";
import { evaluate, prepare } from "../pipeline";
import { inspiralRange, strainCurve, type InspiralDistance, type InspiralOptions } from "../reach";
import { assemble } from "../setup/assemble";
import type { SetupDescription } from "../setup/format";
import { logGrid, type FrequencyGridSpec } from "../setup/grid";
import type { ResolvedSetup } from "../setup/validate";
import { formatQuantity, parseQuantity } from "../units";

/**
 * Figures of merit as a user writes them (values with units) and their resolution against a
 * set-up and a frequency grid into a plan: plain data that tolerance-map workers and design
 * searches evaluate identically (figureValue in value.ts).
 */

/** Margin in dB of power, 10·log10(SQL/total), at `frequency` (a map: at the grid point nearest it in log f). */
export interface MarginAtSpec {
  kind: "margin-at";
  frequency: string | number;
}

/**
 * Band margin in dB: 10·log10(Σ SQL_i / Σ total_i) over the grid points i with from ≤ f_i ≤ to,
 * i.e. the ratio of the band-averaged SQL PSD to the band-averaged total PSD, each grid point
 * weighing the same (on the log-spaced grid: an average over log-frequency).
 */
export interface MarginBandSpec {
  kind: "margin-band";
  from: string | number;
  to: string | number;
}

/** The largest margin below the SQL anywhere on the grid, in dB (the headline figure). */
export interface BestMarginSpec {
  kind: "best-margin";
}

/**
 * Astrophysical reach against a reference, for budgets referred to strain: the binary-inspiral
 * range of each cell over the range of the reference on the same grid, cubed for the surveyed
 * volume ("volume", the default) or as it is ("range").
 */
export interface RangeGainSpec {
  kind: "range-gain";
  /** "unmodified" (the default): the set-up as given; or another set-up to compare against. */
  reference?: "unmodified" | SetupDescription;
  /** "volume": (range/reference range)³, the default; "range": range/reference range. */
  measure?: "volume" | "range";
  /** Component masses of the binary in solar masses (default 1.4 each, > 0). */
  m1?: number;
  m2?: number;
  /** Lower end of the inspiral integral (default: the grid's first frequency). */
  fMin?: string | number;
}

/** The total signal-referred noise (one-sided PSD in the budget's unit, e.g. m²/Hz) at `frequency`; lower is better. */
export interface NoiseAtSpec {
  kind: "noise-at";
  frequency: string | number;
}

export type ToleranceFigureSpec = MarginAtSpec | MarginBandSpec | BestMarginSpec | RangeGainSpec;
export type FigureSpec = ToleranceFigureSpec | NoiseAtSpec;

/** The figures a tolerance map offers. */
export const FIGURE_KINDS = ["margin-at", "margin-band", "best-margin", "range-gain"] as const;
export type FigureKind = (typeof FIGURE_KINDS)[number];
/** Every figure of merit (design searches offer them all). */
export const ALL_FIGURE_KINDS = [...FIGURE_KINDS, "noise-at"] as const;
export type AnyFigureKind = (typeof ALL_FIGURE_KINDS)[number];

/** How a budget becomes one number (indices refer to the figure's frequencies). */
export type FigurePlan =
  | { readonly kind: "margin-at"; readonly index: number }
  | { readonly kind: "margin-band"; readonly first: number; readonly last: number }
  | { readonly kind: "best-margin" }
  | {
      readonly kind: "range-gain";
      readonly measure: "volume" | "range";
      readonly inspiral: InspiralOptions;
      /** Range of the reference on the grid, in metres. */
      readonly referenceMetres: number;
    }
  | { readonly kind: "noise-at"; readonly index: number };

/** What the figure is, for display. */
export interface FigureInfo {
  readonly kind: AnyFigureKind;
  /** "dB" for margins; "" (a plain ratio) for range-gain; the PSD unit (e.g. "m²/Hz") for noise-at. */
  readonly unit: string;
  readonly label: string;
  /** margin-at, noise-at: the frequency (Hz) actually used. */
  readonly frequency?: number;
  /** margin-band: first and last grid frequency (Hz) in the band, and how many grid points it has. */
  readonly band?: readonly [number, number];
  readonly bandPoints?: number;
  /** range-gain: the reference's range in Mpc. */
  readonly referenceRangeMpc?: number;
}

export interface FigureResolveOptions {
  /** The figure kinds this caller offers. */
  readonly kinds: readonly AnyFigureKind[];
  /**
   * Figures at one frequency: "nearest-grid-point" (a map cell; the frequency must lie on the
   * grid) or "exact" (evaluated at the frequency itself, anywhere above 0 Hz).
   */
  readonly atFrequency: "nearest-grid-point" | "exact";
}

export interface ResolvedFigure {
  readonly plan: FigurePlan;
  readonly info: FigureInfo;
  /** The frequencies (Hz) a budget is evaluated on for this figure: the grid, or the one exact frequency. */
  readonly frequencies: Float64Array;
}

/**
 * Checks a figure spec against a set-up (`setup` as given, `base` its validation) and a grid.
 * Every problem is a QuietframeError naming the field (`figure.*`).
 */
export function resolveFigure(setup: SetupDescription, base: ResolvedSetup, raw: FigureSpec, grid: FrequencyGridSpec, options: FigureResolveOptions): ResolvedFigure {
  const fig = expectObject(raw, "figure", undefined) as { kind?: unknown };
  const kinds = options.kinds.join(", ");
  if (!options.kinds.includes(fig.kind as AnyFigureKind)) {
    throw new QuietframeError({ path: "figure.kind", value: fig.kind, problem: "is not a figure of merit", allowed: kinds });
  }
  const kind = fig.kind as AnyFigureKind;
  const freqs = logGrid(grid);
  const assembled = assemble(base);
  const gridText = `${formatQuantity(grid.from, "frequency")} … ${formatQuantity(grid.to, "frequency")} (the grid)`;
  if (kind !== "range-gain" && kind !== "noise-at" && !assembled.signal.curves.some((c) => c.id === "sql")) {
    throw new QuietframeError({
      path: "figure.kind",
      value: kind,
      problem: "needs an SQL reference, and this set-up's signal has none",
      allowed: options.kinds.includes("noise-at") ? "noise-at, or range-gain for strain budgets" : "range-gain for strain budgets",
    });
  }
  switch (kind) {
    case "margin-at":
    case "noise-at": {
      const f = expectObject(raw, "figure", ["kind", "frequency"]) as unknown as MarginAtSpec | NoiseAtSpec;
      const at = parseQuantity(f.frequency, "frequency", "figure.frequency");
      const what = (fq: number): string => (kind === "margin-at" ? `margin below the SQL at ${formatQuantity(fq, "frequency", 6)}` : `total noise at ${formatQuantity(fq, "frequency", 6)}`);
      const unit = kind === "margin-at" ? "dB" : spectralDensityUnit(assembled.referredTo.unit, "power");
      if (options.atFrequency === "exact") {
        if (!(at > 0)) throw new QuietframeError({ path: "figure.frequency", value: f.frequency, problem: "must be above 0 Hz", allowed: 'a frequency such as "1.16 MHz"' });
        return { plan: { kind, index: 0 }, info: { kind, unit, label: what(at), frequency: at }, frequencies: Float64Array.of(at) };
      }
      if (!(at >= grid.from && at <= grid.to)) {
        throw new QuietframeError({ path: "figure.frequency", value: f.frequency, problem: "is outside the frequency grid", allowed: gridText });
      }
      const index = nearestInLog(freqs, at);
      return { plan: { kind, index }, info: { kind, unit, label: what(freqs[index]), frequency: freqs[index] }, frequencies: freqs };
    }
    case "margin-band": {
      const f = expectObject(raw, "figure", ["kind", "from", "to"]) as unknown as MarginBandSpec;
      const from = parseQuantity(f.from, "frequency", "figure.from");
      const to = parseQuantity(f.to, "frequency", "figure.to");
      if (!(from >= grid.from && from < grid.to)) {
        throw new QuietframeError({ path: "figure.from", value: f.from, problem: "is outside the frequency grid", allowed: gridText });
      }
      if (!(to > from && to <= grid.to)) {
        throw new QuietframeError({
          path: "figure.to",
          value: f.to,
          problem: "must be above figure.from and inside the grid",
          allowed: `${formatQuantity(from, "frequency")} < to ≤ ${formatQuantity(grid.to, "frequency")}`,
        });
      }
      let first = -1;
      let last = -1;
      for (let i = 0; i < freqs.length; i++) {
        if (freqs[i] >= from && freqs[i] <= to) {
          if (first < 0) first = i;
          last = i;
        }
      }
      if (first < 0) {
        throw new QuietframeError({ path: "figure.to", value: f.to, problem: "the band holds no grid point", allowed: "a wider band or a denser grid" });
      }
      const band: [number, number] = [freqs[first], freqs[last]];
      return {
        plan: { kind, first, last },
        info: {
          kind,
          unit: "dB",
          label: `band margin below the SQL, ${formatQuantity(band[0], "frequency", 6)} … ${formatQuantity(band[1], "frequency", 6)}`,
          band,
          bandPoints: last - first + 1,
        },
        frequencies: freqs,
      };
    }
    case "best-margin":
      expectObject(raw, "figure", ["kind"]);
      return { plan: { kind }, info: { kind, unit: "dB", label: "largest margin below the SQL on the grid" }, frequencies: freqs };
    case "range-gain":
      return { ...rangeGain(setup, raw as RangeGainSpec, grid, assembled.referredTo.name), frequencies: freqs };
  }
}

function rangeGain(setup: SetupDescription, raw: RangeGainSpec, grid: FrequencyGridSpec, quantity: string): { plan: FigurePlan; info: FigureInfo } {
  const f = expectObject(raw, "figure", ["kind", "reference", "measure", "m1", "m2", "fMin"]) as unknown as RangeGainSpec;
  if (quantity !== "strain") {
    throw new QuietframeError({
      path: "figure.kind",
      value: "range-gain",
      problem: `needs a budget referred to strain; this set-up's noise is referred to ${quantity}`,
      allowed: "margin-at, margin-band or best-margin for this set-up",
    });
  }
  const measure = f.measure ?? "volume";
  if (measure !== "volume" && measure !== "range") {
    throw new QuietframeError({ path: "figure.measure", value: f.measure, problem: "is not a measure of reach", allowed: "volume or range" });
  }
  const mass = (v: unknown, path: string): number | undefined => {
    if (v === undefined) return undefined;
    if (typeof v !== "number" || !Number.isFinite(v) || !(v > 0)) {
      throw new QuietframeError({ path, value: v, problem: "must be a finite number above 0", allowed: "a mass in solar masses, e.g. 1.4" });
    }
    return v;
  };
  const inspiral: { m1?: number; m2?: number; fMin?: number } = {};
  const m1 = mass(f.m1, "figure.m1");
  const m2 = mass(f.m2, "figure.m2");
  if (m1 !== undefined) inspiral.m1 = m1;
  if (m2 !== undefined) inspiral.m2 = m2;
  if (f.fMin !== undefined) {
    inspiral.fMin = parseQuantity(f.fMin, "frequency", "figure.fMin");
    if (!(inspiral.fMin > 0)) throw new QuietframeError({ path: "figure.fMin", value: f.fMin, problem: "must be above 0 Hz", allowed: 'a frequency such as "10 Hz"' });
  }
  const reference = f.reference ?? "unmodified";
  if (typeof reference === "string" && reference !== "unmodified") {
    throw new QuietframeError({ path: "figure.reference", value: reference, problem: "is not a reference", allowed: '"unmodified" (the set-up as given) or a set-up description' });
  }
  const shown = typeof reference === "string" ? reference : "(set-up)";
  let range: InspiralDistance;
  try {
    const budget = evaluate(prepare(typeof reference === "string" ? setup : reference), grid).budget;
    const curve = strainCurve(budget);
    range = inspiralRange(curve.frequencies, curve.strainPsd, inspiral);
  } catch (e) {
    if (e instanceof QuietframeError && e.path.startsWith("options.")) {
      throw new QuietframeError({ path: `figure.${e.path.slice("options.".length)}`, value: e.value, problem: e.problem, allowed: e.allowed });
    }
    if (e instanceof QuietframeError && e.path === "frequencies") {
      throw new QuietframeError({ path: "grid", value: e.value, problem: e.problem, allowed: e.allowed });
    }
    if (e instanceof QuietframeError || e instanceof QuietframeErrors) {
      throw new QuietframeError({ path: "figure.reference", value: shown, problem: `cannot be evaluated on the map's grid: ${e.message}`, allowed: "a stable set-up referred to strain" });
    }
    throw e;
  }
  const referenceMetres = range.metres;
  if (!(referenceMetres > 0 && Number.isFinite(referenceMetres))) {
    throw new QuietframeError({ path: "figure.reference", value: shown, problem: "has no finite reach above zero on the map's grid", allowed: "a reference that sees inspirals on this grid" });
  }
  return {
    plan: { kind: "range-gain", measure, inspiral, referenceMetres },
    info: {
      kind: "range-gain",
      unit: "",
      label: measure === "volume" ? "surveyed volume over the reference's, (range/reference range)³" : "inspiral range over the reference's",
      referenceRangeMpc: range.megaparsecs,
    },
  };
}

/** Index of the grid point nearest `at` in log-frequency (the lower one on a tie). */
function nearestInLog(freqs: Float64Array, at: number): number {
  const target = log(at);
  let best = 0;
  let bestDistance = Infinity;
  for (let i = 0; i < freqs.length; i++) {
    const d = Math.abs(log(freqs[i]) - target);
    if (d < bestDistance) {
      bestDistance = d;
      best = i;
    }
  }
  return best;
}

/** An object with only the given keys (any keys when `keys` is undefined); `path` names it in messages. */
export function expectObject(value: unknown, path: string, keys: readonly string[] | undefined): Record<string, unknown> {
  if (typeof value !== "object" || value === null || Array.isArray(value)) {
    throw new QuietframeError({ path, value, problem: "must be an object", allowed: keys ? `an object with ${keys.join(", ")}` : "an object" });
  }
  if (keys) {
    for (const key of Object.keys(value)) {
      if (!keys.includes(key)) {
        throw new QuietframeError({ path: `${path === "spec" ? "" : `${path}.`}${key}`, problem: "is not a field here", allowed: keys.join(", ") });
      }
    }
  }
  return value as Record<string, unknown>;
}
