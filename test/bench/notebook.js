"use strict";
/**
 * 5. Notebook weight and cold start.
 *
 * Notebooks with 0, 1, 2 and 10 explorer widgets (cells calling `explorer(...).show()` with
 * the `../dist/widgets/notebook` import, as notebooks/*.ipynb do) are executed by Debian's
 * nbconvert with the tslab kernel in a private Jupyter prefix, and the saved files are
 * measured. The notebooks live in a temporary directory next to links to dist/ and
 * examples/, so their relative imports work as in notebooks/.
 *
 * Cold start: kernel_cold.py starts the kernel with jupyter_client and times kernel
 * ready, the import cell, and the first widget cell up to the display_data that carries
 * the widget (what a front end receives; the browser's part, booting the runtime and
 * drawing, is the page boot time of the browser benchmark).
 */
const { execFile, execFileSync } = require("node:child_process");
const { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, statSync, symlinkSync, writeFileSync } = require("node:fs");
const { tmpdir } = require("node:os");
const { join } = require("node:path");
const { SYSTEM_PYTHON, privateJupyterDirs } = require("./lib/jupyter-dirs");
const { ROOT } = require("./lib/repo");
const { nowMs } = require("./lib/timing");

const KERNEL = "tslab";
const WIDGET_COUNTS = [0, 1, 2, 10];
const TIMEOUT_MS = 300_000;

/** A private Jupyter prefix with the repository's tslab registered (the notebook suites do the same). */
function privateJupyter() {
  const binary = join(ROOT, "node_modules", ".bin", "tslab");
  if (!existsSync(binary)) throw new Error("node_modules/.bin/tslab is missing: run npm ci");
  const jupyter = privateJupyterDirs("quietframe-bench-jupyter-");
  try {
    execFileSync(binary, ["install", `--python=${SYSTEM_PYTHON}`, `--binary=${binary}`, "--prefix", jupyter.prefix], { env: jupyter.env, stdio: ["ignore", "pipe", "pipe"] });
  } catch (e) {
    jupyter.dispose();
    throw new Error(`tslab install failed: ${e.stderr?.toString() ?? e.message}`);
  }
  return jupyter;
}

function run(command, args, { env, cwd, timeoutMs }) {
  const start = nowMs();
  return new Promise((resolve) => {
    execFile(command, args, { env, cwd, timeout: timeoutMs, killSignal: "SIGKILL", maxBuffer: 64 * 1024 * 1024 }, (error, stdout, stderr) => {
      resolve({ code: error ? (typeof error.code === "number" ? error.code : null) : 0, stdout: String(stdout), stderr: String(stderr), ms: nowMs() - start });
    });
  });
}

const IMPORT_CELL = [
  `import { explorer, loadSetupFile } from "../dist/widgets/notebook";`,
  ``,
  `const setup = loadSetupFile("../examples/cryogenic-membrane.json");`,
  `const controls = [`,
  `  { target: "cavity.photons", label: "intracavity photons", min: 1e4, max: 1e8 },`,
  `  { target: "cavity.inputCoupling", label: "cavity input coupling", min: "50 %", max: "100 %" },`,
  `  { target: "detector.efficiency", label: "detection efficiency", min: "50 %", max: "100 %" },`,
  `  { target: "membrane.temperature", label: "bath temperature", min: "10 mK", max: "10 K" },`,
  `];`,
  `console.log(setup.name);`,
].join("\n");

// Written out rather than `{ controls }`: tslab does not resolve a shorthand property to an earlier cell's variable.
const widgetCell = (k) => `await explorer(setup, { controls: controls }).show(); // widget ${k}`;

function notebook(widgets) {
  const cell = (id, source) => ({ cell_type: "code", execution_count: null, id, metadata: {}, outputs: [], source });
  return {
    cells: [cell("setup", IMPORT_CELL), ...Array.from({ length: widgets }, (_, k) => cell(`widget-${k + 1}`, widgetCell(k + 1)))],
    metadata: {
      kernelspec: { display_name: "TypeScript", language: "typescript", name: KERNEL },
      language_info: { file_extension: ".ts", mimetype: "text/typescript", name: "typescript" },
    },
    nbformat: 4,
    nbformat_minor: 5,
  };
}

function cellErrors(nb) {
  return nb.cells
    .flatMap((c) => c.outputs ?? [])
    .filter((o) => o.output_type === "error" || o.name === "stderr")
    .map((o) => [].concat(o.text ?? []).join("") || `${o.ename}: ${o.evalue}`)
    .join("\n")
    .slice(0, 3000);
}

/**
 * Where a widget output's bytes go: each media type as stored, and inside the HTML the
 * inline SVG fallback, the embedded state and the runtime script.
 */
function outputParts(nb, cellId) {
  const cell = nb.cells.find((c) => c.id === cellId);
  const display = (cell?.outputs ?? []).find((o) => o.output_type === "display_data");
  if (!display) return undefined;
  const text = (v) => (typeof v === "string" ? v : Array.isArray(v) ? v.join("") : JSON.stringify(v));
  const parts = {};
  for (const [type, value] of Object.entries(display.data)) parts[type] = Buffer.byteLength(text(value));
  const html = text(display.data["text/html"] ?? "");
  const span = (re) => Buffer.byteLength(html.match(re)?.[0] ?? "");
  parts["html: svg fallback"] = span(/<svg[\s\S]*?<\/svg>/);
  parts["html: state"] = span(/<script type="application\/json" class="quietframe-state">[\s\S]*?<\/script>/);
  parts["html: runtime"] = Buffer.byteLength(
    html
      .split(/(?=<script>)/)
      .filter((chunk) => chunk.startsWith("<script>") && chunk.includes("quietframeRuntime") && chunk.length > 100_000)
      .join(""),
  );
  return parts;
}

/** Bytes of each widget cell's outputs as saved (JSON of the outputs list, as nbformat writes it, approximately). */
function outputBytes(nb) {
  return nb.cells.filter((c) => c.id.startsWith("widget-")).map((c) => Buffer.byteLength(JSON.stringify(c.outputs, null, 1)));
}

async function runNotebookBench(log = () => undefined) {
  const jupyter = privateJupyter();
  const work = mkdtempSync(join(tmpdir(), "quietframe-bench-notebooks-"));
  try {
    // Relative imports as in notebooks/: ../dist and ../examples from the notebook's directory.
    symlinkSync(join(ROOT, "dist"), join(work, "dist"), "dir");
    symlinkSync(join(ROOT, "examples"), join(work, "examples"), "dir");
    const src = join(work, "nb");
    const out = join(work, "out");
    mkdirSync(src);
    mkdirSync(out);

    const executed = [];
    for (const count of WIDGET_COUNTS) {
      const name = `widgets-${count}.ipynb`;
      writeFileSync(join(src, name), JSON.stringify(notebook(count), null, 1) + "\n");
      log(`notebook: executing ${name}`);
      const nbconvert = (extra) =>
        run(
          SYSTEM_PYTHON,
          [
            "-m",
            "nbconvert",
            "--to",
            "notebook",
            "--execute",
            `--ExecutePreprocessor.kernel_name=${KERNEL}`,
            `--ExecutePreprocessor.timeout=${TIMEOUT_MS / 1000}`,
            ...extra,
            join(src, name),
            "--output",
            name,
            "--output-dir",
            out,
          ],
          { env: jupyter.env, timeoutMs: TIMEOUT_MS },
        );
      const r = await nbconvert([]);
      const file = join(out, name);
      if (r.code !== 0) {
        // tslab reports a failing cell on stderr, which nbconvert's own message leaves out: run again to read it.
        const again = await nbconvert(["--allow-errors"]);
        const why = again.code === 0 ? cellErrors(JSON.parse(readFileSync(file, "utf8"))) : again.stderr.slice(-2000);
        throw new Error(`nbconvert failed on ${name} (exit ${r.code}): ${why || r.stderr.slice(-2000)}`);
      }
      const nb = JSON.parse(readFileSync(file, "utf8"));
      const errors = cellErrors(nb);
      if (errors) throw new Error(`${name}: a cell failed: ${errors}`);
      const widgets = nb.cells.flatMap((c) => c.outputs ?? []).filter((o) => String([].concat(o.data?.["text/html"] ?? []).join("")).includes('class="quietframe-explorer"')).length;
      if (widgets !== count) throw new Error(`${name}: expected ${count} widget outputs, found ${widgets}`);
      executed.push({
        widgets: count,
        bytes: statSync(file).size,
        nbconvertSeconds: r.ms / 1000,
        outputBytes: outputBytes(nb),
        firstParts: count >= 1 ? outputParts(nb, "widget-1") : undefined,
        secondParts: count >= 2 ? outputParts(nb, "widget-2") : undefined,
      });
    }
    const bytes = Object.fromEntries(executed.map((e) => [e.widgets, e.bytes]));
    const runtimeBytes = statSync(join(ROOT, "dist", "widgets", "runtime.js")).size;

    log("notebook: cold start with jupyter_client");
    const importFile = join(work, "import.ts");
    const widgetFile = join(work, "widget.ts");
    writeFileSync(importFile, IMPORT_CELL);
    writeFileSync(widgetFile, widgetCell(1));
    const cold = await run(SYSTEM_PYTHON, [join(__dirname, "kernel_cold.py"), KERNEL, src, importFile, widgetFile], { env: jupyter.env, timeoutMs: TIMEOUT_MS });
    if (cold.code !== 0) throw new Error(`kernel_cold.py failed (exit ${cold.code}):\n${cold.stderr.slice(-3000)}`);
    const coldTimes = JSON.parse(cold.stdout.trim().split("\n").pop());
    if (coldTimes.errors) throw new Error(`cold start: the cells reported errors: ${coldTimes.errors}`);
    if (coldTimes.display === null) throw new Error("cold start: the widget cell displayed no widget");

    return {
      executed,
      firstWidgetBytes: bytes[1] - bytes[0],
      secondWidgetBytes: bytes[2] - bytes[1],
      furtherWidgetBytes: (bytes[10] - bytes[1]) / 9,
      runtimeBytes,
      firstParts: executed.find((e) => e.widgets === 2)?.firstParts,
      furtherParts: executed.find((e) => e.widgets === 2)?.secondParts,
      cold: {
        readySeconds: coldTimes.ready,
        importSeconds: coldTimes.import,
        firstDisplaySeconds: coldTimes.display,
        totalSeconds: coldTimes.ready + coldTimes.import + coldTimes.display,
      },
    };
  } finally {
    rmSync(work, { recursive: true, force: true });
    jupyter.dispose();
  }
}

module.exports = { runNotebookBench };

if (require.main === module) {
  runNotebookBench((s) => console.error(s)).then(
    (r) => console.log(JSON.stringify(r, null, 2)),
    (e) => {
      console.error(e);
      process.exitCode = 1;
    },
  );
}
