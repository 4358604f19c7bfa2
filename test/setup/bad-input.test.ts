import { readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { COMPONENT_KINDS } from "../../src/components/registry";
import { QuietframeError, QuietframeErrors } from "../../src/errors";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { prepare } from "../../src/prepare";
import type { SetupDescription } from "../../src/setup/format";
import { setup } from "../helpers/setups";
import { BAD_CASES, MALFORMED_CASES, cavitySetup, component, edited, freeMassSetup, singleProblem, thrownBy } from "./fixtures";

const SMALL_GRID = { from: 10, to: 1000, points: 5 };

function loadAndEvaluate(text: string) {
  return evaluateSetup(loadSetup(text), SMALL_GRID);
}

function prototypeIsClean(): boolean {
  const probe = {} as Record<string, unknown>;
  return probe.polluted === undefined && !Object.prototype.hasOwnProperty.call(Object.prototype, "polluted");
}

describe("the fixtures themselves are good set-ups", () => {
  it.each([
    ["free mass", freeMassSetup],
    ["cavity", cavitySetup],
  ])("%s loads and evaluates", (_, make) => {
    const result = loadAndEvaluate(JSON.stringify(make()));
    expect(result.budget.total.every((v) => Number.isFinite(v) && v > 0)).toBe(true);
  });
});

describe("each bad set-up is reported with component, field, value as written and what is allowed", () => {
  for (const c of BAD_CASES) {
    it(c.label, () => {
      const e =
        c.stage === "load"
          ? singleProblem(() => loadSetup(c.text))
          : (() => {
              const setup = loadSetup(c.text); // must get past validation: the problem is in the physics
              return singleProblem(() => evaluateSetup(setup, SMALL_GRID));
            })();
      expect(e.path).toBe(c.path);
      for (const part of c.contains) expect(e.message).toContain(part);
      expect(prototypeIsClean()).toBe(true);
    });
  }

  it("an unknown type's message lists every registered type", () => {
    const e = singleProblem(() => loadSetup(BAD_CASES.find((c) => c.label === "unknown component type")!.text));
    for (const type of COMPONENT_KINDS.keys()) expect(e.allowed).toContain(type);
  });

  it("structured fields carry the value exactly as written (string with its unit)", () => {
    const e = singleProblem(() => loadSetup(edited(cavitySetup, (s) => (component(s, "membrane").params.temperature = "-20 mK"))));
    expect(e.value).toBe("-20 mK");
    expect(e.allowed).toBe("0 K ≤ temperature");
  });

  it("problems in several components are all reported in one QuietframeErrors", () => {
    const text = edited(cavitySetup, (s) => {
      component(s, "membrane").params.Q = -3;
      component(s, "detector").params.efficiency = 2;
    });
    const e = thrownBy(() => loadSetup(text));
    expect(e).toBeInstanceOf(QuietframeErrors);
    const problems = (e as QuietframeErrors).problems;
    expect(problems.map((p) => p.path)).toEqual(["components.membrane.Q", "components.detector.efficiency"]);
    expect((e as Error).message).toContain("components.membrane.Q = -3");
    expect((e as Error).message).toContain("components.detector.efficiency = 2");
  });
});

describe("malformed JSON names the line and column", () => {
  for (const c of MALFORMED_CASES) {
    it(c.label, () => {
      const e = singleProblem(() => loadSetup(c.text, "bad.json"));
      expect(e.path).toBe("bad.json");
      expect(e.message).toContain("malformed JSON");
      expect(e.message).toContain(`at line ${c.line}, column ${c.column}`);
    });
  }
});

describe("__proto__ and other prototype names", () => {
  const withKey = (where: "signal" | "grid" | "component", key: string): string => {
    const text = JSON.stringify(freeMassSetup());
    const inject = `"${key}":{"polluted":"yes"},`;
    if (where === "signal") return text.replace('"signal":{', `"signal":{${inject}`);
    if (where === "grid") return text.replace('"grid":{', `"grid":{${inject}`);
    return text.replace('{"name":"mirror"', `{${inject}"name":"mirror"`);
  };

  it.each([
    ["signal", "signal.__proto__"],
    ["grid", "grid.__proto__"],
    ["component", "components[1].__proto__"],
  ] as const)("__proto__ inside %s is an unknown field, not a prototype", (where, path) => {
    const e = singleProblem(() => loadSetup(withKey(where, "__proto__")));
    expect(e.path).toBe(path);
    expect(prototypeIsClean()).toBe(true);
  });

  it.each(["constructor", "prototype", "toString", "hasOwnProperty"])("'%s' as a parameter name is an unknown parameter", (key) => {
    const text = edited(freeMassSetup, (s) => (component(s, "mirror").params[key] = "1 kg"));
    const e = singleProblem(() => loadSetup(text));
    expect(e.path).toBe(`components.mirror.${key}`);
    expect(e.message).toContain(`'free-mass' has no parameter '${key}'`);
  });

  it.each(["__proto__", "constructor", "toString", "hasOwnProperty", "valueOf"])("a component named '%s' works like any other name", (name) => {
    const reference = loadAndEvaluate(JSON.stringify(freeMassSetup())).budget.total;
    const renamed = JSON.stringify(freeMassSetup()).replaceAll('"mirror', `"${name}`);
    expect(renamed).toContain(`"${name}.body"`);
    const result = loadAndEvaluate(renamed);
    expect(Array.from(result.budget.total)).toEqual(Array.from(reference));
    expect(prototypeIsClean()).toBe(true);
  });
});

describe("any JSON put anywhere in a set-up gives a result or a QuietframeError, never a crash (fast-check, seed 5)", () => {
  /** Every path to a value inside `v`, as key lists. */
  function paths(v: unknown, prefix: (string | number)[] = []): (string | number)[][] {
    const out: (string | number)[][] = [prefix];
    if (Array.isArray(v)) v.forEach((x, i) => out.push(...paths(x, [...prefix, i])));
    else if (v && typeof v === "object") for (const [k, x] of Object.entries(v)) out.push(...paths(x, [...prefix, k]));
    return out;
  }

  const bases = [freeMassSetup(), cavitySetup()];
  const keyArb = fc.oneof(fc.constantFrom("__proto__", "constructor", "mass", "type", "params", "name", "from"), fc.string({ maxLength: 6 }));

  it("replacing a value or adding a key", () => {
    fc.assert(
      fc.property(fc.nat(1), fc.nat(), fc.jsonValue({ maxDepth: 2 }), fc.boolean(), keyArb, (which, pick, value, addKey, key) => {
        // Round-trip through JSON text so keys like __proto__ are own keys, as when a user writes them.
        const doc = JSON.parse(JSON.stringify(bases[which]));
        const all = paths(doc);
        const path = all[pick % all.length];
        const text = JSON.stringify(doc);
        let mutated: string;
        if (path.length === 0) {
          mutated = JSON.stringify(value);
        } else {
          const parent = path.slice(0, -1).reduce((o: any, k) => o[k], doc);
          const last = path[path.length - 1];
          if (addKey && parent && typeof parent === "object" && !Array.isArray(parent)) {
            mutated = text; // replaced below via text so that __proto__ stays an own key
            const target = JSON.stringify(parent);
            const injected = target.replace(/^\{/, `{${JSON.stringify(key)}:${JSON.stringify(value)},`).replace(/,\}$/, "}");
            mutated = text.replace(target, injected);
          } else {
            parent[last] = value;
            mutated = JSON.stringify(doc);
          }
        }
        try {
          const result = loadAndEvaluate(mutated);
          expect(result.budget.total.length).toBe(SMALL_GRID.points);
        } catch (e) {
          if (!(e instanceof QuietframeError || e instanceof QuietframeErrors)) {
            throw new Error(`not a QuietframeError: ${String(e)}\ninput: ${mutated}`);
          }
        }
        expect(prototypeIsClean()).toBe(true);
      }),
      { seed: 5, numRuns: 1500 },
    );
  });
});

describe("a blank top-level key", () => {
  it("is named in quotes, so the message points at something visible", () => {
    let caught: unknown;
    try {
      loadSetup('{"": 0}');
    } catch (e) {
      caught = e;
    }
    const problems = (caught as { problems?: { path: string; message: string }[] }).problems ?? [caught as { path: string; message: string }];
    const blank = problems.find((p) => p.message.includes("is not a field of a set-up"));
    expect(blank?.path).toBe('[""]');
  });
});

describe("connections that assembly refuses (the project's own rules and texts: common practice, no source)", () => {
  it("light that runs in a loop names every component on the loop and downstream of it", () => {
    const looped = setup(
      [
        { name: "light", type: "coherent" },
        { name: "body", type: "free-mass", params: { mass: "1 g" } },
        { name: "probe", type: "position-probe", params: { power: "1 mW" } },
        { name: "s1", type: "beam-splitter", params: { transmission: 0.5 } },
        { name: "s2", type: "beam-splitter", params: { transmission: 0.5 } },
        { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 1 } },
        { name: "sink", type: "dump" },
        { name: "open", type: "vacuum" },
      ],
      [
        ["light.out", "s1.in1"],
        ["s1.out1", "s2.in1"],
        ["s2.out1", "s1.in2"],
        ["open.out", "s2.in2"],
        ["s1.out2", "probe.in"],
        ["s2.out2", "sink.in"],
        ["probe.out", "detector.in"],
        ["probe.mechanics", "body.body"],
      ],
    );
    const e = singleProblem(() => prepare(looped));
    expect(e.path).toBe("connections");
    expect(e.value).toBe("probe, s1, s2, detector, sink");
    expect(e.problem).toBe("light runs in a closed loop through these components");
  });

  it("an optional output that carries no light as configured is refused by name", () => {
    const description = JSON.parse(readFileSync(join(__dirname, "..", "..", "examples", "long-baseline-detector.json"), "utf8")) as SetupDescription;
    const withIdler: SetupDescription = {
      ...description,
      components: [...description.components, { name: "sink", type: "dump" }],
      connections: [...description.connections, ["ifo.idlerOut", "sink.in"]],
    };
    const e = singleProblem(() => prepare(withIdler));
    expect(e.path).toBe("connections");
    expect(e.value).toBe("ifo.idlerOut → sink.in");
    expect(e.message).toContain("'ifo.idlerOut' carries no light as 'ifo' is configured");
  });
});
