import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import Module, { createRequire } from "node:module";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { inspect } from "node:util";
import { afterEach, beforeEach, describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { headlineFigures } from "../../src/engine/headline";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { EXPLORER_CLASS } from "../../widgets/explorer/names";
import { runtimeSource } from "../../widgets/core/page/runtime-source";
import { PNG_KEY_ATTRIBUTE, pngOutputKey } from "../../widgets/core/page/png-output";
import { explorerFigures } from "../../widgets/explorer/figures";
import { applyValues, chartBundle, displayBundle, encodeBundle, explorer, loadSetupFile, resetDisplaySession, showChart, VEGA_LITE_MIME, type SetupDescription } from "../../widgets/notebook";
import { REPO_ROOT } from "../jupyter/env";

const EXAMPLES = join(REPO_ROOT, "examples");
const membrane = JSON.parse(readFileSync(join(EXAMPLES, "cryogenic-membrane.json"), "utf8")) as SetupDescription;
const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

type Sent = { content: { data: Record<string, unknown>; metadata: Record<string, unknown>; transient: Record<string, unknown> }; update: boolean };

/**
 * Stands in for a running tslab kernel: a loaded module at a path ending in
 * tslab/dist/jupyter.js whose lastWriteDisplayData is set, as tslab sets it per cell. The
 * path is not the repository's tslab, as when a kernel runs from another install.
 */
class FakeKernel {
  readonly sent: Sent[] = [];
  private readonly ids: string[] = [];
  private readonly cache = createRequire(__filename).cache;

  constructor(private readonly root = mkdtempSync(join(tmpdir(), "quietframe-fake-kernel-"))) {}

  /** A copy that was loaded but never ran a cell (its writer is null). */
  addIdleCopy(): void {
    this.add("idle", null);
  }

  start(): void {
    this.add("kernel", (content: Sent["content"], update: boolean) => this.sent.push({ content, update }));
  }

  private add(dir: string, writer: unknown): void {
    const id = join(this.root, dir, "node_modules", "tslab", "dist", "jupyter.js");
    const mod = new Module(id);
    mod.filename = id;
    mod.loaded = true;
    mod.exports = { lastWriteDisplayData: writer };
    this.cache[id] = mod;
    this.ids.push(id);
  }

  stop(): void {
    for (const id of this.ids) delete this.cache[id];
    rmSync(this.root, { recursive: true, force: true });
  }
}

describe("encodeBundle", () => {
  it("base64-encodes bytes, keeps text and keeps JSON objects for +json types", () => {
    const bytes = new Uint8Array([0, 1, 2, 250, 255]);
    const spec = { $schema: "https://vega.github.io/schema/vega-lite/v5.json", mark: "line" };
    const out = encodeBundle({ "image/png": bytes, "text/plain": "hi", [VEGA_LITE_MIME]: spec });
    expect(out["image/png"]).toBe(Buffer.from(bytes).toString("base64"));
    expect(out["text/plain"]).toBe("hi");
    expect(out[VEGA_LITE_MIME]).toEqual(spec);
    expect(typeof out[VEGA_LITE_MIME]).toBe("object");
  });

  it("encodes only the viewed bytes of a subarray", () => {
    const view = new Uint8Array([9, 9, 1, 2, 3, 9]).subarray(2, 5);
    expect(encodeBundle({ "image/png": view })["image/png"]).toBe(Buffer.from([1, 2, 3]).toString("base64"));
  });

  it("refuses what a notebook cannot store", () => {
    expect(() => encodeBundle({})).toThrow(QuietframeError);
    expect(() => encodeBundle({ "text/html": { not: "text" } })).toThrow(/bundle\.text\/html.*cannot be stored/);
    expect(() => encodeBundle({ html: "<b>x</b>" })).toThrow(/is not a media type/);
    expect(() => encodeBundle({ "text/plain": 42 })).toThrow(QuietframeError);
  });
});

describe("displayBundle", () => {
  let kernel: FakeKernel;
  beforeEach(() => {
    kernel = new FakeKernel();
  });
  afterEach(() => kernel.stop());

  it("returns the encoded bundle and sends nothing outside a kernel", () => {
    const r = displayBundle({ "text/plain": "x", "image/png": new Uint8Array([1]) });
    expect(r.via).toBe("none");
    expect(r.bundle).toEqual({ "text/plain": "x", "image/png": "AQ==" });
  });

  it("sends every type in ONE display_data through the running kernel's writer", () => {
    kernel.addIdleCopy();
    kernel.start();
    const r = displayBundle({ "text/html": "<b>x</b>", "image/png": new Uint8Array([1, 2]), "text/plain": "x" }, { metadata: { "image/png": { width: 10 } }, displayId: "d1" });
    expect(r.via).toBe("kernel");
    expect(kernel.sent).toHaveLength(1);
    expect(kernel.sent[0]).toEqual({
      content: { data: { "text/html": "<b>x</b>", "image/png": "AQI=", "text/plain": "x" }, metadata: { "image/png": { width: 10 } }, transient: { display_id: "d1" } },
      update: false,
    });
  });

  it("falls back to one message per type through tslab's public display inside a tslab process", () => {
    // No kernel module found, but tslab's executor global is there and `require("tslab")` answers.
    const req = createRequire(__filename);
    const id = req.resolve("tslab");
    const saved = req.cache[id];
    const calls: [string, unknown][] = [];
    const fake = new Module(id);
    fake.filename = id;
    fake.loaded = true;
    fake.exports = { display: { raw: (type: string, data: unknown) => calls.push([type, data]) } };
    req.cache[id] = fake;
    (globalThis as Record<string, unknown>).__tslab__ = {};
    try {
      const r = displayBundle({ "text/plain": "x", "image/png": new Uint8Array([1]) });
      expect(r.via).toBe("per-mime");
      expect(calls).toEqual([
        ["text/plain", "x"],
        ["image/png", "AQ=="],
      ]);
    } finally {
      delete (globalThis as Record<string, unknown>).__tslab__;
      if (saved) req.cache[id] = saved;
      else delete req.cache[id];
    }
  });

  it("prints as a one-line summary, never the (possibly huge) data", () => {
    const r = displayBundle({ "text/plain": "x".repeat(10_000) });
    const shown = inspect(r);
    expect(shown).toContain("via: none");
    expect(shown.length).toBeLessThan(200);
  });
});

describe("explorer()", () => {
  it("holds a plain state and the engine's headline figures as plain arrays", () => {
    const w = explorer(membrane, { controls: [{ target: "cavity.photons", min: 1e4, max: 1e8 }] });
    const state = w.state;
    expect(JSON.parse(JSON.stringify(state))).toEqual(state);
    expect(state.values).toEqual({ "cavity.photons": 1e6 });
    const f = w.figures;
    const independent = headlineFigures(evaluateSetup(loadSetup(membrane), { from: 1.1e6, to: 1.3e6, points: 801 }).budget);
    expect(f.headline.bestMarginDb).toBe(independent.bestMarginDb);
    expect(f.headline.bestMarginAt).toBe(independent.bestMarginAt);
    expect(Array.isArray(f.table.frequencies)).toBe(true);
    expect(f.table.frequencies).toHaveLength(801);
    expect(f.table.columns[0].id).toBe("total");
    expect(f.table.columns.map((c) => c.id)).toContain("sql");
    for (const c of f.table.columns) expect(Array.isArray(c.values) && c.values.length === 801).toBe(true);
    expect(f.fingerprint).toBe(state.fingerprint);
  });

  it("returns a copy of the state, so editing it changes nothing", () => {
    const w = explorer(membrane, { controls: [{ target: "cavity.photons", min: 1e4, max: 1e8 }] });
    const s = w.state;
    s.values["cavity.photons"] = 5;
    expect(w.state.values["cavity.photons"]).toBe(1e6);
  });

  it("moves controls with set() and recomputes the fingerprint", () => {
    const w = explorer(membrane, { controls: [{ target: "cavity.photons", min: 1e4, max: 1e8 }] });
    const before = w.state.fingerprint;
    w.set({ "cavity.photons": 1e7 });
    expect(w.state.fingerprint).not.toBe(before);
    expect(w.state.fingerprint).toBe(explorer(applyValues(membrane, { "cavity.photons": 1e7 }), { controls: [{ target: "cavity.photons", min: 1e4, max: 1e8 }] }).state.fingerprint);
    expect(() => w.set({ "cavity.photons": 1e9 })).toThrow(/outside the control's range/);
    expect(() => w.set({ "membrane.mass": "1 ng" })).toThrow(/has no control/);
  });

  it("reopens its shared state document with the same curves, and refuses new controls for it", () => {
    const w = explorer(membrane, { controls: [{ target: "membrane.temperature", min: "10 mK", max: "10 K" }] }).set({ "membrane.temperature": "1 K" });
    const again = explorer(w.stateDocument());
    expect(again.fingerprintMatches).toBe(true);
    expect(again.state).toEqual(w.state);
    expect(explorer(w.state).state.fingerprint).toBe(w.state.fingerprint);
    expect(() => explorer(w.state, { controls: [] })).toThrow(QuietframeError);
  });

  it("flags a state whose recorded curves this version does not reproduce", () => {
    const state = explorer(membrane).state;
    const forged = { ...state, fingerprint: `sha256:${"0".repeat(64)}` };
    expect(explorer(forged).fingerprintMatches).toBe(false);
  });

  it("prints its summary, not its internals, as a cell's last value", () => {
    const shown = inspect(explorer(membrane));
    expect(shown).toContain(membrane.name!);
    expect(shown).toMatch(/fingerprint: sha256:[0-9a-f]{64}/);
    expect(shown.length).toBeLessThan(3000);
  });
});

describe("show() and showChart() in a kernel", () => {
  let kernel: FakeKernel;
  beforeEach(() => {
    resetDisplaySession();
    kernel = new FakeKernel();
  });
  afterEach(() => {
    kernel.stop();
    resetDisplaySession();
  });

  it("displays the widget as two outputs: the page (HTML with the runtime the first time only, text summary), then the PNG sized as the chart", async () => {
    kernel.start();
    const runtime = runtimeSource();
    const w = explorer(membrane, { controls: [{ target: "cavity.photons", min: 1e4, max: 1e8 }] });
    await w.show();
    await w.show();
    // Each show() sends the page, then the figure as an image/png output of its own.
    expect(kernel.sent).toHaveLength(4);
    const [firstPage, firstFigure, secondPage, secondFigure] = kernel.sent.map((s) => s.content);
    // The chart's size in CSS pixels, from the SVG the page draws as its fallback.
    const svg = (await explorerFigures(w.computation, w.state, { scale: 1 })).svg;
    const chart = { width: Number(/<svg[^>]*\swidth="([\d.]+)"/.exec(svg)![1]), height: Number(/<svg[^>]*\sheight="([\d.]+)"/.exec(svg)![1]) };
    for (const [page, figure] of [
      [firstPage, firstFigure],
      [secondPage, secondFigure],
    ]) {
      expect(Object.keys(page.data).sort()).toEqual(["text/html", "text/plain"]);
      expect(String(page.data["text/html"])).toContain(`class="${EXPLORER_CLASS}"`);
      expect(String(page.data["text/plain"])).toContain(w.state.fingerprint);
      expect(Object.keys(figure.data).sort()).toEqual(["image/png", "text/plain"]);
      const png = Buffer.from(String(figure.data["image/png"]), "base64");
      expect(png.subarray(0, 8).equals(PNG_SIGNATURE)).toBe(true);
      // IHDR right after the signature, width and height as big-endian 32-bit integers (PNG specification, 11.2.2).
      expect(png.subarray(12, 16).toString("latin1")).toBe("IHDR");
      const size = { width: png.readUInt32BE(16), height: png.readUInt32BE(20) };
      // Scale 1: one image pixel per chart pixel.
      expect(size).toEqual(chart);
      expect(figure.metadata).toEqual({ "image/png": size });
      expect(String(figure.data["text/plain"])).toContain(membrane.name!);
      // The page names its PNG output by key, so that the live page hides exactly that one.
      expect(String(page.data["text/html"])).toContain(`${PNG_KEY_ATTRIBUTE}="${pngOutputKey(String(figure.data["image/png"]))}"`);
    }
    expect(String(firstPage.data["text/html"]).includes(runtime)).toBe(true);
    expect(String(secondPage.data["text/html"]).includes(runtime)).toBe(false);
    resetDisplaySession();
    await w.show();
    expect(String(kernel.sent[4].content.data["text/html"]).includes(runtime)).toBe(true);
  });

  it("sizes the PNG output as the chart whatever scale its PNG was rendered at", async () => {
    kernel.start();
    const w = explorer(membrane);
    await w.show({ png: { scale: 1 } });
    await w.show({ png: { scale: 2 } });
    const [, atOne, , atTwo] = kernel.sent.map((s) => s.content);
    const pixels = (c: Sent["content"]) => Buffer.from(String(c.data["image/png"]), "base64").readUInt32BE(16);
    expect(pixels(atTwo)).toBe(2 * pixels(atOne));
    expect(atTwo.metadata).toEqual(atOne.metadata);
  });

  it("does not count a widget shown outside a kernel as carrying the runtime", async () => {
    const w = explorer(membrane);
    await w.show();
    kernel.start();
    await w.show();
    expect(String(kernel.sent[0].content.data["text/html"]).includes(runtimeSource())).toBe(true);
  });

  it("shows a chart with the Vega-Lite spec as an object, its SVG and the key figures", async () => {
    kernel.start();
    await showChart(membrane);
    expect(kernel.sent).toHaveLength(1);
    const data = kernel.sent[0].content.data;
    expect(Object.keys(data).sort()).toEqual([VEGA_LITE_MIME, "image/svg+xml", "text/plain"].sort());
    const spec = data[VEGA_LITE_MIME] as { $schema: string; datasets: { curves: unknown[] } };
    expect(spec.$schema).toContain("vega-lite/v5");
    expect(spec.datasets.curves.length).toBeGreaterThan(801);
    expect(String(data["image/svg+xml"])).toMatch(/^<svg[\s>]/);
    expect(String(data["text/plain"])).toMatch(/below the SQL|above it/);
  });

  it("builds the same chart bundle for an explorer and for its set-up", async () => {
    const a = await chartBundle(membrane);
    const b = await chartBundle(explorer(membrane));
    expect(a[VEGA_LITE_MIME]).toEqual(b[VEGA_LITE_MIME]);
    expect(a["text/plain"]).toBe(b["text/plain"]);
  });
});

describe("loadSetupFile", () => {
  let dir: string;
  let cwd: string;
  beforeEach(() => {
    dir = mkdtempSync(join(tmpdir(), "quietframe-setups-"));
    cwd = process.cwd();
  });
  afterEach(() => {
    process.chdir(cwd);
    rmSync(dir, { recursive: true, force: true });
  });

  it("reads a set-up relative to the working directory (the notebook's folder in a kernel)", () => {
    writeFileSync(join(dir, "s.json"), JSON.stringify(membrane));
    process.chdir(dir);
    expect(loadSetupFile("s.json")).toEqual(membrane);
  });

  it("names the file and where the JSON breaks", () => {
    writeFileSync(join(dir, "broken.json"), '{\n  "format": "quietframe.setup",\n  "version": 1,,\n}');
    expect(() => loadSetupFile(join(dir, "broken.json"))).toThrow(/broken\.json.*line 3/);
  });

  it("says where it looked for a missing file", () => {
    process.chdir(dir);
    expect(() => loadSetupFile("nope.json")).toThrow(/nope\.json: does not exist \(looked in /);
  });

  it("rejects an invalid set-up with the field that is wrong", () => {
    const bad = structuredClone(membrane);
    bad.components[1].params = { ...bad.components[1].params, mass: "5 parsecs" };
    writeFileSync(join(dir, "bad.json"), JSON.stringify(bad));
    expect(() => loadSetupFile(join(dir, "bad.json"))).toThrow(/mass/);
  });
});
