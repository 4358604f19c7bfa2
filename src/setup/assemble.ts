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
import type { OpticalLink, ResolvedSetup } from "./validate";
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
  const { components, kinds } = setup;
  const builder = new NetworkBuilder();
  // Components by their index in the set-up: no keys to build per call.
  const indexOf = new Map<string, number>();
  const handles: unknown[] = [];
  for (let k = 0; k < components.length; k++) {
    const c = components[k];
    indexOf.set(c.name, k);
    handles.push(kinds.get(c.name)!.allocate(builder, c));
  }
  const handleOf = (name: string): unknown => handles[indexOf.get(name)!];
  const classical = setup.classical.map((term) => allocateClassicalNoise(builder, term, kinds.get(term.on)!, components[indexOf.get(term.on)!], () => handleOf(term.on)));
  builder.freeze();

  const bodyOf = (name: string): MechanicalBody => {
    const kind = kinds.get(name)!;
    if (!kind.body) throw new Error(`internal: '${name}' has a body port but no body`);
    return kind.body(handleOf(name));
  };
  const arriving = linksArriving(setup, indexOf);
  // What each component sends out, by port, once it is wired.
  const emitted: (Readonly<Record<string, Field>> | undefined)[] = [];
  const linkedBodies: Record<string, MechanicalBody | undefined>[] = [];

  for (const k of flowOrder(setup, indexOf)) {
    const component = components[k];
    const kind = kinds.get(component.name)!;
    const inputs: Record<string, Field> = {};
    const bodies: Record<string, MechanicalBody | undefined> = {};
    for (const port of kind.ports) {
      if (port.kind === "optical-in") {
        // An optional input left unconnected is absent; the component decides what that means.
        const from = lastLinkInto(arriving[k], port.name)?.from;
        if (from) inputs[port.name] = emittedLight(emitted[indexOf.get(from.component)!], from, `${component.name}.${port.name}`);
      } else if (port.kind === "mechanical-probe") {
        const link = setup.mechanical.find((l) => l.probe.component === component.name && l.probe.port === port.name);
        bodies[port.name] = link ? bodyOf(link.body) : undefined;
      }
    }
    linkedBodies[k] = bodies;
    // A laser's intensity noise rides on the light arriving at the component that carries its drive.
    const drives = classical.flatMap((t) => (t.drive?.on === component.name ? [t.drive] : []));
    emitted[k] = kind.wire({ builder, component, handle: handles[k], inputs: withDriveNoise(builder, inputs, drives), bodies });
  }

  const target = kinds.get(setup.signal.on)!;
  target.applySignal!(builder, handleOf(setup.signal.on), setup.signal.kind);
  for (const term of classical) term.enter();
  const model = builder.build();
  const signal = target.signalReference!(handleOf(setup.signal.on), setup.signal.kind);
  const referredTo = pickQuantity(signal, setup.signal.referTo);
  const readoutRows = setup.readout.map((d) => model.outputs.findIndex((o) => o.owner === d));
  return new Assembled(setup, model, readoutRows, signal, referredTo, linkedBodies);
}

/** The optical links into each component, by its index, in the set-up's order. */
function linksArriving(setup: ResolvedSetup, indexOf: ReadonlyMap<string, number>): OpticalLink[][] {
  const arriving: OpticalLink[][] = setup.components.map(() => []);
  for (const l of setup.optical) arriving[indexOf.get(l.to.component)!].push(l);
  return arriving;
}

/** The link into `port` (the last one listed, as a later connection to a port replaces an earlier one). */
function lastLinkInto(links: readonly OpticalLink[], port: string): OpticalLink | undefined {
  for (let k = links.length - 1; k >= 0; k--) if (links[k].to.port === port) return links[k];
  return undefined;
}

/**
 * An assembled set-up whose cautions are written when first read: their text costs more than a
 * small model's assembly, and searches never read them (a class: see docs/performance.md on getters).
 */
class Assembled implements AssembledSetup {
  /** The bodies on each component's probe ports, by the component's index. */
  readonly #linkedBodies: readonly Record<string, MechanicalBody | undefined>[];
  #cautions: readonly string[] | undefined;

  constructor(
    readonly setup: ResolvedSetup,
    readonly model: StateSpaceModel,
    readonly readoutRows: readonly number[],
    readonly signal: SignalReference,
    readonly referredTo: ReferredQuantity,
    linkedBodies: readonly Record<string, MechanicalBody | undefined>[],
  ) {
    this.#linkedBodies = linkedBodies;
  }

  get cautions(): readonly string[] {
    const setup = this.setup;
    const linkedBodies = this.#linkedBodies;
    return (this.#cautions ??= setup.components.flatMap((c, k) => setup.kinds.get(c.name)!.cautions?.(c, linkedBodies[k] ?? {}) ?? []));
  }

  /** In JSON as a plain object would be: its fields and its cautions. */
  toJSON(): AssembledSetup {
    const { setup, model, readoutRows, signal, referredTo, cautions } = this;
    return { setup, model, readoutRows, signal, referredTo, cautions };
  }
}

/** The light leaving `from` (`sent`: what that component sends out); an optional output that carries none in this configuration is refused by name. */
function emittedLight(sent: Readonly<Record<string, Field>> | undefined, from: { component: string; port: string }, to: string): Field {
  const field = sent !== undefined && Object.hasOwn(sent, from.port) ? sent[from.port] : undefined;
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

/** Topological order (component indices) of the optical graph (Kahn); a loop is an error that names it. */
function flowOrder(setup: ResolvedSetup, indexOf: ReadonlyMap<string, number>): number[] {
  const count = setup.components.length;
  const indegree: number[] = [];
  const next: number[][] = [];
  for (let k = 0; k < count; k++) {
    indegree.push(0);
    next.push([]);
  }
  for (const l of setup.optical) {
    const to = indexOf.get(l.to.component)!;
    indegree[to]++;
    next[indexOf.get(l.from.component)!].push(to);
  }
  const order: number[] = [];
  for (let k = 0; k < count; k++) if (indegree[k] === 0) order.push(k);
  // `order` doubles as Kahn's queue: everything after `done` is ready and waiting.
  for (let done = 0; done < order.length; done++) {
    for (const m of next[order[done]]) if (--indegree[m] === 0) order.push(m);
  }
  if (order.length < count) {
    const inLoop = setup.components.filter((_, k) => !order.includes(k)).map((c) => c.name);
    throw new QuietframeError({
      path: "connections",
      value: inLoop.join(", "),
      problem: "light runs in a closed loop through these components",
      allowed: "travelling light without feedback loops (model a resonator as a cavity component)",
    });
  }
  return order;
}
