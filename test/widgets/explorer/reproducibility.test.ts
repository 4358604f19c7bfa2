import { createHash } from "node:crypto";
import { describe, expect, test } from "vitest";
import type { NoiseBudget } from "../../../src/engine/budget";
import { computeExplorer, createExplorerState } from "../../../widgets/explorer/model";
import { budgetFingerprint } from "../../../widgets/explorer/fingerprint";
import { loadExplorerState, parseExplorerState, stateDocumentText } from "../../../widgets/explorer/document";
import { exampleFiles, exampleSetup, exampleState } from "./examples";

/**
 * The fingerprint's byte layout written out independently (labels, then little-endian doubles)
 * and hashed with node:crypto as the reference.
 */
function referenceFingerprint(budget: NoiseBudget): string {
  const hash = createHash("sha256");
  const series = (label: string, values: Float64Array): void => {
    hash.update(`${label}\n`, "utf8");
    const buf = Buffer.alloc(values.length * 8);
    values.forEach((v, i) => buf.writeDoubleLE(v, 8 * i));
    hash.update(buf);
  };
  hash.update(`quantity ${budget.quantity.name} [${budget.quantity.unit}]\n`, "utf8");
  series("frequencies", budget.frequencies);
  series("total", budget.total);
  for (const t of budget.terms) series(`term ${t.id}`, t.psd);
  for (const r of budget.references) series(`reference ${r.id}`, r.psd);
  return `sha256:${hash.digest("hex")}`;
}

describe("reproducibility of a saved state", () => {
  test.each(exampleFiles())("%s: the fingerprint is SHA-256 of the curves' doubles (node:crypto as reference)", (file) => {
    const computation = computeExplorer(exampleState(file));
    expect(budgetFingerprint(computation.evaluation.budget)).toBe(referenceFingerprint(computation.evaluation.budget));
  });

  test.each(exampleFiles())("%s: saving, reading and recomputing gives the same fingerprint, bit for bit", (file) => {
    const state = exampleState(file);
    const first = loadExplorerState(stateDocumentText(state));
    const again = loadExplorerState(stateDocumentText(first.state));
    expect(first.fingerprintMatches).toBe(true);
    expect(again.computation.fingerprint).toBe(state.fingerprint);
    // The plotted numbers themselves, compared as bytes.
    const bytes = (a: Float64Array): number[] => Array.from(new Uint8Array(a.buffer, a.byteOffset, a.byteLength));
    first.computation.table.columns.forEach((c, k) => {
      expect(bytes(again.computation.table.columns[k].values), c.label).toEqual(bytes(c.values));
    });
  });

  test("changing one value changes the fingerprint, and the loaded file says it no longer matches", () => {
    const state = exampleState("cryogenic-membrane.json");
    const changed = { ...state, values: { ...state.values, "membrane.temperature": "7 K" } };
    const loaded = loadExplorerState(stateDocumentText(changed));
    expect(loaded.fingerprintMatches).toBe(false);
    expect(loaded.computation.fingerprint).not.toBe(state.fingerprint);
    expect(loaded.computation.fingerprint).toMatch(/^sha256:[0-9a-f]{64}$/);
    // Back to the recorded value: the recorded fingerprint again.
    const restored = loadExplorerState(stateDocumentText({ ...changed, values: { ...changed.values, "membrane.temperature": "6 K" } }));
    expect(restored.computation.fingerprint).toBe(state.fingerprint);
  });

  test("the same physical value written differently gives the same curves", () => {
    const state = exampleState("cryogenic-membrane.json");
    const loaded = loadExplorerState({ ...state, values: { ...state.values, "membrane.temperature": "6000 mK" } });
    expect(loaded.computation.fingerprint).toBe(state.fingerprint);
  });

  test("one grid point more changes the fingerprint", () => {
    const state = exampleState("free-test-mass.json");
    const settings = { ...state.settings, grid: { ...state.settings.grid, points: state.settings.grid.points + 1 } };
    expect(loadExplorerState({ ...state, settings }).computation.fingerprint).not.toBe(state.fingerprint);
  });

  test("a mismatching fingerprint is reported, not thrown", () => {
    const state = exampleState("free-test-mass.json");
    const forged = { ...state, fingerprint: `sha256:${"0".repeat(64)}` };
    const loaded = loadExplorerState(stateDocumentText(forged));
    expect(loaded.fingerprintMatches).toBe(false);
    expect(loaded.state.fingerprint).toBe(forged.fingerprint);
    expect(loaded.computation.fingerprint).toBe(state.fingerprint);
  });

  test("a state created twice from the same set-up is identical", () => {
    const a = createExplorerState(exampleSetup("free-test-mass.json"));
    const b = createExplorerState(exampleSetup("free-test-mass.json"));
    expect(stateDocumentText(a)).toBe(stateDocumentText(b));
    expect(parseExplorerState(stateDocumentText(a)).fingerprint).toBe(b.fingerprint);
  });
});
