/**
 * The assemble pass: a validated set-up becomes a state-space model. Components claim
 * modes and inputs, light is wired through them in flow order, the signal is applied.
 * It sits above components and network (which know nothing of set-ups).
 */
import type { MechanicalBody, ReferredQuantity, SignalReference } from "../components/types";
import { QuietframeError } from "../errors";
import { NetworkBuilder } from "../network/builder";
import type { Field } from "../network/linear-form";
import type { StateSpaceModel } from "../network/model";
import type { ResolvedSetup } from "./validate";
import { allocateClassicalNoise } from "./classical-entry";
import { withDriveNoise } from "./classical-laser";

/** A set-up turned into matrices, plus what is needed to read the results. */
export interface AssembledSetup {
  readonly setup: ResolvedSetup;
  readonly model: StateSpaceModel;
  /** Rows of the model's outputs that the set-up reads, in readout order. */
  readonly readoutRows: readonly number[];
  readonly signal: SignalReference;
  /** The quantity the noise is expressed in (signal.referTo or the target's first). */
  readonly referredTo: ReferredQuantity;
  /** Safety cautions collected from components. */
  readonly cautions: readonly string[];
}

/**
 * Builds the state-space model: (1) every component claims its modes and inputs, then each
 * classical noise term its own input, (2) light is wired through the components in flow order,
 * so each receives fully formed input fields, (3) the signal is applied, the classical terms
 * enter where they act, and the matrices are collected.
 */
export function assemble(setup: ResolvedSetup): AssembledSetup {
  const builder = new NetworkBuilder();
  const handles = new Map<string, unknown>();
  for (const c of setup.components) handles.set(c.name, setup.kinds.get(c.name)!.allocate(builder, c));
  const componentNamed = (name: string) => setup.components.find((x) => x.name === name)!;
  const classical = setup.classical.map((term) => allocateClassicalNoise(builder, term, setup.kinds.get(term.on)!, componentNamed(term.on), () => handles.get(term.on)));
  builder.freeze();

  const bodyOf = (name: string): MechanicalBody => {
    const kind = setup.kinds.get(name)!;
    if (!kind.body) throw new Error(`internal: '${name}' has a body port but no body`);
    return kind.body(handles.get(name));
  };
  const sourceOf = new Map(setup.optical.map((l) => [`${l.to.component}.${l.to.port}`, l.from]));
  const emitted = new Map<string, Field>();
  const linkedBodies = new Map<string, Record<string, MechanicalBody | undefined>>();

  for (const c of flowOrder(setup)) {
    const kind = setup.kinds.get(c)!;
    const component = componentNamed(c);
    const inputs: Record<string, Field> = {};
    const bodies: Record<string, MechanicalBody | undefined> = {};
    for (const port of kind.ports) {
      if (port.kind === "optical-in") {
        // An optional input left unconnected is absent; the component decides what that means.
        const from = sourceOf.get(`${c}.${port.name}`);
        if (from) inputs[port.name] = emittedLight(emitted, from, `${c}.${port.name}`);
      } else if (port.kind === "mechanical-probe") {
        const link = setup.mechanical.find((l) => l.probe.component === c && l.probe.port === port.name);
        bodies[port.name] = link ? bodyOf(link.body) : undefined;
      }
    }
    linkedBodies.set(c, bodies);
    // A laser's intensity noise rides on the light arriving at the component that carries its drive.
    const drives = classical.flatMap((t) => (t.drive?.on === c ? [t.drive] : []));
    const out = kind.wire({ builder, component, handle: handles.get(c), inputs: withDriveNoise(builder, inputs, drives), bodies });
    for (const [port, field] of Object.entries(out)) emitted.set(`${c}.${port}`, field);
  }

  const target = setup.kinds.get(setup.signal.on)!;
  target.applySignal!(builder, handles.get(setup.signal.on), setup.signal.kind);
  for (const term of classical) term.enter();
  const model = builder.build();
  const signal = target.signalReference!(handles.get(setup.signal.on), setup.signal.kind);
  const referredTo = pickQuantity(signal, setup.signal.referTo);
  const readoutRows = setup.readout.map((d) => model.outputs.findIndex((o) => o.owner === d));
  return new Assembled(setup, model, readoutRows, signal, referredTo, linkedBodies);
}

/**
 * An assembled set-up whose cautions are written when first read: their text costs more than a
 * small model's assembly, and searches never read them. A class rather than an object literal
 * with a getter: a getter closure in a literal gives every result a hidden class of its own,
 * which is slow to make and keeps short-lived objects alive through garbage collections.
 */
class Assembled implements AssembledSetup {
  readonly #linkedBodies: ReadonlyMap<string, Record<string, MechanicalBody | undefined>>;
  #cautions: readonly string[] | undefined;

  constructor(
    readonly setup: ResolvedSetup,
    readonly model: StateSpaceModel,
    readonly readoutRows: readonly number[],
    readonly signal: SignalReference,
    readonly referredTo: ReferredQuantity,
    linkedBodies: ReadonlyMap<string, Record<string, MechanicalBody | undefined>>,
  ) {
    this.#linkedBodies = linkedBodies;
  }

  get cautions(): readonly string[] {
    const setup = this.setup;
    const linkedBodies = this.#linkedBodies;
    return (this.#cautions ??= setup.components.flatMap((c) => setup.kinds.get(c.name)!.cautions?.(c, linkedBodies.get(c.name) ?? {}) ?? []));
  }

  /** In JSON as a plain object would be: its fields and its cautions. */
  toJSON(): AssembledSetup {
    const { setup, model, readoutRows, signal, referredTo, cautions } = this;
    return { setup, model, readoutRows, signal, referredTo, cautions };
  }
}

/** The light leaving `from`; an optional output that carries none in this configuration is refused by name. */
function emittedLight(emitted: ReadonlyMap<string, Field>, from: { component: string; port: string }, to: string): Field {
  const field = emitted.get(`${from.component}.${from.port}`);
  if (field) return field;
  throw new QuietframeError({
    path: "connections",
    value: `${from.component}.${from.port} → ${to}`,
    problem: `'${from.component}.${from.port}' carries no light as '${from.component}' is configured (an optional output whose parameters are absent)`,
    allowed: "give the parameters that bring that output into use (e.g. an interferometer's idlerDetuning for idlerOut), or remove the connection",
  });
}

function pickQuantity(signal: SignalReference, referTo: string | undefined): ReferredQuantity {
  if (referTo === undefined) return signal.quantities[0];
  const q = signal.quantities.find((x) => x.name === referTo);
  if (!q) {
    throw new QuietframeError({
      path: "signal.referTo",
      value: referTo,
      problem: "is not a quantity this signal can be expressed in",
      allowed: signal.quantities.map((x) => `"${x.name}"`).join(" or "),
    });
  }
  return q;
}

/** Topological order of the optical graph (Kahn); a loop is an error that names it. */
function flowOrder(setup: ResolvedSetup): string[] {
  const names = setup.components.map((c) => c.name);
  const indegree = new Map(names.map((n) => [n, 0]));
  const next = new Map<string, string[]>(names.map((n) => [n, []]));
  for (const l of setup.optical) {
    indegree.set(l.to.component, indegree.get(l.to.component)! + 1);
    next.get(l.from.component)!.push(l.to.component);
  }
  const ready = names.filter((n) => indegree.get(n) === 0);
  const order: string[] = [];
  while (ready.length) {
    const n = ready.shift()!;
    order.push(n);
    for (const m of next.get(n)!) {
      indegree.set(m, indegree.get(m)! - 1);
      if (indegree.get(m) === 0) ready.push(m);
    }
  }
  if (order.length < names.length) {
    const inLoop = names.filter((n) => !order.includes(n));
    throw new QuietframeError({
      path: "connections",
      value: inLoop.join(", "),
      problem: "light runs in a closed loop through these components",
      allowed: "travelling light without feedback loops (model a resonator as a cavity component)",
    });
  }
  return order;
}
