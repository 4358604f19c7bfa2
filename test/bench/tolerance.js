"use strict";
/**
 * Tolerance-map benchmark (built package): a 100 × 100 map of the squeezed cryogenic membrane
 * (squeezing × cavity input coupling, margin at 1.16 MHz), 256 frequencies per cell, computed
 * on every core (worker threads) and on one (in-process, `workers: 1`), in alternating order.
 *
 *   - parallel speed-up, both sides warm: one-core time over the time on a TolerancePool of
 *     every core, started and warmed up (one small map) before the timed maps, paired within
 *     each round;
 *   - the same with workers started for each map (cold threads, what `toleranceMap` without
 *     a pool does);
 *   - per-cell cost: one-core time per cell over one `loadSetup` + `evaluateSetup` of a cell
 *     on the same grid, the baseline timed in the same run just before each map;
 *   - the same against the map on one fresh worker thread (which, like each of the workers,
 *     starts cold, where the in-process run has been warmed up by the runs before it);
 *   - the machine's parallel ceiling at that moment (a fixed loop on all threads vs one),
 *     measured in every round, and the map's speed-up as a share of it;
 *   - fixed cost of starting the workers: a 2 × 2 map with all workers over the same in-process;
 *   - CPU time of the process for each map (all threads), so that a shared, busy machine shows
 *     as wall time well above CPU time rather than as a slow engine.
 * Every run must give the same bits; nothing here asserts a time.
 */
const os = require("node:os");
const { Worker } = require("node:worker_threads");
const { readFileSync } = require("node:fs");
const { join } = require("node:path");
const { ROOT, dist } = require("./lib/repo");
const { calibrate, median, nowMs, sample } = require("./lib/timing");

const qf = dist("src/index");
// Internal pieces, to time one fresh worker thread (toleranceMap runs `workers: 1` in-process).
const { resolveToleranceSpec } = dist("src/tolerance/spec");
const { runRowsInWorkers } = dist("src/tolerance/parallel");

const SIZE = 100;
const POINTS = 256;
const ROUNDS = 3;

function spec(size) {
  return {
    x: { target: "squeezer.squeezing", from: "-15 dB", to: "0 dB", points: size },
    y: { target: "cavity.inputCoupling", from: "50 %", to: "100 %", points: size },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: POINTS },
    figure: { kind: "margin-at", frequency: "1.16 MHz" },
  };
}

function sameBits(a, b) {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
}

/** ms per loadSetup + evaluateSetup of one cell's set-up (the middle of the map) on the map's grid. */
function baselineSampler(setup, map) {
  const cell = qf.toleranceCellSetup(setup, map, map.x.written.length >> 1, map.y.written.length >> 1);
  const grid = { from: 1.1e6, to: 1.3e6, points: POINTS };
  let sink = 0;
  const once = () => {
    sink += qf.evaluateSetup(qf.loadSetup(cell), grid).budget.total[7];
  };
  const until = nowMs() + 300;
  while (nowMs() < until) once();
  const reps = calibrate(once, 25);
  return () => {
    const ms = median(Array.from({ length: 7 }, () => sample(once, reps)));
    if (!Number.isFinite(sink)) throw new Error("unreachable");
    return ms;
  };
}

/** The map on a single fresh worker thread: the same start-up and warm-up as each of several workers. */
async function oneWorkerThread(setup, s) {
  const started = performance.now();
  const { plan, figure } = resolveToleranceSpec(setup, s);
  return (await runRowsInWorkers(plan, 1, {})).finish(plan, figure, started, 1);
}

/** Wall time and CPU time of the whole process (every thread, workers included) of one map. */
async function timedMap(setup, s, workers, oneThread = false, pool = undefined) {
  const cpu0 = process.cpuUsage();
  const t0 = nowMs();
  const map = oneThread ? await oneWorkerThread(setup, s) : await qf.toleranceMap(setup, s, pool ? { pool } : { workers });
  const ms = nowMs() - t0;
  const cpu = process.cpuUsage(cpu0);
  return { ms, cpuMs: (cpu.user + cpu.system) / 1e3, map };
}

/**
 * What parallelism the machine offers right now: a fixed arithmetic loop (no allocation, no
 * engine code) on one worker, then the same loop on `threads` workers at once, each doing
 * the full amount. Returns threads × t(1) / t(threads): the speed-up a perfectly parallel
 * job could get at this moment (other processes on a shared machine lower it).
 */
const PROBE = `
const { parentPort, workerData } = require("node:worker_threads");
const a = new Float64Array(4096).fill(1.000001);
parentPort.on("message", () => {
  let s = 0;
  for (let r = 0; r < workerData.reps; r++) for (let i = 0; i < 4096; i++) s += a[i] * a[(i * 7) & 4095];
  parentPort.postMessage(s);
});`;

async function parallelCeiling(threads, reps = 40000) {
  const pool = Array.from({ length: threads }, () => new Worker(PROBE, { eval: true, workerData: { reps } }));
  const runOn = async (workers) => {
    const t0 = nowMs();
    await Promise.all(
      workers.map(
        (w) =>
          new Promise((resolve) => {
            w.once("message", resolve);
            w.postMessage(0);
          }),
      ),
    );
    return nowMs() - t0;
  };
  try {
    await runOn(pool); // warm-up: every worker compiles the loop
    const ratios = [];
    for (let k = 0; k < 3; k++) {
      const one = await runOn(pool.slice(0, 1));
      const all = await runOn(pool);
      ratios.push((threads * one) / all);
    }
    return median(ratios);
  } finally {
    await Promise.all(pool.map((w) => w.terminate()));
  }
}

async function runToleranceBench(log = () => undefined) {
  const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8"));
  const cores = os.availableParallelism();
  const load0 = os.loadavg()[0];

  log("tolerance: warm-up and start-up cost");
  const small = spec(2);
  await timedMap(setup, spec(12), 1); // JIT of the main thread
  const startup = [];
  for (let r = 0; r < 3; r++) {
    const inProcess = await timedMap(setup, small, 1);
    const threads = await timedMap(setup, small, cores);
    startup.push(threads.ms - inProcess.ms);
  }
  const baseline = baselineSampler(setup, (await timedMap(setup, small, 1)).map);
  // The warm pool: threads started and the engine compiled in them before any timed map,
  // with about as many cells per thread as the main thread has run by now (maps, baseline).
  const pool = await qf.TolerancePool.start(cores);
  await timedMap(setup, spec(12), cores, false, pool);
  await timedMap(setup, spec(40), cores, false, pool);

  const s = spec(SIZE);
  const cells = SIZE * SIZE;
  const rounds = [];
  let reference;
  let identical = true;
  try {
    for (let r = 0; r < ROUNDS; r++) {
      const kinds = ["one", "pool", "all", "thread"];
      const order = kinds.map((_, k) => kinds[(k + r) % kinds.length]);
      const round = { ceiling: await parallelCeiling(cores) };
      for (const kind of order) {
        const workers = kind === "all" || kind === "pool" ? cores : 1;
        const baseMs = baseline();
        const what = { one: "one core (in-process)", pool: `warm pool of ${cores} workers`, all: `${cores} fresh workers`, thread: "one fresh worker thread" }[kind];
        log(`tolerance: ${SIZE}×${SIZE} map, ${what} (round ${r + 1} of ${ROUNDS})`);
        const { ms, cpuMs, map } = await timedMap(setup, s, workers, kind === "thread", kind === "pool" ? pool : undefined);
        if (!reference) reference = map;
        identical = identical && sameBits(map.values, reference.values) && sameBits(map.status, reference.status);
        round[kind] = { ms, cpuMs, baseMs, workers: map.workers };
      }
      rounds.push(round);
    }
  } finally {
    await pool.close();
  }
  const speedup = median(rounds.map((r) => r.one.ms / r.pool.ms));
  const coldSpeedup = median(rounds.map((r) => r.one.ms / r.all.ms));
  const threadSpeedup = median(rounds.map((r) => r.thread.ms / r.all.ms));
  const ceiling = median(rounds.map((r) => r.ceiling));
  const ofCeiling = median(rounds.map((r) => r.one.ms / r.pool.ms / r.ceiling));
  const perCellRatio = median(rounds.map((r) => r.one.ms / cells / r.one.baseMs));
  return {
    size: SIZE,
    cells,
    points: POINTS,
    cores,
    workers: rounds[0].all.workers,
    oneCoreMs: median(rounds.map((r) => r.one.ms)),
    poolMs: median(rounds.map((r) => r.pool.ms)),
    allCoresMs: median(rounds.map((r) => r.all.ms)),
    coldSpeedup,
    oneThreadMs: median(rounds.map((r) => r.thread.ms)),
    threadSpeedup,
    oneCoreCpuMs: median(rounds.map((r) => r.one.cpuMs)),
    allCoresCpuMs: median(rounds.map((r) => r.all.cpuMs)),
    poolCpuMs: median(rounds.map((r) => r.pool.cpuMs)),
    baselineMs: median(rounds.flatMap((r) => [r.one.baseMs, r.pool.baseMs, r.all.baseMs])),
    speedup,
    efficiency: speedup / rounds[0].all.workers,
    ceiling,
    ofCeiling,
    perCellRatio,
    startupMs: median(startup),
    counts: reference.counts,
    identical,
    rounds,
    loadAverage1m: { start: load0, end: os.loadavg()[0] },
  };
}

// ---------------------------------------------------------------- rows of the bench table

function fmtMs(ms) {
  return ms >= 1000 ? `${(ms / 1000).toFixed(2)} s` : ms >= 1 ? `${ms.toFixed(ms >= 100 ? 0 : 1)} ms` : `${(ms * 1e3).toFixed(0)} µs`;
}

function toleranceRows(t) {
  const ratio = (x) => `${x.toFixed(2)}×`;
  const goal = 0.75 * t.workers;
  return [
    {
      id: "6a",
      measure: `tolerance map ${t.size}×${t.size} set-ups × ${t.points} pts: warm pool of ${t.workers} workers vs one core (in-process, warm)`,
      result: `${ratio(t.speedup)} faster`,
      detail: [
        `warm pool ${fmtMs(t.poolMs)} · one core ${fmtMs(t.oneCoreMs)} (medians of ${t.rounds.length} alternating rounds) · ${fmtMs(t.poolMs / t.cells)}/cell on the pool`,
        `workers started for the map (cold): ${fmtMs(t.allCoresMs)}, ${ratio(t.coldSpeedup)} faster than one core`,
        `the machine's ceiling now (a fixed loop on ${t.workers} threads vs 1, same rounds): ${ratio(t.ceiling)} · the map reaches ${(100 * t.ofCeiling).toFixed(0)} % of it`,
        `against one fresh worker thread (${fmtMs(t.oneThreadMs)}; cold like each of the ${t.workers}, where the in-process run is warm): ${ratio(t.threadSpeedup)} faster`,
        `efficiency ${(100 * t.efficiency).toFixed(0)} % of ${t.workers} cores · starting the workers costs ${fmtMs(t.startupMs)} · load avg (1 min) ${t.loadAverage1m.start.toFixed(1)} → ${t.loadAverage1m.end.toFixed(1)}`,
        `CPU time of the process (all threads): warm pool ${fmtMs(t.poolCpuMs)} · cold workers ${fmtMs(t.allCoresCpuMs)} · one core ${fmtMs(t.oneCoreCpuMs)} (wall ÷ CPU on one core ${(t.oneCoreMs / t.oneCoreCpuMs).toFixed(2)}: above 1 means other load took the CPU)`,
        `same bits on every run: ${t.identical ? "yes" : "NO"} · cells ok/unstable/invalid ${t.counts.ok}/${t.counts.unstable}/${t.counts.invalid}`,
      ],
      goal: `≥ ${goal.toFixed(1)}×`,
      met: t.identical ? (t.speedup >= goal ? "yes" : "NO") : "bits differ",
    },
    {
      id: "6b",
      measure: "tolerance map cost per cell (one core) ÷ one loadSetup + evaluateSetup of a cell",
      result: ratio(t.perCellRatio),
      detail: [`baseline ${fmtMs(t.baselineMs)} per set-up (${t.points} pts, timed before each map) · map ${fmtMs(t.oneCoreMs / t.cells)} per cell`],
      goal: "≤ 1.1×",
      met: t.perCellRatio <= 1.1 ? "yes" : "NO",
    },
  ];
}

module.exports = { runToleranceBench, toleranceRows, parallelCeiling };

if (require.main === module) {
  const t0 = nowMs();
  runToleranceBench((s) => console.error(s)).then((r) => {
    console.log(JSON.stringify(r, null, 2));
    console.error(`${((nowMs() - t0) / 1000).toFixed(1)} s`);
  });
}
