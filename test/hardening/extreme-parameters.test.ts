import { describe, expect, it } from "vitest";
import { COMPONENT_KINDS } from "../../src/components/registry";
import type { QuantityParam } from "../../src/components/types";
import { QuietframeError } from "../../src/errors";
import { evaluateSetup, loadSetup, type Evaluation } from "../../src/pipeline";
import type { SetupDescription } from "../../src/setup/format";
import { setup } from "../helpers/setups";
import { EXAMPLE_FILES, errorDefect, exampleObject, problemsOf } from "./support";

/**
 * Extreme but valid parameters: every quantity parameter of every shipped example
 * and of small set-ups covering the remaining component kinds is set, one at a time, to the
 * ends of the ranges physicists use (masses 1e-21 … 1e3 kg, frequencies 1e-3 … 1e9 Hz,
 * Q up to 1e10 and the accepted limit 1e12, squeezing 20 dB and the accepted limit,
 * efficiencies 0 and 1, temperatures 0 and 300 K), and evaluated on the set-up's own grid
 * and on a grid spanning 1e-3 … 1e9 Hz. Each case ends either in a result that passes the
 * physical checks, or in a QuietframeError with a path and an explanation.
 */

/** Small invented set-ups for the component kinds the examples do not use. */
const SMALL_SETUPS: Record<string, SetupDescription> = {
  "squeezed light through a filter cavity into an interferometer": setup(
    [
      { name: "light", type: "squeezed", params: { squeezing: "-10 dB", angle: "90 deg" } },
      { name: "filter", type: "filter-cavity", params: { length: "300 m", detuning: "-40 Hz", inputTransmission: 60e-6, roundTripLoss: 1e-6 } },
      { name: "ifo", type: "interferometer", params: { mass: "40 kg", armLength: "4 km", armBandwidth: "100 Hz", power: "800 kW" } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: "95 %" } },
    ],
    [
      ["light.out", "filter.in"],
      ["filter.out", "ifo.in"],
      ["ifo.out", "detector.in"],
    ],
    { signal: { kind: "strain", on: "ifo" }, grid: { from: "5 Hz", to: "5 kHz", points: 9 } },
  ),
  "entangled light on a probed oscillator": setup(
    [
      { name: "epr", type: "entangled-source", params: { squeezing: "-10 dB", efficiency1: "95 %", efficiency2: "95 %", bandwidth: "5 MHz" } },
      { name: "body", type: "oscillator", params: { mass: "10 ng", frequency: "1 MHz", Q: 1e6, temperature: "1 K", damping: "symmetric" } },
      { name: "probe", type: "position-probe", params: { measurementRate: "2 kHz" } },
      { name: "d1", type: "homodyne", params: { angle: "90 deg", efficiency: "90 %" } },
      { name: "d2", type: "homodyne", params: { angle: "90 deg", efficiency: "90 %" } },
    ],
    [
      ["epr.out1", "probe.in"],
      ["probe.out", "d1.in"],
      ["epr.out2", "d2.in"],
      ["probe.mechanics", "body.body"],
    ],
    { readout: ["d1", "d2"], signal: { kind: "force", on: "body", referTo: "displacement" }, grid: { from: "0.9 MHz", to: "1.1 MHz", points: 9 } },
  ),
  "free mass in a gas bath read through a split beam": setup(
    [
      { name: "laser", type: "coherent", params: { amplitudeExcess: "3 dB", phaseExcess: "0 dB" } },
      { name: "dark", type: "vacuum" },
      { name: "splitter", type: "beam-splitter", params: { transmission: "90 %" } },
      { name: "spill", type: "dump" },
      { name: "body", type: "free-mass", params: { mass: "1 g" } },
      { name: "gas", type: "thermal-bath", params: { temperature: "300 K", dampingRate: "1 mHz" } },
      { name: "probe", type: "position-probe", params: { power: "1 mW" } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: "99 %" } },
    ],
    [
      ["laser.out", "splitter.in1"],
      ["dark.out", "splitter.in2"],
      ["splitter.out1", "probe.in"],
      ["splitter.out2", "spill.in"],
      ["probe.out", "detector.in"],
      ["probe.mechanics", "body.body"],
      ["gas.mechanics", "body.body"],
    ],
    { grid: { from: "1 Hz", to: "10 kHz", points: 9 } },
  ),
};

/** Values at the ends of the useful ranges, by parameter name or quantity kind. */
function extremesFor(spec: QuantityParam): (string | number)[] {
  if (spec.name === "Q") return [1e10, 1e12];
  if (spec.name === "r") return [10];
  if (spec.name === "squeezing") return ["-20 dB", "-86.85 dB"];
  if (spec.name === "amplitudeExcess" || spec.name === "phaseExcess") return ["100 dB"];
  switch (spec.kind) {
    case "mass":
      return ["1e-21 kg", "1e3 kg"];
    case "frequency":
      return ["1e-3 Hz", "1e9 Hz"];
    case "fraction":
      return [0, 1];
    case "temperature":
      return ["0 K", "300 K"];
    default:
      return [];
  }
}

interface Case {
  label: string;
  doc: SetupDescription;
}

/** One case per (set-up, component, parameter present or defaulted, extreme value). */
function cases(): Case[] {
  // The hybrid example with its spin's Larmor frequency given directly, so that it is swept too.
  const hybrid = exampleObject(EXAMPLE_FILES.indexOf("hybrid-spin-reference.json")) as SetupDescription;
  const cell = hybrid.components.find((c) => c.type === "spin-ensemble")!;
  const { field: _field, gyromagneticRatio: _ratio, ...rest } = cell.params as Record<string, unknown>;
  cell.params = { ...rest, larmorFrequency: "1.1 MHz" } as typeof cell.params;
  const bases: [string, SetupDescription][] = [
    ...EXAMPLE_FILES.map((f, i): [string, SetupDescription] => [f, exampleObject(i)]),
    ...Object.entries(SMALL_SETUPS),
    ["hybrid-spin-reference.json with a Larmor frequency", hybrid],
  ];
  const out: Case[] = [];
  for (const [name, base] of bases) {
    out.push({ label: `${name} as shipped`, doc: base });
    base.components.forEach((c, ci) => {
      const kind = COMPONENT_KINDS.get(c.type)!;
      for (const spec of kind.params) {
        if (spec.kind === "choice") continue;
        const present = c.params !== undefined && spec.name in c.params;
        if (!present && spec.default === undefined) continue; // an alternative the set-up does not use
        if (spec.name === "r" && !present) continue;
        for (const v of extremesFor(spec)) {
          const doc: SetupDescription = structuredClone(base);
          doc.components[ci].params = { ...(doc.components[ci].params ?? {}), [spec.name]: v };
          out.push({ label: `${name}: ${c.name}.${spec.name} = ${JSON.stringify(v)}`, doc });
        }
      }
    });
  }
  return out;
}

const WIDE_GRID = { from: 1e-3, to: 1e9, points: 25 };

/** What is wrong with an evaluation (empty string when every physical check holds). */
function evaluationDefect(e: Evaluation, doc: SetupDescription): string {
  const b = e.budget;
  for (let i = 0; i < b.total.length; i++) {
    const total = b.total[i];
    if (!Number.isFinite(total) || !(total > 0)) return `total at ${b.frequencies[i]} Hz is ${total}`;
    let sum = 0;
    for (const t of b.terms) {
      const v = t.psd[i];
      // Rounding may leave a term a hair below zero; the property suite allows the same 1e-12.
      if (!Number.isFinite(v) || v < -1e-12 * total) return `term '${t.label}' at ${b.frequencies[i]} Hz is ${v}`;
      sum += v;
    }
    // The terms are the independent input groups: they add up to the total (DEVELOPERS.md, budget).
    if (Math.abs(sum - total) > 1e-9 * total) return `terms sum to ${sum}, total ${total} at ${b.frequencies[i]} Hz`;
    for (const r of b.references) {
      if (!Number.isFinite(r.psd[i]) || r.psd[i] < 0) return `reference '${r.id}' at ${b.frequencies[i]} Hz is ${r.psd[i]}`;
      // The SQL 2ħ|χ| (Braginsky & Khalili 1992) is positive at every frequency.
      if (r.id === "sql" && !(r.psd[i] > 0)) return `SQL at ${b.frequencies[i]} Hz is ${r.psd[i]}`;
    }
  }
  if (e.warnings.some((w) => /blind/.test(w))) return `blind readout left in a result: ${e.warnings.join(" | ")}`;
  if (e.stability.stable) {
    // Heisenberg: the stationary state has V + iΣ/2 ≥ 0 (Simon, Mukunda & Dutta, PRA 49, 1567 (1994)).
    if (!e.physicality) return "stable set-up without a physicality check";
    if (!Number.isFinite(e.physicality.margin)) return `uncertainty margin ${e.physicality.margin}`;
    if (!e.physicality.physical) return e.physicality.summary;
  } else if (e.stability.undamped.length === 0) {
    return `neither stable nor marginal: ${e.stability.summary}`;
  } else if (!doc.components.some((c) => c.type === "free-mass" || c.type === "interferometer")) {
    // Only a body without a restoring force is truly undamped; a high-Q oscillator must keep its stationary-state check.
    return `marginal without a free body: ${e.stability.summary}`;
  }
  return "";
}

describe("extreme but valid parameters: a result that passes the physical checks, or a QuietframeError that explains", () => {
  const all = cases();

  it("covers every shipped example and every component kind", () => {
    const kinds = new Set(all.flatMap((c) => c.doc.components.map((x) => x.type)));
    expect([...kinds].sort()).toEqual([...COMPONENT_KINDS.keys()].sort());
    expect(all.length).toBeGreaterThan(100);
  });

  it("on the set-up's own grid and on 1e-3 … 1e9 Hz", () => {
    const defects: string[] = [];
    const refusals = new Map<string, number>();
    let evaluated = 0;
    for (const c of all) {
      for (const grid of [undefined, WIDE_GRID]) {
        const where = `${c.label} on ${grid ? "1e-3 … 1e9 Hz" : "its own grid"}`;
        try {
          const s = loadSetup(c.doc);
          const own = s.grid ? { ...s.grid, points: 9 } : undefined;
          const defect = evaluationDefect(evaluateSetup(s, grid ?? own), c.doc);
          if (defect) defects.push(`${where}: ${defect}`);
          else evaluated++;
        } catch (e) {
          const defect = errorDefect(e, false);
          if (defect) defects.push(`${where}: ${defect}`);
          else refusals.set((e as Error).message.slice(0, 60), (refusals.get((e as Error).message.slice(0, 60)) ?? 0) + 1);
        }
      }
    }
    expect(defects).toEqual([]);
    console.log(`extreme parameters: ${evaluated} evaluations passed the checks, ${[...refusals.values()].reduce((a, b) => a + b, 0)} refused:`, Object.fromEntries(refusals));
    // Most extremes are valid set-ups and must be evaluated, not refused.
    expect(evaluated).toBeGreaterThan(0.8 * 2 * all.length);
  }, 240_000);
});

/** The single problem of a set-up that is refused, at load or at evaluation. */
function refusal(doc: SetupDescription): QuietframeError {
  try {
    evaluateSetup(loadSetup(doc));
  } catch (e) {
    const problems = problemsOf(e);
    if (problems && problems.length === 1) return problems[0];
    throw e;
  }
  throw new Error("expected the set-up to be refused");
}

const withParam = (doc: SetupDescription, component: string, param: string, value: string | number): SetupDescription => {
  const copy: SetupDescription = structuredClone(doc);
  const c = copy.components.find((x) => x.name === component)!;
  c.params = { ...(c.params ?? {}), [param]: value };
  return copy;
};

const MEMBRANE = exampleObject(EXAMPLE_FILES.indexOf("cryogenic-membrane.json")) as SetupDescription;
const SQUEEZED = exampleObject(EXAMPLE_FILES.indexOf("cryogenic-membrane-squeezed.json")) as SetupDescription;

describe("efficiency 0: no information, refused with the detector named (never an infinite curve)", () => {
  it("a lone detector at efficiency 0", () => {
    const e = refusal(withParam(MEMBRANE, "detector", "efficiency", 0));
    expect(e.path).toBe("components.detector.efficiency");
    expect(e.value).toBe(0);
    expect(e.problem).toContain("detector 'detector' has efficiency 0");
    expect(e.problem).toContain("infinite");
    expect(e.allowed).toContain("above 0");
  });

  it("efficiency 1 and a hair above 0 are evaluated: the noise grows as 1/η but stays finite", () => {
    const grid = { from: 1.1e6, to: 1.3e6, points: 5 };
    const full = evaluateSetup(loadSetup(withParam(MEMBRANE, "detector", "efficiency", 1)), grid).budget;
    const faint = evaluateSetup(loadSetup(withParam(MEMBRANE, "detector", "efficiency", 1e-12)), grid).budget;
    for (let i = 0; i < 5; i++) {
      expect(Number.isFinite(faint.total[i])).toBe(true);
      // Imprecision scales as 1/η (AKM 2014, Sec. VI.B): at η = 1e-12 it dwarfs everything else.
      expect(faint.total[i]).toBeGreaterThan(1e9 * full.total[i]);
    }
  });
});

describe("the limits the set-up format allows, and just beyond", () => {
  it("squeezing: −86.85 dB (r ≈ 10) is evaluated; −87 dB is refused naming the limit shared with r", () => {
    const ok = evaluateSetup(loadSetup(withParam(SQUEEZED, "squeezer", "squeezing", "-86.85 dB")), { from: 1.1e6, to: 1.3e6, points: 5 });
    expect(evaluationDefect(ok, SQUEEZED)).toBe("");
    const e = refusal(withParam(SQUEEZED, "squeezer", "squeezing", "-87 dB"));
    expect(e.path).toBe("components.squeezer.squeezing");
    // 10·log10(e^{−20}) = −86.8589 dB: the dB form of r = 10.
    expect(e.allowed).toContain("-86.86 dB ≤ squeezing ≤ 0 dB");
  });

  it("classical excess noise: 100 dB is evaluated, 101 dB is refused", () => {
    const doc = withParam(MEMBRANE, "laser", "amplitudeExcess", "100 dB");
    expect(evaluationDefect(evaluateSetup(loadSetup(doc), { from: 1.1e6, to: 1.3e6, points: 5 }), doc)).toBe("");
    const e = refusal(withParam(MEMBRANE, "laser", "amplitudeExcess", "101 dB"));
    expect(e.path).toBe("components.laser.amplitudeExcess");
    expect(e.allowed).toContain("100 dB");
  });

  it("Q: 1e12 is stable with a physical stationary state; 1e13 is refused saying why", () => {
    const doc = withParam(MEMBRANE, "membrane", "Q", 1e12);
    const ev = evaluateSetup(loadSetup(doc), { from: 1.1e6, to: 1.3e6, points: 5 });
    expect(ev.stability.stable).toBe(true);
    expect(evaluationDefect(ev, doc)).toBe("");
    const e = refusal(withParam(MEMBRANE, "membrane", "Q", 1e13));
    expect(e.path).toBe("components.membrane.Q");
    expect(e.allowed).toContain("Q ≤ 1e+12");
    expect(e.problem).toMatch(/narrower than double precision resolves/);
  });
});

describe("a high-Q oscillator is weakly damped, not undamped", () => {
  const lone = (q: number, temperature: string): SetupDescription =>
    setup(
      [
        { name: "light", type: "coherent" },
        { name: "body", type: "oscillator", params: { mass: "1 ng", frequency: "1 MHz", Q: q, temperature, damping: "symmetric" } },
        { name: "probe", type: "position-probe", params: { measurementRate: "1e-12 Hz" } },
        { name: "detector", type: "homodyne" },
      ],
      [
        ["light.out", "probe.in"],
        ["probe.out", "detector.in"],
        ["probe.mechanics", "body.body"],
      ],
    );

  it.each([1e9, 1e10, 1e12])("Q = %d: stable, and the stationary variance is the thermal one", (q) => {
    const ev = evaluateSetup(loadSetup(lone(q, "10 mK")), { from: 0.9e6, to: 1.1e6, points: 5 });
    expect(ev.stability.stable).toBe(true);
    expect(ev.stability.summary).toMatch(/^stable/);
    expect(ev.physicality?.physical).toBe(true);
    // Quantum FDT: a mode in a bath relaxes to ⟨X²⟩ = n̄ + 1/2 with n̄ = 1/(e^{ħΩ/kT} − 1)
    // (Gardiner & Zoller, Quantum Noise, the damped oscillator chapter, from memory; ħ and k_B from CODATA 2018). The probe's
    // back-action at Γ/2π = 1e-12 Hz heats by about Γ/γ ≤ 1e-6 quanta (from the rate's definition).
    const hbarOmegaOverKT = (1.054571817e-34 * 2 * Math.PI * 1e6) / (1.380649e-23 * 0.01);
    const nbar = 1 / Math.expm1(hbarOmegaOverKT);
    const relative = Math.abs(ev.physicality!.largestVariance / (nbar + 0.5) - 1);
    expect(relative).toBeLessThan(1e-6);
  });

  it("a free mass stays marginal: its zero eigenvalue is real, even with friction", () => {
    const doc = SMALL_SETUPS["free mass in a gas bath read through a split beam"];
    const ev = evaluateSetup(loadSetup(doc));
    expect(ev.stability.stable).toBe(false);
    expect(ev.stability.undamped.length).toBeGreaterThan(0);
    expect(ev.physicality).toBeUndefined();
    expect(ev.warnings.join(" ")).toMatch(/marginal.*'body'/);
  });
});

describe("all extremes at once: every corner of eight parameters of the squeezed membrane", () => {
  const AXES: [string, string, [string | number, string | number]][] = [
    ["membrane", "mass", ["1e-21 kg", "1e3 kg"]],
    ["membrane", "frequency", ["1e-3 Hz", "1e9 Hz"]],
    ["membrane", "Q", [1e10, 1e12]],
    ["membrane", "temperature", ["0 K", "300 K"]],
    ["cavity", "linewidth", ["1e-3 Hz", "1e9 Hz"]],
    ["cavity", "photons", [1, 1e12]],
    ["squeezer", "squeezing", ["-20 dB", "-86.85 dB"]],
    ["membrane", "damping", ["viscous", "symmetric"]],
  ];

  it("2⁸ corners on 1e-3 … 1e9 Hz: each passes the physical checks or is refused with a reason", () => {
    const defects: string[] = [];
    let evaluated = 0;
    for (let corner = 0; corner < 1 << AXES.length; corner++) {
      const doc: SetupDescription = structuredClone(SQUEEZED);
      AXES.forEach(([name, param, values], k) => {
        const c = doc.components.find((x) => x.name === name)!;
        c.params = { ...(c.params ?? {}), [param]: values[(corner >> k) & 1] };
      });
      try {
        const defect = evaluationDefect(evaluateSetup(loadSetup(doc), { from: 1e-3, to: 1e9, points: 13 }), doc);
        if (defect) defects.push(`corner ${corner}: ${defect}`);
        else evaluated++;
      } catch (e) {
        const defect = errorDefect(e, false);
        if (defect) defects.push(`corner ${corner}: ${defect}`);
      }
    }
    expect(defects).toEqual([]);
    expect(evaluated).toBeGreaterThan(0.9 * (1 << AXES.length));
  }, 120_000);
});
