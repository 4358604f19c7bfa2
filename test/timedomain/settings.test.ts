import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../src/errors";
import { assemble } from "../../src/setup/assemble";
import { loadSetup } from "../../src/pipeline";
import { MAX_STEPS, simulateTrajectory, startTrajectory, type SimulationSettings } from "../../src/timedomain";
import { probedBody } from "../helpers/setups";

const model = assemble(
  loadSetup(
    probedBody({
      bodyType: "oscillator",
      body: { mass: "1 ng", frequency: "100 kHz", Q: 1e3, temperature: "1 mK", damping: "symmetric" },
      probe: { measurementRate: "10 kHz" },
      efficiency: 0.9,
    }),
  ),
).model;
const request = { joint: [{ label: "x", terms: [{ component: "body", quadrature: "x" as const, weight: 1 }] }] };
const good: SimulationSettings = { duration: 1e-4, step: 1e-7, seed: 7, samples: 101 };

function problemOf(settings: SimulationSettings): QuietframeError {
  try {
    startTrajectory(model, settings, request);
  } catch (e) {
    if (e instanceof QuietframeError) return e;
    throw e;
  }
  throw new Error("no error");
}

describe("simulation settings are checked (common practice, no source: the allowed ranges are ours)", () => {
  it.each<[string, Partial<SimulationSettings>, string, RegExp]>([
    ["zero step", { step: 0 }, "simulation.step", /step > 0 s/],
    ["negative step", { step: -1e-6 }, "simulation.step", /step > 0 s/],
    ["NaN step", { step: NaN }, "simulation.step", /step > 0 s/],
    ["duration below one step", { duration: 1e-8 }, "simulation.duration", /duration/],
    ["too many steps", { duration: (MAX_STEPS + 10) * 1e-7 }, "simulation.duration", /10000000/],
    ["fractional seed", { seed: 1.5 }, "simulation.seed", /2³²−1/],
    ["negative seed", { seed: -1 }, "simulation.seed", /0 ≤ seed ≤ 4294967295/],
    ["seed above 2³²−1", { seed: 2 ** 32 }, "simulation.seed", /4294967295/],
    ["one sample", { samples: 1 }, "simulation.samples", /2 ≤ samples ≤ 100000/],
    ["too many samples", { samples: 100001 }, "simulation.samples", /2 ≤ samples ≤ 100000/],
  ])("%s → QuietframeError at the field, with the value and what is allowed", (_, change, path, allowed) => {
    const e = problemOf({ ...good, ...change });
    expect(e.path).toBe(path);
    expect(e.allowed).toMatch(allowed);
    const value = Object.values(change)[0];
    expect(Object.is(e.value, value)).toBe(true);
  });

  it("an unknown initial state is refused with the choices", () => {
    const e = problemOf({ ...good, initial: "thermal" as never });
    expect(e.path).toBe("simulation.initial");
    expect(e.allowed).toMatch(/stationary.*ground/);
  });

  it("a stationary start is refused for a free mass (no stationary state), and chosen by default only where it exists", () => {
    const free = assemble(loadSetup(probedBody({ body: { mass: "1 g" }, probe: { power: "1 mW" } }))).model;
    const freeRequest = { joint: [{ label: "x", terms: [{ component: "body", quadrature: "x" as const, weight: 1 }] }] };
    let caught: unknown;
    try {
      startTrajectory(free, { ...good, initial: "stationary" }, freeRequest);
    } catch (e) {
      caught = e;
    }
    expect(caught).toBeInstanceOf(QuietframeError);
    expect((caught as QuietframeError).path).toBe("simulation.initial");
    expect((caught as QuietframeError).allowed).toMatch(/ground/);
    expect(simulateTrajectory(free, good, freeRequest).settings.initial).toBe("ground");
    expect(simulateTrajectory(model, good, request).settings.initial).toBe("stationary");
  });

  it("progress is reported in increasing fractions up to 1", () => {
    const seen: number[] = [];
    simulateTrajectory(model, { duration: 2e-3, step: 1e-7, seed: 1, samples: 11 }, request, (f) => seen.push(f));
    expect(seen.length).toBeGreaterThan(5);
    expect(seen[seen.length - 1]).toBe(1);
    for (let i = 1; i < seen.length; i++) expect(seen[i]).toBeGreaterThanOrEqual(seen[i - 1]);
  });

  it("an unknown component or mode in a joint variable is refused, naming what exists", () => {
    expect(() => startTrajectory(model, good, { joint: [{ label: "?", terms: [{ component: "nobody", quadrature: "x", weight: 1 }] }] })).toThrow(
      /joint\[0\]\.terms\[0\]\.component = "nobody".*'body'/,
    );
    expect(() => startTrajectory(model, good, { joint: [{ label: "?", terms: [{ component: "body", mode: "wobble", quadrature: "x", weight: 1 }] }] })).toThrow(/joint\[0\]\.terms\[0\]\.mode/);
    expect(() => startTrajectory(model, good, { joint: [], pair: ["body", "ghost"] })).toThrow(/pair\[1\]\.component/);
    expect(() => startTrajectory(model, good, { joint: [], pair: ["body", "body"] })).toThrow(/pair\[1\] = "body": entanglement needs two different components/);
  });

  it("a duration that is not a whole number of steps is rounded up to one, and samples are capped at steps + 1", () => {
    const r = simulateTrajectory(model, { duration: 1.05e-6, step: 1e-7, seed: 1, samples: 500 }, request);
    expect(r.stepsPlanned).toBe(11);
    expect(r.settings.samples).toBe(12);
    expect(r.time.length).toBe(12);
    expect(r.time[11]).toBeCloseTo(1.1e-6, 18);
  });
});

describe("reproducibility", () => {
  it("two runs with the same settings are bitwise equal; a different seed differs", () => {
    const a = simulateTrajectory(model, good, request);
    const b = simulateTrajectory(model, good, request);
    const c = simulateTrajectory(model, { ...good, seed: 8 }, request);
    const bits = (r: typeof a) => Buffer.from(Float64Array.from([...r.joint[0].truth, ...r.joint[0].estimate, ...r.records[0].values]).buffer).toString("hex");
    expect(bits(a)).toBe(bits(b));
    expect(bits(a)).not.toBe(bits(c));
    // The covariances do not depend on the seed.
    expect(Array.from(c.joint[0].conditional)).toEqual(Array.from(a.joint[0].conditional));
  });

  it("advancing in slices gives the same bits as one call; stop() ends early with the partial result", () => {
    const whole = simulateTrajectory(model, good, request);
    const run = startTrajectory(model, good, request);
    let slices = 0;
    while (!run.advance(37)) slices++;
    expect(slices).toBeGreaterThan(10);
    expect(run.progress).toBe(1);
    expect(Array.from(run.result().joint[0].truth)).toEqual(Array.from(whole.joint[0].truth));

    const early = startTrajectory(model, good, request);
    early.advance(250);
    early.stop();
    expect(early.done).toBe(true);
    expect(early.advance(1000)).toBe(true);
    const partial = early.result();
    expect(partial.stopped).toBe(true);
    expect(partial.stepsTaken).toBe(250);
    expect(partial.time.length).toBe(26); // stored every 10 steps: 0, 10, …, 250
    expect(Array.from(partial.joint[0].truth)).toEqual(Array.from(whole.joint[0].truth.slice(0, 26)));
  });
});
