import { mkdtempSync, readdirSync, readFileSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCliAsync } from "../../src/cli/run";
import { kindOf, WIDGET_KINDS } from "../../widgets/registry";

/**
 * examples/states/ holds one shareable state per widget kind (the artefact a paper's
 * supplementary material carries); `quietframe render --strict` reproduces each: a recomputed
 * fingerprint that differs from the stored one would be an error.
 */
const STATES = join(__dirname, "..", "..", "examples", "states");
const FILES = readdirSync(STATES).filter((f) => f.endsWith(".json"));

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-example-states-"));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe("examples/states", () => {
  it("holds a state of every widget kind", () => {
    const kinds = FILES.map((f) => kindOf(readFileSync(join(STATES, f), "utf8")).name);
    expect([...kinds].sort()).toEqual(WIDGET_KINDS.map((k) => k.name).sort());
  });

  it.each(FILES)("%s renders with --strict", async (file) => {
    let out = "";
    let err = "";
    const page = join(dir, file.replace(/\.json$/, ".html"));
    const code = await runCliAsync(["render", join(STATES, file), "-o", page, "--strict"], { out: (s) => (out += s), err: (s) => (err += s) });
    expect(err).not.toMatch(/warning|quietframe:/);
    expect(code).toBe(0);
    expect(out).toContain(`wrote ${page} (html`);
    expect(readFileSync(page, "utf8")).toContain("Safety section of the quietframe README");
  });
});
