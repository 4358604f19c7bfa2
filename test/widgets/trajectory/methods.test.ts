/** A trajectory's methods text states everything a reader needs to repeat the run: seed, step, duration, stored points, start, stop point, generator and filter. */
import { describe, expect, test } from "vitest";
import { siunitxQuantity } from "../../../src/units";
import { computeTrajectory, newTrajectory } from "../../../widgets/trajectory/model";
import { trajectoryMethods } from "../../../widgets/trajectory/methods/methods";
import { hybrid, P_DIFF, shortRun } from "./fixtures";

describe("trajectory methods", () => {
  test("a complete run: settings, generator, discretization, filter, joint variables, entanglement measures, command and fingerprint", () => {
    const { state, computation } = newTrajectory(hybrid, { ...shortRun(11), joint: [P_DIFF] });
    const { markdown, latex, bibtex } = trajectoryMethods(state, computation, { stateFile: "run.json" });
    expect(markdown).toContain("Step h = 10 ns, duration 20 µs");
    expect(latex).toContain(`Step $h$ = ${siunitxQuantity(10e-9, "time")}, duration ${siunitxQuantity(20e-6, "time")}`);
    expect(markdown).toContain("401 stored time points");
    expect(markdown).toContain("seed 11");
    expect(markdown).toContain(`The run took all ${computation.result.stepsPlanned} planned steps.`);
    expect(markdown).toContain("unconditional stationary state");
    expect(markdown).toContain("xoshiro128\\*\\*");
    expect(markdown).toContain("ziggurat");
    expect(markdown).toContain("Kalman–Bucy");
    // The joint variable with its weights (a true minus sign on the negative one).
    expect(markdown).toContain("“p membrane − p cell” = 1·P of `membrane` + −1·P of `cell`");
    expect(markdown).toContain("Duan sum");
    expect(markdown).toContain("logarithmic negativity");
    expect(markdown).toContain(computation.fingerprint);
    expect(markdown).toContain("quietframe render run.json -o run.svg --strict");
    // The spin ensemble and the symmetric-damped membrane of the hybrid set-up, with their sources.
    expect(markdown).toContain("Holstein–Primakoff");
    expect(markdown).toContain("χ\\_s(Ω) = sΩ\\_L/(Ω\\_L² + γ²/4 − Ω² − iγΩ)");
    for (const key of ["holstein1940", "hammerer2010", "vanloan1978", "blackman2021", "marsaglia2000", "kalman1961", "duan2000", "vidal2002"]) expect(bibtex).toContain(`{${key},`);
  });

  test("a stopped run states where it stopped and a ground-state start", () => {
    const options = shortRun(3);
    const created = newTrajectory(hybrid, { ...options, simulation: { ...options.simulation, initial: "ground" } }).state;
    const { fingerprint: _, ...rest } = created;
    const stopped = { ...rest, simulation: { ...rest.simulation, stoppedAfter: 700 } };
    const computation = computeTrajectory(stopped);
    const { markdown } = trajectoryMethods({ ...stopped, fingerprint: computation.fingerprint }, computation);
    expect(markdown).toContain(`stopped by its user after 700 of ${computation.result.stepsPlanned} planned steps, at t = 7 µs`);
    expect(markdown).toContain("every mode in its ground state");
  });
});
