/**
 * Value sets written into a set-up that was validated once, without validating all of it
 * again: only the components a value set names are resolved anew (their parameters parsed and
 * range-checked, their cross-parameter rules run). Connections, readout, signal and grid do
 * not depend on parameter values, so they are the validated set-up's. The result equals
 * loadSetup(applyValues(description, values)) field for field, errors included.
 */
import type { ResolvedComponent } from "../components/types";
import { QuietframeError, QuietframeErrors } from "../errors";
import { applyValues, splitTarget } from "./apply-values";
import type { SetupDescription } from "./format";
import { resolveComponentParams, type ResolvedSetup } from "./validate";

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
    const snapshot = { ...values };
    let source: SetupDescription | undefined;
    const resolved = { ...base, components };
    // The description with the values written in, made only when something reads it (a saved
    // state, a methods text); the computation never does.
    Object.defineProperty(resolved, "source", {
      enumerable: true,
      get: (): SetupDescription => (source ??= applyValues(base.source, snapshot)),
    });
    return resolved;
  }
}
