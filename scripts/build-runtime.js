#!/usr/bin/env node
/**
 * Bundles the browser runtime (widgets/runtime/runtime.ts: the explorer model, the engine,
 * Vega and Vega-Lite) into one minified script, dist/widgets/runtime.js. HTML outputs inline
 * it, so it must work without any network and must not contain text that ends a <script>.
 */
"use strict";
const { build } = require("esbuild");
const { readFileSync, statSync } = require("node:fs");
const { join } = require("node:path");
const { gzipSync } = require("node:zlib");

const root = join(__dirname, "..");
const outfile = join(root, "dist", "widgets", "runtime.js");

// Vega-Lite imports its whole package.json for its version string; carry only the version
// (the manifest's author and project links would otherwise ride along in every page).
const versionOnlyManifest = {
  name: "version-only-manifest",
  setup(b) {
    b.onLoad({ filter: /[\\/]node_modules[\\/]vega-lite[\\/](build[\\/])?package\.json$/ }, (args) => ({
      contents: JSON.stringify({ version: JSON.parse(readFileSync(args.path, "utf8")).version }),
      loader: "json",
    }));
  },
};

async function main() {
  await build({
    entryPoints: [join(root, "widgets", "runtime", "runtime.ts")],
    outfile,
    bundle: true,
    minify: true,
    format: "iife",
    target: "es2020",
    platform: "browser",
    // No globalName: the runtime sets window.quietframeRuntime itself, so that a second copy
    // on a page (a re-run notebook cell) leaves the first in charge.
    legalComments: "none",
    // Only the Vega transforms a budget chart uses (about 120 kB less).
    alias: { vega: join(root, "widgets", "core", "browser", "vega-slim.ts") },
    plugins: [versionOnlyManifest],
    tsconfig: join(root, "widgets", "runtime", "tsconfig.json"),
    logLevel: "warning",
    define: { "process.env.NODE_ENV": '"production"' },
  });
  const text = readFileSync(outfile, "utf8");
  // Inlined into HTML: these would end the script element or change how it is parsed.
  const bad = /<\/script|<!--/i.exec(text);
  if (bad) throw new Error(`runtime bundle contains ${JSON.stringify(bad[0])} at ${bad.index}; it cannot be inlined`);
  const size = statSync(outfile).size;
  if (process.argv.includes("--verbose")) {
    console.log(`dist/widgets/runtime.js: ${size} bytes, ${gzipSync(text).length} gzipped`);
  }
}

main().catch((e) => {
  console.error(`build-runtime: ${e && e.message ? e.message : e}`);
  process.exit(1);
});
