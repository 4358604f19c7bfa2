/**
 * Sweeps: one description of a large computation (a tolerance map or a Monte Carlo spread),
 * run on this machine's worker pool or cut into chunks for Slurm array jobs, merged with
 * checks into the same bits. Node only (exported from "quietframe/node").
 */
export { SWEEP_FORMAT, SWEEP_VERSION, VARY_KINDS, DEFAULT_CHUNKS, type SweepDescription, type Variation, type GridVariation, type SampleVariation, type KeepSpec } from "./format";
export { resolveSweep, type ResolvedSweep, type GridWork, type SampleWork } from "./resolve";
export { chunkRange, chunkRanges, parseChunkIndex, type ChunkRange } from "./chunks";
export { atomicWrite, TEMPORARY_PREFIX } from "./atomic-write";
export { chunkFileName, chunkFileText, readChunkText, CHUNK_FORMAT, type ChunkResult } from "./chunk-file";
export { planSweep, openSweepDir, readJson, PLAN_FORMAT, type SweepDir, type PlanSummary } from "./sweep-dir";
export { runChunk, markFailed, type StartedMarker } from "./run-chunk";
export { mergeSweep, readAllChunks, readChunk } from "./merge";
export { gridSpec } from "./grid-spec";
export { runSweepLocally, type LocalSweepOptions } from "./local";
export { sweepResult, type SweepResult } from "./result";
export { sweepStatus, chunksToRun, CHUNK_STATES, type ChunkState, type ChunkStatus, type SweepStatus, type QueuedTasks } from "./status";
export { arrayList, chunkScript, mergeScript, checkSlurmRequest, shellWord, DEFAULT_REQUEST, type SlurmRequest, type CommandPrefix, type ScriptContext } from "./slurm-script";
export { writeSlurmScripts, submitSweep, submissions, queuedTasks, type Submission, type WrittenScripts } from "./slurm";
export { sweepJsonSchema, SWEEP_SCHEMA_ID } from "./schema";
export { canonicalJson, sha256, arraysDigest } from "./digest";
