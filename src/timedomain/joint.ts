/** Joint variables Σ weight·quadrature as weight vectors over the model's states. */
import { QuietframeError } from "../errors";
import type { ModeInfo, StateSpaceModel } from "../network/model";
import type { JointVariable, QuadratureRef } from "./types";

/** The mode a quadrature reference points at; `path` names the reference in errors. */
export function findMode(model: StateSpaceModel, ref: Pick<QuadratureRef, "component" | "mode">, path: string): ModeInfo {
  const owned = model.modes.filter((m) => m.owner === ref.component);
  if (owned.length === 0) {
    const owners = [...new Set(model.modes.map((m) => m.owner))];
    throw new QuietframeError({
      path: `${path}.component`,
      value: ref.component,
      problem: "no component of this name owns a mode in the set-up",
      allowed: owners.length ? `one of ${owners.map((o) => `'${o}'`).join(", ")}` : "none: the set-up has no modes",
    });
  }
  if (ref.mode === undefined) {
    if (owned.length === 1) return owned[0];
    throw new QuietframeError({
      path: `${path}.mode`,
      problem: `'${ref.component}' owns ${owned.length} modes, so the mode must be named`,
      allowed: owned.map((m) => `'${m.label}'`).join(", "),
    });
  }
  const mode = owned.find((m) => m.label === ref.mode);
  if (!mode) {
    throw new QuietframeError({
      path: `${path}.mode`,
      value: ref.mode,
      problem: `'${ref.component}' has no mode of this label`,
      allowed: owned.map((m) => `'${m.label}'`).join(", "),
    });
  }
  return mode;
}

/** Weights w over the states such that the joint variable is wᵀz. */
export function resolveJointVariable(model: StateSpaceModel, jv: JointVariable, path = "joint"): Float64Array {
  const w = new Float64Array(model.nStates);
  if (jv.terms.length === 0) {
    throw new QuietframeError({ path: `${path}.terms`, value: [], problem: "a joint variable needs at least one term", allowed: "one or more { component, quadrature, weight }" });
  }
  jv.terms.forEach((term, i) => {
    const at = `${path}.terms[${i}]`;
    const mode = findMode(model, term, at);
    if (term.quadrature !== "x" && term.quadrature !== "p") {
      throw new QuietframeError({ path: `${at}.quadrature`, value: term.quadrature, problem: "unknown quadrature", allowed: '"x" or "p"' });
    }
    if (!Number.isFinite(term.weight)) {
      throw new QuietframeError({ path: `${at}.weight`, value: term.weight, problem: "the weight must be a finite number", allowed: "any finite real number" });
    }
    w[term.quadrature === "x" ? mode.x : mode.p] += term.weight;
  });
  return w;
}

/** The part of a joint variable that belongs to each component (weights over states). */
export function jointParts(model: StateSpaceModel, jv: JointVariable, path = "joint"): Record<string, Float64Array> {
  const parts: Record<string, Float64Array> = {};
  jv.terms.forEach((term, i) => {
    const mode = findMode(model, term, `${path}.terms[${i}]`);
    const w = (parts[term.component] ??= new Float64Array(model.nStates));
    w[term.quadrature === "x" ? mode.x : mode.p] += term.weight;
  });
  return parts;
}

/** wᵀ V w. */
export function jointVariance(v: ArrayLike<number>, weights: ArrayLike<number>): number {
  const n = weights.length;
  let s = 0;
  for (let i = 0; i < n; i++) {
    const wi = weights[i];
    if (wi === 0) continue;
    let row = 0;
    for (let j = 0; j < n; j++) row += v[i * n + j] * weights[j];
    s += wi * row;
  }
  return s;
}

/** Zero-point variance Σ weight²/2 of a joint variable (each quadrature has vacuum variance 1/2). */
export function zeroPointVariance(weights: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < weights.length; i++) s += weights[i] * weights[i];
  return 0.5 * s;
}
