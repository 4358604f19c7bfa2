/** The entangled-light panel's state and model (two-mode squeezed source, losses, bandwidth). */
import {
  QuietframeError,
  squeezeFactorFromDb,
  AMPLITUDE_CORRELATED,
  conditionalVariance,
  duanBound,
  duanSum,
  entangledSourceCovariance,
  entangledSourceSpectrum,
  eprVariances,
  logarithmicNegativity,
  cos,
  log10,
  pow,
  sin,
  QUIETFRAME_VERSION,
  type TwoModeSqueezing,
} from "../../src/index";
import { parseUntrustedJson } from "../core/state/state-text";
import { locateSingleModelState, type SingleModelKind } from "../core/state/single-model-read";
import { expectFingerprint, VERSION_PATTERN } from "../core/state/strict-read";
import { entangledFingerprint } from "./csv";
import { ELLIPSE_SERIES, SPECTRUM_SERIES } from "./series-names";
import { bandwidthLabel } from "./bandwidth";

/**
 * The entangled-light panel's model: a two-mode squeezed source with per-arm losses and an
 * optional bandwidth, and what the panel shows of it. Pure: the kernel, the static figures
 * and the browser runtime all call `computeEntangled`, so a state gives the same bits everywhere.
 *
 * Units: quadrature variances with vacuum 1/2 (as src/engine/entanglement.ts), spectra in dB
 * relative to the vacuum level of the same quantity.
 */
export const ENTANGLED_STATE_FORMAT = "quietframe.entangled-panel";
/** 2: the saved state carries the fingerprint of its numbers; 1 (read, never written): none. */
export const ENTANGLED_STATE_VERSION = 2;
/** The panel's model in a Jupyter widget-state document. */
export const ENTANGLED_MODEL_NAME = "EntangledPanelModel";

export type SqueezeUnit = "dB" | "r";

export interface EntangledState {
  format: typeof ENTANGLED_STATE_FORMAT;
  /** Format version the state was read as (1 or 2); new states are 2. */
  version: number;
  /** quietframe version that wrote the state. */
  quietframe: string;
  /** Two-mode squeezing as 10·log10 e^{−2r} (dB, −40 … 0) or as the factor r (0 … 4.6). */
  squeeze: { unit: SqueezeUnit; value: number };
  /** Power transmission of arm 1 (0 … 1). */
  efficiency1: number;
  /** Power transmission of arm 2 (0 … 1). */
  efficiency2: number;
  /** Linewidth κ/2π of the source's cavity modes in Hz; null for a white (broadband) source. */
  bandwidth: number | null;
  /** Panel title (plain text). */
  title: string;
}

export interface EntangledOptions {
  /** Two-mode squeezing in dB (≤ 0, e.g. −10); give this or `r`. Default −10 dB. */
  squeezingDb?: number;
  /** Two-mode squeeze factor r ≥ 0; give this or `squeezingDb`. */
  r?: number;
  /** η1, power transmission of arm 1, 0 … 1 (default 1). */
  efficiency1?: number;
  /** η2, power transmission of arm 2, 0 … 1 (default 1). */
  efficiency2?: number;
  /** Source linewidth κ/2π in Hz (> 0); absent for a white source. */
  bandwidth?: number;
  /** Title shown above the panel. */
  title?: string;
}

/** Slider ranges: dB in 0.1 dB steps, r in steps of 0.01, efficiencies in steps of 0.01. */
export const SQUEEZE_DB_MIN = -40;
export const SQUEEZE_R_MAX = 4.6;
export const SLIDER_STEPS = { dB: 400, r: 460, efficiency: 100 } as const;

/** The value slider position k stands for (the same arithmetic in Node and in the page). */
export function sliderValue(control: "dB" | "r" | "efficiency", k: number): number {
  if (control === "dB") return -k / 10;
  return k / 100;
}

/** The slider position nearest a value. */
export function sliderPosition(control: "dB" | "r" | "efficiency", value: number): number {
  const k = control === "dB" ? Math.round(-value * 10) : Math.round(value * 100);
  return Math.min(SLIDER_STEPS[control], Math.max(0, k));
}

export function createEntangledState(options: EntangledOptions = {}): EntangledState {
  if (options.squeezingDb !== undefined && options.r !== undefined) {
    throw new QuietframeError({ path: "options.squeezingDb", value: options.squeezingDb, problem: "both squeezingDb and r are given", allowed: "one of squeezingDb (dB ≤ 0) or r (≥ 0)" });
  }
  const squeeze = options.r !== undefined ? { unit: "r" as const, value: options.r } : { unit: "dB" as const, value: options.squeezingDb ?? -10 };
  const raw = {
    format: ENTANGLED_STATE_FORMAT,
    version: ENTANGLED_STATE_VERSION,
    quietframe: QUIETFRAME_VERSION,
    squeeze,
    efficiency1: options.efficiency1 ?? 1,
    efficiency2: options.efficiency2 ?? 1,
    bandwidth: options.bandwidth ?? null,
    title: options.title ?? "Entangled light",
  };
  return checkEntangledState(raw, "options");
}

/** Parses and checks a saved state (object or JSON text, bare or in a widget-state document); problems name the field. */
export function loadEntangledState(input: unknown, source = "state"): EntangledState {
  return readEntangledState(input, source).state;
}

/** A saved state as read: the state, the fingerprint it stores (null for a version-1 state or none), and where it sits in the input. */
export interface StoredEntangledState {
  readonly state: EntangledState;
  readonly fingerprint: string | null;
}

export function readEntangledState(input: unknown, source = "state"): StoredEntangledState & { readonly path: string } {
  // Text is parsed into plain JSON data first (size limit, no prototype keys anywhere).
  const value = typeof input === "string" ? parseUntrustedJson(input, source) : input;
  const { state, path } = locateSingleModelState(value, source, STORED_KIND);
  return { ...state, path };
}

const STORED_KIND: SingleModelKind<StoredEntangledState> = {
  what: "entangled-panel",
  format: ENTANGLED_STATE_FORMAT,
  modelName: ENTANGLED_MODEL_NAME,
  check: (input, path) => checkStoredState(input, path),
};

/** The bare state as saved: the current version, with the fingerprint of the numbers it gives. */
export function entangledStateText(state: EntangledState): string {
  return JSON.stringify(savedEntangledState(state), null, 1);
}

/** The state as a saved document holds it: current version, fingerprint of its recomputed numbers. */
export function savedEntangledState(state: EntangledState, computation: EntangledComputation = computeEntangled(state)): EntangledState & { fingerprint: string } {
  return { ...state, version: ENTANGLED_STATE_VERSION, fingerprint: entangledFingerprint(computation) };
}

function finiteIn(value: unknown, path: string, min: number, max: number, what: string): number {
  if (typeof value !== "number" || !Number.isFinite(value) || value < min || value > max) {
    throw new QuietframeError({ path, value, problem: "is out of range or not a number", allowed: what });
  }
  return value;
}

function checkEntangledState(input: unknown, path: string): EntangledState {
  return checkStoredState(input, path).state;
}

const STATE_KEYS = ["format", "version", "quietframe", "squeeze", "efficiency1", "efficiency2", "bandwidth", "title"] as const;

function checkStoredState(input: unknown, path: string): StoredEntangledState {
  if (typeof input !== "object" || input === null || Array.isArray(input)) {
    throw new QuietframeError({ path, value: input, problem: "must be an object", allowed: `a saved entangled-panel state {"format": "${ENTANGLED_STATE_FORMAT}", …}` });
  }
  const o = input as Record<string, unknown>;
  if (o.format !== ENTANGLED_STATE_FORMAT) throw new QuietframeError({ path: `${path}.format`, value: o.format, problem: "is not an entangled-panel state", allowed: `"${ENTANGLED_STATE_FORMAT}"` });
  const version = o.version;
  if (version !== 1 && version !== ENTANGLED_STATE_VERSION)
    throw new QuietframeError({ path: `${path}.version`, value: version, problem: "is not a version this quietframe reads", allowed: `1 or ${ENTANGLED_STATE_VERSION}` });
  if (typeof o.quietframe !== "string" || !VERSION_PATTERN.test(o.quietframe))
    throw new QuietframeError({ path: `${path}.quietframe`, value: o.quietframe, problem: "must be a version string", allowed: `a quietframe version such as "${QUIETFRAME_VERSION}"` });
  const sq = o.squeeze;
  if (typeof sq !== "object" || sq === null || Array.isArray(sq))
    throw new QuietframeError({ path: `${path}.squeeze`, value: sq, problem: "must be an object", allowed: '{"unit": "dB" | "r", "value": number}' });
  const s = sq as Record<string, unknown>;
  for (const key of Object.keys(s))
    if (key !== "unit" && key !== "value") throw new QuietframeError({ path: `${path}.squeeze.${key}`, problem: "is not a field of the squeezing", allowed: "unit, value" });
  if (s.unit !== "dB" && s.unit !== "r") throw new QuietframeError({ path: `${path}.squeeze.unit`, value: s.unit, problem: "is not a squeeze unit", allowed: '"dB" or "r"' });
  const value =
    s.unit === "dB"
      ? finiteIn(s.value, `${path}.squeeze.value`, SQUEEZE_DB_MIN, 0, `${SQUEEZE_DB_MIN} dB ≤ squeezing ≤ 0 dB`)
      : finiteIn(s.value, `${path}.squeeze.value`, 0, SQUEEZE_R_MAX, `0 ≤ r ≤ ${SQUEEZE_R_MAX}`);
  const efficiency1 = finiteIn(o.efficiency1, `${path}.efficiency1`, 0, 1, "0 ≤ η1 ≤ 1");
  const efficiency2 = finiteIn(o.efficiency2, `${path}.efficiency2`, 0, 1, "0 ≤ η2 ≤ 1");
  let bandwidth: number | null = null;
  if (o.bandwidth !== null && o.bandwidth !== undefined) {
    bandwidth = finiteIn(o.bandwidth, `${path}.bandwidth`, 1e-3, 1e15, "a linewidth in Hz from 1e-3 to 1e15, or null for a white source");
  }
  if (typeof o.title !== "string" || o.title.length > 200)
    throw new QuietframeError({ path: `${path}.title`, value: o.title, problem: "must be text of at most 200 characters", allowed: "plain text" });
  // Version 1 states were written before the panel recorded a fingerprint.
  const known: readonly string[] = version === 1 ? STATE_KEYS : [...STATE_KEYS, "fingerprint"];
  for (const key of Object.keys(o)) if (!known.includes(key)) throw new QuietframeError({ path: `${path}.${key}`, problem: "is not a field of an entangled-panel state", allowed: known.join(", ") });
  const fingerprint = o.fingerprint === undefined ? null : expectFingerprint(o.fingerprint, `${path}.fingerprint`, "panel");
  return {
    state: { format: ENTANGLED_STATE_FORMAT, version, quietframe: o.quietframe, squeeze: { unit: s.unit, value }, efficiency1, efficiency2, bandwidth, title: o.title },
    fingerprint,
  };
}

export interface SpectrumRow {
  /** Sideband frequency, Hz. */
  f: number;
  /** dB relative to the vacuum level of the same quantity. */
  db: number;
  series: string;
}

export interface EprRow {
  quantity: string;
  value: number;
}

export interface EllipseRow {
  x: number;
  y: number;
  /** Position along the curve, for drawing order. */
  i: number;
  series: string;
}

export interface EntangledComputation {
  readonly source: TwoModeSqueezing;
  readonly r: number;
  /** Covariance (vacuum 1/2) over X1, P1, X2, P2 at zero sideband frequency (or of the white source). */
  readonly covariance: Float64Array;
  readonly eprX: number;
  readonly eprP: number;
  readonly duanSum: number;
  readonly duanBound: number;
  /** ebits */
  readonly logNegativity: number;
  /** Var(X1 | X2), vacuum 1/2. */
  readonly conditionalVariance: number;
  readonly conditionalDb: number;
  readonly spectrum: SpectrumRow[];
  readonly epr: EprRow[];
  readonly ellipses: EllipseRow[];
  /** Half-width of the square the ellipses are drawn in. */
  readonly ellipseExtent: number;
}

export { ELLIPSE_SERIES, SPECTRUM_SERIES };
export const EPR_LABELS = { x: "Var(X1 − X2)", p: "Var(P1 + P2)", duan: "Duan sum" } as const;
export const SPECTRUM_POINTS = 121;
export const ELLIPSE_POINTS = 97;

export function squeezeFactor(state: EntangledState): number {
  return state.squeeze.unit === "dB" ? squeezeFactorFromDb(state.squeeze.value) : state.squeeze.value;
}

const X1 = 0;
const P1 = 1;
const X2 = 2;

/** 10·log10 of a ratio; −Infinity for 0. */
function db(ratio: number): number {
  return ratio > 0 ? 10 * log10(ratio) : -Infinity;
}

/** The sideband frequencies shown: around the linewidth, or a nominal band for a white source. */
export function spectrumFrequencies(bandwidth: number | null): number[] {
  const from = bandwidth === null ? 1e3 : bandwidth / 100;
  const decades = 4;
  const out: number[] = [];
  for (let k = 0; k < SPECTRUM_POINTS; k++) out.push(from * pow(10, (decades * k) / (SPECTRUM_POINTS - 1)));
  return out;
}

/**
 * The 2×2 covariance of arm 1 (X1, P1) given an ideal homodyne of X2: the Schur complement
 * A − c cᵀ / V(X2, X2) with c = (V(X1, X2), V(P1, X2)).
 */
export function conditionalArmCovariance(v: ArrayLike<number>): [number, number, number] {
  const g = v[X2 * 4 + X2];
  const cx = v[X1 * 4 + X2];
  const cp = v[P1 * 4 + X2];
  return [v[0] - (cx * cx) / g, v[1] - (cx * cp) / g, v[5] - (cp * cp) / g];
}

/**
 * Points x = L (cos t, sin t) with L Lᵀ = V (Cholesky of [[a, b], [b, d]]), so that every point
 * has xᵀ V⁻¹ x = 1: the one-standard-deviation contour of the quadrature noise.
 */
export function ellipsePoints(a: number, b: number, d: number, series: string, n = ELLIPSE_POINTS): EllipseRow[] {
  const l11 = Math.sqrt(a);
  const l21 = b / l11;
  const l22 = Math.sqrt(Math.max(0, d - l21 * l21));
  const rows: EllipseRow[] = [];
  for (let i = 0; i < n; i++) {
    const t = (2 * Math.PI * i) / (n - 1);
    const c = cos(t);
    const s = sin(t);
    rows.push({ x: l11 * c, y: l21 * c + l22 * s, i, series });
  }
  return rows;
}

export function computeEntangled(state: EntangledState): EntangledComputation {
  const r = squeezeFactor(state);
  const source: TwoModeSqueezing = { r, efficiency1: state.efficiency1, efficiency2: state.efficiency2, ...(state.bandwidth === null ? {} : { bandwidth: state.bandwidth }) };
  const v = entangledSourceCovariance(source);
  const { x, p } = eprVariances(v, AMPLITUDE_CORRELATED);
  const duan = duanSum(v, AMPLITUDE_CORRELATED);
  const cond = conditionalVariance(v, X1, [X2]);
  const spectrum: SpectrumRow[] = [];
  for (const f of spectrumFrequencies(state.bandwidth)) {
    const s = entangledSourceSpectrum(source, f);
    const vf = s.map((y) => 0.5 * y);
    spectrum.push({ f, db: db(conditionalVariance(vf, X1, [X2]) / 0.5), series: SPECTRUM_SERIES.conditional });
    spectrum.push({ f, db: db(eprVariances(vf, AMPLITUDE_CORRELATED).x / 1), series: SPECTRUM_SERIES.epr });
  }
  const [ca, cb, cd] = conditionalArmCovariance(v);
  const ellipses = [
    ...ellipsePoints(0.5, 0, 0.5, ELLIPSE_SERIES.vacuum),
    ...ellipsePoints(v[0], v[1], v[5], ELLIPSE_SERIES.arm1),
    ...ellipsePoints(v[10], v[11], v[15], ELLIPSE_SERIES.arm2),
    ...ellipsePoints(ca, cb, cd, ELLIPSE_SERIES.conditional),
  ];
  const largest = Math.max(...ellipses.map((e) => Math.max(Math.abs(e.x), Math.abs(e.y))));
  return {
    source,
    r,
    covariance: v,
    eprX: x,
    eprP: p,
    duanSum: duan,
    duanBound: duanBound(),
    logNegativity: logarithmicNegativity(v),
    conditionalVariance: cond,
    conditionalDb: db(cond / 0.5),
    spectrum,
    epr: [
      { quantity: EPR_LABELS.x, value: x },
      { quantity: EPR_LABELS.p, value: p },
      { quantity: EPR_LABELS.duan, value: duan },
    ],
    ellipses,
    ellipseExtent: niceExtent(largest),
  };
}

/** A round half-width a little above the largest ellipse, from 1, 1.5, 2, 3, 5, 7 × 10^k. */
function niceExtent(x: number): number {
  const ladder = [0.5, 0.7, 1, 1.5, 2, 3, 5, 7, 10, 15, 20, 30, 50, 70, 100];
  for (const step of ladder) if (x * 1.05 <= step) return step;
  return x * 1.05;
}

/** The summary lines (label, text) every output shows: fallback, live readout, text/plain. */
export function entangledSummary(state: EntangledState, c: EntangledComputation): { label: string; text: string }[] {
  const n = (y: number, d = 4): string => (Number.isFinite(y) ? String(Number(y.toPrecision(d))) : String(y));
  const squeeze = state.squeeze.unit === "dB" ? `${n(state.squeeze.value)} dB (r = ${n(c.r)})` : `r = ${n(c.r)} (${dbText(db(epr0(c.r)))} dB)`;
  return [
    { label: "Two-mode squeezing", text: squeeze },
    { label: "Arm efficiencies", text: `η1 = ${n(state.efficiency1)}, η2 = ${n(state.efficiency2)}` },
    { label: "Source linewidth κ/2π", text: state.bandwidth === null ? "white (broadband)" : `${bandwidthLabel(state.bandwidth)} (numbers below at zero sideband frequency)` },
    { label: "EPR variances", text: `Var(X1 − X2) = ${n(c.eprX)}, Var(P1 + P2) = ${n(c.eprP)} (vacuum 1)` },
    { label: "Duan sum", text: `${n(c.duanSum)} (separable states ≥ ${n(c.duanBound)}): ${c.duanSum < c.duanBound ? "entangled" : "not shown entangled"}` },
    { label: "Logarithmic negativity", text: `${n(c.logNegativity)} ebits` },
    { label: "Conditional variance", text: `Var(X1 | X2) = ${n(c.conditionalVariance)} (${dbText(c.conditionalDb)} dB relative to vacuum; vacuum quadrature variance ½)` },
  ];
}

/**
 * A level in dB to 0.01 dB: rounding error of a value that is vacuum exactly (e.g. −1.9e−15 dB
 * at r = 0) reads as 0.00, and a negative zero loses its sign.
 */
export function dbText(value: number): string {
  if (!Number.isFinite(value)) return value < 0 ? "−∞" : String(value);
  const text = value.toFixed(2);
  return text === "-0.00" ? "0.00" : text.replace("-", "−");
}

/** e^{−2r} of the lossless source, as the dB figure a squeeze factor stands for. */
function epr0(r: number): number {
  return eprVariances(entangledSourceCovariance({ r, efficiency1: 1, efficiency2: 1 })).x;
}
