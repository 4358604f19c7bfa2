/**
 * Every test file runs in exactly one vitest project ("unit" or "integration"), read from the
 * same patterns vitest.config.mts uses, and no pattern is left pointing at nothing (a renamed
 * integration file would otherwise fall silently into the unit loop).
 */
import { readdirSync } from "node:fs";
import { join, sep } from "node:path";
import { beforeAll, describe, expect, it } from "vitest";

type ProjectFiles = { readonly include: readonly string[]; readonly exclude: readonly string[] };

const ROOT = join(__dirname, "..");
// An ES module (the vitest config imports it natively), so it is loaded with import().
let PROJECTS: Record<string, ProjectFiles>;
let ALL_PATTERNS: string[];
beforeAll(async () => {
  const { UNIT_TESTS, INTEGRATION_TESTS } = await import("./projects.mjs");
  PROJECTS = { unit: UNIT_TESTS, integration: INTEGRATION_TESTS };
  ALL_PATTERNS = Object.values(PROJECTS).flatMap((p) => [...p.include, ...p.exclude]);
});

/** Glob syntax the patterns keep to: names, `*` inside a name, `**` as a whole folder segment. */
const SUPPORTED = /^(?:(?:\*\*|[\w.*-]+)\/)*[\w.*-]+$/;

/** `**` = any folders (none included), `*` = any characters but `/`: how vitest's globs read these patterns. */
function globToRegExp(glob: string): RegExp {
  let source = "";
  for (const segment of glob.split("/")) {
    if (segment === "**") source += "(?:[^/]+/)*";
    else source += segment.replace(/[.+?^${}()|[\]\\]/g, "\\$&").replace(/\*/g, "[^/]*") + "/";
  }
  return new RegExp(`^${source.slice(0, -1)}$`);
}

const matches = (file: string, patterns: readonly string[]): boolean => patterns.some((p) => globToRegExp(p).test(file));
const inProject = (file: string, project: ProjectFiles): boolean => matches(file, project.include) && !matches(file, project.exclude);

const TEST_FILES = (readdirSync(join(ROOT, "test"), { recursive: true }) as string[])
  .filter((f) => f.endsWith(".test.ts"))
  .map((f) => `test/${f.split(sep).join("/")}`)
  .sort();

describe("the unit and integration projects", () => {
  it("patterns use only names, `*` and whole `**` segments (what the matcher here reads like vitest)", () => {
    for (const pattern of ALL_PATTERNS) expect(pattern, pattern).toMatch(SUPPORTED);
  });

  it("the matcher reads the pattern shapes as vitest's globs do", () => {
    expect(matches("test/a.test.ts", ["test/*.test.ts"])).toBe(true);
    expect(matches("test/engine/a.test.ts", ["test/*.test.ts"])).toBe(false);
    expect(matches("test/widgets/a.test.ts", ["test/widgets/**/*.test.ts"])).toBe(true);
    expect(matches("test/widgets/state/a.test.ts", ["test/widgets/**/*.test.ts"])).toBe(true);
    expect(matches("test/widgets-old/a.test.ts", ["test/widgets/**/*.test.ts"])).toBe(false);
    expect(matches("test/cli/cliXtest.ts", ["test/cli/cli.test.ts"])).toBe(false);
  });

  it("finds the test files", () => {
    expect(TEST_FILES.length).toBeGreaterThan(50);
    expect(TEST_FILES).toContain("test/projects.test.ts");
  });

  it("put every test file in exactly one project", () => {
    const wrong = TEST_FILES.map((file) => ({ file, projects: Object.keys(PROJECTS).filter((name) => inProject(file, PROJECTS[name]!)) })).filter((f) => f.projects.length !== 1);
    expect(wrong).toEqual([]);
  });

  it("have no pattern that matches no test file", () => {
    expect(ALL_PATTERNS.filter((pattern) => !TEST_FILES.some((file) => matches(file, [pattern])))).toEqual([]);
  });
});
