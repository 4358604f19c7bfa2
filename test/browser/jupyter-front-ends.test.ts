import { spawnSync } from "node:child_process";
import { existsSync, readFileSync } from "node:fs";
import { join } from "node:path";
import type { Locator, Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { curveRows, type CurveRow } from "../../widgets/explorer/budget-spec";
import { computeExplorer } from "../../widgets/explorer/model";
import { CHART_MODEL_NAME, CHART_VIEW_CLASS, LIVE_MODULE, LIVE_MODULE_VERSION } from "../../widgets/explorer/live/names";
import { WIDGET_STATE_MIME } from "../../widgets/core/state/widget-state";
import { liveStateSource } from "../../widgets/explorer/live/saved-state";
import { loadExplorerState } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";
import { versionMismatchText } from "../../widgets/explorer/frontend/mismatch-text";
import { openBrowser, type BrowserSession } from "./helpers/chromium";
import { APP_TIMEOUT_MS, openNotebook, runAll, screenshotArtifact, waitForKernelIdle } from "./helpers/jupyter-app";
import { createFrontEndEnv, notebookRoot, startLab, type FrontEndEnv } from "./helpers/front-ends";
import type { NotebookServer } from "./helpers/notebook-server";

/**
 * The live explorer in the front-ends users run: JupyterLab 4 and Notebook 7 with ipywidgets 8
 * (pinned, from PyPI, scripts/ensure-python-env.sh), the quietframe kernel and the prebuilt
 * lab extension installed by our own `quietframe kernel install` and `quietframe extension
 * install`. An example notebook, unchanged, is opened, the quietframe kernel chosen in the
 * kernel dialog, and every cell run; the mouse moves a slider, cells read and set values, the
 * page reconnects to the running kernel after a reload, the saved notebook redraws its
 * charts from its widget state once that kernel is gone, and a restarted kernel runs the
 * notebook again into working charts. The page logs no errors from quietframe and no
 * shared-module version warnings (see scripts/python-env/requirements.txt). Screenshots go to
 * QUIETFRAME_TEST_ARTIFACTS (default: quietframe-test-artifacts/ in the OS temp dir).
 */
const KERNEL_DISPLAY = "TypeScript (quietframe)";
const KERNEL_NAME = "quietframe-ts";
const TIMEOUT_MS = APP_TIMEOUT_MS;
const EXAMPLE = "cryogenic-membrane.ipynb";
const LAB_NOTEBOOK = "lab.ipynb";
const NB7_NOTEBOOK = "notebook7.ipynb";
/** The notebook's first explorer (plain light) and the control the tests move. */
const FIRST_EXPLORER = "plain";
const TARGET = "detector.efficiency";
const TARGET_LABEL = "detection efficiency [%]";

interface SavedNotebook {
  metadata: { widgets?: Record<string, { state?: Record<string, { model_module: string; model_module_version: string; model_name: string }> }> };
}

let fe: FrontEndEnv | undefined;
let root: string;
let server: NotebookServer | undefined;
let browser: BrowserSession | undefined;

/** console errors that come from quietframe's code (its extension's files, or naming quietframe). */
function quietframeConsoleErrors(): string[] {
  return (browser?.consoleErrors ?? []).filter((m) => /quietframe/i.test(m));
}

/**
 * Warnings the module federation logs when an extension asks the page for a shared module of
 * a version the page does not have ("Unsatisfied version …", "No satisfying version …"),
 * whichever extension asked, and warnings from quietframe's code (its extension's files, or
 * text starting with "quietframe"; JupyterLab's own notes may name the kernel quietframe-ts).
 */
function versionOrQuietframeWarnings(): string[] {
  return (browser?.consoleWarnings ?? []).filter((m) => /Unsatisfied version|No satisfying version|^quietframe|\/quietframe-live\//i.test(m));
}

function screenshot(page: Page, name: string): Promise<void> {
  return screenshotArtifact(page, "jupyter-front-ends", name);
}

/**
 * Chooses a kernel by its display name as a user does: in the "Select Kernel" dialog the
 * front-end shows when the notebook's kernel is not installed, or else through Kernel →
 * Change Kernel… (the front-end may have started a kernel of the notebook's language).
 */
async function chooseKernel(page: Page, label: string): Promise<void> {
  const dialog = page.locator(".jp-Dialog");
  await page.waitForFunction(
    () => {
      const ctx = (globalThis as any).jupyterapp.shell.currentWidget.sessionContext;
      return (globalThis as any).document.querySelector(".jp-Dialog") !== null || (ctx.isReady && !ctx.pendingInput);
    },
    undefined,
    { timeout: TIMEOUT_MS },
  );
  if ((await dialog.count()) === 0) {
    // Not awaited in the page: the command resolves only when the dialog closes.
    await page.evaluate(() => void (globalThis as any).jupyterapp.commands.execute("notebook:change-kernel"));
    await dialog.waitFor({ timeout: TIMEOUT_MS });
  }
  await dialog.locator("select").selectOption({ label });
  await dialog.locator(".jp-Dialog-button.jp-mod-accept").click();
  await dialog.waitFor({ state: "detached", timeout: TIMEOUT_MS });
  await page.waitForFunction((name) => (globalThis as any).jupyterapp.shell.currentWidget.sessionContext.session?.kernel?.name === name, KERNEL_NAME, { timeout: TIMEOUT_MS });
}

/** Restarts the kernel as a user does (Kernel → Restart Kernel…, confirmed in its dialog) and waits until it is idle again. */
async function restartKernel(page: Page): Promise<void> {
  await waitForKernelIdle(page);
  await page.evaluate(() => {
    const w = globalThis as any;
    w.quietframeTestRestarted = false;
    w.jupyterapp.shell.currentWidget.sessionContext.session.kernel.statusChanged.connect((_: unknown, status: string) => {
      if (status === "restarting" || status === "autorestarting") w.quietframeTestRestarted = true;
    });
    // Not awaited in the page: the command resolves only when the dialog closes.
    void w.jupyterapp.commands.execute("notebook:restart-kernel");
  });
  const dialog = page.locator(".jp-Dialog");
  await dialog.waitFor({ timeout: TIMEOUT_MS });
  await dialog.locator(".jp-Dialog-button.jp-mod-accept").click();
  await dialog.waitFor({ state: "detached", timeout: TIMEOUT_MS });
  await page.waitForFunction(
    () => (globalThis as any).quietframeTestRestarted === true && (globalThis as any).jupyterapp.shell.currentWidget.sessionContext.session?.kernel?.status === "idle",
    undefined,
    { timeout: TIMEOUT_MS },
  );
}

/** Adds a cell at the end, runs it and returns what it printed (tslab prints a last expression's value as text). */
async function runCell(page: Page, code: string): Promise<{ text: string; errors: string[] }> {
  await waitForKernelIdle(page);
  const index = await page.evaluate(async (source) => {
    const app = (globalThis as any).jupyterapp;
    const nb = app.shell.currentWidget.content;
    nb.activeCellIndex = nb.widgets.length - 1;
    await app.commands.execute("notebook:insert-cell-below");
    nb.activeCell.model.sharedModel.setSource(source);
    void app.commands.execute("notebook:run-cell");
    return nb.activeCellIndex as number;
  }, code);
  await page.waitForFunction(
    (i) => {
      const panel = (globalThis as any).jupyterapp.shell.currentWidget;
      const cell = panel.content.widgets[i];
      const prompt = cell.node.querySelector(".jp-InputArea-prompt")?.textContent ?? "";
      return panel.sessionContext.session?.kernel?.status === "idle" && /\[\d*\]/.test(prompt) && !prompt.includes("*") && cell.model.executionState !== "running";
    },
    index,
    { timeout: TIMEOUT_MS, polling: 250 },
  );
  return page.evaluate((i) => {
    const outputs = (globalThis as any).jupyterapp.shell.currentWidget.content.widgets[i].model.outputs.toJSON() as any[];
    const text = outputs.map((o) => (o.output_type === "stream" ? o.text : (o.data?.["text/plain"] ?? ""))).join("");
    return { text: String(text), errors: outputs.filter((o) => o.output_type === "error").map((o) => `${o.ename}: ${o.evalue}`) };
  }, index);
}

/** The value of `target` in a printed `w.values` (tslab prints it as an object literal). */
function printedValue(text: string, target: string): string {
  const m = new RegExp(`'${target.replace(/\./g, "\\.")}': ('[^']*'|[-+0-9.e]+)`).exec(text);
  if (!m) throw new Error(`no value of ${target} in ${JSON.stringify(text)}`);
  return m[1].startsWith("'") ? m[1].slice(1, -1) : m[1];
}

/** The rows the n-th chart on the page plots now (read from its Vega view). */
async function plottedRows(page: Page, n: number): Promise<CurveRow[]> {
  return page.evaluate(([cls, i]) => ((globalThis as any).document.querySelectorAll(`.${cls}`)[i] as any).quietframeChart.rows(), [CHART_VIEW_CLASS, n] as const);
}

async function drawnRevision(page: Page, n: number): Promise<number> {
  return page.evaluate(([cls, i]) => Number(((globalThis as any).document.querySelectorAll(`.${cls}`)[i] as { dataset: Record<string, string> } | undefined)?.dataset.revision ?? 0), [
    CHART_VIEW_CLASS,
    n,
  ] as const);
}

async function save(page: Page): Promise<void> {
  await page.evaluate(() => (globalThis as any).jupyterapp.commands.execute("docmanager:save"));
  await page.waitForFunction(() => (globalThis as any).jupyterapp.shell.currentWidget.context.model.dirty === false, undefined, { timeout: TIMEOUT_MS });
}

/**
 * The explorer states of this version's live charts saved in a notebook's widget state, the
 * notebook's first explorer (plain light: no squeezer control) first.
 */
function savedChartStates(file: string): ExplorerState[] {
  const text = readFileSync(join(root, "notebooks", file), "utf8");
  const models = Object.values((JSON.parse(text) as SavedNotebook).metadata.widgets?.[WIDGET_STATE_MIME]?.state ?? {}).filter(
    (m) => m.model_module === LIVE_MODULE && m.model_name === CHART_MODEL_NAME,
  );
  const states = models.flatMap((m, i) => {
    if (m.model_module_version !== LIVE_MODULE_VERSION) return [];
    const found = liveStateSource(text, file, i + 1);
    const loaded = loadExplorerState(found.value, found.source);
    expect(loaded.fingerprintMatches, `chart ${i + 1}: the saved state reproduces its fingerprint`).toBe(true);
    return [loaded.state];
  });
  const plain = (s: ExplorerState): boolean => !s.controls.some((c) => c.target.startsWith("squeezer."));
  return [...states.filter(plain), ...states.filter((s) => !plain(s))];
}

/** The curves the engine computes in this Node process for a state, with some values changed. */
function engineRows(state: ExplorerState, values: Record<string, string> = {}): CurveRow[] {
  return curveRows(computeExplorer({ ...state, values: { ...state.values, ...values } }).table);
}

function sliderRow(page: Page, label: string): Locator {
  return page
    .locator(".widget-hslider")
    .filter({ has: page.locator(".widget-label", { hasText: label }) })
    .first();
}

/** Waits until `n` charts have drawn curves. */
async function waitForCharts(page: Page, n: number): Promise<void> {
  await page.waitForFunction(([cls, count]) => (globalThis as any).document.querySelectorAll(`.${cls}[data-revision]`).length === count, [CHART_VIEW_CLASS, n] as const, { timeout: TIMEOUT_MS });
}

/** Waits until the first chart has drawn a revision newer than `revision`. */
async function waitForFirstChartAbove(page: Page, revision: number): Promise<void> {
  await page.waitForFunction(([cls, r]) => Number((globalThis as any).document.querySelectorAll(`.${cls}`)[0]?.dataset.revision ?? 0) > (r as number), [CHART_VIEW_CLASS, revision] as const, {
    timeout: TIMEOUT_MS,
  });
}

/** Drags the first slider labelled `label` to `fraction` of its track with real pointer events; returns the slider. */
async function dragSlider(page: Page, label: string, fraction: number): Promise<Locator> {
  const slider = sliderRow(page, label);
  await slider.scrollIntoViewIfNeeded();
  const track = (await slider.locator(".noUi-target").boundingBox())!;
  const handle = (await slider.locator(".noUi-handle").boundingBox())!;
  await page.mouse.move(handle.x + handle.width / 2, handle.y + handle.height / 2);
  await page.mouse.down();
  await page.mouse.move(track.x + track.width * fraction, track.y + track.height / 2, { steps: 8 });
  await page.mouse.up();
  return slider;
}

/**
 * Drags the target slider to `fraction` of its track; the kernel's value (printed by a cell)
 * follows the readout and the first chart replots the engine's curves for it. Returns the readout.
 */
async function expectDragReachesKernel(page: Page, fraction: number, state: ExplorerState): Promise<number> {
  const before = await drawnRevision(page, 0);
  const slider = await dragSlider(page, TARGET_LABEL, fraction);
  const readout = Number(await slider.locator(".widget-readout").innerText());
  let shown = "";
  await expect
    .poll(
      async () => {
        shown = printedValue((await runCell(page, `${FIRST_EXPLORER}.values`)).text, TARGET);
        return Number(shown.replace(/\s*%$/, ""));
      },
      { timeout: TIMEOUT_MS },
    )
    .toBeCloseTo(readout, 10);
  await waitForFirstChartAbove(page, before);
  const want = engineRows(state, { [TARGET]: shown });
  await expect.poll(async () => JSON.stringify(await plottedRows(page, 0)) === JSON.stringify(want), { timeout: TIMEOUT_MS }).toBe(true);
  expect(want).not.toEqual(engineRows(state));
  return readout;
}

/** Sets the target from a cell: the cell reads the new value back, the slider moves to it and the first chart replots. */
async function expectCellSetMovesSlider(page: Page, percent: number, state: ExplorerState): Promise<void> {
  const before = await drawnRevision(page, 0);
  const value = `${percent} %`;
  const result = await runCell(page, `${FIRST_EXPLORER}.set("${TARGET}", "${value}"); ${FIRST_EXPLORER}.values`);
  expect(result.errors).toEqual([]);
  expect(printedValue(result.text, TARGET)).toBe(value);
  await expect.poll(() => sliderRow(page, TARGET_LABEL).locator(".widget-readout").innerText(), { timeout: TIMEOUT_MS }).toBe(String(percent));
  await waitForFirstChartAbove(page, before);
  const want = engineRows(state, { [TARGET]: value });
  await expect.poll(async () => JSON.stringify(await plottedRows(page, 0)) === JSON.stringify(want), { timeout: TIMEOUT_MS }).toBe(true);
}

/** Reloads the page while its kernel runs: the front-end reconnects to the kernel's widgets and draws the same charts and controls. */
async function expectReloadRedraws(page: Page, percent: number): Promise<void> {
  const rows = [await plottedRows(page, 0), await plottedRows(page, 1)];
  await page.reload({ waitUntil: "load" });
  await page.waitForFunction(() => (globalThis as any).jupyterapp?.shell?.currentWidget?.context?.isReady === true, undefined, { timeout: TIMEOUT_MS });
  await waitForCharts(page, 2);
  expect(await page.locator(".jupyter-widgets-error-widget").count()).toBe(0);
  expect(await plottedRows(page, 0)).toEqual(rows[0]);
  expect(await plottedRows(page, 1)).toEqual(rows[1]);
  await expect.poll(() => sliderRow(page, TARGET_LABEL).locator(".widget-readout").innerText(), { timeout: TIMEOUT_MS }).toBe(String(percent));
}

/**
 * Restarts the kernel and runs every cell again, with the cells this suite added since the
 * page last loaded the file (`setByAddedCells`: the target value the last of them set, if any):
 * the new kernel's charts draw the engine's curves for the notebook's values (`states`, the
 * first run's) with that target, and answer the mouse.
 */
async function expectRestartRunsAgain(page: Page, states: ExplorerState[], fraction: number, setByAddedCells?: number): Promise<void> {
  const percent = setByAddedCells ?? Number(String(states[0].values[TARGET]).replace(/\s*%$/, ""));
  await restartKernel(page);
  expect((await runCell(page, `typeof ${FIRST_EXPLORER}`)).text, "the restarted kernel has none of the old variables").toMatch(/Cannot find name 'plain'|undefined/);
  expect(await runAll(page)).toEqual([]);
  await waitForCharts(page, 2);
  expect(await page.locator(".jupyter-widgets-error-widget").count()).toBe(0);
  const want = [engineRows(states[0], { [TARGET]: `${percent} %` }), engineRows(states[1])];
  await expect.poll(() => sliderRow(page, TARGET_LABEL).locator(".widget-readout").innerText(), { timeout: TIMEOUT_MS }).toBe(String(percent));
  for (let i = 0; i < 2; i++) await expect.poll(async () => JSON.stringify(await plottedRows(page, i)) === JSON.stringify(want[i]), { timeout: TIMEOUT_MS, message: `chart ${i + 1}` }).toBe(true);
  await expectDragReachesKernel(page, fraction, states[0]);
}

/** What `jupyter labextension list` of the pinned environment prints, without its colours. */
function labextensionList(): string {
  const r = spawnSync(join(fe!.env.VIRTUAL_ENV!, "bin", "jupyter"), ["labextension", "list"], { env: fe!.env, encoding: "utf8" });
  // JupyterLab colours "enabled" and "OK" even without a terminal.
  return `${r.stdout}${r.stderr}`.replace(new RegExp(`${String.fromCharCode(27)}\\[[0-9;]*m`, "g"), "");
}

beforeAll(async () => {
  fe = createFrontEndEnv();
  // No --python: the kernel install finds the Python of the `jupyter` on PATH (the pinned environment's).
  await fe.cli(["kernel", "install", "--prefix", fe.prefix]);
  await fe.cli(["extension", "install", "--prefix", fe.prefix]);
  root = notebookRoot(fe.dir, { [LAB_NOTEBOOK]: EXAMPLE, [NB7_NOTEBOOK]: EXAMPLE });
  server = await startLab(fe, root);
  const origin = server.origin;
  browser = await openBrowser({ allow: (url) => url.startsWith(`${origin}/`) || /^(data|blob):/.test(url) });
}, TIMEOUT_MS);

afterAll(async () => {
  try {
    await browser?.close();
  } finally {
    await server?.stop();
    fe?.dispose();
  }
});

describe("the pinned front-ends", () => {
  it("list the installed extension as enabled", async () => {
    const r = labextensionList();
    expect(r).toMatch(/JupyterLab v4\./);
    expect(r).toMatch(/quietframe-live v0\.\d+\.\d+ enabled\s+OK \(npm, quietframe\)/);
  });
});

describe("quietframe extension install and remove", () => {
  it("puts the built extension into PREFIX/share/jupyter/labextensions and takes it out again", async () => {
    const other = join(fe!.dir, "other-prefix");
    const target = join(other, "share", "jupyter", "labextensions", "quietframe-live");
    expect(await fe!.cli(["extension", "install", "--prefix", other])).toBe(`Installed the quietframe-live extension in ${target}; reload JupyterLab's page\n`);
    const manifest = JSON.parse(readFileSync(join(target, "package.json"), "utf8")) as { name: string; version: string; jupyterlab: { _build: { load: string } } };
    expect(manifest.name).toBe("quietframe-live");
    expect(manifest.version).toBe(LIVE_MODULE_VERSION);
    expect(existsSync(join(target, manifest.jupyterlab._build.load))).toBe(true);
    expect(JSON.parse(readFileSync(join(target, "install.json"), "utf8"))).toEqual({
      packageManager: "npm",
      packageName: "quietframe",
      uninstallInstructions: `npx quietframe extension remove --prefix ${JSON.stringify(other)}`,
    });
    expect(await fe!.cli(["extension", "remove", "--prefix", other])).toBe(`Removed the quietframe-live extension from ${target}; reload JupyterLab's page\n`);
    expect(existsSync(target)).toBe(false);
    expect(await fe!.cli(["extension", "remove", "--prefix", other])).toBe(`The quietframe-live extension is not in ${target}: nothing to remove\n`);
  });
});

describe("an example notebook in JupyterLab 4", { timeout: TIMEOUT_MS * 3 }, () => {
  let page: Page;
  let states: ExplorerState[] = [];

  it("opens, takes the quietframe kernel from the kernel dialog, and runs every cell without errors", async () => {
    page = browser!.page;
    await openNotebook(page, server!, `lab/tree/notebooks/${LAB_NOTEBOOK}`);
    await chooseKernel(page, KERNEL_DISPLAY);
    expect(await runAll(page)).toEqual([]);
    await screenshot(page, "lab-run-all");
  });

  it("draws each explorer's live chart with the curves the engine computes in Node", async () => {
    await waitForCharts(page, 2);
    expect(await page.locator(".widget-hslider").count()).toBeGreaterThan(4);
    await save(page);
    states = savedChartStates(LAB_NOTEBOOK);
    expect(states).toHaveLength(2);
    for (let i = 0; i < 2; i++) {
      const want = engineRows(states[i]);
      expect(want.length).toBeGreaterThan(10);
      expect(await plottedRows(page, i), `chart ${i + 1}`).toEqual(want);
    }
    await page.locator(`.${CHART_VIEW_CLASS}`).first().scrollIntoViewIfNeeded();
    await screenshot(page, "lab-first-chart");
    expect(quietframeConsoleErrors()).toEqual([]);
  });

  it("a slider moved with the mouse changes the kernel's value and the chart", async () => {
    const readout = await expectDragReachesKernel(page, 0.2, states[0]);
    // The control spans 50 % … 100 % (the notebook's first explorer).
    expect(readout).toBeGreaterThan(50);
    expect(readout).toBeLessThan(70);
  });

  it("a value set from a cell moves the slider and replots", async () => {
    await expectCellSetMovesSlider(page, 70, states[0]);
    await screenshot(page, "lab-set-from-cell");
  });

  it("a chart from another quietframe version shows which versions disagree, not a blank or a stack", async () => {
    const version = "99.0.0";
    const result = await runCell(
      page,
      [
        `{ const k = require(${JSON.stringify(join(root, "dist", "widgets", "kernel"))});`,
        `const names = { _model_module: "quietframe-live", _model_module_version: "${version}", _model_name: "QuietframeChartModel", _view_module: "quietframe-live", _view_module_version: "${version}", _view_name: "QuietframeChartView" };`,
        `k.displayWidget(new k.WidgetModel(names), { "text/plain": "a chart of another version" }); }`,
      ].join("\n"),
    );
    expect(result.errors).toEqual([]);
    const message = page.locator(".quietframe-live-version-mismatch");
    await message.waitFor({ timeout: TIMEOUT_MS });
    expect(await message.innerText()).toBe(versionMismatchText(version));
    expect(await page.locator(".jupyter-widgets-error-widget").count()).toBe(0);
    await message.scrollIntoViewIfNeeded();
    await screenshot(page, "lab-version-mismatch");
    // Take the cell out again, so the saved notebook holds only the example's charts.
    await page.evaluate(() => (globalThis as any).jupyterapp.commands.execute("notebook:delete-cell"));
  });

  it("reloaded while the kernel runs, reconnects to its widgets: the charts redraw and still answer", async () => {
    await expectReloadRedraws(page, 70);
  });

  it("saved, and reopened after the kernel was shut down, redraws its charts from the saved widget state", async () => {
    const rows = [await plottedRows(page, 0), await plottedRows(page, 1)];
    await save(page);
    const saved = savedChartStates(LAB_NOTEBOOK);
    expect(saved[0].values[TARGET]).toBe("70 %");
    const before = await page.evaluate(() => (globalThis as any).jupyterapp.shell.currentWidget.sessionContext.session.kernel.id as string);
    await page.evaluate(() => (globalThis as any).jupyterapp.shell.currentWidget.sessionContext.shutdown());
    await page.reload({ waitUntil: "load" });
    // JupyterLab starts a new kernel for the notebook; it knows none of the old widgets, so
    // what the page shows comes from the widget state saved in the file.
    await page.waitForFunction(
      (old) => {
        const kernel = (globalThis as any).jupyterapp?.shell?.currentWidget?.sessionContext?.session?.kernel;
        return kernel && kernel.id !== old && kernel.status === "idle";
      },
      before,
      { timeout: TIMEOUT_MS },
    );
    await waitForCharts(page, 2);
    expect(await plottedRows(page, 0)).toEqual(rows[0]);
    expect(await plottedRows(page, 1)).toEqual(rows[1]);
    expect(await plottedRows(page, 0)).toEqual(engineRows(saved[0]));
    expect((await runCell(page, `typeof ${FIRST_EXPLORER}`)).text).toMatch(/Cannot find name 'plain'|undefined/);
    await page.locator(`.${CHART_VIEW_CLASS}`).first().scrollIntoViewIfNeeded();
    await screenshot(page, "lab-reopened-from-saved-state");
    expect(quietframeConsoleErrors()).toEqual([]);
  });

  it("restarted (Kernel → Restart Kernel…) and run again, draws live charts that answer the mouse", async () => {
    // The cells added before the reloads went with them (never saved); the notebook's own values.
    await expectRestartRunsAgain(page, states, 0.8);
    await page.locator(`.${CHART_VIEW_CLASS}`).first().scrollIntoViewIfNeeded();
    await screenshot(page, "lab-restarted");
    expect(quietframeConsoleErrors()).toEqual([]);
    expect(versionOrQuietframeWarnings()).toEqual([]);
  });
});

describe("the same notebook in Notebook 7", { timeout: TIMEOUT_MS * 3 }, () => {
  let page: Page;
  let states: ExplorerState[] = [];

  it("runs with the quietframe kernel and draws the engine's curves", async () => {
    await fe!.cli(["kernel", "install", "--prefix", fe!.prefix]);
    page = await browser!.context.newPage();
    await openNotebook(page, server!, `notebooks/notebooks/${NB7_NOTEBOOK}`);
    await chooseKernel(page, KERNEL_DISPLAY);
    expect(await runAll(page)).toEqual([]);
    await waitForCharts(page, 2);
    await save(page);
    states = savedChartStates(NB7_NOTEBOOK);
    for (let i = 0; i < 2; i++) expect(await plottedRows(page, i), `chart ${i + 1}`).toEqual(engineRows(states[i]));
    await page.locator(`.${CHART_VIEW_CLASS}`).first().scrollIntoViewIfNeeded();
    await screenshot(page, "notebook7-first-chart");
  });

  it("a slider moved with the mouse changes the kernel's value and the chart", async () => {
    await expectDragReachesKernel(page, 0.3, states[0]);
    await sliderRow(page, TARGET_LABEL).scrollIntoViewIfNeeded();
    await screenshot(page, "notebook7-slider-moved");
  });

  it("a value set from a cell moves the slider and replots", async () => {
    await expectCellSetMovesSlider(page, 80, states[0]);
    await screenshot(page, "notebook7-set-from-cell");
  });

  it("reloaded while the kernel runs, reconnects to its widgets: the charts redraw and still answer", async () => {
    await expectReloadRedraws(page, 80);
    await expectCellSetMovesSlider(page, 65, states[0]);
    await screenshot(page, "notebook7-reloaded");
  });

  it("restarted (Kernel → Restart Kernel…) and run again, draws live charts that answer the mouse", async () => {
    // The cell added after the reload set the target to 65 % and runs again.
    await expectRestartRunsAgain(page, states, 0.7, 65);
    await page.locator(`.${CHART_VIEW_CLASS}`).first().scrollIntoViewIfNeeded();
    await screenshot(page, "notebook7-restarted");
    expect(quietframeConsoleErrors()).toEqual([]);
    expect(versionOrQuietframeWarnings()).toEqual([]);
    await page.close();
  });
});
