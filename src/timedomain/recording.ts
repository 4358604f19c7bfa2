/**
 * The stored samples of a run: at each stored step, the time, the records averaged since the
 * last stored point, each joint variable (truth, estimate, conditional and unconditional
 * variance, parts), the entanglement of a pair of modes and the uncertainty margin; then
 * the series cut to the points taken. Nothing non-finite is stored.
 */
import { fastUncertaintyMargin } from "../engine/covariance";
import { duanBound, duanSum, eprVariances, logarithmicNegativity, modePairCovariance } from "../engine/entanglement";
import { QuietframeError } from "../errors";
import { maxAbs } from "../linalg/real-matrix";
import type { StateSpaceModel } from "../network/model";
import { findMode, jointParts, jointVariance, resolveJointVariable, zeroPointVariance } from "./joint";
import type { EntanglementSeries, JointSeries, TrajectoryRequest, TrajectoryResult } from "./types";

interface JointTrack {
  readonly label: string;
  readonly weights: Float64Array;
  readonly zeroPoint: number;
  readonly parts: readonly [string, Float64Array][];
  readonly truth: Float64Array;
  readonly estimate: Float64Array;
  readonly conditional: Float64Array;
  readonly unconditional: Float64Array;
  readonly partSeries: Float64Array[];
}

interface PairTrack {
  readonly pair: readonly [string, string];
  readonly eprX: Float64Array;
  readonly eprP: Float64Array;
  readonly duanSum: Float64Array;
  readonly logNegativity: Float64Array;
  readonly unconditionalLogNegativity: Float64Array;
}

/** What a run holds at a stored point. */
export interface RunSnapshot {
  /** Steps taken. */
  readonly step: number;
  /** Hidden state z. */
  readonly z: Float64Array;
  /** Estimate ẑ. */
  readonly zHat: Float64Array;
  /** The filter's covariance P and its revision (the margin is recomputed only when P moved). */
  readonly cov: Float64Array;
  readonly covRevision: number;
  /** Unconditional covariance at this point. */
  readonly unconditionalCov: Float64Array;
}

/** The stored series, without the run's settings and step counts. */
export type RecordedSeries = Pick<TrajectoryResult, "time" | "records" | "joint" | "entanglement" | "minUncertaintyMargin">;

function outputNames(model: StateSpaceModel): string[] {
  return model.outputs.map((o) => (model.outputs.filter((x) => x.owner === o.owner).length > 1 ? `${o.owner}: ${o.label}` : o.owner));
}

export class Recorder {
  private stored = 0;
  private lastStep = 0;
  private minMargin = Infinity;
  private marginRevision = -1;
  private readonly yAcc: Float64Array;
  private readonly time: Float64Array;
  private readonly records: Float64Array[];
  private readonly joints: JointTrack[];
  private readonly pairTrack: PairTrack | undefined;

  /**
   * Resolves the request's joint variables and pair against the model (errors name
   * `joint[i]` and `pair[i]`) and reserves one slot per stored step.
   */
  constructor(
    private readonly model: StateSpaceModel,
    request: TrajectoryRequest,
    /** Steps at which a point is stored, ascending, starting at 0. */
    private readonly storedSteps: Int32Array,
    /** Step length in seconds. */
    private readonly h: number,
  ) {
    const samples = storedSteps.length;
    this.joints = request.joint.map((jv, i): JointTrack => {
      const weights = resolveJointVariable(model, jv, `joint[${i}]`);
      const parts = Object.entries(jointParts(model, jv, `joint[${i}]`));
      return {
        label: jv.label,
        weights,
        zeroPoint: zeroPointVariance(weights),
        parts,
        truth: new Float64Array(samples),
        estimate: new Float64Array(samples),
        conditional: new Float64Array(samples),
        unconditional: new Float64Array(samples),
        partSeries: parts.map(() => new Float64Array(samples)),
      };
    });
    if (request.pair) {
      request.pair.forEach((c, i) => findMode(model, { component: c, mode: model.modes.find((m) => m.owner === c)?.label }, `pair[${i}]`));
      if (request.pair[0] === request.pair[1]) {
        throw new QuietframeError({ path: "pair[1]", value: request.pair[1], problem: "entanglement needs two different components", allowed: "two distinct component names that own modes" });
      }
      this.pairTrack = {
        pair: [request.pair[0], request.pair[1]],
        eprX: new Float64Array(samples),
        eprP: new Float64Array(samples),
        duanSum: new Float64Array(samples),
        logNegativity: new Float64Array(samples),
        unconditionalLogNegativity: new Float64Array(samples),
      };
    }
    const p = model.nOutputs;
    this.yAcc = new Float64Array(p);
    this.time = new Float64Array(samples);
    this.records = Array.from({ length: p }, () => new Float64Array(samples));
  }

  /** Whether step k is one to store (and not stored yet). */
  isDue(k: number): boolean {
    return this.stored < this.storedSteps.length && k === this.storedSteps[this.stored];
  }

  /** Steps since the last stored point (0 before the first). */
  stepsSinceStored(k: number): number {
    return this.stored === 0 ? 0 : k - this.lastStep;
  }

  /** Adds one step's record increments to the running sums of the current interval. */
  accumulate(dy: ArrayLike<number>): void {
    for (let i = 0; i < this.yAcc.length; i++) this.yAcc[i] += dy[i];
  }

  /** Stores the point of `s.step`; refuses (QuietframeError) a state that left the floating-point range. */
  store(s: RunSnapshot): void {
    const j = this.stored;
    const { model } = this;
    const n = model.nStates;
    this.time[j] = s.step * this.h;
    if (j > 0) {
      const dt = (s.step - this.lastStep) * this.h;
      for (let i = 0; i < this.yAcc.length; i++) {
        this.records[i][j] = this.yAcc[i] / dt;
        this.yAcc[i] = 0;
      }
    }
    this.lastStep = s.step;
    for (const t of this.joints) {
      let truth = 0;
      let estimate = 0;
      for (let i = 0; i < n; i++) {
        truth += t.weights[i] * s.z[i];
        estimate += t.weights[i] * s.zHat[i];
      }
      t.truth[j] = truth;
      t.estimate[j] = estimate;
      t.conditional[j] = jointVariance(s.cov, t.weights);
      t.unconditional[j] = jointVariance(s.unconditionalCov, t.weights);
      t.parts.forEach(([, w], i) => (t.partSeries[i][j] = jointVariance(s.cov, w)));
    }
    if (this.pairTrack) {
      const e = this.pairTrack;
      const pc = modePairCovariance(model, s.cov, e.pair[0], e.pair[1]);
      const epr = eprVariances(pc);
      e.eprX[j] = epr.x;
      e.eprP[j] = epr.p;
      e.duanSum[j] = duanSum(pc);
      e.logNegativity[j] = logarithmicNegativity(pc);
      e.unconditionalLogNegativity[j] = logarithmicNegativity(modePairCovariance(model, s.unconditionalCov, e.pair[0], e.pair[1]));
    }
    if (s.covRevision !== this.marginRevision) {
      this.minMargin = Math.min(this.minMargin, fastUncertaintyMargin(model.modes, s.cov, n));
      this.marginRevision = s.covRevision;
    }
    // A growing mode overflows somewhere first; nothing non-finite may reach a plot.
    if (![s.z, s.zHat, s.cov, s.unconditionalCov].every((a) => Number.isFinite(maxAbs(a)))) throw overflow(s.step, this.h);
    this.stored++;
  }

  /** The series up to the last stored point. */
  series(): RecordedSeries {
    const c = this.stored;
    const cut = (a: Float64Array): Float64Array => a.slice(0, c);
    const names = outputNames(this.model);
    const records = this.records.map((values, i) => {
      const v = cut(values);
      // No interval ends at t = 0: show the first interval's average there.
      if (c > 1) v[0] = v[1];
      return { output: names[i], values: v };
    });
    const joint: JointSeries[] = this.joints.map((t) => ({
      label: t.label,
      truth: cut(t.truth),
      estimate: cut(t.estimate),
      conditional: cut(t.conditional),
      unconditional: cut(t.unconditional),
      zeroPoint: t.zeroPoint,
      parts: Object.fromEntries(t.parts.map(([name], i) => [name, cut(t.partSeries[i])])),
    }));
    let entanglement: EntanglementSeries | undefined;
    if (this.pairTrack) {
      const e = this.pairTrack;
      entanglement = {
        pair: e.pair,
        eprX: cut(e.eprX),
        eprP: cut(e.eprP),
        duanSum: cut(e.duanSum),
        duanBound: duanBound(),
        logNegativity: cut(e.logNegativity),
        unconditionalLogNegativity: cut(e.unconditionalLogNegativity),
      };
    }
    return { time: cut(this.time), records, joint, entanglement, minUncertaintyMargin: this.minMargin };
  }
}

function overflow(step: number, h: number): QuietframeError {
  return new QuietframeError({
    path: "simulation.duration",
    value: step * h,
    problem: `the simulated state left the floating-point range after ${step} steps (${step * h} s): the set-up has a growing mode`,
    allowed: "a shorter duration, or a stable set-up (see the stability report)",
  });
}
