/**
 * The contract between component plug-ins and the rest of the engine: parameter and port
 * specifications, the resolved component, and the ComponentKind interface itself.
 */
import type { NetworkBuilder } from "../network/builder";
import type { Field } from "../network/linear-form";
import type { MechanicalBody } from "../physics/mechanical-body";
import type { SignalReference } from "../physics/signal-reference";
import type { QuantityKind } from "../units";

export type { MechanicalBody, ThermalBathInfo } from "../physics/mechanical-body";
export type { ReferenceCurve, ReferredQuantity, SignalReference } from "../physics/signal-reference";

/** A parameter whose value carries a unit, e.g. "40 kg". */
export interface QuantityParam {
  readonly name: string;
  readonly kind: QuantityKind;
  /** Meaning, unit and default, shown in `quietframe help` and the docs. */
  readonly doc: string;
  /** The default as a user would write it; absent means required unless `optional`. */
  readonly default?: string | number;
  /** Absent and not defaulted is fine (the component checks alternatives itself). */
  readonly optional?: boolean;
  readonly min?: number;
  readonly max?: number;
  readonly minExclusive?: boolean;
  readonly maxExclusive?: boolean;
  /** Why the range ends where it does, when that is not obvious (shown when a value falls outside it). */
  readonly rangeReason?: string;
}

/** A parameter that is one of a few words, e.g. "positive" | "negative". */
export interface ChoiceParam {
  readonly name: string;
  readonly kind: "choice";
  readonly doc: string;
  readonly choices: readonly string[];
  readonly default?: string;
  readonly optional?: boolean;
}

export type ParamSpec = QuantityParam | ChoiceParam;

export const PORT_KINDS = ["optical-in", "optical-out", "mechanical-probe", "mechanical-body"] as const;
export type PortKind = (typeof PORT_KINDS)[number];

export interface PortSpec {
  readonly name: string;
  readonly kind: PortKind;
  readonly doc: string;
  /**
   * The component also works with this port unlinked: a mechanical probe without a body (an
   * empty cavity), an optical input absent from `inputs` (an interferometer without an idler),
   * an optical output nobody reads.
   */
  readonly optional?: boolean;
}

/** Parameter values after parsing: SI numbers (frequencies in cyclic Hz, angles in rad) or choice words. */
export type ParamValues = Readonly<Record<string, number | string | undefined>>;

export interface ResolvedComponent {
  readonly name: string;
  readonly type: string;
  readonly values: ParamValues;
  /** Names of the parameters the user gave explicitly (the rest were defaulted). */
  readonly given: ReadonlySet<string>;
  /** The parameters exactly as written, for messages. */
  readonly raw: Readonly<Record<string, unknown>>;
  /** Path prefix for messages, e.g. `components.membrane`. */
  readonly path: string;
}

export interface WireContext<H> {
  readonly builder: NetworkBuilder;
  readonly component: ResolvedComponent;
  readonly handle: H;
  /** Light arriving at each optical input port (an unconnected optional port is absent). */
  readonly inputs: Readonly<Record<string, Field>>;
  /** Body linked at each mechanical-probe port (absent if an optional port is unlinked). */
  readonly bodies: Readonly<Record<string, MechanicalBody | undefined>>;
}

/**
 * A kind of component. The engine only knows this interface: a new physical system
 * (a spin ensemble, an interferometer) is a new file that implements it.
 */
export interface ComponentKind<H = unknown> {
  readonly type: string;
  readonly summary: string;
  readonly params: readonly ParamSpec[];
  readonly ports: readonly PortSpec[];
  /** Rules that involve several parameters (e.g. give either power or photons). */
  readonly crossCheck?: (c: ResolvedComponent) => void;
  /** Claims modes and input blocks; runs before any wiring. */
  readonly allocate: (builder: NetworkBuilder, c: ResolvedComponent) => H;
  /** Writes the dynamics; returns the light leaving each optical output port. */
  readonly wire: (ctx: WireContext<H>) => Record<string, Field>;
  /** For components with a mechanical-body port. */
  readonly body?: (handle: H) => MechanicalBody;
  /** Signals this component can receive (e.g. "force"). */
  readonly signals?: readonly string[];
  readonly applySignal?: (builder: NetworkBuilder, handle: H, kind: string) => void;
  readonly signalReference?: (handle: H, kind: string) => SignalReference;
  /**
   * Places classical noise enters this component besides its signals and its body, by name
   * ("force" and "displacement" of one of an interferometer's test masses); the unit of each is
   * that of its name (src/setup/spectrum-units.ts).
   */
  readonly noiseEntries?: Readonly<Record<string, NoiseEntry<H>>>;
  /** A sentence on how this component can make a set-up unstable, used in stability messages. */
  readonly instabilityHint?: (c: ResolvedComponent) => string | undefined;
  /**
   * True when the user declared a control loop that holds this component's growing modes (an
   * interferometer's arm-length servo). A loop that reads the readout acts on signal and noise
   * alike, so spectra referred to the signal stay as computed; growing modes that live only in
   * such components are reported, not refused.
   */
  readonly heldByControl?: (c: ResolvedComponent) => boolean;
  /**
   * Safety cautions (laser power, cryogenics, magnetic fields), repeated in summaries; one
   * sentence each (see src/safety/cautions.ts). `bodies` are the linked bodies, as in wire,
   * for hazards implied through a body (a measurement rate needs its mass and frequency).
   */
  readonly cautions?: (c: ResolvedComponent, bodies: Readonly<Record<string, MechanicalBody | undefined>>) => string[];
}

/**
 * How a classical noise spectrum enters at one of a component's own places of entry: its PSD
 * times `psdScale` is the PSD of an input column that `apply` writes into the dynamics, the way
 * applySignal writes the signal (the engine runs it inside NetworkBuilder.enterAsSignal).
 */
export interface NoiseEntry<H> {
  /** How budgets name the place, followed by the component's name, e.g. "force on each test mass of"; it starts with the entry's name. */
  readonly label: string;
  readonly psdScale: (handle: H) => number;
  readonly apply: (builder: NetworkBuilder, handle: H) => void;
}

export function num(c: ResolvedComponent, name: string): number {
  const v = c.values[name];
  if (typeof v !== "number") throw new Error(`internal: ${c.path}.${name} is not a resolved number`);
  return v;
}

export function maybeNum(c: ResolvedComponent, name: string): number | undefined {
  const v = c.values[name];
  return typeof v === "number" ? v : undefined;
}
