import { QuietframeError } from "../errors";
import type { ResolvedSetup } from "../setup/validate";
import { designParameter, parseParameterValue, shownValue, withinBounds, type DesignParameter } from "./parameters";

/**
 * Parameter uncertainties as a user writes them: "95 % ± 2 %" (a centre and a spread, each in the
 * parameter's own units), "± 300 Hz" (around the set-up's value), optionally followed by
 * "normal" (the default: the spread is one standard deviation) or "uniform" (the spread is the
 * half-width). Values outside the parameter's physical bounds are redrawn, so a distribution
 * that reaches a bound is truncated there (its mass beyond the bound is spread over the rest).
 */

export type SpreadDistribution = "normal" | "uniform";

export interface UncertaintySpec {
  /** "component.parameter". */
  readonly target: string;
  /** "95 % ± 2 %" or "± 2 %" ("+-" and "+/-" also work), optionally ending in "normal" or "uniform". */
  readonly value: string;
  /** Overrides a distribution word in `value`. */
  readonly distribution?: SpreadDistribution;
}

export interface ResolvedUncertainty {
  readonly parameter: DesignParameter;
  /** Centre and spread in SI units. */
  readonly centre: number;
  readonly spread: number;
  readonly distribution: SpreadDistribution;
  /** Standard deviation before truncation: the spread (normal) or spread/√3 (uniform). */
  readonly deviation: number;
  /** Whether draws reach a bound (a uniform one within its half-width, a normal one within TRUNCATION_SPREADS spreads): they are then redrawn. */
  readonly truncated: boolean;
  /** "95 % ± 2 % (normal)". */
  readonly shown: string;
}

const PLUS_MINUS = /±|\+\/-|\+-/;

/** A normal distribution counts as truncated when a bound lies within this many standard deviations (beyond 4σ lies 3e-5 of it). */
export const TRUNCATION_SPREADS = 4;

/** Resolves uncertainties against a set-up; every problem names `uncertain.<target>` and what is allowed. */
export function resolveUncertainties(setup: ResolvedSetup, specs: readonly UncertaintySpec[]): ResolvedUncertainty[] {
  if (!Array.isArray(specs) || specs.length === 0) {
    throw new QuietframeError({ path: "uncertain", value: specs, problem: "names no uncertain parameter", allowed: 'one or more { target: "component.parameter", value: "95 % ± 2 %" }' });
  }
  const seen = new Set<string>();
  return specs.map((spec, i) => {
    if (typeof spec !== "object" || spec === null) {
      throw new QuietframeError({ path: `uncertain[${i}]`, value: spec, problem: "must be an object", allowed: '{ target: "component.parameter", value: "95 % ± 2 %" }' });
    }
    const p = designParameter(setup, spec.target, `uncertain[${i}].target`);
    if (seen.has(p.target)) throw new QuietframeError({ path: `uncertain[${i}].target`, value: spec.target, problem: "is named twice", allowed: "each parameter once" });
    seen.add(p.target);
    return resolveOne(p, spec);
  });
}

function resolveOne(p: DesignParameter, spec: UncertaintySpec): ResolvedUncertainty {
  const path = `uncertain.${p.target}`;
  if (typeof spec.value !== "string") {
    throw new QuietframeError({ path, value: spec.value, problem: 'must be text such as "95 % ± 2 %"', allowed: `a value ± a spread in the units of ${p.target}, e.g. "${example(p)}"` });
  }
  let text = spec.value.trim();
  let distribution: SpreadDistribution = "normal";
  const word = /\s*\b(normal|uniform)$/i.exec(text);
  if (word) {
    distribution = word[1].toLowerCase() as SpreadDistribution;
    text = text.slice(0, word.index).trim();
  }
  if (spec.distribution !== undefined) {
    if (spec.distribution !== "normal" && spec.distribution !== "uniform") {
      throw new QuietframeError({ path: `${path}.distribution`, value: spec.distribution, problem: "is not a distribution", allowed: "normal or uniform" });
    }
    distribution = spec.distribution;
  }
  const parts = text.split(PLUS_MINUS);
  if (parts.length !== 2 || parts[1].trim() === "") {
    throw new QuietframeError({
      path,
      value: spec.value,
      problem: "is not a value ± a spread",
      allowed: `e.g. "${example(p)}" or "± ${shownValue(Math.abs(p.value) * 0.02 || 1, p)}", optionally ending in normal or uniform`,
    });
  }
  const centre = parts[0].trim() === "" ? p.value : parseParameterValue(p, parts[0].trim(), `${path}.value`);
  if (!withinBounds(p, centre)) {
    throw new QuietframeError({ path: `${path}.value`, value: parts[0].trim(), problem: `is outside the range of ${p.target}`, allowed: p.allowed });
  }
  const spreadText = parts[1].trim();
  const spread = parseParameterValue(p, spreadText, `${path}.spread`);
  if (!(spread > 0)) {
    throw new QuietframeError({
      path: `${path}.spread`,
      value: spreadText,
      problem: "must be above zero",
      allowed: `a spread in the units of ${p.target}, e.g. "${shownValue(Math.abs(p.value) * 0.02 || 1, p)}"`,
    });
  }
  if (p.lower && p.upper && spread > p.upper.value - p.lower.value) {
    throw new QuietframeError({
      path: `${path}.spread`,
      value: spreadText,
      problem: `is larger than the whole range of ${p.target} (${shownValue(p.upper.value - p.lower.value, p)})`,
      allowed: `a spread below ${shownValue(p.upper.value - p.lower.value, p)} (${p.allowed})`,
    });
  }
  const reach = distribution === "normal" ? TRUNCATION_SPREADS * spread : spread;
  const truncated = (p.lower !== undefined && centre - reach <= p.lower.value) || (p.upper !== undefined && centre + reach >= p.upper.value);
  return {
    parameter: p,
    centre,
    spread,
    distribution,
    deviation: distribution === "normal" ? spread : spread / Math.sqrt(3),
    truncated,
    shown: `${shownValue(centre, p)} ± ${shownValue(spread, p)} (${distribution})`,
  };
}

function example(p: DesignParameter): string {
  const x = p.value === 0 ? 1 : p.value;
  return `${shownValue(p.value, p)} ± ${shownValue(Math.abs(x) * 0.02, p)}`;
}
