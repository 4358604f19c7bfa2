/**
 * The fast way of preparing many value sets (SetupPreparer: validate once, write values into
 * the validated set-up) against the plain way (prepare(description, values): copy, write,
 * validate everything), bit for bit: every Float64Array of the prepared set-up and of its
 * budget compared by its bytes, every other field by value, errors by class and text. On
 * every example and on random parameter values (fixed seeds), including values that are out
 * of range. Reference: the plain path itself (common practice, no outside source: the claim
 * under test is identity with it).
 */
import { readdirSync, readFileSync } from "node:fs";
import { join } from "node:path";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { exactText, numericParameters } from "../../src/design/parameters";
import { evaluate } from "../../src/evaluate";
import { prepare, SetupPreparer, type SetupValues } from "../../src/prepare";
import { copyDescription } from "../../src/setup/copy-description";
import type { SetupDescription } from "../../src/setup/format";
import { logGrid } from "../../src/setup/grid";
import { loadSetup } from "../../src/setup/load";
import { setup } from "../helpers/setups";

const EXAMPLES = join(__dirname, "..", "..", "examples");
const examples = readdirSync(EXAMPLES)
  .filter((f) => f.endsWith(".json"))
  .map((f) => ({ file: f, text: readFileSync(join(EXAMPLES, f), "utf8") }));

/** A free mass read by one probe whose light is split onto two homodynes (the optimal-combination path, p = 2). */
const twoDetectors: SetupDescription = setup(
  [
    { name: "light", type: "coherent" },
    { name: "body", type: "free-mass", params: { mass: "10 g" } },
    { name: "probe", type: "position-probe", params: { power: "0.3 W" } },
    { name: "open", type: "vacuum" },
    { name: "split", type: "beam-splitter", params: { transmission: 0.5 } },
    { name: "d1", type: "homodyne", params: { angle: "90 deg", efficiency: 0.9 } },
    { name: "d2", type: "homodyne", params: { angle: "30 deg", efficiency: 0.8 } },
  ],
  [
    ["light.out", "probe.in"],
    ["probe.out", "split.in1"],
    ["open.out", "split.in2"],
    ["split.out1", "d1.in"],
    ["split.out2", "d2.in"],
    ["probe.mechanics", "body.body"],
  ],
  { readout: ["d1", "d2"] },
);

/** Everything a prepared set-up and its evaluation hold, arrays as their bytes, closures left out (their values are in the budget). */
function bits(value: unknown): unknown {
  return JSON.parse(
    JSON.stringify(value, (_key, v) => {
      if (v instanceof Float64Array) return `f64:${Buffer.from(v.buffer, v.byteOffset, v.byteLength).toString("hex")}`;
      if (v instanceof Map) return { map: [...v.keys()] };
      if (v instanceof Set) return { set: [...v] };
      if (typeof v === "function") return "function";
      return v;
    }),
  );
}

/** prepare + evaluate at 256 points, or the error it throws. */
function outcome(run: () => ReturnType<typeof prepare>, grid: { from: number; to: number; points: number }): unknown {
  try {
    const prepared = run();
    return bits({ prepared, evaluation: evaluate(prepared, grid) });
  } catch (e) {
    return { error: (e as Error).constructor.name, message: (e as Error).message };
  }
}

function gridOf(description: SetupDescription): { from: number; to: number; points: number } {
  const g = loadSetup(description).grid;
  return { from: g?.from ?? 1, to: g?.to ?? 1e5, points: 256 };
}

/** Random value sets: a random subset of the numeric parameters, each scaled by 0.2 … 5 (some leave their range), written exactly. */
function valueSets(description: SetupDescription, seed: number, runs: number): SetupValues[] {
  const params = numericParameters(loadSetup(description));
  const arbitrary = fc.array(fc.tuple(fc.integer({ min: 0, max: params.length - 1 }), fc.double({ min: 0.2, max: 5, noNaN: true }), fc.boolean()), { minLength: 1, maxLength: 4 });
  return fc.sample(arbitrary, { seed, numRuns: runs }).map((draws) => {
    const values: Record<string, string | number> = {};
    for (const [k, scale, asNumber] of draws) {
      const p = params[k];
      const x = p.value === 0 ? scale - 1 : p.value * scale;
      values[p.target] = asNumber && p.spec.kind === "fraction" ? x : exactText(x, p);
    }
    return values;
  });
}

describe("SetupPreparer gives what prepare gives, bit for bit", () => {
  const cases = [
    ...examples.map((e) => ({ name: e.file, description: JSON.parse(e.text) as SetupDescription, text: e.text })),
    { name: "two detectors", description: twoDetectors, text: JSON.stringify(twoDetectors) },
  ];

  it.each(cases)("$name: the set-up as it is, with no values and with none written", ({ description, text }) => {
    const grid = gridOf(description);
    for (const setup of [description, text]) {
      const preparer = new SetupPreparer(setup);
      expect(outcome(() => preparer.prepare(), grid)).toEqual(outcome(() => prepare(setup), grid));
      expect(outcome(() => preparer.prepare({}), grid)).toEqual(outcome(() => prepare(setup, {}), grid));
    }
  });

  it.each(cases)("$name: 60 random value sets (in range and out of range)", ({ name, description }) => {
    const grid = gridOf(description);
    const preparer = new SetupPreparer(description);
    let failures = 0;
    for (const values of valueSets(description, name.length * 7919, 60)) {
      const plain = outcome(() => prepare(description, values), grid);
      expect(outcome(() => preparer.prepare(values), grid)).toEqual(plain);
      if ((plain as { error?: string }).error) failures++;
    }
    // Both kinds of value sets were compared: some prepare, some are refused.
    expect(failures).toBeGreaterThan(0);
    expect(failures).toBeLessThan(60);
  });

  it("refuses the same things with the same words: a target naming no component, several bad values at once, values that are no object", () => {
    const description = JSON.parse(examples.find((e) => e.file === "cryogenic-membrane-squeezed.json")!.text) as SetupDescription;
    const grid = gridOf(description);
    const preparer = new SetupPreparer(description);
    const bad: unknown[] = [
      { "nothing.mass": "1 kg" },
      { "membrane.mass": "-1 kg", "cavity.inputCoupling": "150 %" },
      { "membrane.weight": "1 kg" },
      { "detector.efficiency": 0 },
      { "cavity.linewidth": "12 kg" },
      [],
      "membrane.mass",
    ];
    for (const values of bad) {
      const plain = outcome(() => prepare(description, values as SetupValues), grid);
      expect((plain as { error?: string }).error).toBeDefined();
      expect(outcome(() => preparer.prepare(values as SetupValues), grid)).toEqual(plain);
    }
  });

  it("a set-up that only validates with the values written in is prepared the plain way", () => {
    const description = JSON.parse(examples[0].text) as SetupDescription;
    const broken = copyDescription(description);
    const detector = broken.components.find((c) => c.type === "homodyne")!;
    detector.params = { ...detector.params, efficiency: "150 %" };
    const grid = gridOf(description);
    const preparer = new SetupPreparer(broken);
    const fixed = { [`${detector.name}.efficiency`]: "80 %" };
    expect((outcome(() => prepare(broken, fixed), grid) as { error?: string }).error).toBeUndefined();
    expect(outcome(() => preparer.prepare(fixed), grid)).toEqual(outcome(() => prepare(broken, fixed), grid));
    expect(outcome(() => preparer.prepare(), grid)).toEqual(outcome(() => prepare(broken), grid));
  });

  it("the written set-up's description is the one the plain way keeps, made when it is read", () => {
    const description = JSON.parse(examples[0].text) as SetupDescription;
    const params = numericParameters(loadSetup(description));
    const values = { [params[0].target]: exactText(params[0].value * 1.5, params[0]) };
    const fast = new SetupPreparer(description).prepare(values).setup;
    expect(fast.source).toEqual(prepare(description, values).setup.source);
    expect(fast.source).toBe(fast.source);
  });
});

describe("copyDescription is structuredClone", () => {
  it("copies JSON-shaped data deeply, sharing nothing", () => {
    const original = JSON.parse(examples[0].text) as SetupDescription;
    const copy = copyDescription(original);
    expect(copy).toStrictEqual(structuredClone(original));
    copy.components[0].params = { changed: 1 };
    expect(original).toStrictEqual(JSON.parse(examples[0].text));
  });

  it("hands anything that is not plain JSON data to structuredClone (same result, same error)", () => {
    const shared = { a: 1 };
    const cyclic: Record<string, unknown> = { x: 1 };
    cyclic.self = cyclic;
    const withProto = JSON.parse('{"__proto__": {"polluted": true}, "b": [1, 2]}');
    const sparse: number[] = new Array(3);
    sparse[0] = 1;
    sparse[2] = 3;
    const cases: unknown[] = [{ twice: [shared, shared] }, cyclic, withProto, { when: new Date(0) }, { big: 10n }, sparse, { neg: -0, nan: NaN, none: undefined }];
    for (const value of cases) {
      const copy = copyDescription(value);
      expect(copy).toStrictEqual(structuredClone(value));
    }
    const twice = copyDescription({ twice: [shared, shared] });
    expect(twice.twice[0]).toBe(twice.twice[1]);
    expect(Object.hasOwn(copyDescription(withProto), "__proto__")).toBe(true);
    expect(Object.is(copyDescription({ z: -0 }).z, -0)).toBe(true);
    expect(() => copyDescription({ f: () => 1 })).toThrow(expect.objectContaining({ name: "DataCloneError" }));
  });
});

describe("logGrid keeps recent grids without sharing them", () => {
  it("gives the same bits on a repeated grid, in a fresh array each time", () => {
    const spec = { from: 1.1e6, to: 1.3e6, points: 257 };
    const first = logGrid(spec);
    const copyOfFirst = first.slice();
    first.fill(0);
    const second = logGrid(spec);
    expect(second).not.toBe(first);
    expect(Buffer.from(second.buffer).equals(Buffer.from(copyOfFirst.buffer))).toBe(true);
    // Many other grids in between: the grid is laid out again, to the same bits.
    for (let k = 2; k < 12; k++) logGrid({ from: 1, to: 10 * k, points: k });
    expect(Buffer.from(logGrid(spec).buffer).equals(Buffer.from(copyOfFirst.buffer))).toBe(true);
  });
});
