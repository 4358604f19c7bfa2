import { copyFileSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { createJupyterEnv, REPO_ROOT, SYSTEM_PYTHON, type JupyterEnv } from "../jupyter/env";
import { joined, outputsOf, run, type Notebook, type NotebookOutput } from "../jupyter/notebook-file";
import { openBrowser, type BrowserSession } from "./helpers/chromium";
import { processesMentioning, startNotebookServer, type NotebookServer } from "./helpers/notebook-server";
import { TRUST_HINT } from "../../widgets/core/page/fallback";
import { isWidgetOutput, pngOutputsAfterWidgets, pngOutputViews, summaryFingerprint, type StoredPngOutput } from "./helpers/notebook-widgets";
import { STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { PAGE_OUTPUT_CLASS } from "../../widgets/core/page/png-output";
import { expectPageMatchesEngine, fingerprintOf, moveSlider, otherPosition, pageState, sliderPosition, sliderText, waitAllReady } from "./helpers/widgets";

/**
 * An example notebook run by a reader in Debian's classic notebook server with the
 * repository's tslab kernel, in Debian's Chromium: every cell runs, the widgets come alive
 * from the live outputs and replot the engine's numbers; saved from the page (which signs
 * it) and reloaded with no kernel allowed, they boot again from the stored outputs alone.
 * Each widget's page hides the PNG output that follows it once live; a copy the server never
 * signed opens untrusted and shows the summary, how to trust and that PNG.
 */
const NOTEBOOK = "cryogenic-membrane.ipynb";
/** Kernel start, all cells (about 10 s on an idle machine) and the widgets' first charts. */
const RUN_TIMEOUT_MS = 180_000;
const JUPYTER_WAIT_MS = 60_000;

let jupyter: JupyterEnv | undefined;
let root: string | undefined;
let server: NotebookServer | undefined;
let browser: BrowserSession | undefined;
let page: Page;
let notebookFile: string;
/** Fingerprints the kernel computed for the widgets, in page order. */
let executedFingerprints: string[] = [];
/** The PNG outputs the kernel sent after the widgets, in page order. */
let pngOutputs: StoredPngOutput[] = [];
/** The classic notebook's element per output, and the notebook's container. */
const OUTPUT_AREA = ".output_area";
const NOTEBOOK_CONTAINER = "#notebook-container";
const RECEIVED = "received-classic.ipynb";
/** An axis title drawn in the explorer's figure (inline SVG in the page, pixels in the PNG). */
const SVG_AXIS_TITLE = "share of term";
const refusedKernelRequests: string[] = [];

/**
 * The classic front end always tries to load the ipywidgets extension, which is not
 * installed here: a 404 and a refused script, whatever the notebook holds.
 */
const FRONT_END_NOISE = /\/nbextensions\/widgets\/notebook\/js\/extension\.js/;
const KERNEL_API = /\/api\/(sessions|kernels)(\/|\?|$)/;
/** How the classic front end reacts to a session it could not start. */
const NO_KERNEL = /Exception in event handler for kernel_dead\.Session/;

function consoleErrorsBut(allowed: RegExp[], from = 0): string[] {
  return browser!.consoleErrors.slice(from).filter((m) => !allowed.some((r) => r.test(m)));
}

interface CellReport {
  index: number;
  type: string;
  source: string;
  outputs: NotebookOutput[];
  running: boolean;
}

async function cells(): Promise<CellReport[]> {
  return page.evaluate(() => {
    const nb = (globalThis as any).Jupyter.notebook;
    return nb.get_cells().map((c: any, index: number) => ({
      index,
      type: c.cell_type,
      source: c.get_text(),
      outputs: c.cell_type === "code" ? c.output_area.outputs : [],
      running: c.element.hasClass("running"),
    }));
  });
}

function problems(report: CellReport[]): string[] {
  return report.flatMap((c) =>
    c.outputs
      .filter((o) => o.output_type === "error" || (o.output_type === "stream" && o.name === "stderr"))
      .map((o) => `cell ${c.index}: ${o.output_type === "error" ? `${o.ename}: ${o.evalue}` : joined(o.text)}`.slice(0, 2000)),
  );
}

/** A trusted notebook shows the live page only: each widget's page hid its own PNG output. */
async function expectPngOutputsHidden(): Promise<void> {
  await expect
    .poll(async () => (await pngOutputViews(page, NOTEBOOK_CONTAINER, OUTPUT_AREA)).map((v) => ({ visible: v.visible, hiddenByPage: v.hiddenByPage })), { timeout: JUPYTER_WAIT_MS })
    .toEqual(pngOutputs.map(() => ({ visible: false, hiddenByPage: true })));
}

async function waitForNotebookPage(): Promise<void> {
  await page.waitForFunction(() => (globalThis as any).Jupyter?.notebook?._fully_loaded === true, undefined, { timeout: JUPYTER_WAIT_MS });
}

beforeAll(async () => {
  jupyter = createJupyterEnv();
  // The notebook imports ../dist/widgets/notebook and reads ../examples: keep both paths valid
  // beside a private copy, so the repository's notebooks folder is never written to.
  root = mkdtempSync(join(tmpdir(), "quietframe-server-"));
  symlinkSync(join(REPO_ROOT, "dist"), join(root, "dist"), "dir");
  symlinkSync(join(REPO_ROOT, "examples"), join(root, "examples"), "dir");
  const notebookDir = join(root, "notebooks");
  mkdirSync(notebookDir);
  notebookFile = join(notebookDir, NOTEBOOK);
  copyFileSync(join(REPO_ROOT, "notebooks", NOTEBOOK), notebookFile);
  server = await startNotebookServer(jupyter, notebookDir);
  const origin = server.origin;
  browser = await openBrowser({ allow: (url) => url.startsWith(`${origin}/`) || /^(data|blob):/.test(url) });
  page = browser.page;
  await page.goto(`${origin}/notebooks/${NOTEBOOK}?token=${server.token}`, { waitUntil: "load" });
  await waitForNotebookPage();
}, 180_000);

afterAll(async () => {
  await browser?.close();
  await server?.stop();
  jupyter?.dispose();
  if (root) rmSync(root, { recursive: true, force: true });
});

describe(`${NOTEBOOK} in the classic notebook server`, { timeout: RUN_TIMEOUT_MS + 60_000 }, () => {
  it("starts the repository's tslab kernel", async () => {
    const implementation = await page.waitForFunction(() => (globalThis as any).Jupyter.notebook.kernel?.info_reply?.implementation, undefined, { timeout: JUPYTER_WAIT_MS });
    expect(await implementation.jsonValue()).toBe("tslab");
    // The kernel runs from the private Jupyter environment: its connection file lives there.
    expect(processesMentioning(jupyter!.env.JUPYTER_RUNTIME_DIR!).length).toBeGreaterThanOrEqual(1);
  });

  it("runs every cell without errors", async () => {
    // tslab sends no execute_input, so prompt numbers are no signal. A cell is done when its
    // execute_reply arrived ("running" class gone) and the kernel went idle after it
    // (finished_execute.CodeCell); execute_all_cells marks every cell running at once.
    await page.evaluate(() => {
      const w = globalThis as any;
      const nb = w.Jupyter.notebook;
      w.__finishedCells = [];
      nb.events.on("finished_execute.CodeCell", (_e: unknown, d: any) => w.__finishedCells.push(nb.find_cell_index(d.cell)));
      nb.execute_all_cells();
    });
    try {
      await page.waitForFunction(
        () => {
          const w = globalThis as any;
          const all = w.Jupyter.notebook.get_cells() as any[];
          const code = all.map((c, i) => ({ c, i })).filter(({ c }) => c.cell_type === "code" && c.get_text().trim() !== "");
          if (code.some(({ c }) => c.output_area.outputs.some((o: any) => o.output_type === "error"))) return "error";
          return code.every(({ c, i }) => !c.element.hasClass("running") && w.__finishedCells.includes(i)) ? "done" : false;
        },
        undefined,
        { timeout: RUN_TIMEOUT_MS, polling: 250 },
      );
    } catch (e) {
      const report = await cells();
      throw new Error(`the cells did not finish: still running ${JSON.stringify(report.filter((c) => c.running).map((c) => c.index))}; ${problems(report).join("\n")}\n${(e as Error).message}`);
    }
    const report = await cells();
    expect(problems(report)).toEqual([]);
    // Every code cell produced something.
    for (const c of report.filter((x) => x.type === "code")) expect(c.outputs.length, c.source.slice(0, 200)).toBeGreaterThan(0);
    const widgets = report.flatMap((c) => c.outputs).filter(isWidgetOutput);
    expect(widgets.length).toBeGreaterThanOrEqual(2);
    executedFingerprints = widgets.map(summaryFingerprint);
    pngOutputs = pngOutputsAfterWidgets(report.flatMap((c) => c.outputs));
    expect(pngOutputs.map((p) => p.metadata)).toEqual(pngOutputs.map((p) => ({ width: p.width, height: p.height })));
  });

  it("shows the widgets live, with the curves the kernel computed, bit for bit the engine's", async () => {
    expect(executedFingerprints.length).toBeGreaterThanOrEqual(2);
    await waitAllReady(page, executedFingerprints.length);
    for (let i = 0; i < executedFingerprints.length; i++) {
      expect(await fingerprintOf(page, i)).toBe(executedFingerprints[i]);
      await expectPageMatchesEngine(page, i);
    }
    await expectPngOutputsHidden();
  });

  it("replots exactly the engine's numbers when a slider of the first widget moves", async () => {
    const before = await pageState(page, 0);
    const target = before.controls[0].target;
    const k = otherPosition(before, target, await sliderPosition(page, 0, target));
    await moveSlider(page, 0, target, k);
    const { state } = await expectPageMatchesEngine(page, 0);
    expect(state.values).toEqual({ ...before.values, [target]: sliderText(before, target, k) });
    expect(state.fingerprint).not.toBe(before.fingerprint);
    expect(await fingerprintOf(page, 1)).toBe(executedFingerprints[1]);
  });

  it("saves from the page into a signed notebook that stores the widgets", async () => {
    await page.evaluate(() => (globalThis as any).Jupyter.notebook.save_notebook());
    expect(await page.evaluate(() => (globalThis as any).Jupyter.notebook.dirty)).toBe(false);
    const saved = JSON.parse(readFileSync(notebookFile, "utf8")) as Notebook;
    expect(outputsOf(saved).filter(isWidgetOutput).map(summaryFingerprint)).toEqual(executedFingerprints);
    expect(pngOutputsAfterWidgets(outputsOf(saved))).toEqual(pngOutputs);
    // Debian's nbformat, with the same private data dir (the signing key), agrees it is signed.
    const check = await run(
      SYSTEM_PYTHON,
      ["-c", "import nbformat, sys; from nbformat.sign import NotebookNotary; print(NotebookNotary().check_signature(nbformat.read(sys.argv[1], as_version=4)))", notebookFile],
      { env: jupyter!.env, timeoutMs: 60_000 },
    );
    expect(check.stderr.trim()).toBe("");
    expect(check.stdout.trim()).toBe("True");
  });

  it("after a reload with no kernel allowed, boots the widgets again from the stored outputs", async () => {
    // Errors so far belong to the live session; none were expected from quietframe.
    expect(consoleErrorsBut([FRONT_END_NOISE])).toEqual([]);
    const errorsBefore = browser!.consoleErrors.length;
    // Later routes win: the reloaded page may not start (or reach) any kernel.
    await page.route(KERNEL_API, (route) => {
      refusedKernelRequests.push(`${route.request().method()} ${route.request().url()}`);
      return route.abort();
    });
    await page.reload({ waitUntil: "load" });
    await waitForNotebookPage();
    expect(await page.evaluate(() => (globalThis as any).Jupyter.notebook.trusted)).toBe(true);
    await waitAllReady(page, executedFingerprints.length);
    for (let i = 0; i < executedFingerprints.length; i++) {
      expect(await fingerprintOf(page, i)).toBe(executedFingerprints[i]);
      await expectPageMatchesEngine(page, i);
    }
    await expectPngOutputsHidden();
    // The page did try to start a kernel and was refused, so nothing came from a kernel.
    expect(refusedKernelRequests.length).toBeGreaterThanOrEqual(1);
    expect(await page.evaluate(() => (globalThis as any).Jupyter.notebook.kernel?.info_reply?.implementation ?? null)).toBeNull();
    // Still live without a kernel.
    const before = await pageState(page, 1);
    const target = before.controls[0].target;
    const k = otherPosition(before, target, await sliderPosition(page, 1, target));
    await moveSlider(page, 1, target, k);
    const { state } = await expectPageMatchesEngine(page, 1);
    expect(state.values).toEqual({ ...before.values, [target]: sliderText(before, target, k) });
    // Only the refused kernel requests may have complained.
    expect(consoleErrorsBut([FRONT_END_NOISE, KERNEL_API, NO_KERNEL], errorsBefore)).toEqual([]);
  });

  it("a copy the server never signed opens untrusted: the summary, how to trust and each widget's PNG output show, no widget boots", async () => {
    // Someone else's file: a metadata field differs, so no signature of this server covers it.
    const nb = JSON.parse(readFileSync(notebookFile, "utf8")) as Notebook;
    nb.metadata.received_as = RECEIVED;
    // Its pages do carry the inline SVG whose labels must not show loose below.
    expect(
      outputsOf(nb)
        .filter(isWidgetOutput)
        .map((o) => joined(o.data?.["text/html"]).includes(SVG_AXIS_TITLE)),
    ).toEqual(pngOutputs.map(() => true));
    writeFileSync(join(root!, "notebooks", RECEIVED), JSON.stringify(nb, null, 1));
    await page.goto(`${server!.origin}/notebooks/${RECEIVED}?token=${server!.token}`, { waitUntil: "load" });
    await waitForNotebookPage();
    expect(await page.evaluate(() => (globalThis as any).Jupyter.notebook.trusted)).toBe(false);
    const views = await pngOutputViews(page, NOTEBOOK_CONTAINER, OUTPUT_AREA);
    expect(views).toEqual(
      pngOutputs.map((p) => ({ visible: true, hiddenByPage: false, naturalWidth: p.width, naturalHeight: p.height, width: String(p.metadata.width), height: String(p.metadata.height) })),
    );
    const pages = await page.evaluate(
      ([container, wrapper, status]) =>
        (Array.from(document.querySelector(container)!.querySelectorAll(wrapper)) as HTMLElement[]).map((o) => ({ text: o.innerText, booted: o.querySelector(`[${status}]`) !== null })),
      [NOTEBOOK_CONTAINER, `.${PAGE_OUTPUT_CLASS}`, STATUS_ATTRIBUTE] as const,
    );
    expect(pages).toHaveLength(pngOutputs.length);
    for (const p of pages) {
      expect(p.booted).toBe(false);
      expect(p.text).toContain(TRUST_HINT);
      // An axis title of the inline SVG: the sanitizer drops the SVG and its style, and its text must not show loose.
      expect(p.text).not.toContain(SVG_AXIS_TITLE);
    }
  });

  it("stopped the server with SIGTERM, and its kernel with it", async () => {
    expect(browser!.refusedRequests).toEqual([]);
    await browser!.close();
    browser = undefined;
    const runtimeDir = jupyter!.env.JUPYTER_RUNTIME_DIR!;
    expect(processesMentioning(runtimeDir).length).toBeGreaterThanOrEqual(1);
    const stopped = await server!.stop();
    expect(stopped.killed).toBe(false);
    expect(server!.exited()).toBe(true);
    // The kernel goes down with the server (bounded wait: it may take a moment to exit).
    const deadline = Date.now() + 20_000;
    while (processesMentioning(runtimeDir).length > 0 && Date.now() < deadline) await new Promise((r) => setTimeout(r, 200));
    expect(processesMentioning(runtimeDir)).toEqual([]);
  });
});
