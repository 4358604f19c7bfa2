import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { basename, join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { RUNTIME_FILE } from "../../widgets/core/page/runtime-source";
import { CHART_MODEL_NAME, LIVE_MODULE } from "../../widgets/explorer/live/names";
import { liveStateSource } from "../../widgets/explorer/live/saved-state";
import { loadExplorerState } from "../../widgets/explorer/document";
import { WIDGET_STATE_MIME } from "../../widgets/core/state/widget-state";
import { REPO_ROOT, SYSTEM_PYTHON } from "../jupyter/env";
import { joined, outputsOf, run, validateWithNbformat, type Notebook, type NotebookOutput, type RunResult } from "../jupyter/notebook-file";
import { createQuietframeKernelEnv, type QuietframeKernelEnv } from "../kernel/kernel-env";

/**
 * The example notebooks, unchanged, executed by Debian's nbconvert with the quietframe kernel
 * instead of plain tslab: explorers become live widgets (the widget-view mime type beside the
 * kernel-free HTML), and nbclient stores their widget state in the notebook's metadata, from
 * which the explorer states load and reproduce their curves.
 */
const NOTEBOOK_DIR = join(REPO_ROOT, "notebooks");
const NOTEBOOKS = readdirSync(NOTEBOOK_DIR)
  .filter((f) => f.endsWith(".ipynb"))
  .sort();
/** Notebooks whose cells build explorers (the widget that has a live form); the others keep their kernel-free widgets. */
const usesExplorer = (name: string): boolean => (JSON.parse(readFileSync(join(NOTEBOOK_DIR, name), "utf8")) as Notebook).cells.some((c) => /\bexplorer\(/.test(joined(c.source)));
const EXECUTE_TIMEOUT_MS = 240_000;
const WIDGET_VIEW_MIME = "application/vnd.jupyter.widget-view+json";

let jupyter: QuietframeKernelEnv;
let outDir: string;

function execute(source: string): Promise<RunResult> {
  return run(
    SYSTEM_PYTHON,
    [
      "-m",
      "nbconvert",
      "--to",
      "notebook",
      "--execute",
      `--ExecutePreprocessor.kernel_name=${jupyter.kernelName}`,
      `--ExecutePreprocessor.timeout=${EXECUTE_TIMEOUT_MS / 1000}`,
      source,
      "--output",
      basename(source),
      "--output-dir",
      outDir,
    ],
    { env: jupyter.env, timeoutMs: EXECUTE_TIMEOUT_MS },
  );
}

function isLiveWidget(o: NotebookOutput): boolean {
  return o.output_type === "display_data" && o.data?.[WIDGET_VIEW_MIME] !== undefined;
}

beforeAll(() => {
  jupyter = createQuietframeKernelEnv();
  outDir = mkdtempSync(join(tmpdir(), "quietframe-live-notebooks-"));
}, 60_000);

afterAll(() => {
  jupyter?.dispose();
  if (outDir) rmSync(outDir, { recursive: true, force: true });
});

describe.each(NOTEBOOKS)("%s with the quietframe kernel", (name) => {
  let result: RunResult;
  let nb: Notebook | undefined;
  const file = (): string => join(outDir, name);

  beforeAll(async () => {
    result = await execute(join(NOTEBOOK_DIR, name));
    if (result.code === 0) nb = JSON.parse(readFileSync(file(), "utf8")) as Notebook;
  }, EXECUTE_TIMEOUT_MS + 10_000);

  it("executes every cell without errors", () => {
    expect(result.code, result.stderr.slice(-4000)).toBe(0);
    const outputs = outputsOf(nb!);
    expect(outputs.filter((o) => o.output_type === "error").map((o) => `${o.ename}: ${o.evalue}`)).toEqual([]);
    const stderr = outputs.filter((o) => o.output_type === "stream" && o.name === "stderr").map((o) => joined(o.text));
    expect(stderr.filter((t) => /error/i.test(t))).toEqual([]);
  });

  it("is a valid notebook according to Debian's nbformat", async () => {
    const v = await validateWithNbformat({ dir: jupyter.dir, env: jupyter.env, kernelSpec: jupyter.kernelSpec, dispose: () => undefined }, file());
    expect(v.stdout.trim(), v.stderr).toBe("valid");
  });

  if (!usesExplorer(name)) {
    it("keeps its kernel-free widgets (no explorer, so no live widget) under the quietframe kernel", () => {
      const outputs = outputsOf(nb!);
      expect(outputs.filter(isLiveWidget)).toEqual([]);
      const runtime = readFileSync(join(REPO_ROOT, RUNTIME_FILE), "utf8");
      // The first widget output carries the browser runtime, as under plain tslab.
      expect(outputs.some((o) => o.output_type === "display_data" && joined(o.data?.["text/html"]).includes(runtime))).toBe(true);
    });
    return;
  }

  it("shows each explorer as a live widget with the kernel-free output beside it", () => {
    const widgets = outputsOf(nb!).filter(isLiveWidget);
    expect(widgets.length).toBeGreaterThanOrEqual(1);
    for (const w of widgets) {
      // Widget message protocol 2.1, "Displaying widgets": model_id plus the protocol's major version.
      expect(w.data![WIDGET_VIEW_MIME]).toMatchObject({ model_id: expect.stringMatching(/^[0-9a-f]{32}$/), version_major: 2 });
      expect(joined(w.data!["text/html"])).toContain('type="application/json"');
      expect(joined(w.data!["text/plain"])).toMatch(/fingerprint: sha256:[0-9a-f]{64}/);
    }
  });

  it("carries the browser runtime in the first live widget's fallback only", () => {
    const runtime = readFileSync(join(REPO_ROOT, RUNTIME_FILE), "utf8");
    const carrying = outputsOf(nb!)
      .filter(isLiveWidget)
      .map((w) => joined(w.data!["text/html"]).includes(runtime));
    expect(carrying[0]).toBe(true);
    expect(carrying.slice(1).every((c) => !c)).toBe(true);
  });

  it("stores the charts' widget state in the metadata; each explorer state reproduces its curves", () => {
    const saved = (nb!.metadata.widgets as Record<string, { state: Record<string, { model_module: string; model_name: string }> }> | undefined)?.[WIDGET_STATE_MIME];
    expect(saved, "metadata.widgets").toBeDefined();
    const charts = Object.values(saved!.state).filter((m) => m.model_module === LIVE_MODULE && m.model_name === CHART_MODEL_NAME);
    expect(charts.length).toBe(outputsOf(nb!).filter(isLiveWidget).length);
    const text = readFileSync(file(), "utf8");
    for (let k = 1; k <= charts.length; k++) {
      const found = liveStateSource(text, name, k);
      const loaded = loadExplorerState(found.value, found.source);
      expect(loaded.fingerprintMatches, found.source).toBe(true);
    }
  });
});
