import { mkdtempSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { ENTANGLED_CLASS } from "../../widgets/entangled/names";
import { kindOf, loadWidgetState, WIDGET_KINDS } from "../../widgets/registry";
import { TOLERANCE_CLASS } from "../../widgets/tolerance/names";
import { quietframeErrorOf } from "../helpers/errors";

/**
 * The registry finds the kind of every saved state (one of each kind in test/fixtures/states/),
 * and `quietframe render` goes through it for every kind. Outside references: the PNG file
 * signature (ISO/IEC 15948:2004, §5.2, "PNG signature") and the SVG root element (W3C SVG 1.1,
 * §5.1.1, the "svg" element).
 */
const STATES = join(__dirname, "..", "fixtures", "states");
const text = (name: string): string => readFileSync(join(STATES, name), "utf8");
const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-registry-"));
});
afterAll(() => {
  if (dir) rmSync(dir, { recursive: true, force: true });
});

async function render(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(["render", ...argv], { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("the widget registry", () => {
  it("lists each kind once, with a state format of its own", () => {
    const names = WIDGET_KINDS.map((k) => k.name);
    expect(new Set(names).size).toBe(names.length);
    expect(new Set(WIDGET_KINDS.map((k) => k.stateFormat)).size).toBe(names.length);
    expect([...names].sort()).toEqual(["design", "entangled", "explorer", "tolerance", "trajectory"]);
  });

  it.each([
    ["explorer.json", "explorer"],
    ["explorer-detector.json", "explorer"],
    ["trajectory.json", "trajectory"],
    ["tolerance.json", "tolerance"],
    ["entangled.json", "entangled"],
  ])("finds the kind of %s (%s), as text and parsed", (file, name) => {
    expect(kindOf(text(file)).name).toBe(name);
    expect(kindOf(JSON.parse(text(file))).name).toBe(name);
  });

  it("loads each saved state through its kind; explorers and trajectories reproduce their stored fingerprint", () => {
    for (const file of ["explorer.json", "trajectory.json"]) {
      const { loaded } = loadWidgetState(text(file), file);
      expect(loaded.fingerprint?.recomputed).toBe(loaded.fingerprint?.stored);
    }
    // A version-1 panel state and a map saved before maps had one record no fingerprint: the numbers' own, nothing to compare.
    for (const file of ["entangled.json", "tolerance.json"]) {
      const fingerprint = loadWidgetState(text(file), file).loaded.fingerprint;
      expect(fingerprint?.stored).toBeNull();
      expect(fingerprint?.recomputed).toMatch(/^sha256:[0-9a-f]{64}$/);
    }
  });

  it("gives input no kind recognises to the explorer's reader, which says what is wrong with it", () => {
    const e = quietframeErrorOf(() => loadWidgetState('{"format": "quietframe.unknown"}', "other.json"));
    expect(e.path).toBe("other.json.format");
    expect(e.problem).toBe("is not a quietframe explorer state");
  });
});

describe("quietframe render of the kinds drawn as SVG, PNG and page", { timeout: 120_000 }, () => {
  it.each([
    ["tolerance.json", TOLERANCE_CLASS],
    ["entangled.json", ENTANGLED_CLASS],
  ])("%s: an SVG, a PNG, a standalone page and the kind's table as CSV (%s)", async (file, className) => {
    const input = join(STATES, file);
    const svg = join(dir, `${file}.svg`);
    expect((await render(input, "-o", svg)).code).toBe(0);
    expect(readFileSync(svg, "utf8")).toMatch(/^<svg[\s>]/);
    const png = join(dir, `${file}.png`);
    expect((await render(input, "-o", png, "--scale", "1")).code).toBe(0);
    expect(Array.from(readFileSync(png).subarray(0, 8))).toEqual(PNG_SIGNATURE);
    const html = join(dir, `${file}.html`);
    expect((await render(input, "-o", html)).code).toBe(0);
    const page = readFileSync(html, "utf8");
    expect(page).toMatch(/^<!DOCTYPE html>/);
    expect(page).toContain(`<div class="${className}"`);
    expect(page).toContain("window.quietframeRuntime");
    const csvFile = join(dir, `${file}.csv`);
    const csv = await render(input, "-o", csvFile);
    expect(csv.code).toBe(0);
    const { kind, loaded } = loadWidgetState(text(file), file);
    expect(readFileSync(csvFile, "utf8")).toBe(kind.figure(loaded).csv);
  });
});
