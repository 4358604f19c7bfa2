import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import Ajv2020 from "ajv/dist/2020";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { COMPONENT_KINDS } from "../../src/components/registry";
import type { ParamSpec, QuantityParam } from "../../src/components/types";
import { QuietframeError } from "../../src/errors";
import { resolveParams } from "../../src/setup/params";
import { COMPONENT_NAME_PATTERN, SETUP_SCHEMA_ID, setupJsonSchema } from "../../src/setup/schema";
import { validateSetup } from "../../src/setup/validate";
import { componentReferenceMarkdown } from "../../src/setup/component-docs";
import { component, freeMassSetup } from "./fixtures";

// Outside reference for every check in this file: JSON Schema draft 2020-12, validated with ajv
// (its 2020-12 build, strict mode), which knows nothing of quietframe's own validator.

const ROOT = join(__dirname, "..", "..");
const COMMITTED = join(ROOT, "schema", "setup.schema.json");
const EXAMPLES = join(ROOT, "examples");

function compiled() {
  const ajv = new Ajv2020({ strict: true, allErrors: true });
  const validate = ajv.compile(setupJsonSchema());
  const sub = (def: string) => {
    const v = ajv.getSchema(`${SETUP_SCHEMA_ID}#/$defs/${def}`);
    if (!v) throw new Error(`schema has no $defs/${def}`);
    return v;
  };
  return { ajv, validate, sub };
}

describe("committed schema/setup.schema.json", () => {
  it("equals setupJsonSchema() (regenerate with `npm run schema`)", () => {
    const committed: unknown = JSON.parse(readFileSync(COMMITTED, "utf8"));
    expect(committed, "schema/setup.schema.json is stale: run `npm run schema` and commit the result").toEqual(setupJsonSchema());
  });
});

describe("setupJsonSchema() as a draft 2020-12 schema (ajv, strict mode)", () => {
  it("is valid against the draft 2020-12 meta-schema and compiles in strict mode", () => {
    const ajv = new Ajv2020({ strict: true });
    expect(ajv.validateSchema(setupJsonSchema()), JSON.stringify(ajv.errors)).toBe(true);
    expect(() => ajv.compile(setupJsonSchema())).not.toThrow();
  });

  it("declares draft 2020-12 and its own id, and says that units and ranges are checked elsewhere", () => {
    const s = setupJsonSchema() as Record<string, unknown>;
    expect(s.$schema).toBe("https://json-schema.org/draft/2020-12/schema");
    expect(s.$id).toBe(SETUP_SCHEMA_ID);
    expect(String(s.description)).toContain("checks shape only");
    expect(String(s.description)).toContain("Units, value ranges");
  });

  it("has one component variant per registered type, each listing exactly that type's parameters", () => {
    const s = setupJsonSchema() as any;
    expect(s.$defs.component.oneOf).toHaveLength(COMPONENT_KINDS.size);
    for (const kind of COMPONENT_KINDS.values()) {
      const variant = s.$defs[`type-${kind.type}`];
      expect(variant.properties.type).toEqual({ const: kind.type });
      expect(Object.keys(variant.properties.params.properties)).toEqual(kind.params.map((p) => p.name));
      for (const p of kind.params) {
        const ps = variant.properties.params.properties[p.name];
        expect(ps.description, `${kind.type}.${p.name}`).toContain(p.doc);
        if (p.kind === "choice") expect(ps.enum).toEqual(p.choices);
      }
    }
  });
});

describe("examples/*.json against the schema", () => {
  // Top-level examples and the set-ups beside the spectrum files in examples/spectra/.
  const files = [
    ...readdirSync(EXAMPLES).filter((f) => f.endsWith(".json")),
    ...readdirSync(join(EXAMPLES, "spectra"))
      .filter((f) => f.endsWith(".json"))
      .map((f) => join("spectra", f)),
  ];
  it("there are examples to check", () => {
    expect(files.length).toBeGreaterThan(0);
  });
  for (const file of files) {
    it(`${file} is valid`, () => {
      const { validate } = compiled();
      const ok = validate(JSON.parse(readFileSync(join(EXAMPLES, file), "utf8")));
      expect(ok, JSON.stringify(validate.errors, null, 2)).toBe(true);
    });
  }
});

describe("structurally broken set-ups are rejected by the schema", () => {
  const { validate } = compiled();
  const errorsFor = (doc: unknown) => {
    expect(validate(doc)).toBe(false);
    return validate.errors ?? [];
  };

  it("accepts the fixture the broken cases start from", () => {
    expect(validate(freeMassSetup()), JSON.stringify(validate.errors)).toBe(true);
  });

  it("unknown top-level key", () => {
    const s = freeMassSetup();
    s.colour = "blue";
    const errors = errorsFor(s);
    expect(errors).toContainEqual(expect.objectContaining({ instancePath: "", keyword: "additionalProperties", params: { additionalProperty: "colour" } }));
  });

  it("__proto__ as a top-level key (from JSON text, so it is an own key)", () => {
    const s = JSON.parse(JSON.stringify(freeMassSetup()).replace(/^\{/, '{"__proto__":{"polluted":1},'));
    const errors = errorsFor(s);
    expect(errors).toContainEqual(expect.objectContaining({ keyword: "additionalProperties", params: { additionalProperty: "__proto__" } }));
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });

  it("unknown component type", () => {
    const s = freeMassSetup();
    component(s, "mirror").type = "black-hole";
    const errors = errorsFor(s);
    expect(errors).toContainEqual(expect.objectContaining({ instancePath: "/components/1", keyword: "oneOf" }));
  });

  it("unknown parameter name", () => {
    const s = freeMassSetup();
    component(s, "mirror").params.weight = "1 kg";
    const errors = errorsFor(s);
    expect(errors).toContainEqual(expect.objectContaining({ instancePath: "/components/1/params", keyword: "additionalProperties", params: { additionalProperty: "weight" } }));
  });

  it("a required parameter left out", () => {
    const s = freeMassSetup();
    component(s, "mirror").params = {};
    const errors = errorsFor(s);
    expect(errors).toContainEqual(expect.objectContaining({ instancePath: "/components/1/params", keyword: "required", params: { missingProperty: "mass" } }));
  });

  it("a bare number where a unit is needed, and a word outside a choice", () => {
    const s = freeMassSetup();
    component(s, "mirror").params.mass = 40;
    expect(errorsFor(s)).toContainEqual(expect.objectContaining({ instancePath: "/components/1/params/mass", keyword: "type" }));
    const c = { name: "m", type: "oscillator", params: { mass: "1 g", frequency: "1 Hz", Q: 10, temperature: "1 K", massSign: "upside-down" } };
    expect(compiled().sub("type-oscillator")(c)).toBe(false);
  });

  it("a connection that is not a pair of port references", () => {
    for (const bad of [["laser.out"], ["laser.out", "probe.in", "detector.in"], ["laser", "probe.in"], ["laser.out", 3]]) {
      const s = freeMassSetup();
      s.connections[0] = bad;
      expect(validate(s), JSON.stringify(bad)).toBe(false);
    }
  });

  it("a detector listed twice in the readout", () => {
    const s = freeMassSetup();
    s.readout = ["detector", "detector"];
    expect(errorsFor(s)).toContainEqual(expect.objectContaining({ instancePath: "/readout", keyword: "uniqueItems" }));
  });
});

describe("the schema never rejects what the validator accepts (fast-check, seed 11)", () => {
  const { sub } = compiled();
  const nameSchema = sub("componentName");

  /** Whether the validator accepts `name` as a component name (the rest of the set-up is valid). */
  function validatorAcceptsName(name: string): boolean {
    const s = freeMassSetup();
    component(s, "mirror").name = name;
    s.connections[2][1] = `${name}.body`;
    s.signal.on = name;
    try {
      validateSetup(JSON.parse(JSON.stringify(s)));
      return true;
    } catch (e) {
      if (e instanceof QuietframeError && e.path === "components[1].name") return false;
      throw e;
    }
  }

  it("component names: schema pattern and validator agree", () => {
    const others = new Set(["laser", "probe", "detector"]); // taken by the fixture's other components
    const nameLike = fc.stringMatching(/^[A-Za-z_.<>-][A-Za-z0-9_ .<>-]{0,70}$/);
    fc.assert(
      fc.property(fc.oneof(nameLike, fc.string({ maxLength: 70 })), (name) => {
        fc.pre(!others.has(name));
        expect(nameSchema(name), JSON.stringify(name)).toBe(validatorAcceptsName(name));
      }),
      { seed: 11, numRuns: 2000 },
    );
    // The length limit is the boundary most likely to drift between the two.
    expect(nameSchema("m".repeat(64))).toBe(true);
    expect(nameSchema("m".repeat(65))).toBe(false);
    expect(validatorAcceptsName("m".repeat(64))).toBe(true);
    expect(validatorAcceptsName("m".repeat(65))).toBe(false);
    expect(COMPONENT_NAME_PATTERN).toContain("{0,63}");
  });

  it("component parameters: whatever resolveParams accepts, the type's schema accepts", () => {
    for (const kind of COMPONENT_KINDS.values()) {
      const variant = sub(`type-${kind.type}`);
      const valueArb = (p: ParamSpec) =>
        fc.oneof({ weight: 3, arbitrary: fc.constantFrom(...sampleValues(p)) }, { weight: 1, arbitrary: fc.oneof(fc.double(), fc.string({ maxLength: 8 }), fc.boolean(), fc.constant(null)) });
      const paramsArb = fc.record(Object.fromEntries(kind.params.map((p) => [p.name, valueArb(p)])), { requiredKeys: [] });
      fc.assert(
        fc.property(paramsArb, (params) => {
          let accepted = true;
          try {
            resolveParams(kind, params, `components.c`);
          } catch (e) {
            if (!(e instanceof QuietframeError)) throw e;
            accepted = false;
          }
          if (accepted) expect(variant({ name: "c", type: kind.type, params }), `${kind.type} ${JSON.stringify(params)}`).toBe(true);
        }),
        { seed: 11, numRuns: 300 },
      );
    }
  });

  it("the parameter samples above are accepted by resolveParams (so the property is not vacuous)", () => {
    for (const kind of COMPONENT_KINDS.values()) {
      const base = Object.fromEntries(kind.params.map((p) => [p.name, sampleValues(p)[0]]));
      for (const p of kind.params) {
        for (const value of sampleValues(p)) {
          const params = { ...base, [p.name]: value };
          expect(() => resolveParams(kind, params, "components.c"), `${kind.type} ${JSON.stringify(params)}`).not.toThrow();
        }
      }
    }
  });
});

/** Values a user could write for a parameter, inside its range; the first is always accepted. */
function sampleValues(p: ParamSpec): (string | number)[] {
  if (p.kind === "choice") return [...p.choices];
  const q = p as QuantityParam;
  switch (q.kind) {
    case "mass":
      return ["1 kg", "2.5 ng"];
    case "frequency":
      return ["1 kHz", "8.2e6 rad/s"];
    case "temperature":
      return ["4 K", "20 mK"];
    case "length":
      return ["1064 nm", "4 km"];
    case "power":
      return ["2 W", "125 mW"];
    case "time":
      return ["1.2 ms"];
    case "angle":
      return ["90 deg", "1.57 rad"];
    case "fraction":
      return [0.5, "0.95", "95 %"];
    case "decibel":
      return q.max !== undefined && q.max <= 0 ? ["-10 dB", "-3 dB"] : ["3 dB", "0 dB"];
    case "count":
      return [1e8, "1e12"];
    case "magneticField":
      return ["50 uT", "0.5 G"];
    case "gyromagneticRatio":
      return ["3.5 GHz/T", "700 kHz/G"];
    case "number":
      return [1.2, "1.2"];
    default:
      throw new Error(`no sample values for quantity kind ${q.kind}: add some here`);
  }
}

describe("docs/components.md", () => {
  it("equals componentReferenceMarkdown() (regenerate with `npm run schema`)", () => {
    const committed = readFileSync(join(ROOT, "docs", "components.md"), "utf8");
    expect(committed, "docs/components.md is stale: run `npm run schema` and commit the result").toBe(componentReferenceMarkdown());
  });
});
