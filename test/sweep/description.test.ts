/**
 * The sweep description: every bad input is a QuietframeError naming the field of the sweep
 * file, the value and what is allowed; the JSON Schema (draft 2020-12, validated with ajv in
 * strict mode: the outside reference) is the committed one and accepts what the checks accept.
 */
import { readFileSync } from "node:fs";
import { join } from "node:path";
import Ajv2020 from "ajv/dist/2020";
import { describe, expect, it } from "vitest";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { setupJsonSchema } from "../../src/setup/schema";
import { resolveSweep, sweepJsonSchema, type SweepDescription } from "../../src/sweep";
import { readSweepFile } from "../../src/cli/sweep-command";
import { gridSweep, sampleSweep, squeezed, startSweep } from "./helpers";

const ROOT = join(__dirname, "..", "..");

function refusal(input: unknown): QuietframeError {
  try {
    resolveSweep(input);
  } catch (e) {
    if (e instanceof QuietframeError) return e;
    if (e instanceof QuietframeErrors) return e.problems[0];
    throw e;
  }
  throw new Error("the sweep was accepted");
}

describe("resolveSweep refuses bad input by field", () => {
  it("an unknown axis target names vary.x.target, the value and the set-up's parameters", () => {
    const d = gridSweep();
    const e = refusal({ ...d, vary: { ...d.vary, x: { target: "squeezer.squeezign", from: "-15 dB", to: "-3 dB", points: 4 } } });
    expect(e.path).toBe("vary.x.target");
    expect(e.value).toBe("squeezer.squeezign");
    expect(e.problem).toBe("is not a parameter of this set-up");
    expect(e.allowed).toContain("squeezer.squeezing");
  });

  it("an unknown uncertain target names vary.uncertain…", () => {
    const d = sampleSweep();
    const e = refusal({ ...d, vary: { kind: "samples", uncertain: [{ target: "cavity.nothing", value: "± 1 %" }] } });
    expect(e.path).toMatch(/^vary\.uncertain/);
    expect(e.message).toContain("cavity.nothing");
  });

  it("a sample count out of range names vary.samples with the range", () => {
    const d = sampleSweep();
    const e = refusal({ ...d, vary: { ...d.vary, samples: 1 } });
    expect(e.path).toBe("vary.samples");
    expect(e.allowed).toBe("an integer from 2 to 100000");
  });

  it("an unknown parameter to optimize names vary.parameters[k].target, a start count out of range vary.starts", () => {
    const d = startSweep();
    if (d.vary.kind !== "starts") throw new Error("not a starts sweep");
    const e = refusal({ ...d, vary: { ...d.vary, parameters: [d.vary.parameters[0], { target: "cavity.inputCouplng" }] } });
    expect(e.path).toBe("vary.parameters[1].target");
    expect(e.value).toBe("cavity.inputCouplng");
    const starts = refusal({ ...d, vary: { ...d.vary, starts: 101 } });
    expect(starts.path).toBe("vary.starts");
    expect(starts.allowed).toBe("an integer from 1 to 100");
    expect(refusal({ ...d, vary: { ...d.vary, tolerance: 1 } }).path).toBe("vary.tolerance");
  });

  it("a mistyped variation kind names vary.kind and suggests the nearest", () => {
    const d = gridSweep();
    const e = refusal({ ...d, vary: { ...d.vary, kind: "gird" } });
    expect(e.path).toBe("vary.kind");
    expect(e.problem).toContain('did you mean "grid"');
    expect(e.allowed).toBe("grid or samples or starts");
  });

  it("chunk sizes outside 1 … items name chunkSize and the range", () => {
    expect(refusal(gridSweep({ chunkSize: 0 })).allowed).toBe("an integer from 1 to 5 (rows, samples or starts per chunk)");
    expect(refusal(gridSweep({ chunkSize: 6 })).path).toBe("chunkSize");
    expect(refusal(sampleSweep({ chunkSize: 2.5 })).value).toBe(2.5);
  });

  it("an unknown top-level field, a wrong format or version, a missing figure, keep.curves on a grid", () => {
    expect(refusal({ ...gridSweep(), chunks: 3 }).path).toBe("chunks");
    expect(refusal({ ...gridSweep(), format: "quietframe.setup" }).path).toBe("format");
    expect(refusal({ ...gridSweep(), version: 2 }).path).toBe("version");
    const { figure: _figure, ...noFigure } = gridSweep();
    expect(refusal(noFigure).path).toBe("figure");
    expect(refusal(gridSweep({ keep: { curves: true } })).path).toBe("keep.curves");
    expect(refusal(sampleSweep({ keep: { curves: "yes" as unknown as boolean } })).path).toBe("keep.curves");
    expect(refusal([]).path).toBe("sweep");
  });

  it("a set-up problem is named inside setup, a figure problem as figure.*", () => {
    const broken = { ...squeezed, components: squeezed.components.map((c) => (c.name === "cavity" ? { ...c, params: { ...c.params, inputCoupling: "140 %" } } : c)) };
    expect(refusal(gridSweep({ setup: broken })).path).toMatch(/^setup\.components/);
    expect(refusal(gridSweep({ figure: { kind: "margin-at", frequency: "5 MHz" } })).path).toBe("figure.frequency");
  });

  it("the fingerprint follows the content, not the key order; another sweep has another one", () => {
    const a = resolveSweep(gridSweep());
    const reordered = Object.fromEntries(Object.entries(gridSweep()).reverse()) as unknown as SweepDescription;
    expect(resolveSweep(reordered).fingerprint).toBe(a.fingerprint);
    expect(resolveSweep(gridSweep({ chunkSize: 3 })).fingerprint).not.toBe(a.fingerprint);
    expect(a.fingerprint).toMatch(/^sha256:[0-9a-f]{64}$/);
    expect([a.items, a.chunkSize, a.chunks]).toEqual([5, 2, 3]);
    // Default: at most 100 chunks, so 60 samples give 60 chunks of one.
    const { chunkSize: _size, ...free } = sampleSweep();
    const s = resolveSweep(free);
    expect([s.chunkSize, s.chunks]).toEqual([1, 60]);
  });
});

describe("the sweep file's JSON Schema", () => {
  it("is the committed schema/sweep.schema.json (regenerate with `npm run schema`)", () => {
    const committed: unknown = JSON.parse(readFileSync(join(ROOT, "schema", "sweep.schema.json"), "utf8"));
    expect(committed, "schema/sweep.schema.json is stale: run `npm run schema` and commit the result").toEqual(sweepJsonSchema());
  });

  const ajv = new Ajv2020({ strict: true, allErrors: true });
  ajv.addSchema(setupJsonSchema());
  const validate = ajv.compile(sweepJsonSchema());

  it("accepts the test sweeps and the example sweep files, which the checks accept too", () => {
    for (const d of [gridSweep(), sampleSweep(), startSweep()]) expect(validate(d), JSON.stringify(validate.errors)).toBe(true);
    for (const file of ["membrane-map.sweep.json", "membrane-spread.sweep.json"]) {
      const path = join(ROOT, "examples", "sweeps", file);
      expect(validate(JSON.parse(readFileSync(path, "utf8"))), JSON.stringify(validate.errors)).toBe(true);
      expect(() => resolveSweep(readSweepFile(path))).not.toThrow();
    }
  });

  it("refuses what the checks refuse by shape: an unknown field, a wrong kind, a missing axis", () => {
    expect(validate({ ...gridSweep(), chunks: 3 })).toBe(false);
    expect(validate({ ...gridSweep(), vary: { kind: "gird" } })).toBe(false);
    const { y: _y, ...noY } = gridSweep().vary as { kind: "grid"; x: unknown; y: unknown };
    expect(validate({ ...gridSweep(), vary: noY })).toBe(false);
  });
});
