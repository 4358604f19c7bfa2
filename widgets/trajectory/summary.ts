/** The trajectory widget's summary lines. */
import type { JointVariable } from "../../src/index";
import { engineDuanLabel, jointDuanSum } from "./duan";
import { simulationText, type TrajectoryComputation } from "./model";
import { writeTime } from "./simulation";
import type { SummaryLine } from "../core/page/summary-line";

/**
 * The summary lines (label, text) every output shows: static fallback, live readout and
 * text/plain. Numbers at the end of the run; variances in units where one quadrature's
 * zero-point level is 1/2.
 */

const n = (y: number, d = 4): string => (Number.isFinite(y) ? String(Number(y.toPrecision(d))) : String(y));

export function trajectorySummary(c: TrajectoryComputation, joint: readonly JointVariable[] = []): SummaryLine[] {
  const r = c.result;
  const last = r.time.length - 1;
  const lines: SummaryLine[] = [{ label: "Run", text: simulationText(c.simulation, r) }];
  for (const j of r.joint) {
    const parts = Object.keys(j.parts)
      .sort()
      .map((k) => `${k} alone ${n(j.parts[k][last])}`);
    const ratio = j.conditional[last] / j.zeroPoint;
    lines.push({
      label: j.label,
      text: `conditional variance ${n(j.conditional[last])} (${n(ratio, 3)} × zero-point ${n(j.zeroPoint)}), unconditional ${n(j.unconditional[last])}${parts.length ? `; ${parts.join(", ")}` : ""}`,
    });
  }
  const e = r.entanglement;
  if (e) {
    lines.push({ label: `Entanglement ${e.pair[0]}–${e.pair[1]}`, text: `log-negativity ${n(e.logNegativity[last])} ebits (unconditional ${n(e.unconditionalLogNegativity[last])})` });
    const other = jointDuanSum(joint, r, e.pair);
    for (const [label, values] of [[engineDuanLabel(e.pair), e.duanSum] as const, ...(other ? [[other.label, other.values] as const] : [])]) {
      const first = firstBelow(values, e.duanBound);
      const verdict = values[last] < e.duanBound ? "entangled" : "not shown entangled";
      lines.push({
        label: "Duan sum",
        text: `${label} (1 = ${e.pair[0]}, 2 = ${e.pair[1]}) = ${n(values[last])} (separable ≥ ${n(e.duanBound)}): ${verdict}${first >= 0 ? `; first below the bound after ${writeTime(r.time[first])}` : ""}`,
      });
    }
  }
  lines.push({ label: "Curve fingerprint", text: c.fingerprint });
  return lines;
}

function firstBelow(values: ArrayLike<number>, bound: number): number {
  for (let i = 0; i < values.length; i++) if (values[i] < bound) return i;
  return -1;
}
