import { existsSync, readdirSync } from "node:fs";
import { dirname, join } from "node:path";
import { describe, expect, it } from "vitest";
import { cycles, importsOf, ROOT, sourceFiles, type ImportEdge } from "./import-graph";

/**
 * The layer rules of DEVELOPERS.md, enforced: engine ← widgets core ← widget kinds ←
 * notebook API, kernel, browser runtime and CLI. A file may import its own layer and those
 * below; widgets reach the engine only through its public entries; no folder imports itself
 * back through other folders. A failure prints each offending import with file and line.
 */
const LAYERS = ["engine", "widgets core", "widget kinds", "application"] as const;
type Layer = (typeof LAYERS)[number];

/** Folders under widgets/ that are widget kinds: those with a kind.ts (core/kind.ts is the interface itself). */
const KIND_FOLDERS = readdirSync(join(ROOT, "widgets")).filter((name) => name !== "core" && existsSync(join(ROOT, "widgets", name, "kind.ts")));
/** Files and folders of the application layer (the top). */
const APPLICATION = ["src/cli/", "widgets/notebook/", "widgets/kernel/", "widgets/runtime/", "widgets/index.ts", "widgets/registry.ts", "widgets/methods.ts"];
/** Folders of code that runs in a page (the runtime bundle and the front-end module); `*` is one folder name. */
const BROWSER_CODE = ["widgets/runtime/", "widgets/core/browser/", "widgets/*/browser/", "widgets/explorer/frontend/"];
/** The engine's public entries: the only engine files widgets may import. */
const ENGINE_ENTRIES = new Set(["src/index.ts", "src/node.ts"]);

function layerOf(file: string): Layer | undefined {
  if (APPLICATION.some((p) => file === p || (p.endsWith("/") && file.startsWith(p)))) return "application";
  if (file.startsWith("src/")) return "engine";
  if (file.startsWith("widgets/core/")) return "widgets core";
  if (KIND_FOLDERS.some((k) => file.startsWith(`widgets/${k}/`))) return "widget kinds";
  return undefined;
}

const FILES = sourceFiles("src", "widgets");
const EDGES: ImportEdge[] = FILES.flatMap(importsOf);
const local = EDGES.filter((e): e is ImportEdge & { to: string } => e.to !== undefined);
/**
 * The unit a file belongs to for the cycle rule: its folder; a widget kind's folder as a whole
 * (its sub-folders — browser view, live parts, notebook API — are rooms of one kind, and the
 * kind's entry wires them together); a file at the top of src/ or widgets/ (an entry,
 * errors.ts) stands for itself.
 */
function folderOf(file: string): string {
  const parts = file.split("/");
  if (parts.length === 2) return file;
  if (parts[0] === "widgets" && KIND_FOLDERS.includes(parts[1])) return `widgets/${parts[1]}`;
  return dirname(file);
}
const where = (e: ImportEdge): string => `${e.from}:${e.line} imports ${e.specifier}${e.to ? ` (${e.to})` : ""}`;

describe("layer rules", () => {
  it("finds the widget kinds by their kind.ts", () => {
    expect(KIND_FOLDERS).toEqual(expect.arrayContaining(["design", "entangled", "explorer", "tolerance", "trajectory"]));
    expect(KIND_FOLDERS).not.toContain("core");
  });

  it("every source file belongs to a layer", () => {
    expect(FILES.filter((f) => layerOf(f) === undefined)).toEqual([]);
  });

  it("no file imports a layer above its own", () => {
    const rank = (f: string): number => LAYERS.indexOf(layerOf(f)!);
    const upward = local.filter((e) => rank(e.to) > rank(e.from)).map((e) => `${where(e)}: ${layerOf(e.from)} may not import ${layerOf(e.to)}`);
    expect(upward).toEqual([]);
  });

  it("widgets reach the engine only through src/index.ts or src/node.ts", () => {
    const past = local.filter((e) => e.from.startsWith("widgets/") && e.to.startsWith("src/") && !ENGINE_ENTRIES.has(e.to)).map(where);
    expect(past).toEqual([]);
  });

  it("browser code imports neither Node's modules nor the engine's Node entry", () => {
    const inBrowser = (f: string): boolean => BROWSER_CODE.some((p) => new RegExp(`^${p.replace(/\*/g, "[^/]+")}`).test(f));
    const bad = EDGES.filter((e) => inBrowser(e.from) && (e.to === "src/node.ts" || e.specifier.startsWith("node:"))).map(where);
    expect(FILES.filter(inBrowser).length).toBeGreaterThan(0);
    expect(bad).toEqual([]);
  });

  it("no folder cycles (a widget kind counts as one folder)", () => {
    const folders = [...new Set(FILES.map(folderOf))];
    const next = new Map<string, Set<string>>(folders.map((f) => [f, new Set<string>()]));
    for (const e of local) if (folderOf(e.to) !== folderOf(e.from)) next.get(folderOf(e.from))?.add(folderOf(e.to));
    const found = cycles(folders, (f) => [...next.get(f)!]).map((c) => {
      const inside = new Set(c);
      const ties = local.filter((e) => inside.has(folderOf(e.from)) && inside.has(folderOf(e.to)) && folderOf(e.from) !== folderOf(e.to)).map(where);
      return `${c.join(" ↔ ")}:\n    ${ties.join("\n    ")}`;
    });
    expect(found).toEqual([]);
  });
});

describe("the import reader behind the rules", () => {
  it("finds a cycle and only that one (a → b → c → a, d → a)", () => {
    const g: Record<string, string[]> = { a: ["b"], b: ["c"], c: ["a"], d: ["a"] };
    expect(cycles(Object.keys(g), (v) => g[v])).toEqual([["a", "b", "c"]]);
  });

  it("reads this test's own imports, resolved to files", () => {
    const own = importsOf("test/layout/layers.test.ts");
    expect(own.map((e) => e.to ?? e.specifier)).toEqual(["node:fs", "node:path", "vitest", "test/layout/import-graph.ts"]);
  });
});
