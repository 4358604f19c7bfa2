import { componentKind } from "../components/registry";
import type { QuantityParam } from "../components/types";
import { QuietframeError } from "../errors";
import { describeRange, exactSiText } from "../setup/params";
import type { ResolvedSetup } from "../setup/validate";
import { formatQuantity, parseQuantity } from "../units";

/**
 * The parameters a design search varies: "component.parameter" targets resolved against a
 * set-up, their current SI values, the physical bounds of their component's parameter spec,
 * and exact text for writing a trial value back into a set-up.
 */

/** One end of a parameter's allowed interval. */
export interface ParameterBound {
  readonly value: number;
  /** Whether the end itself is allowed (efficiency ≤ 100 %: yes; mass > 0: no). */
  readonly inclusive: boolean;
}

export interface DesignParameter {
  /** "component.parameter". */
  readonly target: string;
  readonly component: string;
  readonly param: string;
  readonly spec: QuantityParam;
  /** The value in the set-up, in SI units (cyclic Hz, rad, dB, fraction 0…1). */
  readonly value: number;
  /** The physical bounds from the parameter spec (and the quantity itself: a fraction lies in 0…1); undefined: open. */
  readonly lower?: ParameterBound;
  readonly upper?: ParameterBound;
  /** "0 % ≤ efficiency ≤ 100 %", for messages and tables. */
  readonly allowed: string;
}

/** Every numeric parameter that has a value in the set-up (given or defaulted), in component order. */
export function numericParameters(setup: ResolvedSetup): DesignParameter[] {
  const out: DesignParameter[] = [];
  for (const c of setup.components) {
    const kind = componentKind(c.type);
    for (const spec of kind?.params ?? []) {
      if (spec.kind === "choice") continue;
      const value = c.values[spec.name];
      if (typeof value === "number") out.push(makeParameter(c.name, spec, value));
    }
  }
  return out;
}

/** The parameter a target names; `path` names the field in messages. */
export function designParameter(setup: ResolvedSetup, target: unknown, path: string): DesignParameter {
  const all = numericParameters(setup);
  const list = all.map((p) => p.target).join(", ");
  if (typeof target !== "string") {
    throw new QuietframeError({ path, value: target, problem: "must name a parameter", allowed: `"component.parameter", one of ${list}` });
  }
  const found = all.find((p) => p.target === target);
  if (found) return found;
  const dot = target.indexOf(".");
  const component = setup.components.find((c) => c.name === target.slice(0, dot));
  const spec = component ? componentKind(component.type)?.params.find((p) => p.name === target.slice(dot + 1)) : undefined;
  if (spec?.kind === "choice") {
    throw new QuietframeError({ path, value: target, problem: `is a choice (${spec.choices.join(", ")}), not a value on a scale`, allowed: list });
  }
  if (spec) {
    throw new QuietframeError({ path, value: target, problem: "has no value in this set-up (an optional parameter left out; the component uses another one)", allowed: list });
  }
  throw new QuietframeError({ path, value: target, problem: "is not a numeric parameter of this set-up", allowed: list });
}

function makeParameter(component: string, spec: QuantityParam, value: number): DesignParameter {
  let lower: ParameterBound | undefined = spec.min === undefined ? undefined : { value: spec.min, inclusive: !spec.minExclusive };
  let upper: ParameterBound | undefined = spec.max === undefined ? undefined : { value: spec.max, inclusive: !spec.maxExclusive };
  // The quantity's own range (parseQuantity refuses anything else).
  if (spec.kind === "fraction") {
    if (!lower || lower.value < 0) lower = { value: 0, inclusive: true };
    if (!upper || upper.value > 1) upper = { value: 1, inclusive: true };
  }
  if (spec.kind === "count" && (!lower || lower.value <= 0)) lower = { value: 0, inclusive: false };
  return { target: `${component}.${spec.name}`, component, param: spec.name, spec, value, lower, upper, allowed: describeRange(spec) };
}

/** Whether an SI value lies inside the parameter's physical bounds. */
export function withinBounds(p: DesignParameter, x: number): boolean {
  if (!Number.isFinite(x)) return false;
  if (p.lower && (p.lower.inclusive ? x < p.lower.value : x <= p.lower.value)) return false;
  if (p.upper && (p.upper.inclusive ? x > p.upper.value : x >= p.upper.value)) return false;
  return true;
}

/**
 * The SI value as text that parses back to exactly the same double (shortest round-trip digits
 * in the SI unit of the quantity), so a trial value is what the search asked for, bit for bit.
 */
export function exactText(x: number, p: DesignParameter): string | number {
  return exactSiText(x, p.spec.kind);
}

/** A value for display (six significant digits, the quantity's usual unit). */
export function shownValue(x: number, p: DesignParameter): string {
  return formatQuantity(x, p.spec.kind, 6);
}

/** Parses a user-written value of the parameter's kind; `path` names the field. */
export function parseParameterValue(p: DesignParameter, raw: unknown, path: string): number {
  return parseQuantity(raw, p.spec.kind, path);
}
