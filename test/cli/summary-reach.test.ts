import { mkdtempSync, readFileSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { runCli } from "../../src/cli/run";
import { evaluate, loadSetup, prepare } from "../../src/pipeline";
import { inspiralHorizon, inspiralRange, strainCurve } from "../../src/reach";
import { distanceText } from "../../widgets/explorer/summary";

/**
 * `quietframe summary` on a strain set-up prints the inspiral range and horizon of its total
 * noise (src/reach, itself checked against the flat-band closed form in test/reach) and, with
 * --against, the volume gain (range ratio cubed) over another set-up on the same grid.
 */
const EXAMPLES = join(__dirname, "..", "..", "examples");
const DETECTOR = join(EXAMPLES, "long-baseline-detector.json");
const SOURCE = { m1: 1.4, m2: 1.4, snr: 8 };

function cli(...argv: string[]): { code: number; out: string; err: string } {
  let out = "";
  let err = "";
  const code = runCli(argv, { out: (s) => (out += s), err: (s) => (err += s) });
  return { code, out, err };
}

let dir: string;
let unsqueezed: string;
beforeAll(() => {
  dir = mkdtempSync(join(tmpdir(), "quietframe-summary-"));
  const setup = JSON.parse(readFileSync(DETECTOR, "utf8"));
  setup.components.find((c: any) => c.name === "squeezer").params.squeezing = "0 dB";
  unsqueezed = join(dir, "unsqueezed.json");
  writeFileSync(unsqueezed, JSON.stringify(setup));
});
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function rangeOf(file: string): { range: number; horizon: number } {
  const setup = loadSetup(readFileSync(file, "utf8"));
  const curve = strainCurve(evaluate(prepare(setup), setup.grid).budget);
  return { range: inspiralRange(curve.frequencies, curve.strainPsd, SOURCE).megaparsecs, horizon: inspiralHorizon(curve.frequencies, curve.strainPsd, SOURCE).megaparsecs };
}

describe("quietframe summary: inspiral reach of a strain set-up", () => {
  it("prints the range and horizon of the set-up's strain curve", () => {
    const r = cli("summary", DETECTOR);
    expect(r.code).toBe(0);
    const { range, horizon } = rangeOf(DETECTOR);
    expect(r.out).toContain(`inspiral reach (1.4 + 1.4 M☉, SNR 8): range ${distanceText(range)}, horizon ${distanceText(horizon)}\n`);
    // The horizon of an optimally oriented source is 2.2648 times the averaged range (src/reach).
    expect(horizon / range).toBeCloseTo(2.2648, 10);
    expect(r.out).not.toContain("volume gain");
  });

  it("--against: the volume gain is the range ratio cubed, ×1.0 against itself", () => {
    const self = cli("summary", DETECTOR, "--against", DETECTOR);
    expect(self.code).toBe(0);
    expect(self.out).toContain(`volume gain against ${DETECTOR}: ×1.0 (range ×1.00)\n`);
    const r = cli("summary", DETECTOR, "--against", unsqueezed);
    expect(r.code).toBe(0);
    const ratio = rangeOf(DETECTOR).range / rangeOf(unsqueezed).range;
    expect(ratio).toBeGreaterThan(1);
    const m = /volume gain against .*: ×([\d.]+) \(range ×([\d.]+)\)/.exec(r.out);
    expect(m).not.toBeNull();
    expect(Number(m![2])).toBe(Number(ratio.toPrecision(3)));
    expect(Number(m![1])).toBe(Number((ratio * ratio * ratio).toPrecision(2)));
  });

  it("prints no reach for a displacement set-up, and --against there is an error", () => {
    const free = join(EXAMPLES, "free-test-mass.json");
    const r = cli("summary", free);
    expect(r.code).toBe(0);
    expect(r.out).not.toMatch(/inspiral|volume gain/);
    const bad = cli("summary", free, "--against", DETECTOR);
    expect(bad.code).toBe(1);
    expect(bad.out).toBe("");
    expect(bad.err).toContain("--against");
    expect(bad.err).toContain("not referred to strain");
  });
});
