import { spawnSync } from "node:child_process";
import { existsSync, mkdtempSync, readdirSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { BAD_CASES } from "../setup/fixtures";

/** The command as users run it: the built binary in a child process (integration: needs `npm run build`). */
const ROOT = join(__dirname, "..", "..");
const EXAMPLES = join(ROOT, "examples");
const EXAMPLE_FILES = readdirSync(EXAMPLES)
  .filter((f) => f.endsWith(".json"))
  .map((f) => join(EXAMPLES, f));
const BUILT_CLI = join(ROOT, "dist", "src", "cli", "main.js");

let dir: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-cli-binary-"));
});
afterAll(() => {
  rmSync(dir, { recursive: true, force: true });
});

function writeTemp(text: string): string {
  const path = join(dir, "setup.json");
  writeFileSync(path, text);
  return path;
}

describe("the built binary (node dist/src/cli/main.js; the suite runs after `npm run build`)", () => {
  it("exits non-zero with empty stdout on a bad set-up", () => {
    expect(existsSync(BUILT_CLI), "dist/src/cli/main.js is missing: run `npm run build` first").toBe(true);
    const bad = BAD_CASES.find((c) => c.label === "zero mass")!;
    const r = spawnSync(process.execPath, [BUILT_CLI, "eval", writeTemp(bad.text)], { encoding: "utf8" });
    expect(r.status).toBe(1);
    expect(r.stdout).toBe("");
    for (const part of bad.contains) expect(r.stderr).toContain(part);
  });

  it("exits 0 and prints CSV on a good set-up", () => {
    const r = spawnSync(process.execPath, [BUILT_CLI, "eval", EXAMPLE_FILES[0], "--points", "3"], { encoding: "utf8" });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout.split("\n")[0]).toMatch(/^frequency \[Hz\],/);
  });
});
