import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../../src/cli/run";
import { QuietframeError } from "../../../src/errors";
import { trajectoryWidget } from "../../../widgets/notebook";
import { progressReporter } from "../../../widgets/trajectory/notebook";
import { loadTrajectoryState } from "../../../widgets/trajectory/document";
import { TRAJECTORY_CLASS, TRAJECTORY_STATE_CLASS } from "../../../widgets/trajectory/names";
import { hybrid, shortRun } from "./fixtures";

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
const dir = mkdtempSync(join(tmpdir(), "quietframe-trajectory-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function cli(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("trajectoryWidget in a notebook", () => {
  const w = trajectoryWidget(hybrid, shortRun());

  it("gives the numbers as plain arrays, with the band's inputs and the zero-point", () => {
    const f = w.figures;
    expect(f.fingerprint).toBe(w.state.fingerprint);
    expect(f.time).toHaveLength(401);
    expect(f.stepsTaken).toBe(2000);
    expect(f.stopped).toBe(false);
    expect(f.joint.map((j) => j.label)).toEqual(["x membrane + x cell", "x membrane"]);
    expect(f.joint[0].zeroPoint).toBe(1);
    expect(Object.keys(f.joint[0].parts).sort()).toEqual(["cell", "membrane"]);
    expect(f.entanglement?.pair).toEqual(["membrane", "cell"]);
    expect(Array.isArray(f.joint[0].conditional)).toBe(true);
  });

  it("shows live HTML carrying its state, a PNG fallback and a text summary with the fingerprint", async () => {
    const b = await w.bundle({ includeRuntime: false });
    const html = b["text/html"] as string;
    expect(html).toContain(`class="${TRAJECTORY_CLASS}"`);
    const m = new RegExp(`<script type="application/json" class="${TRAJECTORY_STATE_CLASS}">([\\s\\S]*?)</script>`).exec(html);
    expect(loadTrajectoryState(m![1]).fingerprintMatches).toBe(true);
    expect(
      Buffer.from(b["image/png"] as Uint8Array)
        .subarray(0, 8)
        .equals(PNG_SIGNATURE),
    ).toBe(true);
    expect(b["text/plain"]).toContain(`fingerprint: ${w.state.fingerprint}`);
  });

  it("reloads from its state text with the same curves", () => {
    const again = trajectoryWidget(w.stateText());
    expect(again.fingerprintMatches).toBe(true);
    expect(again.figures.fingerprint).toBe(w.figures.fingerprint);
  });

  it("set() reruns with new values, and a refused change keeps the last valid state", () => {
    const v = trajectoryWidget(hybrid, shortRun());
    const before = v.state;
    v.set({ simulation: { seed: 99 } });
    expect(v.state.simulation.seed).toBe(99);
    expect(v.state.fingerprint).not.toBe(before.fingerprint);
    const valid = v.state;
    for (const bad of [{ simulation: { step: "1 ms" } }, { simulation: { duration: "-5 us" } }, { simulation: { seed: 0.5 } }, { values: { "cell.field": "2 T" } }]) {
      expect(() => v.set(bad)).toThrow(QuietframeError);
      expect(v.state).toEqual(valid);
    }
  });

  it("needs simulation settings for a set-up, and says so", () => {
    expect(() => trajectoryWidget(hybrid)).toThrow(/options: is required for a set-up/);
  });
});

describe("quietframe render of a trajectory state", () => {
  const w = trajectoryWidget(hybrid, shortRun(11));
  const file = join(dir, "trajectory.json");
  writeFileSync(file, w.stateText());

  it("writes the CSV of exactly the stored run and reports its fingerprint", async () => {
    const out = join(dir, "t.csv");
    const r = await cli(["render", file, "-o", out]);
    expect(r.code, r.err).toBe(0);
    expect(r.out).toContain(w.state.fingerprint);
    expect(readFileSync(out, "utf8")).toBe((await w.staticFigures()).csv);
  });

  it("writes a standalone page and an SVG", async () => {
    for (const ext of ["html", "svg"]) {
      const out = join(dir, `t.${ext}`);
      const r = await cli(["render", file, "-o", out]);
      expect(r.code, r.err).toBe(0);
      const text = readFileSync(out, "utf8");
      expect(text).toContain(ext === "html" ? TRAJECTORY_CLASS : "<svg");
    }
  });

  it("warns about a fingerprint it does not reproduce, and refuses with --strict", async () => {
    const doc = JSON.parse(w.stateText());
    const id = Object.keys(doc.state)[0];
    doc.state[id].state.fingerprint = `sha256:${"1".repeat(64)}`;
    const bad = join(dir, "tampered.json");
    writeFileSync(bad, JSON.stringify(doc));
    const loose = await cli(["render", bad, "-o", join(dir, "x.csv")]);
    expect(loose.code).toBe(0);
    expect(loose.err).toMatch(/warning: the recomputed curves differ/);
    const strict = await cli(["render", bad, "-o", join(dir, "y.csv"), "--strict"]);
    expect(strict.code).toBe(1);
  });
});

describe("kernel-side progress", () => {
  it("is silent for a quick run and says at most one line a second for a long one", () => {
    let clock = 0;
    const lines: string[] = [];
    const r = progressReporter(
      () => clock,
      (t) => lines.push(t),
    );
    clock = 500;
    r.onProgress!(0.1, 100, 1000);
    expect(lines).toEqual([]);
    clock = 1200;
    r.onProgress!(0.3, 300, 1000);
    clock = 1700;
    r.onProgress!(0.5, 500, 1000);
    clock = 2300;
    r.onProgress!(0.8, 800, 1000);
    expect(lines).toEqual(["trajectory: 30 % (300 of 1000 steps)\n", "trajectory: 80 % (800 of 1000 steps)\n"]);
  });
});
