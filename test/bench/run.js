#!/usr/bin/env node
"use strict";
/**
 * quietframe benchmarks (not tests: nothing here asserts a time). `npm run bench` builds,
 * then runs every section; `node test/bench/run.js engine browser notebook` runs some.
 *
 * Speed is reported as ratios against a baseline timed in the same run, interleaved with
 * the candidate, so the figures keep their meaning on a shared, noisy machine; absolute
 * times are shown beside them. Prints one table, then where the engine's and the widget
 * model's time goes (sampling profile, source lines from the source maps), and writes
 * everything as JSON to dist/bench/latest.json.
 */

// Before anything loads dist/: the profiler maps built lines back to the TypeScript sources.
const { profile } = require("./lib/profile");
const os = require("node:os");
const { mkdirSync, writeFileSync, readFileSync } = require("node:fs");
const { join, relative } = require("node:path");
const { ROOT, dist } = require("./lib/repo");
const { nowMs } = require("./lib/timing");

const SECTIONS = ["engine", "browser", "notebook", "tolerance", "timedomain", "prepared", "kernel"];

function fmtTime(ms) {
  if (!Number.isFinite(ms)) return String(ms);
  if (ms >= 1000) return `${(ms / 1000).toFixed(2)} s`;
  if (ms >= 1) return `${ms.toFixed(ms >= 100 ? 0 : ms >= 10 ? 1 : 2)} ms`;
  if (ms >= 1e-3) return `${(ms * 1e3).toFixed(ms >= 0.1 ? 0 : ms >= 0.01 ? 1 : 2)} µs`;
  return `${(ms * 1e6).toFixed(0)} ns`;
}

function fmtBytes(n) {
  if (n >= 1e6) return `${(n / 1e6).toFixed(2)} MB`;
  if (n >= 1e3) return `${(n / 1e3).toFixed(1)} kB`;
  return `${Math.round(n)} B`;
}

const fmtRatio = (x) => `${x >= 100 ? x.toFixed(0) : x >= 10 ? x.toFixed(1) : x.toFixed(2)}×`;
const fmtExp = (x) => x.toExponential(1);
const met = (ok) => (ok ? "yes" : "NO");

// ---------------------------------------------------------------- rows per section

function engineRows(e) {
  const rows = [];
  for (const f of e.floor) {
    rows.push({
      id: f.id,
      measure: `full budget ÷ closed form: ${f.label}`,
      result: fmtRatio(f.ratio),
      detail: [
        `engine ${fmtTime(f.engineMs)} (${fmtTime(f.engineMs / f.points)}/pt) · closed form ${fmtTime(f.closedMs)} · ${f.points} pts`,
        `n=${f.states} states, ${f.terms} term(s) + references · assembly ${fmtTime(f.assemblyMs)} (excluded) · agree to ${fmtExp(f.check)}`,
      ],
      goal: "≤ 3×",
      met: met(f.ratio <= 3),
    });
  }
  const m = e.vsMathjs;
  rows.push({
    id: "2",
    measure: `mathjs per-frequency LA ÷ engine: ${m.label} (n=${m.states}, m=${m.inputs})`,
    result: `${fmtRatio(m.speedup)} faster`,
    detail: [
      `engine ${fmtTime(m.engineUsPerPoint / 1e3)}/pt · mathjs ${fmtTime(m.mathjsUsPerPoint / 1e3)}/pt · ${m.points} pts`,
      `same numbers: max rel. diff ${fmtExp(m.check)} (needs ≤ 1e-9): ${m.checkPassed ? "pass" : "FAIL"}`,
    ],
    goal: "≥ 30×",
    met: m.checkPassed ? met(m.speedup >= 30) : "check failed",
  });
  const s = e.scaling;
  const pick = s.rows.filter((r) => [2, 8, 16, 24].includes(r.n));
  rows.push({
    id: "3",
    measure: `cost/point vs states (chain of probed oscillators), fit n ≥ ${s.fitFrom}`,
    result: `n^${s.exponent.toFixed(2)}`,
    detail: [
      `R² ${s.r2.toFixed(3)} · ${pick.map((r) => `n=${r.n}: ${fmtTime(r.usPerPoint / 1e3)}`).join(" · ")} per pt`,
      `(times normalised by a fixed loop timed alongside; ${s.points} pts per budget)`,
    ],
    goal: "≤ n^3",
    met: met(s.exponent <= 3),
  });
  return rows;
}

function browserRows(b) {
  return [
    {
      id: "4a",
      measure: `input → chart updated (Vega runAsync resolved, "quietframe-drawn"), ${b.points} pts, ${b.terms} terms`,
      result: `median ${fmtTime(b.chart.median)}`,
      detail: [
        `p95 ${fmtTime(b.chart.p95)} · max ${fmtTime(b.chart.max)} · ${b.moves} moves, ${b.refused} refused · ${fmtRatio(b.chartOverBaseline)} the baseline`,
        `baseline, empty input → rAF: median ${fmtTime(b.baseline.median)} · p95 ${fmtTime(b.baseline.p95)}`,
        b.split
          ? `medians of the parts: wait ${fmtTime(b.split.wait.median)} · model ${fmtTime(b.split.model.median)} · chart (Vega) ${fmtTime(b.split.chart.median)} · after ${fmtTime(b.split.after.median)}`
          : `no in-page breakdown (widget internals renamed?); model alone in Node (computeExplorer): ${fmtTime(b.modelMsNode)}`,
        `page shows the fingerprint Node computes for the final value: ${b.fingerprintMatchesNode ? "yes" : "NO"}`,
      ],
      goal: "median < 16 ms",
      met: met(b.chart.median < 16),
    },
    {
      id: "4b",
      measure: "input → rendering step after the update done (rAF, then a task)",
      result: `median ${fmtTime(b.frame.median)}`,
      detail: [
        `p95 ${fmtTime(b.frame.p95)} · standalone page ${fmtBytes(b.pageBytes)}, load → widget ready ${fmtTime(b.bootMs)}`,
        `input → fingerprint and "ready" published (after the paint): median ${fmtTime(b.settled.median)} · p95 ${fmtTime(b.settled.p95)}`,
      ],
      goal: "",
      met: "",
    },
  ];
}

function notebookRows(n) {
  const sizes = n.executed.map((e) => `${e.widgets}: ${fmtBytes(e.bytes)}`).join(" · ");
  const parts = (p) =>
    p
      ? `html ${fmtBytes(p["text/html"] ?? 0)} (svg ${fmtBytes(p["html: svg fallback"])}, state ${fmtBytes(p["html: state"])}, runtime ${fmtBytes(p["html: runtime"])}) · png ${fmtBytes(p["image/png"] ?? 0)} (base64)`
      : "";
  return [
    {
      id: "5a",
      measure: "saved notebook: bytes added by the first widget",
      result: fmtBytes(n.firstWidgetBytes),
      detail: [`${parts(n.firstParts)}`, `saved files with 0/1/2/10 widgets — ${sizes}`],
      goal: "",
      met: "",
    },
    {
      id: "5b",
      measure: "saved notebook: bytes added by each further widget",
      result: fmtBytes(n.furtherWidgetBytes),
      detail: [`(10 − 1 widgets)/9; 2nd alone ${fmtBytes(n.secondWidgetBytes)} · ${parts(n.furtherParts)}`],
      goal: "",
      met: "",
    },
    {
      id: "5c",
      measure: "cold: kernel start → first widget display_data (jupyter_client)",
      result: fmtTime(n.cold.totalSeconds * 1000),
      detail: [
        `kernel ready ${fmtTime(n.cold.readySeconds * 1000)} · import cell ${fmtTime(n.cold.importSeconds * 1000)} · widget cell → display ${fmtTime(n.cold.firstDisplaySeconds * 1000)}`,
        `nbconvert wall time, 0/1/2/10 widgets: ${n.executed.map((e) => fmtTime(e.nbconvertSeconds * 1000)).join(" / ")}`,
      ],
      goal: "",
      met: "",
    },
  ];
}

// ---------------------------------------------------------------- profiles

async function profiles(selected) {
  const out = {};
  if (selected.includes("engine")) {
    const qf = dist("src/index");
    const { probedFreeMass } = require("./lib/setups");
    const assembled = qf.assemble(qf.loadSetup(probedFreeMass({ mass: 1e-3, power: 0.01, efficiency: 0.9, referTo: "displacement" })));
    const freqs = qf.logGrid({ from: 1, to: 1e4, points: 4096 });
    out["noiseBudget, free mass + probe, 4096 pts"] = await profile(() => qf.noiseBudget(assembled, freqs), { ms: 1500 });
  }
  if (selected.includes("prepared")) {
    const qf = dist("src/index");
    const { SetupPreparer } = dist("src/prepare");
    const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8"));
    const preparer = new SetupPreparer(setup);
    const grid = { from: 1.1e6, to: 1.3e6, points: 256 };
    const values = ["5 K", "6 K", "7 K"];
    let k = 0;
    out["prepared evaluation (SetupPreparer + evaluate), 256 pts"] = await profile(() => qf.evaluate(preparer.prepare({ "membrane.temperature": values[k++ % 3] }), grid).budget.total, { ms: 1500 });
  }
  if (selected.includes("browser")) {
    const { createExplorerState, computeExplorer } = dist("widgets/explorer/model");
    const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane.json"), "utf8"));
    const state = createExplorerState(setup, {
      controls: [{ target: "membrane.temperature", min: "10 mK", max: "300 K" }],
      settings: { grid: { from: "1.1 MHz", to: "1.3 MHz", points: 1000 } },
    });
    const values = ["0.5 K", "7 K", "60 K"];
    let k = 0;
    out["computeExplorer (one widget update), 1000 pts"] = await profile(() => computeExplorer({ ...state, values: { "membrane.temperature": values[k++ % 3] } }), { ms: 1500 });
  }
  return out;
}

// ---------------------------------------------------------------- table

function printTable(rows, header) {
  const cols = [
    ["#", (r) => r.id],
    ["measure", (r) => r.measure],
    ["result", (r) => r.result],
    ["goal", (r) => r.goal],
    ["met", (r) => r.met],
  ];
  const width = cols.map(([name, get]) => Math.max(name.length, ...rows.map((r) => String(get(r)).length)));
  const line = (cells) =>
    cells
      .map((c, i) => String(c).padEnd(width[i]))
      .join("  ")
      .trimEnd();
  const indent = width[0] + 2;
  const rule = "─".repeat(width.reduce((a, b) => a + b + 2, -2));
  console.log(header);
  console.log(rule);
  console.log(line(cols.map(([name]) => name)));
  console.log(rule);
  for (const r of rows) {
    console.log(line(cols.map(([, get]) => get(r))));
    for (const d of [].concat(r.detail ?? [])) if (d) console.log(`${" ".repeat(indent)}  ${d}`);
  }
  console.log(rule);
}

async function main() {
  const args = process.argv.slice(2);
  const unknown = args.filter((a) => !SECTIONS.includes(a));
  if (unknown.length) {
    console.error(`unknown section(s): ${unknown.join(", ")}; choose from ${SECTIONS.join(", ")}`);
    process.exit(2);
  }
  const selected = args.length ? args : SECTIONS;
  const started = new Date();
  const t0 = nowMs();
  const load0 = os.loadavg()[0];
  const log = (s) => console.error(`[bench ${((nowMs() - t0) / 1000).toFixed(0).padStart(3)} s] ${s}`);
  const details = {};
  const rows = [];
  const failures = [];

  const sections = {
    engine: async () => {
      const r = await require("./engine").runEngineBenches(log);
      details.engine = r;
      rows.push(...engineRows(r));
      if (!r.vsMathjs.checkPassed) failures.push("engine and mathjs disagree");
    },
    browser: async () => {
      const r = await require("./browser").runBrowserBench(log);
      details.browser = r;
      rows.push(...browserRows(r));
      if (!r.fingerprintMatchesNode) failures.push("the page's fingerprint differs from Node's");
      if (r.pageErrors.length) failures.push(`page errors: ${r.pageErrors.join("; ")}`);
    },
    notebook: async () => {
      const r = await require("./notebook").runNotebookBench(log);
      details.notebook = r;
      rows.push(...notebookRows(r));
    },
    tolerance: async () => {
      const t = require("./tolerance");
      details.tolerance = await t.runToleranceBench(log);
      rows.push(...t.toleranceRows(details.tolerance));
      if (!details.tolerance.identical) failures.push("tolerance maps differ between runs");
      const c = require("./cell-path");
      details.cellPath = await c.runCellPathBench(log);
      rows.push(...c.cellPathRows(details.cellPath));
      if (!details.cellPath.identical) failures.push("a tolerance cell differs between the prepared and the whole path");
    },
    prepared: async () => {
      const p = require("./prepared");
      details.prepared = await p.runPreparedBench(log);
      rows.push(...p.preparedRows(details.prepared));
      if (!details.prepared.mc.identical) failures.push("Monte Carlo on threads and in this thread differ");
      if (!details.prepared.numpy.rows.every((r) => r.checkPassed)) failures.push("NumPy and the engine disagree");
    },
    kernel: async () => {
      const k = require("./kernel");
      details.kernel = await k.runKernelBench(log);
      rows.push(...k.kernelRows(details.kernel, { fmtRatio, fmtBytes, fmtTime }));
    },
    timedomain: async () => {
      const t = require("./timedomain");
      details.timedomain = await t.runTimeDomainBench(log);
      rows.push(...t.timeDomainRows(details.timedomain));
      if (!details.timedomain.reproducible) failures.push("time-domain runs with the same seed differ");
    },
  };
  for (const name of selected) {
    try {
      await sections[name]();
    } catch (e) {
      failures.push(`${name}: ${e.message}`);
      rows.push({ id: name, measure: `${name} benchmarks did not run`, result: "error", detail: [String(e.message).split("\n")[0]], goal: "", met: "" });
    }
  }
  log("profiles");
  let hot = {};
  try {
    hot = await profiles(selected);
  } catch (e) {
    failures.push(`profile: ${e.message}`);
  }

  const load1 = os.loadavg()[0];
  const cpus = os.cpus();
  const machine = {
    node: process.version,
    cpus: cpus.length,
    cpuModel: cpus[0]?.model ?? "unknown",
    loadAverage1m: { start: load0, end: load1 },
  };
  const version = JSON.parse(readFileSync(join(ROOT, "package.json"), "utf8")).version;
  const header =
    `quietframe ${version} benchmarks · ${started.toISOString().slice(0, 16).replace("T", " ")} UTC · Node ${machine.node} · ` +
    `${machine.cpus} × ${machine.cpuModel.trim()} · load avg (1 min) ${load0.toFixed(1)} → ${load1.toFixed(1)} · ${((nowMs() - t0) / 1000).toFixed(0)} s`;
  console.log("");
  printTable(rows, header);
  for (const [what, entries] of Object.entries(hot)) {
    console.log(`\nself time, ${what}:`);
    for (const e of entries.slice(0, 6)) {
      const at = e.source ? `${e.source}${e.hottest && e.hottest !== e.source ? `, hottest line ${e.hottest}` : ""}` : e.where;
      console.log(`  ${(100 * e.share).toFixed(1).padStart(5)} %  ${e.name}  ${e.source ? at : ""}`.trimEnd());
    }
  }
  if (failures.length) console.log(`\nproblems:\n${failures.map((f) => `  - ${f}`).join("\n")}`);

  const outDir = join(ROOT, "dist", "bench");
  mkdirSync(outDir, { recursive: true });
  const outFile = join(outDir, "latest.json");
  writeFileSync(outFile, JSON.stringify({ generated: started.toISOString(), quietframe: version, machine, sections: selected, table: rows, profiles: hot, details, failures }, null, 2) + "\n");
  console.log(`\nwritten: ${relative(ROOT, outFile)}`);
  process.exitCode = failures.length ? 1 : 0;
}

main().catch((e) => {
  console.error(e);
  process.exitCode = 1;
});
