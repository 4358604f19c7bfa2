import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readFileSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { tableToCsv } from "../../src/engine/tabulate";
import type { SetupDescription } from "../../src/setup/format";
import { computeExplorer, createExplorerState } from "../../widgets/explorer/model";
import { loadExplorerState, stateDocumentText } from "../../widgets/explorer/document";
import type { ExplorerState } from "../../widgets/explorer/format";

const ROOT = join(__dirname, "..", "..");
const EXAMPLE = join(ROOT, "examples", "cryogenic-membrane-squeezed.json");
const BUILT_CLI = join(ROOT, "dist", "src", "cli", "main.js");

async function cli(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

let dir: string;
let state: ExplorerState;
let stateFile: string;

function fresh(name: string): string {
  return join(dir, name);
}

function write(name: string, text: string): string {
  const path = fresh(name);
  writeFileSync(path, text);
  return path;
}

/** The widget-state JSON embedded in an HTML output. */
function embeddedState(html: string): string {
  const m = /<script type="application\/json" class="quietframe-state">([\s\S]*?)<\/script>/.exec(html);
  expect(m).not.toBeNull();
  return m![1];
}

beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-render-"));
  const setup = JSON.parse(readFileSync(EXAMPLE, "utf8")) as SetupDescription;
  state = createExplorerState(setup, {
    controls: [
      { target: "membrane.temperature", min: "10 mK", max: "300 K" },
      { target: "cavity.detuning", min: "-4 MHz", max: "4 MHz", scale: "linear" },
    ],
    settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 301 } },
  });
  state = { ...state, values: { ...state.values, "membrane.temperature": "2.5 K" } };
  state = { ...state, fingerprint: computeExplorer(state).fingerprint };
  stateFile = write("state.json", stateDocumentText(state));
});

afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

describe("quietframe render", () => {
  it("writes a standalone page whose embedded state recomputes to the stored fingerprint, bit for bit", async () => {
    const out = fresh("page.html");
    const r = await cli("render", stateFile, "-o", out);
    // The state's 2.5 K membrane is cryogenic: its caution is the only line on stderr.
    expect(r).toMatchObject({ code: 0 });
    expect(r.err).toMatch(/^caution: 'membrane' is at 2\.5 K, at or below 4\.2 K [^\n]*licensed practice\.\n$/);
    expect(r.out).toContain(state.fingerprint);
    const html = readFileSync(out, "utf8");
    expect(html.startsWith("<!DOCTYPE html>")).toBe(true);
    const loaded = loadExplorerState(embeddedState(html), "page");
    expect(loaded.state).toEqual(state);
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.computation.fingerprint).toBe(state.fingerprint);
    expect(html).toContain("<svg");
    expect(html).toContain("data:image/png;base64,");
  });

  it("writes the plotted numbers as CSV, exactly as the model tabulates them", async () => {
    const out = fresh("curves.csv");
    expect((await cli("render", stateFile, "-o", out)).code).toBe(0);
    expect(readFileSync(out, "utf8")).toBe(tableToCsv(computeExplorer(state).table));
  });

  it("writes SVG and PNG charts; --format overrides the extension", async () => {
    const svg = fresh("chart.svg");
    expect((await cli("render", stateFile, "-o", svg)).code).toBe(0);
    const svgText = readFileSync(svg, "utf8");
    expect(svgText.startsWith("<svg")).toBe(true);
    expect(svgText).toContain("frequency [Hz]");
    const png = fresh("chart.bin");
    expect((await cli("render", stateFile, "-o", png, "--format", "png", "--scale", "1")).code).toBe(0);
    const bytes = readFileSync(png);
    expect(bytes.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
    // IHDR width at scale 1 equals the SVG's width attribute.
    const width = Number(/<svg[^>]*\swidth="(\d+)"/.exec(svgText)![1]);
    expect(bytes.readUInt32BE(16)).toBe(width);
  });

  it("warns when the stored fingerprint differs, and --strict refuses without writing", async () => {
    const other = { ...state, fingerprint: `sha256:${"0".repeat(64)}` };
    const file = write("stale.json", stateDocumentText(other));
    const out = fresh("stale.csv");
    const r = await cli("render", file, "-o", out);
    expect(r.code).toBe(0);
    expect(r.err).toMatch(/^warning: the recomputed curves differ from the ones stored in .*stale\.json \(stored sha256:0{64}/);
    expect(existsSync(out)).toBe(true);
    const strictOut = fresh("strict.csv");
    const s = await cli("render", file, "-o", strictOut, "--strict");
    expect(s.code).toBe(1);
    expect(s.out).toBe("");
    expect(s.err).toMatch(/differ/);
    expect(existsSync(strictOut)).toBe(false);
  });

  it.each([
    // Built when the test runs: the state exists only after beforeAll.
    ["not JSON", (): string => "{ nope"],
    ["not a state", (): string => JSON.stringify({ hello: 1 })],
    ["a value outside its control", (): string => stateDocumentText({ ...state, values: { ...state.values, "membrane.temperature": "900 K" } })],
    ["an unstable set-up (blue detuning)", (): string => stateDocumentText({ ...state, values: { ...state.values, "cavity.detuning": "2 MHz" } })],
  ] as const)("exits 1 without output for %s", async (_name, text) => {
    const file = write(`bad-${readdirSync(dir).length}.json`, text());
    for (const ext of ["html", "csv"]) {
      const out = fresh(`bad-output.${ext}`);
      const r = await cli("render", file, "-o", out);
      expect(r.code).toBe(1);
      expect(r.out).toBe("");
      expect(r.err).toMatch(/^quietframe: /);
      expect(existsSync(out)).toBe(false);
    }
    // No temporary files are left behind either.
    expect(readdirSync(dir).filter((f) => f.includes(".tmp"))).toEqual([]);
  });

  it("names the problem with its path in the file", async () => {
    const file = write("hot.json", stateDocumentText({ ...state, values: { ...state.values, "membrane.temperature": "900 K" } }));
    const r = await cli("render", file, "-o", fresh("hot.csv"));
    expect(r.err).toMatch(/values\.membrane\.temperature = "900 K": is outside the control's range/);
  });

  it("refuses unknown formats, missing -o and missing files", async () => {
    expect((await cli("render", stateFile, "-o", fresh("x.gif"))).err).toMatch(/-o = .*has no output format/);
    expect((await cli("render", stateFile, "-o", fresh("x.csv"), "--format", "pdf")).err).toMatch(/--format = "pdf": is not an output format/);
    expect((await cli("render", stateFile)).err).toMatch(/no output file/);
    expect((await cli("render", fresh("missing.json"), "-o", fresh("y.csv"))).err).toMatch(/cannot be read \(ENOENT\)/);
  });
});

describe("quietframe report", () => {
  it("writes an interactive page of a set-up with the requested sliders and prints the headline figures", async () => {
    const out = fresh("report.html");
    const r = await cli("report", EXAMPLE, "-o", out, "--control", "membrane.temperature=10 mK:300 K", "--control", "squeezer.angle=0 deg:180 deg:linear");
    expect(r.code).toBe(0);
    expect(r.out).toMatch(/below the SQL/);
    expect(r.out).toContain("controls: membrane.temperature, squeezer.angle");
    const loaded = loadExplorerState(embeddedState(readFileSync(out, "utf8")), "report");
    expect(loaded.fingerprintMatches).toBe(true);
    expect(loaded.state.controls).toEqual([
      { target: "membrane.temperature", min: "10 mK", max: "300 K" },
      { target: "squeezer.angle", min: "0 deg", max: "180 deg", scale: "linear" },
    ]);
    expect(loaded.state.values).toEqual({ "membrane.temperature": "6 K", "squeezer.angle": "60 deg" });
  });

  it("names the --control option in errors", async () => {
    const out = fresh("no-report.html");
    const r = await cli("report", EXAMPLE, "-o", out, "--control", "membrane.colour=1:2");
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/--control\[0\]\.target = "membrane\.colour": is not a parameter of this set-up/);
    expect(existsSync(out)).toBe(false);
    expect((await cli("report", EXAMPLE, "-o", out, "--control", "membrane.temperature=5 K")).err).toMatch(/does not give a range/);
  });
});

describe("the built binary", () => {
  it("renders through the async entry point and reports failures with exit status 1", () => {
    const out = fresh("binary.csv");
    const ok = spawnSync(process.execPath, [BUILT_CLI, "render", stateFile, "-o", out], { encoding: "utf8" });
    expect(ok.status).toBe(0);
    expect(readFileSync(out, "utf8")).toBe(tableToCsv(computeExplorer(state).table));
    const bad = spawnSync(process.execPath, [BUILT_CLI, "render", fresh("nothing.json"), "-o", fresh("never.csv")], { encoding: "utf8" });
    expect(bad.status).toBe(1);
    expect(bad.stdout).toBe("");
    expect(bad.stderr).toMatch(/^quietframe: /);
  });
});
