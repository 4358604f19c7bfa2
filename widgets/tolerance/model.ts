import {
  componentKind,
  QuietframeError,
  CellStatus,
  toleranceCellSetup,
  parseQuantity,
  QUIETFRAME_VERSION,
  type SetupDescription,
  type CellMessage,
  type ToleranceMap,
  type AxisScale,
  type FigureInfo,
  type ToleranceMapSpec,
  type QuantityKind,
} from "../../src/index";
import { createExplorerState } from "../explorer/model";
import type { ExplorerState } from "../explorer/format";
import type { ControlSpec } from "../core/controls/control-spec";
import { parseUntrustedJson } from "../core/state/state-text";
import { FINGERPRINT_PATTERN } from "../core/state/strict-read";
import { decodeValue, encodeValue, type CellValue } from "./cell-value";
import { toleranceFingerprint } from "./numbers";

export { decodeValue, encodeValue, type CellValue };

/**
 * The tolerance-map widget's model: a finished map as plain JSON (it travels inside the
 * page, so nothing is recomputed there), the rows its heat map plots, a text summary, and
 * the explorer state of one cell. Pure: the kernel and the browser runtime run this code.
 */
export const TOLERANCE_STATE_FORMAT = "quietframe.tolerance";
export const TOLERANCE_STATE_VERSION = 1;

export interface ToleranceAxisData {
  readonly target: string;
  readonly scale: AxisScale;
  /** Values as written into each cell's set-up. */
  readonly written: readonly string[];
  /** SI values those strings parse to. */
  readonly values: readonly number[];
  /** Unit of the written values at the axis end ("dB", "%", "MHz"). */
  readonly unit: string;
}

export interface ToleranceMapData {
  readonly x: ToleranceAxisData;
  readonly y: ToleranceAxisData;
  /** Frequency grid of every cell (Hz). */
  readonly grid: { readonly from: number; readonly to: number; readonly points: number };
  readonly figure: FigureInfo;
  /** Row-major with y outer, as ToleranceMap.values. */
  readonly values: readonly CellValue[];
  readonly status: readonly number[];
  readonly counts: { readonly ok: number; readonly unstable: number; readonly invalid: number };
  /** Why failed cells have no value (as many as the kernel gathered; see toleranceWidget). */
  readonly messages: readonly CellMessage[];
}

export interface ToleranceSettings {
  /** Shown above the map; defaults to the set-up's name. */
  title?: string;
  /** A figure the summary counts cells against (dB for margins, a ratio for gains), e.g. 3. */
  target?: number;
  /** Axis labels by target (default: the target itself). */
  labels?: Record<string, string>;
}

/** Where a map computed as a sweep (`quietframe sweep`) came from: the sweep's fingerprint and that of the map's numbers. */
export interface SweepMark {
  readonly fingerprint: string;
  readonly result: string;
}

export interface ToleranceWidgetState {
  format: typeof TOLERANCE_STATE_FORMAT;
  version: number;
  quietframe: string;
  setup: SetupDescription;
  spec: ToleranceMapSpec;
  settings: ToleranceSettings;
  map: ToleranceMapData;
  /** Present on a map merged from a sweep's chunks (or run as a sweep on one machine). */
  sweep?: SweepMark;
  /** SHA-256 of the map's numbers (docs/fingerprint.md); absent in states saved before maps had one. */
  fingerprint?: string;
}

/** The widget state of a finished map; `messages` may hold more failed cells than the map kept. */
export function toleranceWidgetState(
  setup: SetupDescription,
  spec: ToleranceMapSpec,
  map: ToleranceMap,
  settings: ToleranceSettings = {},
  messages: readonly CellMessage[] = map.messages,
): ToleranceWidgetState {
  const data = toleranceMapData(map, messages);
  return {
    format: TOLERANCE_STATE_FORMAT,
    version: TOLERANCE_STATE_VERSION,
    quietframe: QUIETFRAME_VERSION,
    setup: structuredClone(setup),
    spec: structuredClone(spec),
    settings: structuredClone(settings),
    map: data,
    fingerprint: toleranceFingerprint(data),
  };
}

/** A computed map as the state stores it; `messages` may hold more failed cells than the map kept. */
export function toleranceMapData(map: ToleranceMap, messages: readonly CellMessage[] = map.messages): ToleranceMapData {
  const axis = (a: ToleranceMap["x"]): ToleranceAxisData => ({ target: a.target, scale: a.scale, written: [...a.written], values: Array.from(a.values), unit: a.unit });
  return {
    x: axis(map.x),
    y: axis(map.y),
    grid: { from: map.grid.from, to: map.grid.to, points: map.grid.points },
    figure: structuredClone(map.figure),
    values: Array.from(map.values, encodeValue),
    status: Array.from(map.status),
    counts: { ...map.counts },
    messages: structuredClone([...messages]),
  };
}

/** Checks the shape of a state read from a page (JSON text); throws QuietframeError. */
export function loadToleranceState(text: string): ToleranceWidgetState {
  const value = parseUntrustedJson(text, "state");
  const s = value as Partial<ToleranceWidgetState> | null;
  if (typeof s !== "object" || s === null || s.format !== TOLERANCE_STATE_FORMAT) {
    throw new QuietframeError({ path: "state.format", value: s?.format, problem: "is not a tolerance-map state", allowed: TOLERANCE_STATE_FORMAT });
  }
  if (s.version !== TOLERANCE_STATE_VERSION) {
    throw new QuietframeError({ path: "state.version", value: s.version, problem: "is not a version this quietframe reads", allowed: String(TOLERANCE_STATE_VERSION) });
  }
  const m = s.map;
  const ok = (a: unknown): a is ToleranceAxisData => {
    const x = a as ToleranceAxisData | undefined;
    return !!x && typeof x.target === "string" && Array.isArray(x.written) && Array.isArray(x.values) && x.written.length === x.values.length && x.written.length >= 2;
  };
  if (!m || !ok(m.x) || !ok(m.y) || !Array.isArray(m.values) || !Array.isArray(m.status) || m.values.length !== m.x.written.length * m.y.written.length || m.status.length !== m.values.length) {
    throw new QuietframeError({ path: "state.map", problem: "is malformed (axes, values and status do not fit together)", allowed: "the map a quietframe tolerance widget writes" });
  }
  if (!s.setup || !Array.isArray(s.setup.components)) {
    throw new QuietframeError({ path: "state.setup", problem: "is missing", allowed: "a set-up description" });
  }
  const mark = s.sweep as Partial<SweepMark> | undefined;
  if (mark !== undefined && (typeof mark !== "object" || mark === null || !FINGERPRINT_PATTERN.test(String(mark.fingerprint)) || !FINGERPRINT_PATTERN.test(String(mark.result)))) {
    throw new QuietframeError({
      path: "state.sweep",
      value: mark,
      problem: "is not a sweep's mark",
      allowed: '{ "fingerprint": "sha256:…", "result": "sha256:…" } as `quietframe sweep merge` writes it',
    });
  }
  if (s.fingerprint !== undefined && !FINGERPRINT_PATTERN.test(String(s.fingerprint))) {
    throw new QuietframeError({ path: "state.fingerprint", value: s.fingerprint, problem: "is not a fingerprint", allowed: '"sha256:" followed by 64 lowercase hex digits (docs/fingerprint.md)' });
  }
  return { ...(s as ToleranceWidgetState), settings: s.settings ?? {}, map: { ...m, messages: Array.isArray(m.messages) ? m.messages : [] } };
}

export const STATUS_TEXT: Record<number, string> = { [CellStatus.ok]: "ok", [CellStatus.unstable]: "unstable", [CellStatus.invalid]: "invalid" };

/** One plotted cell of the heat map. */
export interface HeatmapCell {
  /** Column and row. */
  readonly i: number;
  readonly j: number;
  /** Cell edges and centre in the axis display unit. */
  readonly x0: number;
  readonly x1: number;
  readonly y0: number;
  readonly y1: number;
  readonly xValue: number;
  readonly yValue: number;
  /** The values as written into the cell's set-up. */
  readonly xText: string;
  readonly yText: string;
  /** The figure (finite), or null when the cell is drawn as having no value. */
  readonly value: number | null;
  readonly figureText: string;
  /** "ok", "unstable", "invalid", or "infinite" (a figure of ±∞: the readout is blind there). */
  readonly status: string;
  readonly message: string;
}

/** How the axis's SI values are shown: divided by one of its unit. */
export function displayFactor(axis: Pick<ToleranceAxisData, "unit" | "target">, kind: QuantityKind | undefined): number {
  if (!axis.unit || !kind) return 1;
  try {
    const f = parseQuantity(`1 ${axis.unit}`, kind, axis.target);
    return Number.isFinite(f) && f > 0 ? f : 1;
  } catch {
    return 1;
  }
}

/** Quantity kind of an axis: that of the parameter it scans. */
export function axisKind(setup: SetupDescription, axis: Pick<ToleranceAxisData, "target">): QuantityKind | undefined {
  const dot = axis.target.indexOf(".");
  const component = setup.components.find((c) => c.name === axis.target.slice(0, dot));
  const param = component ? componentKind(component.type)?.params.find((p) => p.name === axis.target.slice(dot + 1)) : undefined;
  return param && param.kind !== "choice" ? (param.kind as QuantityKind) : undefined;
}

/** Cell edges on an axis: halfway between neighbouring values (in log on a log axis), ends mirrored. */
export function axisEdges(values: readonly number[], scale: AxisScale): number[] {
  const n = values.length;
  const mid = (a: number, b: number): number => (scale === "log" ? geometricMean(a, b) : (a + b) / 2);
  const edges: number[] = [];
  for (let k = 0; k <= n; k++) {
    if (k === 0) edges.push(scale === "log" ? (values[0] * values[0]) / geometricMean(values[0], values[1]) : values[0] - (values[1] - values[0]) / 2);
    else if (k === n) edges.push(scale === "log" ? (values[n - 1] * values[n - 1]) / geometricMean(values[n - 2], values[n - 1]) : values[n - 1] + (values[n - 1] - values[n - 2]) / 2);
    else edges.push(mid(values[k - 1], values[k]));
  }
  return edges;
}

/** √(ab) without overflow; Math.sqrt is correctly rounded by the language, so it gives the same bits everywhere. */
function geometricMean(a: number, b: number): number {
  return a > 0 && b > 0 ? Math.sqrt(a) * Math.sqrt(b) : 0;
}

/** A figure as text: "-3.21 dB", "1.84×" for gains. */
export function figureText(value: number, figure: Pick<FigureInfo, "unit">): string {
  if (Number.isNaN(value)) return "no value";
  if (!Number.isFinite(value)) return value > 0 ? "∞" : "−∞";
  const v = Number(value.toPrecision(4));
  return figure.unit ? `${v} ${figure.unit}` : `${v}×`;
}

/** Every cell of the map, row-major with y outer (cell (i, j) at j · nx + i), each exactly once. */
export function heatmapCells(state: ToleranceWidgetState): HeatmapCell[] {
  const { map } = state;
  const nx = map.x.values.length;
  const ny = map.y.values.length;
  const fx = displayFactor(map.x, axisKind(state.setup, map.x));
  const fy = displayFactor(map.y, axisKind(state.setup, map.y));
  const xs = map.x.values.map((v) => v / fx);
  const ys = map.y.values.map((v) => v / fy);
  const xe = axisEdges(xs, map.x.scale);
  const ye = axisEdges(ys, map.y.scale);
  const messages = new Map(map.messages.map((m) => [`${m.x},${m.y}`, m.message]));
  const cells: HeatmapCell[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i;
      const code = map.status[k];
      const value = decodeValue(map.values[k]);
      const finite = code === CellStatus.ok && Number.isFinite(value);
      const status = code === CellStatus.ok ? (finite ? "ok" : "infinite") : (STATUS_TEXT[code] ?? "invalid");
      const message = code === CellStatus.ok ? (finite ? "" : "the figure is infinite here (no finite noise or reference)") : (messages.get(`${i},${j}`) ?? `no value (${status})`);
      cells.push({
        i,
        j,
        x0: xe[i],
        x1: xe[i + 1],
        y0: ye[j],
        y1: ye[j + 1],
        xValue: xs[i],
        yValue: ys[j],
        xText: map.x.written[i],
        yText: map.y.written[j],
        value: finite ? value : null,
        figureText: figureText(value, map.figure),
        status,
        message,
      });
    }
  }
  return cells;
}

/** The value the colour scale is centred on: 0 dB for margins, 1 for gains. */
export function neutralValue(figure: Pick<FigureInfo, "unit">): number {
  return figure.unit === "dB" ? 0 : 1;
}

export interface ToleranceSummary {
  readonly cells: number;
  readonly counts: ToleranceMapData["counts"];
  /** The best finite cell, if any. */
  readonly best?: { readonly i: number; readonly j: number; readonly value: number; readonly x: string; readonly y: string };
  /** Fraction of all cells whose figure is at least the neutral value (0 dB or 1). */
  readonly atLeastNeutral: number;
  /** Fraction of all cells at least settings.target, when given. */
  readonly atLeastTarget?: number;
}

export function toleranceSummary(state: ToleranceWidgetState): ToleranceSummary {
  const { map } = state;
  const nx = map.x.values.length;
  const neutral = neutralValue(map.figure);
  const target = state.settings.target;
  let best: ToleranceSummary["best"];
  let aboveNeutral = 0;
  let aboveTarget = 0;
  map.values.forEach((raw, k) => {
    if (map.status[k] !== CellStatus.ok) return;
    const v = decodeValue(raw);
    if (v >= neutral) aboveNeutral++;
    if (target !== undefined && v >= target) aboveTarget++;
    if (Number.isFinite(v) && (!best || v > best.value)) {
      const i = k % nx;
      const j = (k - i) / nx;
      best = { i, j, value: v, x: map.x.written[i], y: map.y.written[j] };
    }
  });
  const cells = map.values.length;
  return {
    cells,
    counts: map.counts,
    best,
    atLeastNeutral: aboveNeutral / cells,
    ...(target !== undefined ? { atLeastTarget: aboveTarget / cells } : {}),
  };
}

/** Axis title: label (or target) and unit. */
export function axisTitle(state: ToleranceWidgetState, axis: ToleranceAxisData): string {
  const label = state.settings.labels?.[axis.target] ?? axis.target;
  return axis.unit ? `${label} (${axis.unit})` : label;
}

/** The map's summary as plain text lines. */
export function toleranceSummaryText(state: ToleranceWidgetState): string {
  const s = toleranceSummary(state);
  const { map } = state;
  const title = state.settings.title ?? state.setup.name ?? "tolerance map";
  const pct = (f: number): string => `${Number((100 * f).toFixed(1))} %`;
  const neutral = neutralValue(map.figure);
  const lines = [
    `${title}: ${map.figure.label}`,
    `${map.x.written.length} × ${map.y.written.length} cells over ${map.x.target} (${map.x.written[0]} … ${map.x.written[map.x.written.length - 1]}, ${map.x.scale}) and ${map.y.target} (${map.y.written[0]} … ${map.y.written[map.y.written.length - 1]}, ${map.y.scale})`,
    s.best ? `best: ${figureText(s.best.value, map.figure)} at ${map.x.target} = ${s.best.x}, ${map.y.target} = ${s.best.y}` : "best: no cell has a finite value",
    `cells at or above ${figureText(neutral, map.figure)}: ${pct(s.atLeastNeutral)}`,
  ];
  if (s.atLeastTarget !== undefined && state.settings.target !== undefined) lines.push(`cells at or above the target ${figureText(state.settings.target, map.figure)}: ${pct(s.atLeastTarget)}`);
  lines.push(`failed cells: ${map.counts.unstable} unstable, ${map.counts.invalid} invalid`);
  return lines.join("\n");
}

/** Explorer controls of the two mapped parameters, bounded by the map's axis range. */
export function cellControls(state: ToleranceWidgetState): ControlSpec[] {
  const control = (a: ToleranceAxisData): ControlSpec => ({
    target: a.target,
    label: state.settings.labels?.[a.target] ?? a.target,
    min: a.written[0],
    max: a.written[a.written.length - 1],
    scale: a.scale,
  });
  return [control(state.map.x), control(state.map.y)];
}

/** The set-up of cell (i, j): the base set-up with the cell's two written values. */
export function cellSetup(state: ToleranceWidgetState, i: number, j: number): SetupDescription {
  const axis = (a: ToleranceAxisData) => ({ target: a.target, scale: a.scale, written: a.written, values: Float64Array.from(a.values), unit: a.unit });
  return toleranceCellSetup(state.setup, { x: axis(state.map.x), y: axis(state.map.y) }, i, j);
}

/** The grid the cell explorer computes on: the map's own, written in hertz. */
export function cellGrid(state: ToleranceWidgetState): { from: string; to: string; points: number } {
  return { from: `${state.map.grid.from} Hz`, to: `${state.map.grid.to} Hz`, points: state.map.grid.points };
}

/**
 * An explorer state for cell (i, j): the cell's set-up, controls on the two mapped
 * parameters over the map's range, current values the cell's written values.
 * Throws QuietframeError where the cell's set-up does not compute (unstable or invalid).
 */
export function cellExplorerState(state: ToleranceWidgetState, i: number, j: number): ExplorerState {
  const setup = cellSetup(state, i, j);
  const name = state.settings.title ?? state.setup.name ?? "set-up";
  return createExplorerState(setup, {
    controls: cellControls(state),
    settings: { grid: cellGrid(state), spectralDensity: "amplitude", title: `${name} at ${state.map.x.written[i]}, ${state.map.y.written[j]}` },
  });
}
