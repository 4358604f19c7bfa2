/** The trajectory widget's fingerprint: SHA-256 over every stored series of a run. */
import type { TrajectoryResult } from "../../src/index";
import { seriesFingerprint } from "../core/state/series-fingerprint";

/**
 * Fingerprint of a simulated run: SHA-256 over the exact IEEE-754 doubles (little-endian) of
 * every stored series, each preceded by its label, plus the steps taken. Two runs agree on it
 * only if every number the widget plots or exports agrees bit for bit.
 */
export function trajectoryFingerprint(r: TrajectoryResult): string {
  return seriesFingerprint(({ label, series }) => {
    label(`steps ${r.stepsTaken} of ${r.stepsPlanned}${r.stopped ? " stopped" : ""}`);
    series("time", r.time);
    for (const rec of r.records) series(`record ${rec.output}`, rec.values);
    for (const j of r.joint) {
      series(`joint ${j.label} truth`, j.truth);
      series(`joint ${j.label} estimate`, j.estimate);
      series(`joint ${j.label} conditional`, j.conditional);
      series(`joint ${j.label} unconditional`, j.unconditional);
      series(`joint ${j.label} zero-point`, [j.zeroPoint]);
      for (const name of Object.keys(j.parts).sort()) series(`joint ${j.label} part ${name}`, j.parts[name]);
    }
    const e = r.entanglement;
    if (e) {
      label(`pair ${e.pair[0]} ${e.pair[1]}`);
      series("epr x", e.eprX);
      series("epr p", e.eprP);
      series("duan sum", e.duanSum);
      series("duan bound", [e.duanBound]);
      series("log-negativity", e.logNegativity);
      series("unconditional log-negativity", e.unconditionalLogNegativity);
    }
    series("min uncertainty margin", [r.minUncertaintyMargin]);
  });
}
