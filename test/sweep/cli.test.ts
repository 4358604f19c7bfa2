/**
 * `quietframe sweep` in-process: plan, run (chunk from --chunk or SLURM_ARRAY_TASK_ID), status,
 * merge, local, and the merged files rendered by `quietframe render --strict`; mistyped
 * subcommands get the nearest one; bad chunk indexes and directories are named. Reference:
 * the local run's file (the claim is identity with it; common practice, no outside source).
 */
import { existsSync, readdirSync, readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { kindOf } from "../../widgets/registry";
import { gridSweep, sampleSweep, scratch, startSweep } from "./helpers";

const tmp = scratch();
afterAll(tmp.cleanup);

async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("quietframe sweep", () => {
  it.each([
    ["grid", gridSweep, "tolerance"],
    ["samples", sampleSweep, "design"],
    ["starts", startSweep, "design"],
  ] as const)("%s: plan, run every chunk, status, merge; the merged file is the local run's, a %s state, and renders", async (label, make, kind) => {
    const root = tmp.make(`cli-${label}`);
    const file = join(root, "sweep.json");
    // The set-up as a path relative to the sweep file, as the examples write it.
    writeFileSync(join(root, "setup.json"), JSON.stringify(make().setup));
    writeFileSync(file, JSON.stringify({ ...make(), setup: "setup.json" }));
    const dir = join(root, "planned");

    const plan = await cli("sweep", "plan", file, dir);
    expect(plan.err).toBe("");
    expect(plan.out).toMatch(/^planned \d+ chunks of up to \d+ (rows|samples|starts)/);

    const before = await cli("sweep", "status", dir);
    expect(before.out).toMatch(/: \d+ chunks: 0 done, 0 running, 0 pending, 0 failed, (\d+) missing/);

    const chunks = Number(/planned (\d+) chunks/.exec(plan.out)![1]);
    const saved = process.env.SLURM_ARRAY_TASK_ID;
    try {
      for (let k = 0; k < chunks; k++) {
        // Half the chunks as an array task would name them, half by hand.
        if (k % 2 === 0) process.env.SLURM_ARRAY_TASK_ID = String(k);
        const run = k % 2 === 0 ? await cli("sweep", "run", dir) : await cli("sweep", "run", dir, "--chunk", String(k));
        expect(run.err).toBe("");
        expect(run.code).toBe(0);
      }
    } finally {
      if (saved === undefined) delete process.env.SLURM_ARRAY_TASK_ID;
      else process.env.SLURM_ARRAY_TASK_ID = saved;
    }
    expect(readdirSync(join(dir, "chunks")).filter((f) => !/^chunk-\d{6}\.json$/.test(f))).toEqual([]);

    const status = await cli("sweep", "status", dir, "--format", "json");
    expect(JSON.parse(status.out).counts.done).toBe(chunks);

    const merge = await cli("sweep", "merge", dir);
    expect(merge.err).toBe("");
    expect(merge.out).toContain(`merged ${chunks} chunks into ${join(dir, "merged.json")}`);
    const local = join(root, "local.json");
    expect((await cli("sweep", "local", file, "-o", local, "--threads", "2")).code).toBe(0);
    expect(readFileSync(join(dir, "merged.json"), "utf8")).toBe(readFileSync(local, "utf8"));
    expect(kindOf(readFileSync(local, "utf8")).name).toBe(kind);

    const page = join(root, "merged.html");
    const render = await cli("render", join(dir, "merged.json"), "-o", page, "--strict");
    expect(render.err).not.toMatch(/warning|quietframe:/);
    expect(render.code).toBe(0);
    expect(existsSync(page)).toBe(true);
    const fingerprint = /^sweep\s+(sha256:[0-9a-f]{64})$/m.exec(merge.out)![1];
    expect(readFileSync(page, "utf8")).toContain(fingerprint);
  });

  it("a mistyped subcommand gets the nearest one", async () => {
    const r = await cli("sweep", "mrege", "x");
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain('quietframe: sweep = "mrege": is not a sweep subcommand (did you mean "merge"?); allowed: plan, run, merge, status, script, submit, local');
    expect((await cli("swep")).err).toContain('did you mean "sweep"?');
  });

  it("a chunk index out of range, a missing index and a directory that is not a sweep are named", async () => {
    const root = tmp.make("cli-bad");
    writeFileSync(join(root, "sweep.json"), JSON.stringify(gridSweep()));
    const dir = join(root, "planned");
    await cli("sweep", "plan", join(root, "sweep.json"), dir);
    const saved = process.env.SLURM_ARRAY_TASK_ID;
    delete process.env.SLURM_ARRAY_TASK_ID;
    try {
      expect((await cli("sweep", "run", dir, "--chunk", "3")).err).toContain('quietframe: --chunk = "3": is not a chunk of this sweep; allowed: an integer from 0 to 2');
      expect((await cli("sweep", "run", dir)).err).toContain("quietframe: SLURM_ARRAY_TASK_ID: no chunk index given");
    } finally {
      if (saved !== undefined) process.env.SLURM_ARRAY_TASK_ID = saved;
    }
    const notSweep = await cli("sweep", "merge", root);
    expect(notSweep.code).toBe(1);
    expect(notSweep.err).toContain(`quietframe: ${join(root, "plan.json")}: does not exist; allowed: a directory made by \`quietframe sweep plan\``);
    const incomplete = await cli("sweep", "merge", dir);
    expect(incomplete.code).toBe(1);
    expect(incomplete.err.match(/chunk-00000\d\.json: is missing/g)).toHaveLength(3);
    expect(existsSync(join(dir, "merged.json"))).toBe(false);
    const other = join(root, "other.json");
    writeFileSync(other, JSON.stringify(gridSweep({ chunkSize: 1 })));
    expect((await cli("sweep", "plan", other, dir)).err).toMatch(/planned: already holds another sweep \(sha256:/);
  });

  it("script writes the array and merge scripts for the chunks still to run", async () => {
    const root = tmp.make("cli-script");
    writeFileSync(join(root, "sweep.json"), JSON.stringify(gridSweep()));
    const dir = join(root, "planned");
    await cli("sweep", "plan", join(root, "sweep.json"), dir);
    await cli("sweep", "run", dir, "--chunk", "1");
    const r = await cli("sweep", "script", dir, "--time", "10", "--mem", "1G", "--concurrency", "2", "--partition", "short");
    expect(r.err).toBe("");
    const script = readFileSync(join(dir, "slurm", "chunks.sbatch"), "utf8");
    expect(script).toContain("#SBATCH --array=0,2%2\n");
    expect(script).toContain("#SBATCH --partition=short\n");
    expect(readFileSync(join(dir, "slurm", "merge.sbatch"), "utf8")).toContain(`sweep merge ${dir}`);
    const bad = await cli("sweep", "script", dir, "--time", "soon");
    expect(bad.err).toContain('quietframe: --time = "soon": is not a Slurm time limit');
    expect((await cli("sweep", "script", dir, "--concurrency", "many")).err).toContain('quietframe: --concurrency = "many": is not a usable number of tasks running at once; allowed: an integer ≥ 1');
    expect((await cli("sweep", "local", join(root, "sweep.json"), "--threads", "0")).err).toContain('quietframe: --threads = "0": is not a usable number of worker threads');
  });
});
