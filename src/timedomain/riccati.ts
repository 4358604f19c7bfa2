/**
 * Conditional covariance under continuous homodyne measurement of all detector outputs:
 * the Kalman–Bucy Riccati equation
 *   dV/dt = A V + V Aᵀ + Q − (V Cᵀ + S) R⁻¹ (C V + Sᵀ)
 * (Q, R, S in measurement.ts). With Ã = A − S R⁻¹ C, Q̃ = Q − S R⁻¹ Sᵀ and G = Cᵀ R⁻¹ C it is
 * dV/dt = Ã V + V Ãᵀ + Q̃ − V G V, whose flow is linear in V = X Y⁻¹:
 *   d/dt [X; Y] = H [X; Y],  H = [[Ã, Q̃], [G, −Ãᵀ]].
 *
 * The flow over a time h is a linear-fractional map
 *   V ↦ W + Φ V (I + Γ V)⁻¹ Φᵀ
 * with Φ = E₂₂⁻ᵀ, Γ = E₂₂⁻¹E₂₁, W = E₁₂E₂₂⁻¹ from E = e^{Hh}. Two such maps compose into one
 * of the same form, so a step too long for e^{Hh} (stiff models: e^{−Ãᵀh} overflows) is cut
 * to h/2^k and doubled k times; the steady state is the limit of W under repeated doubling
 * (the doubling algorithm of the discrete Riccati equation). Every step is exact flow, not a
 * time-stepping scheme, so time scales from 1e-9 s to 1e2 s in one model cost only a few
 * dozen doublings.
 */
import { QuietframeError } from "../errors";
import type { StateSpaceModel } from "../network/model";
import { expm } from "../linalg/expm";
import { solve } from "../linalg/real-lu";
import { allFinite, block, congruence, identity, maxAbs, mul, multiply, norm1, setBlock, symmetrize, transpose } from "../linalg/real-matrix";
import { halvingsFor, powerOfTwo } from "./discretize";
import { measurementNoise } from "./measurement";
import { checkCovarianceShape } from "./transient";

/** V ↦ W + Φ V (I + Γ V)⁻¹ Φᵀ. */
export interface RiccatiMap {
  readonly phi: Float64Array;
  readonly gamma: Float64Array;
  readonly w: Float64Array;
}

/** The Riccati equation in the form dV/dt = Ã V + V Ãᵀ + Q̃ − V G V. */
export interface RiccatiProblem {
  readonly n: number;
  readonly a: Float64Array;
  readonly q: Float64Array;
  readonly g: Float64Array;
}

export function riccatiProblem(model: StateSpaceModel): RiccatiProblem {
  const { n, p, q, r, s } = measurementNoise(model);
  if (p === 0) return { n, a: Float64Array.from(model.A), q, g: new Float64Array(n * n) };
  const rInvC = solve(r, model.C, p, n); // R⁻¹C, p×n
  const rInvSt = solve(r, transpose(s, n, p), p, n); // R⁻¹Sᵀ, p×n
  const sRInvC = multiply(s, rInvC, n, p, n);
  const a = new Float64Array(n * n);
  for (let i = 0; i < n * n; i++) a[i] = model.A[i] - sRInvC[i];
  const qt = multiply(s, rInvSt, n, p, n);
  for (let i = 0; i < n * n; i++) qt[i] = q[i] - qt[i];
  const g = multiply(transpose(model.C, p, n), rInvC, n, p, n);
  return { n, a, q: symmetrize(qt, n), g: symmetrize(g, n) };
}

/** Residual A V + V Aᵀ + Q − (V Cᵀ + S) R⁻¹ (C V + Sᵀ), relative to the size of its largest term. */
export function riccatiResidual(model: StateSpaceModel, v: Float64Array): number {
  const { n, a, q, g } = riccatiProblem(model);
  const av = mul(a, v, n);
  const vgv = congruence(v, g, n);
  let worst = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const res = av[i * n + j] + av[j * n + i] + q[i * n + j] - vgv[i * n + j];
      worst = Math.max(worst, Math.abs(res));
    }
  }
  const scale = Math.max(2 * maxAbs(av), maxAbs(q), maxAbs(vgv), Number.MIN_VALUE);
  return worst / scale;
}

/** Balancing factor σ: the flow is computed for V/σ so that Q̃/σ and σG have equal size. */
function balance(problem: RiccatiProblem): number {
  const qn = norm1(problem.q, problem.n);
  const gn = norm1(problem.g, problem.n);
  return qn > 0 && gn > 0 ? Math.sqrt(qn / gn) : 1;
}

function hamiltonianNorm(problem: RiccatiProblem, sigma: number): number {
  const { n, a, q, g } = problem;
  return 2 * norm1(a, n) + norm1(q, n) / sigma + norm1(g, n) * sigma;
}

/** Map of a step short enough (‖H‖h ≤ 1/2) for one exponential of the Hamiltonian matrix. */
function shortMap(problem: RiccatiProblem, sigma: number, h: number): RiccatiMap {
  const { n, a, q, g } = problem;
  const m = 2 * n;
  const ham = new Float64Array(m * m);
  setBlock(ham, m, 0, 0, a, n, n, h);
  setBlock(ham, m, 0, n, q, n, n, h / sigma);
  setBlock(ham, m, n, 0, g, n, n, h * sigma);
  setBlock(ham, m, n, n, transpose(a, n), n, n, -h);
  const e = expm(ham, m);
  const e12 = block(e, m, 0, n, n, n);
  const e21 = block(e, m, n, 0, n, n);
  const e22 = block(e, m, n, n, n, n);
  // Φ = E₂₂⁻ᵀ, Γ = E₂₂⁻¹E₂₁, W = E₁₂E₂₂⁻¹ = (E₂₂⁻ᵀE₁₂ᵀ)ᵀ; then undo the balancing (V = σV').
  const e22t = transpose(e22, n);
  const phi = solve(e22t, identity(n), n, n);
  const gamma = solve(e22, e21, n, n);
  const w = transpose(solve(e22t, transpose(e12, n), n, n), n);
  for (let i = 0; i < n * n; i++) {
    w[i] *= sigma;
    gamma[i] /= sigma;
  }
  return { phi, gamma: symmetrize(gamma, n), w: symmetrize(w, n) };
}

/**
 * `first` then `second`, with M = I + W₁Γ₂:
 *   Φ = Φ₂ M⁻¹ Φ₁,  Γ = Γ₁ + Φ₁ᵀ Γ₂ M⁻¹ Φ₁,  W = W₂ + Φ₂ W₁ M⁻ᵀ Φ₂ᵀ.
 */
export function composeMaps(first: RiccatiMap, second: RiccatiMap, n: number): RiccatiMap {
  const mm = mul(first.w, second.gamma, n);
  for (let i = 0; i < n; i++) mm[i * n + i] += 1;
  const stacked = new Float64Array(n * 2 * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      stacked[i * 2 * n + j] = first.phi[i * n + j];
      stacked[i * 2 * n + n + j] = first.w[i * n + j];
    }
  }
  const solved = solve(mm, stacked, n, 2 * n);
  const x = block(solved, 2 * n, 0, 0, n, n); // M⁻¹Φ₁
  const y = block(solved, 2 * n, 0, n, n, n); // M⁻¹W₁ = (W₁M⁻ᵀ)ᵀ
  const phi = mul(second.phi, x, n);
  const gamma = mul(transpose(first.phi, n), mul(second.gamma, x, n), n);
  for (let i = 0; i < n * n; i++) gamma[i] += first.gamma[i];
  const w = mul(mul(second.phi, transpose(y, n), n), transpose(second.phi, n), n);
  for (let i = 0; i < n * n; i++) w[i] += second.w[i];
  return { phi, gamma: symmetrize(gamma, n), w: symmetrize(w, n) };
}

/** The map applied to V: W + Φ (I + V Γ)⁻¹ V Φᵀ. */
export function applyMap(map: RiccatiMap, v: Float64Array, n: number): Float64Array {
  const m = mul(v, map.gamma, n);
  for (let i = 0; i < n; i++) m[i * n + i] += 1;
  const z = solve(m, v, n, n);
  const out = congruence(map.phi, symmetrize(z, n), n);
  for (let i = 0; i < n * n; i++) out[i] += map.w[i];
  return symmetrize(out, n);
}

/** The exact Riccati flow over a time h ≥ 0. */
export function riccatiMap(problem: RiccatiProblem, h: number): RiccatiMap {
  const sigma = balance(problem);
  const k = halvingsFor(hamiltonianNorm(problem, sigma) * h);
  let map = shortMap(problem, sigma, h / powerOfTwo(k));
  for (let i = 0; i < k; i++) map = composeMaps(map, map, problem.n);
  return map;
}

/** Doublings before giving up on a steady state: 2^400 steps of the starting length. */
const MAX_DOUBLINGS = 400;
const CONVERGED = 1e-14;

/** Stationary solution of the Riccati equation (the conditional covariance after a long measurement). */
export function conditionalSteadyState(model: StateSpaceModel): Float64Array {
  const problem = riccatiProblem(model);
  const n = problem.n;
  if (n === 0) return new Float64Array(0);
  const sigma = balance(problem);
  const h0 = 0.5 / Math.max(hamiltonianNorm(problem, sigma), Number.MIN_VALUE);
  const limit = doublingLimit(shortMap(problem, sigma, h0), n);
  if ("failed" in limit) throw noSteadyState(model, limit.before, limit.after);
  return limit.w;
}

/**
 * lim W of the map doubled again and again, i.e. the fixed point reached from V = 0 (the
 * stabilizing solution when the mode set-up is detectable and stabilizable). Converged when
 * two doublings in a row change no entry by more than CONVERGED of √(W_ii W_jj); by then the
 * change shrinks quadratically.
 */
export function doublingLimit(start: RiccatiMap, n: number): { w: Float64Array } | { failed: true; before: Float64Array; after: Float64Array } {
  let map = start;
  let settled = 0;
  for (let it = 0; it < MAX_DOUBLINGS; it++) {
    const next = composeMaps(map, map, n);
    if (!allFinite(next.w) || it === MAX_DOUBLINGS - 1) return { failed: true, before: map.w, after: next.w };
    const change = relativeChange(map.w, next.w, n);
    map = next;
    settled = change <= CONVERGED ? settled + 1 : 0;
    if (settled === 2) return { w: map.w };
  }
  return { failed: true, before: map.w, after: map.w };
}

/** max |Δ_ij| / √(|W_ii W_jj|), falling back to the largest entry where a variance is zero. */
export function relativeChange(before: Float64Array, after: Float64Array, n: number): number {
  const floor = maxAbs(after) || Number.MIN_VALUE;
  let worst = 0;
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const scale = Math.sqrt(Math.abs(after[i * n + i] * after[j * n + j]));
      const d = Math.abs(after[i * n + j] - before[i * n + j]) / (scale > 0 ? scale : floor);
      if (d > worst || d !== d) worst = d;
    }
  }
  return worst;
}

/** Names the mode whose conditional variance keeps growing (neither damped nor observed). */
function noSteadyState(model: StateSpaceModel, before: Float64Array, after: Float64Array): QuietframeError {
  const n = model.nStates;
  let worst = 0;
  let ratio = -Infinity;
  for (let i = 0; i < n; i++) {
    const grown = after[i * n + i] / Math.max(before[i * n + i], Number.MIN_VALUE);
    const r = Number.isFinite(grown) ? grown : Infinity;
    if (r > ratio) {
      ratio = r;
      worst = i;
    }
  }
  const mode = model.modes.find((m) => m.x === worst || m.p === worst);
  const where = mode ? ` (mode '${mode.label}' of '${mode.owner}')` : "";
  return new QuietframeError({
    path: "readout",
    problem: `the conditional covariance has no steady state: a mode is neither damped nor seen by the read-out outputs${where}, so its uncertainty grows without bound`,
    allowed: "a set-up in which every mode is damped or measured; use conditionalTransient for a finite time",
  });
}

/** V(t) of the Riccati equation from V(0) = v0 at each of the (non-decreasing, ≥ 0) times. */
export function conditionalTransient(model: StateSpaceModel, v0: Float64Array, times: Float64Array): Float64Array[] {
  checkCovarianceShape(model, v0, "v0");
  const problem = riccatiProblem(model);
  const n = problem.n;
  const cache = new Map<number, RiccatiMap>();
  const out: Float64Array[] = [];
  let v = symmetrize(Float64Array.from(v0), n);
  let t = 0;
  for (let i = 0; i < times.length; i++) {
    const ti = times[i];
    if (!(Number.isFinite(ti) && ti >= t)) {
      throw new QuietframeError({
        path: `times[${i}]`,
        value: ti,
        problem: "times must be finite, ≥ 0 and non-decreasing (seconds)",
        allowed: `a time ≥ ${t} s`,
      });
    }
    const dt = ti - t;
    if (dt > 0) {
      let map = cache.get(dt);
      if (!map) {
        map = riccatiMap(problem, dt);
        cache.set(dt, map);
      }
      v = applyMap(map, v, n);
    }
    out.push(Float64Array.from(v));
    t = ti;
  }
  return out;
}
