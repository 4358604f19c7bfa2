/**
 * Checks a sweep description and resolves it into the work it stands for: the tolerance
 * plan of a grid or the Monte Carlo plan of samples (both resolved by the engine's own
 * checks, so a sweep refuses exactly what a map or a spread refuses), the number of items
 * (rows or samples), the chunk size, and the sweep's fingerprint. Every problem is a
 * QuietframeError whose path is a field of the sweep file.
 */
import { QuietframeError, QuietframeErrors } from "../errors";
import { planSpread, type SpreadPlan } from "../design/spread";
import { planOptimize, type OptimizePlan } from "../design/optimize";
import type { FigureSpec } from "../figures/spec";
import { expectObject } from "../figures/spec";
import type { SetupDescription } from "../setup/format";
import { loadSetup } from "../setup/load";
import { resolveToleranceSpec, type FigureInfo, type ToleranceMapSpec, type TolerancePlan } from "../tolerance/spec";
import { QUIETFRAME_VERSION } from "../version";
import { canonicalJson, sha256 } from "./digest";
import { gridSpec } from "./grid-spec";
import {
  DEFAULT_CHUNKS,
  GRID_VARY_KEYS,
  KEEP_KEYS,
  SAMPLE_VARY_KEYS,
  START_VARY_KEYS,
  SWEEP_FORMAT,
  SWEEP_KEYS,
  SWEEP_VERSION,
  VARY_KINDS,
  type GridVariation,
  type SampleVariation,
  type StartVariation,
  type SweepDescription,
} from "./format";

/** A grid sweep resolved: the tolerance plan every row is computed from. */
export interface GridWork {
  readonly kind: "grid";
  readonly spec: ToleranceMapSpec;
  readonly plan: TolerancePlan;
  readonly figure: FigureInfo;
  /** Cells per row. */
  readonly rowLength: number;
}

/** A sample sweep resolved: the Monte Carlo plan, with every sample's draws made. */
export interface SampleWork {
  readonly kind: "samples";
  readonly plan: SpreadPlan;
}

/** An optimization resolved: its starts drawn, each to run on its own. */
export interface StartWork {
  readonly kind: "starts";
  readonly plan: OptimizePlan;
}

export interface ResolvedSweep {
  /** A checked copy of the description, chunk size written in. */
  readonly description: SweepDescription;
  readonly work: GridWork | SampleWork | StartWork;
  /** Rows of the map, samples or starts. */
  readonly items: number;
  readonly chunkSize: number;
  readonly chunks: number;
  /** "sha256:…" of the canonical description and the quietframe version: chunks of another sweep never match it. */
  readonly fingerprint: string;
}

/** Checks a sweep description (an object, e.g. parsed from a sweep file) and resolves its work. */
export function resolveSweep(input: unknown): ResolvedSweep {
  if (typeof input !== "object" || input === null || Array.isArray(input)) {
    throw new QuietframeError({ path: "sweep", value: input, problem: "must be an object", allowed: `a sweep description {"format": "${SWEEP_FORMAT}", …}` });
  }
  // Path "spec" makes expectObject name an unknown top-level field by itself.
  const d = expectObject(input, "spec", SWEEP_KEYS);
  if (d.format !== SWEEP_FORMAT) throw new QuietframeError({ path: "format", value: d.format, problem: "is not a quietframe sweep", allowed: `"${SWEEP_FORMAT}"` });
  if (d.version !== SWEEP_VERSION) throw new QuietframeError({ path: "version", value: d.version, problem: "is not a sweep version this quietframe reads", allowed: String(SWEEP_VERSION) });
  if (d.name !== undefined && (typeof d.name !== "string" || d.name.length > 200)) {
    throw new QuietframeError({ path: "name", value: d.name, problem: "must be text of at most 200 characters", allowed: "plain text" });
  }
  const setup = checkSetup(d.setup);
  if (d.figure === undefined) throw new QuietframeError({ path: "figure", problem: "is missing", allowed: 'a figure of merit such as { "kind": "margin-at", "frequency": "1.16 MHz" }' });
  const keep = d.keep === undefined ? {} : expectObject(d.keep, "keep", KEEP_KEYS);
  if (keep.curves !== undefined && typeof keep.curves !== "boolean") throw new QuietframeError({ path: "keep.curves", value: keep.curves, problem: "must be true or false", allowed: "true or false" });
  const vary = expectObject(d.vary, "vary", undefined);
  if (!VARY_KINDS.includes(vary.kind as never)) {
    throw new QuietframeError({ path: "vary.kind", value: vary.kind, problem: "is not a kind of variation", allowed: VARY_KINDS.join(" or "), choices: VARY_KINDS });
  }
  const grid = d.grid as SweepDescription["grid"];
  const figure = d.figure as FigureSpec;
  let work: GridWork | SampleWork | StartWork;
  let items: number;
  if (vary.kind === "grid") {
    const v = expectObject(vary, "vary", GRID_VARY_KEYS) as unknown as GridVariation;
    if (keep.curves !== undefined)
      throw new QuietframeError({ path: "keep.curves", value: keep.curves, problem: "applies to samples only (a grid keeps one figure per cell)", allowed: "no keep.curves with vary.kind grid" });
    const spec = gridSpec({ ...(d as unknown as SweepDescription), vary: v });
    const { plan, figure: info } = rebased(() => resolveToleranceSpec(setup, spec), gridPath);
    work = { kind: "grid", spec, plan, figure: info, rowLength: plan.x.written.length };
    items = plan.y.written.length;
  } else if (vary.kind === "starts") {
    const v = expectObject(vary, "vary", START_VARY_KEYS) as unknown as StartVariation;
    if (keep.curves !== undefined) throw new QuietframeError({ path: "keep.curves", value: keep.curves, problem: "applies to samples only", allowed: "no keep.curves with vary.kind starts" });
    const options = { starts: v.starts, seed: v.seed, maxEvaluationsPerStart: v.maxEvaluationsPerStart, tolerance: v.tolerance, grid };
    const plan = rebased(() => planOptimize(setup, figure, v.parameters, options), startPath);
    work = { kind: "starts", plan };
    items = plan.starts;
  } else {
    const v = expectObject(vary, "vary", SAMPLE_VARY_KEYS) as unknown as SampleVariation;
    if (!Array.isArray(v.uncertain) || v.uncertain.length === 0) {
      throw new QuietframeError({
        path: "vary.uncertain",
        value: v.uncertain,
        problem: "must list the uncertain parameters",
        allowed: '[{ "target": "detector.efficiency", "value": "95 % ± 2 %" }, …]',
      });
    }
    const options = { samples: v.samples, seed: v.seed, target: v.target, grid, bands: keep.curves !== false };
    const plan = rebased(() => planSpread(setup, figure, v.uncertain, options), samplePath);
    work = { kind: "samples", plan };
    items = plan.samples;
  }
  const chunkSize = checkChunkSize(d.chunkSize, items);
  const description = { ...(structuredClone(d) as unknown as SweepDescription), chunkSize };
  const fingerprint = sha256(canonicalJson({ quietframe: QUIETFRAME_VERSION, sweep: description }));
  return { description, work, items, chunkSize, chunks: Math.ceil(items / chunkSize), fingerprint };
}

function checkSetup(setup: unknown): SetupDescription {
  if (setup === undefined) throw new QuietframeError({ path: "setup", problem: "is missing", allowed: "a set-up description (docs/setup-format.md)" });
  rebased(
    () => loadSetup(setup),
    (p) => `setup.${p}`,
  );
  return setup as SetupDescription;
}

function checkChunkSize(value: unknown, items: number): number {
  if (value === undefined) return Math.ceil(items / DEFAULT_CHUNKS);
  if (typeof value !== "number" || !Number.isInteger(value) || value < 1 || value > items) {
    throw new QuietframeError({ path: "chunkSize", value, problem: "is not a usable chunk size", allowed: `an integer from 1 to ${items} (rows, samples or starts per chunk)` });
  }
  return value;
}

/** Where a tolerance-spec error lies in the sweep file. */
function gridPath(p: string): string {
  if (/^[xy](?=$|\.)/.test(p)) return `vary.${p}`;
  if (/^(figure|grid)(?=$|[.[])/.test(p)) return p;
  return p === "" || p === "spec" ? "vary" : `setup.${p}`;
}

/** Where a spread error lies in the sweep file. */
function samplePath(p: string): string {
  if (/^options\.(samples|seed)$/.test(p)) return `vary.${p.slice("options.".length)}`;
  if (p === "options.grid" || /^options\.grid\./.test(p)) return p.slice("options.".length);
  if (/^(uncertain|target)(?=$|[.[])/.test(p)) return `vary.${p}`;
  if (/^(figure|grid)(?=$|[.[])/.test(p)) return p;
  return `setup.${p}`;
}

/** Where an optimization error lies in the sweep file. */
function startPath(p: string): string {
  if (/^options\.(starts|seed|maxEvaluationsPerStart|tolerance)$/.test(p)) return `vary.${p.slice("options.".length)}`;
  if (/^parameters(?=$|[.[])/.test(p)) return `vary.${p}`;
  if (/^(figure|grid)(?=$|[.[])/.test(p)) return p;
  return `setup.${p}`;
}

/** Runs `f`; QuietframeError(s) it throws come back with their paths moved into the sweep file. */
function rebased<T>(f: () => T, where: (path: string) => string): T {
  try {
    return f();
  } catch (e) {
    const move = (q: QuietframeError): QuietframeError => new QuietframeError({ path: where(q.path), value: q.value, problem: q.problem, allowed: q.allowed });
    if (e instanceof QuietframeError) throw move(e);
    if (e instanceof QuietframeErrors) throw new QuietframeErrors(e.problems.map(move));
    throw e;
  }
}
