import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli, runCliAsync } from "../../src/cli/run";
import { editDistance, nearestName } from "../../src/nearest-name";
import { cavitySetup, component } from "../setup/fixtures";

/** "Did you mean …" for mistyped options, commands, component types and components, and our own option messages. */

function cli(...argv: string[]): { code: number; out: string; err: string } {
  let out = "";
  let err = "";
  const code = runCli(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

let dir: string;
let good: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-suggest-"));
  good = join(dir, "good.json");
  writeFileSync(good, JSON.stringify(cavitySetup()));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function setupFile(edit: (s: any) => void): string {
  const s = cavitySetup();
  edit(s);
  const path = join(dir, `edited-${Math.random().toString(36).slice(2)}.json`);
  writeFileSync(path, JSON.stringify(s));
  return path;
}

describe("edit distance (optimal string alignment)", () => {
  it.each([
    // Levenshtein's textbook pair (kitten → sitting: 2 substitutions, 1 insertion; from memory).
    ["kitten", "sitting", 3],
    ["flaw", "lawn", 2],
    ["", "abc", 3],
    ["same", "same", 0],
    ["Cavity", "cavity", 0],
    // A swap of neighbours is one edit.
    ["stirct", "strict", 1],
    // OSA may not edit a substring twice: "ca" → "abc" costs 3 (true Damerau–Levenshtein gives 2; from memory).
    ["ca", "abc", 3],
  ])("%s → %s = %i", (a, b, d) => {
    expect(editDistance(a, b)).toBe(d);
    expect(editDistance(b, a)).toBe(d);
  });

  it("suggests only names within a third of the word's length", () => {
    expect(nearestName("cavty", ["oscillator", "cavity", "homodyne"])).toBe("cavity");
    expect(nearestName("laser", ["oscillator", "cavity", "homodyne"])).toBeUndefined();
    expect(nearestName("cavity", ["cavity"])).toBeUndefined();
  });
});

describe("the CLI names the nearest name", () => {
  it("for a mistyped command", () => {
    const r = cli("summray", good);
    expect(r.code).toBe(2);
    expect(r.err).toContain(`unknown command 'summray' (did you mean "summary"?)`);
  });

  it("for a mistyped option of an async command, with exit status 1 and our own text", async () => {
    let err = "";
    const code = await runCliAsync(["render", good, "-o", join(dir, "x.html"), "--stirct"], { out: () => {}, err: (s) => (err += s) });
    expect(code).toBe(1);
    expect(err).toContain('quietframe: --stirct: is not an option of quietframe render (did you mean "--strict"?); allowed: -o/--output, --format, --strict, --scale, --widget');
  });

  it("for an option given a value it does not take, or missing its value", () => {
    const flag = cli("eval", good, "--psd=yes");
    expect(flag.code).toBe(1);
    expect(flag.out).toBe("");
    expect(flag.err).toContain("quietframe: --psd: takes no value; allowed: --psd alone");
    const missing = cli("eval", good, "--points");
    expect(missing.code).toBe(1);
    expect(missing.err).toContain("quietframe: --points: needs a value; allowed: --points <value>");
  });

  it("for a file argument where a command takes none", () => {
    const r = cli("kernel", "install", "extra");
    expect(r.code).toBe(1);
    expect(r.err).toContain('<arguments> = "extra": quietframe kernel install takes no file or word arguments here');
  });

  it("for an unknown component type in `types` and in a set-up", () => {
    const types = cli("types", "cavty");
    expect(types.code).toBe(1);
    expect(types.err).toContain('type = "cavty": is not a known component type (did you mean "cavity"?)');
    const file = setupFile((s) => {
      component(s, "membrane").type = "oscilator";
    });
    const r = cli("eval", file);
    expect(r.code).toBe(1);
    expect(r.err).toContain('components.membrane.type = "oscilator": is not a known component type (did you mean "oscillator"?)');
  });

  it("for an unknown component in a connection, and no guess when nothing is close", () => {
    const near = setupFile((s) => {
      s.connections[2] = ["cavity.mechanics", "membrne.body"];
    });
    const r = cli("check", near);
    expect(r.code).toBe(1);
    expect(r.err).toContain(`no component named 'membrne' (did you mean "membrane"?)`);
    const far = setupFile((s) => {
      s.connections[2] = ["cavity.mechanics", "pendulum.body"];
    });
    const f = cli("check", far);
    expect(f.code).toBe(1);
    expect(f.err).toContain("no component named 'pendulum'");
    expect(f.err).not.toContain("did you mean");
  });
});
