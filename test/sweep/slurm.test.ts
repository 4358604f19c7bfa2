/**
 * Sweeps through a real Slurm (Debian's slurm-wlm 22.05 with munge, a single node of the
 * test's own: ./local-slurm.ts) and the built CLI on its nodes: a sweep submitted as an array
 * with an afterok merge merges to the bits of the local run on the worker pool; a chunk whose
 * result is lost, and a chunk cancelled mid-run with scancel (status: failed), are the only
 * chunks submitted again; two merges started at once leave one correct result. The reference
 * is the local run (the claim is identity with it; common practice, no outside source).
 * Where the local Slurm cannot start (not root, packages missing) the suite fails and says why.
 */
import { spawn, spawnSync } from "node:child_process";
import { existsSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { cliCommand } from "../../src/cli/sweep-command";
import { sweepStateText } from "../../src/cli/sweep-state";
import { runSweepLocally, type SweepDescription, type Submission } from "../../src/sweep";
import { gridSweep, scratch } from "./helpers";
import { startLocalSlurm, waitFor, type LocalSlurm } from "./local-slurm";

const tmp = scratch();
let slurm: LocalSlurm | undefined;
let savedConf: string | undefined;

beforeAll(async () => {
  slurm = await startLocalSlurm();
  savedConf = process.env.SLURM_CONF;
  process.env.SLURM_CONF = slurm.conf;
}, 60_000);

afterAll(async () => {
  if (savedConf === undefined) delete process.env.SLURM_CONF;
  else process.env.SLURM_CONF = savedConf;
  await slurm?.stop();
  tmp.cleanup();
}, 60_000);

async function cli(...argv: string[]): Promise<string> {
  let out = "";
  let err = "";
  const code = await runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  if (code !== 0) throw new Error(`quietframe ${argv.join(" ")} failed (${code}): ${err}`);
  return out;
}

function plan(description: SweepDescription, label: string): Promise<string> {
  const root = tmp.make(label);
  writeFileSync(join(root, "sweep.json"), JSON.stringify(description));
  const dir = join(root, "planned");
  return cli("sweep", "plan", join(root, "sweep.json"), dir).then(() => dir);
}

const SUBMIT = ["--time", "5", "--mem", "300M"];

function lastSubmission(dir: string): Submission {
  const list = JSON.parse(readFileSync(join(dir, "slurm", "jobs.json"), "utf8")) as Submission[];
  return list[list.length - 1];
}

/** Jobs of ours still in the queue. */
function queued(jobs: readonly (string | null)[]): string[] {
  const out = spawnSync("squeue", ["--noheader", "--array", "--format=%i %T"], { encoding: "utf8" }).stdout ?? "";
  return out
    .split("\n")
    .map((l) => l.trim())
    .filter((l) => jobs.some((j) => j !== null && (l.startsWith(`${j}_`) || l.startsWith(`${j} `))));
}

async function mergedAfter(dir: string, s: Submission, ms = 40_000): Promise<string> {
  const file = join(dir, "merged.json");
  await waitFor(
    () => existsSync(file) && queued([s.array, s.merge]).length === 0,
    ms,
    () => `no merged.json after ${ms} ms; queue: ${queued([s.array, s.merge]).join("; ")}; merge log: ${logs(dir)}`,
  );
  return readFileSync(file, "utf8");
}

function logs(dir: string): string {
  const d = join(dir, "slurm");
  return readdirSync(d)
    .filter((f) => f.endsWith(".out"))
    .map((f) => `${f}: ${readFileSync(join(d, f), "utf8").trim()}`)
    .join(" | ");
}

async function status(dir: string): Promise<{ slurm: boolean; chunkStates: { chunk: number; state: string; detail?: string }[] }> {
  return JSON.parse(await cli("sweep", "status", dir, "--format", "json"));
}

describe("sweeps on a real Slurm", () => {
  let dir: string;
  let local: string;

  it("an array with an afterok merge gives the local run's bits", async () => {
    const description = gridSweep();
    dir = await plan(description, "slurm-grid");
    local = sweepStateText(await runSweepLocally(description, { workers: 2 }));
    await cli("sweep", "submit", dir, ...SUBMIT, "--concurrency", "2");
    const s = lastSubmission(dir);
    expect(s.chunks).toEqual([0, 1, 2]);
    expect(await mergedAfter(dir, s)).toBe(local);
    expect((await status(dir)).chunkStates.map((c) => c.state)).toEqual(["done", "done", "done"]);
  }, 60_000);

  it("a chunk whose result is lost is the only one submitted again", async () => {
    rmSync(join(dir, "chunks", "chunk-000001.json"));
    rmSync(join(dir, "merged.json"));
    const st = await status(dir);
    expect(st.slurm).toBe(true);
    expect(st.chunkStates.map((c) => c.state)).toEqual(["done", "missing", "done"]);
    await cli("sweep", "submit", dir, ...SUBMIT);
    const s = lastSubmission(dir);
    expect(s.chunks).toEqual([1]);
    expect(readFileSync(join(dir, "slurm", "chunks.sbatch"), "utf8")).toContain("#SBATCH --array=1%1\n");
    expect(await mergedAfter(dir, s)).toBe(local);
  }, 60_000);

  it("two merges started at once leave one correct result and no temporary file", async () => {
    rmSync(join(dir, "merged.json"));
    const [node, main] = cliCommand();
    const merge = () =>
      new Promise<number | null>((resolve) => {
        const child = spawn(node, [main, "sweep", "merge", dir], { stdio: "ignore" });
        child.on("exit", resolve);
      });
    expect(await Promise.all([merge(), merge()])).toEqual([0, 0]);
    expect(readFileSync(join(dir, "merged.json"), "utf8")).toBe(local);
    expect(readdirSync(dir).filter((f) => f.startsWith(".writing-"))).toEqual([]);
  }, 30_000);

  it("a chunk cancelled mid-run shows as failed, and only it is submitted again", async () => {
    // Chunks of about a second each, one at a time, so that chunk 1 is cancelled while it computes.
    const slow = gridSweep({
      name: "slow",
      vary: { kind: "grid", x: { target: "squeezer.squeezing", from: "-15 dB", to: "-3 dB", points: 60 }, y: { target: "cavity.inputCoupling", from: "70 %", to: "99 %", points: 18 } },
      grid: { from: "1.1 MHz", to: "1.3 MHz", points: 400 },
      chunkSize: 6,
    });
    const slowDir = await plan(slow, "slurm-cancel");
    await cli("sweep", "submit", slowDir, ...SUBMIT, "--concurrency", "1");
    const first = lastSubmission(slowDir);
    const started = join(slowDir, "chunks", "chunk-000001.started");
    await waitFor(
      () => existsSync(started),
      30_000,
      () => `chunk 1 never started: ${logs(slowDir)}`,
    );
    expect((await status(slowDir)).chunkStates[1].state).toBe("running");
    expect(spawnSync("scancel", [`${first.array}_1`]).status).toBe(0);
    await waitFor(
      () => queued([first.array]).length === 0,
      30_000,
      () => `the array did not finish: ${queued([first.array]).join("; ")}`,
    );
    const after = await status(slowDir);
    expect(after.chunkStates.map((c) => c.state)).toEqual(["done", "failed", "done"]);
    expect(after.chunkStates[1].detail).toMatch(/stopped by SIGTERM|left the queue without a result/);
    // The first merge waits on an array that can no longer succeed: it is cancelled by hand, as docs/sweeps.md says.
    spawnSync("scancel", [first.merge]);
    await cli("sweep", "submit", slowDir, ...SUBMIT);
    const again = lastSubmission(slowDir);
    expect(again.chunks).toEqual([1]);
    await mergedAfter(slowDir, again);
    expect((await status(slowDir)).chunkStates.map((c) => c.state)).toEqual(["done", "done", "done"]);
  }, 60_000);
});
