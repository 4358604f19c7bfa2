import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { EXPLORER_CLASS } from "../../widgets/explorer/names";
import { RUNTIME_FILE } from "../../widgets/core/page/runtime-source";
import { loadExplorerState } from "../../widgets/explorer/document";
import { isTrajectoryInput, loadTrajectoryState } from "../../widgets/trajectory/document";
import { TRAJECTORY_CLASS } from "../../widgets/trajectory/names";
import { VEGA_LITE_MIME } from "../../widgets/explorer/notebook/chart";
import { createJupyterEnv, REPO_ROOT, type JupyterEnv } from "../jupyter/env";
import { executeNotebook, joined, outputsOf, validateWithNbformat, type ExecutedNotebook, type Notebook, type NotebookOutput } from "../jupyter/notebook-file";

/**
 * Every example notebook is executed by Debian's nbconvert through the repository's tslab
 * kernel, exactly as a user's Jupyter would run it, and the saved result is checked.
 * Kernel start is about 2 s and each notebook a few seconds; the limits leave ample room.
 */
const NOTEBOOK_DIR = join(REPO_ROOT, "notebooks");
const NOTEBOOKS = readdirSync(NOTEBOOK_DIR)
  .filter((f) => f.endsWith(".ipynb"))
  .sort();
const EXECUTE_TIMEOUT_MS = 240_000;

const PNG_SIGNATURE = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);

function isWidget(o: NotebookOutput): boolean {
  const html = joined(o.data?.["text/html"]);
  return o.output_type === "display_data" && (html.includes(`class="${EXPLORER_CLASS}"`) || html.includes(`class="${TRAJECTORY_CLASS}"`));
}

/** A printed state document, explorer or trajectory, recomputed here: its fingerprint and whether it matches. */
function loadPrinted(text: string): { fingerprint: string; fingerprintMatches: boolean } {
  if (isTrajectoryInput(text)) {
    const t = loadTrajectoryState(text, "printed state");
    return { fingerprint: t.state.fingerprint, fingerprintMatches: t.fingerprintMatches };
  }
  const e = loadExplorerState(text, "printed state");
  return { fingerprint: e.state.fingerprint, fingerprintMatches: e.fingerprintMatches };
}

function describeFailure(r: ExecutedNotebook): string {
  return `nbconvert exited with ${r.run.code} after ${r.run.ms} ms\n${r.cellErrors ?? r.run.stderr.slice(-4000)}`;
}

let jupyter: JupyterEnv;
let outDir: string;
const executed = new Map<string, ExecutedNotebook>();

beforeAll(() => {
  jupyter = createJupyterEnv();
  outDir = mkdtempSync(join(tmpdir(), "quietframe-notebooks-"));
}, 60_000);

afterAll(() => {
  jupyter?.dispose();
  if (outDir) rmSync(outDir, { recursive: true, force: true });
});

it("finds the example notebooks", () => {
  expect(NOTEBOOKS).toEqual(expect.arrayContaining(["cryogenic-membrane.ipynb", "free-mass-tradeoff.ipynb"]));
});

it("registers the repository's tslab in the private Jupyter environment only", () => {
  expect(jupyter.kernelSpec.language).toBe("typescript");
  expect(jupyter.kernelSpec.argv[0]).toBe(join(REPO_ROOT, "node_modules", ".bin", "tslab"));
  for (const key of ["JUPYTER_PATH", "JUPYTER_CONFIG_DIR", "JUPYTER_DATA_DIR", "JUPYTER_RUNTIME_DIR"]) {
    expect(jupyter.env[key]?.startsWith(jupyter.dir), key).toBe(true);
  }
});

describe.each(NOTEBOOKS)("%s", (name) => {
  const get = (): ExecutedNotebook & { notebook: Notebook } => {
    const r = executed.get(name);
    if (!r?.notebook) throw new Error(`${name} did not execute; see "executes every cell with the tslab kernel"`);
    return r as ExecutedNotebook & { notebook: Notebook };
  };

  // The runtime file as the kernel will read it (read before, in case dist/ is rebuilt meanwhile).
  let runtime = "";

  beforeAll(async () => {
    runtime = readFileSync(join(REPO_ROOT, RUNTIME_FILE), "utf8");
    executed.set(name, await executeNotebook(jupyter, join(NOTEBOOK_DIR, name), outDir, EXECUTE_TIMEOUT_MS));
  }, EXECUTE_TIMEOUT_MS + 10_000);

  it("executes every cell with the tslab kernel", () => {
    const r = executed.get(name)!;
    expect(r.run.code, describeFailure(r)).toBe(0);
    const nb = get().notebook;
    expect(nb.metadata.kernelspec).toMatchObject({ name: "tslab" });
    // Every code cell produced something: a cell that silently did nothing is suspicious here.
    for (const cell of nb.cells.filter((c) => c.cell_type === "code")) {
      expect(cell.outputs?.length ?? 0, joined(cell.source).slice(0, 200)).toBeGreaterThan(0);
    }
  });

  it("has no error outputs and nothing that looks like an error on stderr", () => {
    const outputs = outputsOf(get().notebook);
    expect(outputs.filter((o) => o.output_type === "error").map((o) => `${o.ename}: ${o.evalue}`)).toEqual([]);
    const stderr = outputs.filter((o) => o.output_type === "stream" && o.name === "stderr").map((o) => joined(o.text));
    expect(stderr.filter((t) => /error/i.test(t))).toEqual([]);
  });

  it("is a valid notebook according to Debian's nbformat", async () => {
    const v = await validateWithNbformat(jupyter, get().file);
    expect(v.stderr.trim()).toBe("");
    expect(v.code).toBe(0);
    expect(v.stdout.trim()).toBe("valid");
  });

  it("shows each live widget as its page (HTML and a text summary) followed by its figure as a PNG output", () => {
    const outputs = outputsOf(get().notebook);
    const widgets = outputs.flatMap((o, i) => (isWidget(o) ? [i] : []));
    expect(widgets.length).toBeGreaterThanOrEqual(1);
    for (const i of widgets) {
      const w = outputs[i];
      expect(Object.keys(w.data!).sort()).toEqual(["text/html", "text/plain"]);
      expect(joined(w.data!["text/plain"])).toMatch(/fingerprint: sha256:[0-9a-f]{64}/);
      expect(joined(w.data!["text/html"])).toContain('type="application/json"');
      const figure = outputs[i + 1];
      expect(figure.output_type).toBe("display_data");
      expect(Object.keys(figure.data!).sort()).toEqual(["image/png", "text/plain"]);
      const png = Buffer.from(joined(figure.data!["image/png"]), "base64");
      expect(png.subarray(0, 8).equals(PNG_SIGNATURE)).toBe(true);
      expect(png.length).toBeGreaterThan(10_000);
      // IHDR's width and height (PNG specification, 11.2.2) are the display size the metadata asks for: scale 1.
      expect(figure.metadata).toEqual({ "image/png": { width: png.readUInt32BE(16), height: png.readUInt32BE(20) } });
    }
  });

  it("carries the browser runtime in the first widget only", () => {
    expect(runtime.length).toBeGreaterThan(10_000);
    const widgets = outputsOf(get().notebook).filter(isWidget);
    const carrying = widgets.map((w) => joined(w.data!["text/html"]).includes(runtime));
    expect(carrying[0]).toBe(true);
    expect(carrying.slice(1).every((c) => !c)).toBe(true);
  });

  it("ends with a shareable state that reproduces the same curves here", () => {
    const nb = get().notebook;
    const last = [...nb.cells].reverse().find((c) => c.cell_type === "code")!;
    const printed = (last.outputs ?? [])
      .filter((o) => o.output_type === "stream" && o.name === "stdout")
      .map((o) => joined(o.text))
      .join("");
    // Recomputed by the TypeScript sources under test, not by the kernel's build.
    const loaded = loadPrinted(printed);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.fingerprint).toMatch(/^sha256:/);
    // The state matches one of the widgets shown in the notebook.
    const shown = outputsOf(nb)
      .filter(isWidget)
      .map((w) => joined(w.data!["text/plain"]));
    expect(shown.some((t) => t.includes(loaded.fingerprint))).toBe(true);
  });
});

describe("static charts in the notebooks", () => {
  it("carry the Vega-Lite spec as a JSON object beside an SVG", () => {
    const charts = [...executed.values()].flatMap((r) => (r.notebook ? outputsOf(r.notebook) : [])).filter((o) => o.data?.[VEGA_LITE_MIME] !== undefined);
    expect(charts.length).toBeGreaterThanOrEqual(1);
    for (const c of charts) {
      const spec = c.data![VEGA_LITE_MIME] as Record<string, unknown>;
      expect(typeof spec).toBe("object");
      expect(String(spec.$schema)).toContain("vega-lite/v5");
      expect(joined(c.data!["image/svg+xml"]).trimStart()).toMatch(/^<svg/);
    }
  });
});

describe("notebooks as committed", () => {
  it.each(NOTEBOOKS)("%s is stored without outputs and names the tslab kernel", (name) => {
    const nb = JSON.parse(readFileSync(join(NOTEBOOK_DIR, name), "utf8")) as { cells: { cell_type: string; outputs?: unknown[] }[]; metadata: { kernelspec?: { name?: string } } };
    expect(nb.metadata.kernelspec?.name).toBe("tslab");
    expect(nb.cells.flatMap((c) => c.outputs ?? [])).toEqual([]);
  });
});

/**
 * The upgrade path's invented classical noise: the notebook's table gives each step's budget terms
 * and range with and without the two classical terms. Classical noise is an independent input, so it
 * adds its own budget term and only adds to the noise PSD: the range with it can be no larger
 * (common practice, no source: the range integral falls as the PSD rises).
 */
describe("upgrade-path.ipynb: invented classical noise beside the quantum noise", () => {
  const NAME = "upgrade-path.ipynb";
  const CLASSICAL_TERMS = ["seismicSuspension", "coatingThermal"];

  beforeAll(async () => {
    // Run on its own when a filter skipped the notebook's block above.
    if (!executed.has(NAME)) executed.set(NAME, await executeNotebook(jupyter, join(NOTEBOOK_DIR, NAME), outDir, EXECUTE_TIMEOUT_MS));
  }, EXECUTE_TIMEOUT_MS + 10_000);

  const markdown = (): string => {
    const nb = executed.get(NAME)?.notebook;
    if (!nb) throw new Error(`${NAME} did not execute`);
    return outputsOf(nb)
      .map((o) => joined(o.data?.["text/markdown"]))
      .join("\n");
  };

  /** The table's rows after the header and rule, as cells. */
  const rows = (): string[][] =>
    markdown()
      .split("\n")
      .filter((l) => l.startsWith("| ") && !l.startsWith("| step |"))
      .map((l) =>
        l
          .slice(1, -1)
          .split("|")
          .map((c) => c.trim()),
      );
  const mpc = (cell: string): number => {
    const m = /^(\d+) Mpc$/.exec(cell);
    if (!m) throw new Error(`not a range in Mpc: ${cell}`);
    return Number(m[1]);
  };

  it("names both classical terms as budget terms of their own", () => {
    const line = markdown()
      .split("\n")
      .find((l) => l.startsWith("Classical terms in every budget"));
    expect(line).toBeDefined();
    // Entered as one test mass's force and displacement (the notebook's own spectra, no hand conversion to strain).
    expect(line).toContain("seismicSuspension: force on each test mass of ifo (classical)");
    expect(line).toContain("coatingThermal: displacement of each test mass of ifo (classical)");
  });

  it("the vacuum reference and the four steps each have exactly two more budget terms with classical noise", () => {
    const table = rows();
    expect(table.map((r) => r[0])).toEqual([
      expect.stringMatching(/^Vacuum/),
      expect.stringMatching(/^Step 1/),
      expect.stringMatching(/^Step 2/),
      expect.stringMatching(/^Step 3/),
      expect.stringMatching(/^Step 4/),
    ]);
    for (const r of table) {
      const [quantum, classical] = r[1].split("/").map((n) => Number(n.trim()));
      expect(quantum, r[0]).toBeGreaterThan(0);
      expect(classical, r[0]).toBe(quantum + CLASSICAL_TERMS.length);
    }
  });

  it("each step's range with classical noise is at most its quantum-only range, and each step names a bottleneck with classical noise", () => {
    for (const r of rows()) {
      expect(mpc(r[3]), r[0]).toBeLessThanOrEqual(mpc(r[2]));
      expect(mpc(r[3]), r[0]).toBeGreaterThan(0);
    }
    for (const r of rows().slice(1)) expect(r[6], r[0]).toMatch(/^[a-zA-Z0-9]+\.[a-zA-Z0-9]+ \((increase|decrease|neither)\)$/);
  });

  it("the shared state is the last step with both classical terms", () => {
    const nb = executed.get(NAME)!.notebook!;
    const last = [...nb.cells].reverse().find((c) => c.cell_type === "code")!;
    const printed = (last.outputs ?? [])
      .filter((o) => o.output_type === "stream" && o.name === "stdout")
      .map((o) => joined(o.text))
      .join("");
    const loaded = loadExplorerState(printed, "printed state");
    expect(loaded.fingerprintMatches).toBe(true);
    expect((loaded.state.setup.classicalNoise ?? []).map((t) => t.name)).toEqual(CLASSICAL_TERMS);
  });
});
