import { readFileSync } from "node:fs";
import { join } from "node:path";
import { afterEach, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../../src/setup/format";
import { toleranceMapInProcess, type ToleranceMapSpec } from "../../../src/tolerance";
import { computeExplorer } from "../../../widgets/explorer/model";
import { resetDisplaySession } from "../../../widgets/core/notebook/session";
import { toleranceWidget } from "../../../widgets/tolerance/notebook";
import { loadToleranceState } from "../../../widgets/tolerance/model";
import { TOLERANCE_STATE_CLASS } from "../../../widgets/tolerance/names";

const ROOT = join(__dirname, "..", "..", "..");
const squeezed = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8")) as SetupDescription;

// Ten failed cells in the first rows, more than the map itself keeps reasons for.
const SPEC: ToleranceMapSpec = {
  x: { target: "cavity.detuning", from: "-4 MHz", to: "4 MHz", points: 5 },
  y: { target: "cavity.inputCoupling", from: "0 %", to: "100 %", points: 5 },
  grid: { from: "1.1 MHz", to: "1.3 MHz", points: 32 },
  figure: { kind: "best-margin" },
};

afterEach(() => resetDisplaySession());

describe("toleranceWidget (kernel side)", () => {
  it("computes the map on workers with the same values as in-process, and bundles HTML, PNG and a summary", async () => {
    const w = await toleranceWidget(squeezed, SPEC, { workers: 2, target: 3, title: "detuning × coupling" });
    const direct = await toleranceMapInProcess(squeezed, SPEC);
    expect(Array.from(w.map.values)).toEqual(Array.from(direct.values));
    const bundle = await w.bundle({ includeRuntime: false });
    const html = bundle["text/html"] as string;
    const png = bundle["image/png"] as Uint8Array;
    expect(Array.from(png.subarray(0, 4))).toEqual([0x89, 0x50, 0x4e, 0x47]);
    expect(bundle["text/plain"]).toMatch(/^detuning × coupling: largest margin below the SQL/);
    expect(bundle["text/plain"]).toMatch(/cells at or above the target 3 dB: /);
    const json = new RegExp(`<script type="application/json" class="${TOLERANCE_STATE_CLASS}">([^]*?)</script>`).exec(html)![1];
    const state = loadToleranceState(json);
    expect(state.spec).toEqual(SPEC);
    expect(state.setup).toEqual(squeezed);
    expect(state.map.status).toEqual(Array.from(w.map.status));
    expect(html).toContain("<svg");
    expect(html).not.toMatch(/quietframeRuntime=/);
  });

  it("gives every failed cell its reason, beyond the few the map keeps", async () => {
    const w = await toleranceWidget(squeezed, SPEC, { workers: 1 });
    const failed = w.map.counts.unstable + w.map.counts.invalid;
    expect(failed).toBeGreaterThan(w.map.messages.length);
    expect(w.state.map.messages).toHaveLength(failed);
    for (const m of w.state.map.messages) expect(w.map.status[m.y * 5 + m.x]).toBe(m.status);
  });

  it("opens a cell's explorer in the kernel with the cell's values", async () => {
    const w = await toleranceWidget(squeezed, SPEC, { workers: 1 });
    const e = w.cellExplorer(2, 3);
    expect(e.state.values).toEqual({ "cavity.detuning": w.map.x.written[2], "cavity.inputCoupling": w.map.y.written[3] });
    expect(e.computation.fingerprint).toBe(computeExplorer(e.state).fingerprint);
    expect(e.figures.headline.bestMarginDb).toBe(w.map.values[3 * 5 + 2]);
  });
});
