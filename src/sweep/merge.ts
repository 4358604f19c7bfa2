/**
 * Merging a planned sweep: every chunk must be present, whole (checksum), of this sweep
 * (fingerprint) and the chunk its name says; otherwise nothing is assembled and every
 * problem is named, file by file. The chunks are then assembled by the same code that
 * assembles the worker pool's rows and samples (RowCollector, finishSpread), so the merged
 * result has the bits of the local run. Node only.
 */
import { readFileSync } from "node:fs";
import { relative } from "node:path";
import { QuietframeError, QuietframeErrors } from "../errors";
import { finishSpread, type SampleOutcomes } from "../design/spread";
import { finishOptimize, type StartOutcome } from "../design/optimize";
import { RowCollector } from "../tolerance/run";
import { readChunkText, type ChunkExpectation, type ChunkResult } from "./chunk-file";
import { gridSpec } from "./grid-spec";
import { sweepResult, type SweepResult } from "./result";
import type { SweepDir } from "./sweep-dir";

/** The chunk results of a sweep directory, in chunk order, or a QuietframeErrors naming every missing or refused chunk file. */
export function readAllChunks(dir: SweepDir): ChunkResult[] {
  const results: ChunkResult[] = [];
  const problems: QuietframeError[] = [];
  for (let chunk = 0; chunk < dir.sweep.chunks; chunk++) {
    const outcome = readChunk(dir, chunk);
    if (outcome instanceof QuietframeError) problems.push(outcome);
    else results.push(outcome);
  }
  if (problems.length > 0) throw problems.length === 1 ? problems[0] : new QuietframeErrors(problems);
  return results;
}

/** One chunk's result, or the QuietframeError that refuses it (missing, truncated, damaged, foreign). */
export function readChunk(dir: SweepDir, chunk: number): ChunkResult | QuietframeError {
  const file = dir.chunkPath(chunk);
  const name = relative(process.cwd(), file) || file;
  const range = dir.range(chunk);
  let text: string;
  try {
    text = readFileSync(file, "utf8");
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    return new QuietframeError({
      path: name,
      problem: code === "ENOENT" ? `is missing (chunk ${chunk}, items ${range.from} … ${range.to - 1})` : `cannot be read (${code ?? "error"})`,
      allowed: "run the chunk: quietframe sweep run",
    });
  }
  try {
    return readChunkText(text, name, chunkExpectation(dir, chunk));
  } catch (e) {
    if (e instanceof QuietframeError) return e;
    throw e;
  }
}

function chunkExpectation(dir: SweepDir, chunk: number): ChunkExpectation {
  const work = dir.sweep.work;
  const base = { sweep: dir.sweep.fingerprint, range: dir.range(chunk) };
  if (work.kind === "grid") return { ...base, kind: "grid", width: work.rowLength };
  if (work.kind === "samples") return { ...base, kind: "samples", width: work.plan.frequencies?.length ?? 0 };
  return { ...base, kind: "starts", width: work.plan.params.length, targets: work.plan.params.map((p) => p.target) };
}

/** Checks every chunk and assembles the sweep's result. */
export function mergeSweep(dir: SweepDir): SweepResult {
  const started = performance.now();
  const results = readAllChunks(dir);
  const { sweep } = dir;
  const work = sweep.work;
  if (work.kind === "grid") {
    const collector = new RowCollector(work.plan);
    results.forEach((r, chunk) => {
      if (r.kind !== "grid") throw new Error("internal: a samples chunk in a grid sweep");
      const from = dir.range(chunk).from;
      r.rows.forEach((row, k) => collector.add(from + k, row));
    });
    const map = collector.finish(work.plan, work.figure, started, 1);
    return sweepResult(sweep.description, sweep.fingerprint, { kind: "grid", spec: gridSpec(sweep.description), map });
  }
  if (work.kind === "starts") {
    const outcomes: StartOutcome[] = results.flatMap((r) => {
      if (r.kind !== "starts") throw new Error("internal: another chunk kind in a starts sweep");
      return [...r.outcomes];
    });
    // The starts ran in other processes: their evaluations count, as in one optimizeDesign call.
    const elsewhere = outcomes.reduce((sum, o) => sum + o.report.evaluations, 0);
    return sweepResult(sweep.description, sweep.fingerprint, { kind: "starts", optimum: finishOptimize(work.plan, outcomes, elsewhere) });
  }
  const parts: SampleOutcomes[] = results.map((r) => {
    if (r.kind !== "samples") throw new Error("internal: a grid chunk in a samples sweep");
    return r.part;
  });
  // The samples were evaluated by other processes: they count as evaluations, as a worker pool's do.
  return sweepResult(sweep.description, sweep.fingerprint, { kind: "samples", spread: finishSpread(work.plan, parts, work.plan.samples) });
}
