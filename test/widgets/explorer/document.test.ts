import Ajv from "ajv";
import fc from "fast-check";
import { describe, expect, test } from "vitest";
import { QuietframeError, QuietframeErrors } from "../../../src/errors";
import { QUIETFRAME_VERSION } from "../../../src/version";
import { explorerModelId, loadExplorerState, parseExplorerState, stateDocumentText, toWidgetStateDocument } from "../../../widgets/explorer/document";
import { MAX_STATE_TEXT_BYTES } from "../../../widgets/core/state/state-text";
import { EXPLORER_MODEL_NAME, type ExplorerState } from "../../../widgets/explorer/format";
import { WIDGET_MODULE } from "../../../widgets/core/state/widget-state";
import { exampleFiles, exampleState } from "./examples";

// Outside reference: Jupyter widget state schema v2 from @jupyter-widgets/schema (draft-07), validated with ajv.
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

const FILES = exampleFiles();
const squeezed = (): ExplorerState => exampleState("cryogenic-membrane-squeezed.json");

/** Runs fn, expects a QuietframeError for `path` whose message names the path (and fragment, if given). */
function expectProblem(fn: () => unknown, path: string, fragment?: string | RegExp): QuietframeError {
  let caught: unknown;
  try {
    fn();
  } catch (e) {
    caught = e;
  }
  expect(caught, `expected a QuietframeError at ${path}`).toBeInstanceOf(QuietframeError);
  const e = caught as QuietframeError;
  expect(e.path).toBe(path);
  expect(e.message.startsWith(path)).toBe(true);
  if (fragment !== undefined) expect(e.message).toMatch(fragment);
  return e;
}

/** The state as JSON text with one change made to the parsed object. */
function edited(state: ExplorerState, edit: (s: Record<string, any>) => void): string {
  const copy = JSON.parse(JSON.stringify(state)) as Record<string, any>;
  edit(copy);
  return JSON.stringify(copy, null, 2);
}

describe("toWidgetStateDocument", () => {
  test.each(FILES)("%s: validates against the Jupyter widget state schema v2 (ajv)", (file) => {
    const doc = toWidgetStateDocument(exampleState(file));
    expect(validateWidgetState(doc), JSON.stringify(validateWidgetState.errors)).toBe(true);
    // The text form too, as a reader would load it.
    expect(validateWidgetState(JSON.parse(stateDocumentText(exampleState(file))))).toBe(true);
  });

  test("the schema validator is live: it refuses a document of another major version", () => {
    const doc = JSON.parse(JSON.stringify(toWidgetStateDocument(squeezed())));
    doc.version_major = 3;
    expect(validateWidgetState(doc)).toBe(false);
  });

  test("one model, named and versioned, with a deterministic id from the fingerprint", () => {
    const state = squeezed();
    const doc = toWidgetStateDocument(state);
    expect(doc.version_major).toBe(2);
    expect(doc.version_minor).toBe(0);
    const ids = Object.keys(doc.state);
    expect(ids).toEqual([`quietframe-${state.fingerprint.slice(7, 23)}`]);
    expect(ids[0]).toMatch(/^quietframe-[0-9a-f]{16}$/);
    expect(explorerModelId(state.fingerprint)).toBe(ids[0]);
    const model = doc.state[ids[0]];
    expect(model.model_name).toBe(EXPLORER_MODEL_NAME);
    expect(model.model_module).toBe(WIDGET_MODULE);
    expect(model.model_module_version).toBe(QUIETFRAME_VERSION);
    expect(model.state).toEqual(state);
    expect(toWidgetStateDocument(squeezed())).toEqual(doc);
  });

  test("the document shares nothing with the state it was made from", () => {
    const state = squeezed();
    const doc = toWidgetStateDocument(state);
    const inner = Object.values(doc.state)[0].state as unknown as ExplorerState;
    inner.values["squeezer.squeezing"] = "-3 dB";
    inner.setup.components[0].name = "changed";
    expect(state.values["squeezer.squeezing"]).toBe("-10 dB");
    expect(state.setup.components[0].name).toBe("squeezer");
  });

  test("refuses to write a state it could not read back", () => {
    const state = { ...squeezed(), fingerprint: "sha256:abc" };
    expectProblem(() => toWidgetStateDocument(state), "state.fingerprint", /64 lowercase hex/);
  });

  test("stateDocumentText is two-space JSON with a final newline", () => {
    const state = squeezed();
    const text = stateDocumentText(state);
    expect(text.endsWith("}\n")).toBe(true);
    expect(text.split("\n")[1]).toBe('  "version_major": 2,');
    expect(text).toBe(`${JSON.stringify(toWidgetStateDocument(state), null, 2)}\n`);
  });
});

describe("parseExplorerState: round trips", () => {
  test.each(FILES)("%s: document → text → state is the same state", (file) => {
    const state = exampleState(file);
    expect(parseExplorerState(stateDocumentText(state))).toEqual(state);
    expect(parseExplorerState(toWidgetStateDocument(state))).toEqual(state);
  });

  test("a bare state, as text or object, is accepted", () => {
    const state = squeezed();
    expect(parseExplorerState(JSON.stringify(state))).toEqual(state);
    expect(parseExplorerState(state)).toEqual(state);
    expect(parseExplorerState(state)).not.toBe(state);
  });

  test("other models in the document are ignored", () => {
    const doc = JSON.parse(stateDocumentText(squeezed()));
    doc.state["slider-1"] = { model_name: "IntSliderModel", model_module: "@jupyter-widgets/controls", model_module_version: "2.0.0", state: { value: 3 } };
    doc.state["layout-1"] = { model_name: "LayoutModel", model_module: "@jupyter-widgets/base", state: {} };
    expect(validateWidgetState(doc)).toBe(true);
    expect(parseExplorerState(JSON.stringify(doc))).toEqual(squeezed());
  });

  test("titles and labels of any text survive the trip (fast-check, fixed seed)", () => {
    const base = squeezed();
    fc.assert(
      fc.property(fc.string({ unit: "binary", maxLength: 40 }), fc.string({ unit: "grapheme", maxLength: 40 }), (title, label) => {
        const state: ExplorerState = {
          ...base,
          controls: [{ ...base.controls[0], label }, base.controls[1]],
          settings: { ...base.settings, title },
        };
        expect(parseExplorerState(stateDocumentText(state))).toEqual(state);
      }),
      { seed: 2026, numRuns: 150 },
    );
  });
});

describe("parseExplorerState: bad input names the field", () => {
  test("malformed JSON reports line and column", () => {
    const text = '{\n  "version_major": 2,\n  "state": {,}\n}';
    expectProblem(() => parseExplorerState(text, "figure-3.json"), "figure-3.json", /malformed JSON at line 3, column 13/);
  });

  test("text over the size limit is refused before parsing, with its size and the limit", () => {
    const big = `{"pad": "${"x".repeat(MAX_STATE_TEXT_BYTES)}"}`;
    const e = expectProblem(() => parseExplorerState(big), "state", /more than the 5242880-byte limit/);
    expect(e.message).toContain(String(big.length));
    // Three UTF-8 bytes per "€": under the limit in characters, over it in bytes.
    const euros = `"${"€".repeat(1_800_000)}"`;
    expect(euros.length).toBeLessThan(MAX_STATE_TEXT_BYTES);
    expectProblem(() => parseExplorerState(euros), "state", /5400002 bytes of text/);
  });

  test("text just under the limit is parsed (and then checked)", () => {
    const json = JSON.stringify(squeezed());
    const padded = `${json}${" ".repeat(MAX_STATE_TEXT_BYTES - Buffer.byteLength(json, "utf8"))}`;
    expect(Buffer.byteLength(padded, "utf8")).toBe(MAX_STATE_TEXT_BYTES);
    expect(parseExplorerState(padded)).toEqual(squeezed());
  });

  test("a state from a newer quietframe is refused with an upgrade message, even with fields this version lacks", () => {
    const text = edited(squeezed(), (s) => {
      s.version = 2;
      s.newField = true;
    });
    expectProblem(() => parseExplorerState(text), "state.version", /written by a newer quietframe.*upgrade quietframe/);
  });

  const cases: [string, (s: Record<string, any>) => void, string, RegExp][] = [
    ["not an explorer state", (s) => (s.format = "quietframe.setup"), "state.format", /"quietframe.explorer"/],
    ["version as text", (s) => (s.version = "1"), "state.version", /positive integer/],
    ["version 0", (s) => (s.version = 0), "state.version", /positive integer/],
    ["unknown top-level key", (s) => (s.colour = "red"), "state.colour", /not a field of an explorer state/],
    ["quietframe version not a version", (s) => (s.quietframe = "latest"), "state.quietframe", /not a quietframe version/],
    ["quietframe version missing", (s) => delete s.quietframe, "state.quietframe", /not a quietframe version/],
    ["setup an array", (s) => (s.setup = []), "state.setup", /must be an object/],
    ["setup missing", (s) => delete s.setup, "state.setup", /is required/],
    ["controls an object", (s) => (s.controls = {}), "state.controls", /must be an array/],
    ["control not an object", (s) => (s.controls[1] = "squeezer.angle"), "state.controls[1]", /must be an object/],
    ["control with an unknown key", (s) => (s.controls[0].colour = "red"), "state.controls[0].colour", /not a field of a control/],
    ["control target a number", (s) => (s.controls[0].target = 3), "state.controls[0].target", /must be a string/],
    ["control type unknown", (s) => (s.controls[0].control = "knob"), "state.controls[0].control", /slider, number, dropdown/],
    ["slider scale unknown", (s) => (s.controls[0].scale = "cubic"), "state.controls[0].scale", /linear, log/],
    ["min a boolean", (s) => (s.controls[0].min = true), "state.controls[0].min", /value with its unit/],
    ["steps fractional", (s) => (s.controls[0].steps = 2.5), "state.controls[0].steps", /integer/],
    ["choice null", (s) => (s.controls[1].choices[2] = null), "state.controls[1].choices[2]", /value with its unit/],
    ["values an array", (s) => (s.values = []), "state.values", /must be an object/],
    ["value a boolean", (s) => (s.values["squeezer.squeezing"] = false), "state.values.squeezer.squeezing", /value with its unit or a number/],
    ["value key not a target", (s) => (s.values["squeezing"] = "-3 dB"), "state.values.squeezing", /not a control target/],
    ["settings missing", (s) => delete s.settings, "state.settings", /is required/],
    ["settings with an unknown key", (s) => (s.settings.theme = "dark"), "state.settings.theme", /not a field of the settings/],
    ["grid with an unknown key", (s) => (s.settings.grid.spacing = "log"), "state.settings.grid.spacing", /not a field of a grid/],
    ["grid bound a number", (s) => (s.settings.grid.from = 1.1e6), "state.settings.grid.from", /must be a string/],
    ["grid points as text", (s) => (s.settings.grid.points = "801"), "state.settings.grid.points", /must be a number/],
    ["spectral density unknown", (s) => (s.settings.spectralDensity = "log"), "state.settings.spectralDensity", /amplitude, power/],
    ["title a number", (s) => (s.settings.title = 5), "state.settings.title", /must be a string/],
    ["fingerprint without prefix", (s) => (s.fingerprint = s.fingerprint.slice(7)), "state.fingerprint", /not a curve fingerprint/],
    ["fingerprint in upper case", (s) => (s.fingerprint = s.fingerprint.toUpperCase().replace("SHA256", "sha256")), "state.fingerprint", /64 lowercase hex/],
    ["fingerprint too short", (s) => (s.fingerprint = s.fingerprint.slice(0, -1)), "state.fingerprint", /64 lowercase hex/],
  ];
  test.each(cases)("%s", (_name, edit, path, fragment) => {
    expectProblem(() => parseExplorerState(edited(squeezed(), edit)), path, fragment);
  });

  test("inside a document, paths lead to the model's state", () => {
    const doc = JSON.parse(stateDocumentText(squeezed()));
    const id = Object.keys(doc.state)[0];
    doc.state[id].state.values["squeezer.squeezing"] = [];
    expectProblem(() => parseExplorerState(JSON.stringify(doc)), `state.state.${id}.state.values.squeezer.squeezing`, /value with its unit/);
  });

  const envelopeCases: [string, (d: Record<string, any>) => void, string, RegExp][] = [
    ["major version 3", (d) => (d.version_major = 3), "state.version_major", /allowed: 2/],
    ["minor version negative", (d) => (d.version_minor = -1), "state.version_minor", /non-negative integer/],
    ["models not an object", (d) => (d.state = []), "state.state", /must be an object/],
    ["no explorer model", (d) => (d.state = { other: { model_name: "X", model_module: "y", state: {} } }), "state.state", /holds no quietframe explorer model/],
    ["two explorer models", (d) => (d.state.second = Object.values(d.state)[0]), "state.state", /holds 2 quietframe explorer models/],
    ["binary buffers", (d) => (Object.values<any>(d.state)[0].buffers = [{ path: ["x"], data: "00", encoding: "hex" }]), "", /must be empty/],
  ];
  test.each(envelopeCases)("document: %s", (_name, edit, path, fragment) => {
    const doc = JSON.parse(stateDocumentText(squeezed()));
    edit(doc);
    const expected = path || `state.state.${Object.keys(doc.state)[0]}.buffers`;
    expectProblem(() => parseExplorerState(JSON.stringify(doc)), expected, fragment);
  });

  test("neither a document nor a state", () => {
    expectProblem(() => parseExplorerState('{"name": "x"}'), "state", /neither a Jupyter widget-state document nor a quietframe explorer state/);
    expectProblem(() => parseExplorerState("[1, 2]"), "state", /must be an object/);
    expectProblem(() => parseExplorerState(42), "state", /must be an object/);
    expectProblem(() => parseExplorerState(null), "state", /must be an object/);
  });

  test("objects that are not JSON data are refused with a path, not copied", () => {
    const withNaN = squeezed() as any;
    withNaN.setup.components[1].params.Q = NaN;
    expectProblem(() => parseExplorerState(withNaN), "state.setup.components[1].params.Q", /not a finite number/);
    const withFunction = squeezed() as any;
    withFunction.setup.description = () => "x";
    expectProblem(() => parseExplorerState(withFunction), "state.setup.description", /not JSON data/);
    const withInfinity = squeezed() as any;
    withInfinity.values["squeezer.squeezing"] = -Infinity;
    expectProblem(() => parseExplorerState(withInfinity), "state.values.squeezer.squeezing", /value with its unit or a number/);
  });

  test("a deeply nested set-up is refused with a path, not a stack overflow", () => {
    const deep = `${"[".repeat(10_000)}1${"]".repeat(10_000)}`;
    const text = edited(squeezed(), (s) => (s.setup.description = "placeholder"));
    const json = text.replace('"placeholder"', deep);
    expectProblem(() => parseExplorerState(json), "state.setup.description" + "[0]".repeat(31), /nested more than 32 levels/);
  });
});

describe("__proto__ and friends", () => {
  const polluted = (): boolean => ({}) instanceof Object && "polluted" in ({} as Record<string, unknown>);
  const attempts: [string, (text: string) => string, string][] = [
    ["top level", (t) => t.replace('"format":', '"__proto__": {"polluted": true}, "format":'), "state.__proto__"],
    ["values", (t) => t.replace('"values": {', '"values": {"__proto__": {"polluted": true}, '), "state.values.__proto__"],
    ["a control", (t) => t.replace('"target":', '"__proto__": {"polluted": true}, "target":'), "state.controls[0].__proto__"],
    ["settings", (t) => t.replace('"settings": {', '"settings": {"__proto__": {"polluted": true}, '), "state.settings.__proto__"],
    ["the grid", (t) => t.replace('"settings": {\n    "grid": {', '"settings": {"grid": {"__proto__": {"polluted": true}, '), "state.settings.grid.__proto__"],
    ["the set-up", (t) => t.replace('"setup": {', '"setup": {"__proto__": {"polluted": true}, '), "state.setup.__proto__"],
    ["component params", (t) => t.replace('"params": {', '"params": {"constructor": {"prototype": {"polluted": true}}, '), "state.setup.components[0].params.constructor"],
    ["a value key named constructor.prototype", (t) => t.replace('"values": {', '"values": {"constructor.prototype": "1 K", '), "state.values.constructor.prototype"],
  ];
  test.each(attempts)("in %s: refused, and Object.prototype stays clean", (_where, inject, path) => {
    const text = inject(JSON.stringify(squeezed(), null, 2));
    expect(text).not.toBe(JSON.stringify(squeezed(), null, 2));
    expectProblem(() => parseExplorerState(text), path);
    expectProblem(() => loadExplorerState(text), path);
    expect(polluted()).toBe(false);
    expect(Object.prototype.hasOwnProperty.call(Object.prototype, "polluted")).toBe(false);
  });
});

describe("loadExplorerState", () => {
  test.each(FILES)("%s: recomputes the recorded curves", (file) => {
    const state = exampleState(file);
    const loaded = loadExplorerState(stateDocumentText(state), file);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.computation.fingerprint).toBe(state.fingerprint);
    expect(loaded.state).toEqual(state);
  });

  test("a value outside its control's range is reported at its place in the file", () => {
    const text = edited(squeezed(), (s) => (s.values["squeezer.squeezing"] = "-20 dB"));
    expectProblem(() => loadExplorerState(text), "state.values.squeezer.squeezing", /outside the control's range/);
    const doc = JSON.parse(stateDocumentText(squeezed()));
    const id = Object.keys(doc.state)[0];
    doc.state[id].state.values["squeezer.squeezing"] = "-20 dB";
    expectProblem(() => loadExplorerState(JSON.stringify(doc)), `state.state.${id}.state.values.squeezer.squeezing`, /outside the control's range/);
  });

  test("set-up problems are reported under setup", () => {
    const text = edited(squeezed(), (s) => (s.setup.components[1].params.mass = "5 parsec"));
    expectProblem(() => loadExplorerState(text), "state.setup.components.membrane.mass");
    const broken = edited(squeezed(), (s) => (s.setup.components = "none"));
    expectProblem(() => loadExplorerState(broken), "state.setup.components", /array/);
  });

  test("a control on a parameter the set-up lacks is reported at the control", () => {
    const text = edited(squeezed(), (s) => (s.controls[0].target = "squeezer.colour"));
    expectProblem(() => loadExplorerState(text), "state.controls[0].target", /not a parameter of this set-up/);
  });

  test("a bad grid is reported under settings", () => {
    const text = edited(squeezed(), (s) => (s.settings.grid.points = 1));
    expectProblem(() => loadExplorerState(text), "state.settings.grid.points", /usable number of points/);
  });

  test("several set-up problems at once keep their paths", () => {
    const text = edited(squeezed(), (s) => {
      s.setup.components[1].params.mass = "5 parsec";
      s.setup.components[2].params.linewidth = "-1 MHz";
    });
    let caught: unknown;
    try {
      loadExplorerState(text);
    } catch (e) {
      caught = e;
    }
    // Validation stops at the first broken component or reports them together; either way every path is in the file.
    const problems = caught instanceof QuietframeErrors ? caught.problems : [caught as QuietframeError];
    expect(problems.length).toBeGreaterThan(0);
    for (const p of problems) {
      expect(p).toBeInstanceOf(QuietframeError);
      expect(p.path.startsWith("state.setup.components.")).toBe(true);
    }
  });
});
