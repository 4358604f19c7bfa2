import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { RUNTIME_FILE } from "../../widgets/core/page/runtime-source";
import { createJupyterEnv, REPO_ROOT, SYSTEM_PYTHON, type JupyterEnv } from "../jupyter/env";
import { executeNotebook, outputsOf, run, type Notebook, type NotebookOutput } from "../jupyter/notebook-file";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { fallbackSvg, isWidgetOutput, occurrences, pngOutputsAfterWidgets, pngOutputViews, summaryFingerprint } from "./helpers/notebook-widgets";
import { expectPageMatchesEngine, fingerprintOf, moveSlider, otherPosition, pageState, sliderPosition, sliderText, waitAllReady, WIDGET } from "./helpers/widgets";

/**
 * An example notebook executed by Debian's nbconvert with the repository's tslab kernel,
 * exported to HTML by Debian's nbconvert, and opened from file:// in Debian's Chromium with
 * every non-file request refused: the widgets must come alive from the exported file alone
 * and plot exactly what the engine computes here in Node.
 */
// This notebook shows two widgets; only the first output carries the runtime.
const NOTEBOOK = "free-mass-tradeoff.ipynb";
const EXECUTE_TIMEOUT_MS = 180_000;
const EXPORT_TIMEOUT_MS = 120_000;

let jupyter: JupyterEnv | undefined;
let outDir: string | undefined;
let runtime = "";
let notebook: Notebook;
let widgetOutputs: NotebookOutput[];
let htmlText = "";
let browser: BrowserSession | undefined;
let page: Page;

beforeAll(
  async () => {
    // The runtime as the kernel will read it (read first, in case dist/ is rebuilt meanwhile).
    runtime = readFileSync(join(REPO_ROOT, RUNTIME_FILE), "utf8");
    jupyter = createJupyterEnv();
    outDir = mkdtempSync(join(tmpdir(), "quietframe-export-"));
    const executed = await executeNotebook(jupyter, join(REPO_ROOT, "notebooks", NOTEBOOK), outDir, EXECUTE_TIMEOUT_MS);
    if (!executed.notebook) {
      throw new Error(`nbconvert could not execute ${NOTEBOOK} (exit ${executed.run.code}):\n${executed.cellErrors ?? executed.run.stderr.slice(-4000)}`);
    }
    notebook = executed.notebook;
    widgetOutputs = outputsOf(notebook).filter(isWidgetOutput);
    const exported = await run(SYSTEM_PYTHON, ["-m", "nbconvert", "--to", "html", executed.file, "--output", "export", "--output-dir", outDir], {
      env: jupyter.env,
      timeoutMs: EXPORT_TIMEOUT_MS,
    });
    if (exported.code !== 0) throw new Error(`nbconvert --to html exited with ${exported.code}:\n${exported.stderr.slice(-4000)}`);
    const htmlFile = join(outDir, "export.html");
    htmlText = readFileSync(htmlFile, "utf8");
    browser = await openBrowser({ allow: LOCAL_ONLY });
    page = browser.page;
    await page.goto(pathToFileURL(htmlFile).href, { waitUntil: "load" });
    await waitAllReady(page, widgetOutputs.length);
  },
  EXECUTE_TIMEOUT_MS + EXPORT_TIMEOUT_MS + 120_000,
);

afterAll(async () => {
  await browser?.close();
  jupyter?.dispose();
  if (outDir) rmSync(outDir, { recursive: true, force: true });
});

describe(`${NOTEBOOK} exported to HTML by nbconvert`, { timeout: 150_000 }, () => {
  it("holds every widget the notebook shows, with the runtime exactly once", () => {
    expect(widgetOutputs.length).toBeGreaterThanOrEqual(2);
    expect(occurrences(htmlText, 'class="quietframe-explorer"')).toBe(widgetOutputs.length);
    expect(runtime.length).toBeGreaterThan(10_000);
    expect(occurrences(htmlText, runtime)).toBe(1);
  });

  it("keeps each widget's inline SVG fallback as the kernel wrote it", async () => {
    for (const o of widgetOutputs) {
      const svg = fallbackSvg(o);
      expect(svg.length).toBeGreaterThan(1000);
      expect(htmlText).toContain(svg);
    }
    // In the page: a drawn figure (paths and text) in every fallback, hidden once the widget is live.
    const fallbacks = await page.evaluate((selector) => {
      return (Array.from((globalThis as any).document.querySelectorAll(selector)) as any[]).map((el) => {
        const fallback = el.querySelector(":scope > .qf-fallback");
        const svg = fallback?.querySelector(":scope > .qf-fallback-svg > svg");
        return { hidden: fallback?.hidden, paths: svg ? svg.querySelectorAll("path").length : -1, texts: svg ? svg.querySelectorAll("text").length : -1 };
      });
    }, WIDGET);
    expect(fallbacks).toHaveLength(widgetOutputs.length);
    for (const f of fallbacks) {
      expect(f.hidden).toBe(true);
      expect(f.paths).toBeGreaterThan(3);
      expect(f.texts).toBeGreaterThan(3);
    }
  });

  it("hides each widget's PNG output once the widget is live (a viewer without scripts shows it instead)", async () => {
    const stored = pngOutputsAfterWidgets(outputsOf(notebook));
    expect(stored).toHaveLength(widgetOutputs.length);
    // nbconvert's template puts each output in a .jp-OutputArea-child, as JupyterLab does.
    const views = await pngOutputViews(page, "body", ".jp-OutputArea-child");
    expect(views).toEqual(
      stored.map((p) => ({ visible: false, hiddenByPage: true, naturalWidth: p.width, naturalHeight: p.height, width: String(p.metadata.width), height: String(p.metadata.height) })),
    );
  });

  it("boots every widget with the curves the kernel computed, bit for bit the engine's", async () => {
    for (let i = 0; i < widgetOutputs.length; i++) {
      expect(await fingerprintOf(page, i)).toBe(summaryFingerprint(widgetOutputs[i]));
      await expectPageMatchesEngine(page, i);
    }
  });

  it("replots exactly the engine's numbers when a slider of the last widget moves", async () => {
    const last = widgetOutputs.length - 1;
    const others = await Promise.all(widgetOutputs.slice(0, last).map((_, i) => fingerprintOf(page, i)));
    const before = await pageState(page, last);
    const target = before.controls[0].target;
    const k = otherPosition(before, target, await sliderPosition(page, last, target));
    await moveSlider(page, last, target, k);
    const { state } = await expectPageMatchesEngine(page, last);
    expect(state.values).toEqual({ ...before.values, [target]: sliderText(before, target, k) });
    expect(state.fingerprint).not.toBe(before.fingerprint);
    // The other widgets did not move.
    expect(await Promise.all(others.map((_, i) => fingerprintOf(page, i)))).toEqual(others);
  });

  it("asked for nothing outside the file and logged no console errors", () => {
    expect(browser!.refusedRequests).toEqual([]);
    expect(browser!.consoleErrors).toEqual([]);
  });
});
