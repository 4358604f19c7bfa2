import Ajv from "ajv";
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import type { Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { tableToCsv } from "../../src/engine/tabulate";
import type { SetupDescription } from "../../src/setup/format";
import { curveRows, type CurveRow } from "../../widgets/explorer/budget-spec";
import { frequencyAxis } from "../../widgets/core/look/layout";
import { computeExplorer, createExplorerState, type ExplorerComputation } from "../../widgets/explorer/model";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { componentKind } from "../../src/components/registry";
import { parseQuantity, siunitxQuantity, unicodeQuantity, type QuantityKind } from "../../src/units";
import { escapeMarkdown } from "../../widgets/explorer/methods/methods";
import { parseExplorerState, stateDocumentText } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";
import { REPO_ROOT } from "../jupyter/env";
import { run } from "../jupyter/notebook-file";
import { actionButton, downloadFrom, pngSize, shownValues, sliderSteps, visibleAlert, type DownloadedFile } from "./helpers/actions";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { expectPageMatchesEngine, fingerprintOf, moveSlider, pageState, plottedRows, sliderPosition, sliderText, waitAllReady, WIDGET, WIDGET_WAIT_MS } from "./helpers/widgets";

/**
 * Every button of a live widget, pressed in headless Chromium on a standalone page that the
 * built CLI rendered from a state file and that is opened from file:// with every other
 * request refused. Each button must produce the real thing: files the browser downloads,
 * the clipboard's content, the reset view; their numbers are checked against the engine
 * run here in Node for the values the controls show at that moment.
 */

// Outside reference for the state documents: the Jupyter widget state schema v2.
const widgetSchemas = require("@jupyter-widgets/schema") as { v2: { state: object } };
const validateWidgetState = new Ajv({ allErrors: true, strict: false }).compile(widgetSchemas.v2.state);

const CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");
const TITLE = "Button check: 100 g mirror";
const STEM = "quietframe-button-check-100-g-mirror";
const POWER = "arm.power";
const EFFICIENCY = "detector.efficiency";
const COUPLING = "arm.inputCoupling";

let dir: string;
let downloads: string;
let initial: ExplorerState;
let initialRows: CurveRow[];
/** The values the controls are set to before the buttons are pressed (computed in Node). */
let moved: Record<string, string | number>;
let expected: ExplorerComputation;
let browser: BrowserSession | undefined;
let page: Page;

function example(name: string): SetupDescription {
  return JSON.parse(readFileSync(join(REPO_ROOT, "examples", name), "utf8")) as SetupDescription;
}

/** The state the widget should hold after the moves, recomputed here. */
function movedState(): ExplorerState {
  return { ...initial, values: moved, fingerprint: expected.fingerprint };
}

async function waitForFingerprint(fingerprint: string): Promise<void> {
  await page.waitForFunction(
    ([selector, fp, attr, status]) => {
      const el = (globalThis as any).document.querySelector(selector);
      return el.getAttribute(status) === "ready" && el.getAttribute(attr) === fp;
    },
    [WIDGET, fingerprint, FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE] as const,
    { timeout: WIDGET_WAIT_MS },
  );
}

/** Types into a number field and commits it (Enter or leaving the field fires `change`). */
async function typeValue(target: string, text: string): Promise<void> {
  const before = await fingerprintOf(page, 0);
  const field = page.locator(`${WIDGET} input[type=text][data-target="${target}"]`);
  await field.fill(text);
  await field.press("Enter");
  await page.waitForFunction(
    ([selector, old, attr, status]) => {
      const el = (globalThis as any).document.querySelector(selector);
      return el.getAttribute(status) === "ready" && el.getAttribute(attr) !== old;
    },
    [WIDGET, before, FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE] as const,
    { timeout: WIDGET_WAIT_MS },
  );
}

let movedOnce: Promise<void> | undefined;

/**
 * Moves two sliders and types a value, once per run (every test that needs the moved
 * controls calls this, so each can also run alone); sets `moved` and `expected`.
 */
function moveControls(): Promise<void> {
  movedOnce ??= (async () => {
    const steps = await sliderSteps(page, 0, POWER);
    const powerAt = Math.round(steps * 0.83);
    const efficiencyAt = Math.round((await sliderSteps(page, 0, EFFICIENCY)) * 0.37);
    expect(powerAt).not.toBe(await sliderPosition(page, 0, POWER));
    expect(efficiencyAt).not.toBe(await sliderPosition(page, 0, EFFICIENCY));
    await moveSlider(page, 0, POWER, powerAt);
    await moveSlider(page, 0, EFFICIENCY, efficiencyAt);
    await typeValue(COUPLING, "90");
    moved = {
      [POWER]: sliderText(initial, POWER, powerAt),
      [EFFICIENCY]: sliderText(initial, EFFICIENCY, efficiencyAt),
      // A bare number is read in the unit beside the field.
      [COUPLING]: "90 %",
    };
    expected = computeExplorer({ ...initial, values: moved });
    expect(expected.fingerprint).not.toBe(initial.fingerprint);
  })();
  return movedOnce;
}

/** Each value must be a string of digits that JavaScript prints back exactly as written. */
function expectShortestRoundTrip(field: string): void {
  const x = Number(field);
  expect(Number.isFinite(x), field).toBe(true);
  expect(String(x), field).toBe(field);
}

/** The fields of one CSV line (RFC 4180 quoting: "a, b" and "" for a quote inside). */
function csvFields(line: string): string[] {
  const fields: string[] = [];
  let i = 0;
  while (i <= line.length) {
    if (line[i] === '"') {
      let value = "";
      i++;
      for (;;) {
        const q = line.indexOf('"', i);
        if (q < 0) throw new Error(`unterminated quoted field in ${line}`);
        value += line.slice(i, q);
        if (line[q + 1] === '"') {
          value += '"';
          i = q + 2;
        } else {
          i = q + 1;
          break;
        }
      }
      fields.push(value);
      if (i < line.length && line[i] !== ",") throw new Error(`text after a quoted field in ${line}`);
      i++;
    } else {
      const comma = line.indexOf(",", i);
      const end = comma < 0 ? line.length : comma;
      fields.push(line.slice(i, end));
      i = end + 1;
    }
  }
  return fields;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-actions-"));
  downloads = join(dir, "downloads");
  mkdirSync(downloads);
  initial = createExplorerState(example("free-test-mass.json"), {
    controls: [
      { target: POWER, label: "input power", min: "1 mW", max: "400 mW" },
      { target: EFFICIENCY, label: "detection efficiency", min: "50 %", max: "100 %" },
      { target: COUPLING, label: "input coupling", control: "number", min: "50 %", max: "100 %" },
    ],
    settings: { grid: { from: "10 Hz", to: "100 kHz", points: 240 }, title: TITLE },
  });
  initialRows = curveRows(computeExplorer(initial).table);
  const stateFile = join(dir, "state.json");
  writeFileSync(stateFile, stateDocumentText(initial));
  // The page as a reader gets it: rendered by the built command.
  const rendered = await run(process.execPath, [CLI, "render", stateFile, "-o", join(dir, "page.html"), "--strict"], { env: process.env, timeoutMs: 120_000 });
  if (rendered.code !== 0) throw new Error(`quietframe render exited with ${rendered.code}:\n${rendered.stderr}`);
  browser = await openBrowser({ allow: LOCAL_ONLY });
  page = browser.page;
  await browser.context.grantPermissions(["clipboard-read", "clipboard-write"]);
  await page.goto(pathToFileURL(join(dir, "page.html")).href, { waitUntil: "load" });
  await waitAllReady(page, 1);
}, 180_000);

afterAll(async () => {
  await browser?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("widget buttons on a standalone page", { timeout: 120_000 }, () => {
  it("boots with the stored state, then follows two slider moves and a typed value", async () => {
    expect(await fingerprintOf(page, 0)).toBe(initial.fingerprint);
    expect(await plottedRows(page, 0)).toEqual(initialRows);
    expect(await shownValues(page, 0)).toEqual({ [POWER]: "10 mW", [EFFICIENCY]: "95 %", [COUPLING]: "0.98" });

    await moveControls();
    expect(await shownValues(page, 0)).toEqual(moved);
    const { state } = await expectPageMatchesEngine(page, 0);
    expect(state.values).toEqual(moved);
    expect(state.fingerprint).toBe(expected.fingerprint);
  });

  it("Download state: a widget-state document with the values the controls show and their fingerprint", async () => {
    await moveControls();
    const file = await downloadFrom(page, actionButton(page, 0, "Download state"), downloads);
    expect(file.suggestedFilename).toBe(`${STEM}.json`);
    const doc = JSON.parse(file.text) as unknown;
    expect(validateWidgetState(doc), JSON.stringify(validateWidgetState.errors)).toBe(true);
    const saved = parseExplorerState(file.text, file.suggestedFilename);
    const shown = await shownValues(page, 0);
    expect(Object.keys(saved.values).sort()).toEqual(Object.keys(shown).sort());
    for (const [target, text] of Object.entries(shown)) expect(String(saved.values[target]), target).toBe(text);
    expect(saved.values).toEqual(moved);
    // Everything but the values and the fingerprint is what the page was created with.
    expect({ ...saved, values: initial.values, fingerprint: initial.fingerprint }).toEqual(initial);
    expect(saved.fingerprint).toBe(computeExplorer(saved).fingerprint);
    expect(saved.fingerprint).toBe(expected.fingerprint);
    expect(saved.fingerprint).toBe(await fingerprintOf(page, 0));
    // Byte for byte the text Node writes for the same state.
    expect(file.text).toBe(stateDocumentText(movedState()));
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("SVG: a well-formed SVG document with both axis titles and their units", async () => {
    await moveControls();
    const file = await downloadFrom(page, actionButton(page, 0, "SVG"), downloads);
    expect(file.suggestedFilename).toBe(`${STEM}.svg`);
    expect(file.text.trimStart()).toMatch(/^<svg[\s>]/);
    // Parsed as XML by the browser: a malformed file yields a <parsererror> document.
    const parsed = await page.evaluate((text) => {
      const d = new (globalThis as any).DOMParser().parseFromString(text, "image/svg+xml");
      return {
        root: d.documentElement.localName as string,
        namespace: d.documentElement.namespaceURI as string | null,
        errors: d.getElementsByTagName("parsererror").length as number,
        texts: (Array.from(d.getElementsByTagName("text")) as any[]).map((t) => t.textContent as string),
        paths: d.getElementsByTagName("path").length as number,
      };
    }, file.text);
    expect(parsed.errors).toBe(0);
    expect(parsed.root).toBe("svg");
    expect(parsed.namespace).toBe("http://www.w3.org/2000/svg");
    // Frequency in the unit of the band (docs/widgets.md, "Visual identity").
    const grid = expected.table.frequencies;
    expect(parsed.texts).toContain(`frequency [${frequencyAxis(grid[0], grid[grid.length - 1]).unit}]`);
    const unit = expected.table.unit;
    expect(unit).toBe("m/√Hz");
    const quantity = expected.evaluation.budget.quantity.name;
    expect(
      parsed.texts.some((t) => t.includes(quantity) && t.endsWith(`[${unit}]`)),
      JSON.stringify(parsed.texts),
    ).toBe(true);
    expect(parsed.texts).toContain(TITLE);
    expect(parsed.paths).toBeGreaterThan(3);
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("PNG: a PNG file with a non-empty image", async () => {
    await moveControls();
    const file = await downloadFrom(page, actionButton(page, 0, "PNG"), downloads);
    expect(file.suggestedFilename).toBe(`${STEM}.png`);
    const { width, height } = pngSize(file.bytes);
    expect(width).toBeGreaterThan(100);
    expect(height).toBeGreaterThan(100);
    expect(file.bytes.length).toBeGreaterThan(5_000);
    expect(file.bytes.subarray(file.bytes.length - 8, file.bytes.length - 4).toString("latin1")).toBe("IEND");
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("CSV: units in the header, one row per grid point, exactly the engine's numbers for the current values", async () => {
    await moveControls();
    const file = await downloadFrom(page, actionButton(page, 0, "CSV"), downloads);
    expect(file.suggestedFilename).toBe(`${STEM}.csv`);
    const lines = file.text.split("\n");
    expect(lines.pop()).toBe("");
    const header = csvFields(lines.shift()!);
    expect(header.slice(0, 2)).toEqual(["frequency [Hz]", "total [m/√Hz]"]);
    expect(header.length).toBe(expected.table.columns.length + 1);
    for (const column of header.slice(1)) expect(column, column).toMatch(/ \[m\/√Hz\]$/);
    expect(header.some((c) => c.startsWith("SQL"))).toBe(true);
    expect(lines.length).toBe(initial.settings.grid.points);
    for (const line of lines) expect(line.split(",").length).toBe(header.length);
    for (const line of [lines[0], lines[1], lines[lines.length >> 1], lines[lines.length - 1]]) line.split(",").forEach(expectShortestRoundTrip);
    // Rows in grid order, starting and ending at the grid's ends.
    expect(Number(lines[0].split(",")[0])).toBe(10);
    expect(Number(lines[lines.length - 1].split(",")[0])).toBeCloseTo(1e5, 6);
    // The whole file, character for character, as Node writes it for the values on screen.
    expect(file.text).toBe(tableToCsv(expected.table));
    expect(file.text).not.toBe(tableToCsv(computeExplorer(initial).table));
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it.each([
    ["Methods (Markdown)", "md", (c: string) => `\`${c}\``, (si: number, kind: QuantityKind) => `= ${escapeMarkdown(unicodeQuantity(si, kind))}`],
    ["Methods (LaTeX)", "tex", (c: string) => `\\texttt{${c}}`, (si: number, kind: QuantityKind) => `= ${siunitxQuantity(si, kind)}`],
  ] as const)("%s: the methods text naming every parameter value and the fingerprint", async (label, extension, code, shown) => {
    await moveControls();
    const file: DownloadedFile = await downloadFrom(page, actionButton(page, 0, label), downloads);
    expect(file.suggestedFilename).toBe(`${STEM}-methods.${extension}`);
    const text = file.text;
    expect(text).toContain(code(expected.fingerprint));
    // Every parameter the model used, at the values on screen, in quietframe's units.
    for (const c of expected.setup.components) {
      for (const p of componentKind(c.type)!.params) {
        const value = c.values[p.name];
        if (typeof value === "number" && p.kind !== "choice") expect(text, `${c.name}.${p.name}`).toContain(shown(value, p.kind));
      }
    }
    // Not the values the page was created with.
    const initialPower = parseQuantity(initial.values[POWER], "power", POWER);
    expect(text).not.toContain(shown(initialPower, "power"));
    expect(text).toContain(`${initial.settings.grid.points} logarithmically spaced frequencies`);
    if (extension === "tex") expect(text).toContain(`\\bibliography{${STEM}-methods}`);
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("Methods (BibTeX): the entries the LaTeX cites, with DOIs", async () => {
    await moveControls();
    const file: DownloadedFile = await downloadFrom(page, actionButton(page, 0, "Methods (BibTeX)"), downloads);
    expect(file.suggestedFilename).toBe(`${STEM}-methods.bib`);
    expect(file.text).toContain("@article{clerk2010,");
    expect(file.text).toContain("doi = {10.1103/RevModPhys.82.1155}");
  });

  it("Copy state: the clipboard (or the fallback text box) holds the same document", async () => {
    await moveControls();
    await actionButton(page, 0, "Copy state").click();
    const want = stateDocumentText(movedState());
    const widget = page.locator(WIDGET).first();
    const fallback = widget.locator("textarea.qf-copy-fallback");
    // Either the notice that it was copied or the text box appears.
    await page.waitForFunction(
      (selector) => {
        const el = (globalThis as any).document.querySelector(selector);
        const flash = el.querySelector(".qf-flash");
        return (flash && !flash.hidden && /copied/.test(flash.textContent)) || el.querySelector("textarea.qf-copy-fallback") !== null;
      },
      WIDGET,
      { timeout: WIDGET_WAIT_MS },
    );
    let copied: string;
    if ((await fallback.count()) > 0) {
      expect(await fallback.isVisible()).toBe(true);
      copied = await fallback.inputValue();
    } else {
      expect(await widget.locator(".qf-flash").textContent()).toBe("State copied to the clipboard.");
      // The confirmation has its own place: it never replaces a notice about the state.
      expect(await widget.locator(".qf-notice").isHidden()).toBe(true);
      copied = await page.evaluate(() => (globalThis as any).navigator.clipboard.readText() as Promise<string>);
    }
    expect(copied).toBe(want);
    expect(validateWidgetState(JSON.parse(copied))).toBe(true);
    expect(parseExplorerState(copied).fingerprint).toBe(expected.fingerprint);
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("Copy state where the clipboard refuses: the same document, selected in a text box", async () => {
    await moveControls();
    // As in a sandboxed output frame: the clipboard API exists but refuses to write.
    await page.evaluate(() => {
      const clipboard = (globalThis as any).navigator.clipboard;
      clipboard.writeText = () => Promise.reject(new DOMException("Write permission denied.", "NotAllowedError"));
    });
    await actionButton(page, 0, "Copy state").click();
    const fallback = page.locator(`${WIDGET} textarea.qf-copy-fallback`);
    await fallback.waitFor({ state: "visible", timeout: WIDGET_WAIT_MS });
    const text = await fallback.inputValue();
    expect(text).toBe(stateDocumentText(movedState()));
    // Selected, so Ctrl+C copies all of it.
    const selection = await fallback.evaluate((area: any) => [area.selectionStart, area.selectionEnd, (globalThis as any).document.activeElement === area]);
    expect(selection).toEqual([0, text.length, true]);
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("Reset: back to the values, fingerprint and plotted rows the widget was created with", async () => {
    await moveControls();
    expect(await fingerprintOf(page, 0)).toBe(expected.fingerprint);
    await actionButton(page, 0, "Reset").click();
    await waitForFingerprint(initial.fingerprint);
    expect(await shownValues(page, 0)).toEqual({ [POWER]: "10 mW", [EFFICIENCY]: "95 %", [COUPLING]: "0.98" });
    const state = await pageState(page, 0);
    expect(state).toEqual(initial);
    expect(await plottedRows(page, 0)).toEqual(initialRows);
    await expectPageMatchesEngine(page, 0);
    // What the buttons save follows the reset.
    const file = await downloadFrom(page, actionButton(page, 0, "Download state"), downloads);
    expect(file.text).toBe(stateDocumentText(initial));
    const csv = await downloadFrom(page, actionButton(page, 0, "CSV"), downloads);
    expect(csv.text).toBe(tableToCsv(computeExplorer(initial).table));
    expect(await visibleAlert(page, 0)).toBeNull();
  });

  it("asked for nothing outside the file and logged no console errors", () => {
    expect(browser!.refusedRequests).toEqual([]);
    expect(browser!.consoleErrors).toEqual([]);
  });
});
