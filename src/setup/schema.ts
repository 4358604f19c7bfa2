/**
 * The JSON Schema (draft 2020-12) of the set-up format, written from the component registry so
 * that the schema, validation, `quietframe types` and the docs share one parameter list.
 */
import { COMPONENT_KINDS } from "../components/registry";
import type { ComponentKind, ParamSpec, QuantityParam } from "../components/types";
import { MAX_GRID_POINTS } from "./grid";
import { QUANTITY_KIND_INFO } from "../units";
import { SETUP_FORMAT, SETUP_KEYS, SETUP_VERSION } from "./format";
import { describeRange } from "./params";
import { SPECTRUM_EXTENSIONS } from "../numeric/log-log-spectrum";
import { AMPLITUDE_BASE_UNITS } from "./spectrum-units";

/** Every place a classical noise can enter (which ones a component takes is checked by the validator). */
const CLASSICAL_ENTRIES = Object.keys(AMPLITUDE_BASE_UNITS);

export const SETUP_SCHEMA_ID = `https://quietframe.dev/schema/setup-${SETUP_VERSION}.json`;

/** Same rule as the validator's component names; schema tests check that the two agree. */
export const COMPONENT_NAME_PATTERN = "^[A-Za-z_][A-Za-z0-9_-]{0,63}$";
export const PORT_REF_PATTERN = "^[A-Za-z_][A-Za-z0-9_-]*\\.[A-Za-z0-9_]+$";

/** Kinds that also take a bare JSON number (the others need a unit, so only a string will do). */
const NUMERIC_KINDS = new Set(["fraction", "count", "number"]);

type Schema = Record<string, unknown>;

/**
 * JSON Schema (draft 2020-12) of the set-up format, built from the component registry so
 * that it lists exactly the types and parameters this build knows. It checks shape only,
 * for editors and other tools; units, ranges and wiring stay with the validator, which
 * gives messages a schema cannot (the value with its unit and the allowed range).
 */
export function setupJsonSchema(): Schema {
  const kinds = [...COMPONENT_KINDS.values()];
  const signalKinds = [...new Set(kinds.flatMap((k) => k.signals ?? []))];
  const properties: Record<(typeof SETUP_KEYS)[number], Schema> = {
    format: { const: SETUP_FORMAT, description: "Marks the file as a quietframe set-up." },
    version: {
      const: SETUP_VERSION,
      description: `Version of the set-up format; this schema describes version ${SETUP_VERSION}.`,
    },
    name: { type: "string", maxLength: 10_000, description: "Short title of the set-up." },
    description: { type: "string", maxLength: 10_000, description: "Free text about the set-up." },
    components: {
      type: "array",
      minItems: 1,
      items: { $ref: "#/$defs/component" },
      description: "The parts of the measurement; each has a unique name and a registered type.",
    },
    connections: {
      type: "array",
      items: { $ref: "#/$defs/connection" },
      description: 'Pairs of ports "component.port": light flows from the first (an output) to the second (an input); ' + "a probe's mechanical port is linked to a body in either order.",
    },
    readout: {
      type: "array",
      minItems: 1,
      uniqueItems: true,
      items: { $ref: "#/$defs/componentName" },
      description: "Names of the detectors whose outputs are used; several are combined optimally.",
    },
    signal: {
      type: "object",
      properties: {
        kind: { enum: signalKinds, description: "What the signal is." },
        on: { $ref: "#/$defs/componentName", description: "The component the signal acts on." },
        referTo: {
          type: "string",
          description: 'Quantity the noise is expressed in, e.g. "displacement" or "force"; defaults to the first the target offers.',
        },
      },
      required: ["kind", "on"],
      additionalProperties: false,
    },
    grid: {
      type: "object",
      properties: {
        from: { type: "string", description: `Lowest frequency: ${QUANTITY_KIND_INFO.frequency.allowed}.` },
        to: { type: "string", description: "Highest frequency, above from." },
        points: { type: "integer", description: `Number of log-spaced points, 2 to ${MAX_GRID_POINTS}.` },
      },
      required: ["from", "to"],
      additionalProperties: false,
      description: "Default frequency grid for evaluation.",
    },
    classicalNoise: {
      type: "array",
      items: { $ref: "#/$defs/classicalNoise" },
      description: "Classical noise terms: measured or modelled spectra entering at named places; each is a budget term of its own.",
    },
  };

  const defs: Record<string, Schema> = {
    componentName: {
      type: "string",
      pattern: COMPONENT_NAME_PATTERN,
      description: "A letter or _, then letters, digits, _ or - (at most 64 characters).",
    },
    connection: {
      type: "array",
      items: { type: "string", pattern: PORT_REF_PATTERN },
      minItems: 2,
      maxItems: 2,
      description: 'Two ports, e.g. ["laser.out", "cavity.in"].',
    },
    classicalNoise: {
      type: "object",
      properties: {
        name: { $ref: "#/$defs/componentName", description: "The term's name in budgets, different from every component's." },
        enters: {
          enum: CLASSICAL_ENTRIES,
          description:
            '"force" or "displacement" on a body or on each test mass of an interferometer, "strain" on an interferometer, "laser intensity" or "laser frequency" on the cavity (or, for intensity, the position probe given its power) that the laser drives.',
        },
        on: { $ref: "#/$defs/componentName", description: "The component the noise enters at." },
        spectrum: {
          type: "object",
          properties: {
            file: {
              type: "string",
              description: "A CSV file (path relative to the set-up file) read when the set-up file is loaded in Node; header with units in brackets, then frequency, ASD lines.",
            },
            frequencyUnit: { type: "string", description: 'Unit of the frequencies, "Hz" (default) with any SI prefix.' },
            unit: {
              type: "string",
              description:
                'Unit of the amplitude spectral density: "N/√Hz" for a force, "m/√Hz" for a displacement, "Hz/√Hz" for laser frequency (any SI prefix), "1/√Hz" for strain and for relative intensity noise.',
            },
            points: {
              type: "array",
              minItems: 2,
              items: { type: "array", items: { type: "number" }, minItems: 2, maxItems: 2 },
              description: "[frequency, ASD] pairs, frequencies strictly increasing, every value finite and above zero.",
            },
            lines: { type: "array", items: { type: "integer" }, description: "Line of each point in its file (written by the loader, for messages)." },
          },
          additionalProperties: false,
          description: "The spectrum: inline points with their units, or a file.",
        },
        beyondRange: { enum: [...SPECTRUM_EXTENSIONS], description: 'Outside the spectrum\'s frequencies: "refuse" (default), "hold" the end values, or continue the end segments as "power-law"s.' },
      },
      required: ["name", "enters", "on", "spectrum"],
      additionalProperties: false,
      description: "One classical noise term.",
    },
    component: {
      oneOf: kinds.map((k) => ({ $ref: `#/$defs/${typeDefName(k.type)}` })),
      description: "One component; its type decides which params it takes.",
    },
  };
  for (const kind of kinds) defs[typeDefName(kind.type)] = componentSchema(kind);

  return {
    $schema: "https://json-schema.org/draft/2020-12/schema",
    $id: SETUP_SCHEMA_ID,
    title: "quietframe set-up",
    description:
      `A measurement set-up for quietframe, format version ${SETUP_VERSION}. This schema checks shape only ` +
      "(field names, types, component types and their parameter names). Units, value ranges, " +
      "connections and whether the detectors see the signal are checked by quietframe itself " +
      "(`quietframe check`), which names the field, the value and what is allowed.",
    type: "object",
    properties,
    required: ["format", "version", "components", "connections", "readout", "signal"],
    additionalProperties: false,
    $defs: defs,
  };
}

function typeDefName(type: string): string {
  return `type-${type}`;
}

function componentSchema(kind: ComponentKind<unknown>): Schema {
  const required = kind.params.filter((p) => p.default === undefined && !p.optional).map((p) => p.name);
  const params: Schema = {
    type: "object",
    // fromEntries defines own properties, so no parameter name can reach a prototype.
    properties: Object.fromEntries(kind.params.map((p) => [p.name, paramSchema(p)])),
    additionalProperties: false,
  };
  if (required.length) params.required = required;
  const ports = kind.ports.map((p) => `${p.name} (${p.kind}${p.optional ? ", optional" : ""})`).join(", ");
  return {
    title: kind.type,
    description: `${kind.summary} Ports: ${ports || "none"}.`,
    type: "object",
    properties: {
      name: { $ref: "#/$defs/componentName" },
      type: { const: kind.type },
      params,
    },
    required: required.length ? ["name", "type", "params"] : ["name", "type"],
    additionalProperties: false,
  };
}

function rangeText(p: QuantityParam): string {
  return p.min === undefined && p.max === undefined ? "" : `; allowed range ${describeRange(p)} (checked by quietframe)`;
}

function paramSchema(p: ParamSpec): Schema {
  const out: Schema =
    p.kind === "choice"
      ? { type: "string", enum: [...p.choices], description: p.doc }
      : {
          // anyOf rather than a type list: ajv's strict mode rejects union types.
          ...(NUMERIC_KINDS.has(p.kind) ? { anyOf: [{ type: "string" }, { type: "number" }] } : { type: "string" }),
          description: `${p.doc} Written as ${QUANTITY_KIND_INFO[p.kind].allowed}${rangeText(p)}.`,
        };
  if (p.default !== undefined) out.default = p.default;
  return out;
}
