import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { build } from "esbuild";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { CONTROL_SPECS, type StandardModelName } from "../../widgets/core/comm/controls/control-specs.generated";
import { REPO_ROOT } from "../jupyter/env";

// The default states quietframe sends come from the widget model specification that
// @jupyter-widgets/schema ships (jupyterwidgetmodels.latest.json); the models that
// front-ends run come from @jupyter-widgets/controls and @jupyter-widgets/base. Both are
// checked here: the embedded table equals the specification, and every attribute the
// front-end's model classes define (their defaults()) is present in what we send, with the
// same model and view names, modules and versions.

const { specStatesSource, MODELS, GENERATED_FILE } = require("../../scripts/write-control-specs.js") as { specStatesSource(): string; MODELS: StandardModelName[]; GENERATED_FILE: string };

describe("the embedded control specification", () => {
  it("is exactly what the package's specification gives (regenerate: npm run generate:controls)", () => {
    const file = readFileSync(GENERATED_FILE, "utf8");
    expect(file).toBe(specStatesSource());
  });

  it("describes controls and base 2.0.0, the versions that speak widget protocol 2.1", () => {
    for (const name of MODELS) {
      expect(CONTROL_SPECS[name].model.version, name).toBe("2.0.0");
      expect(["@jupyter-widgets/controls", "@jupyter-widgets/base"]).toContain(CONTROL_SPECS[name].model.module);
    }
  });
});

// The front-end packages expect a browser; these stand-ins only let their modules load so
// that the model classes' defaults() can be read (no view is created).
const DOM_STUBS = `
globalThis.navigator = { userAgent: "node", platform: "node" };
const el = () => ({ style: {}, classList: { add() {}, remove() {}, contains() { return false; } }, setAttribute() {}, appendChild() {}, addEventListener() {} });
globalThis.document = { createElement: el, createElementNS: el, documentElement: el(), body: el(), head: el(), addEventListener() {} };
globalThis.window = globalThis;
globalThis.requestAnimationFrame = (f) => setTimeout(f, 0);
for (const n of ["Element", "HTMLElement", "DragEvent", "MouseEvent", "Event", "KeyboardEvent", "CustomEvent", "Node", "HTMLInputElement", "HTMLDivElement", "SVGElement", "ResizeObserver", "MutationObserver", "IntersectionObserver"]) {
  if (!(n in globalThis)) globalThis[n] = class {};
}
`;

describe("front-end model defaults from @jupyter-widgets/controls and @jupyter-widgets/base", () => {
  let dir: string;
  let defaults: Record<string, Record<string, unknown>>;

  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), "quietframe-controls-"));
    writeFileSync(join(dir, "stub-module.js"), "module.exports = function () { return {}; };");
    writeFileSync(
      join(dir, "entry.js"),
      `import * as controls from "@jupyter-widgets/controls"; import * as base from "@jupyter-widgets/base";
       const all = { ...controls, LayoutModel: base.LayoutModel };
       globalThis.__defaults = Object.fromEntries(${JSON.stringify(MODELS)}.map((n) => [n, all[n].prototype.defaults()]));`,
    );
    await build({
      entryPoints: [join(dir, "entry.js")],
      bundle: true,
      platform: "node",
      format: "cjs",
      outfile: join(dir, "bundle.js"),
      logLevel: "silent",
      nodePaths: [join(REPO_ROOT, "node_modules")],
      loader: { ".css": "empty" },
      // jQuery and the slider library touch the DOM at load; the models do not need them.
      alias: { jquery: join(dir, "stub-module.js"), nouislider: join(dir, "stub-module.js") },
      banner: { js: DOM_STUBS },
    });
    // Runs in this test file's worker (vitest isolates files); the most visible stubs are put back after.
    const g = globalThis as unknown as Record<string, unknown>;
    const saved = { navigator: g.navigator, document: g.document, window: g.window };
    try {
      // eslint-disable-next-line @typescript-eslint/no-require-imports
      require(join(dir, "bundle.js"));
      defaults = (globalThis as unknown as { __defaults: typeof defaults }).__defaults;
    } finally {
      for (const [k, v] of Object.entries(saved)) {
        if (v === undefined) delete g[k];
        else Object.defineProperty(globalThis, k, { value: v, configurable: true, writable: true });
      }
    }
  }, 120_000);

  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  // Where the kernel-side specification and the front-end classes differ, exactly (a new
  // package version that changes either shows up here). Front-end-only keys are filled from
  // the classes' defaults when a kernel leaves them out, as ipywidgets' own kernel side does.
  const FRONT_END_ONLY: Record<string, string[]> = {
    FloatSliderModel: ["_range", "slider_color"],
    FloatLogSliderModel: ["_range", "slider_color"],
    DropdownModel: ["button_style"],
    HTMLModel: ["disabled"],
    // The button class gives its style reference a default; quietframe sends it as a reference (refs), outside the state table.
    ButtonModel: ["style"],
  };
  // The slider views read `behavior` from the model although the classes give it no default.
  const KERNEL_ONLY: Record<string, string[]> = { FloatSliderModel: ["behavior"], FloatLogSliderModel: ["behavior"] };

  it("the attributes quietframe sends and those the front-end classes define differ only where listed", () => {
    for (const name of MODELS) {
      const ours = Object.keys(CONTROL_SPECS[name].state);
      const theirs = Object.keys(defaults[name]);
      // _view_count is front-end bookkeeping that kernels never send; layout/style are references the classes deserialize.
      expect(
        theirs.filter((k) => k !== "_view_count" && !ours.includes(k)),
        `${name}: front-end only`,
      ).toEqual(FRONT_END_ONLY[name] ?? []);
      expect(
        ours.filter((k) => !theirs.includes(k)),
        `${name}: kernel only`,
      ).toEqual(KERNEL_ONLY[name] ?? []);
    }
  });

  it("model and view names, modules and versions agree with the front-end classes", () => {
    for (const name of MODELS) {
      for (const key of ["_model_name", "_model_module", "_model_module_version", "_view_name", "_view_module", "_view_module_version"]) {
        expect(CONTROL_SPECS[name].state[key], `${name}.${key}`).toEqual(defaults[name][key]);
      }
    }
  });
});
