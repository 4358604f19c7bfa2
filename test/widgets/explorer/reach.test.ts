import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { inspiralHorizon, inspiralRange, strainCurve, volumeGain } from "../../../src/reach";
import type { SetupDescription } from "../../../src/setup/format";
import { computeExplorer, createExplorerState, initialValues } from "../../../widgets/explorer/model";
import { DEFAULT_REACH_SOURCE, explorerReach, initialComputation, INITIAL_SETUP, reachFigures } from "../../../widgets/explorer/reach";
import { distanceText, rangeRatioText, reachSummary, volumeGainText } from "../../../widgets/explorer/summary";
import { notebookFigures, summaryText } from "../../../widgets/explorer/notebook/figures";
import { parseExplorerState, stateDocumentText } from "../../../widgets/explorer/document";
import type { ExplorerState } from "../../../widgets/explorer/format";

/**
 * The explorer's reach gauge must be src/reach applied to the very curve the explorer
 * computed, compared with the state's initial set-up; it must not touch the fingerprint.
 */
const ROOT = join(__dirname, "..", "..", "..");
const example = (name: string): SetupDescription => JSON.parse(readFileSync(join(ROOT, "examples", name), "utf8")) as SetupDescription;

const POWER = { target: "ifo.power", label: "arm power", min: "100 mW", max: "1 MW" };

function detector(): ExplorerState {
  return createExplorerState(example("long-baseline-detector.json"), { controls: [POWER, { target: "squeezer.squeezing", min: "-12 dB", max: "0 dB", scale: "linear" as const }] });
}

describe("reachFigures", () => {
  it("is src/reach on the computation's strain curve, exactly", () => {
    const computation = computeExplorer(detector());
    const reach = reachFigures(computation);
    expect(reach?.available).toBe(true);
    if (!reach?.available) return;
    const curve = strainCurve(computation.evaluation.budget);
    expect(reach.range).toEqual(inspiralRange(curve.frequencies, curve.strainPsd));
    expect(reach.horizon).toEqual(inspiralHorizon(curve.frequencies, curve.strainPsd));
    expect(reach.source).toEqual({ m1: 1.4, m2: 1.4, snr: 8 });
    expect(reach.comparison).toBeUndefined();
    // The example's detector sees a binary neutron-star inspiral at a few hundred Mpc.
    expect(reach.range.megaparsecs).toBeGreaterThan(50);
    expect(reach.range.megaparsecs).toBeLessThan(1000);
  });

  it("compares with a reference curve: range ratio of the two ranges, volume gain its cube, as src/reach computes them", () => {
    const state = detector();
    const base = computeExplorer(state);
    const more = computeExplorer({ ...state, values: { ...state.values, "squeezer.squeezing": "-10 dB" } });
    const reach = reachFigures(more, base, { against: "six decibels" });
    expect(reach?.available && reach.comparison).toBeTruthy();
    if (!reach?.available || !reach.comparison) return;
    const a = strainCurve(more.evaluation.budget);
    const b = strainCurve(base.evaluation.budget);
    const ra = inspiralRange(a.frequencies, a.strainPsd);
    const rb = inspiralRange(b.frequencies, b.strainPsd);
    const c = reach.comparison;
    expect(c.against).toBe("six decibels");
    expect(c.referenceRange).toEqual(rb);
    expect(c.rangeRatio).toBe(ra.metres / rb.metres);
    expect(c.volumeGain).toBe(c.rangeRatio * c.rangeRatio * c.rangeRatio);
    expect(c.volumeGain).toBe(volumeGain(a, b));
    // Frequency-independent squeezing trades shot noise for radiation-pressure noise: the range moves.
    expect(Math.abs(c.rangeRatio - 1)).toBeGreaterThan(0.01);
  });

  it("passes the source on to src/reach and refuses bad source options", () => {
    const computation = computeExplorer(detector());
    const heavy = reachFigures(computation, undefined, { source: { m1: 30, m2: 30, snr: 10 } });
    if (!heavy?.available) throw new Error("expected a reach");
    const curve = strainCurve(computation.evaluation.budget);
    expect(heavy.range).toEqual(inspiralRange(curve.frequencies, curve.strainPsd, { m1: 30, m2: 30, snr: 10 }));
    const light = reachFigures(computation);
    if (!light?.available) throw new Error("expected a reach");
    expect(heavy.range.megaparsecs).toBeGreaterThan(light.range.megaparsecs);
    expect(() => reachFigures(computation, undefined, { source: { m1: -1 } })).toThrow(/options\.m1/);
  });

  it("says why when the grid misses the inspiral band", () => {
    const state = createExplorerState(example("long-baseline-detector.json"), { settings: { grid: { from: "2 kHz", to: "5 kHz", points: 50 } } });
    const reach = reachFigures(computeExplorer(state));
    expect(reach?.available).toBe(false);
    if (reach?.available !== false) return;
    expect(reach.problem).toMatch(/does not overlap the inspiral band/);
    expect(reachSummary(reach)[0].text).toMatch(/^not available: .*inspiral band/);
  });

  it("is undefined for a budget not referred to strain", () => {
    const state = createExplorerState(example("free-test-mass.json"), { controls: [{ target: "arm.power", min: "1 mW", max: "3 W" }] });
    const computation = computeExplorer(state);
    expect(computation.evaluation.budget.quantity.name).toBe("displacement");
    expect(reachFigures(computation)).toBeUndefined();
    expect(explorerReach(state, computation)).toBeUndefined();
    expect(notebookFigures(computation, state)).not.toHaveProperty("reach");
    expect(summaryText(computation, state)).not.toMatch(/reach|range/i);
  });
});

describe("explorerReach: against the initial set-up", () => {
  it("compares the current values with the set-up's own values (×1 at the start)", () => {
    const state = detector();
    expect(initialValues(state)).toEqual(state.values);
    const computation = computeExplorer(state);
    // At the initial values the reference is the current computation itself.
    expect(initialComputation(state, computation)).toBe(computation);
    const reach = explorerReach(state, computation);
    if (!reach?.available || !reach.comparison) throw new Error("expected a comparison");
    expect(reach.comparison.against).toBe(INITIAL_SETUP);
    expect(reach.comparison.rangeRatio).toBe(1);
    expect(reach.comparison.volumeGain).toBe(1);
    expect(reachSummary(reach)[0].text).toBe(`range ${distanceText(reach.range.megaparsecs)} (×1.00 range, ×1.0 volume vs the initial set-up); horizon ${distanceText(reach.horizon.megaparsecs)}`);
  });

  it("after a control moves, gives range ratio and volume gain against the initial curve, and the fingerprint is the curves' alone", () => {
    const state = detector();
    const initial = computeExplorer(state);
    const moved = { ...state, values: { ...state.values, "ifo.power": "100 kW" } };
    const computation = computeExplorer(moved);
    const reach = explorerReach(moved, computation);
    if (!reach?.available || !reach.comparison) throw new Error("expected a comparison");
    const now = strainCurve(computation.evaluation.budget);
    const then = strainCurve(initial.evaluation.budget);
    expect(reach.range).toEqual(inspiralRange(now.frequencies, now.strainPsd));
    expect(reach.comparison.referenceRange).toEqual(inspiralRange(then.frequencies, then.strainPsd));
    expect(reach.comparison.rangeRatio).toBe(inspiralRange(now.frequencies, now.strainPsd).metres / inspiralRange(then.frequencies, then.strainPsd).metres);
    expect(reach.comparison.volumeGain).toBe(volumeGain(now, then));
    expect(reach.comparison.rangeRatio).toBeLessThan(1);
    // Computing the gauge changes neither the computation's fingerprint nor the state's.
    expect(computation.fingerprint).toBe(computeExplorer(moved).fingerprint);
    expect(createExplorerState(example("long-baseline-detector.json"), { controls: moved.controls }).fingerprint).toBe(state.fingerprint);
  });

  it("keeps the same reference after the moved state is saved and reopened", () => {
    const state = detector();
    const values = { ...state.values, "squeezer.squeezing": "-9 dB" };
    const moved = { ...state, values, fingerprint: computeExplorer({ ...state, values }).fingerprint };
    const reopened = parseExplorerState(stateDocumentText(moved), "saved");
    expect(reopened.values).toEqual(values);
    expect(initialValues(reopened)).toEqual(state.values);
    const a = explorerReach(moved, computeExplorer(moved));
    const b = explorerReach(reopened, computeExplorer(reopened));
    expect(b).toEqual(a);
    if (!b?.available || !b.comparison) throw new Error("expected a comparison");
    expect(b.comparison.referenceRange).toEqual((explorerReach(state, computeExplorer(state)) as { range: unknown }).range);
  });
});

describe("reach in summaries", () => {
  it("formats distances and ratios as the gauge shows them", () => {
    expect(distanceText(182.04)).toBe("182 Mpc");
    expect(distanceText(3.7377)).toBe("3.74 Mpc");
    expect(distanceText(999.7)).toBe("1.00 Gpc");
    expect(distanceText(0.25)).toBe("250 kpc");
    expect(distanceText(4.2e-7)).toBe("0.420 pc");
    expect(rangeRatioText(1.2599)).toBe("1.26");
    expect(volumeGainText(1.2599 * 1.2599 * 1.2599)).toBe("2.0");
    expect(volumeGainText(1234.4)).toBe("1234");
    expect(volumeGainText(0.5)).toBe("0.50");
  });

  it("the notebook figures and text summary carry the gauge of a strain budget", () => {
    const state = detector();
    const moved = { ...state, values: { ...state.values, "ifo.power": "100 kW" } };
    const computation = computeExplorer(moved);
    const full = { ...moved, fingerprint: computation.fingerprint };
    const reach = explorerReach(moved, computation);
    if (!reach?.available || !reach.comparison) throw new Error("expected a comparison");
    const f = notebookFigures(computation, full);
    expect(f.reach).toEqual({
      source: { ...DEFAULT_REACH_SOURCE },
      horizonMpc: reach.horizon.megaparsecs,
      rangeMpc: reach.range.megaparsecs,
      band: [...reach.range.band],
      vsInitial: { rangeMpc: reach.comparison.referenceRange.megaparsecs, rangeRatio: reach.comparison.rangeRatio, volumeGain: reach.comparison.volumeGain },
    });
    expect(JSON.parse(JSON.stringify(f.reach))).toEqual(f.reach);
    const text = summaryText(computation, full);
    const [line] = reachSummary(reach);
    expect(text).toContain(`${line.label}: ${line.text}`);
    expect(line.label).toBe("Inspiral reach (1.4 + 1.4 M☉, SNR 8)");
    expect(line.text).toMatch(/^range \d+(\.\d+)? Mpc \(×0\.\d\d\d range, ×0\.\d+ volume vs the initial set-up\); horizon \d+(\.\d+)? Mpc$/);
  });
});
