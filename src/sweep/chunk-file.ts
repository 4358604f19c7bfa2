/**
 * The file one chunk's result is written to, and its strict reading. The numbers travel as
 * the bytes of their IEEE-754 doubles (base64, little-endian), so a merged result has the
 * bits the chunk computed. The file names its sweep's fingerprint and its chunk, and carries
 * a SHA-256 checksum of its result: a truncated, edited or foreign file is refused with its name.
 */
import { endianness } from "node:os";
import { QuietframeError } from "../errors";
import type { SampleOutcomes } from "../design/spread";
import type { StartOutcome, StartReport } from "../design/optimize";
import type { RowResult } from "../tolerance/evaluate";
import type { ChunkRange } from "./chunks";
import { canonicalJson, sha256 } from "./digest";

export const CHUNK_FORMAT = "quietframe.sweep-chunk";
export const CHUNK_VERSION = 1;

/** Rows of a map, in order from range.from. */
export interface GridChunkResult {
  readonly kind: "grid";
  readonly rows: readonly RowResult[];
}

/** Samples range.from … range.to − 1. */
export interface SampleChunkResult {
  readonly kind: "samples";
  readonly part: SampleOutcomes;
}

/** Optimizer starts range.from … range.to − 1, in order. */
export interface StartChunkResult {
  readonly kind: "starts";
  readonly outcomes: readonly StartOutcome[];
}

export type ChunkResult = GridChunkResult | SampleChunkResult | StartChunkResult;

/** The chunk file name of chunk k: zero-padded so that a listing sorts in chunk order. */
export function chunkFileName(chunk: number): string {
  return `chunk-${String(chunk).padStart(6, "0")}.json`;
}

/** The text of a chunk file. */
export function chunkFileText(sweep: string, range: ChunkRange, result: ChunkResult): string {
  if (endianness() !== "LE") throw new Error("chunk files store little-endian doubles; this machine is big-endian");
  const encoded = encodeResult(result);
  const file = { format: CHUNK_FORMAT, version: CHUNK_VERSION, sweep, chunk: range.chunk, from: range.from, to: range.to, checksum: sha256(canonicalJson(encoded)), result: encoded };
  return `${JSON.stringify(file)}\n`;
}

/** What a chunk file must match: its sweep, its range, and the shape of its work. */
export interface ChunkExpectation {
  readonly sweep: string;
  readonly range: ChunkRange;
  /** Cells per row (grid), curve points per sample (samples, 0 without curves) or parameters (starts). */
  readonly width: number;
  readonly kind: ChunkResult["kind"];
  /** Starts: the parameters' targets, in order. */
  readonly targets?: readonly string[];
}

/** Reads and checks chunk file text; every refusal is a QuietframeError whose path is `name`. */
export function readChunkText(text: string, name: string, expected: ChunkExpectation): ChunkResult {
  const refuse = (problem: string): QuietframeError =>
    new QuietframeError({ path: name, problem, allowed: `the result of chunk ${expected.range.chunk} of this sweep, as \`quietframe sweep run\` writes it` });
  let file: Record<string, unknown>;
  try {
    file = JSON.parse(text) as Record<string, unknown>;
  } catch {
    throw refuse("is truncated or not JSON");
  }
  if (typeof file !== "object" || file === null || file.format !== CHUNK_FORMAT) throw refuse("is not a quietframe chunk file");
  if (file.version !== CHUNK_VERSION) throw refuse(`is chunk format version ${String(file.version)}, not ${CHUNK_VERSION}`);
  if (file.sweep !== expected.sweep) throw refuse(`belongs to another sweep (${String(file.sweep)}, not ${expected.sweep})`);
  const { chunk, from, to } = expected.range;
  if (file.chunk !== chunk || file.from !== from || file.to !== to)
    throw refuse(`holds chunk ${String(file.chunk)} (items ${String(file.from)} … ${String(file.to)}), not chunk ${chunk} (items ${from} … ${to})`);
  if (typeof file.checksum !== "string" || sha256(canonicalJson(file.result)) !== file.checksum) throw refuse("does not match its checksum (changed or damaged after it was written)");
  const decoded = decodeResult(file.result, expected);
  if (!decoded) throw refuse("has a checksum but not the arrays this chunk needs");
  return decoded;
}

interface EncodedRow {
  readonly unstable: number;
  readonly invalid: number;
  readonly messages: RowResult["messages"];
}

function encodeResult(result: ChunkResult): unknown {
  if (result.kind === "grid") {
    const rows = result.rows;
    const width = rows[0]?.values.length ?? 0;
    const values = new Float64Array(rows.length * width);
    const status = new Uint8Array(rows.length * width);
    rows.forEach((r, k) => {
      values.set(r.values, k * width);
      status.set(r.status, k * width);
    });
    return { kind: "grid", rows: rows.map((r): EncodedRow => ({ unstable: r.unstable, invalid: r.invalid, messages: r.messages })), values: base64(values), status: base64(status) };
  }
  if (result.kind === "starts") {
    return {
      kind: "starts",
      outcomes: result.outcomes.map(({ report: r, best }) => ({
        status: r.status,
        evaluations: r.evaluations,
        message: r.message ?? null,
        // The start's values in the parameters' order, its figure, and the best point with its cost: as doubles.
        start: base64(Float64Array.from(Object.values(r.start))),
        figure: base64(Float64Array.of(r.figure)),
        best: best ? base64(Float64Array.of(best.f, ...best.u)) : null,
      })),
    };
  }
  const p = result.part;
  return {
    kind: "samples",
    values: base64(p.values),
    status: base64(p.status),
    curves: base64(p.curves),
    firstFailure: p.firstFailure ? { sample: p.firstFailure.sample, message: p.firstFailure.message ?? null } : null,
  };
}

function decodeResult(raw: unknown, expected: ChunkExpectation): ChunkResult | undefined {
  const r = raw as Record<string, unknown> | null;
  if (typeof r !== "object" || r === null || r.kind !== expected.kind) return undefined;
  const count = expected.range.to - expected.range.from;
  if (r.kind === "grid") {
    const values = doubles(r.values, count * expected.width);
    const status = bytes(r.status, count * expected.width);
    const rows = r.rows as EncodedRow[];
    if (!values || !status || !Array.isArray(rows) || rows.length !== count) return undefined;
    const w = expected.width;
    return {
      kind: "grid",
      rows: rows.map((row, k) => ({ unstable: row.unstable, invalid: row.invalid, messages: row.messages, values: values.slice(k * w, (k + 1) * w), status: status.slice(k * w, (k + 1) * w) })),
    };
  }
  if (r.kind === "starts") return decodeStarts(r.outcomes, count, expected);
  const values = doubles(r.values, count);
  const status = bytes(r.status, count);
  const curves = doubles(r.curves, count * expected.width);
  if (!values || !status || !curves) return undefined;
  const failure = r.firstFailure as { sample: number; message: string | null } | null;
  const firstFailure = failure ? { sample: failure.sample, ...(failure.message === null ? {} : { message: failure.message }) } : undefined;
  return { kind: "samples", part: { from: expected.range.from, values, status, curves, ...(firstFailure ? { firstFailure } : {}) } };
}

interface EncodedStart {
  readonly status: StartReport["status"];
  readonly evaluations: number;
  readonly message: string | null;
  readonly start: string;
  readonly figure: string;
  readonly best: string | null;
}

function decodeStarts(raw: unknown, count: number, expected: ChunkExpectation): StartChunkResult | undefined {
  const targets = expected.targets ?? [];
  if (!Array.isArray(raw) || raw.length !== count || targets.length !== expected.width) return undefined;
  const outcomes: StartOutcome[] = [];
  for (const o of raw as EncodedStart[]) {
    const start = doubles(o?.start, expected.width);
    const figure = doubles(o?.figure, 1);
    const best = o?.best === null ? null : doubles(o?.best, expected.width + 1);
    if (!start || !figure || best === undefined || !Number.isInteger(o.evaluations)) return undefined;
    const report: StartReport = {
      start: Object.fromEntries(targets.map((t, k) => [t, start[k]])),
      status: o.status,
      figure: figure[0],
      evaluations: o.evaluations,
      ...(o.message === null ? {} : { message: o.message }),
    };
    outcomes.push(best ? { report, best: { f: best[0], u: best.slice(1) } } : { report });
  }
  return { kind: "starts", outcomes };
}

function base64(a: Float64Array | Uint8Array): string {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).toString("base64");
}

function decoded(text: unknown, byteLength: number): Buffer | undefined {
  if (typeof text !== "string") return undefined;
  const b = Buffer.from(text, "base64");
  return b.length === byteLength ? b : undefined;
}

function doubles(text: unknown, length: number): Float64Array | undefined {
  const b = decoded(text, length * 8);
  if (!b) return undefined;
  // Copied into an aligned buffer of its own.
  const out = new Float64Array(length);
  new Uint8Array(out.buffer).set(b);
  return out;
}

function bytes(text: unknown, length: number): Uint8Array | undefined {
  const b = decoded(text, length);
  return b ? Uint8Array.from(b) : undefined;
}
