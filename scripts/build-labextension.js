#!/usr/bin/env node
/**
 * Builds the prebuilt JupyterLab extension "quietframe-live" (JupyterLab 4 and Notebook 7) into
 *
 *   dist/labextension/quietframe-live/   package.json (with its "jupyterlab" key) and static/
 *
 * which `quietframe extension install` copies into a Jupyter data directory
 * (share/jupyter/labextensions/quietframe-live/). Two steps: esbuild bundles the plugin
 * (widgets/explorer/frontend/lab-plugin.ts, with the chart model and view, Vega and
 * Vega-Lite) into one ES module in a staging package; @jupyterlab/builder then wraps it as a
 * module-federation container that shares @jupyter-widgets/base and JupyterLab's own packages
 * with the running front-end.
 *
 * The builder reads JupyterLab's core package metadata from the jupyterlab Python package, so
 * this runs after scripts/ensure-python-env.sh (`npm test` and `npm run build:labextension`
 * do it); the ordinary `npm run build` does not need it. QUIETFRAME_JUPYTERLAB_CORE may name
 * another jupyterlab/staging directory.
 */
"use strict";
const { build } = require("esbuild");
const { execFileSync } = require("node:child_process");
const { existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } = require("node:fs");
const { join, relative } = require("node:path");

const root = join(__dirname, "..");
const NAME = "quietframe-live";
const output = join(root, "dist", "labextension", NAME);
// Inside the repository's node_modules, so webpack resolves @jupyter-widgets/base from the project.
const staging = join(root, "node_modules", ".cache", "quietframe-labextension");
/**
 * The @jupyter-widgets/base the extension asks the page's shared scope for: any ipywidgets 8
 * widget manager (base 6.x; jupyterlab_widgets 3.0.16 shares 6.0.11, 3.0.17 shares 6.0.12).
 * The plugin uses only what 6.0.0 has (DOMWidgetModel, DOMWidgetView, IJupyterWidgetRegistry),
 * and a narrower range makes the page warn "Unsatisfied version" under an older manager.
 */
const BASE_RANGE = "^6.0.0";

/** JupyterLab's core package directory (jupyterlab/staging) of the pinned Python environment. */
function corePath() {
  if (process.env.QUIETFRAME_JUPYTERLAB_CORE) return process.env.QUIETFRAME_JUPYTERLAB_CORE;
  const env = execFileSync("bash", [join(__dirname, "ensure-python-env.sh"), "--print-dir"], { encoding: "utf8", stdio: ["ignore", "pipe", "inherit"] }).trim();
  const script = "import jupyterlab, os; print(os.path.join(os.path.dirname(jupyterlab.__file__), 'staging'))";
  return execFileSync(join(env, "bin", "python"), ["-c", script], { encoding: "utf8" }).trim();
}

async function main() {
  const core = corePath();
  if (!existsSync(join(core, "package.json"))) throw new Error(`no JupyterLab core metadata in ${core}`);
  const pkg = JSON.parse(readFileSync(join(root, "package.json"), "utf8"));
  rmSync(staging, { recursive: true, force: true });
  mkdirSync(join(staging, "lib"), { recursive: true });
  await build({
    entryPoints: [join(root, "widgets", "explorer", "frontend", "lab-plugin.ts")],
    outfile: join(staging, "lib", "index.js"),
    bundle: true,
    minify: true,
    format: "esm",
    target: "es2020",
    platform: "browser",
    // Provided by the front-end at run time (shared modules), never bundled.
    external: ["@jupyter-widgets/base", "@jupyterlab/*", "@lumino/*"],
    legalComments: "none",
    // The same trimmed Vega as the other bundles (see widgets/core/browser/vega-slim.ts).
    alias: { vega: join(root, "widgets", "core", "browser", "vega-slim.ts") },
    tsconfig: join(root, "widgets", "explorer", "frontend", "tsconfig.json"),
    logLevel: "warning",
    define: { "process.env.NODE_ENV": '"production"' },
  });
  const manifest = {
    name: NAME,
    version: pkg.version,
    description: "quietframe's live chart for JupyterLab 4 and Notebook 7 (ipywidgets 8)",
    license: pkg.license,
    main: "lib/index.js",
    // @jupyter-widgets/base comes from the widget manager: our classes must extend its copy.
    dependencies: { "@jupyter-widgets/base": BASE_RANGE },
    jupyterlab: {
      extension: true,
      outputDir: relative(staging, output),
      sharedPackages: { "@jupyter-widgets/base": { bundled: false, singleton: true } },
    },
  };
  writeFileSync(join(staging, "package.json"), `${JSON.stringify(manifest, null, 2)}\n`);
  const builder = join(root, "node_modules", "@jupyterlab", "builder", "lib", "build-labextension.js");
  try {
    execFileSync(process.execPath, [builder, "--core-path", core, staging], { stdio: ["ignore", "pipe", "pipe"], encoding: "utf8" });
  } catch (e) {
    // The builder's own report (webpack's errors) only when it failed.
    throw new Error(`@jupyterlab/builder failed:\n${e.stdout ?? ""}${e.stderr ?? ""}`);
  }
  const built = JSON.parse(readFileSync(join(output, "package.json"), "utf8"));
  if (!built.jupyterlab?._build?.load) throw new Error("the builder wrote no remote entry");
}

main().catch((e) => {
  console.error(`build-labextension: ${e && e.message ? e.message : e}`);
  process.exit(1);
});
