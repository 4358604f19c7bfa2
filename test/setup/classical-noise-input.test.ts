import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { evaluate, loadSetup, prepare } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { loadSetupFile } from "../../src/setup/load-file";
import { parseSpectrumCsv } from "../../src/setup/spectrum-csv";
import { probedBody } from "../helpers/setups";
import { singleProblemOf } from "../helpers/errors";

const folder = mkdtempSync(join(tmpdir(), "quietframe-spectra-"));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const GOOD_CSV = ["# invented actuator noise", "frequency [Hz], force ASD [N/√Hz]", "1, 1e-12", "10, 1e-13", "", "1000, 1e-15"].join("\n");

/** A free mass read by a probe, with one classical force term whose spectrum is `spectrum`. */
function setupWith(spectrum: Record<string, unknown>, extra: Record<string, unknown> = {}): SetupDescription {
  return {
    ...probedBody({ body: { mass: "1 g" }, probe: { power: "1 mW", wavelength: "1064 nm" } }),
    classicalNoise: [{ name: "actuator", enters: "force", on: "body", spectrum, ...extra } as never],
    grid: { from: "2 Hz", to: "500 Hz", points: 21 },
  };
}

/** Writes the CSV and a set-up that names it; returns the set-up's path. */
function files(csv: string, name: string): string {
  writeFileSync(join(folder, `${name}.csv`), csv);
  const path = join(folder, `${name}.json`);
  writeFileSync(path, JSON.stringify(setupWith({ file: `${name}.csv` })));
  return path;
}

describe("spectrum files", () => {
  it("are read relative to the set-up file and written into the description with their lines", () => {
    const description = loadSetupFile(files(GOOD_CSV, "good"));
    expect(description.classicalNoise![0].spectrum).toEqual({
      file: "good.csv",
      frequencyUnit: "Hz",
      unit: "N/√Hz",
      points: [
        [1, 1e-12],
        [10, 1e-13],
        [1000, 1e-15],
      ],
      lines: [3, 4, 6],
    });
    const budget = evaluate(prepare(description)).budget;
    expect(budget.terms.some((t) => t.owner === "actuator")).toBe(true);
  });

  it.each([
    ["a header without units", "frequency, ASD\n1, 1e-12\n10, 1e-13", "line 1", "gives no unit for the frequency column"],
    ["an ASD column without unit", "frequency [Hz], ASD\n1, 1e-12\n10, 1e-13", "line 1", "gives no unit for the amplitude spectral density column"],
    ["a wrong ASD unit for a force", "frequency [Hz], ASD [m/√Hz]\n1, 1e-12\n10, 1e-13", "header", "is not an amplitude spectral density in N per root hertz"],
    ["non-monotonic frequencies", "frequency [Hz], ASD [N/√Hz]\n1, 1e-12\n10, 1e-13\n10, 1e-14", "line 4", "not above the one before it"],
    ["a negative value", "frequency [Hz], ASD [N/√Hz]\n1, 1e-12\n10, -1e-13", "line 3", "negative or not a finite number"],
    ["a zero value", "frequency [Hz], ASD [N/√Hz]\n1, 1e-12\n10, 0", "line 3", "log-log interpolation cannot pass through"],
    ["a non-finite value", "frequency [Hz], ASD [N/√Hz]\n1, 1e-12\n10, NaN", "line 3", "is not a finite number"],
    ["a line with three fields", "frequency [Hz], ASD [N/√Hz]\n1, 1e-12, 3", "line 2", "has 3 fields, not two"],
    ["a single point", "frequency [Hz], ASD [N/√Hz]\n1, 1e-12", '"single.csv"', "needs at least two"],
  ])("refuse %s, naming the file and the line", (label, csv, where, problem) => {
    const name = label === "a single point" ? "single" : label.replace(/[^a-z]+/g, "-");
    const e = singleProblemOf(() => loadSetupFile(files(csv, name)));
    expect(e.path).toContain(`"${name}.csv"`);
    expect(e.path).toContain(where);
    expect(e.message).toContain(problem);
    expect(e.allowed).toBeTruthy();
  });

  it("refuse a grid the spectrum does not cover, naming the file and the line of the end point", () => {
    const description = loadSetupFile(files(GOOD_CSV, "narrow"));
    const e = singleProblemOf(() => evaluate(prepare(description), { from: 0.5, to: 100, points: 11 }));
    expect(e.path).toBe('"narrow.csv", line 3');
    expect(e.message).toContain("covers 1 Hz to 1 kHz");
    expect(e.allowed).toContain('"power-law"');
  });

  it("that are missing are named with the folder looked in", () => {
    const path = join(folder, "missing.json");
    writeFileSync(path, JSON.stringify(setupWith({ file: "nowhere.csv" })));
    const e = singleProblemOf(() => loadSetupFile(path));
    expect(e.path).toBe("classicalNoise[0].spectrum.file");
    expect(e.message).toContain("does not exist");
  });

  it("are not read by the browser-safe loader, which says how to load them", () => {
    const e = singleProblemOf(() => loadSetup(setupWith({ file: "good.csv" })));
    expect(e.path).toBe("classicalNoise[0].spectrum.file");
    expect(e.message).toContain("read when a set-up file is loaded in Node");
  });

  it("parse with parentheses around units and a byte-order mark", () => {
    const parsed = parseSpectrumCsv("\uFEFFf (kHz), h (1/sqrt(Hz))\r\n0.01, 2e-23\r\n1, 3e-24\r\n", "h.csv");
    expect(parsed).toMatchObject({ frequencyUnit: "kHz", unit: "1/sqrt(Hz)", lines: [2, 3] });
  });
});

describe("classical noise in a set-up", () => {
  it.each([
    [
      "an ASD without unit",
      setupWith({
        points: [
          [1, 1e-12],
          [10, 1e-13],
        ],
      }),
      "classicalNoise[0].spectrum.unit",
      "gives no unit",
    ],
    [
      "an unknown frequency unit",
      setupWith({
        frequencyUnit: "rpm",
        unit: "N/√Hz",
        points: [
          [1, 1e-12],
          [10, 1e-13],
        ],
      }),
      "classicalNoise[0].spectrum.frequencyUnit",
      "is not a frequency unit",
    ],
    [
      "a decreasing table",
      setupWith({
        unit: "N/√Hz",
        points: [
          [10, 1e-12],
          [1, 1e-13],
        ],
      }),
      "classicalNoise[0].spectrum.points[1]",
      "not above the one before it",
    ],
    [
      "a negative frequency",
      setupWith({
        unit: "N/√Hz",
        points: [
          [-1, 1e-12],
          [1, 1e-13],
        ],
      }),
      "classicalNoise[0].spectrum.points[0]",
      "not a finite positive number",
    ],
    [
      "a place the component does not take",
      setupWith(
        {
          unit: "N/√Hz",
          points: [
            [1, 1e-12],
            [10, 1e-13],
          ],
        },
        { enters: "strain" },
      ),
      "classicalNoise[0].enters",
      'allowed: "force" or "displacement"',
    ],
    [
      "an unknown extension",
      setupWith(
        {
          unit: "N/√Hz",
          points: [
            [1, 1e-12],
            [10, 1e-13],
          ],
        },
        { beyondRange: "flat" },
      ),
      "classicalNoise[0].beyondRange",
      '"refuse", "hold", "power-law"',
    ],
    [
      "a name taken by a component",
      setupWith(
        {
          unit: "N/√Hz",
          points: [
            [1, 1e-12],
            [10, 1e-13],
          ],
        },
        { name: "probe" },
      ),
      "classicalNoise[0].name",
      "already the name of a component",
    ],
    [
      "a component that takes no classical noise",
      setupWith(
        {
          unit: "N/√Hz",
          points: [
            [1, 1e-12],
            [10, 1e-13],
          ],
        },
        { on: "detector" },
      ),
      "classicalNoise[0].enters",
      "takes no classical noise",
    ],
  ])("refuses %s, naming the field", (_, description, path, problem) => {
    const e = singleProblemOf(() => loadSetup(description));
    expect(e.path).toBe(path);
    expect(e.message).toContain(problem);
  });
});
