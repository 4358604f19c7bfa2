/**
 * Chunks merged give the bits of the same sweep run locally on the worker pool (the claim
 * under test; the reference is the engine's own toleranceMap and spreadAnalysisOnThreads,
 * themselves tested against cell-by-cell evaluation and the in-process spread). Merge refuses
 * missing, truncated, damaged and foreign chunk files and names each; the merged states open
 * in their widget kinds and carry the sweep's fingerprint.
 */
import { copyFileSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { mergeSweep, openSweepDir, planSweep, runChunk, runSweepLocally, type SweepDescription, type SweepDir, type SweepResult } from "../../src/sweep";
import { sweepStateText } from "../../src/cli/sweep-state";
import { loadWidgetState } from "../../widgets/registry";
import { gridSweep, sampleSweep, scratch, startSweep } from "./helpers";

const tmp = scratch();
afterAll(tmp.cleanup);

async function planAndRun(description: SweepDescription, label: string): Promise<SweepDir> {
  const dir = planSweep(description, join(tmp.make(label), "sweep"));
  // Each chunk as a separate job would run it: from the directory alone, in any order.
  for (let k = dir.sweep.chunks - 1; k >= 0; k--) await runChunk(openSweepDir(dir.dir), k, {});
  return dir;
}

function refusals(dir: SweepDir): QuietframeError[] {
  try {
    mergeSweep(openSweepDir(dir.dir));
  } catch (e) {
    if (e instanceof QuietframeError) return [e];
    if (e instanceof QuietframeErrors) return e.problems;
    throw e;
  }
  throw new Error("merged");
}

const bytes = (a: Float64Array | Uint8Array) => Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString("hex");

describe.each([
  ["grid", gridSweep],
  ["samples", sampleSweep],
  ["starts", startSweep],
] as const)("a %s sweep", (label, make) => {
  let dir: SweepDir;
  let merged: SweepResult;
  let local: SweepResult;
  beforeAll(async () => {
    dir = await planAndRun(make(), label);
    merged = mergeSweep(openSweepDir(dir.dir));
    local = await runSweepLocally(make(), { workers: 2 });
  });

  it("merges to the bits of the local run on 2 worker threads, and to the same state file", () => {
    expect(merged.sweep).toBe(local.sweep);
    expect(merged.fingerprint).toBe(local.fingerprint);
    if (merged.outcome.kind === "grid" && local.outcome.kind === "grid") {
      expect(bytes(merged.outcome.map.values)).toBe(bytes(local.outcome.map.values));
      expect(bytes(merged.outcome.map.status)).toBe(bytes(local.outcome.map.status));
      expect(merged.outcome.map.messages).toEqual(local.outcome.map.messages);
    } else if (merged.outcome.kind === "samples" && local.outcome.kind === "samples") {
      const m = merged.outcome.spread;
      const l = local.outcome.spread;
      expect(bytes(m.values)).toBe(bytes(l.values));
      expect(m.failed).toEqual(l.failed);
      expect(m.failed.unstable).toBeGreaterThan(0);
      expect(m.evaluations).toBe(l.evaluations);
      expect(bytes(m.bands!.p95)).toBe(bytes(l.bands!.p95));
      expect(m.distribution).toEqual(l.distribution);
    } else if (merged.outcome.kind === "starts" && local.outcome.kind === "starts") {
      const m = merged.outcome.optimum;
      const l = local.outcome.optimum;
      expect(m.status).toBe("ok");
      expect(m.starts).toEqual(l.starts);
      expect(bytes(Float64Array.from(m.starts, (s) => s.figure))).toBe(bytes(Float64Array.from(l.starts, (s) => s.figure)));
      expect(m.optimum).toEqual(l.optimum);
      expect(bytes(Float64Array.of(m.optimum!.figure, ...m.optimum!.values.map((v) => v.value)))).toBe(bytes(Float64Array.of(l.optimum!.figure, ...l.optimum!.values.map((v) => v.value))));
      expect(m.evaluations).toBe(l.evaluations);
      expect(m.message).toBe(l.message);
    } else throw new Error("different kinds");
    expect(sweepStateText(merged)).toBe(sweepStateText(local));
  });

  it("opens in its widget kind with the sweep's fingerprint in its state", () => {
    const { kind, loaded } = loadWidgetState(sweepStateText(merged), "merged.json");
    expect(kind.name).toBe(label === "grid" ? "tolerance" : "design");
    if (label !== "grid") expect((loaded.state as { answer: { kind: string } }).answer.kind).toBe(label === "samples" ? "spread" : "optimum");
    const state = loaded.state as { sweep?: { fingerprint: string; result: string } };
    expect(state.sweep).toEqual({ fingerprint: merged.sweep, result: merged.fingerprint });
    // A design answer is checked against its stored fingerprint (not computed again: that would be the whole sweep).
    if (loaded.fingerprint) expect(loaded.fingerprint.recomputed).toBe(loaded.fingerprint.stored);
  });

  it("refuses a missing chunk, naming its file and items", () => {
    const copy = planSweep(make(), join(tmp.make(`${label}-missing`), "sweep"));
    for (let k = 0; k < copy.sweep.chunks; k++) copyFileSync(dir.chunkPath(k), copy.chunkPath(k));
    rmSync(copy.chunkPath(1));
    const [e, ...more] = refusals(copy);
    expect(more).toEqual([]);
    expect(e.path).toMatch(/chunks\/chunk-000001\.json$/);
    expect(e.problem).toMatch(/^is missing \(chunk 1, items \d+ … \d+\)$/);
  });

  it("refuses a truncated and a damaged chunk, naming each file", () => {
    const copy = planSweep(make(), join(tmp.make(`${label}-corrupt`), "sweep"));
    for (let k = 0; k < copy.sweep.chunks; k++) copyFileSync(dir.chunkPath(k), copy.chunkPath(k));
    const text = readFileSync(copy.chunkPath(0), "utf8");
    writeFileSync(copy.chunkPath(0), text.slice(0, Math.floor(text.length / 2)));
    // One character of the base64 figures (of a start's values) changed: still JSON, still the right shape, not the same numbers.
    const damaged = readFileSync(copy.chunkPath(2), "utf8").replace(/"(values|start)":"(.)/, (_m, field: string, c: string) => `"${field}":"${c === "A" ? "B" : "A"}`);
    writeFileSync(copy.chunkPath(2), damaged);
    const problems = refusals(copy);
    expect(problems.map((p) => p.path.replace(/^.*chunks\//, ""))).toEqual(["chunk-000000.json", "chunk-000002.json"]);
    expect(problems[0].problem).toBe("is truncated or not JSON");
    expect(problems[1].problem).toBe("does not match its checksum (changed or damaged after it was written)");
  });

  it("refuses a chunk of another sweep mixed into the directory, and a chunk under another chunk's name", async () => {
    const foreign = planSweep(make({ name: "another sweep" }), join(tmp.make(`${label}-foreign`), "sweep"));
    await runChunk(foreign, 0, {});
    const copy = planSweep(make(), join(tmp.make(`${label}-mixed`), "sweep"));
    for (let k = 0; k < copy.sweep.chunks; k++) copyFileSync(dir.chunkPath(k), copy.chunkPath(k));
    copyFileSync(foreign.chunkPath(0), copy.chunkPath(0));
    copyFileSync(dir.chunkPath(2), copy.chunkPath(1));
    const problems = refusals(copy);
    expect(problems[0].problem).toMatch(/^belongs to another sweep \(sha256:[0-9a-f]{64}, not sha256:[0-9a-f]{64}\)$/);
    expect(problems[1].problem).toMatch(/^holds chunk 2 \(items \d+ … \d+\), not chunk 1/);
  });

  it("an edited sweep.json no longer opens as the planned sweep", () => {
    const copy = planSweep(make(), join(tmp.make(`${label}-edited`), "sweep"));
    const file = join(copy.dir, "sweep.json");
    writeFileSync(
      file,
      readFileSync(file, "utf8")
        .replace('"chunkSize"', '"name": "renamed",\n  "chunkSize"')
        .replace(/"name": "membrane-[a-z]+",\n/, ""),
    );
    expect(() => openSweepDir(copy.dir)).toThrow(/is not the sweep planned here/);
  });
});
