/**
 * A planned sweep on disk: the directory `quietframe sweep plan` makes, which every chunk job,
 * the merge and the status read (it lives on a file system the cluster's nodes share).
 *
 *   sweep.json          the checked description (set-up inline, chunk size written in)
 *   plan.json           fingerprint, kind, items, chunk size and count (for people and scripts)
 *   chunks/             chunk-000007.json results; .started and .failed markers beside them
 *   slurm/              the sbatch scripts, the submitted job ids, Slurm's job output
 *
 * Node only.
 */
import { existsSync, mkdirSync, readFileSync } from "node:fs";
import { join, resolve } from "node:path";
import { QuietframeError } from "../errors";
import { QUIETFRAME_VERSION } from "../version";
import { atomicWrite, unwritable } from "./atomic-write";
import { chunkFileName } from "./chunk-file";
import { chunkRange, type ChunkRange } from "./chunks";
import { resolveSweep, type ResolvedSweep } from "./resolve";
import type { VaryKind } from "./format";

export const PLAN_FORMAT = "quietframe.sweep-plan";

/** What plan.json says. */
export interface PlanSummary {
  readonly format: typeof PLAN_FORMAT;
  readonly quietframe: string;
  readonly sweep: string;
  readonly name: string | null;
  readonly kind: VaryKind;
  readonly items: number;
  readonly chunkSize: number;
  readonly chunks: number;
}

export interface SweepDir {
  /** Absolute path of the directory. */
  readonly dir: string;
  readonly sweep: ResolvedSweep;
  readonly chunksDir: string;
  readonly slurmDir: string;
  range(chunk: number): ChunkRange;
  /** Result file of a chunk. */
  chunkPath(chunk: number): string;
  /** Marker files: a run started (and has not finished), a run failed. */
  startedPath(chunk: number): string;
  failedPath(chunk: number): string;
}

/** Checks a description and lays out its directory (again: the same sweep keeps its chunks; another sweep is refused). */
export function planSweep(description: unknown, dir: string): SweepDir {
  const sweep = resolveSweep(description);
  const root = resolve(dir);
  const planFile = join(root, "plan.json");
  if (existsSync(planFile)) {
    const old = readPlanSummary(root);
    if (old.sweep !== sweep.fingerprint) {
      throw new QuietframeError({ path: root, problem: `already holds another sweep (${old.sweep})`, allowed: "an empty or new directory, or the same sweep again" });
    }
  }
  try {
    for (const d of [root, join(root, "chunks"), join(root, "slurm")]) mkdirSync(d, { recursive: true });
  } catch (e) {
    throw unwritable(root, e);
  }
  atomicWrite(join(root, "sweep.json"), `${JSON.stringify(sweep.description, null, 2)}\n`);
  atomicWrite(planFile, `${JSON.stringify(planSummary(sweep), null, 2)}\n`);
  return sweepDir(root, sweep);
}

/** Opens a planned sweep directory: the description is checked and resolved again, and must still be the sweep of plan.json. */
export function openSweepDir(dir: string): SweepDir {
  const root = resolve(dir);
  const summary = readPlanSummary(root);
  const file = join(root, "sweep.json");
  const sweep = resolveSweep(readJson(file, "the sweep.json that `quietframe sweep plan` wrote"));
  if (sweep.fingerprint !== summary.sweep) {
    throw new QuietframeError({
      path: file,
      value: sweep.fingerprint,
      problem: `is not the sweep planned here (plan.json says ${summary.sweep}); it was edited, or written by another quietframe version (${summary.quietframe}, this is ${QUIETFRAME_VERSION})`,
      allowed: "plan the edited sweep into a new directory",
    });
  }
  return sweepDir(root, sweep);
}

function sweepDir(root: string, sweep: ResolvedSweep): SweepDir {
  const chunksDir = join(root, "chunks");
  const name = (chunk: number) => chunkFileName(chunk).replace(/\.json$/, "");
  return {
    dir: root,
    sweep,
    chunksDir,
    slurmDir: join(root, "slurm"),
    range: (chunk) => chunkRange(sweep.items, sweep.chunkSize, chunk),
    chunkPath: (chunk) => join(chunksDir, chunkFileName(chunk)),
    startedPath: (chunk) => join(chunksDir, `${name(chunk)}.started`),
    failedPath: (chunk) => join(chunksDir, `${name(chunk)}.failed`),
  };
}

function planSummary(s: ResolvedSweep): PlanSummary {
  return { format: PLAN_FORMAT, quietframe: QUIETFRAME_VERSION, sweep: s.fingerprint, name: s.description.name ?? null, kind: s.work.kind, items: s.items, chunkSize: s.chunkSize, chunks: s.chunks };
}

function readPlanSummary(root: string): PlanSummary {
  const file = join(root, "plan.json");
  const plan = readJson(file, "a directory made by `quietframe sweep plan`") as Partial<PlanSummary> | null;
  if (typeof plan !== "object" || plan === null || plan.format !== PLAN_FORMAT || typeof plan.sweep !== "string") {
    throw new QuietframeError({ path: file, problem: "is not a sweep plan", allowed: "a directory made by `quietframe sweep plan`" });
  }
  return plan as PlanSummary;
}

/** A JSON file, or a QuietframeError naming it. */
export function readJson(file: string, allowed: string): unknown {
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    throw new QuietframeError({ path: file, problem: code === "ENOENT" ? "does not exist" : `cannot be read (${code ?? "error"})`, allowed });
  }
  try {
    return JSON.parse(text);
  } catch {
    throw new QuietframeError({ path: file, problem: "is not valid JSON", allowed });
  }
}
