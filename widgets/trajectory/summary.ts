import { simulationText, type TrajectoryComputation } from "./model";
import { writeTime } from "./simulation";

/**
 * The summary lines (label, text) every output shows: static fallback, live readout and
 * text/plain. Numbers at the end of the run; variances in units where one quadrature's
 * zero-point level is 1/2.
 */
export interface SummaryLine {
  readonly label: string;
  readonly text: string;
}

const n = (y: number, d = 4): string => (Number.isFinite(y) ? String(Number(y.toPrecision(d))) : String(y));

export function trajectorySummary(c: TrajectoryComputation): SummaryLine[] {
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
    const duan = e.duanSum[last];
    lines.push({ label: `Entanglement ${e.pair[0]}–${e.pair[1]}`, text: `log-negativity ${n(e.logNegativity[last])} ebits (unconditional ${n(e.unconditionalLogNegativity[last])}); Duan sum ${n(duan)} (separable ≥ ${n(e.duanBound)}): ${duan < e.duanBound ? "entangled" : "not shown entangled"}` });
    const first = firstBelow(e.duanSum, e.duanBound);
    if (first >= 0) lines.push({ label: "Duan sum first below the bound", text: `after ${writeTime(r.time[first])}` });
  }
  lines.push({ label: "Curve fingerprint", text: c.fingerprint });
  return lines;
}

function firstBelow(values: ArrayLike<number>, bound: number): number {
  for (let i = 0; i < values.length; i++) if (values[i] < bound) return i;
  return -1;
}
