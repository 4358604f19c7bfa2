"use strict";
/**
 * Engine benchmarks (Node, built package):
 *   1. floor ratio: the full budget against a closed form over Float64Arrays;
 *   2. against the same linear algebra written per frequency with mathjs complex matrices;
 *   3. cost per frequency point against the number of states.
 */
const { readFileSync } = require("node:fs");
const { join } = require("node:path");
const { ROOT, dist } = require("./lib/repo");
const { probedFreeMass, probeChain } = require("./lib/setups");
const { compare, linearFit, maxRelDiff, nowMs, median, calibrate, sample } = require("./lib/timing");

const qf = dist("src/index");
const { HBAR, SPEED_OF_LIGHT } = qf.constants;

const TWO_PI = 2 * Math.PI;
const OMEGA_LASER = (TWO_PI * SPEED_OF_LIGHT) / 1064e-9;
/** One-sided back-action force PSD of reflected power P: 8ħωP/c². */
const reflectionForce = (power) => (8 * HBAR * OMEGA_LASER * power) / (SPEED_OF_LIGHT * SPEED_OF_LIGHT);

function grid(from, to, points) {
  return qf.logGrid({ from, to, points });
}

/** Assembly alone (validation excluded), ms per call. */
function assemblyMs(resolved) {
  qf.assemble(resolved);
  const reps = calibrate(() => qf.assemble(resolved), 20);
  return median(Array.from({ length: 7 }, () => sample(() => qf.assemble(resolved), reps)));
}

// ---------------------------------------------------------------- 1. floor ratio

/** (a) S_x = ħ²/(ηS_F) + S_F/(m²Ω⁴): a free mass read by a quantum-limited position probe. */
function freeMassCase() {
  const mass = 1e-3;
  const eta = 0.9;
  // Power that puts the SQL-touching frequency at 100 Hz, as the engine test does.
  const omegaQ = TWO_PI * 100;
  const power = (HBAR * mass * omegaQ * omegaQ * SPEED_OF_LIGHT ** 2) / (8 * HBAR * OMEGA_LASER);
  const sF = reflectionForce(power);
  const imprecision = (HBAR * HBAR) / (eta * sF);
  const backAction = sF / (mass * mass);
  return {
    id: "1a",
    label: "free mass + position probe (η = 0.9), S_x",
    setup: probedFreeMass({ mass, power, efficiency: eta, referTo: "displacement" }),
    closedForm(freqs) {
      const out = new Float64Array(freqs.length);
      for (let i = 0; i < freqs.length; i++) {
        const w = TWO_PI * freqs[i];
        const w2 = w * w;
        out[i] = imprecision + backAction / (w2 * w2);
      }
      return out;
    },
  };
}

/** (b) S = (S_SQL/2)(K + 1/K)(cosh 2r − cos 2(θ+Φ) sinh 2r), Φ = arccot K: squeezed light into the same readout. */
function squeezedCase() {
  const mass = 0.01;
  const power = 0.5;
  const r = 0.8;
  const theta = Math.PI / 3;
  const sBA = reflectionForce(power);
  const ch = Math.cosh(2 * r);
  const sh = Math.sinh(2 * r);
  return {
    id: "1b",
    label: "squeezed free-mass readout (r = 0.8, θ = 60°), S_F",
    setup: probedFreeMass({ mass, power, light: { name: "light", type: "squeezed", params: { r, angle: `${theta} rad` } }, referTo: "force" }),
    closedForm(freqs) {
      const out = new Float64Array(freqs.length);
      for (let i = 0; i < freqs.length; i++) {
        const w = TWO_PI * freqs[i];
        const K = sBA / (HBAR * mass * w * w);
        const sql = 2 * HBAR * mass * w * w;
        out[i] = 0.5 * sql * (K + 1 / K) * (ch - Math.cos(2 * (theta + Math.atan(1 / K))) * sh);
      }
      return out;
    },
  };
}

/**
 * Time of noiseBudget (total, every term and the reference curves, fresh arrays) over the
 * time of the closed form for the total alone (also into a fresh array), on the same 4,096
 * log-spaced frequencies; assembly is timed apart. Both must agree before they are timed.
 */
function floorRatio(c) {
  const freqs = grid(1, 1e4, 4096);
  const resolved = qf.loadSetup(c.setup);
  const assembled = qf.assemble(resolved);
  const check = maxRelDiff(qf.noiseBudget(assembled, freqs).total, c.closedForm(freqs));
  if (!(check <= 1e-9)) throw new Error(`${c.id}: the engine and the closed form disagree (max relative difference ${check})`);
  let sink = 0;
  const t = compare(
    {
      closed: () => {
        sink += c.closedForm(freqs)[7];
      },
      engine: () => {
        sink += qf.noiseBudget(assembled, freqs).total[7];
      },
    },
    { rounds: 21, sampleMs: 25 },
  );
  if (!Number.isFinite(sink)) throw new Error("unreachable");
  return {
    id: c.id,
    label: c.label,
    points: freqs.length,
    states: assembled.model.nStates,
    inputs: assembled.model.nInputs,
    terms: qf.noiseBudget(assembled, freqs).terms.length,
    check,
    closedMs: t.closed.ms,
    engineMs: t.engine.ms,
    ratio: t.engine.ratio,
    assemblyMs: assemblyMs(resolved),
  };
}

// ---------------------------------------------------------------- 2. against mathjs

/**
 * The budget total as a user would write it with mathjs, one frequency at a time:
 * M = −iΩI − A, M⁻¹, H = C_r M⁻¹ B + D_r, h = C_r M⁻¹ b_s + d_s, S = H N Hᴴ / |h|²,
 * then the same referral factor (|χ|² for displacement) the engine applies.
 */
function mathjsTotal(math, assembled, freqs) {
  const { model, readoutRows, referredTo } = assembled;
  const { nStates: n, nInputs: m } = model;
  const row = readoutRows[0];
  const matrix = (flat, rows, cols) => math.matrix(Array.from({ length: rows }, (_, i) => Array.from(flat.subarray(i * cols, (i + 1) * cols))));
  const A = matrix(model.A, n, n);
  const B = matrix(model.B, n, m);
  const N = matrix(model.N, m, m);
  const Cr = math.matrix([Array.from(model.C.subarray(row * n, (row + 1) * n))]);
  const Dr = math.matrix([Array.from(model.D.subarray(row * m, (row + 1) * m))]);
  const bs = math.matrix(Array.from(model.signalB, (v) => [v]));
  const ds = model.signalD[row];
  const I = math.identity(n);
  const out = new Float64Array(freqs.length);
  for (let f = 0; f < freqs.length; f++) {
    const omega = TWO_PI * freqs[f];
    const M = math.subtract(math.multiply(math.complex(0, -omega), I), A);
    const Minv = math.inv(M);
    const CM = math.multiply(Cr, Minv);
    const H = math.add(math.multiply(CM, B), Dr);
    const h = math.add(math.multiply(CM, bs).get([0, 0]), ds);
    const S = math.multiply(math.multiply(H, N), math.ctranspose(H)).get([0, 0]);
    out[f] = (math.re(S) / math.abs(h) ** 2) * referredTo.psdFactor(omega);
  }
  return out;
}

async function againstMathjs() {
  const math = await import("mathjs");
  const file = join(ROOT, "examples", "cryogenic-membrane.json");
  const resolved = qf.loadSetup(readFileSync(file, "utf8"));
  const assembled = qf.assemble(resolved);
  const freqs = grid(1.1e6, 1.3e6, 512);
  const engine = qf.noiseBudget(assembled, freqs).total;
  const reference = mathjsTotal(math, assembled, freqs);
  const check = maxRelDiff(engine, reference);
  // mathjs is slow: a few whole passes, interleaved with the engine, are enough.
  let sink = 0;
  const t = compare(
    {
      engine: () => {
        sink += qf.noiseBudget(assembled, freqs).total[3];
      },
      mathjs: () => {
        sink += mathjsTotal(math, assembled, freqs)[3];
      },
    },
    { rounds: 5, sampleMs: 50, warmupMs: 300 },
  );
  if (!Number.isFinite(sink)) throw new Error("unreachable");
  return {
    label: "cryogenic-membrane.json",
    points: freqs.length,
    states: assembled.model.nStates,
    inputs: assembled.model.nInputs,
    check,
    checkPassed: check <= 1e-9,
    engineUsPerPoint: (t.engine.ms * 1e3) / freqs.length,
    mathjsUsPerPoint: (t.mathjs.ms * 1e3) / freqs.length,
    speedup: t.mathjs.ratio,
  };
}

// ---------------------------------------------------------------- 3. scaling

/**
 * Cost per frequency point of the full budget for 1…12 probed oscillators (n = 2…24).
 * Each size is timed interleaved with a fixed arithmetic loop; the fit uses the ratio to
 * that loop, so a machine that slows down or speeds up between sizes does not bend the
 * curve. The µs per point shown are those ratios times the loop's median time over the run.
 */
function scaling() {
  const freqs = grid(100, 1e4, 512);
  const steady = new Float64Array(4096).fill(1.000001);
  const probe = () => {
    let s = 0;
    for (let r = 0; r < 64; r++) for (let i = 0; i < steady.length; i++) s += steady[i] * steady[(i * 7) & 4095];
    return s;
  };
  const raw = [];
  for (let k = 1; k <= 12; k++) {
    const assembled = qf.assemble(qf.loadSetup(probeChain(k)));
    let sink = 0;
    const t = compare(
      {
        steady: () => {
          sink += probe();
        },
        budget: () => {
          sink += qf.noiseBudget(assembled, freqs).total[0];
        },
      },
      { rounds: 9, sampleMs: 20, warmupMs: 100 },
    );
    if (!Number.isFinite(sink)) throw new Error("unreachable");
    raw.push({ n: assembled.model.nStates, m: assembled.model.nInputs, ratio: t.budget.ratio, budgetMs: t.budget.ms, steadyMs: t.steady.ms });
  }
  const steadyMs = median(raw.map((r) => r.steadyMs));
  const rows = raw.map((r) => ({
    n: r.n,
    m: r.m,
    usPerPoint: (r.ratio * steadyMs * 1e3) / freqs.length,
    rawUsPerPoint: (r.budgetMs * 1e3) / freqs.length,
  }));
  const fitRows = raw.filter((r) => r.n >= 8);
  const fit = linearFit(
    fitRows.map((r) => Math.log(r.n)),
    fitRows.map((r) => Math.log(r.ratio)),
  );
  return { points: freqs.length, rows, exponent: fit.slope, r2: fit.r2, fitFrom: 8 };
}

async function runEngineBenches(log = () => undefined) {
  log("engine: floor ratio (free mass)");
  const floorA = floorRatio(freeMassCase());
  log("engine: floor ratio (squeezed)");
  const floorB = floorRatio(squeezedCase());
  log("engine: against mathjs");
  const vsMathjs = await againstMathjs();
  log("engine: scaling");
  const scale = scaling();
  return { floor: [floorA, floorB], vsMathjs, scaling: scale };
}

module.exports = { runEngineBenches, mathjsTotal };

if (require.main === module) {
  const t0 = nowMs();
  runEngineBenches((s) => console.error(s)).then((r) => {
    console.log(JSON.stringify(r, null, 2));
    console.error(`${((nowMs() - t0) / 1000).toFixed(1)} s`);
  });
}
