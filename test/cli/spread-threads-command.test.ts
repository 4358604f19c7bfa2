/**
 * `quietframe spread --threads N`: the samples on N worker threads print exactly what the run in
 * this process prints (text and JSON, same seed), Ctrl-C stops it with status 130, and its errors
 * name the options as the run in this process names them. Needs the built worker script
 * (dist/src/tolerance/worker.js), as the other thread tests do. Reference: the in-process run
 * itself (common practice, no outside source: the claim is identity with it).
 */
import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runCli, runCliAsync } from "../../src/cli/run";

const squeezed = join(__dirname, "..", "..", "examples", "cryogenic-membrane-squeezed.json");
const SPREAD = [
  "spread",
  squeezed,
  "--figure",
  "margin-at=1.16 MHz",
  "--uncertain",
  "detector.efficiency=95 % ± 1 %",
  "--uncertain",
  "squeezer.angle=60 deg ± 2 deg",
  "--samples",
  "200",
  "--seed",
  "3",
  "--target",
  "4 dB",
  "--points",
  "64",
];

async function runAsync(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("quietframe spread --threads", () => {
  it("prints on 2 worker threads exactly what it prints in this process, as text and as JSON", async () => {
    for (const extra of [[], ["--format", "json"]]) {
      const here = await runAsync(...SPREAD, ...extra);
      const threads = await runAsync(...SPREAD, ...extra, "--threads", "2");
      expect(here.code).toBe(0);
      expect(here.out.length).toBeGreaterThan(200);
      expect(threads).toEqual(here);
    }
  });

  it("stops on Ctrl-C with status 130 and prints nothing on stdout", async () => {
    let out = "";
    let err = "";
    const running = runCliAsync([...SPREAD, "--threads", "2"], { out: (s) => (out += s), err: (s) => (err += s) });
    process.emit("SIGINT");
    const code = await running;
    expect(code).toBe(130);
    expect(out).toBe("");
    expect(err).toMatch(/^quietframe: spread stopped after \d+ of 200 samples; no result is given for a stopped run\n$/);
  });

  it("names the option in its errors: a bad thread count, the synchronous runner, a check made before the threads start", async () => {
    for (const bad of ["0", "two", "2.5"]) {
      const r = await runAsync(...SPREAD, "--threads", bad);
      expect(r.code).toBe(1);
      expect(r.out).toBe("");
      expect(r.err).toMatch(new RegExp(`^quietframe: --threads = "${bad}": is not a (whole|usable) number`));
    }
    let err = "";
    expect(runCli([...SPREAD, "--threads", "2"], { out: () => undefined, err: (s) => (err += s) })).toBe(1);
    expect(err).toMatch(/^quietframe: --threads = 2: worker threads need the asynchronous runner; allowed: runCliAsync/);
    const zeroSamples = [...SPREAD.slice(0, SPREAD.indexOf("--samples")), "--samples", "0", ...SPREAD.slice(SPREAD.indexOf("--samples") + 2)];
    const here = await runAsync(...zeroSamples);
    const threads = await runAsync(...zeroSamples, "--threads", "2");
    expect(here.code).toBe(1);
    expect(here.err).toMatch(/^quietframe: --samples/);
    expect(threads).toEqual(here);
  });
});
