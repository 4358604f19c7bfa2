/**
 * The reach lines of `quietframe summary` for a strain set-up: inspiral horizon and range of
 * its total noise (src/reach) and, against a reference set-up, the range ratio and volume gain.
 */
import type { NoiseBudget } from "../engine/budget";
import { QuietframeError } from "../errors";
import { inspiralHorizon, inspiralRange, strainCurve } from "../reach";
import { distanceText, rangeRatioText, volumeGainText } from "../../widgets/explorer/summary";

/** The source the lines describe: two 1.4 M☉ neutron stars at an optimal matched-filter SNR of 8. */
const SOURCE = { m1: 1.4, m2: 1.4, snr: 8 } as const;
const LABEL = `inspiral reach (${SOURCE.m1} + ${SOURCE.m2} M☉, SNR ${SOURCE.snr})`;

/**
 * Nothing for a budget not referred to strain. A curve that misses the inspiral band gets a
 * line saying why instead of failing the summary.
 * @param against the reference's budget and its name, for the volume gain
 */
export function reachLines(budget: NoiseBudget, against?: { budget: NoiseBudget; name: string }): string {
  if (budget.quantity.name !== "strain") {
    if (against)
      throw new QuietframeError({
        path: "--against",
        value: against.name,
        problem: "compares inspiral reach, but the set-up summarised is not referred to strain",
        allowed: "--against only with strain set-ups",
      });
    return "";
  }
  const curve = strainCurve(budget);
  let range: number;
  let horizon: number;
  try {
    range = inspiralRange(curve.frequencies, curve.strainPsd, SOURCE).megaparsecs;
    horizon = inspiralHorizon(curve.frequencies, curve.strainPsd, SOURCE).megaparsecs;
  } catch (e) {
    if (!(e instanceof QuietframeError)) throw e;
    return `${LABEL}: not available: ${e.message}\n`;
  }
  let text = `${LABEL}: range ${distanceText(range)}, horizon ${distanceText(horizon)}\n`;
  if (against) {
    if (against.budget.quantity.name !== "strain") {
      throw new QuietframeError({
        path: "--against",
        value: against.name,
        problem: "is not referred to strain, so it has no inspiral reach to compare",
        allowed: "a strain set-up (an interferometer's strain signal)",
      });
    }
    const reference = strainCurve(against.budget);
    // The surveyed volume goes as the cube of the range (same source and threshold).
    const ratio = range / inspiralRange(reference.frequencies, reference.strainPsd, SOURCE).megaparsecs;
    text += `volume gain against ${against.name}: ×${volumeGainText(ratio * ratio * ratio)} (range ×${rangeRatioText(ratio)})\n`;
  }
  return text;
}
