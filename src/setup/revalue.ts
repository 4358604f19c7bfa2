/**
 * Value sets written into a set-up that was validated once, without validating all of it
 * again: only the components a value set names are resolved anew (their parameters parsed and
 * range-checked, their cross-parameter rules run). Connections, readout, signal and grid do
 * not depend on parameter values, so they are the validated set-up's. The result equals
 * loadSetup(applyValues(description, values)) field for field, errors included.
 */
import type { ComponentKind, ResolvedComponent } from "../components/types";
import { QuietframeError, QuietframeErrors } from "../errors";
import { applyValues, splitTarget } from "./apply-values";
import type { SetupDescription } from "./format";
import type { FrequencyGridSpec } from "./grid";
import type { ResolvedClassicalNoise } from "./classical-noise";
import { type MechanicalLink, type OpticalLink, resolveComponentParams, type ResolvedSetup } from "./validate";

export class SetupRevaluer {
  private readonly index = new Map<string, number>();

  /** `base`: the validated description (loadSetup of it); its `source` is the description. */
  constructor(private readonly base: ResolvedSetup) {
    base.components.forEach((c, i) => this.index.set(c.name, i));
  }

  /** The validated set-up with `values` ("component.parameter" → value as a set-up writes it) written in. */
  resolve(values: Readonly<Record<string, string | number>>): ResolvedSetup {
    const { base } = this;
    // The written parameters of each named component, in the order applyValues writes them.
    const written = new Map<number, Record<string, unknown>>();
    for (const [target, value] of Object.entries(values)) {
      const { component, param } = splitTarget(target);
      const i = this.index.get(component);
      if (i === undefined) throw new QuietframeError({ path: `values.${target}`, value, problem: "names no component of the set-up" });
      const params = written.get(i) ?? { ...(base.source.components[i].params ?? {}) };
      params[param] = value;
      written.set(i, params);
    }
    const components: ResolvedComponent[] = [...base.components];
    const problems: QuietframeError[] = [];
    // Component order, as validation reports its problems.
    for (const i of [...written.keys()].sort((a, b) => a - b)) {
      const c = base.components[i];
      try {
        components[i] = resolveComponentParams(c.name, base.kinds.get(c.name)!, written.get(i));
      } catch (e) {
        if (e instanceof QuietframeError) problems.push(e);
        else if (e instanceof QuietframeErrors) problems.push(...e.problems);
        else throw e;
      }
    }
    if (problems.length) throw problems.length === 1 ? problems[0] : new QuietframeErrors(problems);
    return new Revalued(base, components, { ...values });
  }
}

/**
 * The validated set-up with values written in. The description with the values written in is
 * made only when something reads `source` (a saved state, a methods text); the computation
 * never does (a class: see docs/performance.md on getters).
 */
class Revalued implements ResolvedSetup {
  readonly name: string;
  readonly description: string;
  readonly kinds: ReadonlyMap<string, ComponentKind<unknown>>;
  readonly optical: readonly OpticalLink[];
  readonly mechanical: readonly MechanicalLink[];
  readonly readout: readonly string[];
  readonly signal: ResolvedSetup["signal"];
  readonly grid: FrequencyGridSpec | undefined;
  readonly classical: readonly ResolvedClassicalNoise[];
  readonly #base: ResolvedSetup;
  readonly #values: Readonly<Record<string, string | number>>;
  #source: SetupDescription | undefined;

  constructor(
    base: ResolvedSetup,
    readonly components: readonly ResolvedComponent[],
    values: Readonly<Record<string, string | number>>,
  ) {
    this.name = base.name;
    this.description = base.description;
    this.kinds = base.kinds;
    this.optical = base.optical;
    this.mechanical = base.mechanical;
    this.readout = base.readout;
    this.signal = base.signal;
    this.grid = base.grid;
    this.classical = base.classical;
    this.#base = base;
    this.#values = values;
  }

  get source(): SetupDescription {
    return (this.#source ??= applyValues(this.#base.source, this.#values));
  }

  /** In JSON as the validated set-up's own fields are, in their order, `source` last. */
  toJSON(): ResolvedSetup {
    const { name, description, components, kinds, optical, mechanical, readout, signal, grid, classical, source } = this;
    return { name, description, components, kinds, optical, mechanical, readout, signal, grid, classical, source };
  }
}
