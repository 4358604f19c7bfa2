import Ajv from "ajv";
import { beforeAll, describe, expect, it } from "vitest";
import { QuietframeError } from "../../../src/index";
import { bandwidthText, parseBandwidth } from "../../../widgets/entangled/bandwidth";
import { entangledCsv } from "../../../widgets/entangled/csv";
import { entangledDocumentText, isEntangledInput } from "../../../widgets/entangled/document";
import { computeEntangled, createEntangledState, dbText, entangledSummary, readEntangledState } from "../../../widgets/entangled/model";
import { entangledPanel } from "../../../widgets/entangled/notebook";
import { loadWidgetState } from "../../../widgets/registry";
import { quietframeErrorOf } from "../../helpers/errors";
import { loadMathjs, type MathJs } from "../../helpers/mathjs";

// Outside references: the Jupyter widget-state schema v2 as @jupyter-widgets/schema ships it; mathjs units for "5 MHz".
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

let math: MathJs;
beforeAll(async () => {
  math = await loadMathjs();
});

const state = createEntangledState({ squeezingDb: -6, efficiency1: 0.92, efficiency2: 0.8, bandwidth: 3e6, title: "pair" });

describe("the entangled panel's state document", () => {
  it("is a Jupyter widget-state 2.0 document the published schema accepts, with one panel model and its fingerprint", () => {
    const doc = JSON.parse(entangledDocumentText(state)) as { state: Record<string, { model_name: string; model_module: string; state: Record<string, unknown> }> };
    expect(validateWidgetState(doc), JSON.stringify(validateWidgetState.errors)).toBe(true);
    const models = Object.values(doc.state);
    expect(models).toHaveLength(1);
    expect(models[0]).toMatchObject({ model_name: "EntangledPanelModel", model_module: "quietframe" });
    expect(models[0].state.version).toBe(2);
    expect(models[0].state.fingerprint).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect(isEntangledInput(doc)).toBe(true);
  });

  it("loads back to the same state and numbers; the notebook's stateText() is that document", () => {
    const text = entangledDocumentText(state);
    const read = readEntangledState(text, "pair.json");
    expect(read.state).toEqual(state);
    expect(read.path).toMatch(/^pair\.json\.state\.quietframe-entangled-[0-9a-f]{16}\.state$/);
    expect(entangledPanel(state).stateText()).toBe(text);
    const { loaded } = loadWidgetState(text, "pair.json");
    expect(loaded.fingerprint?.recomputed).toBe(read.fingerprint);
  });

  it("names a field of a state inside a document by its path in the document", () => {
    const doc = JSON.parse(entangledDocumentText(state)) as { state: Record<string, { state: Record<string, unknown> }> };
    const id = Object.keys(doc.state)[0];
    doc.state[id].state.efficiency1 = 2;
    const e = quietframeErrorOf(() => readEntangledState(doc, "pair.json"));
    expect(e.path).toBe(`pair.json.state.${id}.state.efficiency1`);
  });

  it("refuses a fingerprint in a version-1 state and a malformed one in a version-2 state", () => {
    const bare = JSON.parse(entangledDocumentText(state)) as { state: Record<string, { state: Record<string, unknown> }> };
    const s = Object.values(bare.state)[0].state;
    expect(quietframeErrorOf(() => readEntangledState({ ...s, version: 1 }, "s")).path).toBe("s.fingerprint");
    expect(quietframeErrorOf(() => readEntangledState({ ...s, fingerprint: "sha256:abc" }, "s")).problem).toBe("is not a panel fingerprint");
  });

  it("gives a CSV with every number it fingerprints, in shortest round-trip form", () => {
    const c = computeEntangled(state);
    const csv = entangledCsv(c);
    const tables = csv.trimEnd().split("\n\n");
    expect(tables).toHaveLength(4);
    const spectrum = tables[0].split("\n").slice(1);
    expect(spectrum).toHaveLength(c.spectrum.length / 2);
    expect(Number(spectrum[0].split(",")[0])).toBe(c.spectrum[0].f);
    expect(tables[2].split("\n")[1]).toBe(["X1", ...Array.from(c.covariance.subarray(0, 4), String)].join(","));
    expect(tables[3].split("\n")).toHaveLength(1 + c.ellipses.length);
  });
});

describe("the panel's inputs and readouts", () => {
  it.each([
    ["5 MHz", 5e6],
    ["2.5 kHz", 2.5e3],
    ["5e6", 5e6],
  ])("the linewidth field reads %s with its unit (mathjs agrees)", (text, hz) => {
    const parsed = parseBandwidth(text, "bandwidth");
    expect(parsed).toBe(hz);
    if (/[a-z]/i.test(text.replace(/e\d/, ""))) expect(parsed).toBeCloseTo(math.unit(text).toNumber("Hz"), 6);
  });

  it("empty is a white source; refused text is a QuietframeError naming the field, never NaN", () => {
    expect(parseBandwidth("  ", "bandwidth")).toBeNull();
    for (const bad of ["five MHz", "5 K", "-3 MHz", "0 Hz"]) {
      const e = quietframeErrorOf(() => parseBandwidth(bad, "bandwidth"));
      expect(e).toBeInstanceOf(QuietframeError);
      expect(e.path).toBe("bandwidth");
    }
    expect(parseBandwidth(bandwidthText(3e6), "bandwidth")).toBe(3e6);
  });

  it("a level that is vacuum exactly reads 0.00 dB, not a rounding error such as -1.93e-15 dB", () => {
    // r = 0: every quadrature is vacuum (common practice, no source: 10 log10 1 = 0).
    const vacuum = createEntangledState({ r: 0 });
    const lines = entangledSummary(vacuum, computeEntangled(vacuum)).map((l) => l.text);
    expect(lines.join("\n")).not.toMatch(/e-1\d/);
    expect(lines.find((l) => l.startsWith("Var(X1 | X2)"))).toContain("(0.00 dB relative to vacuum");
    expect(dbText(-1.93e-15)).toBe("0.00");
    expect(dbText(-0)).toBe("0.00");
    expect(dbText(-3.0103)).toBe("−3.01");
  });
});
