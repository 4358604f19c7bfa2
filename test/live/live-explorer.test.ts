import { readFileSync } from "node:fs";
import { join } from "node:path";
import { describe, expect, test } from "vitest";
import { QuietframeError } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";
import { resolveControls, sliderPosition, sliderValue, writeValue } from "../../widgets/core/controls/setup-controls";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { curvesFromWire, type WireCurves } from "../../widgets/explorer/live/chart-wire";
import { controlWidget } from "../../widgets/explorer/live/control-widgets";
import { LiveExplorer, type LiveChange } from "../../widgets/explorer/live/live-explorer";
import { CHART_MODEL_NAME, CHART_VIEW_NAME, LIVE_MODULE } from "../../widgets/explorer/live/names";
import type { ControlSpec } from "../../widgets/core/controls/control-spec";
import { QUIETFRAME_VERSION } from "../../src/version";
import { pow } from "../../src/numeric/portable-math";
import { DeferringHost, FakeHost, type FakeModel } from "./fake-host";

const ROOT = join(__dirname, "..", "..");
const membrane = (): SetupDescription => JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane.json"), "utf8"));

const CONTROLS: ControlSpec[] = [
  { target: "cavity.photons", label: "intracavity photons", min: 1e4, max: 1e8 },
  { target: "detector.efficiency", min: "50 %", max: "100 %" },
  { target: "membrane.temperature", control: "number", min: "10 mK", max: "300 K" },
  { target: "cavity.detuning", control: "number", min: "-20 MHz", max: "20 MHz" },
];

function live(controls: ControlSpec[] = CONTROLS) {
  const state = createExplorerState(membrane(), { controls, settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 60 } } });
  const host = new FakeHost();
  const w = new LiveExplorer(host, state, computeExplorer(state));
  const chart = host.byKind(CHART_MODEL_NAME)[0];
  const control = (target: string): FakeModel => w.control(target) as FakeModel;
  return { state, host, w, chart, control };
}

/** The curves the chart model holds now, decoded as a front-end decodes them. */
function chartCurves(chart: FakeModel) {
  return curvesFromWire(chart.get("curves") as WireCurves);
}

describe("LiveExplorer: the widgets it opens", () => {
  test("a VBox holds one standard control per explorer control, then the chart", () => {
    const { host, w, chart } = live();
    const box = w.widget as FakeModel;
    expect(box.kind).toBe("VBox");
    const children = box.get("children") as string[];
    expect(children).toEqual([...CONTROLS.map((c) => `IPY_MODEL_${w.control(c.target)!.id}`), `IPY_MODEL_${chart.id}`]);
    expect(host.byKind("FloatLogSlider")).toHaveLength(1);
    expect(host.byKind("Text")).toHaveLength(2);
  });

  test("a log control becomes a log slider whose exponents span the control's decades", () => {
    const { control } = live();
    const s = control("cavity.photons");
    expect(s.kind).toBe("FloatLogSlider");
    expect(s.get("base")).toBe(10);
    expect(s.get("min")).toBeCloseTo(4, 12);
    expect(s.get("max")).toBeCloseTo(8, 12);
    expect(s.get("value")).toBe(1e6);
    // The end values themselves must lie inside 10^min … 10^max, or a range check would refuse them.
    expect(pow(10, s.get("min") as number)).toBeLessThanOrEqual(1e4);
    expect(pow(10, s.get("max") as number)).toBeGreaterThanOrEqual(1e8);
  });

  test("a linear slider shows its unit in the description and its value in that unit", () => {
    const { control } = live();
    const s = control("detector.efficiency");
    expect(s.kind).toBe("FloatSlider");
    expect(s.get("description")).toBe("detector.efficiency [%]");
    expect(s.get("min")).toBeCloseTo(50, 12);
    expect(s.get("max")).toBeCloseTo(100, 12);
    expect(s.get("value")).toBeCloseTo(95, 12);
  });

  test("a choice parameter becomes a dropdown of its choices with the current one selected", () => {
    const { control } = live([
      { target: "membrane.temperature", min: "1 K", max: "10 K" },
      { target: "detector.angle", choices: ["0 deg", "45 deg", "90 deg"] },
    ]);
    const d = control("detector.angle");
    expect(d.kind).toBe("Dropdown");
    expect(d.get("_options_labels")).toEqual(["0 deg", "45 deg", "90 deg"]);
    expect(d.get("index")).toBe(2);
  });

  test("the chart model names quietframe's module, model and view at the package version", () => {
    const { chart } = live();
    expect(chart.get("_model_module")).toBe(LIVE_MODULE);
    expect(chart.get("_model_name")).toBe(CHART_MODEL_NAME);
    expect(chart.get("_view_name")).toBe(CHART_VIEW_NAME);
    expect(chart.get("_model_module_version")).toBe(QUIETFRAME_VERSION);
    expect(chart.get("error")).toBe("");
  });

  test("the chart starts with the state's curves, bit for bit", () => {
    const { state, chart } = live();
    const expected = computeExplorer(state).table;
    const got = chartCurves(chart);
    expect(got.unit).toBe(expected.unit);
    expect(got.columns.map((c) => c.id)).toEqual(expected.columns.map((c) => c.id));
    got.columns.forEach((c, k) => expect(Buffer.from(c.values.buffer).equals(Buffer.from(expected.columns[k].values.buffer))).toBe(true));
    expect((chart.get("explorer_state") as { fingerprint: string }).fingerprint).toBe(state.fingerprint);
  });
});

describe("LiveExplorer: a control moved in a front-end", () => {
  test("recomputes with the explorer model and pushes the new curves to the chart", () => {
    const { state, w, chart, control } = live();
    control("cavity.photons").frontEndUpdate({ value: 1e7 });
    const c = resolveControls(state.setup, state.controls)[0];
    // The value is snapped to a slider position, as the kernel-free page writes it.
    const written = writeValue(c, sliderValue(c, sliderPosition(c, 1e7)));
    expect(w.values["cavity.photons"]).toBe(written);
    const expected = computeExplorer({ ...state, values: { ...state.values, "cavity.photons": written } });
    expect(chartCurves(chart).columns[0].values).toEqual(expected.table.columns[0].values);
    expect((chart.get("explorer_state") as { fingerprint: string }).fingerprint).toBe(expected.fingerprint);
    expect(w.state.fingerprint).toBe(expected.fingerprint);
    expect(chart.get("revision")).toBe(2);
  });

  test("the new curves differ from the old ones (more photons: less imprecision)", () => {
    const { state, chart, control } = live();
    const before = chartCurves(chart).columns[0].values;
    control("cavity.photons").frontEndUpdate({ value: 1e7 });
    const after = chartCurves(chart).columns[0].values;
    expect(after).not.toEqual(before);
    expect(after.length).toBe(state.settings.grid.points);
  });

  test("a slider's value in display units is read back in SI through its unit", () => {
    const { w, control } = live();
    control("detector.efficiency").frontEndUpdate({ value: 80 });
    expect(w.values["detector.efficiency"]).toBe("80 %");
  });

  test("a value typed out of range shows the reason in the chart and keeps the last valid curves and state", () => {
    const { state, w, chart, control } = live();
    const before = chartCurves(chart).columns[0].values;
    control("membrane.temperature").frontEndUpdate({ value: "500" });
    expect(w.values["membrane.temperature"]).toBe("500 K");
    expect(chart.get("error")).toMatch(/values\.membrane\.temperature.*outside the control's range/);
    expect(w.error).toBe(chart.get("error"));
    expect(chartCurves(chart).columns[0].values).toEqual(before);
    expect(w.state).toEqual(state);
    // Back in range: the error goes and the curves follow.
    control("membrane.temperature").frontEndUpdate({ value: "3 K" });
    expect(chart.get("error")).toBe("");
    expect(w.error).toBeUndefined();
    expect(w.state.values["membrane.temperature"]).toBe("3 K");
  });

  test("a front-end that sends no number gets an error text, not a NaN curve", () => {
    const { chart, control } = live();
    control("detector.efficiency").frontEndUpdate({ value: null });
    expect(chart.get("error")).toMatch(/detector\.efficiency.*no number/);
  });

  test("a blue-detuned cavity that makes the set-up unstable shows why and keeps the curves and state", () => {
    // A blue-detuned drive gives the mechanics negative optical damping: a parametric
    // instability once it beats the intrinsic damping (Aspelmeyer, Kippenberg & Marquardt,
    // Rev. Mod. Phys. 86, 1391 (2014), sec. VII); with Q = 1e8 any blue detuning does.
    const { state, w, chart, control } = live();
    const before = chartCurves(chart).columns[0].values;
    control("cavity.detuning").frontEndUpdate({ value: "1.2" });
    expect(w.values["cavity.detuning"]).toBe("1.2 MHz");
    expect(chart.get("error")).toMatch(/unstable.*blue-detuned/);
    expect(chartCurves(chart).columns[0].values).toEqual(before);
    expect(w.state).toEqual(state);
    // The red side of the same detuning cools instead: computed, and the error is gone.
    control("cavity.detuning").frontEndUpdate({ value: "-1.2 MHz" });
    expect(chart.get("error")).toBe("");
    expect(w.state.values["cavity.detuning"]).toBe("-1.2 MHz");
  });
});

describe("LiveExplorer: a cell reads and moves the controls", () => {
  test("setValues moves the control models and recomputes once", () => {
    const { w, chart, control } = live();
    w.setValues({ "detector.efficiency": "70 %", "cavity.photons": 3e6 });
    expect(control("detector.efficiency").get("value")).toBeCloseTo(70, 12);
    expect(control("cavity.photons").get("value")).toBe(3e6);
    expect(w.values["detector.efficiency"]).toBe("70 %");
    // One computation for both values: the kernel's own writes are not taken as front-end input.
    expect(chart.get("revision")).toBe(2);
    expect(w.state.values).toMatchObject({ "detector.efficiency": "70 %", "cavity.photons": 3e6 });
  });

  test("a value between slider positions is kept exactly as written", () => {
    const { w } = live();
    w.setValues({ "detector.efficiency": "91.234 %" });
    expect(w.state.values["detector.efficiency"]).toBe("91.234 %");
  });

  test("out-of-range and unknown values are refused with the path, and nothing moves", () => {
    const { w, chart, control } = live();
    let caught: unknown;
    try {
      w.setValues({ "detector.efficiency": "120 %" });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe("values.detector.efficiency");
    expect(() => w.setValues({ "laser.power": "1 W" })).toThrow(/values\.laser\.power.*has no control/);
    expect(() => w.setValues({ "detector.efficiency": "3 kg" })).toThrow(QuietframeError);
    expect(control("detector.efficiency").sent).toHaveLength(0);
    expect(chart.get("revision")).toBe(1);
  });

  test("onChange listeners see every recomputation, from either side; a failing listener does not stop the rest", () => {
    const { w, control } = live();
    const seen: LiveChange[] = [];
    w.onChange(() => {
      throw new Error("user code failed");
    });
    const stop = w.onChange((c) => seen.push(c));
    const errors: unknown[] = [];
    const original = console.error;
    console.error = (...args: unknown[]) => errors.push(args);
    try {
      control("detector.efficiency").frontEndUpdate({ value: 60 });
      w.setValues({ "cavity.photons": 2e6 });
    } finally {
      console.error = original;
    }
    expect(seen.map((c) => [c.source, c.changed])).toEqual([
      ["front-end", ["detector.efficiency"]],
      ["kernel", ["cavity.photons"]],
    ]);
    expect(seen[1].values["detector.efficiency"]).toBe("60 %");
    expect(seen[1].state.fingerprint).toBe(seen[1].computation.fingerprint);
    expect(errors).toHaveLength(2);
    stop();
    w.setValues({ "cavity.photons": 4e6 });
    expect(seen).toHaveLength(2);
  });

  test("close closes every model it opened", () => {
    const { host, w } = live();
    w.close();
    expect(host.models.every((m) => m.closed)).toBe(true);
  });
});

describe("LiveExplorer: values the kernel snaps go back to the front-end", () => {
  test("a slider value between positions is computed at the nearest position, and the slider is moved there", () => {
    const { w, control } = live();
    const slider = control("detector.efficiency");
    // The FloatSlider's own min and step (from memory: @jupyter-widgets/controls' step attribute) give its positions.
    const min = slider.get("min") as number;
    const step = slider.get("step") as number;
    const nearest = min + Math.round((72.3 - min) / step) * step;
    expect(nearest).toBeCloseTo(72.25, 12);
    slider.frontEndUpdate({ value: 72.3 });
    expect(slider.sent).toHaveLength(1);
    expect(slider.sent[0].value as number).toBeCloseTo(nearest, 12);
    expect(w.values["detector.efficiency"]).toBe("72.25 %");
    expect(w.state.values["detector.efficiency"]).toBe("72.25 %");
    // A value on a position needs no correction.
    slider.frontEndUpdate({ value: slider.get("value") });
    expect(slider.sent).toHaveLength(1);
  });

  test("a slider value on a position in the front-end's own rounding is computed there and never sent back", () => {
    const { w, control } = live();
    const slider = control("detector.efficiency");
    const c = resolveControls(membrane(), CONTROLS).find((r) => r.target === "detector.efficiency")!;
    const min = slider.get("min") as number;
    const step = slider.get("step") as number;
    // A front-end slider computes position k as min + k·step in its own floating point
    // (common practice, no source); 63.75 is one such value, while "63.75 %" reads back as
    // 63.74999999999999. Sending that back makes the slider snap to its own number and send
    // again, replacing a newer move that waits in its buffer, so the kernel keeps the old value.
    const positions = Array.from({ length: c.steps + 1 }, (_, k) => k);
    // The case arises: some position's number differs between the front-end and the kernel.
    expect(positions.some((k) => !Object.is(controlWidget(c).toWidget(writeValue(c, sliderValue(c, k))), min + k * step))).toBe(true);
    for (const k of positions) {
      slider.frontEndUpdate({ value: min + k * step });
      expect(slider.sent, `position ${k} (${min + k * step})`).toEqual([]);
      expect(w.values["detector.efficiency"], `position ${k}`).toBe(writeValue(c, sliderValue(c, k)));
    }
    expect(w.state.values["detector.efficiency"]).toBe(writeValue(c, sliderValue(c, c.steps)));
  });

  test("a drag whose front-end re-snaps every value the kernel sends ends on the drag's last value in kernel and slider", () => {
    const { w, control } = live();
    const slider = control("detector.efficiency");
    const min = slider.get("min") as number;
    const step = slider.get("step") as number;
    // The front-end's slider (from memory: @jupyter-widgets/controls' FloatSliderView) moves its
    // handle to a value the kernel sends, and sends its own stepped value again when that differs.
    const ownStep = (v: number): number => min + Math.round((v - min) / step) * step;
    let messages = 0;
    const frontEndSends = (value: number): void => {
      let next: number | undefined = value;
      while (next !== undefined && messages < 100) {
        const before = slider.sent.length;
        slider.frontEndUpdate({ value: next });
        messages += 1;
        const back = slider.sent
          .slice(before)
          .map((p) => p.value as number)
          .pop();
        next = back !== undefined && ownStep(back) !== back ? ownStep(back) : undefined;
      }
    };
    for (const v of [72.5, 68.25, 63.75, 59.5]) frontEndSends(ownStep(v));
    expect(messages).toBe(4);
    expect(slider.get("value")).toBe(ownStep(59.5));
    expect(w.values["detector.efficiency"]).toBe("59.5 %");
  });
});

describe("LiveExplorer: a burst of front-end moves", () => {
  function deferring() {
    const state = createExplorerState(membrane(), { controls: CONTROLS, settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 60 } } });
    const host = new DeferringHost();
    const w = new LiveExplorer(host, state, computeExplorer(state));
    return { state, host, w, chart: host.byKind(CHART_MODEL_NAME)[0], slider: w.control("detector.efficiency") as FakeModel };
  }

  test("is computed once, for the newest values, when the waiting messages are handled", () => {
    const { host, w, chart, slider } = deferring();
    for (const v of [60, 70, 80]) slider.frontEndUpdate({ value: v });
    expect(chart.get("revision")).toBe(1);
    expect(w.values["detector.efficiency"]).toBe("80 %");
    host.settleAll();
    expect(chart.get("revision")).toBe(2);
    expect((chart.get("explorer_state") as { values: Record<string, unknown> }).values["detector.efficiency"]).toBe("80 %");
    expect(w.state.fingerprint).toBe(computeExplorer({ ...w.state }).fingerprint);
  });

  test("reading state computes at once, so a cell never sees values and state apart", () => {
    const { host, w, chart, slider } = deferring();
    slider.frontEndUpdate({ value: 65 });
    expect(w.state.values["detector.efficiency"]).toBe("65 %");
    expect(chart.get("revision")).toBe(2);
    host.settleAll();
    expect(chart.get("revision")).toBe(2);
  });

  test("a cell's set() computes the waiting moves together with its own values", () => {
    const { host, w, chart, slider } = deferring();
    slider.frontEndUpdate({ value: 65 });
    const changes: LiveChange[] = [];
    w.onChange((c) => changes.push(c));
    w.setValues({ "cavity.photons": 2e6 });
    expect(changes.map((c) => [...c.changed].sort())).toEqual([["cavity.photons", "detector.efficiency"]]);
    expect(w.state.values).toMatchObject({ "detector.efficiency": "65 %", "cavity.photons": 2e6 });
    host.settleAll();
    expect(chart.get("revision")).toBe(2);
  });
});

describe("LiveExplorer: a part closed by a front-end", () => {
  test("closes the others, and set() then refuses with a QuietframeError; values stay those of the last chart", () => {
    const { host, w, chart, control } = live();
    control("detector.efficiency").frontEndUpdate({ value: 70 });
    chart.close();
    expect(host.models.every((m) => m.closed)).toBe(true);
    expect(w.isClosed).toBe(true);
    expect(() => w.setValues({ "detector.efficiency": "60 %" })).toThrow(/^explorer: is closed \(its chart was closed by a front-end\)/);
    expect(() => w.setValues({ "detector.efficiency": "60 %" })).toThrow(QuietframeError);
    expect(w.values).toEqual(w.state.values);
    expect(w.values["detector.efficiency"]).toBe("70 %");
    // A late move of a closed control changes nothing.
    control("detector.efficiency").frontEndUpdate({ value: 55 });
    expect(w.values["detector.efficiency"]).toBe("70 %");
    expect(chart.get("revision")).toBe(2);
  });
});
