import { componentKind } from "../components/registry";
import type { QuantityParam } from "../components/types";
import { parseGrid, type FrequencyGridSpec } from "../setup/grid";
import { QuietframeError } from "../errors";
import { pow } from "../numeric/portable-math";
import { FALLBACK_GRID, loadSetup } from "../pipeline";
import type { SetupDescription } from "../setup/format";
import { formatQuantity, parseQuantity, type QuantityKind } from "../units";
import { expectObject, FIGURE_KINDS, resolveFigure, type FigureInfo, type FigurePlan, type ToleranceFigureSpec } from "../figures/spec";

// The figures of merit are shared with the design searches (src/figures); a map offers FIGURE_KINDS.
export {
  FIGURE_KINDS,
  type FigureKind,
  type FigureInfo,
  type FigurePlan,
  type ToleranceFigureSpec,
  type MarginAtSpec,
  type MarginBandSpec,
  type BestMarginSpec,
  type RangeGainSpec,
} from "../figures/spec";

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
  const { plan, info } = resolveFigure(setup, base, s.figure, plan0.grid, { kinds: FIGURE_KINDS, atFrequency: "nearest-grid-point" });
  return { plan: { ...plan0, figure: plan }, figure: info };
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
  const quantities = setup.components.flatMap((c) => (componentKind(c.type)?.params ?? []).filter((p) => p.kind !== "choice").map((p) => `${c.name}.${p.name}`));
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
