/**
 * The sbatch scripts of a sweep, as text a person can read, edit and submit by hand: an array
 * job over the chunks still to run (with a limit on how many run at once, time and memory
 * requests, partition and account passed through) and a merge job meant to wait for the array
 * with afterok. Pure text; nothing here runs Slurm.
 */
import { QuietframeError } from "../errors";

export interface SlurmRequest {
  /** Wall time per chunk in Slurm's forms: "30", "2:00:00", "1-12:00:00". */
  readonly time: string;
  /** Memory per chunk as Slurm writes it: "2G", "500M". */
  readonly mem: string;
  /** Array tasks running at once (the %N of --array), an integer ≥ 1. */
  readonly concurrency: number;
  readonly partition?: string;
  readonly account?: string;
}

/** What runs a quietframe command on a node: the interpreter and the CLI script, as absolute paths. */
export type CommandPrefix = readonly string[];

export const DEFAULT_REQUEST: SlurmRequest = { time: "1:00:00", mem: "2G", concurrency: 50 };

const TIME = /^(\d+-\d{1,2}(:\d{1,2}(:\d{1,2})?)?|\d+(:\d{1,2}(:\d{1,2})?)?)$/;
const MEMORY = /^\d+[KMGT]?$/;
const NAME = /^[A-Za-z0-9_.,-]{1,64}$/;

/** Checks each request field; a bad one is a QuietframeError naming the option. */
export function checkSlurmRequest(r: SlurmRequest): SlurmRequest {
  if (!TIME.test(r.time)) throw new QuietframeError({ path: "--time", value: r.time, problem: "is not a Slurm time limit", allowed: 'minutes, "H:MM:SS" or "D-HH:MM:SS", e.g. "2:00:00"' });
  if (!MEMORY.test(r.mem)) throw new QuietframeError({ path: "--mem", value: r.mem, problem: "is not a Slurm memory size", allowed: 'a whole number with K, M, G or T, e.g. "2G"' });
  if (!Number.isInteger(r.concurrency) || r.concurrency < 1) {
    throw new QuietframeError({ path: "--concurrency", value: r.concurrency, problem: "is not a usable number of tasks at once", allowed: "an integer ≥ 1" });
  }
  for (const [option, value] of [
    ["--partition", r.partition],
    ["--account", r.account],
  ] as const) {
    if (value !== undefined && !NAME.test(value)) throw new QuietframeError({ path: option, value, problem: "is not a Slurm name", allowed: "letters, digits, _ . , - (as your cluster names it)" });
  }
  return r;
}

/** Chunk indexes as Slurm's --array list: runs of consecutive indexes as ranges ("0-4,7,9-11"). */
export function arrayList(chunks: readonly number[]): string {
  const sorted = [...new Set(chunks)].sort((a, b) => a - b);
  const parts: string[] = [];
  for (let k = 0; k < sorted.length; ) {
    let end = k;
    while (end + 1 < sorted.length && sorted[end + 1] === sorted[end] + 1) end++;
    parts.push(end === k ? `${sorted[k]}` : `${sorted[k]}-${sorted[end]}`);
    k = end + 1;
  }
  return parts.join(",");
}

/** A word for a POSIX shell: single-quoted unless it is plainly safe. */
export function shellWord(word: string): string {
  return /^[A-Za-z0-9_./:=@%+-]+$/.test(word) ? word : `'${word.replace(/'/g, `'"'"'`)}'`;
}

export interface ScriptContext {
  /** Absolute path of the sweep directory (on a file system the nodes share). */
  readonly dir: string;
  readonly name: string;
  readonly fingerprint: string;
  readonly chunkCount: number;
  readonly command: CommandPrefix;
}

/** The array job over `chunks`; each task runs the chunk named by SLURM_ARRAY_TASK_ID. */
export function chunkScript(ctx: ScriptContext, chunks: readonly number[], r: SlurmRequest): string {
  const list = arrayList(chunks);
  const limit = Math.min(r.concurrency, chunks.length);
  return [
    "#!/bin/bash",
    `# quietframe sweep "${ctx.name}" (${ctx.fingerprint.slice(0, 19)}…): ${chunks.length} of its ${ctx.chunkCount} chunks as a Slurm array.`,
    "# Each array task computes the chunk whose index is its SLURM_ARRAY_TASK_ID and writes",
    "# chunks/chunk-NNNNNN.json in the sweep directory (whole or not at all).",
    "# To submit by hand (instead of `quietframe sweep submit`):",
    "#   sbatch --parsable chunks.sbatch                      -> prints the array's job id",
    "#   sbatch --dependency=afterok:<that id> merge.sbatch",
    `#SBATCH --job-name=${shellWord(`qf-${ctx.name}`)}`,
    `#SBATCH --array=${list}%${limit}`,
    `#SBATCH --time=${r.time}`,
    `#SBATCH --mem=${r.mem}`,
    "#SBATCH --ntasks=1",
    "#SBATCH --cpus-per-task=1",
    ...(r.partition ? [`#SBATCH --partition=${r.partition}`] : []),
    ...(r.account ? [`#SBATCH --account=${r.account}`] : []),
    `#SBATCH --output=${shellWord(`${ctx.dir}/slurm/chunk-%a.out`)}`,
    "set -euo pipefail",
    `exec ${[...ctx.command, "sweep", "run", ctx.dir].map(shellWord).join(" ")}`,
    "",
  ].join("\n");
}

/** The merge job: checks every chunk and writes merged.json; submitted with --dependency=afterok on the array. */
export function mergeScript(ctx: ScriptContext, r: SlurmRequest): string {
  return [
    "#!/bin/bash",
    `# quietframe sweep "${ctx.name}": merges its ${ctx.chunkCount} chunks into merged.json once every array task succeeded`,
    "# (submit it with --dependency=afterok:<array job id>). A missing or damaged chunk makes it fail, naming the chunk.",
    `#SBATCH --job-name=${shellWord(`qf-${ctx.name}-merge`)}`,
    `#SBATCH --time=${r.time}`,
    `#SBATCH --mem=${r.mem}`,
    "#SBATCH --ntasks=1",
    ...(r.partition ? [`#SBATCH --partition=${r.partition}`] : []),
    ...(r.account ? [`#SBATCH --account=${r.account}`] : []),
    `#SBATCH --output=${shellWord(`${ctx.dir}/slurm/merge-%j.out`)}`,
    "set -euo pipefail",
    `exec ${[...ctx.command, "sweep", "merge", ctx.dir].map(shellWord).join(" ")}`,
    "",
  ].join("\n");
}
