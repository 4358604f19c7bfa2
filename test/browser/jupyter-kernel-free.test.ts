import { execFileSync } from "node:child_process";
import { readFileSync, writeFileSync } from "node:fs";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { TRUST_HINT } from "../../widgets/core/page/fallback";
import { STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { TS_KERNEL, tslabBinary } from "../jupyter/env";
import { outputsOf, run, type Notebook } from "../jupyter/notebook-file";
import { openBrowser, type BrowserSession } from "./helpers/chromium";
import { createFrontEndEnv, notebookRoot, startLab, type FrontEndEnv } from "./helpers/front-ends";
import { APP_TIMEOUT_MS, openNotebook, runAll, screenshotArtifact } from "./helpers/jupyter-app";
import type { NotebookServer } from "./helpers/notebook-server";
import { isWidgetOutput, pngOutputsAfterWidgets, pngOutputViews, summaryFingerprint, type PngOutputView, type StoredPngOutput } from "./helpers/notebook-widgets";
import { expectPageMatchesEngine, fingerprintOf, moveSlider, otherPosition, pageState, sliderPosition, sliderText, WIDGET, waitAllReady } from "./helpers/widgets";

/**
 * Kernel-free widget outputs in JupyterLab 4 and Notebook 7 (the pinned environment of
 * scripts/ensure-python-env.sh): an example notebook, unchanged, run with plain tslab (the
 * notebook's own kernel; no quietframe kernel, no extension). Each widget is two outputs: the
 * page (HTML) and its figure as a PNG output. Its outputs are trusted while they are made and
 * once the server has signed the saved file: the widgets come alive from the HTML, replot the
 * engine's numbers without a kernel and hide their PNG outputs. A copy this server never
 * signed (a notebook received from someone) opens untrusted: no script runs, and the reader
 * sees the safety note, the summary, how to trust the notebook and the figure as the PNG,
 * never the SVG's loose labels; trusting it brings the widgets to life and hides the PNGs.
 * Screenshots go to QUIETFRAME_TEST_ARTIFACTS.
 */
const EXAMPLE = "cryogenic-membrane.ipynb";
const NOTEBOOK = "kernel-free.ipynb";
const RECEIVED_IN_LAB = "received-lab.ipynb";
const RECEIVED_IN_NOTEBOOK7 = "received-notebook7.ipynb";
/** The example's kernel-free widgets (two explorers). */
const WIDGETS = 2;
/** The safety note every widget output starts with, and a summary line of every explorer. */
const SAFETY_NOTE_START = "quietframe computes and does not certify";
const SUMMARY_LABEL = "Below the SQL";
/** An axis title of the explorer's static SVG: its text must not show loose where the SVG is stripped. */
const AXIS_TITLE = "frequency [Hz]";

let fe: FrontEndEnv | undefined;
let root: string;
let server: NotebookServer | undefined;
let browser: BrowserSession | undefined;
let page: Page;
/** The fingerprints tslab computed for the widgets (their text summaries), in page order. */
let fingerprints: string[] = [];
/** The PNG outputs tslab sent after the widgets, in page order. */
let pngOutputs: StoredPngOutput[] = [];
/** JupyterLab's and Notebook 7's element per output. */
const OUTPUT_CHILD = ".jp-OutputArea-child";

function quietframeConsoleErrors(): string[] {
  return (browser?.consoleErrors ?? []).filter((m) => /quietframe/i.test(m));
}

function screenshot(name: string): Promise<void> {
  return screenshotArtifact(page, "jupyter-kernel-free", name);
}

function notebookFile(name: string): string {
  return join(root, "notebooks", name);
}

/**
 * A copy of the saved notebook as someone else's file: a metadata field differs, so no
 * signature of this server covers it (the field names the copy: a copy trusted and saved
 * earlier is signed, and an identical one would be trusted too).
 */
function receivedCopy(name: string): void {
  const nb = JSON.parse(readFileSync(notebookFile(NOTEBOOK), "utf8")) as Notebook & { metadata: Record<string, unknown> };
  nb.metadata.received_as = name;
  writeFileSync(notebookFile(name), JSON.stringify(nb, null, 1));
}

/** The code cells' trust flags of the open notebook. */
async function cellTrust(): Promise<boolean[]> {
  return page.evaluate(() => (globalThis as any).jupyterapp.shell.currentWidget.content.widgets.filter((c: any) => c.model.type === "code").map((c: any) => c.model.trusted as boolean));
}

/** What the open notebook shows of the PNG outputs after its widget outputs. */
async function pngViews(): Promise<PngOutputView[]> {
  const id = await page.evaluate(() => (globalThis as any).jupyterapp.shell.currentWidget.node.id as string);
  return pngOutputViews(page, `[id="${id}"]`, OUTPUT_CHILD);
}

/** A trusted notebook shows the live page only: each widget's page hid its own PNG output. */
async function expectPngOutputsHidden(): Promise<void> {
  await expect
    .poll(async () => (await pngViews()).map((v) => ({ visible: v.visible, hiddenByPage: v.hiddenByPage })), { timeout: APP_TIMEOUT_MS })
    .toEqual(pngOutputs.map(() => ({ visible: false, hiddenByPage: true })));
}

/** Waits until the open notebook shows its widget outputs (booted or not). */
async function waitForWidgetOutputs(): Promise<void> {
  await page.waitForFunction(([selector, n]) => (globalThis as any).jupyterapp?.shell?.currentWidget?.node?.querySelectorAll(selector).length === n, [WIDGET, WIDGETS] as const, {
    timeout: APP_TIMEOUT_MS,
  });
}

/** What an untrusted notebook shows of each widget output, read from the page. */
interface UntrustedView {
  /** The text a reader sees (innerText: hidden elements left out). */
  visibleText: string;
  booted: boolean;
  svgs: number;
  controls: number;
  scripts: number;
}

async function untrustedViews(): Promise<UntrustedView[]> {
  return page.evaluate(
    ([selector, status]) =>
      (Array.from((globalThis as any).jupyterapp.shell.currentWidget.node.querySelectorAll(selector)) as any[]).map((el) => ({
        visibleText: el.innerText as string,
        booted: el.hasAttribute(status),
        svgs: el.querySelectorAll("svg").length as number,
        controls: el.querySelectorAll("input, button, select").length as number,
        scripts: el.parentElement.querySelectorAll("script").length as number,
      })),
    [WIDGET, STATUS_ATTRIBUTE] as const,
  );
}

/**
 * The untrusted notebook's widget outputs: sanitized HTML with no script, no control and no
 * figure inside (JupyterLab's sanitizer drops inline SVG and data: images), and no runtime in
 * the page; the reader sees the safety note, the summary and how to trust, not the SVG's
 * labels, and the figure as the PNG output after each page: the stored PNG at the size its
 * metadata gives.
 */
async function expectUntrustedView(): Promise<void> {
  await waitForWidgetOutputs();
  expect(await cellTrust()).not.toContain(true);
  expect(await page.evaluate(() => typeof (globalThis as any).quietframeRuntime)).toBe("undefined");
  const views = await untrustedViews();
  expect(views).toHaveLength(WIDGETS);
  for (const view of views) {
    expect({ booted: view.booted, svgs: view.svgs, controls: view.controls, scripts: view.scripts }).toEqual({ booted: false, svgs: 0, controls: 0, scripts: 0 });
    expect(view.visibleText).toContain(SAFETY_NOTE_START);
    expect(view.visibleText).toContain(SUMMARY_LABEL);
    expect(view.visibleText).toContain(TRUST_HINT);
    expect(view.visibleText).not.toContain(AXIS_TITLE);
  }
  const pngs = await pngViews();
  expect(pngs).toEqual(
    pngOutputs.map((p) => ({ visible: true, hiddenByPage: false, naturalWidth: p.width, naturalHeight: p.height, width: String(p.metadata.width), height: String(p.metadata.height) })),
  );
  await page.evaluate((selector) => (globalThis as any).jupyterapp.shell.currentWidget.node.querySelector(selector).scrollIntoView(), WIDGET);
}

/** Every widget booted, with the fingerprints tslab computed, and the first one's curves are the engine's. */
async function expectLiveWidgets(): Promise<void> {
  await waitAllReady(page, WIDGETS);
  for (let i = 0; i < WIDGETS; i++) expect(await fingerprintOf(page, i)).toBe(fingerprints[i]);
  await expectPageMatchesEngine(page, 0);
}

/** Moves a control of the widget at `index` in the page; the page replots the engine's numbers for it (no kernel computes). */
async function expectSliderReplots(index: number): Promise<void> {
  const before = await pageState(page, index);
  const target = before.controls[0].target;
  const k = otherPosition(before, target, await sliderPosition(page, index, target));
  await moveSlider(page, index, target, k);
  const { state } = await expectPageMatchesEngine(page, index);
  expect(state.values).toEqual({ ...before.values, [target]: sliderText(before, target, k) });
  expect(state.fingerprint).not.toBe(before.fingerprint);
}

/** Accepts the front-end's "Trust this notebook?" dialog. */
async function acceptTrustDialog(): Promise<void> {
  const dialog = page.locator(".jp-Dialog");
  await dialog.waitFor({ timeout: APP_TIMEOUT_MS });
  await dialog.locator(".jp-Dialog-button.jp-mod-accept").click();
  await dialog.waitFor({ state: "detached", timeout: APP_TIMEOUT_MS });
}

beforeAll(async () => {
  fe = createFrontEndEnv();
  // Plain tslab, registered for the pinned environment's Jupyter as its README says.
  execFileSync(tslabBinary(), ["install", `--python=${fe.python}`, `--binary=${tslabBinary()}`, "--prefix", fe.prefix], { env: fe.env, stdio: ["ignore", "pipe", "pipe"] });
  root = notebookRoot(fe.dir, { [NOTEBOOK]: EXAMPLE });
  server = await startLab(fe, root);
  const origin = server.origin;
  browser = await openBrowser({ allow: (url) => url.startsWith(`${origin}/`) || /^(data|blob):/.test(url) });
  page = browser.page;
}, APP_TIMEOUT_MS);

afterAll(async () => {
  try {
    await browser?.close();
  } finally {
    await server?.stop();
    fe?.dispose();
  }
});

describe("an example notebook run with plain tslab in JupyterLab 4", { timeout: APP_TIMEOUT_MS * 3 }, () => {
  it("runs every cell with the notebook's own kernel, and the widgets come alive in the trusted outputs", async () => {
    await openNotebook(page, server!, `lab/tree/notebooks/${NOTEBOOK}`);
    await page.waitForFunction((name) => (globalThis as any).jupyterapp.shell.currentWidget.sessionContext.session?.kernel?.name === name, TS_KERNEL, { timeout: APP_TIMEOUT_MS });
    expect(await runAll(page)).toEqual([]);
    const outputs = await page.evaluate(() => (globalThis as any).jupyterapp.shell.currentWidget.content.widgets.flatMap((c: any) => (c.model.type === "code" ? c.model.outputs.toJSON() : [])));
    fingerprints = outputs.filter(isWidgetOutput).map(summaryFingerprint);
    expect(fingerprints).toHaveLength(WIDGETS);
    // Each widget's page is followed by its figure: a PNG at one image pixel per chart pixel, named in its text.
    pngOutputs = pngOutputsAfterWidgets(outputs);
    expect(pngOutputs).toHaveLength(WIDGETS);
    for (const p of pngOutputs) {
      expect(p.width).toBeGreaterThan(300);
      expect(p.metadata).toEqual({ width: p.width, height: p.height });
      expect(p.text).toMatch(/^Figure: /);
    }
    expect(await cellTrust()).not.toContain(false);
    await expectLiveWidgets();
    await expectPngOutputsHidden();
    await page.locator(WIDGET).first().scrollIntoViewIfNeeded();
    await screenshot("lab-trusted-live");
  });

  it("a slider moved in the page replots the engine's numbers, with no kernel involved", async () => {
    await expectSliderReplots(0);
  });

  it("saved, the server signs it; reopened, the widgets boot again from the stored outputs", async () => {
    await page.evaluate(() => (globalThis as any).jupyterapp.commands.execute("docmanager:save"));
    await page.waitForFunction(() => (globalThis as any).jupyterapp.shell.currentWidget.context.model.dirty === false, undefined, { timeout: APP_TIMEOUT_MS });
    const saved = JSON.parse(readFileSync(notebookFile(NOTEBOOK), "utf8")) as Notebook;
    expect(outputsOf(saved).filter(isWidgetOutput).map(summaryFingerprint)).toEqual(fingerprints);
    expect(pngOutputsAfterWidgets(outputsOf(saved))).toEqual(pngOutputs);
    // nbformat's notary of the pinned environment, with the server's data dir (its signing key), agrees it is signed.
    const check = await run(
      fe!.python,
      ["-c", "import nbformat, sys; from nbformat.sign import NotebookNotary; print(NotebookNotary().check_signature(nbformat.read(sys.argv[1], as_version=4)))", notebookFile(NOTEBOOK)],
      { env: fe!.env, timeoutMs: 60_000 },
    );
    expect(check.stdout.trim()).toBe("True");
    // A workspace of its own: the page opens this notebook alone, with nothing booted yet.
    await openNotebook(page, server!, `lab/workspaces/reopened/tree/notebooks/${NOTEBOOK}`);
    await expectLiveWidgets();
    await expectPngOutputsHidden();
    expect(await cellTrust()).not.toContain(false);
  });

  it("a copy this server never signed opens untrusted: no script runs; the summary, how to trust and the PNG show, not the figure's loose labels", async () => {
    receivedCopy(RECEIVED_IN_LAB);
    await openNotebook(page, server!, `lab/workspaces/received/tree/notebooks/${RECEIVED_IN_LAB}`);
    await expectUntrustedView();
    await screenshot("lab-untrusted");
    expect(quietframeConsoleErrors()).toEqual([]);
  });

  it("Trust Notebook (from the command palette's command) brings its widgets to life in place and hides their PNG outputs", async () => {
    expect(await page.evaluate(() => (globalThis as any).jupyterapp.commands.label("notebook:trust"))).toBe("Trust Notebook");
    // Not awaited in the page: the command resolves only when the dialog closes.
    await page.evaluate(() => void (globalThis as any).jupyterapp.commands.execute("notebook:trust"));
    await acceptTrustDialog();
    await expectLiveWidgets();
    await expectPngOutputsHidden();
    expect(await cellTrust()).not.toContain(false);
    await page.locator(WIDGET).first().scrollIntoViewIfNeeded();
    await screenshot("lab-trusted-after-trust");
    expect(quietframeConsoleErrors()).toEqual([]);
  });
});

describe("the same notebook in Notebook 7", { timeout: APP_TIMEOUT_MS * 3 }, () => {
  it("opens the signed notebook trusted: the widgets come alive and a slider replots the engine's numbers", async () => {
    await openNotebook(page, server!, `notebooks/notebooks/${NOTEBOOK}`);
    await expectLiveWidgets();
    await expectPngOutputsHidden();
    expect(await cellTrust()).not.toContain(false);
    await expectSliderReplots(1);
    await page.locator(WIDGET).nth(1).scrollIntoViewIfNeeded();
    await screenshot("notebook7-trusted-live");
  });

  it("a copy this server never signed opens untrusted: Not Trusted shows, with the summary, how to trust and the PNG", async () => {
    receivedCopy(RECEIVED_IN_NOTEBOOK7);
    await openNotebook(page, server!, `notebooks/notebooks/${RECEIVED_IN_NOTEBOOK7}`);
    // Notebook 7's trust indicator in the toolbar.
    await expect.poll(() => page.locator(".jp-NotebookTrustedStatus").innerText(), { timeout: APP_TIMEOUT_MS }).toBe("Not Trusted");
    await expectUntrustedView();
    await screenshot("notebook7-untrusted");
    expect(quietframeConsoleErrors()).toEqual([]);
  });

  it("File → Trust Notebook brings its widgets to life in place and hides their PNG outputs", async () => {
    await page.locator(".lm-MenuBar-itemLabel", { hasText: "File" }).first().click();
    await page.locator(".lm-Menu-itemLabel", { hasText: "Trust Notebook" }).click();
    await acceptTrustDialog();
    await expectLiveWidgets();
    await expectPngOutputsHidden();
    expect(await page.locator(".jp-NotebookTrustedStatus").innerText()).toBe("Trusted");
    expect(await cellTrust()).not.toContain(false);
    await page.locator(WIDGET).first().scrollIntoViewIfNeeded();
    await screenshot("notebook7-trusted-after-trust");
    expect(quietframeConsoleErrors()).toEqual([]);
  });
});
