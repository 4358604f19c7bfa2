/** The entangled-light panel's fingerprint: SHA-256 over every number the panel shows or exports. */
import { seriesFingerprint } from "../core/state/series-fingerprint";
import { ELLIPSE_SERIES, SPECTRUM_SERIES, type EntangledComputation } from "./model";

/**
 * Fingerprint of a computed panel (docs/fingerprint.md, "entangled-light panel"): the labelled
 * series below, in this order, as exact IEEE-754 doubles. Labels are plain ASCII so that a
 * reader can type them; the series names of the charts are mapped to short keys.
 */
export function entangledFingerprint(c: EntangledComputation): string {
  return seriesFingerprint(({ label, series }) => {
    label("entangled-panel");
    series("covariance", c.covariance);
    series("epr", [c.eprX, c.eprP, c.duanSum, c.duanBound]);
    series("log-negativity", [c.logNegativity]);
    series("conditional variance", [c.conditionalVariance]);
    const rows = (name: string) => c.spectrum.filter((row) => row.series === name);
    series(
      "spectrum frequencies",
      rows(SPECTRUM_SERIES.conditional).map((row) => row.f),
    );
    series(
      "spectrum conditional",
      rows(SPECTRUM_SERIES.conditional).map((row) => row.db),
    );
    series(
      "spectrum epr-x",
      rows(SPECTRUM_SERIES.epr).map((row) => row.db),
    );
    for (const [key, name] of Object.entries(ELLIPSE_SERIES)) {
      const points = c.ellipses.filter((p) => p.series === name);
      series(
        `ellipse ${key} x`,
        points.map((p) => p.x),
      );
      series(
        `ellipse ${key} y`,
        points.map((p) => p.y),
      );
    }
  });
}
