import { componentKind } from "../components/registry";
import type { QuantityParam } from "../components/types";
import { logGrid, parseGrid, type FrequencyGridSpec } from "../setup/grid";
import { QuietframeError, QuietframeErrors } from "../errors";
import { assemble } from "../setup/assemble";
import { log, pow } from "../numeric/portable-math";
import { evaluate, FALLBACK_GRID, loadSetup, prepare } from "../pipeline";
import { inspiralRange, strainCurve, type InspiralDistance, type InspiralOptions } from "../reach";
import type { SetupDescription } from "../setup/format";
import type { ResolvedSetup } from "../setup/validate";
import { formatQuantity, parseQuantity, type QuantityKind } from "../units";

/**
 * What a tolerance map scans and what it measures, as a user writes it (values with units),
 * and its resolution into a plan: plain data (strings and numbers only) that every worker
 * evaluates identically.
 */

/** Most cells a map may have (x.points × y.points). */
export const MAX_TOLERANCE_CELLS = 1_000_000;

/**
 * Significant digits of the values written into each cell's set-up: the same as the
 * explorer writes a control's value, so a cell is exactly what a slider at that position gives.
 */
export const WRITTEN_DIGITS = 6;

export type AxisScale = "linear" | "log";

/** One axis of a map: a parameter of the set-up and the values it takes. */
export interface ToleranceAxisSpec {
  /** "component.parameter", a parameter with a value on a scale (not a choice), e.g. "squeezer.squeezing". */
  target: string;
  /** First value, written as in a set-up ("-15 dB", "50 %", "1.1 MHz"; a bare number for counts). */
  from: string | number;
  /** Last value, above `from`. */
  to: string | number;
  /** Number of values, an integer ≥ 2 (both ends included). */
  points: number;
  /**
   * Spacing of the values: "linear", or "log" (equal ratios; needs from > 0). Default as for
   * a slider: log when from > 0 and to/from ≥ 10, otherwise linear.
   */
  scale?: AxisScale;
}

/** Margin in dB of power, 10·log10(SQL/total), at the grid point nearest `frequency` (nearest in log f). */
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
  /** "unmodified" (the default): the map's own set-up as given; or another set-up to compare against. */
  reference?: "unmodified" | SetupDescription;
  /** "volume": (range/reference range)³, the default; "range": range/reference range. */
  measure?: "volume" | "range";
  /** Component masses of the binary in solar masses (default 1.4 each, > 0). */
  m1?: number;
  m2?: number;
  /** Lower end of the inspiral integral (default: the grid's first frequency). */
  fMin?: string | number;
}

export type ToleranceFigureSpec = MarginAtSpec | MarginBandSpec | BestMarginSpec | RangeGainSpec;

export const FIGURE_KINDS = ["margin-at", "margin-band", "best-margin", "range-gain"] as const;
export type FigureKind = (typeof FIGURE_KINDS)[number];

export interface ToleranceMapSpec {
  /** Columns of the map. */
  x: ToleranceAxisSpec;
  /** Rows of the map. */
  y: ToleranceAxisSpec;
  /** Frequency grid of every cell's budget ({from, to, points}, log-spaced); default the set-up's grid. */
  grid?: { from: string | number; to: string | number; points?: number };
  figure: ToleranceFigureSpec;
}

/** An axis resolved against the set-up. */
export interface ResolvedAxis {
  readonly target: string;
  readonly component: string;
  readonly param: string;
  readonly kind: QuantityKind;
  readonly scale: AxisScale;
  /** The values as written into each cell's set-up. */
  readonly written: readonly string[];
  /** The SI values those strings parse to: exactly what each cell computes with. */
  readonly values: readonly number[];
  /** Unit of the written values at the axis end (e.g. "dB", "%", "MHz"). */
  readonly unit: string;
}

/** How a cell's budget becomes one number (indices refer to the map's frequency grid). */
export type FigurePlan =
  | { readonly kind: "margin-at"; readonly index: number }
  | { readonly kind: "margin-band"; readonly first: number; readonly last: number }
  | { readonly kind: "best-margin" }
  | {
      readonly kind: "range-gain";
      readonly measure: "volume" | "range";
      readonly inspiral: InspiralOptions;
      /** Range of the reference on the map's grid, in metres. */
      readonly referenceMetres: number;
    };

/** What the figure is, for display. */
export interface FigureInfo {
  readonly kind: FigureKind;
  /** "dB" for margins; "" (a plain ratio) for range-gain. */
  readonly unit: string;
  readonly label: string;
  /** margin-at: the grid frequency (Hz) actually used. */
  readonly frequency?: number;
  /** margin-band: first and last grid frequency (Hz) in the band, and how many grid points it has. */
  readonly band?: readonly [number, number];
  readonly bandPoints?: number;
  /** range-gain: the reference's range in Mpc. */
  readonly referenceRangeMpc?: number;
}

/** Everything a worker needs, as plain data. */
export interface TolerancePlan {
  readonly setup: SetupDescription;
  readonly x: ResolvedAxis;
  readonly y: ResolvedAxis;
  readonly grid: FrequencyGridSpec;
  readonly figure: FigurePlan;
}

export interface ResolvedToleranceSpec {
  readonly plan: TolerancePlan;
  readonly figure: FigureInfo;
}

/** Checks a spec against a set-up and resolves it; every problem is a QuietframeError naming the field. */
export function resolveToleranceSpec(setup: SetupDescription, spec: ToleranceMapSpec): ResolvedToleranceSpec {
  const base = loadSetup(setup);
  const s = expectObject(spec, "spec", ["x", "y", "grid", "figure"]) as unknown as ToleranceMapSpec;
  const xAxis = expectObject(s.x, "x", AXIS_KEYS) as unknown as ToleranceAxisSpec;
  const yAxis = expectObject(s.y, "y", AXIS_KEYS) as unknown as ToleranceAxisSpec;
  const x = resolveTarget(setup, xAxis, "x");
  const y = resolveTarget(setup, yAxis, "y");
  if (x.target === y.target) {
    throw new QuietframeError({ path: "y.target", value: yAxis.target, problem: "is the same parameter as x.target", allowed: "two different parameters" });
  }
  const nx = checkPoints(xAxis.points, "x.points");
  const ny = checkPoints(yAxis.points, "y.points");
  if (nx * ny > MAX_TOLERANCE_CELLS) {
    throw new QuietframeError({
      path: "y.points",
      value: yAxis.points,
      problem: `x.points × y.points = ${nx} × ${ny} = ${nx * ny} cells is above the limit`,
      allowed: `at most ${MAX_TOLERANCE_CELLS} cells in all`,
    });
  }
  const plan0 = {
    setup: structuredClone(setup),
    x: axisValues(x, xAxis, nx, "x"),
    y: axisValues(y, yAxis, ny, "y"),
    grid: s.grid === undefined ? (base.grid ?? FALLBACK_GRID) : parseGrid(s.grid, "grid"),
  };
  const { figure, info } = resolveFigure(setup, base, s.figure, plan0.grid);
  return { plan: { ...plan0, figure }, figure: info };
}

const AXIS_KEYS = ["target", "from", "to", "points", "scale"];

interface Target {
  readonly target: string;
  readonly component: string;
  readonly param: string;
  readonly spec: QuantityParam;
}

function resolveTarget(setup: SetupDescription, axis: ToleranceAxisSpec, path: string): Target {
  const target = axis.target;
  const quantities = setup.components.flatMap((c) =>
    (componentKind(c.type)?.params ?? []).filter((p) => p.kind !== "choice").map((p) => `${c.name}.${p.name}`),
  );
  if (typeof target !== "string") {
    throw new QuietframeError({ path: `${path}.target`, value: target, problem: "must name a parameter", allowed: '"component.parameter", e.g. "membrane.temperature"' });
  }
  const dot = target.indexOf(".");
  const componentName = dot > 0 ? target.slice(0, dot) : "";
  const paramName = dot > 0 ? target.slice(dot + 1) : "";
  const component = setup.components.find((c) => c.name === componentName);
  const param = component ? componentKind(component.type)?.params.find((p) => p.name === paramName) : undefined;
  if (!param) {
    throw new QuietframeError({ path: `${path}.target`, value: target, problem: "is not a parameter of this set-up", allowed: quantities.join(", ") });
  }
  if (param.kind === "choice") {
    throw new QuietframeError({
      path: `${path}.target`,
      value: target,
      problem: `is a choice (${param.choices.join(", ")}), not a value on a scale`,
      allowed: quantities.join(", "),
    });
  }
  return { target, component: componentName, param: paramName, spec: param };
}

function checkPoints(points: unknown, path: string): number {
  if (typeof points !== "number" || !Number.isInteger(points) || points < 2 || points > MAX_TOLERANCE_CELLS) {
    throw new QuietframeError({ path, value: points, problem: "is not a usable number of points", allowed: `an integer from 2 to ${MAX_TOLERANCE_CELLS}` });
  }
  return points;
}

/** The axis values: the positions of a slider with points − 1 steps over [from, to], written with the explorer's precision. */
function axisValues(t: Target, axis: ToleranceAxisSpec, n: number, path: string): ResolvedAxis {
  const kind = t.spec.kind as QuantityKind;
  if (axis.from === undefined) {
    throw new QuietframeError({ path: `${path}.from`, problem: "is missing", allowed: `a value with its unit, e.g. "${formatQuantity(1, kind)}"` });
  }
  if (axis.to === undefined) {
    throw new QuietframeError({ path: `${path}.to`, problem: "is missing", allowed: `a value with its unit, e.g. "${formatQuantity(1, kind)}"` });
  }
  const from = parseQuantity(axis.from, kind, `${path}.from`);
  const to = parseQuantity(axis.to, kind, `${path}.to`);
  if (!(to > from)) {
    throw new QuietframeError({ path: `${path}.to`, value: axis.to, problem: `must be above from (${formatQuantity(from, kind)})`, allowed: `to > ${formatQuantity(from, kind)}` });
  }
  const scale: AxisScale = axis.scale ?? (from > 0 && to / from >= 10 ? "log" : "linear");
  if (scale !== "linear" && scale !== "log") {
    throw new QuietframeError({ path: `${path}.scale`, value: axis.scale, problem: "is not an axis scale", allowed: "linear or log" });
  }
  if (scale === "log" && !(from > 0)) {
    throw new QuietframeError({
      path: `${path}.from`,
      value: axis.from,
      problem: "a log axis cannot start at or below zero",
      allowed: `from > 0 with scale "log", or scale "linear"`,
    });
  }
  const written: string[] = [];
  const values: number[] = [];
  const steps = n - 1;
  for (let k = 0; k <= steps; k++) {
    // Same arithmetic as a slider position k of `steps` (ends exact).
    const u = k / steps;
    const si = k === 0 ? from : k === steps ? to : scale === "log" ? from * pow(to / from, u) : from + (to - from) * u;
    const text = formatQuantity(si, kind, WRITTEN_DIGITS);
    const value = parseQuantity(text, kind, `${path}.values[${k}]`);
    if (k > 0 && !(value > values[k - 1])) {
      throw new QuietframeError({
        path: `${path}.points`,
        value: n,
        problem: `neighbouring values are written the same at ${WRITTEN_DIGITS} significant digits (${JSON.stringify(written[k - 1])}, ${JSON.stringify(text)})`,
        allowed: "fewer points or a wider range",
      });
    }
    written.push(text);
    values.push(value);
  }
  const unit = written[steps].replace(/^[-+0-9.e]+\s*/, "");
  return { target: t.target, component: t.component, param: t.param, kind, scale, written, values, unit };
}

function resolveFigure(setup: SetupDescription, base: ResolvedSetup, raw: ToleranceFigureSpec, grid: FrequencyGridSpec): { figure: FigurePlan; info: FigureInfo } {
  const fig = expectObject(raw, "figure", undefined) as { kind?: unknown };
  const kinds = FIGURE_KINDS.join(", ");
  if (!FIGURE_KINDS.includes(fig.kind as FigureKind)) {
    throw new QuietframeError({ path: "figure.kind", value: fig.kind, problem: "is not a figure of merit", allowed: kinds });
  }
  const kind = fig.kind as FigureKind;
  const freqs = logGrid(grid);
  const assembled = assemble(base);
  const gridText = `${formatQuantity(grid.from, "frequency")} … ${formatQuantity(grid.to, "frequency")} (the grid)`;
  if (kind !== "range-gain" && !assembled.signal.curves.some((c) => c.id === "sql")) {
    throw new QuietframeError({ path: "figure.kind", value: kind, problem: "needs an SQL reference, and this set-up's signal has none", allowed: "range-gain for strain budgets" });
  }
  switch (kind) {
    case "margin-at": {
      const f = expectObject(raw, "figure", ["kind", "frequency"]) as unknown as MarginAtSpec;
      const at = parseQuantity(f.frequency, "frequency", "figure.frequency");
      if (!(at >= grid.from && at <= grid.to)) {
        throw new QuietframeError({ path: "figure.frequency", value: f.frequency, problem: "is outside the frequency grid", allowed: gridText });
      }
      const index = nearestInLog(freqs, at);
      return {
        figure: { kind, index },
        info: { kind, unit: "dB", label: `margin below the SQL at ${formatQuantity(freqs[index], "frequency", 6)}`, frequency: freqs[index] },
      };
    }
    case "margin-band": {
      const f = expectObject(raw, "figure", ["kind", "from", "to"]) as unknown as MarginBandSpec;
      const from = parseQuantity(f.from, "frequency", "figure.from");
      const to = parseQuantity(f.to, "frequency", "figure.to");
      if (!(from >= grid.from && from < grid.to)) {
        throw new QuietframeError({ path: "figure.from", value: f.from, problem: "is outside the frequency grid", allowed: gridText });
      }
      if (!(to > from && to <= grid.to)) {
        throw new QuietframeError({ path: "figure.to", value: f.to, problem: "must be above figure.from and inside the grid", allowed: `${formatQuantity(from, "frequency")} < to ≤ ${formatQuantity(grid.to, "frequency")}` });
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
        figure: { kind, first, last },
        info: {
          kind,
          unit: "dB",
          label: `band margin below the SQL, ${formatQuantity(band[0], "frequency", 6)} … ${formatQuantity(band[1], "frequency", 6)}`,
          band,
          bandPoints: last - first + 1,
        },
      };
    }
    case "best-margin":
      expectObject(raw, "figure", ["kind"]);
      return { figure: { kind }, info: { kind, unit: "dB", label: "largest margin below the SQL on the grid" } };
    case "range-gain":
      return rangeGain(setup, raw as RangeGainSpec, grid, assembled.referredTo.name);
  }
}

function rangeGain(setup: SetupDescription, raw: RangeGainSpec, grid: FrequencyGridSpec, quantity: string): { figure: FigurePlan; info: FigureInfo } {
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
    figure: { kind: "range-gain", measure, inspiral, referenceMetres },
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

function expectObject(value: unknown, path: string, keys: readonly string[] | undefined): Record<string, unknown> {
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
