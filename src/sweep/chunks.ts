/**
 * How a sweep is cut into chunks: chunk k holds items k·size … min(items, (k+1)·size) − 1
 * (rows of a map or samples). Fixed by the description alone, so every machine that runs a
 * chunk, and the merge, agree on what each chunk is.
 */
import { QuietframeError } from "../errors";

export interface ChunkRange {
  readonly chunk: number;
  /** First item and one past the last. */
  readonly from: number;
  readonly to: number;
}

/** The items of chunk `chunk` of a sweep of `items` items cut `size` at a time. */
export function chunkRange(items: number, size: number, chunk: number): ChunkRange {
  const chunks = Math.ceil(items / size);
  if (!Number.isInteger(chunk) || chunk < 0 || chunk >= chunks) {
    throw new QuietframeError({ path: "chunk", value: chunk, problem: "is not a chunk of this sweep", allowed: `an integer from 0 to ${chunks - 1}` });
  }
  return { chunk, from: chunk * size, to: Math.min(items, (chunk + 1) * size) };
}

/** Every chunk, in order. */
export function chunkRanges(items: number, size: number): ChunkRange[] {
  return Array.from({ length: Math.ceil(items / size) }, (_, k) => chunkRange(items, size, k));
}

/** A chunk index written as a user or a scheduler gives it ("7"); anything else is refused by name. */
export function parseChunkIndex(text: string | undefined, chunks: number, source: string): number {
  if (text === undefined || text === "") {
    throw new QuietframeError({ path: source, problem: "no chunk index given", allowed: `--chunk K, or SLURM_ARRAY_TASK_ID set by an array job (0 to ${chunks - 1})` });
  }
  if (!/^\d+$/.test(text.trim()) || Number(text) >= chunks) {
    throw new QuietframeError({ path: source, value: text, problem: "is not a chunk of this sweep", allowed: `an integer from 0 to ${chunks - 1}` });
  }
  return Number(text);
}
