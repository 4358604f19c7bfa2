"use strict";
/**
 * Timing helpers for the benchmarks. Figures are compared as ratios against a baseline
 * measured in the same run, with baseline and candidate samples interleaved, so slow
 * drifts of a shared machine (another process waking up, CPU frequency) hit both alike.
 */

/** Wall-clock now in milliseconds (sub-microsecond resolution). */
function nowMs() {
  return Number(process.hrtime.bigint()) / 1e6;
}

function median(xs) {
  return quantile(xs, 0.5);
}

/** Linear-interpolated quantile of a sample (q in [0, 1]). */
function quantile(xs, q) {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return s[lo] + (s[hi] - s[lo]) * (pos - lo);
}

/** How many calls of fn make one sample last about targetMs (at least 1). */
function calibrate(fn, targetMs) {
  let reps = 1;
  for (;;) {
    const t0 = nowMs();
    for (let i = 0; i < reps; i++) fn();
    const dt = nowMs() - t0;
    if (dt >= targetMs / 4 || reps >= 1 << 24) return Math.max(1, Math.round((reps * targetMs) / Math.max(dt, 1e-3)));
    reps *= 4;
  }
}

/** Milliseconds per call of fn, averaged over reps calls. */
function sample(fn, reps) {
  const t0 = nowMs();
  for (let i = 0; i < reps; i++) fn();
  return (nowMs() - t0) / reps;
}

/**
 * Interleaved comparison: `rounds` rounds, each timing every candidate once (in rotating
 * order) for about sampleMs. Returns per-candidate medians (ms per call) and the median of
 * the per-round ratios of each candidate to the first one.
 */
function compare(candidates, { rounds = 15, sampleMs = 20, warmupMs = 150 } = {}) {
  const names = Object.keys(candidates);
  const reps = {};
  for (const name of names) {
    const fn = candidates[name];
    const until = nowMs() + warmupMs;
    while (nowMs() < until) fn();
    reps[name] = calibrate(fn, sampleMs);
  }
  const samples = Object.fromEntries(names.map((n) => [n, []]));
  for (let r = 0; r < rounds; r++) {
    for (let k = 0; k < names.length; k++) {
      const name = names[(r + k) % names.length];
      samples[name].push(sample(candidates[name], reps[name]));
    }
  }
  const base = names[0];
  const result = {};
  for (const name of names) {
    const ratios = samples[name].map((t, i) => t / samples[base][i]);
    result[name] = { ms: median(samples[name]), p10: quantile(samples[name], 0.1), p90: quantile(samples[name], 0.9), ratio: median(ratios), reps: reps[name] };
  }
  return result;
}

/** Least-squares slope and intercept of y against x. */
function linearFit(xs, ys) {
  const n = xs.length;
  const mx = xs.reduce((a, b) => a + b, 0) / n;
  const my = ys.reduce((a, b) => a + b, 0) / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxy += (xs[i] - mx) * (ys[i] - my);
    sxx += (xs[i] - mx) ** 2;
    syy += (ys[i] - my) ** 2;
  }
  const slope = sxy / sxx;
  const r2 = syy === 0 ? 1 : (sxy * sxy) / (sxx * syy);
  return { slope, intercept: my - slope * mx, r2 };
}

/** Largest relative difference |a−b|/max(|a|,|b|) over two arrays (0 where both are 0). */
function maxRelDiff(a, b) {
  if (a.length !== b.length) return Infinity;
  let worst = 0;
  for (let i = 0; i < a.length; i++) {
    const scale = Math.max(Math.abs(a[i]), Math.abs(b[i]));
    if (scale === 0) continue;
    const d = Math.abs(a[i] - b[i]) / scale;
    if (!(d <= worst)) worst = d;
  }
  return worst;
}

module.exports = { nowMs, median, quantile, calibrate, sample, compare, linearFit, maxRelDiff };
