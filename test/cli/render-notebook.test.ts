import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { loadWidgetState } from "../../widgets/registry";

/**
 * `quietframe render notebook.ipynb` finds the states of kernel-free widget outputs (the JSON
 * script element in each output's HTML) as well as live charts, in notebook order; --widget N
 * picks one, and a notebook holding several without --widget gets an error listing them. The
 * notebook follows nbformat 4 (multi-line strings stored as arrays of lines).
 */
const STATES = join(__dirname, "..", "..", "examples", "states");
const stateFile = (prefix: string): string => join(STATES, readdirSync(STATES).find((f) => f.startsWith(prefix))!);

async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

/** A display_data output holding the kernel-free fragment of the state in `file`. */
function widgetOutput(file: string): Record<string, unknown> {
  const { kind, loaded } = loadWidgetState(readFileSync(file, "utf8"), file);
  const html = kind.fragment(loaded, {});
  return { output_type: "display_data", data: { "text/html": html.split(/(?<=\n)/), "text/plain": [`${kind.name}`] }, metadata: {} };
}

function notebook(cells: Record<string, unknown>[][]): string {
  return JSON.stringify({
    cells: cells.map((outputs) => ({ cell_type: "code", execution_count: 1, metadata: {}, source: ["// shown"], outputs })),
    metadata: {},
    nbformat: 4,
    nbformat_minor: 5,
  });
}

let dir: string;
let mixed: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-render-notebook-"));
  mixed = join(dir, "mixed.ipynb");
  const text = { output_type: "stream", name: "stdout", text: ["no widget here\n"] };
  writeFileSync(mixed, notebook([[text], [widgetOutput(stateFile("explorer"))], [text, widgetOutput(stateFile("tolerance"))], [widgetOutput(stateFile("trajectory"))]]));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("quietframe render <notebook.ipynb> with kernel-free widget outputs", () => {
  it("lists what it found when several widgets and no --widget are given", async () => {
    const r = await cli("render", mixed, "-o", join(dir, "x.html"));
    expect(r.code).toBe(1);
    expect(r.out).toBe("");
    expect(r.err).toContain("holds 3 quietframe widgets (1: cell 2, output 1: explorer output; 2: cell 3, output 2: tolerance output; 3: cell 4, output 1: trajectory output)");
    expect(r.err).toContain("--widget 1 to 3");
  });

  it.each([
    [1, "explorer"],
    [3, "trajectory"],
  ])("--widget %i gives the same CSV as the %s state file itself, with --strict", async (n, prefix) => {
    const fromNotebook = join(dir, `nb-${n}.csv`);
    const fromFile = join(dir, `file-${n}.csv`);
    const a = await cli("render", mixed, "--widget", String(n), "-o", fromNotebook, "--strict");
    expect(a.err).not.toMatch(/warning|quietframe:/);
    expect(a.code).toBe(0);
    expect((await cli("render", stateFile(prefix), "-o", fromFile, "--strict")).code).toBe(0);
    expect(readFileSync(fromNotebook, "utf8")).toBe(readFileSync(fromFile, "utf8"));
  });

  it("--widget 2 renders the tolerance map's page", async () => {
    const page = join(dir, "map.html");
    const r = await cli("render", mixed, "--widget", "2", "-o", page);
    expect(r.code).toBe(0);
    expect(readFileSync(page, "utf8")).toContain("quietframe-tolerance");
  });

  it("a number out of range names the widgets found", async () => {
    const r = await cli("render", mixed, "--widget", "4", "-o", join(dir, "x.html"));
    expect(r.code).toBe(1);
    expect(r.err).toContain("--widget = 4: is not the number of a widget in mixed.ipynb (1: cell 2");
    expect(r.err).toContain("allowed: 1 to 3");
  });

  it("a notebook with one widget output needs no --widget; one with none says so", async () => {
    const one = join(dir, "one.ipynb");
    writeFileSync(one, notebook([[widgetOutput(stateFile("entangled"))]]));
    expect((await cli("render", one, "-o", join(dir, "one.html"), "--strict")).code).toBe(0);
    const none = join(dir, "none.ipynb");
    writeFileSync(none, notebook([[{ output_type: "stream", name: "stdout", text: ["hello\n"] }]]));
    const r = await cli("render", none, "-o", join(dir, "none.html"));
    expect(r.code).toBe(1);
    expect(r.err).toContain("none.ipynb: holds no quietframe widget");
  });
});
