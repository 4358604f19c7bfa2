import Ajv from "ajv";
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { tableToCsv } from "../../src/engine/tabulate";
import { computeExplorer } from "../../widgets/explorer/model";
import { STATE_SCRIPT_CLASS } from "../../widgets/explorer/names";
import { loadExplorerState, parseExplorerState } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";
import { createJupyterEnv, REPO_ROOT, type JupyterEnv } from "../jupyter/env";
import { executeNotebook, joined, outputsOf, run, type Notebook, type NotebookOutput, type RunResult } from "../jupyter/notebook-file";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { isWidgetOutput, summaryFingerprint } from "./helpers/notebook-widgets";
import { expectPageMatchesEngine, fingerprintOf, pageState, waitAllReady, WIDGET } from "./helpers/widgets";

/**
 * The round trip a paper's reader makes: a state exported from a widget of an executed
 * notebook is rendered by the command line (the built binary, spawned) to a standalone
 * page and a CSV, and the page is opened in headless Chromium from file://. The fingerprint
 * stored with the state, the one the command recomputes, the one the page computes and the
 * one computed here in Node must all be the same, and the CSV must hold exactly the
 * recomputed numbers.
 */
const NOTEBOOK = "free-mass-tradeoff.ipynb";
const EXECUTE_TIMEOUT_MS = 180_000;
const CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");
const MISMATCH = /differ|mismatch/i;

// Outside reference for the exported documents: the Jupyter widget state schema v2.
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

interface Exported {
  /** Where the state came from, for messages. */
  readonly name: string;
  /** The document text exactly as the notebook holds it. */
  readonly text: string;
  /** The fingerprint the kernel showed in the widget's text summary, if it came from a widget. */
  readonly summary?: string;
}

let jupyter: JupyterEnv | undefined;
let dir: string | undefined;
let notebook: Notebook;
let widgetOutputs: NotebookOutput[];
let exported: Exported[] = [];
let browser: BrowserSession | undefined;
let page: Page;

/** The JSON of the state script inside a widget output's HTML. */
function embeddedStateText(o: NotebookOutput): string {
  const html = joined(o.data?.["text/html"]);
  const pattern = new RegExp(`<script type="application/json" class="${STATE_SCRIPT_CLASS}">([\\s\\S]*?)</script>`, "g");
  const found = [...html.matchAll(pattern)].map((m) => m[1]);
  if (found.length !== 1) throw new Error(`expected one state script in the widget output, found ${found.length}`);
  return found[0];
}

/** What the notebook's last code cell printed: the shared state document. */
function printedState(nb: Notebook): string {
  const last = [...nb.cells].reverse().find((c) => c.cell_type === "code");
  if (!last) throw new Error("the notebook has no code cell");
  return (last.outputs ?? [])
    .filter((o) => o.output_type === "stream" && o.name === "stdout")
    .map((o) => joined(o.text))
    .join("");
}

function quietframe(args: string[]): Promise<RunResult> {
  return run(process.execPath, [CLI, ...args], { env: process.env, cwd: dir, timeoutMs: 120_000 });
}

/** The fingerprint in the command's "wrote <file> (<format>, <n> bytes, <fingerprint>)" line. */
function reportedFingerprint(stdout: string, file: string): string {
  const escaped = file.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");
  const m = new RegExp(`^wrote ${escaped} \\((\\w+), (\\d+) bytes, (sha256:[0-9a-f]{64})\\)$`, "m").exec(stdout);
  if (!m) throw new Error(`the command did not report what it wrote: ${JSON.stringify(stdout)}`);
  return m[3];
}

beforeAll(async () => {
  jupyter = createJupyterEnv();
  dir = mkdtempSync(join(tmpdir(), "quietframe-roundtrip-"));
  const executed = await executeNotebook(jupyter, join(REPO_ROOT, "notebooks", NOTEBOOK), dir, EXECUTE_TIMEOUT_MS);
  if (!executed.notebook) {
    throw new Error(`nbconvert could not execute ${NOTEBOOK} (exit ${executed.run.code}):\n${executed.cellErrors ?? executed.run.stderr.slice(-4000)}`);
  }
  notebook = executed.notebook;
  widgetOutputs = outputsOf(notebook).filter(isWidgetOutput);
  exported = [...widgetOutputs.map((o, i) => ({ name: `widget-${i + 1}`, text: embeddedStateText(o), summary: summaryFingerprint(o) })), { name: "printed", text: printedState(notebook) }];
  browser = await openBrowser({ allow: LOCAL_ONLY });
  page = browser.page;
}, EXECUTE_TIMEOUT_MS + 120_000);

afterAll(async () => {
  await browser?.close();
  jupyter?.dispose();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe(`states exported from ${NOTEBOOK}`, { timeout: 120_000 }, () => {
  it("are widget-state documents: one per widget, and the printed one is the last widget's", () => {
    expect(widgetOutputs.length).toBeGreaterThanOrEqual(2);
    expect(exported.length).toBe(widgetOutputs.length + 1);
    for (const e of exported) {
      expect(validateWidgetState(JSON.parse(e.text)), `${e.name}: ${JSON.stringify(validateWidgetState.errors)}`).toBe(true);
      if (e.summary !== undefined) expect(parseExplorerState(e.text, e.name).fingerprint, e.name).toBe(e.summary);
    }
    const printed = parseExplorerState(exported[exported.length - 1].text, "printed");
    expect(printed).toEqual(parseExplorerState(exported[exported.length - 2].text, "last widget"));
    // The two widgets hold different configurations, so the round trips below are distinct.
    expect(new Set(exported.slice(0, -1).map((e) => parseExplorerState(e.text).fingerprint)).size).toBe(widgetOutputs.length);
  });

  // One round trip per exported state; the cases are named after it.
  const cases = ["widget-1", "widget-2", "printed"];
  it.each(cases)("%s: stored == CLI-recomputed == page == Node fingerprint, and the CSV holds the recomputed numbers", async (name) => {
    const e = exported.find((x) => x.name === name);
    if (!e) throw new Error(`the notebook exported no state named ${name} (it has ${exported.map((x) => x.name).join(", ")})`);
    const stateFile = join(dir!, `${name}.json`);
    writeFileSync(stateFile, e.text);
    const stored: ExplorerState = parseExplorerState(e.text, name);
    expect(stored.fingerprint).toMatch(/^sha256:[0-9a-f]{64}$/);

    // The test process: the sources under test, from the file as written.
    const loaded = loadExplorerState(readFileSync(stateFile, "utf8"), name);
    const node = computeExplorer(stored);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.computation.fingerprint).toBe(node.fingerprint);

    // The command line: the built binary, spawned, as a reader runs it.
    const html = await quietframe(["render", `${name}.json`, "-o", `${name}.html`]);
    expect(html.code, html.stderr).toBe(0);
    expect(html.stderr).not.toMatch(MISMATCH);
    const cliFingerprint = reportedFingerprint(html.stdout, `${name}.html`);
    const csv = await quietframe(["render", `${name}.json`, "-o", `${name}.csv`]);
    expect(csv.code, csv.stderr).toBe(0);
    expect(csv.stderr).not.toMatch(MISMATCH);
    expect(reportedFingerprint(csv.stdout, `${name}.csv`)).toBe(cliFingerprint);
    const strict = await quietframe(["render", `${name}.json`, "-o", `${name}.strict.csv`, "--strict"]);
    expect(strict.code, strict.stderr).toBe(0);
    expect(strict.stderr).not.toMatch(MISMATCH);

    // The page: the standalone HTML the command wrote, opened from file://.
    await page.goto(pathToFileURL(join(dir!, `${name}.html`)).href, { waitUntil: "load" });
    await waitAllReady(page, 1);
    const pageFingerprint = await fingerprintOf(page, 0);
    // The page says nothing about a mismatch, and holds the state as exported.
    expect(await page.locator(`${WIDGET} .qf-notice`).isHidden()).toBe(true);
    expect(await pageState(page, 0)).toEqual(stored);
    await expectPageMatchesEngine(page, 0);

    expect({ cli: cliFingerprint, page: pageFingerprint, node: node.fingerprint }).toEqual({ cli: stored.fingerprint, page: stored.fingerprint, node: stored.fingerprint });
    if (e.summary !== undefined) expect(e.summary).toBe(stored.fingerprint);

    const csvText = readFileSync(join(dir!, `${name}.csv`), "utf8");
    expect(csvText.split("\n").length - 2).toBe(stored.settings.grid.points);
    expect(csvText).toBe(tableToCsv(node.table));
    expect(readFileSync(join(dir!, `${name}.strict.csv`), "utf8")).toBe(csvText);
  });

  it("a state whose stored fingerprint is wrong is caught by all three: CLI warning, --strict failure, page notice", async () => {
    const e = exported[0];
    const doc = JSON.parse(e.text) as { state: Record<string, { state: { fingerprint: string } }> };
    const model = Object.values(doc.state)[0];
    const right = model.state.fingerprint;
    const wrong = `sha256:${"0".repeat(64)}`;
    model.state.fingerprint = wrong;
    writeFileSync(join(dir!, "tampered.json"), JSON.stringify(doc, null, 2));
    const warned = await quietframe(["render", "tampered.json", "-o", "tampered.html"]);
    expect(warned.code).toBe(0);
    expect(warned.stderr).toMatch(/warning: the recomputed curves differ/);
    expect(warned.stderr).toContain(wrong);
    expect(warned.stderr).toContain(right);
    const refused = await quietframe(["render", "tampered.json", "-o", "tampered.csv", "--strict"]);
    expect(refused.code).toBe(1);
    expect(refused.stdout).toBe("");
    expect(refused.stderr).toContain(wrong);
    await page.goto(pathToFileURL(join(dir!, "tampered.html")).href, { waitUntil: "load" });
    await waitAllReady(page, 1);
    expect(await fingerprintOf(page, 0)).toBe(right);
    const notice = page.locator(`${WIDGET} .qf-notice`);
    expect(await notice.isVisible()).toBe(true);
    expect(await notice.textContent()).toContain(wrong);
    // Copying confirms in its own line and leaves the warning in place.
    await page.locator(`${WIDGET} button`, { hasText: "Copy state" }).first().click();
    await page.locator(`${WIDGET} .qf-flash`).first().waitFor({ state: "visible", timeout: 30_000 });
    expect(await notice.isVisible()).toBe(true);
    expect(await notice.textContent()).toContain(wrong);
    // What the page holds describes the curves it shows, not the tampered number.
    const held = await page.evaluate(() => (globalThis as any).quietframeRuntime.widgets[0].currentState().fingerprint as string);
    expect(held).toBe(right);
  });

  it("asked for nothing outside the files and logged no console errors", () => {
    expect(browser!.refusedRequests).toEqual([]);
    expect(browser!.consoleErrors).toEqual([]);
  });
});
