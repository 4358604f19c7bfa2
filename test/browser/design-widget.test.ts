import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { FigureSpec, SetupDescription } from "../../src/index";
import { loadWidgetState } from "../../widgets/registry";
import { designPage } from "../../widgets/design/html";
import { answerSpecs, curvePoints, gainBars, spreadHistogram } from "../../widgets/design/specs";
import { optimumWidget, rankingWidget, spreadWidget, type NotebookDesign } from "../../widgets/design/notebook";
import type { DesignState, OptimumAnswer, RankingAnswer, SpreadAnswer } from "../../widgets/design/format";
import { DESIGN_CLASS, DESIGN_DRAWN_ATTRIBUTE, DESIGN_PROVISIONAL_ATTRIBUTE } from "../../widgets/design/names";
import { RUN_STATUS_ATTRIBUTE } from "../../widgets/design/browser/page-run";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { WIDGET_WAIT_MS } from "./helpers/widgets";

/**
 * The design widget in Chromium: the page draws the charts of the answer it carries (each
 * chart's data are the rows Node plots, and the fingerprint the page computes over the numbers
 * equals the one Node stored), with no console errors and no request outside the page. A page
 * whose numbers were edited says so; a state the strict reader refuses shows the message and
 * keeps the static figure. "Compute in this page" computes the question again in the page
 * in slices: an optimization draws its best so far after each start, marked provisional, the
 * answer it ends with has Node's fingerprint (same bits in both engines), and Stop ends the run
 * with "stopped after N of M", the saved answer left drawn.
 */
const ROOT = join(__dirname, "..", "..");
const setup = JSON.parse(readFileSync(join(ROOT, "examples", "free-test-mass.json"), "utf8")) as SetupDescription;
const grid = { from: "10 Hz", to: "10 kHz", points: 31 };
const margin: FigureSpec = { kind: "margin-at", frequency: "300 Hz" };
const W = `.${DESIGN_CLASS}`;

let dir: string;
let session: BrowserSession;
let spread: NotebookDesign<SpreadAnswer>;
let ranking: NotebookDesign<RankingAnswer>;
let optimum: NotebookDesign<OptimumAnswer>;

async function open(name: string, state: DesignState): Promise<void> {
  // Through the registry, as `quietframe render` writes a page: the answer is computed again in Node.
  const { loaded } = loadWidgetState(JSON.stringify(state));
  writeFileSync(join(dir, name), designPage(loaded.state as DesignState));
  await session.page.goto(pathToFileURL(join(dir, name)).href);
  await session.page.waitForFunction((sel) => ["ready", "error"].includes((globalThis as any).document.querySelector(sel)?.getAttribute("data-quietframe-status")), W, { timeout: WIDGET_WAIT_MS });
}

/** The data rows of each live chart, as the page's Vega views hold them (every dataset of the chart). */
async function chartRows(): Promise<unknown[][]> {
  const charts = (await session.page.evaluate(() => (globalThis as any).quietframeRuntime.designWidgets[0].plottedData())) as Record<string, unknown[]>[];
  return charts.map((datasets) => Object.values(datasets).flat());
}

beforeAll(async () => {
  spread = spreadWidget(setup, margin, [{ target: "detector.efficiency", value: "95 % ± 2 %" }], { grid, samples: 200, seed: 7, target: "0 dB" });
  ranking = rankingWidget(setup, margin, { grid, parameters: ["arm.power", "detector.efficiency", "mirror.mass"], scanPoints: 7 });
  optimum = optimumWidget(setup, margin, [{ target: "arm.power", min: "1 mW", max: "1 W" }], { grid, starts: 2, seed: 3 });
  dir = mkdtempSync(join(tmpdir(), "quietframe-design-"));
  session = await openBrowser({ allow: LOCAL_ONLY });
});

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("design widget in the browser", () => {
  it("draws the histogram and the noise band of a spread from the state, with Node's fingerprint and no console errors", async () => {
    await open("spread.html", spread.state);
    expect(await session.page.getAttribute(W, "data-quietframe-status")).toBe("ready");
    expect(await session.page.getAttribute(W, DESIGN_DRAWN_ATTRIBUTE)).toBe(spread.fingerprint);
    expect(await session.page.locator(`${W} .qf-charts canvas`).count()).toBe(answerSpecs(spread.result).length);
    expect(answerSpecs(spread.result).length).toBe(2);
    for (const canvas of await session.page.locator(`${W} .qf-charts canvas`).all()) {
      const box = await canvas.boundingBox();
      expect(box && box.width > 200 && box.height > 150).toBe(true);
    }
    expect(await session.page.locator(`${W} .qf-fallback`).isHidden()).toBe(true);
    const methods = await session.page.locator(`${W} .qf-methods p`).textContent();
    expect(methods).toContain("Monte Carlo with 200 samples, seed 7");
    const rows = await chartRows();
    const counts = rows[0].filter((r) => typeof (r as { count?: unknown }).count === "number") as { count: number }[];
    expect(counts.map((r) => r.count)).toEqual(spreadHistogram(spread.result as SpreadAnswer).map((b) => b.count));
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });

  it("draws the ranked gains: one bar per parameter, in rank order", async () => {
    await open("ranking.html", ranking.state);
    expect(await session.page.getAttribute(W, DESIGN_DRAWN_ATTRIBUTE)).toBe(ranking.fingerprint);
    const bars = (await chartRows())[0].filter((r) => typeof (r as { gain?: unknown }).gain === "number") as { target: string; gain: number }[];
    const expected = gainBars(ranking.result as RankingAnswer);
    expect(bars.map((b) => [b.target, b.gain])).toEqual(expected.map((b) => [b.target, b.gain]));
    expect(session.consoleErrors).toEqual([]);
  });

  it("draws the total noise as given and at the optimum", async () => {
    await open("optimum.html", optimum.state);
    expect(await session.page.getAttribute(W, DESIGN_DRAWN_ATTRIBUTE)).toBe(optimum.fingerprint);
    const points = (await chartRows())[0].filter((r) => typeof (r as { psd?: unknown }).psd === "number") as { f: number; curve: string; psd: number }[];
    expect(points.map((p) => [p.f, p.curve, p.psd])).toEqual(curvePoints(optimum.result as OptimumAnswer).map((p) => [p.f, p.curve, p.psd]));
    expect(points.length).toBe(62);
    expect(session.consoleErrors).toEqual([]);
  });

  it("computes the optimum again in the page, with progress and the best so far, and draws Node's answer bit for bit", async () => {
    await open("optimum-run.html", optimum.state);
    expect(await session.page.getAttribute(W, RUN_STATUS_ATTRIBUTE)).toBe("idle");
    // Every provisional label the page sets on the widget, in order.
    await session.page.evaluate(
      ([sel, attr]) => {
        const g = globalThis as any;
        g.provisionalLabels = [];
        new g.MutationObserver(() => {
          const label = g.document.querySelector(sel).getAttribute(attr);
          if (label && g.provisionalLabels[g.provisionalLabels.length - 1] !== label) g.provisionalLabels.push(label);
        }).observe(g.document.querySelector(sel), { attributes: true, attributeFilter: [attr] });
      },
      [W, DESIGN_PROVISIONAL_ATTRIBUTE],
    );
    await session.page.locator(`${W} .qf-run button`, { hasText: "Compute in this page" }).click();
    await session.page.waitForFunction(([sel, attr]) => ["done", "error", "stopped"].includes((globalThis as any).document.querySelector(sel)?.getAttribute(attr)), [W, RUN_STATUS_ATTRIBUTE], {
      timeout: WIDGET_WAIT_MS,
    });
    expect(await session.page.getAttribute(W, RUN_STATUS_ATTRIBUTE)).toBe("done");
    expect(await session.page.getAttribute(W, DESIGN_DRAWN_ATTRIBUTE)).toBe(optimum.fingerprint);
    expect(await session.page.locator(`${W} .qf-run progress`).evaluate((p) => (p as unknown as { value: number }).value)).toBe(1);
    expect(await session.page.evaluate(() => (globalThis as any).provisionalLabels)).toEqual(["best of 1 of 2 starts (provisional)"]);
    expect(await session.page.getAttribute(W, DESIGN_PROVISIONAL_ATTRIBUTE)).toBeNull();
    expect(session.consoleErrors).toEqual([]);
  });

  it("Stop ends a run in the page between two steps; the saved answer stays drawn", async () => {
    const long = spreadWidget(setup, margin, [{ target: "detector.efficiency", value: "95 % ± 2 %" }], { grid, samples: 3000, seed: 7 });
    await open("spread-stop.html", long.state);
    // Started and stopped in one task: the first slice runs, then Stop is heard before the second.
    await session.page.evaluate(async () => {
      const view = (globalThis as any).quietframeRuntime.designWidgets[0];
      const running = view.pageRun.run();
      (globalThis as any).document.querySelectorAll(".qf-run button")[1].click();
      await running;
    });
    expect(await session.page.getAttribute(W, RUN_STATUS_ATTRIBUTE)).toBe("stopped");
    const line = (await session.page.locator(`${W} .qf-run-line`).textContent()) ?? "";
    const [, done] = /^spread stopped after (\d+) of 3000 samples; no result is given for a stopped run; the answer shown is the one saved$/.exec(line) ?? [];
    expect(Number(done)).toBeGreaterThan(0);
    expect(Number(done)).toBeLessThan(3000);
    expect(await session.page.getAttribute(W, DESIGN_DRAWN_ATTRIBUTE)).toBe(long.fingerprint);
    expect(await session.page.locator(`${W} .qf-run button`, { hasText: "Compute in this page" }).isEnabled()).toBe(true);
    expect(session.consoleErrors).toEqual([]);
  });

  it("Stop after a best so far was drawn puts the saved answer back", async () => {
    await open("optimum-stop.html", optimum.state);
    // Stop is clicked as soon as the first best so far is on the page.
    await session.page.evaluate(
      async ([sel, attr]) => {
        const g = globalThis as any;
        const root = g.document.querySelector(sel);
        new g.MutationObserver(() => {
          if (root.getAttribute(attr)) root.querySelectorAll(".qf-run button")[1].click();
        }).observe(root, { attributes: true, attributeFilter: [attr] });
        await g.quietframeRuntime.designWidgets[0].pageRun.run();
      },
      [W, DESIGN_PROVISIONAL_ATTRIBUTE],
    );
    expect(await session.page.getAttribute(W, RUN_STATUS_ATTRIBUTE)).toBe("stopped");
    expect(await session.page.locator(`${W} .qf-run-line`).textContent()).toBe("optimize stopped after 1 of 2 starts; no result is given for a stopped run; the answer shown is the one saved");
    expect(await session.page.getAttribute(W, DESIGN_PROVISIONAL_ATTRIBUTE)).toBeNull();
    expect(await session.page.getAttribute(W, DESIGN_DRAWN_ATTRIBUTE)).toBe(optimum.fingerprint);
    expect(session.consoleErrors).toEqual([]);
  });

  it("says so when the numbers in the page do not match their fingerprint, and still draws them", async () => {
    const state = spread.state;
    const answer = state.answer as SpreadAnswer;
    const edited = { ...state, answer: { ...answer, values: [0.123, ...answer.values.slice(1)] } };
    writeFileSync(join(dir, "edited.html"), designPage(edited));
    await session.page.goto(pathToFileURL(join(dir, "edited.html")).href);
    await session.page.waitForFunction((sel) => (globalThis as any).document.querySelector(sel)?.getAttribute("data-quietframe-status") === "ready", W, { timeout: WIDGET_WAIT_MS });
    expect(await session.page.locator(`${W} .qf-live > .qf-alert`).textContent()).toContain("do not match the fingerprint");
  });

  it("a state the strict reader refuses: the message names the field, the static figure stays", async () => {
    const bad = { ...spread.state, answer: { ...(spread.state.answer as SpreadAnswer), samples: 1 } };
    writeFileSync(join(dir, "bad.html"), designPage(bad as DesignState));
    await session.page.goto(pathToFileURL(join(dir, "bad.html")).href);
    await session.page.waitForFunction((sel) => (globalThis as any).document.querySelector(sel)?.getAttribute("data-quietframe-status") === "error", W, { timeout: WIDGET_WAIT_MS });
    expect(await session.page.locator(`${W} > .qf-alert`).textContent()).toContain("state.answer.samples");
    expect(await session.page.locator(`${W} .qf-fallback`).isVisible()).toBe(true);
  });
});
