import { logGrid, type FrequencyGridSpec } from "../setup/grid";
import { QuietframeError } from "../errors";
import { checkWorkers } from "../threads/worker-count";
import { yieldToEventLoop } from "../threads/event-loop";
import { applyValues } from "../setup/apply-values";
import type { SetupDescription } from "../setup/format";
import { CellStatus, evaluateRow, MAX_CELL_MESSAGES, type CellMessage, type RowResult } from "./evaluate";
import { resolveToleranceSpec, type AxisScale, type FigureInfo, type ResolvedAxis, type ToleranceMapSpec, type TolerancePlan } from "./spec";

/**
 * The map as a result, its assembly from rows, and the in-process run (no threads; what a
 * browser uses and what `workers: 1` does). Platform-free.
 */

export interface ToleranceMapOptions {
  /**
   * Threads evaluating rows: an integer ≥ 1. Default: every core the platform offers
   * (os.availableParallelism() in Node). 1 evaluates in the calling thread, without workers.
   * Never more than the map has rows. The values do not depend on it (bit for bit).
   */
  workers?: number;
  /** Called once per finished row with the number of rows done so far and the number of rows; the last call has done = total. */
  onProgress?: (done: number, total: number) => void;
  /** Aborting stops the workers and rejects with a ToleranceMapCancelled. */
  signal?: AbortSignal;
  /**
   * Node only: worker threads kept warm between jobs (`await TolerancePool.start(n)`; maps and
   * Monte Carlo spreads take the same pool). The map then runs on the pool's threads (at most
   * `workers` of them, when given) instead of starting and stopping its own. The values do not
   * depend on it (bit for bit).
   */
  pool?: WarmThreads;
}

/** What the options see of a TolerancePool (Node only; kept apart so this module stays platform-free). */
export interface WarmThreads {
  readonly size: number;
}

export interface ToleranceAxis {
  readonly target: string;
  readonly scale: AxisScale;
  /** SI values (what the written strings parse to, i.e. what each cell computed with). */
  readonly values: Float64Array;
  /** The values as written into the cells' set-ups ("-7.5 dB", "95 %"). */
  readonly written: readonly string[];
  /** Unit of the written values at the axis end. */
  readonly unit: string;
}

export interface ToleranceMap {
  /** Columns. */
  readonly x: ToleranceAxis;
  /** Rows. */
  readonly y: ToleranceAxis;
  /** Frequency grid of every cell's budget (Hz, log-spaced). */
  readonly grid: FrequencyGridSpec;
  readonly figure: FigureInfo;
  /**
   * The figure of merit, row-major with y outer: cell (i, j) is values[j · x.values.length + i].
   * NaN means "no value" and is always paired with a non-zero status; a computed figure is
   * never NaN (−Infinity is a value: the total noise is infinite there, the readout blind).
   */
  readonly values: Float64Array;
  /** Per cell: CellStatus.ok (0), .unstable (1) or .invalid (2). */
  readonly status: Uint8Array;
  readonly counts: { readonly ok: number; readonly unstable: number; readonly invalid: number };
  /** Why the first few failed cells (row-major order) have no value. */
  readonly messages: readonly CellMessage[];
  /** Wall time of the whole call (spec checks, reference, threads, cells), in ms. */
  readonly elapsedMs: number;
  /** Threads that evaluated cells (1: in the calling thread). */
  readonly workers: number;
}

/** Rejection of a cancelled map. */
export class ToleranceMapCancelled extends Error {
  readonly rowsDone: number;
  readonly rowsTotal: number;
  constructor(rowsDone: number, rowsTotal: number, reason?: unknown) {
    super(`tolerance map cancelled after ${rowsDone} of ${rowsTotal} rows; no worker is left running`, { cause: reason });
    this.name = "AbortError";
    this.rowsDone = rowsDone;
    this.rowsTotal = rowsTotal;
  }
}

/** The number of threads of a map, checked as every threaded job checks it. */
export { checkWorkers };

/** Checks onProgress and signal. */
export function checkCallbacks(options: ToleranceMapOptions): void {
  if (typeof options !== "object" || options === null) {
    throw new QuietframeError({ path: "options", value: options, problem: "must be an object", allowed: "{ workers?, onProgress?, signal? }" });
  }
  if (options.onProgress !== undefined && typeof options.onProgress !== "function") {
    throw new QuietframeError({ path: "options.onProgress", value: typeof options.onProgress, problem: "is not a function", allowed: "(done, total) => void" });
  }
  const signal = options.signal as { aborted?: unknown; addEventListener?: unknown } | undefined;
  if (signal !== undefined && (typeof signal !== "object" || signal === null || typeof signal.aborted !== "boolean" || typeof signal.addEventListener !== "function")) {
    throw new QuietframeError({ path: "options.signal", value: typeof signal, problem: "is not an AbortSignal", allowed: "an AbortController's signal" });
  }
}

/** Collects finished rows (in any order) into the map's arrays. */
export class RowCollector {
  readonly values: Float64Array;
  readonly status: Uint8Array;
  private readonly messagesByRow: CellMessage[][] = [];
  private readonly seen: Uint8Array;
  private unstable = 0;
  private invalid = 0;
  private done = 0;
  private readonly nx: number;
  readonly rows: number;

  constructor(plan: TolerancePlan) {
    this.nx = plan.x.written.length;
    this.rows = plan.y.written.length;
    this.values = new Float64Array(this.nx * this.rows);
    this.status = new Uint8Array(this.nx * this.rows);
    this.seen = new Uint8Array(this.rows);
  }

  /** Stores row j; returns how many rows are done. */
  add(j: number, row: RowResult): number {
    if (!(j >= 0 && j < this.rows) || this.seen[j] || row.values.length !== this.nx) throw new Error(`internal: row ${j} delivered twice or malformed`);
    this.seen[j] = 1;
    this.values.set(row.values, j * this.nx);
    this.status.set(row.status, j * this.nx);
    this.messagesByRow[j] = row.messages;
    this.unstable += row.unstable;
    this.invalid += row.invalid;
    return ++this.done;
  }

  get rowsDone(): number {
    return this.done;
  }

  finish(plan: TolerancePlan, figure: FigureInfo, startedMs: number, workers: number): ToleranceMap {
    if (this.done !== this.rows) throw new Error(`internal: ${this.done} of ${this.rows} rows done`);
    const messages: CellMessage[] = [];
    for (let j = 0; j < this.rows && messages.length < MAX_CELL_MESSAGES; j++) {
      for (const m of this.messagesByRow[j]) if (messages.length < MAX_CELL_MESSAGES) messages.push(m);
    }
    const cells = this.values.length;
    return {
      x: axisResult(plan.x),
      y: axisResult(plan.y),
      grid: plan.grid,
      figure,
      values: this.values,
      status: this.status,
      counts: { ok: cells - this.unstable - this.invalid, unstable: this.unstable, invalid: this.invalid },
      messages,
      elapsedMs: performance.now() - startedMs,
      workers,
    };
  }
}

function axisResult(a: ResolvedAxis): ToleranceAxis {
  return { target: a.target, scale: a.scale, values: Float64Array.from(a.values), written: [...a.written], unit: a.unit };
}

// Lets timers, messages, signals and abort events run between rows (also between a sweep chunk's items).
export { yieldToEventLoop };

/** Evaluates every row in the calling thread, yielding between rows so progress and cancellation work. */
export async function runRowsInProcess(plan: TolerancePlan, options: ToleranceMapOptions): Promise<RowCollector> {
  const collector = new RowCollector(plan);
  const frequencies = logGrid(plan.grid);
  const { signal, onProgress } = options;
  for (let j = 0; j < collector.rows; j++) {
    if (signal?.aborted) throw new ToleranceMapCancelled(collector.rowsDone, collector.rows, signal.reason);
    const done = collector.add(j, evaluateRow(plan, frequencies, j));
    onProgress?.(done, collector.rows);
    if (j + 1 < collector.rows) await yieldToEventLoop();
  }
  return collector;
}

/**
 * A tolerance map computed in the calling thread (no workers): for browsers, or wherever
 * threads are not wanted. Same values as `toleranceMap` with any number of workers.
 */
export async function toleranceMapInProcess(setup: SetupDescription, spec: ToleranceMapSpec, options: Omit<ToleranceMapOptions, "workers"> = {}): Promise<ToleranceMap> {
  const started = performance.now();
  checkCallbacks(options);
  const { plan, figure } = resolveToleranceSpec(setup, spec);
  const collector = await runRowsInProcess(plan, options);
  return collector.finish(plan, figure, started, 1);
}

/** The set-up of cell (i, j) of a finished map: an ordinary set-up with both values written in. */
export function toleranceCellSetup(setup: SetupDescription, map: Pick<ToleranceMap, "x" | "y">, i: number, j: number): SetupDescription {
  const check = (axis: ToleranceAxis, k: number, name: "i" | "j"): void => {
    if (!Number.isInteger(k) || k < 0 || k >= axis.written.length) {
      throw new QuietframeError({ path: name, value: k, problem: "is not a cell index of the map", allowed: `an integer from 0 to ${axis.written.length - 1}` });
    }
  };
  check(map.x, i, "i");
  check(map.y, j, "j");
  return applyValues(setup, { [map.x.target]: map.x.written[i], [map.y.target]: map.y.written[j] });
}

export { CellStatus };
