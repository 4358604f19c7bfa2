/** Strict readers of a trajectory state's joint variables and entangled pair. */
import { QuietframeError, type JointVariable } from "../../src/index";

/**
 * Shape checks of the joint variables and the entangled pair a state asks for. Whether the
 * components and modes exist is the engine's check (it knows the assembled model).
 */
const NAME = /^[A-Za-z_][A-Za-z0-9_-]{0,63}$/;
const MAX_JOINT = 8;
const MAX_TERMS = 16;

export function checkJoint(input: unknown, path: string): JointVariable[] {
  if (!Array.isArray(input) || input.length === 0 || input.length > MAX_JOINT) {
    throw new QuietframeError({
      path,
      value: input,
      problem: "must list the joint variables to follow",
      allowed: `1 to ${MAX_JOINT} variables like {"label": "x probe + x ref", "terms": [{"component": "probe", "quadrature": "x", "weight": 1}, …]}`,
    });
  }
  const labels = new Set<string>();
  return input.map((v, i) => {
    const at = `${path}[${i}]`;
    if (typeof v !== "object" || v === null || Array.isArray(v)) throw new QuietframeError({ path: at, value: v, problem: "must be an object", allowed: '{"label": …, "terms": […]}' });
    const o = v as Record<string, unknown>;
    for (const key of Object.keys(o))
      if (key !== "label" && key !== "terms") throw new QuietframeError({ path: `${at}.${key}`, problem: "is not a field of a joint variable", allowed: "label, terms" });
    if (typeof o.label !== "string" || o.label.trim() === "" || o.label.length > 80)
      throw new QuietframeError({ path: `${at}.label`, value: o.label, problem: "must be a short text", allowed: "1 to 80 characters" });
    if (labels.has(o.label)) throw new QuietframeError({ path: `${at}.label`, value: o.label, problem: "is used twice", allowed: "a label of its own for each joint variable" });
    labels.add(o.label);
    if (!Array.isArray(o.terms) || o.terms.length === 0 || o.terms.length > MAX_TERMS) {
      throw new QuietframeError({
        path: `${at}.terms`,
        value: o.terms,
        problem: "must list the quadratures combined",
        allowed: `1 to ${MAX_TERMS} terms {"component", "mode"?, "quadrature": "x" | "p", "weight"}`,
      });
    }
    const terms = o.terms.map((t, k) => checkTerm(t, `${at}.terms[${k}]`));
    return { label: o.label, terms };
  });
}

function checkTerm(input: unknown, path: string): JointVariable["terms"][number] {
  if (typeof input !== "object" || input === null || Array.isArray(input))
    throw new QuietframeError({ path, value: input, problem: "must be an object", allowed: '{"component": "probe", "quadrature": "x", "weight": 1}' });
  const t = input as Record<string, unknown>;
  for (const key of Object.keys(t))
    if (!["component", "mode", "quadrature", "weight"].includes(key))
      throw new QuietframeError({ path: `${path}.${key}`, problem: "is not a field of a term", allowed: "component, mode, quadrature, weight" });
  if (typeof t.component !== "string" || !NAME.test(t.component))
    throw new QuietframeError({ path: `${path}.component`, value: t.component, problem: "is not a component name", allowed: "the name of a component of the set-up" });
  if (t.mode !== undefined && (typeof t.mode !== "string" || t.mode.length > 120))
    throw new QuietframeError({ path: `${path}.mode`, value: t.mode, problem: "is not a mode label", allowed: "the label of one of the component's modes" });
  if (t.quadrature !== "x" && t.quadrature !== "p") throw new QuietframeError({ path: `${path}.quadrature`, value: t.quadrature, problem: "is not a quadrature", allowed: '"x" or "p"' });
  if (typeof t.weight !== "number" || !Number.isFinite(t.weight) || t.weight === 0 || Math.abs(t.weight) > 1e6) {
    throw new QuietframeError({ path: `${path}.weight`, value: t.weight, problem: "is not a usable weight", allowed: "a finite number, not 0, of magnitude up to 1e6" });
  }
  return { component: t.component, ...(t.mode === undefined ? {} : { mode: t.mode as string }), quadrature: t.quadrature, weight: t.weight };
}

export function checkPair(input: unknown, path: string): [string, string] | null {
  if (input === null || input === undefined) return null;
  if (!Array.isArray(input) || input.length !== 2 || input.some((n) => typeof n !== "string" || !NAME.test(n)) || input[0] === input[1]) {
    throw new QuietframeError({ path, value: input, problem: "is not a pair of components", allowed: 'null, or two different component names, e.g. ["membrane", "cell"]' });
  }
  return [input[0] as string, input[1] as string];
}
