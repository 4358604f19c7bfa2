import Ajv from "ajv";
import { mkdirSync, mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { curveRows, type CurveRow } from "../../widgets/explorer/budget-spec";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { CHART_MODEL_NAME, CHART_VIEW_CLASS, LIVE_MODULE } from "../../widgets/explorer/live/names";
import { liveStateSource } from "../../widgets/explorer/live/saved-state";
import { loadExplorerState } from "../../widgets/explorer/document";
import { WIDGET_STATE_MIME } from "../../widgets/core/state/widget-state";
import type { ExplorerState } from "../../widgets/explorer/format";
import type { ControlSpec } from "../../widgets/core/controls/control-spec";
import { createJupyterEnv, REPO_ROOT, SYSTEM_PYTHON, type JupyterEnv } from "../jupyter/env";
import { run } from "../jupyter/notebook-file";
import { openBrowser, type BrowserSession } from "./helpers/chromium";
import { startNotebookServer, type NotebookServer } from "./helpers/notebook-server";
import { allowOrigin, buildHarness, HARNESS_PATH, startHarnessServer, type HarnessServer } from "./live-harness/harness";

/**
 * The live explorer with a real widget manager: a page with ManagerBase of
 * @jupyter-widgets/base-manager and the views of @jupyter-widgets/controls, connected through
 * @jupyterlab/services (REST and websocket) to Debian's classic notebook server running the
 * quietframe kernel from a private Jupyter prefix. quietframe's chart module is loaded from
 * its built require.js file. A cell shows an explorer; the mouse moves a slider; cells read
 * and set the values.
 */
const KERNEL = "quietframe-ts";
const CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");
const EXAMPLE = join(REPO_ROOT, "examples", "cryogenic-membrane.json");
const CONTROLS: ControlSpec[] = [
  { target: "detector.efficiency", label: "detection efficiency", min: "50 %", max: "100 %" },
  { target: "cavity.photons", label: "intracavity photons", min: 1e4, max: 1e8 },
  { target: "cavity.detuning", label: "cavity detuning", control: "number", min: "-20 MHz", max: "20 MHz" },
];
const GRID = { from: "1.1 MHz", to: "1.3 MHz", points: 200 };
const TIMEOUT_MS = 120_000;

// Outside reference: the Jupyter widget state schema v2 shipped in @jupyter-widgets/schema.
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

interface ExecuteResult {
  status: string;
  stdout: string;
  stderr: string;
  error?: string;
  widgets: string[];
}

let jupyter: JupyterEnv | undefined;
let root: string | undefined;
let server: NotebookServer | undefined;
let browser: BrowserSession | undefined;
let page: Page;
let harnessDir: string;
let harness: HarnessServer | undefined;

/**
 * @jupyterlab/services first offers the kernel websocket subprotocol of newer servers; the
 * classic notebook server declines it and the client reconnects with the JSON protocol.
 */
const PROTOCOL_FALLBACK = /WebSocket handshake: Sent non-empty 'Sec-WebSocket-Protocol' header/;
function consoleErrors(): string[] {
  return browser!.consoleErrors.filter((m) => !PROTOCOL_FALLBACK.test(m));
}

async function execute(code: string): Promise<ExecuteResult> {
  return page.evaluate((c) => (globalThis as any).harness.execute(c), code);
}

/** The rows the chart view plots now (read from its Vega view). */
async function plottedRows(p: Page = page): Promise<CurveRow[]> {
  return p.evaluate((cls) => ((globalThis as any).document.querySelector(`.${cls}`) as any).quietframeChart.rows(), CHART_VIEW_CLASS);
}

async function drawnRevision(p: Page = page): Promise<number> {
  return p.evaluate((cls) => Number(((globalThis as any).document.querySelector(`.${cls}`) as { dataset: Record<string, string> } | null)?.dataset.revision ?? 0), CHART_VIEW_CLASS);
}

async function waitForRevisionAbove(revision: number): Promise<number> {
  await page.waitForFunction(
    ([cls, r]) => Number(((globalThis as any).document.querySelector(`.${cls}`) as { dataset: Record<string, string> } | null)?.dataset.revision ?? 0) > (r as number),
    [CHART_VIEW_CLASS, revision] as const,
    { timeout: TIMEOUT_MS },
  );
  return drawnRevision();
}

/** The values printed by a cell whose last expression is `w.values` (tslab prints it as an object literal). */
function printedValue(stdout: string, target: string): string {
  const m = new RegExp(`'${target.replace(/\./g, "\\.")}': ('[^']*'|[-+0-9.e]+)`).exec(stdout);
  if (!m) throw new Error(`no value of ${target} in ${JSON.stringify(stdout)}`);
  return m[1].startsWith("'") ? m[1].slice(1, -1) : m[1];
}

/** The curves the engine computes for these values, as the chart plots them. */
function engineRows(values: Record<string, string | number>): CurveRow[] {
  const setup = JSON.parse(readFileSync(EXAMPLE, "utf8")) as SetupDescription;
  const fresh = createExplorerState(setup, { controls: CONTROLS, settings: { grid: GRID } });
  const state: Omit<ExplorerState, "fingerprint"> = { ...fresh, values: { ...fresh.values, ...values } };
  return curveRows(computeExplorer(state).table);
}

function sliderReadout(index: number): Promise<string> {
  return page.locator(".widget-hslider .widget-readout").nth(index).innerText();
}

beforeAll(async () => {
  jupyter = createJupyterEnv();
  const install = await run(process.execPath, [CLI, "kernel", "install", "--prefix", join(jupyter.dir, "prefix"), "--python", SYSTEM_PYTHON], { env: jupyter.env, timeoutMs: 60_000 });
  if (install.code !== 0) throw new Error(`quietframe kernel install failed: ${install.stderr}`);
  root = mkdtempSync(join(tmpdir(), "quietframe-live-widgets-"));
  harnessDir = join(root, "harness");
  mkdirSync(harnessDir);
  await buildHarness(harnessDir);
  harness = await startHarnessServer(harnessDir);
  allowOrigin(jupyter.env.JUPYTER_CONFIG_DIR!, harness.origin);
  const notebookDir = join(root, "notebooks");
  mkdirSync(notebookDir);
  server = await startNotebookServer(jupyter, notebookDir);
  const origins = [server.origin, harness.origin];
  browser = await openBrowser({ allow: (url) => origins.some((o) => url.startsWith(`${o}/`)) || /^(data|blob):/.test(url) });
  page = browser.page;
  await page.goto(`${harness.origin}${HARNESS_PATH}index.html?server=${server.origin}&token=${server.token}`, { waitUntil: "load" });
  await page.waitForSelector("body[data-ready=true]", { state: "attached" });
}, 180_000);

afterAll(async () => {
  try {
    await page?.evaluate(() => (globalThis as any).harness.shutdown()).catch(() => undefined);
  } finally {
    await browser?.close();
    await server?.stop();
    await harness?.close();
    jupyter?.dispose();
    if (root) rmSync(root, { recursive: true, force: true });
  }
});

describe("a live explorer under a real widget manager", { timeout: TIMEOUT_MS * 2 }, () => {
  let initialRows: CurveRow[] = [];

  it("starts the quietframe kernel through @jupyterlab/services", async () => {
    const implementation = await page.evaluate((k) => (globalThis as any).harness.connect(k, "quietframe-live.js"), KERNEL);
    expect(typeof implementation).toBe("string");
  });

  it("a cell shows the standard sliders and quietframe's chart, with the engine's curves", async () => {
    const result = await execute(
      [
        `const { explorer, loadSetupFile } = require(${JSON.stringify(join(REPO_ROOT, "dist", "widgets", "notebook"))});`,
        `const w = explorer(loadSetupFile(${JSON.stringify(EXAMPLE)}), { controls: ${JSON.stringify(CONTROLS)}, settings: { grid: ${JSON.stringify(GRID)} } });`,
        `await w.show();`,
      ].join("\n"),
    );
    expect(result.error).toBeUndefined();
    expect(result.status).toBe("ok");
    expect(result.widgets).toHaveLength(1);
    await page.waitForSelector(`.${CHART_VIEW_CLASS}[data-revision="1"]`, { timeout: TIMEOUT_MS });
    expect(await page.locator(".widget-hslider").count()).toBe(2);
    // The slider's description carries the unit; the readout shows the value in that unit.
    expect(await page.locator(".widget-hslider .widget-label").first().innerText()).toBe("detection efficiency [%]");
    expect(Number(await sliderReadout(0))).toBeCloseTo(95, 10);
    initialRows = await plottedRows();
    expect(initialRows).toEqual(engineRows({}));
    expect(consoleErrors()).toEqual([]);
  });

  it("moving the slider with the mouse changes the kernel's value and the chart's curves", async () => {
    const before = await drawnRevision();
    const track = page.locator(".widget-hslider .noUi-target").first();
    const box = (await track.boundingBox())!;
    // Drag the handle (at 95 %) to about a fifth of the track, with real pointer events.
    const handle = (await page.locator(".widget-hslider .noUi-handle").first().boundingBox())!;
    await page.mouse.move(handle.x + handle.width / 2, handle.y + handle.height / 2);
    await page.mouse.down();
    await page.mouse.move(box.x + box.width * 0.2, box.y + box.height / 2, { steps: 8 });
    await page.mouse.up();
    const readout = Number(await sliderReadout(0));
    expect(readout).toBeLessThan(70);
    expect(readout).toBeGreaterThan(50);
    // The kernel's idea of the value, read by a cell.
    let shown = "";
    await expect
      .poll(
        async () => {
          shown = printedValue((await execute("w.values")).stdout, "detector.efficiency");
          return Number(shown.replace(/\s*%$/, ""));
        },
        { timeout: TIMEOUT_MS },
      )
      .toBeCloseTo(readout, 10);
    await waitForRevisionAbove(before);
    await expect.poll(async () => JSON.stringify(await plottedRows()) === JSON.stringify(engineRows({ "detector.efficiency": shown })), { timeout: TIMEOUT_MS }).toBe(true);
    expect(await plottedRows()).not.toEqual(initialRows);
  });

  it("a value set from a cell moves the slider and replots", async () => {
    const before = await drawnRevision();
    const result = await execute(`w.set("detector.efficiency", "70 %"); w.values`);
    expect(result.error).toBeUndefined();
    expect(printedValue(result.stdout, "detector.efficiency")).toBe("70 %");
    await expect.poll(() => sliderReadout(0), { timeout: TIMEOUT_MS }).toBe("70");
    await waitForRevisionAbove(before);
    await expect.poll(async () => JSON.stringify(await plottedRows()) === JSON.stringify(engineRows({ "detector.efficiency": "70 %" })), { timeout: TIMEOUT_MS }).toBe(true);
  });

  it("a value out of range from a cell is refused with its path, and the slider stays", async () => {
    const result = await execute(`w.set("detector.efficiency", "45 %")`);
    expect(`${result.error ?? ""}${result.stderr}`).toMatch(/values\.detector\.efficiency.*outside the control's range/);
    expect(await sliderReadout(0)).toBe("70");
  });

  it("a typed value the model cannot compute shows the reason in the chart and keeps its curves", async () => {
    // A blue-detuned drive makes the mechanics unstable (Aspelmeyer, Kippenberg & Marquardt,
    // Rev. Mod. Phys. 86, 1391 (2014), sec. VII); the kernel says so instead of plotting.
    const rows = await plottedRows();
    const field = page.locator(".widget-text input").first();
    await field.fill("1.2");
    await field.press("Enter");
    const alert = page.locator(`.${CHART_VIEW_CLASS} .qf-alert`);
    await expect.poll(() => alert.isVisible(), { timeout: TIMEOUT_MS }).toBe(true);
    expect(await alert.innerText()).toMatch(/unstable.*blue-detuned/);
    expect(await plottedRows()).toEqual(rows);
    expect(printedValue((await execute("w.values")).stdout, "cavity.detuning")).toBe("1.2 MHz");
    // The last valid state is what the kernel keeps.
    expect((await execute(`w.state.values["cavity.detuning"]`)).stdout).toMatch(/0 Hz/);
    // Back to resonance from a cell: the field follows and the reason goes.
    await execute(`w.set("cavity.detuning", "0 Hz")`);
    await expect.poll(() => alert.isVisible(), { timeout: TIMEOUT_MS }).toBe(false);
    expect(await field.inputValue()).toBe("0 Hz");
  });

  it("the widget state the manager saves holds the explorer state, which the CLI's reader loads", async () => {
    const saved = (await page.evaluate(() => (globalThis as any).harness.savedState())) as { state: Record<string, { model_module: string; model_name: string }> };
    expect(validateWidgetState(saved), JSON.stringify(validateWidgetState.errors)).toBe(true);
    const charts = Object.entries(saved.state).filter(([, m]) => m.model_module === LIVE_MODULE && m.model_name === CHART_MODEL_NAME);
    expect(charts).toHaveLength(1);
    const notebook = { cells: [], metadata: { widgets: { [WIDGET_STATE_MIME]: saved } }, nbformat: 4, nbformat_minor: 5 };
    const found = liveStateSource(JSON.stringify(notebook), "saved.ipynb");
    const loaded = loadExplorerState(found.value, found.source);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.state.values["detector.efficiency"]).toBe("70 %");
  });

  it("a manager without a kernel redraws the chart from that saved state", async () => {
    const saved = await page.evaluate(() => (globalThis as any).harness.savedState());
    const chartId = Object.entries((saved as { state: Record<string, { model_name: string }> }).state).find(([, m]) => m.model_name === CHART_MODEL_NAME)![0];
    const rows = await plottedRows();
    const offline = await browser!.context.newPage();
    try {
      await offline.goto(`${harness!.origin}${HARNESS_PATH}index.html`, { waitUntil: "load" });
      await offline.waitForSelector("body[data-ready=true]", { state: "attached" });
      await offline.evaluate(
        ([state, id]) => {
          (globalThis as any).harness.offline("quietframe-live.js");
          return (globalThis as any).harness.restore(state, id);
        },
        [saved, chartId] as const,
      );
      await offline.waitForSelector(`.${CHART_VIEW_CLASS}[data-revision]`, { timeout: TIMEOUT_MS });
      expect(await plottedRows(offline)).toEqual(rows);
      expect(consoleErrors()).toEqual([]);
    } finally {
      await offline.close();
    }
  });
});
