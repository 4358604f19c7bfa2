import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { pathToFileURL } from "node:url";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { FINGERPRINT_ATTRIBUTE, STATUS_ATTRIBUTE } from "../../widgets/core/page/names";
import { htmlDocument } from "../../widgets/core/page/html-document";
import { trajectoryHtml } from "../../widgets/trajectory/html";
import { loadTrajectoryState, trajectoryDocumentText } from "../../widgets/trajectory/document";
import type { TrajectoryState } from "../../widgets/trajectory/format";
import { computeTrajectory, createTrajectoryState } from "../../widgets/trajectory/model";
import { TRAJECTORY_ATTRIBUTES } from "../../widgets/trajectory/names";
import { DATASETS } from "../../widgets/trajectory/specs";
import { REPO_ROOT } from "../jupyter/env";
import { createJupyterEnv, SYSTEM_PYTHON, type JupyterEnv } from "../jupyter/env";
import { executeNotebook, joined, outputsOf, run, type NotebookOutput } from "../jupyter/notebook-file";
import { RUNTIME_FILE } from "../../widgets/core/page/runtime-source";
import { TRAJECTORY_CLASS } from "../../widgets/trajectory/names";
import { hybrid, MEMBRANE_X, P_DIFF, SUM_X } from "../widgets/trajectory/fixtures";
import { LOCAL_ONLY, openBrowser, type BrowserSession } from "./helpers/chromium";

/**
 * The live trajectory widget in headless Chromium: it reruns the simulation from its state in
 * the page with the same model code, to the bit; controls rerun it; a long run shows progress,
 * keeps the page answering and stops on Stop with a partial result whose state replays in Node;
 * bad settings are refused with a message; and a state goes Node → CLI page → Chromium → Node
 * with one fingerprint throughout.
 */
const W = ".quietframe-trajectory";
const WAIT_MS = 90_000;
const CLI = join(REPO_ROOT, "dist", "src", "cli", "main.js");

let dir: string;
let session: BrowserSession;
let state: TrajectoryState;

const fingerprintOf = (s: Omit<TrajectoryState, "fingerprint">): string => computeTrajectory(s).fingerprint;

async function attr(name: string): Promise<string | null> {
  return session.page.locator(W).first().getAttribute(name);
}

async function pageState(): Promise<TrajectoryState> {
  return session.page.evaluate(() => (globalThis as any).quietframeTrajectoryWidgets()[0].currentState());
}

async function plotted(dataset: string): Promise<Record<string, unknown>[]> {
  return session.page.evaluate((name) => (globalThis as any).quietframeTrajectoryWidgets()[0].plotted(name), dataset);
}

/** Waits until the widget shows a finished run with a fingerprint other than `old` (or an error). */
async function waitSettled(old: string | null, status: "ready" | "error" = "ready"): Promise<void> {
  await session.page.waitForFunction(
    ([sel, st, fp, want, old, running]) => {
      const e = (globalThis as any).document.querySelector(sel);
      if (e.getAttribute(st) !== want || e.getAttribute(running) === "true") return false;
      return want === "error" || e.getAttribute(fp) !== old;
    },
    [W, STATUS_ATTRIBUTE, FINGERPRINT_ATTRIBUTE, status, old, TRAJECTORY_ATTRIBUTES.running] as const,
    { timeout: WAIT_MS, polling: 100 },
  );
}

async function typeSetting(key: "duration" | "step" | "seed", text: string): Promise<void> {
  // As a reader's edit ends: the value, then a change event (no wait for animation frames).
  await session.page.locator(`${W} input[data-target="simulation.${key}"]`).evaluate((input: any, value: string) => {
    input.value = value;
    input.dispatchEvent(new Event("change", { bubbles: true }));
  }, text);
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-trajectory-browser-"));
  state = createTrajectoryState(hybrid, {
    controls: [
      { target: "cell.field", label: "bias field", min: "0.31 mT", max: "0.32 mT" },
      { target: "transfer.transmission", label: "transmission", min: "50 %", max: "100 %" },
    ],
    simulation: { duration: "20 us", step: "10 ns", seed: 5, samples: 401, initial: "ground" },
    joint: [SUM_X, P_DIFF, MEMBRANE_X],
    pair: ["membrane", "cell"],
    title: `Membrane <b>and</b> cell`,
  });
  const { fingerprint: _f, ...base } = state;
  const body = trajectoryHtml(state, computeTrajectory(base), { includeRuntime: true });
  writeFileSync(join(dir, "page.html"), htmlDocument("trajectory widget", [body]));
  session = await openBrowser({ allow: LOCAL_ONLY });
  await session.page.goto(pathToFileURL(join(dir, "page.html")).href);
  await waitSettled(null);
}, 120_000);

afterAll(async () => {
  await session?.close();
  if (dir) rmSync(dir, { recursive: true, force: true });
});

describe("trajectory widget in a page", () => {
  it("reruns its state in the page to Node's fingerprint and draws five charts", async () => {
    expect(await attr(FINGERPRINT_ATTRIBUTE)).toBe(state.fingerprint);
    expect(await pageState()).toEqual(state);
    // Estimation error, variances, measurement record, log-negativity, Duan sums.
    expect(await session.page.locator(`${W} .qf-charts canvas`).count()).toBe(5);
    expect(await session.page.locator(`${W} .qf-fallback`).isHidden()).toBe(true);
    expect(await session.page.locator(`${W} .qf-notice`).isHidden()).toBe(true);
    // The band is estimate ± √(conditional variance) of the run Node computes.
    const { fingerprint: _f, ...base } = state;
    const j = computeTrajectory(base).result.joint[0];
    const rows = (await plotted(DATASETS.joint)).filter((r) => r.series === j.label);
    expect(rows.map((r) => r.estimate)).toEqual(Array.from(j.estimate));
    expect(rows.map((r) => r.upper)).toEqual(Array.from(j.estimate, (e, i) => e + Math.sqrt(j.conditional[i])));
  });

  it("a new seed reruns: the plotted data change and match Node's run bit for bit", async () => {
    const before = await plotted(DATASETS.joint);
    const old = await attr(FINGERPRINT_ATTRIBUTE);
    await typeSetting("seed", "6");
    await waitSettled(old);
    const want = { ...state, simulation: { ...state.simulation, seed: 6 } };
    const { fingerprint: _f, ...base } = want;
    const fp = fingerprintOf(base);
    expect(await attr(FINGERPRINT_ATTRIBUTE)).toBe(fp);
    expect(await pageState()).toEqual({ ...want, fingerprint: fp });
    const after = await plotted(DATASETS.joint);
    expect(after.length).toBe(before.length);
    expect(after.map((r) => r.truth)).not.toEqual(before.map((r) => r.truth));
    expect(await session.page.locator(`${W} .qf-alert`).first().isHidden()).toBe(true);
  });

  it("moving a set-up slider reruns with the value the slider writes", async () => {
    const old = await attr(FINGERPRINT_ATTRIBUTE);
    const before = await plotted(DATASETS.variance);
    await session.page.locator(`${W} input[type=range][data-target="transfer.transmission"]`).evaluate((input: any) => {
      input.value = "40";
      input.dispatchEvent(new Event("input", { bubbles: true }));
    });
    await waitSettled(old);
    const shown = await pageState();
    // Linear slider, 200 positions over 50 … 100 %: position 40 is 60 %.
    expect(shown.values["transfer.transmission"]).toBe("60 %");
    const { fingerprint, ...base } = shown;
    expect(fingerprint).toBe(fingerprintOf(base));
    // The conditional variances depend on the transmission (the seed does not enter them).
    const after = await plotted(DATASETS.variance);
    expect(after.map((r) => r.value)).not.toEqual(before.map((r) => r.value));
  });

  it.each([
    ["step", "30 us", /^Not applied: simulation\.step = "30 us": is longer than the duration/],
    ["duration", "-5 us", /^Not applied: simulation\.duration = "-5 us": must be a positive time/],
    ["seed", "1.5", /^Not applied: simulation\.seed = 1\.5: is not a seed/],
  ] as const)("a %s of %s is refused with a message and the last valid run stays", async (key, text, message) => {
    const kept = await pageState();
    await typeSetting(key, text);
    await session.page.waitForTimeout(2000);
    await waitSettled(null, "error");
    expect(await session.page.locator(`${W} .qf-alert`).first().textContent()).toMatch(message);
    expect(await session.page.locator(`${W} input[data-target="simulation.${key}"]`).getAttribute("aria-invalid")).toBe("true");
    expect(await pageState()).toEqual(kept);
    expect(await attr(FINGERPRINT_ATTRIBUTE)).toBe(kept.fingerprint);
    // Put the valid setting back; the same run comes back.
    await typeSetting(key, String(kept.simulation[key]));
    await session.page.waitForFunction(([sel, st]) => (globalThis as any).document.querySelector(sel).getAttribute(st) === "ready", [W, STATUS_ATTRIBUTE] as const, { timeout: WAIT_MS, polling: 100 });
    await waitSettled(null);
    expect(await attr(FINGERPRINT_ATTRIBUTE)).toBe(kept.fingerprint);
  });

  it("a long run shows progress, keeps the page answering, and Stop keeps a partial result that replays in Node", async () => {
    const old = await attr(FINGERPRINT_ATTRIBUTE);
    // 20 µs in steps of 0.05 ns: 400,000 steps, far more than the test waits for.
    await typeSetting("step", "0.05 ns");
    await session.page.waitForFunction(
      ([sel, p, r]) => {
        const e = (globalThis as any).document.querySelector(sel);
        return e.getAttribute(r) === "true" && Number(e.getAttribute(p)) > 0.002;
      },
      [W, TRAJECTORY_ATTRIBUTES.progress, TRAJECTORY_ATTRIBUTES.running] as const,
      { timeout: WAIT_MS, polling: 100 },
    );
    // The page answers between slices: a script runs, and sees the run still going.
    const during = await session.page.evaluate(([sel, r]) => (globalThis as any).document.querySelector(sel).getAttribute(r), [W, TRAJECTORY_ATTRIBUTES.running] as const);
    expect(during).toBe("true");
    const progressText = await session.page.locator(`${W} .qf-run-text`).textContent();
    expect(progressText).toMatch(/% · \d+ of 400000 steps$/);
    await session.page.locator(`${W} button.qf-stop`).click();
    await waitSettled(old);
    expect(await attr(TRAJECTORY_ATTRIBUTES.stopped)).toBe("true");
    const taken = Number(await attr(TRAJECTORY_ATTRIBUTES.stepsTaken));
    expect(taken).toBeGreaterThan(0);
    expect(taken).toBeLessThan(400_000);
    const progress = await attr(TRAJECTORY_ATTRIBUTES.progress);
    expect(Number(progress)).toBe(taken / 400_000);
    // Progress stays where the run stopped.
    await session.page.waitForTimeout(500);
    expect(await attr(TRAJECTORY_ATTRIBUTES.progress)).toBe(progress);
    expect(await attr(TRAJECTORY_ATTRIBUTES.running)).toBe("false");
    const stopped = await pageState();
    expect(stopped.simulation.stoppedAfter).toBe(taken);
    expect(stopped.simulation.step).toBe("0.05 ns");
    // Node replays the stopped run from the state to the same bits.
    const replay = loadTrajectoryState(trajectoryDocumentText(stopped));
    expect(replay.fingerprintMatches).toBe(true);
    expect(replay.computation.result.stepsTaken).toBe(taken);
    expect(replay.computation.result.stopped).toBe(true);
  });

  it("Stop stops even when a field was edited during the run: the edit is not started", async () => {
    const before = await pageState();
    const old = await attr(FINGERPRINT_ATTRIBUTE);
    // A long run (400,000 steps of 0.05 ns), well under way.
    await typeSetting("step", "0.05 ns");
    await session.page.waitForFunction(
      ([sel, p, r]) => {
        const e = (globalThis as any).document.querySelector(sel);
        return e.getAttribute(r) === "true" && Number(e.getAttribute(p)) > 0.001;
      },
      [W, TRAJECTORY_ATTRIBUTES.progress, TRAJECTORY_ATTRIBUTES.running] as const,
      { timeout: WAIT_MS, polling: 50 },
    );
    // The reader types a new seed and presses Stop: leaving the field fires its change event first.
    const seed = session.page.locator(`${W} input[data-target="simulation.seed"]`);
    await seed.fill(String(before.simulation.seed + 1));
    await session.page.locator(`${W} button.qf-stop`).click();
    await waitSettled(old);
    expect(await attr(TRAJECTORY_ATTRIBUTES.stopped)).toBe("true");
    expect(Number(await attr(TRAJECTORY_ATTRIBUTES.stepsTaken))).toBeLessThan(400_000);
    const stopped = await pageState();
    expect(stopped.simulation.seed).toBe(before.simulation.seed);
    expect(await seed.inputValue()).toBe(String(before.simulation.seed));
    // Nothing starts afterwards.
    await session.page.waitForTimeout(500);
    expect(await attr(TRAJECTORY_ATTRIBUTES.running)).toBe("false");
  });

  it("Reset goes back to the state the widget was created with", async () => {
    const old = await attr(FINGERPRINT_ATTRIBUTE);
    await session.page.locator(`${W} .qf-actions button`, { hasText: "Reset" }).click();
    await waitSettled(old);
    expect(await pageState()).toEqual(state);
  });

  it("shows the title as text, never as markup", async () => {
    expect(await session.page.locator(`${W} b`).count()).toBe(0);
    expect(await session.page.locator(`${W} .qf-title`).textContent()).toBe("Membrane <b>and</b> cell");
  });
});

describe("state round trip: Node → command line → page → Node", () => {
  it("one fingerprint throughout", async () => {
    const file = join(dir, "state.json");
    const page = join(dir, "rendered.html");
    writeFileSync(file, trajectoryDocumentText(state));
    const r = await run(process.execPath, [CLI, "render", file, "-o", page], { env: process.env, cwd: dir, timeoutMs: 120_000 });
    expect(r.code, r.stderr).toBe(0);
    expect(r.stdout).toContain(state.fingerprint);
    expect(readFileSync(page, "utf8")).toContain("quietframe-trajectory");
    await session.page.goto(pathToFileURL(page).href);
    await waitSettled(null);
    expect(await attr(FINGERPRINT_ATTRIBUTE)).toBe(state.fingerprint);
    const back = await pageState();
    expect(loadTrajectoryState(trajectoryDocumentText(back)).fingerprintMatches).toBe(true);
  });

  it("logged no console errors and asked for nothing outside the files", () => {
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});

describe("the time-domain notebook, executed by the kernel and exported by nbconvert", () => {
  const NOTEBOOK = "time-domain-reference.ipynb";
  let jupyter: JupyterEnv | undefined;
  let outDir: string | undefined;
  let widgets: NotebookOutput[] = [];
  let html = "";
  let printed = "";
  let runtime = "";

  const kernelFingerprint = (o: NotebookOutput): string => {
    const m = /fingerprint: (sha256:[0-9a-f]{64})/.exec(joined(o.data?.["text/plain"]));
    if (!m) throw new Error("the widget output names no fingerprint");
    return m[1];
  };

  beforeAll(async () => {
    runtime = readFileSync(join(REPO_ROOT, RUNTIME_FILE), "utf8");
    jupyter = createJupyterEnv();
    outDir = mkdtempSync(join(tmpdir(), "quietframe-trajectory-export-"));
    const executed = await executeNotebook(jupyter, join(REPO_ROOT, "notebooks", NOTEBOOK), outDir, 240_000);
    if (!executed.notebook) throw new Error(`nbconvert could not execute ${NOTEBOOK}:\n${executed.cellErrors ?? executed.run.stderr.slice(-4000)}`);
    widgets = outputsOf(executed.notebook).filter((o) => o.output_type === "display_data" && joined(o.data?.["text/html"]).includes(`class="${TRAJECTORY_CLASS}"`));
    const last = [...executed.notebook.cells].reverse().find((c) => c.cell_type === "code")!;
    printed = (last.outputs ?? [])
      .filter((o) => o.output_type === "stream" && o.name === "stdout")
      .map((o) => joined(o.text))
      .join("");
    const exported = await run(SYSTEM_PYTHON, ["-m", "nbconvert", "--to", "html", executed.file, "--output", "export", "--output-dir", outDir], { env: jupyter.env, timeoutMs: 120_000 });
    if (exported.code !== 0) throw new Error(`nbconvert --to html exited with ${exported.code}:\n${exported.stderr.slice(-4000)}`);
    html = readFileSync(join(outDir, "export.html"), "utf8");
    await session.page.goto(pathToFileURL(join(outDir, "export.html")).href, { waitUntil: "load" });
    await session.page.waitForFunction(
      ([sel, st, n]) => {
        const els = Array.from((globalThis as any).document.querySelectorAll(sel)) as any[];
        return els.length === n && els.every((e) => e.getAttribute(st) === "ready");
      },
      [W, STATUS_ATTRIBUTE, widgets.length] as const,
      { timeout: WAIT_MS, polling: 200 },
    );
  }, 600_000);

  afterAll(() => {
    jupyter?.dispose();
    if (outDir) rmSync(outDir, { recursive: true, force: true });
  });

  it("shows two trajectory widgets, the runtime once", () => {
    expect(widgets).toHaveLength(2);
    expect(runtime.length).toBeGreaterThan(10_000);
    expect(html.split(runtime).length - 1).toBe(1);
  });

  it("every widget reruns in Chromium to the fingerprint the kernel computed", async () => {
    const shown = await session.page.locator(W).evaluateAll((els, fp) => els.map((e) => e.getAttribute(fp)), FINGERPRINT_ATTRIBUTE);
    expect(shown).toEqual(widgets.map(kernelFingerprint));
  });

  it("the state the notebook prints reruns here, in Node, to the same bits", () => {
    const loaded = loadTrajectoryState(printed);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.state.fingerprint).toBe(kernelFingerprint(widgets[0]));
  });

  it("logged no console errors and asked for nothing outside the file", () => {
    expect(session.consoleErrors).toEqual([]);
    expect(session.refusedRequests).toEqual([]);
  });
});
