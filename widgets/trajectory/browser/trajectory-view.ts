/** The trajectory widget in the page: controls, runs in slices with progress and Stop, charts. */
import { widgetBaseCss } from "../../core/browser/styles";
import type { View } from "vega";
import { vega } from "../../core/browser/vega";
import { QuietframeError } from "../../../src/index";
import { resolveControls } from "../../core/controls/setup-controls";
import { CAUTION_HEADING } from "../../core/page/summary-line";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../core/page/names";
import { trajectoryCsv } from "../csv";
import { parseTrajectoryState, trajectoryDocumentText } from "../document";
import type { SimulationSpec, TrajectoryState } from "../format";
import { finishTrajectory, prepareTrajectory, trajectoryTitle, withComputation, type PreparedTrajectory, type TrajectoryComputation } from "../model";
import { TRAJECTORY_ATTRIBUTES, TRAJECTORY_CLASS, TRAJECTORY_STATE_CLASS } from "../names";
import { STATIC_POINTS, trajectoryRows } from "../series";
import { resolveSimulation, writeTime } from "../simulation";
import { trajectoryPanelSpec, trajectorySpecs } from "../specs";
import { trajectorySummary } from "../summary";
import { actionButton, copyText, downloadText, downloadUrl, fileStem } from "../../core/browser/actions";
import { methodsButtons } from "../../core/browser/methods-buttons";
import { trajectoryMethods } from "../methods/methods";
import { messageOf } from "../../core/browser/boot";
import { ControlsView } from "../../core/browser/controls-view";
import { el, flashText, injectStyleOnce } from "../../core/browser/dom";
import { replaceCanvasCharts } from "../../core/browser/canvas-charts";

export type TrajectoryStatus = "booting" | "running" | "ready" | "error";

const STYLE_ID = "quietframe-trajectory-style";
const T = `.${TRAJECTORY_CLASS}`;
const CSS = `${widgetBaseCss(T)}
${T} .qf-controls label{font-weight:500}
${T} .qf-controls output,${T} .qf-unit{font-variant-numeric:tabular-nums;color:#333}
${T} [aria-invalid=true]{outline:2px solid #b3261e;outline-offset:1px}
${T} .qf-notice{border-left:4px solid #a06a00;background:#fdf5e4;color:#4a3300;padding:.45em .7em;white-space:pre-wrap}
${T} .qf-caution{border:2px solid #c77700;background:#fff6de;color:#3d2600;padding:.45em .7em}
${T} .qf-caution ul{margin:.2em 0 0;padding-left:1.2em}
${T} .qf-run{display:flex;gap:.6em;align-items:center;flex-wrap:wrap}
${T} .qf-run progress{width:18em}
${T} .qf-run-text{font-variant-numeric:tabular-nums;color:#333;font-size:13px}
${T} .qf-charts{display:flex;flex-wrap:wrap;gap:1em;align-items:flex-start}
${T} .qf-readout dd{margin:0;font-variant-numeric:tabular-nums}
${T} .qf-actions button,${T} .qf-run button{font:inherit;font-size:13px;padding:.2em .7em;cursor:pointer}
${T} .qf-flash{color:#2f5f2f;padding:.2em .7em}
${T} .qf-copy-fallback{width:100%;min-height:6em;font-family:ui-monospace,monospace;font-size:12px}
`;

/** Wall-clock budget of one slice of steps: short enough that the page keeps answering input. */
const SLICE_MS = 12;
const FIRST_SLICE_STEPS = 200;

/** The widget's styles, added to the page once. */
export function injectTrajectoryStyles(doc: Document = document): void {
  injectStyleOnce(STYLE_ID, CSS, doc);
}

let widgetCount = 0;

/** A run in progress: its prepared simulation, the state it belongs to, and whether it was replaced. */
interface ActiveRun {
  readonly prepared: PreparedTrajectory;
  readonly state: Omit<TrajectoryState, "fingerprint">;
  cancelled: boolean;
}

/**
 * One live trajectory widget. It owns no physics: every run goes through prepareTrajectory /
 * finishTrajectory, the code the kernel and the CLI run, advanced here in short slices between
 * which the page stays responsive. The state it keeps (and saves) always describes the curves
 * on screen; a value the model refuses is reported and the last valid state stays.
 */
export class TrajectoryWidget {
  readonly element: HTMLElement;
  readonly ready: Promise<void>;
  private initial: TrajectoryState | undefined;
  private stored: TrajectoryState | undefined;
  private state: TrajectoryState | undefined;
  private computation: TrajectoryComputation | undefined;
  /** What the controls show; may differ from `state` while refused. */
  private shownValues: Record<string, string | number> = {};
  private shownSimulation: SimulationSpec | undefined;
  private controls: ControlsView | undefined;
  private readonly simInputs: Record<"duration" | "step" | "seed", HTMLInputElement> = {
    duration: el("input", { type: "text", spellcheck: "false", autocomplete: "off", "data-target": "simulation.duration" }),
    step: el("input", { type: "text", spellcheck: "false", autocomplete: "off", "data-target": "simulation.step" }),
    seed: el("input", { type: "text", inputmode: "numeric", spellcheck: "false", autocomplete: "off", "data-target": "simulation.seed" }),
  };
  private readonly alert = el("div", { class: "qf-alert", role: "alert", hidden: "" });
  private readonly notice = el("div", { class: "qf-notice", role: "status", hidden: "" });
  private readonly flashNote = el("div", { class: "qf-flash", role: "status", hidden: "" });
  private readonly cautionList = el("ul");
  private readonly caution = el("div", { class: "qf-caution", role: "note", hidden: "" }, [el("strong", {}, [CAUTION_HEADING]), this.cautionList]);
  private readonly progressBar = el("progress", { max: "1", value: "0" });
  private readonly progressText = el("span", { class: "qf-run-text", "aria-live": "polite" });
  private readonly stopButton = el("button", { type: "button", class: "qf-stop", disabled: "" }, ["Stop"]);
  private readonly charts = el("div", { class: "qf-charts" });
  private readonly readout = el("dl", { class: "qf-readout", "aria-live": "polite" });
  private readonly copyHost = el("div", { hidden: "" });
  private views: View[] = [];
  private active: ActiveRun | undefined;
  private scheduled = false;
  private scheduledTimer: ReturnType<typeof setTimeout> | undefined;
  /** An edit that Stop dropped before it started a run: the fields are put back when the stopped run ends. */
  private editDroppedByStop = false;
  private disposed = false;
  private resolveFirst: (() => void) | undefined;

  constructor(element: HTMLElement) {
    this.element = element;
    this.ready = new Promise((resolve) => {
      this.resolveFirst = resolve;
    });
    this.start();
  }

  get status(): TrajectoryStatus {
    return (this.element.getAttribute(STATUS_ATTRIBUTE) as TrajectoryStatus | null) ?? "booting";
  }

  get fingerprint(): string | undefined {
    return this.computation?.fingerprint;
  }

  /** The state describing the curves on screen, as "Download state" saves it. */
  currentState(): TrajectoryState | undefined {
    return this.state && structuredClone(this.state);
  }

  /** The rows a chart is plotting now, by dataset name (see DATASETS in specs.ts); empty if no chart has it. */
  plotted(dataset: string): Record<string, unknown>[] {
    for (const v of this.views) {
      try {
        return (v.data(dataset) as Record<string, unknown>[]).map((row) => ({ ...row }));
      } catch {
        // Not this chart's dataset.
      }
    }
    return [];
  }

  /** Sets a control (a set-up parameter or "simulation.duration" / ".step" / ".seed") as if the reader had. */
  setValue(target: string, value: string | number): void {
    if (target.startsWith("simulation.")) {
      const key = target.slice("simulation.".length) as "duration" | "step" | "seed";
      this.simInputs[key].value = String(value);
      this.onSimulationInput();
      return;
    }
    this.shownValues = { ...this.shownValues, [target]: value };
    this.controls?.show({ [target]: value });
    this.requestRun();
  }

  /**
   * Stops the run in progress; the curves it reached are shown and become the state. An edit
   * not yet applied is dropped, not started: leaving an edited field by pressing Stop sends its
   * change event just before the click, and Stop must still stop.
   */
  stop(): void {
    if (this.scheduled) {
      clearTimeout(this.scheduledTimer);
      this.scheduled = false;
      this.editDroppedByStop = true;
    }
    const run = this.active;
    if (!run || run.cancelled) return;
    run.prepared.run.stop();
  }

  dispose(): void {
    this.disposed = true;
    if (this.active) this.active.cancelled = true;
    for (const v of this.views) v.finalize();
    this.views = [];
  }

  private start(): void {
    this.element.setAttribute(STATUS_ATTRIBUTE, "booting");
    this.element.prepend(this.alert);
    let state: TrajectoryState;
    try {
      const script = this.element.querySelector<HTMLScriptElement>(`script.${TRAJECTORY_STATE_CLASS}`);
      if (!script) throw new Error("this widget carries no state");
      state = parseTrajectoryState(script.textContent ?? "", "state");
      const controls = resolveControls(state.setup, state.controls);
      const id = `quietframe-t${++widgetCount}`;
      this.controls = new ControlsView(controls, state.values, id, (target, value) => this.setValue(target, value));
      this.shownValues = { ...state.values };
      this.shownSimulation = { ...state.simulation };
      this.showSimulation(state.simulation);
      const live = el("div", { class: "qf-live" }, [
        el("strong", { class: "qf-title" }, [trajectoryTitle(state)]),
        this.controls.element,
        this.simulationControls(id),
        this.runBar(),
        this.alert,
        this.notice,
        this.caution,
        this.flashNote,
        this.charts,
        this.readout,
        this.actions(),
        this.copyHost,
      ]);
      live.hidden = true;
      this.element.append(live);
    } catch (e) {
      this.fail(e);
      return;
    }
    this.initial = state;
    this.stored = state;
    this.launch(state);
  }

  private simulationControls(id: string): HTMLElement {
    const rows: HTMLElement[] = [];
    const row = (key: "duration" | "step" | "seed", label: string, hint: string): void => {
      const input = this.simInputs[key];
      input.id = `${id}-sim-${key}`;
      input.addEventListener("change", () => this.onSimulationInput());
      rows.push(el("label", { for: input.id }, [label]), input, el("span", { class: "qf-unit" }, [hint]));
    };
    row("duration", "simulated time", "with unit, e.g. 200 µs");
    row("step", "integration step", "with unit, e.g. 10 ns");
    row("seed", "random seed", "integer 0 … 4294967295");
    return el("div", { class: "qf-controls qf-simulation" }, rows);
  }

  private runBar(): HTMLElement {
    this.stopButton.addEventListener("click", () => this.stop());
    const rerun = el("button", { type: "button", class: "qf-rerun", title: "Run the whole duration again (after a stop)" }, ["Run"]);
    rerun.addEventListener("click", () => this.requestRun());
    return el("div", { class: "qf-run" }, [this.progressBar, this.progressText, this.stopButton, rerun]);
  }

  private showSimulation(sim: SimulationSpec): void {
    this.simInputs.duration.value = typeof sim.duration === "number" ? writeTime(sim.duration) : sim.duration;
    this.simInputs.step.value = typeof sim.step === "number" ? writeTime(sim.step) : sim.step;
    this.simInputs.seed.value = String(sim.seed);
  }

  private onSimulationInput(): void {
    const base = this.shownSimulation ?? this.state?.simulation;
    if (!base) return;
    const text = (k: "duration" | "step"): string | number => {
      const v = this.simInputs[k].value.trim();
      // A bare number is taken in seconds, as in a state file.
      return /^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(v) ? Number(v) : v;
    };
    const seedText = this.simInputs.seed.value.trim();
    // Text that is not an integer stays what it is, so the model's check can name it.
    const seed = /^[-+]?\d+(\.\d*)?(e[-+]?\d+)?$/i.test(seedText) ? Number(seedText) : (seedText as unknown as number);
    const { stoppedAfter: _s, ...rest } = base;
    this.shownSimulation = { ...rest, duration: text("duration"), step: text("step"), seed };
    this.requestRun();
  }

  /** Coalesces bursts of input (a dragged slider) into one run. */
  private requestRun(): void {
    if (this.scheduled || this.disposed || !this.state) return;
    this.scheduled = true;
    const go = (): void => {
      this.scheduled = false;
      const base = this.state;
      if (!base || !this.shownSimulation) return;
      const { fingerprint: _f, ...rest } = base;
      const { stoppedAfter: _s, ...simulation } = this.shownSimulation;
      this.launch({ ...rest, values: { ...this.shownValues }, simulation }, true);
    };
    // A task, not an animation frame: frames may not come while nothing on the page changes,
    // and a run is long next to one frame anyway.
    this.scheduledTimer = setTimeout(go, 0);
  }

  /** Starts a run for a state, replacing any run in progress. */
  private launch(state: Omit<TrajectoryState, "fingerprint">, userChange = false): void {
    if (this.active) this.active.cancelled = true;
    let prepared: PreparedTrajectory;
    try {
      // Samples follow the run's length unless the state fixes them.
      prepared = prepareTrajectory(userChange ? withSamples(state) : state);
    } catch (e) {
      this.active = undefined;
      if (this.state === undefined) this.fail(e);
      else this.refuse(e);
      return;
    }
    const run: ActiveRun = { prepared, state: userChange ? withSamples(state) : state, cancelled: false };
    this.active = run;
    this.setRunning(true);
    this.showProgress(0, 0, prepared.run.planned);
    void this.drive(run);
  }

  /** Advances a run slice by slice, yielding to the page between slices. */
  private async drive(run: ActiveRun): Promise<void> {
    let steps = FIRST_SLICE_STEPS;
    const sim = run.prepared.run;
    for (;;) {
      await nextTask();
      if (run.cancelled || this.disposed) return;
      const t0 = performance.now();
      let done: boolean;
      try {
        done = sim.advance(steps);
      } catch (e) {
        return this.endWithError(run, e);
      }
      const ms = performance.now() - t0;
      // Aim each slice at SLICE_MS; the slice size never changes the numbers, only the pace.
      steps = Math.max(1, Math.min(steps * 4, Math.floor((steps * SLICE_MS) / Math.max(ms, 0.5))));
      this.showProgress(sim.progress, sim.taken, sim.planned);
      if (done) break;
    }
    let computation: TrajectoryComputation;
    try {
      computation = finishTrajectory(run.prepared);
      await this.draw(computation, run.state);
    } catch (e) {
      return this.endWithError(run, e);
    }
    if (run.cancelled || this.disposed) return;
    this.active = undefined;
    const state = withComputation(run.state, computation);
    const first = this.state === undefined;
    this.state = state;
    this.computation = computation;
    this.shownValues = { ...state.values };
    this.shownSimulation = { ...state.simulation };
    this.controls?.markInvalid([]);
    for (const input of Object.values(this.simInputs)) input.removeAttribute("aria-invalid");
    this.alert.hidden = true;
    this.alert.textContent = "";
    if (first && this.stored && computation.fingerprint !== this.stored.fingerprint) {
      this.notice.textContent =
        `These curves differ from the ones stored with this state (computed by quietframe ${this.stored.quietframe}); ` +
        `the stored fingerprint is ${this.stored.fingerprint}, this page computes ${computation.fingerprint}.`;
      this.notice.hidden = false;
    } else if (!first) {
      this.notice.hidden = true;
      this.notice.textContent = "";
    }
    if (this.editDroppedByStop) {
      // The fields show what the stopped run used, not the edit Stop dropped.
      this.editDroppedByStop = false;
      this.showSimulation(state.simulation);
      this.controls?.show(state.values);
      this.flash("Stopped. The edit made during the run was not applied; the fields show the stopped run's settings (edit again or press Run).");
    }
    this.showFigures(computation, state.joint);
    this.setRunning(false);
    this.element.setAttribute(TRAJECTORY_ATTRIBUTES.stopped, String(computation.result.stopped));
    this.element.setAttribute(TRAJECTORY_ATTRIBUTES.stepsTaken, String(computation.result.stepsTaken));
    this.element.setAttribute(FINGERPRINT_ATTRIBUTE, computation.fingerprint);
    this.element.setAttribute(STATUS_ATTRIBUTE, "ready");
    if (first) {
      this.element.querySelector<HTMLElement>(".qf-fallback")?.setAttribute("hidden", "");
      const live = this.element.querySelector<HTMLElement>(".qf-live");
      if (live) live.hidden = false;
      this.resolveFirst?.();
    }
  }

  private endWithError(run: ActiveRun, e: unknown): void {
    if (run.cancelled) return;
    this.active = undefined;
    this.setRunning(false);
    if (this.state === undefined) return this.fail(e);
    this.refuse(e);
  }

  private setRunning(running: boolean): void {
    this.element.setAttribute(TRAJECTORY_ATTRIBUTES.running, String(running));
    if (running) {
      this.stopButton.removeAttribute("disabled");
      if (this.state !== undefined) this.element.setAttribute(STATUS_ATTRIBUTE, "running");
    } else this.stopButton.setAttribute("disabled", "");
  }

  private showProgress(fraction: number, taken: number, planned: number): void {
    this.progressBar.value = fraction;
    this.progressText.textContent = `${(100 * fraction).toFixed(0)} % · ${taken} of ${planned} steps`;
    this.element.setAttribute(TRAJECTORY_ATTRIBUTES.progress, String(fraction));
  }

  /** A value the model refuses: say why, keep the last valid state and curves. */
  private refuse(e: unknown): void {
    this.alert.textContent = `Not applied: ${messageOf(e)}\nThe charts and saved state keep the last valid values.`;
    this.alert.hidden = false;
    const state = this.state;
    if (state) {
      this.controls?.markInvalid(Object.keys(this.shownValues).filter((t) => this.shownValues[t] !== state.values[t]));
      const path = e instanceof QuietframeError ? e.path : "";
      for (const [key, input] of Object.entries(this.simInputs)) {
        if (path === `simulation.${key}`) input.setAttribute("aria-invalid", "true");
        else input.removeAttribute("aria-invalid");
      }
    }
    this.element.setAttribute(STATUS_ATTRIBUTE, "error");
  }

  private fail(e: unknown): void {
    this.alert.textContent = `The interactive view cannot start: ${messageOf(e)}`;
    this.alert.hidden = false;
    this.element.setAttribute(STATUS_ATTRIBUTE, "error");
    this.resolveFirst?.();
  }

  private async draw(c: TrajectoryComputation, state: Omit<TrajectoryState, "fingerprint">): Promise<void> {
    const specs = trajectorySpecs(
      trajectoryRows(c.result, Infinity, state.joint),
      state.joint.map((j) => j.label),
      state.pair,
    );
    this.views = await replaceCanvasCharts(this.charts, specs, this.views);
  }

  private showFigures(c: TrajectoryComputation, joint: TrajectoryState["joint"]): void {
    this.readout.replaceChildren(...trajectorySummary(c, joint).flatMap((l) => [el("dt", {}, [l.label]), el("dd", {}, [l.text])]));
    this.cautionList.replaceChildren(...c.cautions.map((x) => el("li", {}, [x])));
    this.caution.hidden = c.cautions.length === 0;
    this.showProgress(c.result.stepsTaken / c.result.stepsPlanned, c.result.stepsTaken, c.result.stepsPlanned);
  }

  /** The whole figure (all charts), drawn off-screen from the static panel spec. */
  private async panelView(): Promise<View> {
    const state = this.requireState();
    const c = this.requireComputation();
    const spec = trajectoryPanelSpec(
      trajectoryRows(c.result, STATIC_POINTS, state.joint),
      state.joint.map((j) => j.label),
      state.pair,
      trajectoryTitle(state),
    );
    const { View, parse, compile } = vega();
    const view = new View(parse(compile(spec as unknown as Parameters<typeof compile>[0]).spec), { renderer: "none" });
    await view.runAsync();
    return view;
  }

  private actions(): HTMLElement {
    const button = (label: string, title: string, action: () => unknown): HTMLButtonElement => actionButton(label, title, action, this.alert);
    const stem = (): string => fileStem(this.state ? trajectoryTitle(this.state) : "trajectory");
    return el("div", { class: "qf-actions" }, [
      button("Copy state", "Copy the widget-state JSON (set-up, controls, values, simulation, fingerprint)", async () => {
        const how = await copyText(trajectoryDocumentText(this.requireState()), this.copyHost);
        if (how === "copied") this.flash("State copied to the clipboard.");
      }),
      button("Download state", "Save the widget-state JSON; the CLI, the standalone page and trajectoryWidget() read it", () =>
        downloadText(trajectoryDocumentText(this.requireState()), `${stem()}.json`, "application/json"),
      ),
      button("SVG", "Save the charts as SVG", async () => {
        const view = await this.panelView();
        try {
          downloadText(await view.toSVG(), `${stem()}.svg`, "image/svg+xml");
        } finally {
          view.finalize();
        }
      }),
      button("PNG", "Save the charts as PNG", async () => {
        const view = await this.panelView();
        try {
          downloadUrl(await view.toImageURL("png", 2), `${stem()}.png`);
        } finally {
          view.finalize();
        }
      }),
      button("CSV", "Save every stored number (shortest round-trip form)", () => downloadText(trajectoryCsv(this.requireComputation().result, this.requireState().joint), `${stem()}.csv`, "text/csv")),
      ...methodsButtons(button, stem, (options) => trajectoryMethods(this.requireState(), this.requireComputation(), options)),
      button("Reset", "Back to the values and settings this widget was created with", () => this.reset()),
    ]);
  }

  private reset(): void {
    const initial = this.initial;
    if (!initial) return;
    this.shownValues = { ...initial.values };
    this.shownSimulation = { ...initial.simulation };
    this.controls?.show(this.shownValues);
    this.showSimulation(initial.simulation);
    const { fingerprint: _f, ...rest } = initial;
    this.launch(rest);
  }

  private flash(text: string): void {
    flashText(this.flashNote, text);
  }

  private requireState(): TrajectoryState {
    if (!this.state) throw new Error("the widget has no valid state");
    return this.state;
  }

  private requireComputation(): TrajectoryComputation {
    if (!this.computation) throw new Error("the widget has no valid state");
    return this.computation;
  }
}

/** A changed run keeps its stored points while they fit its length, else takes the default for it. */
function withSamples(state: Omit<TrajectoryState, "fingerprint">): Omit<TrajectoryState, "fingerprint"> {
  const { samples, ...simulation } = state.simulation;
  try {
    const steps = resolveSimulation(simulation).steps;
    if (samples !== undefined && samples <= steps + 1) return state;
  } catch {
    // The run itself is invalid; prepareTrajectory says why.
  }
  return { ...state, simulation };
}

/** Resolves after the browser has had a chance to handle input and paint. */
function nextTask(): Promise<void> {
  return new Promise((resolve) => setTimeout(resolve, 0));
}
