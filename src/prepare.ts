import { checkPhysicality, type PhysicalityReport } from "./engine/covariance";
import { analyzeStability, requireNoGrowingModes, type StabilityReport } from "./engine/stability";
import { QuietframeError, QuietframeErrors } from "./errors";
import { assemble, type AssembledSetup } from "./setup/assemble";
import { applyValues } from "./setup/apply-values";
import type { SetupDescription } from "./setup/format";
import { loadSetup } from "./setup/load";
import { parseJsonText } from "./setup/parse-json";
import { SetupRevaluer } from "./setup/revalue";
import { requireSomeDetection, type ResolvedSetup } from "./setup/validate";

/**
 * Passes 1–4 of the pipeline in one place: a set-up, with values written in, validated,
 * checked for a readout that detects something, assembled and checked for growing modes.
 * Every caller (CLI, explorer, tolerance cells, trajectories) prepares through here, so all
 * of them refuse the same set-ups with the same message; a prepared set-up is then evaluated
 * on any number of grids or simulated in time without repeating these passes.
 */

/** Parameter values by target ("component.parameter"), written as a set-up writes them: "6 K", "-7.5 dB", 0.9. */
export type SetupValues = Readonly<Record<string, string | number>>;

export interface PreparedSetup {
  /** The validated set-up (SI numbers), values written in. */
  readonly setup: ResolvedSetup;
  /** Its state-space model and signal. */
  readonly assembled: AssembledSetup;
  /** Eigenmodes of the dynamics: never a growing one (prepare refuses those). */
  readonly stability: StabilityReport;
  /** Uncertainty-relation check of the stationary state; absent when there is none (an undamped mode, e.g. a free mass). */
  readonly physicality?: PhysicalityReport;
  /** Safety notes of the components (optical power on a membrane, …). */
  readonly cautions: readonly string[];
  /** What makes the set-up's results doubtful: undamped modes, a stationary state that breaks the uncertainty relation. */
  readonly warnings: readonly string[];
}

/**
 * Prepares a set-up: JSON text, a set-up description or an already validated set-up, with
 * `values` (optional) written into a copy of the description first. Throws QuietframeError(s)
 * naming the field: validation problems, `values.<target>` for a value that names no
 * component, `components.<detector>.efficiency` for a readout that detects nothing, and an
 * UnstableSetupError (path `setup`) that says which mode grows and why.
 */
export function prepare(setup: string | SetupDescription | ResolvedSetup, values?: SetupValues): PreparedSetup {
  return checked(resolveWithValues(setup, values));
}

/**
 * Prepares many value sets of one set-up (a map's cells, Monte Carlo samples, a slider's
 * positions): the set-up is parsed and validated once, here, and each value set is written
 * into the validated set-up, so that only the components it names are validated again.
 * `prepare(values)` gives what `prepare(setup, values)` would give for the set-up as it was
 * when the preparer was made: the same result bit for bit, the same errors.
 */
export class SetupPreparer {
  private readonly revaluer?: SetupRevaluer;
  private readonly base?: ResolvedSetup;

  constructor(private readonly setup: string | SetupDescription | ResolvedSetup) {
    if (isResolved(setup)) return;
    try {
      const description = typeof setup === "string" ? parseJsonText(setup, "setup") : setup;
      if (!hasComponentList(description)) return;
      this.base = loadSetup(description);
      this.revaluer = new SetupRevaluer(this.base);
    } catch (e) {
      // A set-up that does not validate as it is may still do so with values written in:
      // each value set then goes the plain way, which reports whatever is wrong.
      if (!(e instanceof QuietframeError || e instanceof QuietframeErrors)) throw e;
    }
  }

  prepare(values?: SetupValues): PreparedSetup {
    const { revaluer, base } = this;
    if (!revaluer || !base) return prepare(this.setup, values);
    if (values === undefined) return checked(base);
    if (typeof values !== "object" || values === null || Array.isArray(values)) return prepare(this.setup, values);
    return checked(revaluer.resolve(values));
  }
}

/** Passes 3 and 4 on a validated set-up: a readout that detects, assembly, stability, physicality. */
function checked(resolved: ResolvedSetup): PreparedSetup {
  requireSomeDetection(resolved);
  const assembled = assemble(resolved);
  const stability = requireNoGrowingModes(assembled, analyzeStability(assembled));
  const physicality = stability.stable ? checkPhysicality(assembled.model) : undefined;
  return new Prepared(resolved, assembled, stability, physicality);
}

/**
 * A prepared set-up whose warnings are written when read, as the stability summary is (a class:
 * see docs/performance.md on getters).
 */
class Prepared implements PreparedSetup {
  #warnings: readonly string[] | undefined;

  constructor(
    readonly setup: ResolvedSetup,
    readonly assembled: AssembledSetup,
    readonly stability: StabilityReport,
    readonly physicality: PhysicalityReport | undefined,
  ) {}

  get cautions(): readonly string[] {
    return this.assembled.cautions;
  }

  get warnings(): readonly string[] {
    return (this.#warnings ??= this.#written());
  }

  #written(): readonly string[] {
    const { stability, physicality } = this;
    const dynamics = stability.undamped.length > 0 || stability.held.length > 0 ? [stability.summary] : [];
    return physicality && !physicality.physical ? [...dynamics, physicality.summary] : dynamics;
  }

  /** In JSON as a plain object would be: its fields, cautions and warnings. */
  toJSON(): PreparedSetup {
    const { setup, assembled, stability, physicality, cautions, warnings } = this;
    return { setup, assembled, stability, physicality, cautions, warnings };
  }
}

/** A validated set-up carries its component kinds in a Map, which no JSON document can hold. */
function isResolved(setup: unknown): setup is ResolvedSetup {
  return typeof setup === "object" && setup !== null && (setup as { kinds?: unknown }).kinds instanceof Map;
}

function resolveWithValues(setup: string | SetupDescription | ResolvedSetup, values: SetupValues | undefined): ResolvedSetup {
  if (values === undefined) return isResolved(setup) ? setup : loadSetup(setup);
  if (typeof values !== "object" || values === null || Array.isArray(values)) {
    throw new QuietframeError({ path: "values", value: values, problem: "must be an object", allowed: '{ "component.parameter": value }, e.g. { "membrane.temperature": "6 K" }' });
  }
  if (isResolved(setup)) {
    throw new QuietframeError({
      path: "values",
      value: values,
      problem: "cannot be written into a set-up that is already validated",
      allowed: "the set-up description (or its JSON text) together with the values, or no values",
    });
  }
  const description = typeof setup === "string" ? parseJsonText(setup, "setup") : setup;
  // A malformed description goes to validation as it is, which names what is wrong with it.
  if (!hasComponentList(description)) return loadSetup(description);
  return loadSetup(applyValues(description, values));
}

function hasComponentList(description: unknown): description is SetupDescription {
  const components = (description as { components?: unknown } | null)?.components;
  return Array.isArray(components) && components.every((c) => typeof c === "object" && c !== null);
}
