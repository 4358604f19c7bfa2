import { createHash } from "node:crypto";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { toleranceMapInProcess } from "../../src/tolerance";
import { computeEntangled, loadEntangledState, loadExplorerState, loadTrajectoryState } from "../../widgets";
import { encodeValue, heatmapCells, loadToleranceState, toleranceSummaryText } from "../../widgets/tolerance/model";

/**
 * States saved by quietframe 0.1.0 before the widget layer was reorganised (one of each kind,
 * in test/fixtures/states/). Whatever moves inside the code, a saved state must give the
 * same numbers: explorer and trajectory states carry their own SHA-256 fingerprint of the
 * curves; the tolerance state carries its map; the entangled panel's figures are pinned by
 * the hash of what that version computed from the file.
 */
const DIR = join(__dirname, "..", "fixtures", "states");
const text = (name: string): string => readFileSync(join(DIR, name), "utf8");
const sha256 = (value: unknown): string => createHash("sha256").update(JSON.stringify(value)).digest("hex");

describe("states saved before the layout change", () => {
  it.each(["explorer.json", "explorer-detector.json"])("%s recomputes to its stored fingerprint", (name) => {
    const loaded = loadExplorerState(text(name), name);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.computation.fingerprint).toBe(loaded.state.fingerprint);
  });

  it("trajectory.json replays to its stored fingerprint", () => {
    const loaded = loadTrajectoryState(text("trajectory.json"), "trajectory.json");
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.computation.fingerprint).toBe(loaded.state.fingerprint);
  });

  it("tolerance.json: its set-up and spec give the stored map bit for bit, and the same heat map and summary", async () => {
    const state = loadToleranceState(text("tolerance.json"));
    const map = await toleranceMapInProcess(state.setup, state.spec);
    expect(Array.from(map.values, encodeValue)).toEqual(state.map.values);
    expect(Array.from(map.status)).toEqual(state.map.status);
    expect(sha256({ cells: heatmapCells(state), summary: toleranceSummaryText(state) })).toBe(TOLERANCE_VIEW_SHA256);
  });

  it("entangled.json computes the same figures", () => {
    const state = loadEntangledState(text("entangled.json"), "entangled.json");
    const c = computeEntangled(state);
    const figures = {
      covariance: Array.from(c.covariance),
      eprX: c.eprX,
      eprP: c.eprP,
      duanSum: c.duanSum,
      logNegativity: c.logNegativity,
      conditionalVariance: c.conditionalVariance,
      spectrum: c.spectrum,
      epr: c.epr,
      ellipses: c.ellipses,
    };
    expect(sha256(figures)).toBe(ENTANGLED_FIGURES_SHA256);
  });
});

// Written by quietframe 0.1.0 from the fixture files above, before the layout change.
const TOLERANCE_VIEW_SHA256 = "c24e77d52dc7c8fe0d8a9868f9f16709d6b90da19a67d40a91aaece9bf74d594";
const ENTANGLED_FIGURES_SHA256 = "0e9368768bff952cbf688e533a9c99c3ba6e62d4a29abef6d3b63826f575a665";
