/**
 * The JSON Schema (draft 2020-12) of the sweep description, written to schema/sweep.schema.json
 * by `npm run schema` beside the set-up format's schema, which it refers to for the set-up.
 * Shape only, for editors and other tools: values with units, ranges and parameter names stay
 * with the checks of resolveSweep, which name the field and what is allowed.
 */
import { ALL_FIGURE_KINDS } from "../figures/spec";
import { SETUP_SCHEMA_ID } from "../setup/schema";
import { MAX_TOLERANCE_CELLS } from "../tolerance/spec";
import { DEFAULT_CHUNKS, SWEEP_FORMAT, SWEEP_VERSION } from "./format";

export const SWEEP_SCHEMA_ID = `https://quietframe.dev/schema/sweep-${SWEEP_VERSION}.json`;

type Schema = Record<string, unknown>;

const VALUE: Schema = { anyOf: [{ type: "string" }, { type: "number" }], description: 'A value with its unit ("-15 dB", "95 %", "1.1 MHz"); a bare number for counts and fractions.' };

export function sweepJsonSchema(): Schema {
  const axis: Schema = {
    type: "object",
    properties: {
      target: { type: "string", pattern: "^[^.]+\\.[^.]+$", description: '"component.parameter", a parameter with a value on a scale.' },
      from: { ...VALUE, description: "First value." },
      to: { ...VALUE, description: "Last value, above from." },
      points: { type: "integer", minimum: 2, maximum: MAX_TOLERANCE_CELLS, description: "Number of values, both ends included." },
      scale: { enum: ["linear", "log"], description: "Spacing of the values (default: log when to/from ≥ 10 and from > 0)." },
    },
    required: ["target", "from", "to", "points"],
    additionalProperties: false,
  };
  return {
    $schema: "https://json-schema.org/draft/2020-12/schema",
    $id: SWEEP_SCHEMA_ID,
    title: "quietframe sweep",
    description:
      "A large computation over one set-up — a tolerance map over two parameters, a seeded Monte Carlo over uncertain ones or an optimization from many starts — cut into chunks that run locally or as Slurm array jobs.",
    type: "object",
    properties: {
      format: { const: SWEEP_FORMAT, description: "Marks the file as a quietframe sweep." },
      version: { const: SWEEP_VERSION, description: `Version of the sweep format; this schema describes version ${SWEEP_VERSION}.` },
      name: { type: "string", maxLength: 200, description: "Short title: job names and the result's title." },
      setup: {
        anyOf: [{ $ref: SETUP_SCHEMA_ID }, { type: "string", description: "A set-up file, relative to the sweep file (the CLI reads it in)." }],
        description: "The set-up every evaluation starts from.",
      },
      vary: {
        oneOf: [
          {
            type: "object",
            description: "A grid over two parameters (a tolerance map); a chunk is a block of rows.",
            properties: { kind: { const: "grid" }, x: { ...axis, description: "Columns." }, y: { ...axis, description: "Rows." } },
            required: ["kind", "x", "y"],
            additionalProperties: false,
          },
          {
            type: "object",
            description: "Seeded Monte Carlo samples of uncertain parameters; a chunk is a block of samples.",
            properties: {
              kind: { const: "samples" },
              uncertain: {
                type: "array",
                minItems: 1,
                items: {
                  type: "object",
                  properties: {
                    target: { type: "string", description: '"component.parameter".' },
                    value: { type: "string", description: '"95 % ± 2 %" or "± 2 %", optionally ending in normal or uniform.' },
                    distribution: { enum: ["normal", "uniform"] },
                  },
                  required: ["target", "value"],
                  additionalProperties: false,
                },
              },
              samples: { type: "integer", minimum: 2, maximum: 100000, description: "Number of samples (default 1000)." },
              seed: { type: "integer", minimum: 0, maximum: 4294967295, description: "Seed of the draws (default 1)." },
              target: { ...VALUE, description: "A figure to reach; the result reports the probability of reaching it." },
            },
            required: ["kind", "uncertain"],
            additionalProperties: false,
          },
          {
            type: "object",
            description: "Optimizer starts: the current values, then seeded random points; a chunk is a block of starts.",
            properties: {
              kind: { const: "starts" },
              parameters: {
                type: "array",
                minItems: 1,
                items: {
                  type: "object",
                  properties: { target: { type: "string", description: '"component.parameter".' }, min: VALUE, max: VALUE },
                  required: ["target"],
                  additionalProperties: false,
                },
              },
              starts: { type: "integer", minimum: 1, maximum: 100, description: "Number of starts (default 4)." },
              seed: { type: "integer", minimum: 0, maximum: 4294967295, description: "Seed of the random starts (default 1)." },
              maxEvaluationsPerStart: { type: "integer", minimum: 10, description: "Evaluations allowed per start." },
              tolerance: { type: "number", exclusiveMinimum: 0, exclusiveMaximum: 0.1, description: "Convergence: simplex size in the unit box." },
            },
            required: ["kind", "parameters"],
            additionalProperties: false,
          },
        ],
      },
      figure: {
        type: "object",
        properties: { kind: { enum: [...ALL_FIGURE_KINDS] } },
        required: ["kind"],
        description: "The figure of merit of every evaluation, as for tolerance maps and design answers (docs/api.md).",
      },
      grid: {
        type: "object",
        properties: { from: VALUE, to: VALUE, points: { type: "integer", minimum: 2 } },
        required: ["from", "to"],
        additionalProperties: false,
        description: "Frequency grid of every evaluation (log-spaced); default the set-up's grid.",
      },
      keep: {
        type: "object",
        properties: { curves: { type: "boolean", description: "Samples only: keep each sample's total noise over the grid for percentile bands (default true)." } },
        additionalProperties: false,
      },
      chunkSize: { type: "integer", minimum: 1, description: `Rows (grid), samples or starts per chunk; default: as many as give at most ${DEFAULT_CHUNKS} chunks.` },
    },
    required: ["format", "version", "setup", "vary", "figure"],
    additionalProperties: false,
  };
}
