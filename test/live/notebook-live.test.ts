import { readFileSync } from "node:fs";
import { join } from "node:path";
import { afterEach, describe, expect, test } from "vitest";
import { QuietframeError } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";
import { computeExplorer } from "../../widgets/explorer/model";
import { installKernelComms } from "../../widgets/core/comm/kernel-comms";
import { CHART_MODEL_NAME, LIVE_MODULE } from "../../widgets/explorer/live/names";
import type { LiveChange } from "../../widgets/explorer/live/live-explorer";
import { explorer } from "../../widgets/explorer/notebook/explorer";
import { liveRuntimeCarried, resetLiveSession } from "../../widgets/explorer/live/live-session";
import { resetDisplaySession, runtimeShown } from "../../widgets/core/notebook/session";
import { frontEnd, recordingComms, type Published } from "../kernel/fake-transport";

/**
 * explorer(...).show() under the quietframe kernel's comms (a recording transport stands in
 * for the kernel's sockets): the widget protocol messages it sends, and a front-end's update
 * coming back. Message shapes: Jupyter widget message protocol 2.1 (@jupyter-widgets/schema
 * messages.md): comm_open on "jupyter.widget" with data {state, buffer_paths}, comm_msg
 * {method: "update" | "echo_update", state, buffer_paths}.
 */
const ROOT = join(__dirname, "..", "..");
const membrane = (): SetupDescription => JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane.json"), "utf8"));
const OPTIONS = {
  controls: [
    { target: "detector.efficiency", label: "detection efficiency", min: "50 %", max: "100 %" },
    { target: "cavity.photons", min: 1e4, max: 1e8 },
  ],
  settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 50 } },
};

afterEach(() => {
  installKernelComms(undefined);
  resetLiveSession();
  resetDisplaySession();
});

function opened(sent: Published[], modelName: string): Published[] {
  return sent.filter((m) => m.msgType === "comm_open" && (m.content.data as { state: Record<string, unknown> }).state._model_name === modelName);
}

function stateOf(m: Published): Record<string, unknown> {
  return (m.content.data as { state: Record<string, unknown> }).state;
}

describe("explorer(...).show() under the quietframe kernel", () => {
  test("opens standard sliders and the chart model, with the curves as binary buffers", async () => {
    const { comms, sent } = recordingComms();
    installKernelComms(comms);
    const w = explorer(membrane(), OPTIONS);
    await w.show();
    const [slider] = opened(sent, "FloatSliderModel");
    expect(stateOf(slider)).toMatchObject({ description: "detection efficiency [%]", _model_module: "@jupyter-widgets/controls" });
    expect(opened(sent, "FloatLogSliderModel")).toHaveLength(1);
    const [chart] = opened(sent, CHART_MODEL_NAME);
    expect(stateOf(chart)._model_module).toBe(LIVE_MODULE);
    const paths = (chart.content.data as { buffer_paths: (string | number)[][] }).buffer_paths;
    expect(paths).toContainEqual(["curves", "frequencies"]);
    // One buffer per curve plus the frequencies, each 8 bytes per grid point.
    expect(chart.buffers.length).toBe(paths.length);
    expect(chart.buffers.every((b) => b.byteLength === 8 * 50)).toBe(true);
    const [box] = opened(sent, "VBoxModel");
    expect((stateOf(box).children as string[]).at(-1)).toBe(`IPY_MODEL_${chart.content.comm_id as string}`);
  });

  test("a front-end update of the slider recomputes; values, state and listeners follow", async () => {
    const { comms, sent } = recordingComms();
    installKernelComms(comms);
    const w = explorer(membrane(), OPTIONS);
    await w.show();
    const changes: LiveChange[] = [];
    w.onChange((c) => changes.push(c));
    const sliderId = opened(sent, "FloatSliderModel")[0].content.comm_id as string;
    const chartId = opened(sent, CHART_MODEL_NAME)[0].content.comm_id as string;
    const before = sent.length;
    await frontEnd(comms, sliderId, { method: "update", state: { value: 80 }, buffer_paths: [] });
    expect(w.values["detector.efficiency"]).toBe("80 %");
    expect(w.state.values["detector.efficiency"]).toBe("80 %");
    expect(w.state.fingerprint).toBe(computeExplorer({ ...w.state }).fingerprint);
    expect(changes.map((c) => c.source)).toEqual(["front-end"]);
    const chartUpdates = sent.slice(before).filter((m) => m.content.comm_id === chartId && (m.content.data as { method: string }).method === "update");
    expect(chartUpdates).toHaveLength(1);
    expect((chartUpdates[0].content.data as { state: { explorer_state: { fingerprint: string } } }).state.explorer_state.fingerprint).toBe(w.state.fingerprint);
  });

  test("set(target, value) from a cell sends the slider's new value to the front-ends", async () => {
    const { comms, sent } = recordingComms();
    installKernelComms(comms);
    const w = explorer(membrane(), OPTIONS);
    await w.show();
    const sliderId = opened(sent, "FloatSliderModel")[0].content.comm_id as string;
    const before = sent.length;
    w.set("detector.efficiency", "70 %");
    const update = sent.slice(before).find((m) => m.content.comm_id === sliderId);
    expect((update!.content.data as { method: string; state: { value: number } }).method).toBe("update");
    expect((update!.content.data as { state: { value: number } }).state.value).toBeCloseTo(70, 12);
    expect(w.values["detector.efficiency"]).toBe("70 %");
    w.values = { "cavity.photons": 2e6 };
    expect(w.state.values).toMatchObject({ "detector.efficiency": "70 %", "cavity.photons": 2e6 });
    expect(() => w.set("detector.efficiency", "45 %")).toThrow(QuietframeError);
  });
});

describe("the browser runtime in live fallbacks", () => {
  test("goes into the first live fallback only, and leaves kernel-free outputs to carry their own", async () => {
    const { comms } = recordingComms();
    installKernelComms(comms);
    expect(liveRuntimeCarried()).toBe(false);
    await explorer(membrane(), OPTIONS).show();
    expect(liveRuntimeCarried()).toBe(true);
    // A front-end with widgets never renders the fallback, so the page may still lack the runtime.
    expect(runtimeShown()).toBe(false);
  });
});

describe("explorer(...) outside the quietframe kernel", () => {
  test("set, values and onChange work on the kernel-free state", async () => {
    const w = explorer(membrane(), OPTIONS);
    const changes: LiveChange[] = [];
    const stop = w.onChange((c) => changes.push(c));
    w.set("detector.efficiency", "60 %");
    expect(w.values["detector.efficiency"]).toBe("60 %");
    expect(changes).toHaveLength(1);
    expect(changes[0].state.fingerprint).toBe(w.state.fingerprint);
    stop();
    w.values = { "detector.efficiency": "65 %" };
    expect(changes).toHaveLength(1);
    expect(w.error).toBeUndefined();
  });
});
