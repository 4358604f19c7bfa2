#!/usr/bin/env node
/**
 * Bundles quietframe's widget module for Jupyter front-ends (widgets/explorer/frontend: the chart
 * model and view, Vega and Vega-Lite) in the two forms widget managers load:
 *
 *   dist/live-frontend/esm/index.js   an ES module (JupyterLab-style managers, pages with import maps)
 *   dist/live-frontend/amd/index.js   a require.js module (the classic notebook's widget manager),
 *                                     with amd/extension.js, the notebook extension that maps the
 *                                     module name "quietframe-live" to it
 *
 * @jupyter-widgets/base stays outside: the manager provides its own copy, and the model and
 * view classes must extend exactly that one.
 */
"use strict";
const { build } = require("esbuild");
const { mkdirSync, readFileSync, writeFileSync } = require("node:fs");
const { join } = require("node:path");

const root = join(__dirname, "..");
const out = join(root, "dist", "live-frontend");
const BASE = "@jupyter-widgets/base";

const common = {
  entryPoints: [join(root, "widgets", "explorer", "frontend", "index.ts")],
  bundle: true,
  minify: true,
  target: "es2020",
  platform: "browser",
  external: [BASE],
  legalComments: "none",
  // The same trimmed Vega as the kernel-free runtime (see widgets/core/browser/vega-slim.ts).
  alias: { vega: join(root, "widgets", "core", "browser", "vega-slim.ts") },
  tsconfig: join(root, "widgets", "explorer", "frontend", "tsconfig.json"),
  logLevel: "warning",
  define: { "process.env.NODE_ENV": '"production"' },
  write: false,
};

async function main() {
  mkdirSync(join(out, "esm"), { recursive: true });
  mkdirSync(join(out, "amd"), { recursive: true });
  const esm = await build({ ...common, format: "esm" });
  writeFileSync(join(out, "esm", "index.js"), esm.outputFiles[0].contents);
  // require.js has no loader for CommonJS: wrap the CommonJS bundle in an anonymous define()
  // whose one dependency is the manager's @jupyter-widgets/base.
  const cjs = await build({ ...common, format: "cjs" });
  const amd =
    `define(["${BASE}"], function (__quietframeBase) {\n` +
    `var module = { exports: {} }, exports = module.exports;\n` +
    `var require = function (name) { if (name === "${BASE}") return __quietframeBase; throw new Error("quietframe-live: no module " + name); };\n` +
    `${cjs.outputFiles[0].text}\nreturn module.exports;\n});\n`;
  writeFileSync(join(out, "amd", "index.js"), amd);
  // The classic notebook's widget manager asks require.js for the module by its name; this
  // notebook extension maps the name to the installed file (see docs/kernel.md, "Live explorers").
  writeFileSync(
    join(out, "amd", "extension.js"),
    `define(function () {\n  "use strict";\n  window.require.config({ map: { "*": { "quietframe-live": "nbextensions/quietframe-live/index" } } });\n  return { load_ipython_extension: function () {} };\n});\n`,
  );
  // The manifest front-ends read the module name and version from.
  const version = JSON.parse(readFileSync(join(root, "package.json"), "utf8")).version;
  writeFileSync(join(out, "package.json"), `${JSON.stringify({ name: "quietframe-live", version, module: "esm/index.js", main: "amd/index.js" }, null, 2)}\n`);
}

main().catch((e) => {
  console.error(`build-live-frontend: ${e && e.message ? e.message : e}`);
  process.exit(1);
});
