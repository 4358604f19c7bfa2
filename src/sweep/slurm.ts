/**
 * A planned sweep and Slurm's client commands: writing its sbatch scripts into slurm/,
 * submitting the array and the afterok merge with sbatch (only chunks that are missing or
 * failed), keeping the job ids in slurm/jobs.json, and reading the array's tasks back from
 * squeue. Node only.
 */
import { spawnSync } from "node:child_process";
import { readFileSync } from "node:fs";
import { join } from "node:path";
import { QuietframeError } from "../errors";
import { atomicWrite } from "./atomic-write";
import { checkSlurmRequest, chunkScript, mergeScript, type CommandPrefix, type ScriptContext, type SlurmRequest } from "./slurm-script";
import { chunksToRun, sweepStatus, type QueuedTasks } from "./status";
import type { SweepDir } from "./sweep-dir";

export interface WrittenScripts {
  /** Chunks the array script runs (empty: every chunk is done, running or pending). */
  readonly chunks: readonly number[];
  /** Absent when there is nothing to run. */
  readonly chunkScript?: string;
  readonly mergeScript: string;
}

/** One submission, as kept in slurm/jobs.json. */
export interface Submission {
  readonly array: string | null;
  readonly chunks: readonly number[];
  readonly merge: string;
  readonly at: string;
}

/** Writes the scripts for the chunks still to run (missing or failed) into the sweep's slurm/ folder. */
export function writeSlurmScripts(dir: SweepDir, request: SlurmRequest, command: CommandPrefix, queue?: QueuedTasks): WrittenScripts {
  checkSlurmRequest(request);
  const chunks = chunksToRun(sweepStatus(dir, queue));
  const ctx: ScriptContext = { dir: dir.dir, name: dir.sweep.description.name ?? "sweep", fingerprint: dir.sweep.fingerprint, chunkCount: dir.sweep.chunks, command };
  const merge = join(dir.slurmDir, "merge.sbatch");
  atomicWrite(merge, mergeScript(ctx, request));
  if (chunks.length === 0) return { chunks, mergeScript: merge };
  const array = join(dir.slurmDir, "chunks.sbatch");
  atomicWrite(array, chunkScript(ctx, chunks, request));
  return { chunks, chunkScript: array, mergeScript: merge };
}

/** Writes the scripts and submits them: the array (if any chunk is to run), then the merge with afterok on it. */
export function submitSweep(dir: SweepDir, request: SlurmRequest, command: CommandPrefix): Submission {
  const written = writeSlurmScripts(dir, request, command, queuedTasks(dir));
  const array = written.chunkScript ? sbatch([written.chunkScript]) : null;
  const merge = sbatch(array ? [`--dependency=afterok:${array}`, written.mergeScript] : [written.mergeScript]);
  const submission: Submission = { array, chunks: written.chunks, merge, at: new Date().toISOString() };
  atomicWrite(jobsFile(dir), `${JSON.stringify([...submissions(dir), submission], null, 2)}\n`);
  return submission;
}

/** The submissions made so far (slurm/jobs.json). */
export function submissions(dir: SweepDir): Submission[] {
  try {
    const list = JSON.parse(readFileSync(jobsFile(dir), "utf8")) as unknown;
    return Array.isArray(list) ? (list as Submission[]) : [];
  } catch {
    return [];
  }
}

/**
 * This sweep's array tasks in Slurm's queue, by chunk; undefined when squeue is not there or
 * does not answer (no Slurm on this machine). Only the sweep's own array jobs are looked at.
 */
export function queuedTasks(dir: SweepDir): QueuedTasks | undefined {
  const arrays = submissions(dir)
    .map((s) => s.array)
    .filter((a): a is string => a !== null);
  // --array: one line per array task, pending ones included. Every job is listed and ours picked out:
  // asking for a long-finished job id by name is an error in some Slurm versions.
  const out = spawnSync("squeue", ["--noheader", "--array", "--format=%i %T"], { encoding: "utf8" });
  if (out.error || out.status !== 0) return undefined;
  const tasks = new Map<number, { job: string; state: string }>();
  for (const line of (out.stdout ?? "").split("\n")) {
    const m = /^(\d+)_(\d+)\s+(\S+)/.exec(line.trim());
    if (m && arrays.includes(m[1])) tasks.set(Number(m[2]), { job: `${m[1]}_${m[2]}`, state: m[3] });
  }
  return tasks;
}

function jobsFile(dir: SweepDir): string {
  return join(dir.slurmDir, "jobs.json");
}

/** Runs sbatch --parsable with the arguments; returns the job id. */
function sbatch(args: readonly string[]): string {
  const run = spawnSync("sbatch", ["--parsable", ...args], { encoding: "utf8" });
  if (run.error) {
    const missing = (run.error as NodeJS.ErrnoException).code === "ENOENT";
    throw new QuietframeError({
      path: "sbatch",
      problem: missing ? "is not on PATH: Slurm's client commands are needed to submit" : `could not be run (${run.error.message})`,
      allowed: "a machine where sbatch works (a cluster's login node), or `quietframe sweep script` and submitting the scripts by hand",
    });
  }
  const id = /^(\d+)/.exec((run.stdout ?? "").trim())?.[1];
  if (run.status !== 0 || !id) {
    throw new QuietframeError({
      path: "sbatch",
      value: args.join(" "),
      problem: `refused the job: ${(run.stderr || run.stdout || `exit status ${run.status}`).trim()}`,
      allowed: "a request this cluster accepts (partition, account, time, memory)",
    });
  }
  return id;
}
