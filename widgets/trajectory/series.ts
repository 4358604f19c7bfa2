/** Chart rows of a trajectory run (thinned for static figures). */
import type { JointVariable, TrajectoryResult } from "../../src/index";
import { engineDuanLabel, jointDuanSum } from "./duan";

/**
 * The rows the charts plot, derived from a run's result. Times are shown in the SI prefix
 * that suits the run's duration (µs for a 200 µs run), variances in the model's units
 * (zero-point level of one quadrature: 1/2).
 */
export interface TimeAxis {
  /** Multiply seconds by this to get the shown unit. */
  readonly factor: number;
  readonly unit: string;
}

const AXES: readonly TimeAxis[] = [
  { factor: 1e12, unit: "ps" },
  { factor: 1e9, unit: "ns" },
  { factor: 1e6, unit: "µs" },
  { factor: 1e3, unit: "ms" },
  { factor: 1, unit: "s" },
];

/** The largest unit in which the duration is 1 or more (picoseconds below that). */
export function timeAxis(duration: number): TimeAxis {
  for (let k = AXES.length - 1; k >= 0; k--) if (duration * AXES[k].factor >= 1) return AXES[k];
  return AXES[0];
}

/** Points per curve in static figures (SVG, PNG): smooth at print size, light in a notebook. */
export const STATIC_POINTS = 400;

export interface JointRow {
  t: number;
  series: string;
  estimate: number;
  lower: number;
  upper: number;
  truth: number;
  /** Estimation error, estimate − true value. */
  error: number;
  /** √(conditional variance), the filter's own standard deviation of the error. */
  sigma: number;
  /** error / sigma: a consistent filter keeps it within ±1 about 68 % of the time, whatever the scale of the variable. */
  normalizedError: number;
}

/** One stored point of a measurement record: the output averaged over the interval since the previous stored point. */
export interface RecordRow {
  t: number;
  output: string;
  value: number;
}

export interface VarianceRow {
  t: number;
  series: string;
  curve: string;
  value: number;
}

export interface ZeroPointRow {
  series: string;
  value: number;
}

export interface MeasureRow {
  t: number;
  measure: string;
  value: number;
}

export const CURVES = { conditional: "conditional", unconditional: "unconditional" } as const;
export const MEASURES = {
  logNeg: "log-negativity (conditional)",
  logNegUnconditional: "log-negativity (unconditional)",
} as const;

/** "<component> alone": the conditional variance of the terms of one system. */
export function partCurve(component: string): string {
  return `${component} alone`;
}

export interface TrajectoryRows {
  readonly axis: TimeAxis;
  readonly joint: JointRow[];
  readonly records: RecordRow[];
  readonly variance: VarianceRow[];
  readonly zeroPoints: ZeroPointRow[];
  readonly logNeg: MeasureRow[];
  readonly duan: MeasureRow[];
  /** The separability bound of the Duan sum, when a pair is followed. */
  readonly duanBound: number | null;
  /** The Duan sums shown (the engine's convention, and the other one when the joint variables give it). */
  readonly duanMeasures: string[];
}

/**
 * Chart rows of a run. `maxPoints` thins the rows for static figures (every k-th stored point
 * and the last); the live charts and the CSV keep every stored point.
 */
export function trajectoryRows(r: TrajectoryResult, maxPoints = Infinity, joint: readonly JointVariable[] = []): TrajectoryRows {
  const axis = timeAxis(r.settings.duration);
  const n = r.time.length;
  const stride = Math.max(1, Math.ceil(n / maxPoints));
  const index: number[] = [];
  for (let i = 0; i < n; i += stride) index.push(i);
  if (index[index.length - 1] !== n - 1) index.push(n - 1);
  const t = index.map((i) => r.time[i] * axis.factor);
  const jointRows: JointRow[] = [];
  const variance: VarianceRow[] = [];
  for (const j of r.joint) {
    index.forEach((i, k) => {
      const sigma = Math.sqrt(j.conditional[i]);
      jointRows.push({
        t: t[k],
        series: j.label,
        estimate: j.estimate[i],
        lower: j.estimate[i] - sigma,
        upper: j.estimate[i] + sigma,
        truth: j.truth[i],
        error: j.estimate[i] - j.truth[i],
        sigma,
        normalizedError: (j.estimate[i] - j.truth[i]) / sigma,
      });
    });
    const curves: [string, ArrayLike<number>][] = [
      [CURVES.conditional, j.conditional],
      [CURVES.unconditional, j.unconditional],
      ...Object.keys(j.parts)
        .sort()
        .map((name): [string, ArrayLike<number>] => [partCurve(name), j.parts[name]]),
    ];
    for (const [curve, values] of curves) index.forEach((i, k) => variance.push({ t: t[k], series: j.label, curve, value: values[i] }));
  }
  const logNeg: MeasureRow[] = [];
  const duan: MeasureRow[] = [];
  const e = r.entanglement;
  const duanMeasures: string[] = [];
  if (e) {
    const engineLabel = engineDuanLabel(e.pair);
    const fromJoint = jointDuanSum(joint, r, e.pair);
    duanMeasures.push(engineLabel, ...(fromJoint ? [fromJoint.label] : []));
    index.forEach((i, k) => {
      logNeg.push({ t: t[k], measure: MEASURES.logNeg, value: e.logNegativity[i] });
      logNeg.push({ t: t[k], measure: MEASURES.logNegUnconditional, value: e.unconditionalLogNegativity[i] });
      duan.push({ t: t[k], measure: engineLabel, value: e.duanSum[i] });
      if (fromJoint) duan.push({ t: t[k], measure: fromJoint.label, value: fromJoint.values[i] });
    });
  }
  const records = r.records.flatMap((rec) => index.map((i, k) => ({ t: t[k], output: rec.output, value: rec.values[i] })));
  return { axis, joint: jointRows, records, variance, zeroPoints: r.joint.map((j) => ({ series: j.label, value: j.zeroPoint })), logNeg, duan, duanBound: e ? e.duanBound : null, duanMeasures };
}

/** The first non-finite stored number, if any: a run that produced one is refused, never plotted. */
export function firstNonFinite(r: TrajectoryResult): { series: string; time: number } | undefined {
  const check = (series: string, values: ArrayLike<number>): { series: string; time: number } | undefined => {
    for (let i = 0; i < values.length; i++) if (!Number.isFinite(values[i])) return { series, time: r.time[Math.min(i, r.time.length - 1)] };
    return undefined;
  };
  for (const j of r.joint) {
    const bad =
      check(`${j.label} truth`, j.truth) ??
      check(`${j.label} estimate`, j.estimate) ??
      check(`${j.label} conditional variance`, j.conditional) ??
      check(`${j.label} unconditional variance`, j.unconditional) ??
      Object.keys(j.parts).reduce<{ series: string; time: number } | undefined>((found, k) => found ?? check(`${j.label} ${partCurve(k)}`, j.parts[k]), undefined);
    if (bad) return bad;
  }
  const e = r.entanglement;
  if (e) return check("log-negativity", e.logNegativity) ?? check("unconditional log-negativity", e.unconditionalLogNegativity) ?? check("Duan sum", e.duanSum);
  return undefined;
}
