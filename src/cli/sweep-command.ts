/**
 * `quietframe sweep`: a large map, Monte Carlo or optimization from one sweep file, run on this machine
 * (local) or cut into chunks (plan) that a scheduler runs one by one (run), then checked and
 * assembled (merge); with status, Slurm scripts (script) and submission (submit).
 */
import { readFileSync } from "node:fs";
import { dirname, join, resolve } from "node:path";
import { QuietframeError } from "../errors";
import { parseJsonText } from "../setup/parse-json";
import { loadSetupFile } from "../setup/load-file";
import {
  arrayList,
  DEFAULT_REQUEST,
  markFailed,
  mergeSweep,
  openSweepDir,
  parseChunkIndex,
  planSweep,
  queuedTasks,
  runChunk,
  runSweepLocally,
  submitSweep,
  sweepStatus,
  writeSlurmScripts,
  type SlurmRequest,
} from "../sweep";
import type { CliIo } from "./io";
import { untilInterrupted } from "./stop-on-interrupt";
import { countOption } from "./design-args";
import { parseOptions } from "./options";
import { writeSweepState } from "./sweep-state";

export const SWEEP_USAGE = `  quietframe sweep plan <sweep.json> <dir>
      Checks a sweep file (docs/sweeps.md: a set-up, a grid of two parameters, seeded samples or
      optimizer starts, a figure, a chunk size) and lays out <dir> for its chunks.
  quietframe sweep run <dir> [--chunk K]
      Computes chunk K (default: $SLURM_ARRAY_TASK_ID) into <dir>/chunks, written whole or not at all.
  quietframe sweep merge <dir> [-o FILE]
      Checks that every chunk is there, whole and of this sweep, and writes the result (default
      <dir>/merged.json): a tolerance-map state, or a design state (spread or optimum), with the sweep's fingerprint.
  quietframe sweep status <dir> [--format text|json]
      Which chunks are done, running, pending, failed or missing (chunk files, and squeue where Slurm is).
  quietframe sweep script <dir> [--time T] [--mem M] [--concurrency N] [--partition P] [--account A]
      Writes <dir>/slurm/chunks.sbatch (an array over the chunks still to run, N at once) and
      merge.sbatch (to submit with --dependency=afterok on the array), to edit and submit by hand.
  quietframe sweep submit <dir> [same options as script]
      Writes the scripts and submits them with sbatch; again later, it sends only missing or failed chunks.
  quietframe sweep local <sweep.json> [-o FILE] [--threads N]
      The whole sweep on this machine's worker threads: the same result, bit for bit, as the merged chunks.
`;

const SUBCOMMANDS = ["plan", "run", "merge", "status", "script", "submit", "local"] as const;

const SLURM_OPTIONS = {
  time: { type: "string" },
  mem: { type: "string" },
  concurrency: { type: "string" },
  partition: { type: "string" },
  account: { type: "string" },
} as const;

export async function sweepCommand(args: string[], io: CliIo): Promise<number> {
  const [sub, ...rest] = args;
  switch (sub) {
    case "plan":
      return planCommand(rest, io);
    case "run":
      return runCommand(rest, io);
    case "merge":
      return mergeCommand(rest, io);
    case "status":
      return statusCommand(rest, io);
    case "script":
    case "submit":
      return slurmCommand(sub, rest, io);
    case "local":
      return localCommand(rest, io);
    default:
      throw new QuietframeError({ path: "sweep", value: sub ?? "", problem: "is not a sweep subcommand", allowed: SUBCOMMANDS.join(", "), choices: SUBCOMMANDS });
  }
}

/** A sweep file; a set-up given as a path is read relative to the sweep file. */
export function readSweepFile(path: string | undefined): unknown {
  if (!path) throw new QuietframeError({ path: "<sweep.json>", problem: "no sweep file given", allowed: "a path to a sweep JSON file (docs/sweeps.md)" });
  let text: string;
  try {
    text = readFileSync(path, "utf8");
  } catch (e) {
    throw new QuietframeError({ path, problem: `cannot be read (${(e as NodeJS.ErrnoException).code ?? "error"})`, allowed: "a readable sweep file" });
  }
  const sweep = parseJsonText(text, path) as Record<string, unknown>;
  if (sweep && typeof sweep === "object" && typeof sweep.setup === "string") {
    return { ...sweep, setup: loadSetupFile(resolve(dirname(path), sweep.setup), `a set-up file named by ${path}'s "setup", relative to it`) };
  }
  return sweep;
}

function oneDirectory(positionals: readonly string[], command: string): string {
  if (positionals.length !== 1) {
    throw new QuietframeError({ path: "<dir>", value: positionals, problem: `quietframe sweep ${command} takes one sweep directory`, allowed: "the directory `quietframe sweep plan` made" });
  }
  return positionals[0];
}

function planCommand(args: string[], io: CliIo): number {
  const { positionals } = parseOptions("sweep plan", args, {});
  if (positionals.length !== 2)
    throw new QuietframeError({ path: "<arguments>", value: positionals, problem: "needs a sweep file and a directory", allowed: "quietframe sweep plan <sweep.json> <dir>" });
  const dir = planSweep(readSweepFile(positionals[0]), positionals[1]);
  const s = dir.sweep;
  const unit = s.work.kind === "grid" ? "rows" : s.work.kind;
  io.out(`planned ${s.chunks} chunks of up to ${s.chunkSize} ${unit} (${s.items} ${unit} in all) in ${dir.dir}\nsweep ${s.fingerprint}\n`);
  return 0;
}

async function runCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseOptions("sweep run", args, { chunk: { type: "string" } });
  const dir = openSweepDir(oneDirectory(positionals, "run"));
  const source = values.chunk !== undefined ? "--chunk" : "SLURM_ARRAY_TASK_ID";
  const chunk = parseChunkIndex(values.chunk ?? process.env.SLURM_ARRAY_TASK_ID, dir.sweep.chunks, source);
  // scancel and a time limit send SIGTERM first: the chunk is marked failed with the reason before the process ends.
  const onSignal = (signal: NodeJS.Signals): void => {
    markFailed(dir, chunk, `stopped by ${signal} before its result was written`);
    process.exit(128 + (signal === "SIGINT" ? 2 : 15));
  };
  process.once("SIGTERM", onSignal);
  process.once("SIGINT", onSignal);
  try {
    const range = await runChunk(dir, chunk);
    io.out(`chunk ${chunk} (items ${range.from} … ${range.to - 1}) written to ${dir.chunkPath(chunk)}\n`);
  } finally {
    process.off("SIGTERM", onSignal);
    process.off("SIGINT", onSignal);
  }
  return 0;
}

function mergeCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions("sweep merge", args, { output: { type: "string", short: "o" } });
  const dir = openSweepDir(oneDirectory(positionals, "merge"));
  const result = mergeSweep(dir);
  const output = values.output ?? join(dir.dir, "merged.json");
  writeSweepState(output, result);
  io.out(`merged ${dir.sweep.chunks} chunks into ${output}\nsweep  ${result.sweep}\nresult ${result.fingerprint}\n`);
  return 0;
}

function statusCommand(args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions("sweep status", args, { format: { type: "string", default: "text" } });
  if (values.format !== "text" && values.format !== "json") throw new QuietframeError({ path: "--format", value: values.format, problem: "is not an output format", allowed: "text or json" });
  const dir = openSweepDir(oneDirectory(positionals, "status"));
  const queue = queuedTasks(dir);
  const status = sweepStatus(dir, queue);
  if (values.format === "json") {
    io.out(`${JSON.stringify({ sweep: dir.sweep.fingerprint, chunks: dir.sweep.chunks, slurm: queue !== undefined, counts: status.counts, chunkStates: status.chunks }, null, 2)}\n`);
    return 0;
  }
  const c = status.counts;
  const lines = [
    `${dir.sweep.description.name ?? "sweep"}: ${dir.sweep.chunks} chunks: ${c.done} done, ${c.running} running, ${c.pending} pending, ${c.failed} failed, ${c.missing} missing${queue === undefined ? " (no Slurm queue here: judged from the chunk files)" : ""}`,
    ...status.chunks.filter((s) => s.state !== "done").map((s) => `  chunk ${s.chunk}: ${s.state}${s.detail ? ` (${s.detail})` : ""}`),
  ];
  io.out(`${lines.join("\n")}\n`);
  return 0;
}

function slurmCommand(sub: "script" | "submit", args: string[], io: CliIo): number {
  const { values, positionals } = parseOptions(`sweep ${sub}`, args, SLURM_OPTIONS);
  const dir = openSweepDir(oneDirectory(positionals, sub));
  const request: SlurmRequest = {
    time: values.time ?? DEFAULT_REQUEST.time,
    mem: values.mem ?? DEFAULT_REQUEST.mem,
    concurrency: values.concurrency === undefined ? DEFAULT_REQUEST.concurrency : countOption(values.concurrency, "--concurrency", "tasks running at once"),
    ...(values.partition === undefined ? {} : { partition: values.partition }),
    ...(values.account === undefined ? {} : { account: values.account }),
  };
  if (sub === "script") {
    const written = writeSlurmScripts(dir, request, cliCommand(), queuedTasks(dir));
    io.out(
      written.chunkScript
        ? `${written.chunkScript} (array over chunks ${arrayList(written.chunks)})\n${written.mergeScript}\nsubmit: sbatch --parsable ${written.chunkScript}, then sbatch --dependency=afterok:<its id> ${written.mergeScript}\n`
        : `every chunk is done, running or pending: nothing to run\n${written.mergeScript}\n`,
    );
    return 0;
  }
  const s = submitSweep(dir, request, cliCommand());
  io.out(`${s.array ? `array job ${s.array}: chunks ${arrayList(s.chunks)}\n` : "no chunk to run\n"}merge job ${s.merge}${s.array ? ` (after job ${s.array} succeeds)` : ""}\n`);
  return 0;
}

async function localCommand(args: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseOptions("sweep local", args, { output: { type: "string", short: "o" }, threads: { type: "string" } });
  if (positionals.length !== 1) throw new QuietframeError({ path: "<sweep.json>", value: positionals, problem: "takes one sweep file", allowed: "quietframe sweep local <sweep.json>" });
  const workers = values.threads === undefined ? undefined : countOption(values.threads, "--threads", "worker threads");
  const output = values.output ?? "merged.json";
  const sweep = readSweepFile(positionals[0]);
  const result = await untilInterrupted((signal) => runSweepLocally(sweep, { workers, signal }));
  writeSweepState(output, result);
  io.out(`wrote ${output}\nsweep  ${result.sweep}\nresult ${result.fingerprint}\n`);
  return 0;
}

/** What runs quietframe on a node: this Node and the built CLI, as absolute paths (the sources' runs use the build). */
export function cliCommand(): string[] {
  const main = __filename.endsWith(".ts") ? join(__dirname, "..", "..", "dist", "src", "cli", "main.js") : join(__dirname, "main.js");
  return [process.execPath, main];
}
