/**
 * Laser-noise terms as a user writes them: the units they take, and every refusal naming the
 * field, the value and what is allowed (where the term cannot enter, a wrong unit, a negative
 * value, a coupler without the carrier's power).
 */
import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { afterAll, describe, expect, it } from "vitest";
import { evaluate, prepare } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { loadSetupFile } from "../../src/setup/load-file";
import { cavityReadout, probedBody, setup, sumTerms } from "../helpers/setups";
import { singleProblemOf } from "../helpers/errors";

const folder = mkdtempSync(join(tmpdir(), "quietframe-laser-spectra-"));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

const grid = { from: "10 Hz", to: "10 kHz", points: 31 };

function cavityWith(term: Record<string, unknown>, cavity: Record<string, string | number> = { linewidth: "100 kHz", power: "10 mW", length: "10 cm" }): SetupDescription {
  return {
    ...cavityReadout({ body: { mass: "100 g" }, bodyType: "free-mass", cavity }),
    grid,
    classicalNoise: [{ name: "laser-noise", on: "cavity", ...term } as never],
  };
}

const rin = (
  unit: string,
  points: [number, number][] = [
    [1, 1e-8],
    [1e5, 1e-8],
  ],
) => ({ enters: "laser intensity", spectrum: { unit, points } });

describe("laser-noise units", () => {
  it.each(["1/√Hz", "1/sqrtHz", "1/sqrt(Hz)", "1/rtHz", "Hz^-1/2", "Hz^(-1/2)", "/√Hz"])("relative intensity noise in %s is the same term", (unit) => {
    const budget = evaluate(prepare(cavityWith(rin(unit)))).budget;
    const reference = evaluate(prepare(cavityWith(rin("1/√Hz")))).budget;
    expect(Array.from(sumTerms(budget.terms, "laser-noise"))).toEqual(Array.from(sumTerms(reference.terms, "laser-noise")));
  });

  it("frequency noise in kHz/√Hz is a thousand times that in Hz/√Hz in amplitude", () => {
    const term = (unit: string, asd: number) =>
      sumTerms(
        evaluate(
          prepare(
            cavityWith({
              enters: "laser frequency",
              spectrum: {
                unit,
                points: [
                  [1, asd],
                  [1e5, asd],
                ],
              },
            }),
          ),
        ).budget.terms,
        "laser-noise",
      );
    const hz = term("Hz/√Hz", 3);
    const khz = term("kHz/sqrtHz", 0.003);
    hz.forEach((v, i) => expect(Math.abs(khz[i] / v - 1)).toBeLessThan(1e-12));
  });

  it("a RIN file with the unit in its header is read like the inline table", () => {
    writeFileSync(join(folder, "rin.csv"), "# invented laser\nfrequency [Hz], RIN [Hz^-1/2]\n1, 1e-8\n100000, 1e-8\n");
    const path = join(folder, "laser.json");
    writeFileSync(path, JSON.stringify(cavityWith({ enters: "laser intensity", spectrum: { file: "rin.csv" } })));
    const fromFile = evaluate(prepare(loadSetupFile(path))).budget;
    const inline = evaluate(prepare(cavityWith(rin("1/√Hz")))).budget;
    expect(Array.from(sumTerms(fromFile.terms, "laser-noise"))).toEqual(Array.from(sumTerms(inline.terms, "laser-noise")));
  });
});

describe("laser-noise refusals", () => {
  it("RIN given as a displacement ASD: the unit is refused, naming what relative intensity noise takes", () => {
    const e = singleProblemOf(() => prepare(cavityWith(rin("m/√Hz"))));
    expect(e.path).toBe("classicalNoise[0].spectrum.unit");
    expect(e.message).toContain('"m/√Hz"');
    expect(e.message).toContain("relative intensity noise (δP/P) per root hertz");
    expect(e.allowed).toContain("1/√Hz");
  });

  it("frequency noise given in 1/√Hz: refused, naming hertz of laser frequency", () => {
    const e = singleProblemOf(() =>
      prepare(
        cavityWith({
          enters: "laser frequency",
          spectrum: {
            unit: "1/√Hz",
            points: [
              [1, 1],
              [1e5, 1],
            ],
          },
        }),
      ),
    );
    expect(e.path).toBe("classicalNoise[0].spectrum.unit");
    expect(e.message).toContain("hertz of laser frequency per root hertz");
    expect(e.allowed).toContain("Hz/√Hz");
  });

  it("a negative RIN value: refused, naming the point", () => {
    const e = singleProblemOf(() =>
      prepare(
        cavityWith(
          rin("1/√Hz", [
            [1, 1e-8],
            [1e5, -1e-8],
          ]),
        ),
      ),
    );
    expect(e.path).toBe("classicalNoise[0].spectrum.points[1]");
    expect(e.message).toContain("negative or not a finite number");
    expect(e.allowed).toContain("1/√Hz");
  });

  it("a cavity given neither power nor photons: refused at the cavity's power, naming the term", () => {
    const e = singleProblemOf(() => prepare(cavityWith(rin("1/√Hz"), { linewidth: "100 kHz", length: "10 cm" })));
    expect(e.path).toBe("components.cavity.power");
    expect(e.message).toContain("'laser-noise'");
    expect(e.allowed).toContain("photons");
  });

  it("a probe given a measurement rate: refused at its power", () => {
    const description: SetupDescription = {
      ...probedBody({ bodyType: "oscillator", body: { mass: "1 ng", frequency: "1 MHz", Q: 1e6, temperature: "0 K" }, probe: { measurementRate: "1 kHz" } }),
      grid: { from: "0.9 MHz", to: "1.1 MHz", points: 11 },
      classicalNoise: [
        {
          name: "laser-noise",
          on: "probe",
          ...rin("1/√Hz", [
            [1e5, 1e-8],
            [1e7, 1e-8],
          ]),
        } as never,
      ],
    };
    const e = singleProblemOf(() => prepare(description));
    expect(e.path).toBe("components.probe.power");
    expect(e.message).toContain("measurement rate");
  });

  it("frequency noise on a position probe: refused in words, pointing to a cavity", () => {
    const description: SetupDescription = {
      ...probedBody({ body: { mass: "1 g" }, probe: { power: "1 mW" } }),
      classicalNoise: [
        {
          name: "laser-noise",
          on: "probe",
          enters: "laser frequency",
          spectrum: {
            unit: "Hz/√Hz",
            points: [
              [1, 1],
              [1e5, 1],
            ],
          },
        } as never,
      ],
    };
    const e = singleProblemOf(() => prepare(description));
    expect(e.path).toBe("classicalNoise[0].enters");
    expect(e.message).toContain("no resonator");
    expect(e.allowed).toContain('"laser intensity"');
  });

  it.each(["laser intensity", "laser frequency"])("%s on an interferometer: refused, saying its model carries the dark port only", (enters) => {
    const description: SetupDescription = setup(
      [
        { name: "vac", type: "vacuum" },
        { name: "ifo", type: "interferometer", params: { mass: "40 kg", armLength: "4 km", armBandwidth: "100 Hz", power: "100 kW" } },
        { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
      ],
      [
        ["vac.out", "ifo.in"],
        ["ifo.out", "detector.in"],
      ],
      {
        signal: { kind: "strain", on: "ifo" },
        classicalNoise: [
          {
            name: "laser-noise",
            on: "ifo",
            enters,
            spectrum: {
              unit: enters === "laser intensity" ? "1/√Hz" : "Hz/√Hz",
              points: [
                [1, 1e-8],
                [1e4, 1e-8],
              ],
            },
          } as never,
        ],
      },
    );
    const e = singleProblemOf(() => prepare(description));
    expect(e.path).toBe("classicalNoise[0].enters");
    expect(e.message).toContain("dark port");
    expect(e.message).toContain("imbalance of the arms");
    expect(e.allowed).toContain('"strain"');
  });

  it("on the light source: refused, naming the cavity it drives (through a loss)", () => {
    const description: SetupDescription = setup(
      [
        { name: "light", type: "coherent" },
        { name: "fibre", type: "loss", params: { transmission: 0.9 } },
        { name: "body", type: "free-mass", params: { mass: "100 g" } },
        { name: "cavity", type: "cavity", params: { linewidth: "100 kHz", power: "10 mW", length: "10 cm" } },
        { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
      ],
      [
        ["light.out", "fibre.in"],
        ["fibre.out", "cavity.in"],
        ["cavity.out", "detector.in"],
        ["cavity.mechanics", "body.body"],
      ],
      { classicalNoise: [{ name: "laser-noise", on: "light", ...rin("1/√Hz") } as never] },
    );
    const e = singleProblemOf(() => prepare(description));
    expect(e.path).toBe("classicalNoise[0].on");
    expect(e.message).toContain("'light' is a light source");
    expect(e.message).toContain("attach it to the component that carries the drive");
    expect(e.message).toContain("'cavity'");
    expect(e.allowed).toBe('"on": "cavity"');
  });
});
