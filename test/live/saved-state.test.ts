import Ajv from "ajv";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { QuietframeError } from "../../src/errors";
import type { SetupDescription } from "../../src/setup/format";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { initialChartState } from "../../widgets/explorer/live/chart-state";
import { liveStateSource } from "../../widgets/explorer/live/saved-state";
import { loadExplorerState, stateDocumentText } from "../../widgets/explorer/document";
import { WIDGET_STATE_MIME } from "../../widgets/core/state/widget-state";
import type { ExplorerState } from "../../widgets/explorer/format";

// Outside reference: the Jupyter widget state schema v2 shipped in @jupyter-widgets/schema.
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

const ROOT = join(__dirname, "..", "..");

function membraneState(values: Record<string, string | number> = {}): ExplorerState {
  const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane.json"), "utf8")) as SetupDescription;
  const state = createExplorerState(setup, { controls: [{ target: "detector.efficiency", min: "50 %", max: "100 %" }], settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 40 } } });
  const moved = { ...state, values: { ...state.values, ...values } };
  return { ...moved, fingerprint: computeExplorer(moved).fingerprint };
}

/**
 * A model's state as a widget manager saves it: binary values are taken out of the state and
 * listed under "buffers" with their path, base64-encoded (widget-state format 2.0, the
 * "buffers" property of @jupyter-widgets/schema v2/state.schema.json).
 */
function savedModel(state: Record<string, unknown>) {
  const buffers: { path: (string | number)[]; data: string; encoding: "base64" }[] = [];
  const strip = (value: unknown, path: (string | number)[]): unknown => {
    if (value instanceof Uint8Array) {
      buffers.push({ path, data: Buffer.from(value).toString("base64"), encoding: "base64" });
      return null;
    }
    if (Array.isArray(value)) return value.map((v, i) => strip(v, [...path, i]));
    if (typeof value === "object" && value !== null) return Object.fromEntries(Object.entries(value).map(([k, v]) => [k, strip(v, [...path, k])]));
    return value;
  };
  const plain = strip(state, []) as Record<string, unknown>;
  return { model_name: String(plain._model_name), model_module: String(plain._model_module), model_module_version: String(plain._model_module_version), state: plain, buffers };
}

function chartModel(state: ExplorerState) {
  return savedModel(initialChartState(state, computeExplorer(state)));
}

function notebook(models: Record<string, unknown>) {
  return {
    cells: [],
    metadata: { widgets: { [WIDGET_STATE_MIME]: { version_major: 2, version_minor: 0, state: models } } },
    nbformat: 4,
    nbformat_minor: 5,
  };
}

const slider = { model_name: "FloatSliderModel", model_module: "@jupyter-widgets/controls", model_module_version: "2.0.0", state: { value: 95 } };

describe("liveStateSource", () => {
  test("the saved widget state of a notebook with a live chart is valid widget-state format 2.0", () => {
    const doc = notebook({ s1: slider, c1: chartModel(membraneState()) });
    const widgetState = doc.metadata.widgets[WIDGET_STATE_MIME];
    expect(validateWidgetState(widgetState), JSON.stringify(validateWidgetState.errors)).toBe(true);
  });

  test("finds the chart's explorer state in a notebook; it loads and reproduces its fingerprint", () => {
    const state = membraneState({ "detector.efficiency": "72.5 %" });
    const found = liveStateSource(JSON.stringify(notebook({ s1: slider, c1: chartModel(state) })), "run.ipynb");
    expect(found.source).toBe(`run.ipynb.metadata.widgets["${WIDGET_STATE_MIME}"].state.c1.state.explorer_state`);
    const loaded = loadExplorerState(found.value, found.source);
    expect(loaded.state).toEqual(state);
    expect(loaded.fingerprintMatches).toBe(true);
  });

  test("errors in a notebook's state name the path inside the notebook", () => {
    const state = membraneState();
    const model = chartModel(state);
    (model.state.explorer_state as Record<string, unknown>).values = { "detector.efficiency": "120 %" };
    const found = liveStateSource(JSON.stringify(notebook({ c1: model })), "run.ipynb");
    let caught: unknown;
    try {
      loadExplorerState(found.value, found.source);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe(`${found.source}.values.detector.efficiency`);
  });

  test("several charts need a number; a wrong number is refused", () => {
    const a = membraneState({ "detector.efficiency": "60 %" });
    const b = membraneState({ "detector.efficiency": "80 %" });
    const text = JSON.stringify(notebook({ c1: chartModel(a), c2: chartModel(b) }));
    expect(() => liveStateSource(text, "two.ipynb")).toThrow(/holds 2 quietframe live charts.*1 to 2/);
    expect((liveStateSource(text, "two.ipynb", 2).value as ExplorerState).values).toEqual(b.values);
    expect(() => liveStateSource(text, "two.ipynb", 3)).toThrow(QuietframeError);
  });

  test("a notebook without saved widget state says how to save it", () => {
    expect(() => liveStateSource(JSON.stringify({ cells: [], metadata: {}, nbformat: 4, nbformat_minor: 5 }), "plain.ipynb")).toThrow(/plain\.ipynb\.metadata\.widgets.*no saved widget state/);
  });

  test("a state file passes through unchanged", () => {
    const text = stateDocumentText(membraneState());
    expect(liveStateSource(text, "state.json")).toEqual({ value: text, source: "state.json" });
  });
});

describe("quietframe render <notebook.ipynb>", () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), "quietframe-live-render-"));
  });
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  test("writes the CSV of the live chart's state, equal to that of the same state file", async () => {
    const state = membraneState({ "detector.efficiency": "66 %" });
    const nb = join(dir, "live.ipynb");
    writeFileSync(nb, JSON.stringify(notebook({ s1: slider, c1: chartModel(state) })));
    const file = join(dir, "state.json");
    writeFileSync(file, stateDocumentText(state));
    const io = { out: () => undefined, err: (s: string) => errors.push(s) };
    const errors: string[] = [];
    expect(await runCliAsync(["render", nb, "-o", join(dir, "from-notebook.csv")], io)).toBe(0);
    expect(await runCliAsync(["render", file, "-o", join(dir, "from-file.csv")], io)).toBe(0);
    expect(errors.filter((e) => /warning/.test(e))).toEqual([]);
    expect(readFileSync(join(dir, "from-notebook.csv"), "utf8")).toBe(readFileSync(join(dir, "from-file.csv"), "utf8"));
  });
});
