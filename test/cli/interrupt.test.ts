/**
 * Ctrl-C during `quietframe rank`, `optimize`, `spread` and `sweep local`: the run stops between steps,
 * the CLI prints "stopped after N of M" on stderr, nothing on stdout, and exits with status 130
 * (128 + SIGINT, the shells' convention: common practice, no source). The signal is delivered
 * in-process (process.emit) right after the command's first step, so the stop is deterministic;
 * without it the async commands print what the sync ones print.
 */
import { existsSync, mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCli, runCliAsync } from "../../src/cli/run";
import { startSweep } from "../sweep/helpers";

const squeezed = join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json");
const OPTIMIZE = ["optimize", squeezed, "--figure", "margin-at=1.16 MHz", "--param", "detector.efficiency=80 %:100 %", "--starts", "3"];
const SPREAD = ["spread", squeezed, "--figure", "margin-at=1.16 MHz", "--uncertain", "detector.efficiency=95 % ± 1 %", "--samples", "200", "--seed", "3"];
const RANK = ["rank", squeezed, "--figure", "margin-at=1.16 MHz", "--param", "detector.efficiency", "--param", "cavity.photons", "--param", "squeezer.angle", "--scan", "5"];
const dir = mkdtempSync(join(tmpdir(), "quietframe-interrupt-"));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/** Starts the command, sends SIGINT once its first step has run, and collects what it printed. */
async function interrupted(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const running = runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  process.emit("SIGINT");
  const code = await running;
  return { code, out, err };
}

describe("Ctrl-C stops long commands", () => {
  it("optimize stops after its first start, exit status 130, and removes its SIGINT handler", async () => {
    const handlers = process.listenerCount("SIGINT");
    const r = await interrupted(OPTIMIZE);
    expect(r).toEqual({ code: 130, out: "", err: "quietframe: optimize stopped after 1 of 3 starts; no result is given for a stopped run\n" });
    expect(process.listenerCount("SIGINT")).toBe(handlers);
  });

  it("rank stops after its first parameter, exit status 130, and removes its SIGINT handler", async () => {
    const handlers = process.listenerCount("SIGINT");
    const r = await interrupted(RANK);
    expect(r).toEqual({ code: 130, out: "", err: "quietframe: ranking stopped after 1 of 3 parameters; no result is given for a stopped run\n" });
    expect(process.listenerCount("SIGINT")).toBe(handlers);
  });

  it("spread stops after its first block of samples, exit status 130", async () => {
    const r = await interrupted(SPREAD);
    expect(r).toEqual({ code: 130, out: "", err: "quietframe: spread stopped after 2 of 200 samples; no result is given for a stopped run\n" });
  });

  it("sweep local stops and writes no result file", async () => {
    const file = join(dir, "starts.json");
    writeFileSync(file, JSON.stringify(startSweep()));
    const output = join(dir, "merged.json");
    const r = await interrupted(["sweep", "local", file, "--output", output]);
    expect(r.code).toBe(130);
    expect(r.out).toBe("");
    expect(r.err).toMatch(/^quietframe: optimize stopped after 1 of 5 starts/);
    expect(existsSync(output)).toBe(false);
  });

  it("not interrupted, the binary's async commands print what the sync ones print", async () => {
    for (const argv of [RANK, OPTIMIZE, SPREAD]) {
      let syncOut = "";
      let asyncOut = "";
      expect(runCli(argv, { out: (s) => (syncOut += s), err: () => undefined })).toBe(0);
      expect(await runCliAsync(argv, { out: (s) => (asyncOut += s), err: () => undefined })).toBe(0);
      expect(asyncOut).toBe(syncOut);
    }
  });
});
