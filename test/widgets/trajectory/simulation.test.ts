import { describe, expect, it } from "vitest";
import { QuietframeError } from "../../../src/errors";
import { resolveSimulation } from "../../../widgets/trajectory/simulation";
import { loadMathjs } from "../../helpers/mathjs";

describe("simulation settings", () => {
  it("read times with their units as mathjs converts them to seconds", async () => {
    const math = await loadMathjs();
    for (const [text, unit] of [
      ["200 us", "200 us"],
      ["1.5 ms", "1.5 ms"],
      ["10 ns", "10 ns"],
      ["2 s", "2 s"],
    ]) {
      const r = resolveSimulation({ duration: text, step: text, seed: 0 });
      // Outside reference: mathjs unit conversion.
      expect(Math.abs(r.settings.duration / math.unit(unit).toNumber("s") - 1)).toBeLessThan(1e-15);
    }
  });

  it("plan duration / step steps (a whole number up to rounding) and store min(steps + 1, 2001) points by default", () => {
    expect(resolveSimulation({ duration: "1 us", step: "10 ns", seed: 1 })).toMatchObject({ steps: 100, settings: { samples: 101 } });
    expect(resolveSimulation({ duration: "1 ms", step: "10 ns", seed: 1 })).toMatchObject({ steps: 100000, settings: { samples: 2001 } });
  });

  it("name the field, the value and the rule when a setting is refused", () => {
    try {
      resolveSimulation({ duration: "1 us", step: "2 us", seed: 1 });
      throw new Error("expected a refusal");
    } catch (e) {
      expect(e).toBeInstanceOf(QuietframeError);
      expect((e as Error).message).toBe('simulation.step = "2 us": is longer than the duration (1 µs); allowed: a step of at most 1 µs');
    }
    expect(() => resolveSimulation({ duration: "1 s", step: "1 ps", seed: 1 })).toThrow(/more than 10000000/);
    expect(() => resolveSimulation({ duration: "1 us", step: "1 ns", seed: "3" as unknown as number })).toThrow(/simulation\.seed = "3": is not a seed/);
  });
});
