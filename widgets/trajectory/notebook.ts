/** The trajectory widget's notebook API: trajectoryWidget(...), show(), set(), figures. */
import { inspect } from "node:util";
import { QuietframeError, parseJsonText, type SetupDescription, type JointVariable } from "../../src/index";
import { trajectoryHtml } from "./html";
import type { RenderPngOptions } from "../core/render/static";
import { isTrajectoryInput, loadTrajectoryState, rebased, trajectoryDocumentText } from "./document";
import { trajectoryFigures } from "./figures";
import type { SimulationSpec, TrajectoryState } from "./format";
import { computeTrajectory, newTrajectory, trajectoryTitle, withComputation, type ComputeOptions, type TrajectoryComputation, type TrajectoryOptions } from "./model";
import { trajectorySummary } from "./summary";
import type { MimeBundle } from "../core/notebook/display";
import { showWidgetOutput } from "../core/notebook/show-output";

export interface TrajectoryShowOptions {
  /** Carry the browser runtime in this output (default: only if no widget carried it yet in this kernel). */
  includeRuntime?: boolean;
  /** PNG fallback options (default scale 1). */
  png?: RenderPngOptions;
}

/** What a run gives, as plain numbers and arrays (times in seconds). */
export interface TrajectoryFiguresPlain {
  readonly fingerprint: string;
  readonly stepsTaken: number;
  readonly stepsPlanned: number;
  readonly stopped: boolean;
  readonly time: number[];
  readonly joint: {
    label: string;
    zeroPoint: number;
    truth: number[];
    estimate: number[];
    conditional: number[];
    unconditional: number[];
    parts: Record<string, number[]>;
  }[];
  readonly entanglement: {
    pair: [string, string];
    eprX: number[];
    eprP: number[];
    duanSum: number[];
    duanBound: number;
    logNegativity: number[];
    unconditionalLogNegativity: number[];
  } | null;
  readonly minUncertaintyMargin: number;
  readonly cautions: string[];
}

/** Changes a notebook may make: control values, simulation settings, joint variables, pair. */
export interface TrajectoryChanges {
  values?: Record<string, string | number>;
  simulation?: Partial<SimulationSpec>;
  joint?: JointVariable[];
  pair?: [string, string] | null;
}

// Runs shorter than this print nothing; longer ones report progress about once a second.
const QUIET_MS = 1000;

/**
 * A trajectory widget held by a notebook cell: `await w.show()` puts the live widget in the
 * notebook, `w.figures` gives the numbers, `w.set({...})` reruns, `w.stateText()` saves it.
 */
export class NotebookTrajectory {
  #state: TrajectoryState;
  #computation: TrajectoryComputation;
  #fingerprintMatches: boolean;

  constructor(state: TrajectoryState, computation: TrajectoryComputation, fingerprintMatches = true) {
    this.#state = state;
    this.#computation = computation;
    this.#fingerprintMatches = fingerprintMatches;
  }

  get state(): TrajectoryState {
    return structuredClone(this.#state);
  }

  get computation(): TrajectoryComputation {
    return this.#computation;
  }

  /** False when the state came from a file whose stored curves this version does not reproduce bit for bit. */
  get fingerprintMatches(): boolean {
    return this.#fingerprintMatches;
  }

  get figures(): TrajectoryFiguresPlain {
    const r = this.#computation.result;
    const e = r.entanglement;
    return {
      fingerprint: this.#computation.fingerprint,
      stepsTaken: r.stepsTaken,
      stepsPlanned: r.stepsPlanned,
      stopped: r.stopped,
      time: Array.from(r.time),
      joint: r.joint.map((j) => ({
        label: j.label,
        zeroPoint: j.zeroPoint,
        truth: Array.from(j.truth),
        estimate: Array.from(j.estimate),
        conditional: Array.from(j.conditional),
        unconditional: Array.from(j.unconditional),
        parts: Object.fromEntries(Object.keys(j.parts).map((k) => [k, Array.from(j.parts[k])])),
      })),
      entanglement: e
        ? {
            pair: [e.pair[0], e.pair[1]],
            eprX: Array.from(e.eprX),
            eprP: Array.from(e.eprP),
            duanSum: Array.from(e.duanSum),
            duanBound: e.duanBound,
            logNegativity: Array.from(e.logNegativity),
            unconditionalLogNegativity: Array.from(e.unconditionalLogNegativity),
          }
        : null,
      minUncertaintyMargin: r.minUncertaintyMargin,
      cautions: [...this.#computation.cautions],
    };
  }

  /** Changes values or settings and runs again (the same checks as a loaded state). */
  set(changes: TrajectoryChanges): this {
    if (typeof changes !== "object" || changes === null)
      throw new QuietframeError({ path: "changes", value: changes, problem: "must be an object", allowed: "{ values?, simulation?, joint?, pair? }" });
    for (const key of Object.keys(changes))
      if (!["values", "simulation", "joint", "pair"].includes(key))
        throw new QuietframeError({ path: `changes.${key}`, problem: "is not something set() changes", allowed: "values, simulation, joint, pair" });
    const s = this.#state;
    const { stoppedAfter: _stopped, ...simulation } = { ...s.simulation, ...changes.simulation };
    const base = { ...s, values: { ...s.values, ...changes.values }, simulation, joint: changes.joint ?? s.joint, pair: changes.pair === undefined ? s.pair : changes.pair };
    const computation = rebased("state", () => computeTrajectory(base, kernelProgress()));
    this.#state = withComputation(base, computation);
    this.#computation = computation;
    this.#fingerprintMatches = true;
    return this;
  }

  /** The widget-state document (Jupyter widget state 2.0) as text: the shareable form. */
  stateText(): string {
    return trajectoryDocumentText(this.#state);
  }

  /** Static figure: Vega-Lite spec, SVG, PNG and CSV. */
  async staticFigures(options: RenderPngOptions = {}) {
    return trajectoryFigures(this.#computation, this.#state, options);
  }

  async bundle(options: TrajectoryShowOptions & { includeRuntime: boolean }): Promise<MimeBundle> {
    const figures = await trajectoryFigures(this.#computation, this.#state, { scale: 1, ...options.png });
    return {
      "text/html": trajectoryHtml(this.#state, this.#computation, { includeRuntime: options.includeRuntime, svg: figures.svg }),
      "image/png": figures.png,
      "text/plain": this.toString(),
    };
  }

  /** Displays the widget; write `await w.show()` (the fallback image is drawn asynchronously). */
  async show(options: TrajectoryShowOptions = {}): Promise<void> {
    await showWidgetOutput(options, (includeRuntime) => this.bundle({ ...options, includeRuntime }));
  }

  toString(): string {
    const cautions = this.#computation.cautions.map((c) => `caution: ${c}`);
    return [trajectoryTitle(this.#state), ...cautions, ...trajectorySummary(this.#computation, this.#state.joint).map((l) => `${l.label}: ${l.text}`)].join("\n");
  }

  [inspect.custom](): string {
    return this.toString();
  }
}

/**
 * Progress as text for runs that take more than a second: at most one line a second, none for
 * quick runs (the clock and the writer are parameters so that tests need not wait).
 */
export function progressReporter(now: () => number = Date.now, write: (text: string) => void = (t) => void process.stdout.write(t)): ComputeOptions {
  const started = now();
  let said = started;
  return {
    onProgress(fraction, taken, planned) {
      const t = now();
      if (t - started < QUIET_MS || t - said < QUIET_MS) return;
      said = t;
      write(`trajectory: ${(100 * fraction).toFixed(0)} % (${taken} of ${planned} steps)\n`);
    },
  };
}

function kernelProgress(): ComputeOptions {
  return progressReporter();
}

/**
 * A trajectory widget for a set-up (`{ simulation, controls?, joint?, pair?, title? }`), or for
 * a saved state: a bare state or a widget-state document, as an object or JSON text.
 */
export function trajectoryWidget(input: SetupDescription | TrajectoryState | Record<string, unknown> | string, options?: TrajectoryOptions): NotebookTrajectory {
  const value: unknown = typeof input === "string" ? parseJsonText(input, "trajectoryWidget input") : input;
  if (isTrajectoryInput(value)) {
    if (options !== undefined) throw new QuietframeError({ path: "options", problem: "cannot change a saved state's settings here", allowed: "trajectoryWidget(state) alone; then .set({...})" });
    const loaded = loadTrajectoryState(value, "state", kernelProgress());
    return new NotebookTrajectory(loaded.state, loaded.computation, loaded.fingerprintMatches);
  }
  if (options === undefined)
    throw new QuietframeError({ path: "options", problem: "is required for a set-up", allowed: '{ simulation: { duration: "200 us", step: "10 ns", seed: 1 }, controls?, joint?, pair? }' });
  const { state, computation } = newTrajectory(value as SetupDescription, options, kernelProgress());
  return new NotebookTrajectory(state, computation);
}
