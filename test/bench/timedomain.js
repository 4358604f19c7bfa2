"use strict";
/**
 * Time-domain benchmark (built package; nothing here asserts a time):
 *   1. steps per second of a seeded run of a four-mode set-up (four probed oscillators in
 *      one beam: 8 states, 4 thermal inputs, one homodyne record), whole run including the
 *      exact discretization and the stored points;
 *   2. cost per step against the number of modes (1, 2, 4, 8, 12), as ratios to one mode
 *      timed in the same round, in two regimes: while the filter's covariance still
 *      changes (updated every step, O(n³)), and after it has settled (one fixed gain, O(n²)).
 * Rounds rotate the order of the set-ups so that drifts of a shared machine hit all alike,
 * and the per-step costs are CPU time of this process (process.cpuUsage), which other
 * processes on a busy machine inflate much less than wall time; wall time is shown beside.
 */
const { dist } = require("./lib/repo");
const { probeChain } = require("./lib/setups");
const { median, nowMs } = require("./lib/timing");

const qf = dist("src/index");

const MODES = [1, 2, 4, 8, 12];
const STEP = 1e-5; // s; the oscillators are at about 1 kHz
const RUN_STEPS = 200_000;
const SETTLING_STEPS = 2_000;
const SETTLED_STEPS = 100_000;
const ROUNDS = 5;

function request() {
  return { joint: [{ label: "x₁", terms: [{ component: "osc1", quadrature: "x", weight: 1 }] }] };
}

function models() {
  return Object.fromEntries(MODES.map((k) => [k, qf.assemble(qf.loadSetup(probeChain(k))).model]));
}

/** A whole run: set-up (discretization, initial state) and every step, ms. */
function wholeRun(model, steps, seed) {
  const c0 = cpuMs();
  const t0 = nowMs();
  const r = qf.simulateTrajectory(model, { duration: steps * STEP, step: STEP, seed, samples: 2001 }, request());
  return { ms: nowMs() - t0, cpuMs: cpuMs() - c0, result: r };
}

/** CPU time (user + system) of this process, ms. */
function cpuMs() {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e3;
}

function startRun(model, seed) {
  return qf.startTrajectory(model, { duration: 1e7 * STEP, step: STEP, seed, samples: 2001 }, request());
}

/** Step after which the filter of this set-up has settled (bounded search). */
function settlingSteps(model) {
  const run = startRun(model, 1);
  let guard = 0;
  while (run.result().filterSettledAtStep === undefined && guard++ < 50) run.advance(20_000);
  return run.result().filterSettledAtStep;
}

/**
 * Per-step cost while the filter settles and after it has settled, µs. The settling regime
 * is timed on fresh runs (set-up untimed) over their first min(settled − 1, 2000) steps,
 * repeated to at least 20,000 steps in all.
 */
function regimes(model, seed, settledAt) {
  const first = Math.max(1, Math.min(SETTLING_STEPS, (settledAt ?? Infinity) - 1));
  const repeats = Math.ceil(20_000 / first);
  const runs = Array.from({ length: repeats }, (_, i) => startRun(model, seed + i));
  let c0 = cpuMs();
  let t0 = nowMs();
  for (const run of runs) run.advance(first);
  const settlingUs = ((cpuMs() - c0) * 1e3) / (first * repeats);
  const settlingWallUs = ((nowMs() - t0) * 1e3) / (first * repeats);
  const run = runs[0];
  if (settledAt !== undefined) run.advance(settledAt - first);
  c0 = cpuMs();
  t0 = nowMs();
  run.advance(SETTLED_STEPS);
  const settledUs = ((cpuMs() - c0) * 1e3) / SETTLED_STEPS;
  const settledWallUs = ((nowMs() - t0) * 1e3) / SETTLED_STEPS;
  return { settlingUs, settledUs, settlingWallUs, settledWallUs, first };
}

async function runTimeDomainBench(log = () => undefined) {
  const byModes = models();
  log("timedomain: warm-up");
  const settledAt = {};
  for (const k of MODES) {
    settledAt[k] = settlingSteps(byModes[k]);
    wholeRun(byModes[k], 20_000, 1);
    regimes(byModes[k], 1, settledAt[k]);
  }
  const four = [];
  const rounds = [];
  let reproducible = true;
  for (let r = 0; r < ROUNDS; r++) {
    log(`timedomain: round ${r + 1} of ${ROUNDS}`);
    const a = wholeRun(byModes[4], RUN_STEPS, 42);
    four.push(a);
    if (r === 0) {
      const b = wholeRun(byModes[4], RUN_STEPS, 42);
      const bits = (x) => Buffer.from(x.result.joint[0].truth.buffer).toString("hex");
      reproducible = bits(a) === bits(b);
    }
    const round = {};
    const order = MODES.map((_, i) => MODES[(i + r) % MODES.length]);
    for (const k of order) round[k] = regimes(byModes[k], 1000 * (r + 1), settledAt[k]);
    rounds.push(round);
  }
  const rows = MODES.map((k) => ({
    modes: k,
    states: byModes[k].nStates,
    settlingUs: median(rounds.map((r) => r[k].settlingUs)),
    settledUs: median(rounds.map((r) => r[k].settledUs)),
    settlingWallUs: median(rounds.map((r) => r[k].settlingWallUs)),
    settledWallUs: median(rounds.map((r) => r[k].settledWallUs)),
    settlingRatio: median(rounds.map((r) => r[k].settlingUs / r[1].settlingUs)),
    settledRatio: median(rounds.map((r) => r[k].settledUs / r[1].settledUs)),
    settledAtStep: settledAt[k],
    settlingTimed: rounds[0][k].first,
  }));
  const fourMs = median(four.map((a) => a.ms));
  const fourCpuMs = median(four.map((a) => a.cpuMs));
  return {
    step: STEP,
    runSteps: RUN_STEPS,
    fourModeMs: fourMs,
    fourModeCpuMs: fourCpuMs,
    fourModeStepsPerSecond: RUN_STEPS / (fourCpuMs / 1e3),
    fourModeStepsPerWallSecond: RUN_STEPS / (fourMs / 1e3),
    loadAverage1m: require("node:os").loadavg()[0],
    reproducible,
    rows,
  };
}

// ---------------------------------------------------------------- rows of the bench table

function fmtUs(us) {
  return us >= 1000 ? `${(us / 1000).toFixed(2)} ms` : us >= 1 ? `${us.toFixed(us >= 100 ? 0 : 2)} µs` : `${(us * 1e3).toFixed(0)} ns`;
}

function timeDomainRows(t) {
  const ratio = (x) => `${x.toFixed(x >= 10 ? 1 : 2)}×`;
  const big = t.rows[t.rows.length - 1];
  return [
    {
      id: "7a",
      measure: `seeded run, four probed oscillators (8 states), ${t.runSteps} steps of ${t.step} s, 2001 stored points`,
      result: `${Math.round(t.fourModeStepsPerSecond).toLocaleString("en-US")} steps/s (CPU)`,
      detail: [
        `whole run ${(t.fourModeCpuMs / 1e3).toFixed(2)} s CPU, ${(t.fourModeMs / 1e3).toFixed(2)} s wall (${Math.round(t.fourModeStepsPerWallSecond).toLocaleString("en-US")} steps/s; medians of ${ROUNDS} rounds; load avg ${t.loadAverage1m.toFixed(1)})`,
        `discretization, initial state and stored points included · same bits twice: ${t.reproducible ? "yes" : "NO"}`,
      ],
      goal: "",
      met: "",
    },
    {
      id: "7b",
      measure: `CPU cost per step vs modes (${t.rows.map((r) => r.modes).join(", ")}), ratio to one mode, filter settling / settled`,
      result: `${big.modes} modes: ${ratio(big.settlingRatio)} / ${ratio(big.settledRatio)}`,
      detail: t.rows.map(
        (r) =>
          `${String(r.modes).padStart(2)} mode(s), n=${String(r.states).padStart(2)}: settling ${fmtUs(r.settlingUs)} (${ratio(r.settlingRatio)}, first ${r.settlingTimed} steps; wall ${fmtUs(r.settlingWallUs)}) · settled ${fmtUs(r.settledUs)} (${ratio(r.settledRatio)}; wall ${fmtUs(r.settledWallUs)})` +
          (r.settledAtStep === undefined ? " · filter not settled within 1e6 steps" : ` · filter settled after ${r.settledAtStep} steps`),
      ),
      goal: "",
      met: "",
    },
  ];
}

module.exports = { runTimeDomainBench, timeDomainRows };

if (require.main === module) {
  const t0 = nowMs();
  runTimeDomainBench((s) => console.error(s)).then((r) => {
    console.log(JSON.stringify(r, null, 2));
    console.log(
      timeDomainRows(r)
        .map((row) => [row.measure, row.result, ...row.detail].join("\n  "))
        .join("\n"),
    );
    console.error(`${((nowMs() - t0) / 1000).toFixed(1)} s`);
  });
}
