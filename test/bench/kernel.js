"use strict";
/**
 * 8. The quietframe kernel under a burst of front-end updates.
 *
 * kernel_burst.py (Debian's jupyter_client) shows a live explorer in the built kernel, moves its
 * slider one update at a time (each after the previous idle) as the baseline, then sends a
 * burst as fast as the shell socket takes them and waits for every idle. Reported: updates per
 * second of both and their ratio, the chart recomputations the burst needed (the kernel
 * computes only for the newest value while older ones wait), and the kernel's resident memory
 * before and after. The kernel spec is installed by our own CLI in a private Jupyter prefix.
 */
const { execFile, execFileSync } = require("node:child_process");
const { join } = require("node:path");
const { SYSTEM_PYTHON, privateJupyterDirs } = require("./lib/jupyter-dirs");
const { ROOT } = require("./lib/repo");

const KERNEL = "quietframe-ts";
const BURST = 5000;
const SEQUENTIAL = 300;
const TIMEOUT_MS = 600_000;

/** A private Jupyter prefix with the quietframe kernel installed by `quietframe kernel install --prefix`. */
function privateKernel() {
  const jupyter = privateJupyterDirs("quietframe-bench-kernel-");
  try {
    execFileSync(process.execPath, [join(ROOT, "dist", "src", "cli", "main.js"), "kernel", "install", "--prefix", jupyter.prefix, "--python", SYSTEM_PYTHON], {
      env: jupyter.env,
      stdio: ["ignore", "pipe", "pipe"],
    });
  } catch (e) {
    jupyter.dispose();
    throw new Error(`quietframe kernel install failed: ${e.stderr?.toString() ?? e.message}`);
  }
  return jupyter;
}

async function runKernelBench(log) {
  const jupyter = privateKernel();
  try {
    log(`kernel: ${SEQUENTIAL} updates one at a time, then a burst of ${BURST}`);
    const r = await new Promise((resolve) => {
      execFile(
        SYSTEM_PYTHON,
        [join(__dirname, "kernel_burst.py"), KERNEL, String(BURST), String(SEQUENTIAL)],
        { env: jupyter.env, cwd: ROOT, timeout: TIMEOUT_MS, killSignal: "SIGKILL", maxBuffer: 64 * 1024 * 1024 },
        (error, stdout, stderr) => resolve({ code: error ? (typeof error.code === "number" ? error.code : null) : 0, stdout: String(stdout), stderr: String(stderr) }),
      );
    });
    if (r.code !== 0) throw new Error(`kernel_burst.py failed (exit ${r.code}):\n${r.stderr.slice(-3000)}`);
    const out = JSON.parse(r.stdout.trim().split("\n").pop());
    if (out.answered !== out.burst) throw new Error(`the burst lost messages: ${out.answered} of ${out.burst} updates were echoed`);
    return {
      ...out,
      burstPerSecond: out.burst / out.burstSeconds,
      sequentialPerSecond: out.sequential / out.sequentialSeconds,
    };
  } finally {
    jupyter.dispose();
  }
}

function kernelRows(k, { fmtRatio, fmtBytes, fmtTime }) {
  return [
    {
      id: "8a",
      measure: `kernel: burst of ${k.burst} slider updates ÷ one at a time (updates per second)`,
      result: fmtRatio(k.burstPerSecond / k.sequentialPerSecond),
      detail: [
        `burst ${k.burstPerSecond.toFixed(0)}/s (${fmtTime(k.burstSeconds * 1000)}, ${k.burstMessages} iopub messages, all ${k.answered} echoed) · one at a time ${k.sequentialPerSecond.toFixed(0)}/s (${k.sequential} updates)`,
        `chart recomputations for the burst: ${k.recomputations} of ${k.burst} updates (computed only for the newest waiting value)`,
      ],
      goal: "",
      met: "",
    },
    {
      id: "8b",
      measure: "kernel: resident memory after the burst ÷ before",
      result: fmtRatio(k.rssAfter / k.rssBefore),
      detail: [`VmRSS before ${fmtBytes(k.rssBefore)} · after ${fmtBytes(k.rssAfter)}`],
      goal: "",
      met: "",
    },
  ];
}

module.exports = { runKernelBench, kernelRows };
