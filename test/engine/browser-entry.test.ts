import { builtinModules } from "node:module";
import { join } from "node:path";
import { build, type Plugin } from "esbuild";
import { describe, expect, it } from "vitest";

/**
 * The package's main entry must bundle for a browser: the browser runtime and any user's
 * page bundle it. Node's built-in modules (esbuild's list for platform "node" is Node's own
 * `module.builtinModules`) are refused and reported with the file that imports them.
 */
const ROOT = join(__dirname, "..", "..");
const BUILTINS = new Set(builtinModules.flatMap((m) => [m, `node:${m}`]));

async function nodeImportsOf(entry: string): Promise<string[]> {
  const found: string[] = [];
  const refuseNode: Plugin = {
    name: "refuse-node",
    setup(b) {
      b.onResolve({ filter: /.*/ }, (args) => {
        if (!BUILTINS.has(args.path) && !args.path.startsWith("node:")) return undefined;
        found.push(`${args.importer.slice(ROOT.length + 1)} imports ${args.path}`);
        return { path: args.path, external: true };
      });
    },
  };
  await build({ entryPoints: [join(ROOT, entry)], bundle: true, write: false, platform: "browser", format: "esm", logLevel: "silent", plugins: [refuseNode] });
  return found;
}

describe("the browser-safe main entry", () => {
  it("src/index.ts bundles for a browser without any Node import", async () => {
    expect(await nodeImportsOf("src/index.ts")).toEqual([]);
  });

  it("the check is live: the Node entry is reported with the importing file", async () => {
    const found = await nodeImportsOf("src/node.ts");
    expect(found).toContain("src/threads/pool.ts imports node:worker_threads");
    expect(found).toContain("src/setup/load-file.ts imports node:fs");
  });
});
