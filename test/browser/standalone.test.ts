import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import type { SetupDescription } from "../../src/setup/format";
import { chartCurves, curveRows, sqlRatioRows, type CurveRow, type RatioRow } from "../../widgets/explorer/budget-spec";
import { curveStyle } from "../../widgets/core/look/encoding";
import { resolveControls, sliderValue, writeValue } from "../../widgets/core/controls/setup-controls";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { headlineSummary } from "../../widgets/explorer/summary";
import { stateDocumentText } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";
import { computeEntangled, loadEntangledState } from "../../widgets/entangled/model";
import { parseTrajectoryState } from "../../widgets/trajectory/document";
import { loadWidgetState } from "../../widgets/registry";

/**
 * A standalone page rendered by the CLI, opened from file:// in Debian's Chromium: the live
 * widget must plot exactly the numbers the engine computes here in Node.
 */
const ROOT = join(__dirname, "..", "..");
const CHROMIUM = process.env.QUIETFRAME_CHROMIUM ?? "/usr/bin/chromium";
const CHROMIUM_ARGS = ["--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run", "--disable-background-networking", "--disable-component-update", "--disable-sync"];

function example(name: string): SetupDescription {
  return JSON.parse(readFileSync(join(ROOT, "examples", name), "utf8")) as SetupDescription;
}

const CONTROLS = [
  { target: "membrane.temperature", min: "10 mK", max: "300 K" },
  { target: "cavity.detuning", min: "-4 MHz", max: "4 MHz", scale: "linear" as const, steps: 80 },
  { target: "detector.efficiency", control: "number" as const, min: 0.5, max: 1 },
];

let dir: string;
let state: ExplorerState;
let context: BrowserContext;
let page: Page;
const consoleErrors: string[] = [];
const outsideRequests: string[] = [];

// The page runs in Chromium; these helpers read it through the runtime's test hooks.
const WIDGET = ".quietframe-explorer";
type PageWidget = { plottedRows(): CurveRow[]; plottedRatio(): RatioRow[]; chartSvg(): Promise<string>; currentState(): ExplorerState };

async function attribute(name: string): Promise<string | null> {
  return page.locator(WIDGET).first().getAttribute(name);
}

async function plottedRows(): Promise<CurveRow[]> {
  return page.evaluate(() => ((globalThis as any).quietframeRuntime.widgets[0] as PageWidget).plottedRows());
}

async function pageState(): Promise<ExplorerState> {
  return page.evaluate(() => ((globalThis as any).quietframeRuntime.widgets[0] as PageWidget).currentState());
}

/** Sets a slider to position k as a reader's drag would, and waits until the widget has handled it. */
async function moveSlider(target: string, k: number, until: "new-fingerprint" | "error" | "ready"): Promise<void> {
  const before = await attribute("data-quietframe-fingerprint");
  await page.locator(`${WIDGET} input[type=range][data-target="${target}"]`).evaluate((input: any, value: number) => {
    input.value = String(value);
    input.dispatchEvent(new Event("input", { bubbles: true }));
  }, k);
  if (until === "error" || until === "ready") await page.waitForSelector(`${WIDGET}[data-quietframe-status="${until}"]`);
  else {
    await page.waitForFunction(
      ([selector, old]) => {
        const el = (globalThis as any).document.querySelector(selector);
        return el.getAttribute("data-quietframe-status") === "ready" && el.getAttribute("data-quietframe-fingerprint") !== old;
      },
      [WIDGET, before] as const,
    );
  }
}

function sliderText(target: string, k: number): string {
  const [c] = resolveControls(
    state.setup,
    state.controls.filter((x) => x.target === target),
  );
  return writeValue(c, sliderValue(c, k));
}

beforeAll(async () => {
  if (!existsSync(CHROMIUM)) throw new Error(`Chromium not found at ${CHROMIUM}: install the Debian package "chromium" (scripts/ensure-system-deps.sh does)`);
  dir = mkdtempSync(join(tmpdir(), "quietframe-browser-"));
  state = createExplorerState(example("cryogenic-membrane-squeezed.json"), { controls: CONTROLS });
  const stateFile = join(dir, "state.json");
  writeFileSync(stateFile, stateDocumentText(state));
  let err = "";
  const code = await runCliAsync(["render", stateFile, "-o", join(dir, "page.html")], { out: () => undefined, err: (s) => (err += s) });
  expect(err).toBe("");
  expect(code).toBe(0);
  context = await chromium.launchPersistentContext(join(dir, "profile"), { executablePath: CHROMIUM, headless: true, args: CHROMIUM_ARGS });
  // Everything the page needs is inline; any request that leaves the file is recorded and refused.
  await context.route("**/*", (route) => {
    const url = route.request().url();
    if (/^(file|data|blob):/.test(url)) return route.continue();
    outsideRequests.push(url);
    return route.abort();
  });
  page = context.pages()[0] ?? (await context.newPage());
  page.on("console", (m) => {
    if (m.type() === "error") consoleErrors.push(m.text());
  });
  page.on("pageerror", (e) => consoleErrors.push(e.message));
  await page.goto(pathToFileURL(join(dir, "page.html")).href);
  await page.waitForSelector(`${WIDGET}[data-quietframe-status="ready"]`);
});

afterAll(async () => {
  await context?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("standalone page in Chromium", () => {
  it("boots from the embedded state and plots the numbers Node computes, bit for bit", async () => {
    expect(await attribute("data-quietframe-fingerprint")).toBe(state.fingerprint);
    expect(await plottedRows()).toEqual(curveRows(computeExplorer(state).table));
    // The static fallback made way for the live view.
    expect(await page.locator(`${WIDGET} .qf-fallback`).isHidden()).toBe(true);
    expect(await page.locator(`${WIDGET} .qf-notice`).isHidden()).toBe(true);
  });

  it("the panel relative to the SQL plots the engine's total ÷ SQL; the key's samples carry each curve's dash", async () => {
    const table = computeExplorer(state).table;
    const ratio = await page.evaluate(() => ((globalThis as any).quietframeRuntime.widgets[0] as PageWidget).plottedRatio());
    expect(ratio.length).toBe(table.frequencies.length);
    expect(ratio).toEqual(sqlRatioRows(table));
    const sql = table.columns.find((c) => c.id === "sql")?.values as Float64Array;
    ratio.forEach((r, i) => expect(r.ratio).toBe(table.columns[0].values[i] / sql[i]));
    // The key as the page draws it (its scenegraph as SVG): a 26 px line sample per curve, in its colour and dash.
    const svg = await page.evaluate(() => ((globalThis as any).quietframeRuntime.widgets[0] as PageWidget).chartSvg());
    const samples = [...svg.matchAll(/<line transform="translate\(0,[\d.]+\)" x2="26" y2="0" stroke="([^"]+)" stroke-width="[^"]+" stroke-dasharray="([^"]+)"\/>/g)].map((m) => [m[1], m[2]]);
    expect(samples).toEqual(chartCurves(table).map((c) => [curveStyle(c.column).colour, curveStyle(c.column).dash.join(",")]));
  });

  it("replots exactly the engine's numbers for a new slider value", async () => {
    const k = 37;
    await moveSlider("membrane.temperature", k, "new-fingerprint");
    const values = { ...state.values, "membrane.temperature": sliderText("membrane.temperature", k) };
    const expected = computeExplorer({ ...state, values });
    expect(expected.fingerprint).not.toBe(state.fingerprint);
    expect(await attribute("data-quietframe-fingerprint")).toBe(expected.fingerprint);
    const rows = await plottedRows();
    const want = curveRows(expected.table);
    expect(rows.length).toBe(want.length);
    for (const i of [0, 1, 400, 2000, want.length - 1]) expect(rows[i]).toEqual(want[i]);
    expect(rows).toEqual(want);
    expect((await pageState()).values).toEqual(values);
    expect(await page.locator(`${WIDGET} output`).first().textContent()).toBe(values["membrane.temperature"]);
    expect(await page.locator(`${WIDGET} .qf-readout`).textContent()).toContain(headlineSummary(expected.headline)[0].text);
  });

  it("shows an unstable set-up as an error and keeps the last valid state and chart", async () => {
    const fingerprint = await attribute("data-quietframe-fingerprint");
    const rows = await plottedRows();
    const valid = await pageState();
    // Position 60 of 80 is +2 MHz: a blue-detuned cavity anti-damps the membrane.
    expect(sliderText("cavity.detuning", 60)).toBe("2 MHz");
    await moveSlider("cavity.detuning", 60, "error");
    const alert = page.locator(`${WIDGET} .qf-alert`);
    expect(await alert.isVisible()).toBe(true);
    expect(await alert.textContent()).toMatch(/unstable.*blue-detuned/);
    expect(await page.locator(`${WIDGET} input[data-target="cavity.detuning"]`).getAttribute("aria-invalid")).toBe("true");
    expect(await attribute("data-quietframe-fingerprint")).toBe(fingerprint);
    expect(await plottedRows()).toEqual(rows);
    expect(await pageState()).toEqual(valid);
    // Back to resonance: the values of the last valid state again, so the same curves.
    await moveSlider("cavity.detuning", 40, "ready");
    expect(await alert.isHidden()).toBe(true);
    const values = { ...valid.values, "cavity.detuning": sliderText("cavity.detuning", 40) };
    expect(await attribute("data-quietframe-fingerprint")).toBe(computeExplorer({ ...state, values }).fingerprint);
  });

  it("refuses a typed value outside the control's range and says why", async () => {
    const fingerprint = await attribute("data-quietframe-fingerprint");
    // A bare number is read in the unit shown beside the field (here %).
    await page.locator(`${WIDGET} input[type=text][data-target="detector.efficiency"]`).fill("20");
    await page.locator(`${WIDGET} input[type=text][data-target="detector.efficiency"]`).dispatchEvent("change");
    await page.waitForSelector(`${WIDGET}[data-quietframe-status="error"]`);
    expect(await page.locator(`${WIDGET} .qf-alert`).textContent()).toMatch(/values\.detector\.efficiency = "20 %": is outside the control's range; allowed: 50 % … 100 %/);
    expect(await attribute("data-quietframe-fingerprint")).toBe(fingerprint);
  });

  it("opens another state pasted into the loader, computed by the same runtime", async () => {
    const other = createExplorerState(example("free-test-mass.json"), { settings: { grid: { from: "10 Hz", to: "10 kHz", points: 300 } } });
    await page.locator(".qf-loader-text").fill(stateDocumentText(other));
    await page.locator(".qf-loader-load").click();
    await page.waitForFunction(([selector, fp]) => (globalThis as any).document.querySelector(selector)?.getAttribute("data-quietframe-fingerprint") === fp, [WIDGET, other.fingerprint] as const);
    expect(await page.locator(WIDGET).count()).toBe(1);
    expect(await plottedRows()).toEqual(curveRows(computeExplorer(other).table));
    // A broken paste is reported in the loader; the widget stays.
    await page.locator(".qf-loader-text").fill('{"format": "quietframe.explorer"');
    await page.locator(".qf-loader-load").click();
    expect(await page.locator(".qf-loader-alert").textContent()).toMatch(/^Not loaded: pasted state/);
    expect(await attribute("data-quietframe-fingerprint")).toBe(other.fingerprint);
  });

  /** The CSV a widget's CSV button saves, as the browser wrote it. */
  async function downloadedCsv(widget: string): Promise<string> {
    const [download] = await Promise.all([page.waitForEvent("download"), page.locator(`${widget} .qf-actions button`, { hasText: /^CSV$/ }).click()]);
    return readFileSync((await download.path()) ?? "", "utf8");
  }

  /** The CSV `quietframe render` writes for a state (its kind's table of the recomputed numbers). */
  function renderedCsv(text: string): string | undefined {
    const { kind, loaded } = loadWidgetState(text, "state.json");
    return kind.figure(loaded).csv;
  }

  it("opens a saved state of another kind in the loader: an entangled-light panel, then a trajectory run", { timeout: 120_000 }, async () => {
    const panelText = readFileSync(join(ROOT, "examples", "states", "entangled-two-beams.json"), "utf8");
    await page.locator(".qf-loader-text").fill(panelText);
    await page.locator(".qf-loader-load").click();
    await page.waitForSelector('.quietframe-entangled[data-quietframe-status="ready"]');
    expect(await page.locator(".qf-loader-alert").isHidden()).toBe(true);
    const panel = computeEntangled(loadEntangledState(panelText));
    expect(await page.locator(".quietframe-entangled").getAttribute("data-duan-sum")).toBe(String(panel.duanSum));
    // The page's CSV is the one `quietframe render` writes for the same state.
    expect(await downloadedCsv(".quietframe-entangled")).toBe(renderedCsv(panelText));
    const runText = readFileSync(join(ROOT, "examples", "states", "trajectory-cryogenic-membrane.json"), "utf8");
    const stored = parseTrajectoryState(runText).fingerprint;
    await page.locator(".qf-loader-text").fill(runText);
    await page.locator(".qf-loader-load").click();
    await page.waitForSelector(`.quietframe-trajectory[data-quietframe-fingerprint="${stored}"]`, { timeout: 110_000 });
    expect(await page.locator(".quietframe-entangled").count()).toBe(0);
    expect(await downloadedCsv(".quietframe-trajectory")).toBe(renderedCsv(runText));
  });

  it("opens a tolerance map and a design answer in the loader; each page's CSV is the one render writes", { timeout: 120_000 }, async () => {
    for (const [file, widget] of [
      ["tolerance-squeezing-efficiency.json", ".quietframe-tolerance"],
      ["design-ranking-free-mass.json", ".quietframe-design"],
    ] as const) {
      const text = readFileSync(join(ROOT, "examples", "states", file), "utf8");
      await page.locator(".qf-loader-text").fill(text);
      await page.locator(".qf-loader-load").click();
      await page.waitForSelector(`${widget}[data-quietframe-status="ready"]`, { timeout: 110_000 });
      expect(await page.locator(".qf-loader-alert").isHidden()).toBe(true);
      expect(await downloadedCsv(widget)).toBe(renderedCsv(text));
    }
  });

  it("logged no console errors and asked for nothing outside the file", () => {
    expect(consoleErrors).toEqual([]);
    expect(outsideRequests).toEqual([]);
  });
});
