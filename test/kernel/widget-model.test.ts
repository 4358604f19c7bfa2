import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { widgetViewBundle } from "../../widgets/core/comm/display-widget";
import { WidgetModel } from "../../widgets/core/comm/widget-model";
import { widgetRegistry } from "../../widgets/core/comm/widget-registry";
import { frontEnd, recordingComms } from "./fake-transport";

// Widget message protocol 2.1: @jupyter-widgets/schema, messages.md, "Widget messaging
// protocol, version 2" (comm_open with state + buffer_paths, update, echo_update,
// request_state, custom, display).

const BASE = { _model_name: "TestModel", _model_module: "quietframe-test", _model_module_version: "0.0.0", _view_name: "TestView", _view_module: "quietframe-test", _view_module_version: "0.0.0" };

function model(extra: Record<string, unknown> = {}) {
  const rec = recordingComms();
  const m = new WidgetModel(
    { ...BASE, n: 1, label: "a", ...extra },
    {
      comms: rec.comms,
      validators: {
        n: (v) => {
          if (typeof v !== "number" || v < 0) throw new QuietframeError({ path: "TestModel.n", value: v, problem: "must be ≥ 0", allowed: "a number ≥ 0" });
          return Math.round(v);
        },
      },
    },
  );
  return { m, ...rec };
}

describe("WidgetModel", () => {
  it("opens on jupyter.widget with the full state and version 2.1.0 metadata", () => {
    const { m, sent } = model({ data: new Float32Array([1, 2]) });
    expect(sent[0].msgType).toBe("comm_open");
    expect(sent[0].content).toEqual({ comm_id: m.id, target_name: "jupyter.widget", data: { state: { ...BASE, n: 1, label: "a" }, buffer_paths: [["data"]] } });
    expect(sent[0].metadata).toEqual({ version: "2.1.0" });
    expect(sent[0].buffers[0].byteLength).toBe(8);
    expect(m.ref).toBe(`IPY_MODEL_${m.id}`);
    expect(widgetRegistry().get(m.id)?.fullState().buffer_paths).toEqual([["data"]]);
  });

  it("set() sends an update with the changed keys and tells listeners the source", () => {
    const { m, sent } = model();
    const seen: unknown[] = [];
    m.on("change:n", (v, old, source) => seen.push(["n", v, old, source]));
    m.on("change", (changes, source) => seen.push(["all", changes, source]));
    m.set({ n: 4 });
    expect(sent.at(-1)?.content.data).toEqual({ method: "update", state: { n: 4 }, buffer_paths: [] });
    expect(seen).toEqual([
      ["n", 4, 1, "kernel"],
      ["all", { n: 4 }, "kernel"],
    ]);
    expect(m.get("n")).toBe(4);
  });

  it("set() with an invalid value throws a QuietframeError and sends nothing", () => {
    const { m, sent } = model();
    const before = sent.length;
    expect(() => m.set({ n: -2 })).toThrow(QuietframeError);
    expect(() => m.set({ nope: 1 })).toThrow("TestModel.nope = 1: is not a key of this model");
    expect(sent.length).toBe(before);
    expect(m.get("n")).toBe(1);
  });

  it("applies a front-end update and echoes it (echo_update, protocol 2.1)", async () => {
    const { m, sent } = model();
    const seen: unknown[] = [];
    m.on("change:label", (v, old, source) => seen.push([v, old, source]));
    await frontEnd(m["comms"], m.id, { method: "update", state: { label: "b" }, buffer_paths: [] });
    expect(sent.at(-1)?.content.data).toEqual({ method: "echo_update", state: { label: "b" }, buffer_paths: [] });
    expect(seen).toEqual([["b", "a", "frontend"]]);
  });

  it("sends a plain update too when the validator normalised the front-end's value", async () => {
    const { m, sent } = model();
    await frontEnd(m["comms"], m.id, { method: "update", state: { n: 2.6 } });
    expect(sent.slice(-2).map((s) => s.content.data)).toEqual([
      { method: "echo_update", state: { n: 3 }, buffer_paths: [] },
      { method: "update", state: { n: 3 }, buffer_paths: [] },
    ]);
    expect(m.get("n")).toBe(3);
  });

  it("refuses a whole update when one key is invalid: error as custom message, values restored, log line", async () => {
    const { m, sent, log } = model();
    await frontEnd(m["comms"], m.id, { method: "update", state: { label: "c", n: -5 } });
    const [error, restore] = sent.slice(-2).map((s) => s.content.data as Record<string, unknown>);
    expect(error).toEqual({
      method: "custom",
      content: { error: { method: "update", message: "TestModel.n = -5: must be ≥ 0; allowed: a number ≥ 0", path: "TestModel.n", problem: "must be ≥ 0", allowed: "a number ≥ 0" } },
    });
    expect(restore).toEqual({ method: "update", state: { label: "a", n: 1 }, buffer_paths: [] });
    expect(m.state).toMatchObject({ label: "a", n: 1 });
    expect(log.at(-1)).toMatch(/update refused: TestModel\.n = -5/);
  });

  it("answers request_state with an update of the entire state", async () => {
    const { m, sent } = model({ data: new Uint8Array([9]) });
    await frontEnd(m["comms"], m.id, { method: "request_state" });
    const reply = sent.at(-1)!;
    expect(reply.content.data).toEqual({ method: "update", state: { ...BASE, n: 1, label: "a" }, buffer_paths: [["data"]] });
    expect([...reply.buffers[0]]).toEqual([9]);
  });

  it("passes custom messages both ways", async () => {
    const { m, sent } = model();
    const got: unknown[] = [];
    m.on("custom", (content, buffers) => got.push([content, buffers.length]));
    await frontEnd(m["comms"], m.id, { method: "custom", content: { click: 1 } }, [new Uint8Array(1)]);
    m.send({ ping: true });
    expect(got).toEqual([[{ click: 1 }, 1]]);
    expect(sent.at(-1)?.content.data).toEqual({ method: "custom", content: { ping: true } });
  });

  it("keeps going when a listener throws, and logs it", async () => {
    const { m, log } = model();
    m.on("change:n", () => {
      throw new Error("listener bug");
    });
    await frontEnd(m["comms"], m.id, { method: "update", state: { n: 2 } });
    expect(m.get("n")).toBe(2);
    expect(log.at(-1)).toMatch("change:n listener failed: Error: listener bug");
  });

  it("closes: comm_close, close listeners, gone from the registry, no more set()", () => {
    const { m, sent } = model();
    let closed = 0;
    m.on("close", () => closed++);
    m.close();
    expect(sent.at(-1)?.msgType).toBe("comm_close");
    expect(closed).toBe(1);
    expect(widgetRegistry().has(m.id)).toBe(false);
    expect(() => m.set({ n: 2 })).toThrow("is closed");
  });

  it("needs a kernel with comms, and says which one when there is none", () => {
    expect(() => new WidgetModel(BASE)).toThrow(/quietframe kernel/);
  });

  it("refuses an unknown event name", () => {
    const { m } = model();
    expect(() => m.on("chnage" as "change", () => undefined)).toThrow('event = "chnage": is not a widget model event');
  });
});

describe("WidgetModel against a hostile front-end", () => {
  it("refuses state keys named __proto__, constructor or prototype, naming the key, and changes nothing", async () => {
    const { m, sent, comms } = model();
    for (const key of ["__proto__", "constructor", "prototype"]) {
      const before = sent.length;
      // As JSON.parse builds it: an own key, not the prototype setter.
      const state = JSON.parse(`{"${key}": {"n": 5}}`) as Record<string, unknown>;
      await frontEnd(comms, m.id, { method: "update", state, buffer_paths: [] });
      const error = (sent[before].content.data as { content: { error: { message: string } } }).content.error;
      expect(error.message).toBe(`TestModel.${key}: is a name reserved by JavaScript objects, never a key of a widget model; allowed: keys of this model's state`);
    }
    expect(m.get("n")).toBe(1);
    expect(({} as Record<string, unknown>).n).toBeUndefined();
  });

  it("echoes a long method name or key cut to 120 characters, and binary data by its size", async () => {
    const { m, sent, log, comms } = model();
    await frontEnd(comms, m.id, { method: "x".repeat(1_000_000) });
    await frontEnd(comms, m.id, { method: "update", state: { ["k".repeat(1_000_000)]: 1 }, buffer_paths: [] });
    await frontEnd(comms, m.id, { method: "update", state: {}, buffer_paths: [["nosuchkey"]] }, [new Uint8Array(1_000_000)]);
    const errors = sent.slice(1).map((s) => (s.content.data as { content: { error: { method: string; message: string } } }).content.error);
    expect(errors).toHaveLength(3);
    expect(errors[0].method).toBe(`${"x".repeat(120)}… (1000000 characters, cut to 120)`);
    expect(errors[1].message).toContain(`TestModel.${"k".repeat(120)}… (1000000 characters, cut to 120)`);
    expect(errors[2].message).toContain('TestModel.nosuchkey = "1000000 bytes of binary data": is not a key of this model');
    for (const e of errors) expect(JSON.stringify(e).length).toBeLessThan(1000);
    for (const line of log) expect(line.length).toBeLessThan(1000);
  });

  it("takes binary data with the same bytes as no change, and other bytes as one", () => {
    const { m } = model({ data: new Float64Array([1, 2]) });
    const changes: unknown[] = [];
    m.on("change:data", (v) => changes.push(v));
    m.set({ data: new Float64Array([1, 2]) });
    expect(changes).toHaveLength(0);
    m.set({ data: new Float64Array([1, 3]) });
    m.set({ data: { nested: [new Uint8Array([1])] } });
    expect(changes).toHaveLength(2);
  });
});

describe("widgetViewBundle", () => {
  it("holds the widget-view mime type with model_id and protocol 2.1, text/plain, and the fallback (messages.md, 'Displaying widgets')", () => {
    const { m } = model();
    const bundle = widgetViewBundle(m, { "text/html": "<p>kernel-free</p>" });
    expect(bundle["application/vnd.jupyter.widget-view+json"]).toEqual({ model_id: m.id, version_major: 2, version_minor: 1 });
    expect(bundle["text/html"]).toBe("<p>kernel-free</p>");
    expect(bundle["text/plain"]).toBe(`Test(model_id=${m.id})`);
  });

  it("refuses a closed model", () => {
    const { m } = model();
    m.close();
    expect(() => widgetViewBundle(m)).toThrow("is closed and cannot be displayed");
  });
});
