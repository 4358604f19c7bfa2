import { join } from "node:path";
import { describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";
import { solveForTarget } from "../../src/design";
import { readFileSync } from "node:fs";

/** The design commands in-process: plain-text tables, JSON that matches the API, and errors that name the option. */
const EXAMPLES = join(__dirname, "..", "..", "examples");
const squeezed = join(EXAMPLES, "cryogenic-membrane-squeezed.json");
const hybrid = join(EXAMPLES, "hybrid-spin-reference.json");

function run(...argv: string[]) {
  let out = "";
  let err = "";
  const code = runCli(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

describe("quietframe rank, solve, optimize, spread", () => {
  it("help lists the four commands with their usage", () => {
    const { code, out } = run("help");
    expect(code).toBe(0);
    for (const c of [
      "quietframe rank <setup.json>",
      "quietframe solve <setup.json> --param T --target X",
      "quietframe optimize <setup.json> --param T[=MIN:MAX]",
      'quietframe spread <setup.json> --uncertain "T=95 % ± 2 %"',
    ]) {
      expect(out).toContain(c);
    }
  });

  it("rank prints a ranked table; --format json carries the same ranking", () => {
    const args = ["rank", squeezed, "--figure", "margin-at=1.16 MHz", "--param", "detector.efficiency", "--param", "membrane.temperature", "--scan", "5"];
    const text = run(...args);
    expect(text.code).toBe(0);
    expect(text.out).toMatch(/^margin below the SQL at 1\.16 MHz: 4\.143 dB now/);
    expect(text.out).toMatch(/^1 {2}detector\.efficiency +95 % +\+0\.1184 /m);
    const json = JSON.parse(run(...args, "--format", "json").out);
    expect(json.parameters.map((p: { target: string }) => p.target)).toEqual(["detector.efficiency", "membrane.temperature"]);
    expect(json.parameters[0].helps).toBe("increase");
  });

  it("solve prints the solution and --format json equals the API's result; --window prints both ends", () => {
    const text = run("solve", hybrid, "--param", "detector.efficiency", "--target", "1.4 dB");
    expect(text.code).toBe(0);
    expect(text.out).toContain("crossing: detector.efficiency = 96.4677 %");
    const json = JSON.parse(run("solve", hybrid, "--param", "detector.efficiency", "--target", "1.4 dB", "--format", "json").out);
    const api = solveForTarget(readFileSync(hybrid, "utf8"), { kind: "best-margin" }, "detector.efficiency", "1.4 dB");
    expect(json.solution.value).toBe(api.solution!.value);
    const window = run("solve", hybrid, "--param", "cell.field", "--target", "1 dB", "--window");
    expect(window.out).toMatch(/low end: {2}304\.6\d* µT → 1\.000 dB \(crossing\)/);
    expect(window.out).toMatch(/high end: 325\.7\d* µT → 1\.000 dB \(crossing\)/);
  });

  it("solve says when no value reaches the target and gives the best (exit 0)", () => {
    const { code, out } = run("solve", hybrid, "--param", "detector.efficiency", "--target", "5 dB");
    expect(code).toBe(0);
    expect(out).toContain("never: no value of detector.efficiency in 0 % … 100 % reaches 5.000 dB");
    expect(out).toMatch(/best reached: detector\.efficiency = 100 % → 1\.4\d+ dB \(bound\)/);
  });

  it("optimize prints the optimum, the bounds it sits on and each start", () => {
    const { code, out } = run("optimize", squeezed, "--figure", "margin-at=1.16 MHz", "--param", "detector.efficiency=80 %:100 %", "--starts", "2");
    expect(code).toBe(0);
    expect(out).toMatch(/detector\.efficiency +100 % +high end \(given\)/);
    expect(out).toMatch(/start +status +figure +evaluations/);
  });

  it("spread prints the Monte Carlo beside first order; json carries noise bands over the grid", () => {
    const args = ["spread", squeezed, "--uncertain", "detector.efficiency=95 % ± 1 %", "--samples", "40", "--seed", "3", "--target", "4 dB"];
    const text = run(...args);
    expect(text.code).toBe(0);
    expect(text.out).toMatch(/Monte Carlo +\d\.\d{3} dB/);
    expect(text.out).toMatch(/first order +4\.377 dB/);
    expect(text.out).toMatch(/probability of 4\.000 dB or better: /);
    const json = JSON.parse(run(...args, "--format", "json").out);
    expect(json.bands.frequencies).toHaveLength(801);
    expect(json.values).toHaveLength(40);
  });

  it("errors name the option, the value and what is allowed, on stderr with exit 1 and nothing on stdout", () => {
    const cases: [string[], RegExp][] = [
      [["solve", squeezed, "--param", "cavity.colour", "--target", "1 dB"], /^quietframe: --param = "cavity\.colour": is not a numeric parameter of this set-up; allowed: squeezer\.squeezing,/],
      [["solve", squeezed, "--param", "detector.efficiency", "--target", "1 dB", "--range", "100 %:50 %"], /^quietframe: --range = "50 %": must be above min \(100 %\)/],
      [["optimize", squeezed, "--param", "detector.efficiency=50 %:120 %"], /^quietframe: --param\[0\] = "120 %": a fraction must be between 0 and 1/],
      [
        ["spread", squeezed, "--uncertain", "membrane.frequency=1.2 MHz ± 300 K"],
        /^quietframe: uncertain\.membrane\.frequency\.spread = "300 K": unit "K" is a temperature, but this field is a frequency/,
      ],
      [["rank", squeezed, "--figure", "loudness"], /^quietframe: --figure = "loudness": is not a figure of merit; allowed: best-margin/],
      [["solve", squeezed, "--param", "detector.efficiency"], /^quietframe: --target: is missing/],
      [["rank", squeezed, "--figure", "margin-at=0 Hz"], /^quietframe: --figure = "0 Hz": must be above 0 Hz/],
    ];
    for (const [argv, message] of cases) {
      const { code, out, err } = run(...argv);
      expect(code, argv.join(" ")).toBe(1);
      expect(out).toBe("");
      expect(err).toMatch(message);
    }
  });
});
