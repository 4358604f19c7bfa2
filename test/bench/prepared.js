"use strict";
/**
 * Benchmarks of one prepared evaluation and what is built on it (built package):
 *   7a. one prepared evaluation (values written in, model assembled, stability and uncertainty
 *       relation checked, budget at 256 points) of every example: the fast way (SetupPreparer:
 *       validated once, values written into the validated set-up) against the plain way
 *       (prepare(description, values)), interleaved; optionally against an older build too
 *       (QUIETFRAME_BASELINE_DIST=<its dist folder>), which measures "before" in the same run;
 *       timed by the wall clock and again by the process's CPU time (on a shared machine the
 *       wall clock also counts the time spent waiting for a core), with the load average;
 *   7b. a 100,000-sample Monte Carlo of cryogenic-membrane-squeezed.json at 256 frequencies on
 *       a warm pool of worker threads (every core; warmed by a smaller spread), beside fresh
 *       threads and this thread, in rounds that rotate the order, with the same bits;
 *   7c. the same state-space algebra as a NumPy script (numpy.linalg.solve batched over the
 *       frequencies) against the engine's budget, after checking that their numbers agree.
 * Nothing here asserts a time.
 */
const os = require("node:os");
const { execFileSync } = require("node:child_process");
const { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync } = require("node:fs");
const { join, resolve } = require("node:path");
const { ROOT, dist } = require("./lib/repo");
const { compare, maxRelDiff, median, nowMs } = require("./lib/timing");
const { parallelCeiling } = require("./tolerance");

const qf = dist("src/node");
const { SetupPreparer } = dist("src/prepare");
const { numericParameters, exactText, withinBounds } = dist("src/design/parameters");

const POINTS = 256;
const MC_SAMPLES = 100_000;
/** Agreement asked of NumPy and the engine (both solve the same systems in double precision, by different LU codes). */
const NUMPY_TOLERANCE = 1e-9;

function examples() {
  return readdirSync(join(ROOT, "examples"))
    .filter((f) => f.endsWith(".json"))
    .map((file) => ({ file, setup: JSON.parse(readFileSync(join(ROOT, "examples", file), "utf8")) }));
}

function gridOf(setup) {
  const g = qf.loadSetup(setup).grid;
  return { from: g?.from ?? 1, to: g?.to ?? 1e5, points: POINTS };
}

const SCALES = [0.9, 1, 1.1];

/** Three value sets of the example's first temperature (else the first parameter that stays in range): 0.9, 1 and 1.1 times its value, written exactly. */
function valueSets(setup) {
  const params = numericParameters(qf.loadSetup(setup)).filter((x) => x.value !== 0 && SCALES.every((k) => withinBounds(x, x.value * k)));
  const p = params.find((x) => x.param === "temperature") ?? params[0];
  return SCALES.map((k) => ({ [p.target]: exactText(p.value * k, p) }));
}

/** Reads every number an evaluation holds (total, terms, references), so lazy parts are paid for. */
function readAll(evaluation) {
  const b = evaluation.budget;
  let s = b.total[3];
  for (const t of b.terms) s += t.psd[3];
  for (const r of b.references) s += r.psd[3];
  return s;
}

// ---------------------------------------------------------------- 7a

/** CPU milliseconds (user + system) of this process so far. */
function cpuMs() {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e3;
}

/**
 * The candidates again, interleaved as compare does, timed by this process's CPU time: on a
 * machine shared with other jobs, time spent waiting for a core counts in the wall clock but
 * not here. Returns the median CPU ms per call of each, with the repetitions compare calibrated.
 */
function cpuCompare(candidates, timed, rounds = 15) {
  const names = Object.keys(candidates);
  const samples = Object.fromEntries(names.map((n) => [n, []]));
  for (let r = 0; r < rounds; r++) {
    for (let k = 0; k < names.length; k++) {
      const name = names[(r + k) % names.length];
      const reps = timed[name].reps;
      const t0 = cpuMs();
      for (let i = 0; i < reps; i++) candidates[name]();
      samples[name].push((cpuMs() - t0) / reps);
    }
  }
  return Object.fromEntries(names.map((n) => [n, median(samples[n])]));
}

/** The error fn throws, or undefined. */
function refusalOf(fn) {
  try {
    fn();
    return undefined;
  } catch (e) {
    return e;
  }
}

function preparedEvaluation() {
  const baselineDir = process.env.QUIETFRAME_BASELINE_DIST;
  const old = baselineDir ? require(resolve(baselineDir, "src", "index.js")) : undefined;
  const rows = [];
  const load0 = os.loadavg()[0];
  for (const { file, setup } of examples()) {
    const grid = gridOf(setup);
    const values = valueSets(setup);
    const preparer = new SetupPreparer(setup);
    let k = 0;
    let sink = 0;
    const candidates = {
      plain: () => {
        sink += readAll(qf.evaluate(qf.prepare(setup, values[k++ % 3]), grid));
      },
      fast: () => {
        sink += readAll(qf.evaluate(preparer.prepare(values[k++ % 3]), grid));
      },
      fastTotal: () => {
        sink += qf.evaluate(preparer.prepare(values[k++ % 3]), grid).budget.total[3];
      },
    };
    // The older build may refuse an example written in a later format (a field it does not know).
    if (old && refusalOf(() => old.evaluate(old.prepare(setup, values[0]), grid)) === undefined) {
      candidates.before = () => {
        sink += readAll(old.evaluate(old.prepare(setup, values[k++ % 3]), grid));
      };
    }
    const t = compare(candidates, { rounds: 15, sampleMs: 20 });
    const cpu = cpuCompare(candidates, t);
    if (!Number.isFinite(sink)) throw new Error("unreachable");
    const timedBefore = candidates.before !== undefined;
    rows.push({
      file,
      plainUs: t.plain.ms * 1e3,
      fastUs: t.fast.ms * 1e3,
      fastTotalUs: t.fastTotal.ms * 1e3,
      speedup: 1 / t.fast.ratio,
      totalOnlySpeedup: 1 / t.fastTotal.ratio,
      beforeUs: timedBefore ? t.before.ms * 1e3 : undefined,
      speedupOverBefore: timedBefore ? t.before.ms / t.fast.ms : undefined,
      // The older build computes every reference curve whether read or not.
      totalOnlyOverBefore: timedBefore ? t.before.ms / t.fastTotal.ms : undefined,
      refusedByBefore: old !== undefined && !timedBefore,
      cpu: { fastUs: cpu.fast * 1e3, fastTotalUs: cpu.fastTotal * 1e3, beforeUs: timedBefore ? cpu.before * 1e3 : undefined },
    });
  }
  return { points: POINTS, baseline: baselineDir ? "QUIETFRAME_BASELINE_DIST" : undefined, rows, loadAverage1m: { start: load0, end: os.loadavg()[0] } };
}

// ---------------------------------------------------------------- 7b

const MC_FIGURE = { kind: "margin-at", frequency: "1.16 MHz" };
const MC_UNCERTAIN = [
  { target: "squeezer.squeezing", value: "-10 dB ± 1 dB" },
  { target: "squeezer.angle", value: "60 deg ± 2 deg" },
  { target: "membrane.temperature", value: "6 K ± 0.5 K" },
  { target: "membrane.mass", value: "5 ng ± 0.2 ng" },
  { target: "cavity.inputCoupling", value: "95 % ± 1 %" },
];

function sameBits(a, b) {
  return Buffer.from(a.buffer, a.byteOffset, a.byteLength).equals(Buffer.from(b.buffer, b.byteOffset, b.byteLength));
}

/** Samples of the smaller spread that warms the pool: several thousand per thread, past the engine's compilation. */
const MC_WARM_SAMPLES_PER_THREAD = 5000;

/** CPU time of the process (user + system, ms) since `from` (a process.cpuUsage() reading). */
function cpuSince(from) {
  const u = process.cpuUsage(from);
  return (u.user + u.system) / 1e3;
}

/** One timed spread: wall-clock and process CPU milliseconds, and the result. */
async function timedSpread(run) {
  const cpu0 = process.cpuUsage();
  const t0 = nowMs();
  const result = await run();
  return { ms: nowMs() - t0, cpuMs: cpuSince(cpu0), result };
}

/** True when two spreads agree bit for bit: every sample's figure, the bands, the statistics. */
function sameSpread(a, b) {
  return (
    sameBits(a.values, b.values) &&
    ["p5", "median", "p95"].every((k) => sameBits(a.bands[k], b.bands[k])) &&
    JSON.stringify([a.distribution, a.failed, a.probability]) === JSON.stringify([b.distribution, b.failed, b.probability])
  );
}

/** The three ways of running the spread, in the order of the first round; each round starts one later (load drifts on a shared machine). */
const MC_KINDS = ["pool", "fresh", "one"];
const MC_ROUNDS = 3;

async function monteCarlo(log) {
  const setup = JSON.parse(readFileSync(join(ROOT, "examples", "cryogenic-membrane-squeezed.json"), "utf8"));
  const cores = os.availableParallelism();
  const options = { samples: MC_SAMPLES, seed: 1, grid: { from: "1.1 MHz", to: "1.3 MHz", points: POINTS }, target: "2 dB" };
  const load0 = os.loadavg()[0];
  // Warm-up of this thread's code, and of the pool's threads by a smaller spread (as the map bench warms its pool).
  qf.spreadAnalysis(setup, MC_FIGURE, MC_UNCERTAIN, { ...options, samples: 2000 });
  log(`monte carlo: warm pool of ${cores} worker threads, warmed by ${MC_WARM_SAMPLES_PER_THREAD * cores} samples`);
  const pool = await qf.TolerancePool.start(cores);
  const runs = {
    pool: () => qf.spreadAnalysisOnThreads(setup, MC_FIGURE, MC_UNCERTAIN, { ...options, pool }),
    fresh: () => qf.spreadAnalysisOnThreads(setup, MC_FIGURE, MC_UNCERTAIN, { ...options, workers: cores }),
    one: async () => qf.spreadAnalysis(setup, MC_FIGURE, MC_UNCERTAIN, options),
  };
  const rounds = [];
  let reference;
  let identical = true;
  try {
    await qf.spreadAnalysisOnThreads(setup, MC_FIGURE, MC_UNCERTAIN, { ...options, samples: MC_WARM_SAMPLES_PER_THREAD * cores, seed: 2, pool });
    for (let r = 0; r < MC_ROUNDS; r++) {
      const round = { ceiling: await parallelCeiling(cores) };
      for (let k = 0; k < MC_KINDS.length; k++) {
        const kind = MC_KINDS[(r + k) % MC_KINDS.length];
        log(`monte carlo, round ${r + 1} of ${MC_ROUNDS}: ${MC_SAMPLES} samples, ${kind}`);
        const { ms, cpuMs, result } = await timedSpread(runs[kind]);
        reference ??= result;
        identical &&= sameSpread(result, reference);
        round[kind] = { ms, cpuMs };
      }
      rounds.push(round);
    }
  } finally {
    await pool.close();
  }
  const med = (kind, field) => median(rounds.map((r) => r[kind][field]));
  return {
    samples: MC_SAMPLES,
    points: POINTS,
    cores,
    rounds,
    poolMs: med("pool", "ms"),
    threadedMs: med("fresh", "ms"),
    oneMs: med("one", "ms"),
    poolCpuMs: med("pool", "cpuMs"),
    threadedCpuMs: med("fresh", "cpuMs"),
    oneCpuMs: med("one", "cpuMs"),
    speedup: median(rounds.map((r) => r.one.ms / r.pool.ms)),
    overFresh: median(rounds.map((r) => r.fresh.ms / r.pool.ms)),
    ceiling: median(rounds.map((r) => r.ceiling)),
    failed: reference.failed,
    identical,
    loadAverage1m: { start: load0, end: os.loadavg()[0] },
  };
}

// ---------------------------------------------------------------- 7c

/** The model and everything the NumPy script needs, as plain JSON. */
function exportModel(assembled, frequencies) {
  const m = assembled.model;
  const factors = Array.from(frequencies, (f) => assembled.referredTo.psdFactor(2 * Math.PI * f));
  const list = (a) => Array.from(a);
  return {
    nStates: m.nStates,
    nInputs: m.nInputs,
    readoutRows: assembled.readoutRows,
    A: list(m.A),
    B: list(m.B),
    C: list(m.C),
    D: list(m.D),
    N: list(m.N),
    signalB: list(m.signalB),
    signalD: list(m.signalD),
    frequencies: list(frequencies),
    factors,
    classical: (m.classicalInputs ?? []).map((c) => ({ column: c.column, psd: Array.from(frequencies, (f) => c.psdAt(f)) })),
  };
}

function againstNumpy(log) {
  const python = "/usr/bin/python3";
  const script = join(__dirname, "numpy_budget.py");
  const dir = mkdtempSync(join(os.tmpdir(), "quietframe-numpy-"));
  const rows = [];
  try {
    for (const { file, setup } of examples()) {
      log(`numpy: ${file}`);
      const assembled = qf.prepare(setup).assembled;
      const frequencies = qf.logGrid(gridOf(setup));
      const path = join(dir, "model.json");
      writeFileSync(path, JSON.stringify(exportModel(assembled, frequencies)));
      const out = JSON.parse(execFileSync(python, [script, path], { encoding: "utf8", maxBuffer: 1 << 26, stdio: ["ignore", "pipe", "ignore"] }));
      const engineTotal = qf.noiseBudget(assembled, frequencies).total;
      const check = maxRelDiff(
        engineTotal,
        Float64Array.from(out.total, (v) => (v === null ? Infinity : v)),
      );
      let sink = 0;
      const t = compare(
        {
          engine: () => {
            sink += qf.noiseBudget(assembled, frequencies).total[3];
          },
        },
        { rounds: 9, sampleMs: 20 },
      );
      if (!Number.isFinite(sink)) throw new Error("unreachable");
      rows.push({ file, numpy: out.numpy, numpyUs: out.seconds * 1e6, engineUs: t.engine.ms * 1e3, ratio: (out.seconds * 1e3) / t.engine.ms, check, checkPassed: check <= NUMPY_TOLERANCE });
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
  return { points: POINTS, tolerance: NUMPY_TOLERANCE, rows };
}

async function runPreparedBench(log = () => undefined) {
  log("prepared evaluation: fast and plain way, every example");
  const prepared = preparedEvaluation();
  const numpy = againstNumpy(log);
  const mc = await monteCarlo(log);
  return { prepared, mc, numpy };
}

// ---------------------------------------------------------------- rows of the bench table

function fmtUs(us) {
  return us >= 1000 ? `${(us / 1000).toFixed(2)} ms` : `${us.toFixed(us >= 100 ? 0 : 1)} µs`;
}

function preparedRows(r) {
  const x = (v) => `${v.toFixed(2)}×`;
  const p = r.prepared;
  const low = Math.min(...p.rows.map((e) => e.speedup));
  const timedBefore = p.rows.filter((e) => e.speedupOverBefore !== undefined);
  const before = timedBefore.length > 0 ? Math.min(...timedBefore.map((e) => e.speedupOverBefore)) : undefined;
  const cpuBefore = timedBefore.length > 0 ? Math.min(...timedBefore.map((e) => e.cpu.beforeUs / e.cpu.fastUs)) : undefined;
  const cpuBeforeTotal = timedBefore.length > 0 ? Math.min(...timedBefore.map((e) => e.cpu.beforeUs / e.cpu.fastTotalUs)) : undefined;
  const mc = r.mc;
  const worstNumpy = Math.max(...r.numpy.rows.map((e) => e.check));
  const numpyOk = r.numpy.rows.every((e) => e.checkPassed);
  return [
    {
      id: "7a",
      measure:
        `one prepared evaluation (values written in, checks, budget at ${p.points} pts, every number read): SetupPreparer` +
        (before === undefined ? " vs prepare(description, values)" : " vs the older build"),
      result: `${x(before ?? low)} faster (least over the examples${before === undefined ? "" : " the older build reads"})`,
      detail: [
        ...p.rows.map(
          (e) =>
            `${e.file}: fast ${fmtUs(e.fastUs)} · plain ${fmtUs(e.plainUs)} (${x(e.speedup)}) · total only ${fmtUs(e.fastTotalUs)} (${x(e.totalOnlySpeedup)})` +
            (e.beforeUs === undefined ? "" : ` · older build ${fmtUs(e.beforeUs)} (${x(e.speedupOverBefore)}; total only ${x(e.totalOnlyOverBefore)})`) +
            (e.refusedByBefore ? " · the older build refuses this example (a later format)" : "") +
            ` · by CPU time: fast ${fmtUs(e.cpu.fastUs)}, total only ${fmtUs(e.cpu.fastTotalUs)}` +
            (e.cpu.beforeUs === undefined ? "" : `, older build ${fmtUs(e.cpu.beforeUs)} (${x(e.cpu.beforeUs / e.cpu.fastUs)}; total only ${x(e.cpu.beforeUs / e.cpu.fastTotalUs)})`),
        ),
        `load avg (1 min) ${p.loadAverage1m.start.toFixed(1)} → ${p.loadAverage1m.end.toFixed(1)} on ${os.availableParallelism()} cores` +
          (cpuBefore === undefined ? "" : ` · by CPU time, at least ${x(cpuBefore)} faster than the older build (total only ${x(cpuBeforeTotal)})`),
        before === undefined
          ? "set QUIETFRAME_BASELINE_DIST to an older build's dist folder to time it in the same run (the goal is against it)"
          : `fast vs plain way in this build: at least ${x(low)}; "total only" reads no reference curve (what noise bands and maps read)`,
      ],
      goal: before === undefined ? "" : "≥ 3×",
      met: before === undefined ? "" : before >= 3 ? "yes" : "NO",
    },
    {
      id: "7b",
      measure: `Monte Carlo, ${mc.samples.toLocaleString("en")} samples × ${mc.points} pts (cryogenic-membrane-squeezed): warm pool of ${mc.cores} worker threads vs this thread (medians of ${mc.rounds.length} rounds)`,
      result: `${(mc.poolMs / 1000).toFixed(2)} s (${Math.round(mc.samples / (mc.poolMs / 1000)).toLocaleString("en")} samples/s)`,
      detail: [
        `${mc.cores} fresh threads ${(mc.threadedMs / 1000).toFixed(2)} s · one thread ${(mc.oneMs / 1000).toFixed(2)} s (${Math.round(mc.samples / (mc.oneMs / 1000)).toLocaleString("en")} samples/s) · pool ${x(mc.speedup)} faster than one thread, ${x(mc.overFresh)} than fresh threads (medians of the rounds' ratios) · the machine's ceiling (median of the rounds) (a fixed loop on ${mc.cores} threads vs 1): ${x(mc.ceiling)}`,
        `rounds (pool / fresh / one thread): ${mc.rounds.map((r) => [r.pool, r.fresh, r.one].map((e) => (e.ms / 1000).toFixed(1)).join(" / ")).join(" · ")} s`,
        `CPU time of the process: pool ${(mc.poolCpuMs / 1000).toFixed(2)} s · fresh threads ${(mc.threadedCpuMs / 1000).toFixed(2)} s · one thread ${(mc.oneCpuMs / 1000).toFixed(2)} s · load avg (1 min) ${mc.loadAverage1m.start.toFixed(1)} → ${mc.loadAverage1m.end.toFixed(1)}`,
        `same bits on the pool, on fresh threads and in this thread: ${mc.identical ? "yes" : "NO"} · samples without a value: ${mc.failed.unstable + mc.failed.invalid}`,
      ],
      goal: "≤ 5 s",
      met: mc.identical ? (mc.poolMs <= 5000 ? "yes" : "NO") : "bits differ",
    },
    {
      id: "7c",
      measure: `NumPy (numpy.linalg.solve batched over ${r.numpy.points} frequencies) ÷ engine budget, same model`,
      result: `${x(median(r.numpy.rows.map((e) => e.ratio)))} (median over the examples)`,
      detail: [
        ...r.numpy.rows.map((e) => `${e.file}: NumPy ${fmtUs(e.numpyUs)} · engine ${fmtUs(e.engineUs)} (all terms and the total) · ${x(e.ratio)}`),
        `NumPy ${r.numpy.rows[0]?.numpy} · totals agree to ${worstNumpy.toExponential(1)} (needs ≤ ${r.numpy.tolerance}): ${numpyOk ? "pass" : "FAIL"}`,
      ],
      goal: "",
      met: numpyOk ? "" : "check failed",
    },
  ];
}

module.exports = { runPreparedBench, preparedRows, preparedEvaluation, monteCarlo, againstNumpy };

if (require.main === module) {
  const t0 = nowMs();
  runPreparedBench((s) => console.error(s)).then((r) => {
    for (const row of preparedRows(r)) console.log([row.id, row.measure, row.result, ...row.detail].join("\n  "));
    console.error(`${((nowMs() - t0) / 1000).toFixed(1)} s`);
  });
}
