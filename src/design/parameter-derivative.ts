import type { DesignParameter } from "./parameters";
import { riddersDerivative, type DerivativeEstimate, type DifferenceKind } from "./ridders-derivative";

/**
 * The derivative of a figure with respect to one parameter at its value: central differences
 * when both sides have room inside the parameter's bounds, one-sided beside a bound, and the
 * other kinds when the first one finds no value (an unstable side). `f` returns NaN where the
 * figure has none; `fx` = f(x0); `h` is the first step.
 */
export function parameterDerivative(f: (x: number) => number, p: DesignParameter, x0: number, h: number, fx: number): DerivativeEstimate | undefined {
  const roomBelow = p.lower ? x0 - p.lower.value : Infinity;
  const roomAbove = p.upper ? p.upper.value - x0 : Infinity;
  const room = Math.min(roomBelow, roomAbove);
  // Exclusive bounds are never reached: stay 1 % short of them.
  const stepWithin = (r: number): number => Math.min(h, 0.99 * r);
  const attempts: { kind: DifferenceKind; step: number }[] = [];
  if (room >= h / 10) attempts.push({ kind: "central", step: stepWithin(room) });
  if (roomAbove >= roomBelow) attempts.push({ kind: "forward", step: stepWithin(roomAbove) }, { kind: "backward", step: stepWithin(roomBelow) });
  else attempts.push({ kind: "backward", step: stepWithin(roomBelow) }, { kind: "forward", step: stepWithin(roomAbove) });
  for (const a of attempts) {
    if (!(a.step > 0)) continue;
    const d = riddersDerivative(f, x0, a.step, a.kind, fx);
    if (d) return d;
  }
  return undefined;
}
