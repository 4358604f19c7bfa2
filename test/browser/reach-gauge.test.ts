import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { SetupDescription } from "../../src/setup/format";
import { parseQuantity } from "../../src/units";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { explorerReach } from "../../widgets/explorer/reach";
import { explorerHtml } from "../../widgets/explorer/html";
import { reachSummary } from "../../widgets/explorer/summary";
import type { ExplorerState } from "../../widgets/explorer/format";
import { actionButton } from "./helpers/actions";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";
import { expectPageMatchesEngine, moveSlider, pageState, sliderPosition, sliderText, waitAllReady, WIDGET } from "./helpers/widgets";

/**
 * The live reach gauge and caution box in Chromium: a strain budget (the long-baseline
 * example) shows range and volume gain against its initial set-up, exactly as Node computes
 * them, and both follow the arm-power slider; a displacement budget shows no gauge. Moving a
 * power slider across 0.5 W turns the Class 4 caution into the Class 3B note and back, and
 * below 5 mW the caution box goes.
 */
const ROOT = join(__dirname, "..", "..");
const example = (name: string): SetupDescription => JSON.parse(readFileSync(join(ROOT, "examples", name), "utf8")) as SetupDescription;

const STRAIN = 0;
const DISPLACEMENT = 1;
/** Class 4 starts above this power (W), where the components raise their caution. */
const HAZARD_W = 0.5;

let dir: string;
let session: BrowserSession;
let strainState: ExplorerState;
let displacementState: ExplorerState;

interface GaugeOnPage {
  hidden: boolean;
  attributes: Record<string, string | null>;
  reachLines: string[];
}

async function gauge(index: number): Promise<GaugeOnPage> {
  return session.page.evaluate(
    ([selector, i]) => {
      const root = (globalThis as any).document.querySelectorAll(selector)[i];
      const g = root.querySelector(".qf-reach-gauge");
      const names = ["data-range-mpc", "data-horizon-mpc", "data-reference-range-mpc", "data-range-ratio", "data-volume-gain"];
      const attributes: Record<string, string | null> = {};
      for (const n of names) attributes[n] = g ? g.getAttribute(n) : null;
      const reachLines = (Array.from(root.querySelectorAll(".qf-readout .qf-reach")) as any[]).map((e) => e.textContent as string);
      return { hidden: !g || g.hidden || g.getBoundingClientRect().height === 0, attributes, reachLines };
    },
    [WIDGET, index] as const,
  );
}

/** What the caution box shows: null when it is hidden, otherwise its items. */
async function cautionsShown(index: number): Promise<string[] | null> {
  const box = session.page.locator(WIDGET).nth(index).locator(".qf-live .qf-caution");
  if (!(await box.isVisible())) return null;
  return box.locator("li").allTextContents();
}

/** The page's state recomputed here: its gauge figures and cautions as Node gives them. */
async function expectGaugeMatchesNode(index: number): Promise<{ state: ExplorerState; rangeRatio: number; cautions: readonly string[] }> {
  const { state, computation } = await expectPageMatchesEngine(session.page, index);
  const reach = explorerReach(state, computation);
  if (!reach?.available || !reach.comparison) throw new Error("Node computes no reach comparison for this state");
  const shown = await gauge(index);
  expect(shown.hidden).toBe(false);
  expect(Number(shown.attributes["data-range-mpc"])).toBe(reach.range.megaparsecs);
  expect(Number(shown.attributes["data-horizon-mpc"])).toBe(reach.horizon.megaparsecs);
  expect(Number(shown.attributes["data-reference-range-mpc"])).toBe(reach.comparison.referenceRange.megaparsecs);
  expect(Number(shown.attributes["data-range-ratio"])).toBe(reach.comparison.rangeRatio);
  expect(Number(shown.attributes["data-volume-gain"])).toBe(reach.comparison.volumeGain);
  const [line] = reachSummary(reach);
  expect(shown.reachLines).toEqual([line.label, line.text]);
  return { state, rangeRatio: reach.comparison.rangeRatio, cautions: computation.evaluation.cautions };
}

/** A slider position whose value is below (or above) the hazard threshold, checked in Node. */
function positionFor(state: ExplorerState, target: string, k: number, hazardous: boolean): number {
  const watts = parseQuantity(sliderText(state, target, k), "power", target);
  expect(watts > HAZARD_W, `${sliderText(state, target, k)} hazardous`).toBe(hazardous);
  return k;
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-reach-"));
  strainState = createExplorerState(example("long-baseline-detector.json"), { controls: [{ target: "ifo.power", label: "arm power", min: "100 mW", max: "1 MW" }] });
  displacementState = createExplorerState(example("free-test-mass.json"), { controls: [{ target: "arm.power", label: "input power", min: "1 mW", max: "3 W" }] });
  const page = [
    "<!DOCTYPE html>",
    `<html lang="en"><head><meta charset="utf-8"><title>reach gauge</title></head><body>`,
    explorerHtml(strainState, computeExplorer(strainState), { includeRuntime: true }),
    explorerHtml(displacementState, computeExplorer(displacementState), { includeRuntime: false }),
    "</body></html>",
  ].join("\n");
  writeFileSync(join(dir, "page.html"), page);
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.goto(pathToFileURL(join(dir, "page.html")).href);
  await waitAllReady(session.page, 2);
});

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("reach gauge in the live widget", () => {
  it("shows the strain budget's range against the initial set-up, as Node computes it", async () => {
    const { state, rangeRatio } = await expectGaugeMatchesNode(STRAIN);
    expect(state.values).toEqual(strainState.values);
    expect(rangeRatio).toBe(1);
    expect((await gauge(STRAIN)).reachLines[1]).toMatch(/^range \d+ Mpc \(×1\.00 range, ×1\.0 volume vs the initial set-up\); horizon \d+ Mpc$/);
  });

  it("shows the 750 kW laser-power caution in its own box, not as an error or a note", async () => {
    const cautions = computeExplorer(strainState).evaluation.cautions;
    expect(cautions).toHaveLength(1);
    expect(await cautionsShown(STRAIN)).toEqual([...cautions]);
    const widget = session.page.locator(WIDGET).nth(STRAIN);
    expect(await widget.locator(".qf-live .qf-caution").textContent()).toMatch(/^Safety caution/);
    expect(await widget.locator(".qf-alert").isHidden()).toBe(true);
    expect(await widget.locator(".qf-notes").textContent()).not.toMatch(/hazardous/);
  });

  it("follows the arm-power slider: below 0.5 W the range shrinks and the Class 4 caution gives way to the Class 3B note, above it comes back", async () => {
    const start = await sliderPosition(session.page, STRAIN, "ifo.power");
    const before = (await gauge(STRAIN)).attributes["data-range-mpc"];
    await moveSlider(session.page, STRAIN, "ifo.power", positionFor(strainState, "ifo.power", 10, false));
    const low = await expectGaugeMatchesNode(STRAIN);
    expect(low.state.values["ifo.power"]).toBe(sliderText(strainState, "ifo.power", 10));
    expect(low.rangeRatio).toBeLessThan(0.5);
    expect((await gauge(STRAIN)).attributes["data-range-mpc"]).not.toBe(before);
    // Below 0.5 W (but above 5 mW) the Class 4 caution gives way to the Class 3B note.
    expect(low.cautions).toHaveLength(1);
    expect(low.cautions[0]).toMatch(/within Class 3B/);
    expect(low.cautions[0]).not.toMatch(/hazardous laser power/);
    expect(await cautionsShown(STRAIN)).toEqual([...low.cautions]);

    await moveSlider(session.page, STRAIN, "ifo.power", positionFor(strainState, "ifo.power", 60, true));
    const high = await expectGaugeMatchesNode(STRAIN);
    expect(high.cautions).toHaveLength(1);
    expect(high.cautions[0]).toMatch(/hazardous laser power/);
    expect(await cautionsShown(STRAIN)).toEqual([...high.cautions]);

    // Reset brings back the initial values, so a ratio of exactly one.
    await actionButton(session.page, STRAIN, "Reset").click();
    await session.page.waitForFunction(([selector, i, fp]) => (globalThis as any).document.querySelectorAll(selector)[i].getAttribute("data-quietframe-fingerprint") === fp, [
      WIDGET,
      STRAIN,
      strainState.fingerprint,
    ] as const);
    expect(await sliderPosition(session.page, STRAIN, "ifo.power")).toBe(start);
    expect((await pageState(session.page, STRAIN)).values).toEqual(strainState.values);
    expect((await expectGaugeMatchesNode(STRAIN)).rangeRatio).toBe(1);
    expect(await cautionsShown(STRAIN)).toEqual([...computeExplorer(strainState).evaluation.cautions]);
  });

  it("a displacement budget shows no gauge, and its power slider turns its caution on and off", async () => {
    const none = await gauge(DISPLACEMENT);
    expect(none.hidden).toBe(true);
    expect(none.reachLines).toEqual([]);
    expect(await session.page.locator(WIDGET).nth(DISPLACEMENT).locator(".qf-readout").textContent()).not.toMatch(/Inspiral|Mpc/);
    // The example's 10 mW input is within Class 3B: the note shows from the start.
    const initial = computeExplorer(displacementState).evaluation.cautions;
    expect(initial).toHaveLength(1);
    expect(initial[0]).toMatch(/within Class 3B/);
    expect(await cautionsShown(DISPLACEMENT)).toEqual([...initial]);

    await moveSlider(session.page, DISPLACEMENT, "arm.power", positionFor(displacementState, "arm.power", 190, true));
    const { computation } = await expectPageMatchesEngine(session.page, DISPLACEMENT);
    expect(computation.evaluation.cautions).toHaveLength(1);
    expect(computation.evaluation.cautions[0]).toMatch(/hazardous laser power/);
    expect(await cautionsShown(DISPLACEMENT)).toEqual([...computation.evaluation.cautions]);
    expect((await gauge(DISPLACEMENT)).hidden).toBe(true);

    await moveSlider(session.page, DISPLACEMENT, "arm.power", positionFor(displacementState, "arm.power", 20, false));
    await expectPageMatchesEngine(session.page, DISPLACEMENT);
    expect(await cautionsShown(DISPLACEMENT)).toBeNull();
  });

  it("logged no console errors and asked for nothing outside the file", () => {
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});
