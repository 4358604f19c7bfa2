/** Duan sums of the joint variables a trajectory state follows. */
import type { JointVariable, TrajectoryResult } from "../../src/index";

/**
 * The Duan sum in the other sign convention, from two followed joint variables. The engine
 * reports Var(x₁ − x₂) + Var(p₁ + p₂) (light with correlated amplitudes); a negative-mass
 * reference correlates the sum x₁ + x₂ and the difference p₁ − p₂ instead. Duan's criterion
 * holds in either convention (the two differ by a rotation of mode 2 by π, a local unitary),
 * so when the state follows x₁ + x₂ and p₁ − p₂ of the pair, Var(x₁ + x₂) + Var(p₁ − p₂)
 * is shown beside the engine's sum, against the same bound.
 */
export interface JointDuan {
  readonly label: string;
  readonly values: Float64Array;
}

/** s with the variable = ±(q_a + s·q_b) over the pair's quadrature q (unit weights, no mode labels), else undefined. */
function combination(v: JointVariable, pair: readonly [string, string], q: "x" | "p"): 1 | -1 | undefined {
  if (v.terms.length !== 2 || v.terms.some((t) => t.quadrature !== q || t.mode !== undefined || Math.abs(t.weight) !== 1)) return undefined;
  const a = v.terms.find((t) => t.component === pair[0]);
  const b = v.terms.find((t) => t.component === pair[1]);
  if (!a || !b) return undefined;
  return a.weight * b.weight > 0 ? 1 : -1;
}

export function jointDuanSum(joint: readonly JointVariable[], r: TrajectoryResult, pair: readonly [string, string] | null): JointDuan | undefined {
  if (!pair) return undefined;
  const xi = joint.findIndex((v) => combination(v, pair, "x") === 1);
  const pi = joint.findIndex((v) => combination(v, pair, "p") === -1);
  if (xi < 0 || pi < 0) return undefined;
  const cx = r.joint[xi].conditional;
  const cp = r.joint[pi].conditional;
  const values = new Float64Array(cx.length);
  for (let i = 0; i < values.length; i++) values[i] = cx[i] + cp[i];
  return { label: "Var(x₁ + x₂) + Var(p₁ − p₂)", values };
}

/** The engine's convention, named the same way (mode 1 is the pair's first component). */
export function engineDuanLabel(_pair: readonly [string, string]): string {
  return "Var(x₁ − x₂) + Var(p₁ + p₂)";
}
