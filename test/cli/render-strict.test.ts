import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { QUIETFRAME_VERSION } from "../../src/index";
import { loadWidgetState } from "../../widgets/registry";

/**
 * What `quietframe render --strict` tells a referee, for every kind that recomputes its numbers
 * (the example states of examples/states/): the numbers of the state, of the CSV and of the
 * recomputation agree; tampering a field that changes the numbers is refused; a state without
 * a fingerprint or from another quietframe version is named as such; the fields the fingerprint
 * does not cover are listed with the reason. Common practice, no outside source: the checks
 * compare the tool with itself across its entry points.
 */
const STATES = join(__dirname, "..", "..", "examples", "states");
const FIXTURES = join(__dirname, "..", "fixtures", "states");

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-render-strict-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function render(...argv: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = "";
  let err = "";
  const code = await runCliAsync(["render", ...argv], { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

type Doc = { state: Record<string, { state: Record<string, unknown> }> };
const modelState = (doc: Doc): Record<string, unknown> => Object.values(doc.state)[0].state;
const readDoc = (file: string): Doc => JSON.parse(readFileSync(join(STATES, file), "utf8")) as Doc;

function writeState(name: string, doc: unknown): string {
  const file = join(dir, name);
  writeFileSync(file, JSON.stringify(doc));
  return file;
}

describe("render --strict for every kind that recomputes its numbers", { timeout: 120_000 }, () => {
  it.each(["entangled-two-beams.json", "explorer-squeezed-membrane.json", "trajectory-cryogenic-membrane.json", "design-ranking-free-mass.json"])(
    "%s: the CSV render --strict writes is the kind's own table of the loaded state",
    async (file) => {
      const out = join(dir, `${file}.csv`);
      const r = await render(join(STATES, file), "-o", out, "--strict");
      expect(r.err).not.toMatch(/warning|quietframe:/);
      expect(r.code).toBe(0);
      const { kind, loaded } = loadWidgetState(readFileSync(join(STATES, file), "utf8"), file);
      expect(readFileSync(out, "utf8")).toBe(kind.figure(loaded).csv);
      expect(loaded.fingerprint?.recomputed).toBe(loaded.fingerprint?.stored);
    },
  );

  it.each<[string, string, (s: Record<string, unknown>) => void]>([
    ["entangled-two-beams.json", "squeezing", (s) => ((s.squeeze as { value: number }).value = -7.9)],
    ["entangled-two-beams.json", "an arm efficiency", (s) => (s.efficiency2 = 0.86)],
    ["entangled-two-beams.json", "the linewidth", (s) => (s.bandwidth = 5.1e6)],
    ["explorer-squeezed-membrane.json", "the settings' grid", (s) => ((s.settings as { grid: { points: number } }).grid.points = 400)],
    ["trajectory-cryogenic-membrane.json", "the seed", (s) => ((s.simulation as { seed: number }).seed += 1)],
    [
      "design-ranking-free-mass.json",
      "the mirror's mass",
      (s) => ((s.setup as { components: { name: string; params?: Record<string, unknown> }[] }).components.find((c) => c.name === "mirror")!.params!.mass = "120 g"),
    ],
  ])("%s: tampering %s fails --strict and writes nothing", async (file, _what, tamper) => {
    const doc = readDoc(file);
    tamper(modelState(doc));
    const input = writeState(`tampered-${file}`, doc);
    const out = join(dir, `tampered-${file}.csv`);
    const r = await render(input, "-o", out, "--strict");
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/recomputed curves differ/);
    expect(r.out).toBe("");
  });

  it("fields that cannot change the numbers: tampering them passes --strict, which names each with its reason", async () => {
    const doc = readDoc("explorer-squeezed-membrane.json");
    const state = modelState(doc) as { setup: { components: { name: string; params: Record<string, unknown> }[]; grid: { points: number } }; values: Record<string, unknown> };
    expect(Object.keys(state.values)).toContain("membrane.temperature");
    const membrane = state.setup.components.findIndex((c) => c.name === "membrane");
    state.setup.components[membrane].params.temperature = "300 K";
    state.setup.grid.points = 17;
    const r = await render(writeState("overridden.json", doc), "-o", join(dir, "overridden.csv"), "--strict");
    expect(r.code).toBe(0);
    expect(r.err).toContain(
      `--strict does not check overridden.json.state.${Object.keys(doc.state)[0]}.state.setup.components[${membrane}].params.temperature: the control value values["membrane.temperature"] replaces it`,
    );
    expect(r.err).toMatch(/--strict does not check \S+\.setup\.grid: the curves are computed on \S+\.settings\.grid/);
    expect(r.err).toMatch(/--strict does not check \S+\.settings\.spectralDensity: /);
    const design = await render(join(STATES, "design-ranking-free-mass.json"), "-o", join(dir, "design-notes.csv"), "--strict");
    expect(design.err).toMatch(/--strict does not check \S+\.state\.title: the figure's title, text only/);
    // Without --strict nothing is listed: the notes answer the question --strict asks.
    expect((await render(writeState("overridden-plain.json", doc), "-o", join(dir, "overridden-plain.csv"))).err).not.toContain("does not check");
  });

  it("a state written by another quietframe version: a warning naming both versions; --strict accepts it when the numbers agree", async () => {
    const doc = readDoc("entangled-two-beams.json");
    modelState(doc).quietframe = "0.0.9";
    const input = writeState("older.json", doc);
    const plain = await render(input, "-o", join(dir, "older.csv"));
    expect(plain.code).toBe(0);
    expect(plain.err).toContain(`written by quietframe 0.0.9 and is recomputed by quietframe ${QUIETFRAME_VERSION}; the numbers agree bit for bit`);
    modelState(doc).efficiency1 = 0.5;
    const differs = await render(writeState("older-differs.json", doc), "-o", join(dir, "older-differs.csv"), "--strict");
    expect(differs.code).toBe(1);
    expect(differs.err).toContain(`written by quietframe 0.0.9, recomputed by quietframe ${QUIETFRAME_VERSION}`);
  });

  it("a state without a fingerprint: named as missing (a warning, an error under --strict)", async () => {
    const input = join(FIXTURES, "entangled.json");
    const plain = await render(input, "-o", join(dir, "v1.csv"));
    expect(plain.code).toBe(0);
    expect(plain.err).toMatch(/^warning: .*entangled\.json records no fingerprint of its numbers/);
    const strict = await render(input, "-o", join(dir, "v1-strict.csv"), "--strict");
    expect(strict.code).toBe(1);
    expect(strict.err).toContain("entangled.json.fingerprint: is missing:");
    expect(strict.err).not.toContain("is not a curve fingerprint");
  });

  it("an explorer state whose fingerprint field is gone: a message that says it is missing", async () => {
    const doc = readDoc("explorer-squeezed-membrane.json");
    delete modelState(doc).fingerprint;
    const r = await render(writeState("no-fingerprint.json", doc), "-o", join(dir, "nf.csv"));
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/fingerprint: is missing: the state records no curve fingerprint/);
  });
});

describe("render --strict for a tolerance map, which carries its numbers and computes them again", { timeout: 120_000 }, () => {
  const EXAMPLE = "tolerance-squeezing-efficiency.json";
  type ToleranceJson = Record<string, unknown> & {
    setup: { components: { name: string; params: Record<string, unknown> }[] };
    spec: { x: { from: string; to: string }; figure: Record<string, unknown> };
    map: { values: unknown[] };
  };
  const readMap = (): ToleranceJson => JSON.parse(readFileSync(join(STATES, EXAMPLE), "utf8")) as ToleranceJson;

  it("the example: --strict computes the map again, its fingerprint is the stored one, and the CSV is the kind's table", async () => {
    const out = join(dir, "tolerance.csv");
    const r = await render(join(STATES, EXAMPLE), "-o", out, "--strict");
    expect(r.err).not.toMatch(/warning|quietframe:/);
    expect(r.code).toBe(0);
    const { kind, loaded } = loadWidgetState(readFileSync(join(STATES, EXAMPLE), "utf8"), EXAMPLE);
    expect(loaded.fingerprint?.stored).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect(loaded.fingerprint?.recomputed).toBe(loaded.fingerprint?.stored);
    const recomputed = await kind.recompute!(loaded, EXAMPLE);
    expect(recomputed.fingerprint?.recomputed).toBe(loaded.fingerprint?.stored);
    expect(readFileSync(out, "utf8")).toBe(kind.figure(recomputed).csv);
    expect(r.out).toContain(String(loaded.fingerprint?.stored));
    // What --strict leaves out, each with its reason: the cells' own values of the mapped parameters, titles, messages.
    expect(r.err).toMatch(/--strict does not check tolerance-squeezing-efficiency\.json\.setup\.components\[\d\]\.params\.squeezing: every cell writes its own value of squeezer\.squeezing/);
    expect(r.err).toMatch(/--strict does not check tolerance-squeezing-efficiency\.json\.settings: /);
  });

  it.each<[string, (s: ToleranceJson) => void]>([
    ["the cavity's linewidth", (s) => (s.setup.components.find((c) => c.name === "cavity")!.params.linewidth = "9 MHz")],
    ["the spec's x axis", (s) => (s.spec.x.to = "-1 dB")],
    ["the figure of merit", (s) => (s.spec.figure = { kind: "margin-at", frequency: "1.2 MHz" })],
  ])("tampering %s fails --strict, names the fingerprint and writes nothing", async (_what, tamper) => {
    const state = readMap();
    tamper(state);
    const input = writeState("tampered-tolerance.json", state);
    const out = join(dir, "tampered-tolerance.csv");
    const r = await render(input, "-o", out, "--strict");
    expect(r.code).toBe(1);
    expect(r.err).toMatch(/tampered-tolerance\.json\.fingerprint = "sha256:[0-9a-f]{64}": the recomputed curves differ/);
    expect(r.out).toBe("");
  });

  it("a map whose set-up or spec no longer computes: the error names the field in the state file", async () => {
    const setup = readMap();
    setup.setup.components.find((c) => c.name === "cavity")!.params.linewidth = "abc";
    const badSetup = await render(writeState("tolerance-bad-setup.json", setup), "-o", join(dir, "bad-setup.csv"), "--strict");
    expect(badSetup.code).toBe(1);
    expect(badSetup.err).toContain('tolerance-bad-setup.json.setup.components.cavity.linewidth = "abc"');
    const spec = readMap();
    spec.spec.x.from = "-12 kg";
    const badSpec = await render(writeState("tolerance-bad-spec.json", spec), "-o", join(dir, "bad-spec.csv"), "--strict");
    expect(badSpec.code).toBe(1);
    expect(badSpec.err).toContain('tolerance-bad-spec.json.spec.x.from = "-12 kg"');
  });

  it("a plain render draws the stored numbers and checks them against the stored fingerprint", async () => {
    const state = readMap();
    state.map.values[3] = (state.map.values[3] as number) + 1e-9;
    const input = writeState("tolerance-edited-number.json", state);
    const plain = await render(input, "-o", join(dir, "edited.csv"));
    expect(plain.code).toBe(0);
    expect(plain.err).toMatch(/^warning: the recomputed curves differ from the ones stored in \S+tolerance-edited-number\.json/);
  });

  it("a map merged from a sweep: its stored numbers are checked against its fingerprint, and --strict says the set-up is not computed again", async () => {
    const state = readMap();
    state.sweep = { fingerprint: `sha256:${"1".repeat(64)}`, result: `sha256:${"2".repeat(64)}` };
    const merged = await render(writeState("tolerance-sweep.json", state), "-o", join(dir, "sweep.csv"), "--strict");
    expect(merged.code).toBe(0);
    expect(merged.err).toMatch(/--strict does not check tolerance-sweep\.json\.setup: a merged sweep's map is checked against its stored fingerprint/);
    state.map.values[0] = (state.map.values[0] as number) * 2;
    const tampered = await render(writeState("tolerance-sweep-tampered.json", state), "-o", join(dir, "sweep-tampered.csv"), "--strict");
    expect(tampered.code).toBe(1);
    expect(tampered.err).toMatch(/tolerance-sweep-tampered\.json\.fingerprint = "sha256:[0-9a-f]{64}": the recomputed curves differ/);
  });

  it("a map saved before maps had a fingerprint: named as missing (a warning, an error under --strict)", async () => {
    const input = join(FIXTURES, "tolerance.json");
    const plain = await render(input, "-o", join(dir, "old-map.csv"));
    expect(plain.code).toBe(0);
    expect(plain.err).toMatch(/^warning: .*tolerance\.json records no fingerprint of its numbers/);
    const strict = await render(input, "-o", join(dir, "old-map-strict.csv"), "--strict");
    expect(strict.code).toBe(1);
    expect(strict.err).toContain("tolerance.json.fingerprint: is missing:");
  });
});
