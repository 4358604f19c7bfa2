/**
 * Pass 2 of the pipeline: a parsed set-up description checked and resolved — units to SI,
 * ports to links, ranges and cross-parameter rules — with errors that name every field at fault.
 */
import { didYouMean } from "../nearest-name";
import { QuietframeError, QuietframeErrors } from "../errors";
import { componentKind, COMPONENT_KINDS } from "../components/registry";
import type { ComponentKind, PortSpec, ResolvedComponent } from "../components/types";
import { copyDescription } from "./copy-description";
import { parseGrid, type FrequencyGridSpec } from "./grid";
import { SETUP_FORMAT, SETUP_KEYS, SETUP_VERSION, type SetupDescription } from "./format";
import { resolveParams } from "./params";
import { resolveClassicalNoise, type ResolvedClassicalNoise } from "./classical-noise";

export interface PortRef {
  readonly component: string;
  readonly port: string;
}

export interface OpticalLink {
  readonly from: PortRef;
  readonly to: PortRef;
}

export interface MechanicalLink {
  readonly probe: PortRef;
  readonly body: string;
}

/** A set-up after validation: parameters in SI, ports resolved; everything the engine needs. */
export interface ResolvedSetup {
  readonly name: string;
  readonly description: string;
  readonly components: readonly ResolvedComponent[];
  readonly kinds: ReadonlyMap<string, ComponentKind<unknown>>;
  readonly optical: readonly OpticalLink[];
  readonly mechanical: readonly MechanicalLink[];
  readonly readout: readonly string[];
  readonly signal: { readonly kind: string; readonly on: string; readonly referTo?: string };
  readonly grid?: FrequencyGridSpec;
  /** Classical noise terms (empty when the set-up has none). */
  readonly classical: readonly ResolvedClassicalNoise[];
  /** The description exactly as given (after JSON parsing), for states and methods text. */
  readonly source: SetupDescription;
}

const NAME_PATTERN = /^[A-Za-z_][A-Za-z0-9_-]{0,63}$/;

/** Validates a parsed set-up description. Throws QuietframeError(s) naming every field at fault. */
export function validateSetup(input: unknown): ResolvedSetup {
  const problems: QuietframeError[] = [];
  const attempt = <T>(fn: () => T): T | undefined => {
    try {
      return fn();
    } catch (e) {
      if (e instanceof QuietframeError) problems.push(e);
      else if (e instanceof QuietframeErrors) problems.push(...e.problems);
      else throw e;
      return undefined;
    }
  };
  const fail = (): never => {
    throw problems.length === 1 ? problems[0] : new QuietframeErrors(problems);
  };

  const top = attempt(() => expectObject(input, "setup"));
  if (!top) return fail();
  attempt(() => checkHeader(top));
  for (const key of Object.keys(top)) {
    if (!(SETUP_KEYS as readonly string[]).includes(key)) {
      // A blank or unusual key is quoted, so the message still points at something visible.
      const path = /^[A-Za-z_$][\w$]*$/.test(key) ? key : `[${JSON.stringify(key)}]`;
      problems.push(new QuietframeError({ path, problem: "is not a field of a set-up", allowed: SETUP_KEYS.join(", ") }));
    }
  }

  const components: ResolvedComponent[] = [];
  const kinds = new Map<string, ComponentKind<unknown>>();
  const list = attempt(() => expectArray(top.components, "components", 1));
  (list ?? []).forEach((entry, i) => {
    const resolved = attempt(() => resolveComponent(entry, i, kinds));
    if (resolved) components.push(resolved);
  });
  if (problems.length) fail();

  const links = attempt(() => resolveConnections(top.connections, components, kinds));
  const readout = attempt(() => resolveReadout(top.readout, kinds));
  const signal = attempt(() => resolveSignal(top.signal, kinds));
  const grid = top.grid === undefined ? undefined : attempt(() => parseGrid(top.grid, "grid"));
  const classical = top.classicalNoise === undefined ? [] : attempt(() => resolveClassicalNoise(top.classicalNoise, components, kinds, links?.optical));
  const name = attempt(() => optionalText(top.name, "name")) ?? "";
  const description = attempt(() => optionalText(top.description, "description")) ?? "";
  if (problems.length || !links || !readout || !signal || !classical) return fail();

  return {
    name,
    description,
    components,
    kinds,
    optical: links.optical,
    mechanical: links.mechanical,
    readout,
    signal,
    grid,
    classical,
    source: copyDescription(top) as unknown as SetupDescription,
  };
}

/**
 * A readout whose every detector has efficiency 0 sees only its own vacuum: it carries no
 * information, and the signal-referred noise would be infinite. Refused (at evaluation, so a
 * control can still pass through 0 and keep its last valid state), naming the detector,
 * rather than drawn as an infinite curve.
 */
export function requireSomeDetection(setup: ResolvedSetup): void {
  const detectors = setup.readout.map((name) => setup.components.find((c) => c.name === name));
  const blind = detectors.filter((c): c is ResolvedComponent => c !== undefined && c.values.efficiency === 0);
  if (blind.length === 0 || blind.length < setup.readout.length) return;
  const first = blind[0];
  const who = blind.length > 1 ? `every detector of the readout (${blind.map((c) => `'${c.name}'`).join(", ")}) has` : `detector '${first.name}' has`;
  throw new QuietframeError({
    path: `${first.path}.efficiency`,
    value: first.raw.efficiency ?? 0,
    problem: `${who} efficiency 0: it sees no signal (no light is detected), so the readout carries no information and the signal-referred noise would be infinite`,
    allowed: "an efficiency above 0 for at least one detector of the readout",
  });
}

function checkHeader(top: Record<string, unknown>): void {
  if (top.format !== SETUP_FORMAT) {
    throw new QuietframeError({ path: "format", value: top.format, problem: "is not a quietframe set-up", allowed: `"${SETUP_FORMAT}"` });
  }
  if (typeof top.version !== "number" || !Number.isInteger(top.version) || top.version < 1) {
    throw new QuietframeError({ path: "version", value: top.version, problem: "must be a positive integer", allowed: String(SETUP_VERSION) });
  }
  if (top.version > SETUP_VERSION) {
    throw new QuietframeError({
      path: "version",
      value: top.version,
      problem: "was written by a newer quietframe than this one",
      allowed: `versions up to ${SETUP_VERSION}; upgrade quietframe to read it`,
    });
  }
}

function resolveComponent(entry: unknown, i: number, kinds: Map<string, ComponentKind<unknown>>): ResolvedComponent {
  const obj = expectObject(entry, `components[${i}]`);
  for (const key of Object.keys(obj)) {
    if (!["name", "type", "params"].includes(key)) {
      throw new QuietframeError({ path: `components[${i}].${key}`, problem: "is not a field of a component", allowed: "name, type, params" });
    }
  }
  const name = obj.name;
  if (typeof name !== "string" || !NAME_PATTERN.test(name)) {
    throw new QuietframeError({
      path: `components[${i}].name`,
      value: name,
      problem: "is not a valid component name",
      allowed: "a letter or _, then letters, digits, _ or - (at most 64 characters)",
    });
  }
  if (kinds.has(name)) {
    throw new QuietframeError({ path: `components[${i}].name`, value: name, problem: "is used by another component", allowed: "unique names" });
  }
  const path = `components.${name}`;
  const kind = typeof obj.type === "string" ? componentKind(obj.type) : undefined;
  if (!kind) {
    throw new QuietframeError({
      path: `${path}.type`,
      value: obj.type,
      problem: "is not a known component type",
      allowed: [...COMPONENT_KINDS.keys()].join(", "),
      choices: [...COMPONENT_KINDS.keys()],
    });
  }
  const resolved = resolveComponentParams(name, kind, obj.params);
  kinds.set(name, kind);
  return resolved;
}

/**
 * A component's parameters (`params` as written, possibly absent) resolved to SI values and
 * checked, its cross-parameter rules included; its name and kind are already checked.
 */
export function resolveComponentParams(name: string, kind: ComponentKind<unknown>, params: unknown): ResolvedComponent {
  const path = `components.${name}`;
  const raw = params === undefined ? {} : expectObject(params, `${path}.params`);
  const { values, given } = resolveParams(kind, raw, path);
  const resolved: ResolvedComponent = { name, type: kind.type, values, given, raw, path };
  kind.crossCheck?.(resolved);
  return resolved;
}

function resolveConnections(input: unknown, components: readonly ResolvedComponent[], kinds: ReadonlyMap<string, ComponentKind<unknown>>): { optical: OpticalLink[]; mechanical: MechanicalLink[] } {
  const list = input === undefined ? [] : expectArray(input, "connections", 0);
  const used = new Map<string, string>();
  const optical: OpticalLink[] = [];
  const mechanical: MechanicalLink[] = [];
  list.forEach((pair, i) => {
    const path = `connections[${i}]`;
    if (!Array.isArray(pair) || pair.length !== 2 || typeof pair[0] !== "string" || typeof pair[1] !== "string") {
      throw new QuietframeError({ path, value: pair, problem: "is not a pair of ports", allowed: '["source.out", "target.in"]' });
    }
    const a = resolvePort(pair[0], `${path}[0]`, kinds);
    const b = resolvePort(pair[1], `${path}[1]`, kinds);
    const mark = (ref: PortRef, spec: PortSpec, where: string): void => {
      if (spec.kind === "mechanical-body") return; // a body carries any number of probes and baths
      const key = `${ref.component}.${ref.port}`;
      const earlier = used.get(key);
      if (earlier) {
        throw new QuietframeError({ path: where, value: key, problem: `port is already connected in ${earlier}`, allowed: "each port connected once (use a beam splitter to split light)" });
      }
      used.set(key, path);
    };
    if (a.spec.kind === "optical-out" && b.spec.kind === "optical-in") {
      optical.push({ from: a.ref, to: b.ref });
    } else if (a.spec.kind === "mechanical-probe" && b.spec.kind === "mechanical-body") {
      mechanical.push({ probe: a.ref, body: b.ref.component });
    } else if (a.spec.kind === "mechanical-body" && b.spec.kind === "mechanical-probe") {
      mechanical.push({ probe: b.ref, body: a.ref.component });
    } else {
      throw new QuietframeError({
        path,
        value: pair,
        problem: `cannot connect a ${a.spec.kind} port to a ${b.spec.kind} port`,
        allowed: "optical-out → optical-in, or a probe's mechanical port ↔ a body",
      });
    }
    mark(a.ref, a.spec, `${path}[0]`);
    mark(b.ref, b.spec, `${path}[1]`);
  });
  for (const c of components) {
    const kind = kinds.get(c.name)!;
    for (const spec of kind.ports) {
      if (spec.kind === "mechanical-body" || spec.optional) continue;
      if (!used.has(`${c.name}.${spec.name}`)) {
        throw new QuietframeError({
          path: `connections`,
          value: `${c.name}.${spec.name}`,
          problem: `port is left unconnected (${spec.kind}: ${spec.doc})`,
          allowed: spec.kind === "optical-out" ? "connect it to a detector, another component or a dump" : "connect every input and probe port",
        });
      }
    }
  }
  return { optical, mechanical };
}

function resolvePort(text: string, path: string, kinds: ReadonlyMap<string, ComponentKind<unknown>>): { ref: PortRef; spec: PortSpec } {
  const dot = text.lastIndexOf(".");
  const component = dot > 0 ? text.slice(0, dot) : text;
  const port = dot > 0 ? text.slice(dot + 1) : "";
  const kind = kinds.get(component);
  if (!kind) {
    throw new QuietframeError({ path, value: text, problem: `no component named '${component}'${didYouMean(component, [...kinds.keys()])}`, allowed: [...kinds.keys()].join(", ") });
  }
  const spec = kind.ports.find((p) => p.name === port);
  if (!spec) {
    throw new QuietframeError({
      path,
      value: text,
      problem: `'${component}' (${kind.type}) has no port '${port}'`,
      allowed: kind.ports.map((p) => `${component}.${p.name}`).join(", ") || "none (it has no ports)",
      choices: kind.ports.map((p) => `${component}.${p.name}`),
    });
  }
  return { ref: { component, port }, spec };
}

function resolveReadout(input: unknown, kinds: ReadonlyMap<string, ComponentKind<unknown>>): string[] {
  const list = expectArray(input, "readout", 1);
  const detectors = [...kinds.entries()].filter(([, k]) => k.type === "homodyne").map(([n]) => n);
  return list.map((name, i) => {
    if (typeof name !== "string" || !detectors.includes(name)) {
      throw new QuietframeError({
        path: `readout[${i}]`,
        value: name,
        problem: "is not a detector of this set-up",
        allowed: detectors.length ? detectors.join(", ") : "none: add a homodyne detector",
        choices: detectors,
      });
    }
    if (list.indexOf(name) !== i) {
      throw new QuietframeError({ path: `readout[${i}]`, value: name, problem: "is listed twice", allowed: "each detector once" });
    }
    return name;
  });
}

function resolveSignal(input: unknown, kinds: ReadonlyMap<string, ComponentKind<unknown>>): ResolvedSetup["signal"] {
  const obj = expectObject(input, "signal");
  for (const key of Object.keys(obj)) {
    if (!["kind", "on", "referTo"].includes(key)) {
      throw new QuietframeError({ path: `signal.${key}`, problem: "is not a field of the signal", allowed: "kind, on, referTo" });
    }
  }
  const receivers = [...kinds.entries()].filter(([, k]) => k.signals?.length);
  const target = typeof obj.on === "string" ? kinds.get(obj.on) : undefined;
  if (!target || !target.signals?.length) {
    throw new QuietframeError({
      path: "signal.on",
      value: obj.on,
      problem: "is not a component that can receive a signal",
      allowed: receivers.map(([n, k]) => `${n} (${k.signals!.join(", ")})`).join(", ") || "none in this set-up",
    });
  }
  if (typeof obj.kind !== "string" || !target.signals.includes(obj.kind)) {
    throw new QuietframeError({ path: "signal.kind", value: obj.kind, problem: `'${obj.on}' cannot receive this signal`, allowed: target.signals.join(", ") });
  }
  if (obj.referTo !== undefined && typeof obj.referTo !== "string") {
    throw new QuietframeError({ path: "signal.referTo", value: obj.referTo, problem: "must be a word", allowed: '"displacement" or "force"' });
  }
  return { kind: obj.kind, on: obj.on as string, referTo: obj.referTo as string | undefined };
}

function expectObject(v: unknown, path: string): Record<string, unknown> {
  if (typeof v !== "object" || v === null || Array.isArray(v)) {
    throw new QuietframeError({ path, value: v, problem: "must be a JSON object", allowed: "{ ... }" });
  }
  return v as Record<string, unknown>;
}

function expectArray(v: unknown, path: string, minLength: number): unknown[] {
  if (!Array.isArray(v) || v.length < minLength) {
    throw new QuietframeError({ path, value: v, problem: minLength ? "must be a non-empty array" : "must be an array", allowed: "[ ... ]" });
  }
  return v;
}

function optionalText(v: unknown, path: string): string | undefined {
  if (v === undefined) return undefined;
  if (typeof v !== "string" || v.length > 10_000) {
    throw new QuietframeError({ path, value: v, problem: "must be text (at most 10,000 characters)", allowed: "a string" });
  }
  return v;
}
