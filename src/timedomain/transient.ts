/**
 * Unconditional covariance over time: V(t) = e^{At} V(0) e^{Aᵀt} + ∫₀ᵗ e^{As} Q e^{Aᵀs} ds,
 * which tends to the stationary (Lyapunov) covariance V∞ for a stable A. Computed from the
 * exact discrete step (discretize.ts), so it needs no V∞ and holds for marginally stable
 * models (a free mass) as well.
 */
import { QuietframeError } from "../errors";
import { diffusionMatrix } from "../engine/covariance";
import type { StateSpaceModel } from "../network/model";
import { congruence, symmetrize } from "../linalg/real-matrix";
import { discreteStep } from "./discretize";

/** Every mode in its ground state: V = I/2 (vacuum variance 1/2 per quadrature). */
export function groundCovariance(model: StateSpaceModel): Float64Array {
  const n = model.nStates;
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 0.5;
  return v;
}

export function transientCovariance(model: StateSpaceModel, v0: Float64Array, t: number): Float64Array {
  checkCovarianceShape(model, v0, "v0");
  if (!(t >= 0 && Number.isFinite(t))) {
    throw new QuietframeError({ path: "t", value: t, problem: "the time must be a finite number of seconds ≥ 0", allowed: "0 ≤ t < ∞ (s)" });
  }
  const n = model.nStates;
  const step = discreteStep(model.A, diffusionMatrix(model), n, t);
  const v = congruence(step.phi, v0, n);
  for (let i = 0; i < v.length; i++) v[i] += step.w[i];
  return symmetrize(v, n);
}

/** A covariance argument must be n×n, finite and symmetric. */
export function checkCovarianceShape(model: StateSpaceModel, v: Float64Array, path: string): void {
  const n = model.nStates;
  if (v.length !== n * n) {
    throw new QuietframeError({
      path,
      value: `${v.length} entries`,
      problem: `a covariance of this model must be ${n}×${n}`,
      allowed: `${n * n} entries (row-major, quadrature variances, vacuum 1/2)`,
    });
  }
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      const x = v[i * n + j];
      if (!Number.isFinite(x)) {
        throw new QuietframeError({ path: `${path}[${i}][${j}]`, value: x, problem: "covariance entries must be finite", allowed: "finite numbers" });
      }
      const y = v[j * n + i];
      if (Math.abs(x - y) > 1e-12 * Math.max(Math.abs(x), Math.abs(y), 1e-300)) {
        throw new QuietframeError({
          path: `${path}[${i}][${j}]`,
          value: x,
          problem: `the covariance is not symmetric (entry [${j}][${i}] is ${y})`,
          allowed: "a symmetric matrix",
        });
      }
    }
  }
}
