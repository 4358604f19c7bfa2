import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { createControl, dropdown, dropdownLabel, floatLogSlider, floatSlider, hbox, html, text, vbox } from "../../widgets/core/comm/controls/controls";
import { CONTROL_SPECS } from "../../widgets/core/comm/controls/control-specs.generated";
import { frontEnd, recordingComms } from "./fake-transport";

// Standard controls of @jupyter-widgets/controls 2.0.0: each opens its LayoutModel and
// style model first (the specification's "reference to new instance"), then itself with
// the specification's full default state plus the options given.

function opened(sent: ReturnType<typeof recordingComms>["sent"]) {
  return sent.filter((s) => s.msgType === "comm_open").map((s) => (s.content.data as { state: Record<string, unknown> }).state);
}

describe("floatSlider", () => {
  it("opens layout, style and slider with the complete default state and the options", () => {
    const { comms, sent } = recordingComms();
    const s = floatSlider({ comms, value: 2, min: 0, max: 10, step: 0.5, description: "photons", layout: { width: "400px" } });
    const [layout, style, slider] = opened(sent);
    expect(layout).toEqual({ ...CONTROL_SPECS.LayoutModel.state, width: "400px" });
    expect(style).toEqual(CONTROL_SPECS.SliderStyleModel.state);
    expect(slider).toEqual({ ...CONTROL_SPECS.FloatSliderModel.state, value: 2, min: 0, max: 10, step: 0.5, description: "photons", layout: s.parts.layout.ref, style: s.parts.style.ref });
  });

  it("refuses front-end values outside min…max and keeps the kernel's value", async () => {
    const { comms, sent } = recordingComms();
    const s = floatSlider({ comms, value: 1, min: 0, max: 2 });
    await frontEnd(comms, s.id, { method: "update", state: { value: 2.5 } });
    expect((sent.at(-2)?.content.data as { content: { error: { allowed: string } } }).content.error.allowed).toBe("0 ≤ value ≤ 2");
    expect(s.get("value")).toBe(1);
    // Moving min and value together in one update is checked against the state after it.
    await frontEnd(comms, s.id, { method: "update", state: { min: -5, value: -4 } });
    expect([s.get("min"), s.get("value")]).toEqual([-5, -4]);
  });

  it("refuses min above max from the kernel with a QuietframeError naming both", () => {
    const { comms } = recordingComms();
    const s = floatSlider({ comms, value: 1, min: 0, max: 2 });
    expect(() => s.set({ min: 3 })).toThrow("FloatSliderModel.min = 3: would make min greater than max");
  });

  it("refuses bad options before opening anything", () => {
    const { comms, sent } = recordingComms();
    expect(() => floatSlider({ comms, value: 20, min: 0, max: 10 })).toThrow(QuietframeError);
    expect(() => floatSlider({ comms, value: Number.NaN })).toThrow("FloatSliderModel.value = NaN: has the wrong type or is not allowed; allowed: a finite number");
    expect(() => floatSlider({ comms, orientation: "diagonal" as "vertical" })).toThrow('one of "horizontal", "vertical"');
    expect(sent).toEqual([]);
  });
});

describe("floatLogSlider", () => {
  it("treats min and max as exponents of base: value must lie in base^min … base^max", async () => {
    const { comms, sent } = recordingComms();
    const s = floatLogSlider({ comms, value: 1e6, min: 4, max: 8 });
    expect(opened(sent).at(-1)).toMatchObject({ _model_name: "FloatLogSliderModel", value: 1e6, min: 4, max: 8, base: 10 });
    await frontEnd(comms, s.id, { method: "update", state: { value: 1e9 } });
    expect(s.get("value")).toBe(1e6);
    await frontEnd(comms, s.id, { method: "update", state: { value: 1e8 } });
    expect(s.get("value")).toBe(1e8);
  });

  it("refuses a base that is no base of a log scale", () => {
    const { comms } = recordingComms();
    expect(() => floatLogSlider({ comms, base: 1 })).toThrow("FloatLogSliderModel.base = 1: cannot be the base of a log scale");
  });
});

describe("dropdown", () => {
  it("sends labels and the selected index; the front-end selects by index", async () => {
    const { comms, sent } = recordingComms();
    const d = dropdown({ comms, options: ["positive", "negative"], description: "mass sign" });
    expect(opened(sent).at(-1)).toMatchObject({ _model_name: "DropdownModel", _options_labels: ["positive", "negative"], index: 0, description: "mass sign" });
    await frontEnd(comms, d.id, { method: "update", state: { index: 1 } });
    expect(dropdownLabel(d)).toBe("negative");
    await frontEnd(comms, d.id, { method: "update", state: { index: 2 } });
    expect(dropdownLabel(d)).toBe("negative");
    await frontEnd(comms, d.id, { method: "update", state: { index: 0.5 } });
    expect(d.get("index")).toBe(1);
  });

  it("refuses options that are not labels", () => {
    expect(() => dropdown({ comms: recordingComms().comms, options: [1, 2] as unknown as string[] })).toThrow("DropdownModel.options");
  });
});

describe("text, html and boxes", () => {
  it("text and html hold strings; a number from the front-end is refused", async () => {
    const { comms } = recordingComms();
    const t = text({ comms, value: "a", placeholder: "type" });
    const h = html({ comms, value: "<b>figures</b>" });
    await frontEnd(comms, t.id, { method: "update", state: { value: 5 } });
    expect(t.get("value")).toBe("a");
    expect(h.get("value")).toBe("<b>figures</b>");
    expect(h.get("_model_name")).toBe("HTMLModel");
  });

  it("vbox and hbox list their children by reference", () => {
    const { comms, sent } = recordingComms();
    const a = html({ comms, value: "a" });
    const b = text({ comms });
    const row = hbox([a, b], { comms });
    const col = vbox([row], { comms, box_style: "info" });
    expect(row.get("children")).toEqual([a.ref, b.ref]);
    expect(col.get("children")).toEqual([row.ref]);
    expect(opened(sent).at(-1)).toMatchObject({ _model_name: "VBoxModel", _view_name: "VBoxView", box_style: "info" });
  });

  it("closing a control closes its layout and style models", () => {
    const { comms } = recordingComms();
    const s = floatSlider({ comms });
    s.close();
    expect([s.isClosed, s.parts.layout.isClosed, s.parts.style.isClosed]).toEqual([true, true, true]);
    expect(comms.commInfo()).toEqual({});
  });
});

describe("createControl", () => {
  it.each(["SliderModel", "toString", "__proto__"])("refuses %s, which is not a model of the control table, and opens nothing", (name) => {
    const { comms, sent } = recordingComms();
    let caught: unknown;
    try {
      createControl(name, {}, { comms });
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe("model");
    expect((caught as QuietframeError).message).toContain("is not a standard control quietframe creates");
    expect(sent).toEqual([]);
  });
});
