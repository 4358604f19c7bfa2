import { describe, expect, it } from "vitest";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { inspiralRange } from "../../src/reach";
import type { ComponentDescription, SetupDescription } from "../../src/setup/format";
import { expectAllClose } from "../helpers/close";
import { setup } from "../helpers/setups";

/**
 * Rules of thumb of the trade, reproduced with the engine. The rules themselves are common
 * practice, no source; what the engine adds is which parameters make them true. Every number
 * asserted below is computed by the engine from the set-ups written out here; the closed forms
 * used to pin the definitions are derived in the comments (and in back-action-evasion.test.ts).
 */

type Budget = ReturnType<typeof evaluateSetup>["budget"];

function evaluate(s: SetupDescription, grid: { from: number; to: number; points: number }): Budget {
  return evaluateSetup(loadSetup(s), grid).budget;
}

/** A budget term by exact label; terms that are zero everywhere are left out of budgets, so they read as zeros. */
function term(b: Budget, label: string): Float64Array {
  return b.terms.find((t) => t.label === label)?.psd ?? new Float64Array(b.frequencies.length);
}

/* ------------------------------------------------------------------------------------------ */
/* 1. A first negative-mass reference removes about 30 % of the back-action.                  */
/* ------------------------------------------------------------------------------------------ */

/**
 * Invented tabletop: a 4 ng membrane-like mode at 1.1 MHz (Q = 2·10⁷, 4 K, symmetric damping so
 * its response has the spin's form) read by travelling light at a measurement rate of 30 kHz;
 * the light then passes a transmission η to a negative-mass vapour-cell spin (F = 4, 80 %
 * polarized) and a phase homodyne.
 *
 * Definition used throughout. Back-action S_BA is force-referred and is what the probe light's
 * amplitude quadrature puts on the measured combination: the term "light: amplitude quadrature",
 * plus, with loss between the systems, the vacuum that enters there and drives the spin alone
 * ("between: vacuum (amplitude)"), as in back-action-evasion.test.ts. The reduction over a band is
 *   R = 1 − Σ_i S_BA,with(f_i) / Σ_i S_BA,without(f_i)
 * over the grid points of the band f_m ± 5 kHz (201 log-spaced points, spacing uniform to 1 %),
 * i.e. the ratio of band-averaged PSDs. "Without" is the same probe with neither loss nor cell.
 */
const F_M = 1.1e6;
const Q_M = 2e7;
const PROBE_RATE = 30e3; // Hz
const BAND = { from: F_M - 5e3, to: F_M + 5e3, points: 201 };

interface Tabletop {
  /** Power transmission between membrane and cell. */
  eta: number;
  /** Spin readout rate over the membrane's. */
  rateRatio: number;
  /** Larmor frequency minus mechanical frequency, Hz. */
  detuning: number;
  /** Intrinsic spin linewidth and probe broadening, Hz (FWHM). */
  linewidth: number;
  probeBroadening: number;
  /** Detection efficiency of the homodyne. */
  detection: number;
}

function tabletop(p: Tabletop | null): SetupDescription {
  const components: ComponentDescription[] = [
    { name: "light", type: "coherent" },
    { name: "membrane", type: "oscillator", params: { mass: "4 ng", frequency: `${F_M} Hz`, Q: Q_M, temperature: "4 K", damping: "symmetric" } },
    { name: "probe", type: "position-probe", params: { measurementRate: `${PROBE_RATE} Hz`, wavelength: "852 nm" } },
  ];
  const connections: [string, string][] = [
    ["light.out", "probe.in"],
    ["probe.mechanics", "membrane.body"],
  ];
  let last = "probe.out";
  if (p) {
    components.push(
      { name: "between", type: "loss", params: { transmission: p.eta } },
      {
        name: "cell",
        type: "spin-ensemble",
        params: {
          atoms: 1e11,
          spin: 4,
          polarization: "80 %",
          larmorFrequency: `${F_M + p.detuning} Hz`,
          linewidth: `${p.linewidth} Hz`,
          probeBroadening: `${p.probeBroadening} Hz`,
          readoutRate: `${PROBE_RATE * p.rateRatio} Hz`,
          orientation: "negative-mass",
        },
      },
    );
    connections.push([last, "between.in"], ["between.out", "cell.in"]);
    last = "cell.out";
  }
  components.push({ name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: p?.detection ?? 0.9 } });
  connections.push([last, "detector.in"]);
  return setup(components, connections, { signal: { kind: "force", on: "membrane", referTo: "force" } });
}

function backAction(b: Budget): Float64Array {
  const light = term(b, "light: amplitude quadrature");
  const between = term(b, "between: vacuum (amplitude)");
  return light.map((v, i) => v + between[i]);
}

function sum(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i];
  return s;
}

const lone = evaluate(tabletop(null), BAND);

/** R over the band, and the reference ratio S_BA,with/S_BA,without point by point. */
function reduction(p: Tabletop): { band: number; ratio: Float64Array; frequencies: Float64Array } {
  const withCell = backAction(evaluate(tabletop(p), BAND));
  const without = backAction(lone);
  return { band: 1 - sum(withCell) / sum(without), ratio: withCell.map((v, i) => v / without[i]), frequencies: lone.frequencies };
}

/** χ_j(Ω) = sΩ_j/(Ω_j² + γ_j²/4 − Ω² − iγ_jΩ) as [re, im] (the membrane's and the spin's common form). */
function chi(sign: number, omegaJ: number, gammaJ: number, omega: number): [number, number] {
  const dr = omegaJ * omegaJ + (gammaJ * gammaJ) / 4 - omega * omega;
  const di = -gammaJ * omega;
  const d2 = dr * dr + di * di;
  return [(sign * omegaJ * dr) / d2, (-sign * omegaJ * di) / d2];
}

/**
 * Derived (back-action-evasion.test.ts gives the one-beam derivation): with k_s² = ρk² and the
 * transmission η between the systems, the force-referred back-action over the lone probe's is
 *   S_BA,with/S_BA,without = |χ_m + ρχ_s|²/|χ_m|² + ρ²·(1 − η)/η·|χ_s|²/|χ_m|²,
 * independent of the detection efficiency (it scales signal and back-action alike). For matched
 * responses (χ_s = −χ_m) this is (1 − ρ)² + ρ²(1 − η)/η: at ρ = 1 the reduction is 1 − (1 − η)/η,
 * and the best rate ratio is ρ = η, where the reduction is η itself.
 */
function closedFormRatio(p: Tabletop, f: number): number {
  const w = 2 * Math.PI * f;
  const wm = 2 * Math.PI * F_M;
  const cm = chi(1, wm, wm / Q_M, w);
  const cs = chi(-1, 2 * Math.PI * (F_M + p.detuning), 2 * Math.PI * (p.linewidth + p.probeBroadening), w);
  const rho = p.rateRatio;
  const m2 = cm[0] * cm[0] + cm[1] * cm[1];
  const re = cm[0] + rho * cs[0];
  const im = cm[1] + rho * cs[1];
  const s2 = cs[0] * cs[0] + cs[1] * cs[1];
  return (re * re + im * im) / m2 + (rho * rho * ((1 - p.eta) / p.eta) * s2) / m2;
}

/**
 * Invented parameter sets, named after the imperfections that set the outcome (one each
 * for A, B and D; several moderate ones together for C). The band
 * reductions the engine gives for them (recorded when this file was written) are
 *   A 31.3 %, B 30.1 %, C 30.8 %, D 31.2 %.
 */
const NOMINAL: Tabletop = { eta: 1, rateRatio: 1, detuning: 0, linewidth: 250, probeBroadening: 150, detection: 0.9 };
const SETS: [string, Tabletop][] = [
  ["A: 60 % transmission between the systems, everything else matched", { ...NOMINAL, eta: 0.6 }],
  ["B: 32 % transmission, spin readout rate turned down to 32 % of the membrane's (ρ = η)", { ...NOMINAL, eta: 0.32, rateRatio: 0.32 }],
  [
    "C: 80 % transmission, spin read 30 % faster, Larmor 300 Hz high, 2 kHz spin line, 80 % detection",
    { eta: 0.8, rateRatio: 1.3, detuning: 300, linewidth: 300, probeBroadening: 1700, detection: 0.8 },
  ],
  ["D: 95 % transmission but a 7 kHz spin line (probe broadening) against a 0.06 Hz mechanical line", { ...NOMINAL, eta: 0.95, linewidth: 500, probeBroadening: 6500 }],
];

describe("rule of thumb: a first demonstration of a negative-mass reference removed about 30 % of the back-action (common practice, no source)", () => {
  const results = SETS.map(([name, p]) => ({ name, p, r: reduction(p) }));

  it("the engine's back-action ratio is the closed form from the two susceptibilities at every frequency of the band (derived above)", () => {
    for (const { name, p, r } of results) {
      expectAllClose(
        r.ratio,
        Array.from(r.frequencies, (f) => closedFormRatio(p, f)),
        1e-9,
        name,
      );
    }
  });

  it.each(SETS)("%s: 30 % ± 5 % over f_m ± 5 kHz", (name) => {
    const { r } = results.find((x) => x.name === name)!;
    console.info(`back-action reduction, ${name}: ${(100 * r.band).toFixed(1)} %`);
    expect(r.band).toBeGreaterThanOrEqual(0.25);
    expect(r.band).toBeLessThanOrEqual(0.35);
  });

  it("more transmission between the systems removes more back-action (set C's other imperfections kept)", () => {
    const etas = [0.5, 0.6, 0.7, 0.8, 0.9, 0.95, 1];
    const rs = etas.map((eta) => reduction({ ...SETS[2][1], eta }).band);
    for (let k = 1; k < rs.length; k++) expect(rs[k], `η = ${etas[k]}`).toBeGreaterThan(rs[k - 1]);
    // The 30 % window is narrow in η: 10 points of transmission either way leave it.
    expect(rs[etas.indexOf(0.7)]).toBeLessThan(0.25);
    expect(rs[etas.indexOf(0.9)]).toBeGreaterThan(0.35);
  });

  it("a larger Larmor mismatch or a broader spin line removes less (set A otherwise)", () => {
    const detuned = [0, 300, 1000, 3000].map((detuning) => reduction({ ...SETS[0][1], detuning }).band);
    for (let k = 1; k < detuned.length; k++) expect(detuned[k]).toBeLessThan(detuned[k - 1]);
    const broad = [100, 1000, 3000, 10000].map((probeBroadening) => reduction({ ...SETS[0][1], probeBroadening }).band);
    for (let k = 1; k < broad.length; k++) expect(broad[k]).toBeLessThan(broad[k - 1]);
  });

  it("the detection efficiency does not change the force-referred back-action reduction (derived above)", () => {
    const a = reduction({ ...SETS[2][1], detection: 0.5 }).band;
    const b = reduction({ ...SETS[2][1], detection: 1 }).band;
    expect(Math.abs(a - b)).toBeLessThan(1e-12);
  });

  it("with matched responses the best spin readout rate is ρ = η, where the reduction equals η (derived above), at 5 kHz from resonance", () => {
    // A narrow spin line so that χ_s ≈ −χ_m at the offset; the residual mismatch is (γ/2Δ)² ≈ 1e-4.
    const eta = 0.6;
    const at = (rateRatio: number) => {
      const r = reduction({ ...NOMINAL, eta, rateRatio, linewidth: 1, probeBroadening: 0 });
      return 1 - r.ratio[r.ratio.length - 1];
    };
    expect(Math.abs(at(eta) - eta)).toBeLessThan(1e-3);
    expect(Math.abs(at(1) - (1 - (1 - eta) / eta))).toBeLessThan(1e-3);
    for (const rho of [0.4, 0.5, 0.7, 0.8, 1]) expect(at(rho), `ρ = ${rho}`).toBeLessThan(at(eta));
  });
});

/* ------------------------------------------------------------------------------------------ */
/* 2. Large gains need end-to-end efficiencies above about 95 %; a factor of about 2 in        */
/*    broadband sensitivity for a long-baseline detector.                                      */
/* ------------------------------------------------------------------------------------------ */

/**
 * Invented long-baseline detector: tuned Michelson, 4 km arm cavities of 45 Hz half-width, 40 kg
 * test masses, 750 kW circulating per arm, 1064 nm. The arms are lossless here so that the
 * overall efficiency η below is the only loss (arm loss acts on the phase readout exactly like
 * detection loss; interferometer.test.ts).
 *
 * Gain G = inspiral range with the reference / range of the same detector without it (vacuum at
 * the dark port, phase readout, the same detection efficiency as the reference scheme's beam 1),
 * for a 1.4 + 1.4 solar-mass inspiral at SNR 8 from 5 Hz (src/reach). The range scales as 1/ASD
 * under a uniform scaling of the noise, so G is the broadband factor in strain ASD, weighted as
 * an inspiral search weighs the band.
 *
 * Overall efficiency η: the power transmission each beam sees from its source to its detector,
 * split as √η before the system (source arm, or between interferometer and cell) and √η at
 * detection, unless a test says otherwise.
 *
 * Spin frequency: the engine's spin precesses at `larmorFrequency` in the frame of the light's
 * quadratures, so the tens of hertz below are the cell's effective frequency against the light
 * it reads; the engine has no separate parameter for an offset between a laboratory Larmor
 * frequency and that frame, and treats the two carrier wavelengths as documentary.
 */
const IFO = { mass: "40 kg", armLength: "4 km", armBandwidth: "45 Hz", power: "750 kW", wavelength: "1064 nm", opticalLoss: 0 };
const STRAIN_GRID = { from: 5, to: 2000, points: 300 };
const strainSignal = { signal: { kind: "strain", on: "ifo", referTo: "strain" } };

interface SpinDesign {
  larmor: number; // Hz, effective
  rate: number; // Hz
  orientation?: "negative-mass" | "positive-mass";
}

function spinCell(d: SpinDesign): ComponentDescription {
  return {
    name: "cell",
    type: "spin-ensemble",
    params: {
      atoms: 1e12,
      spin: 4,
      polarization: "98 %",
      larmorFrequency: `${d.larmor} Hz`,
      linewidth: "1 Hz",
      readoutRate: `${d.rate} Hz`,
      orientation: d.orientation ?? "negative-mass",
    },
  };
}

/** The detector without a reference: vacuum at the dark port. */
function plainDetector(detection: number): SetupDescription {
  return setup(
    [
      { name: "light", type: "vacuum" },
      { name: "ifo", type: "interferometer", params: IFO },
      { name: "d1", type: "homodyne", params: { angle: "90 deg", efficiency: detection } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "d1.in"],
    ],
    { readout: ["d1"], ...strainSignal },
  );
}

/** Two-colour entangled light: beam 1 into the dark port, beam 2 through the negative-mass cell; outputs combined optimally. */
function entangledScheme(squeezingDb: number, d: SpinDesign, before: number, detection: number): SetupDescription {
  return setup(
    [
      { name: "epr", type: "entangled-source", params: { squeezing: `${squeezingDb} dB`, wavelength1: "1064 nm", wavelength2: "852 nm", efficiency1: before, efficiency2: before } },
      { name: "ifo", type: "interferometer", params: IFO },
      spinCell(d),
      { name: "d1", type: "homodyne", params: { angle: "90 deg", efficiency: detection } },
      { name: "d2", type: "homodyne", params: { angle: "90 deg", efficiency: detection } },
    ],
    [
      ["epr.out1", "ifo.in"],
      ["ifo.out", "d1.in"],
      ["epr.out2", "cell.in"],
      ["cell.out", "d2.in"],
    ],
    { readout: ["d1", "d2"], ...strainSignal },
  );
}

/** One beam: vacuum → interferometer → loss → cell → phase homodyne (the cell read at the detector's wavelength). */
function singleBeamScheme(d: SpinDesign, between: number, detection: number): SetupDescription {
  return setup(
    [
      { name: "light", type: "vacuum" },
      { name: "ifo", type: "interferometer", params: IFO },
      { name: "between", type: "loss", params: { transmission: between } },
      spinCell(d),
      { name: "d1", type: "homodyne", params: { angle: "90 deg", efficiency: detection } },
    ],
    [
      ["light.out", "ifo.in"],
      ["ifo.out", "between.in"],
      ["between.out", "cell.in"],
      ["cell.out", "d1.in"],
    ],
    { readout: ["d1"], ...strainSignal },
  );
}

const rangeOf = (s: SetupDescription): number => {
  const b = evaluate(s, STRAIN_GRID);
  return inspiralRange(b.frequencies, b.total).metres;
};

type Split = (eta: number) => [before: number, detection: number];
const EQUAL: Split = (eta) => [Math.sqrt(eta), Math.sqrt(eta)];
const ALL_BEFORE: Split = (eta) => [eta, 1];
const ALL_AT_DETECTION: Split = (eta) => [1, eta];

/**
 * Designs: the cell's effective frequency and readout rate that maximize G at η = 1 (a
 * Nelder–Mead search over both, 1 Hz spin line, 98 % polarization; the test below checks
 * they are a local optimum). -15 dB is the two-mode squeezing of the entangled source.
 */
const SQUEEZING_DB = -15;
const ENTANGLED_DESIGN: SpinDesign = { larmor: 60.8, rate: 16.5 };
const SINGLE_BEAM_DESIGN: SpinDesign = { larmor: 21.6, rate: 171 };

function entangledGain(eta: number, split: Split = EQUAL, design = ENTANGLED_DESIGN, squeezingDb = SQUEEZING_DB): number {
  const [before, detection] = split(eta);
  return rangeOf(entangledScheme(squeezingDb, design, before, detection)) / rangeOf(plainDetector(detection));
}

function singleBeamGain(eta: number, split: Split = EQUAL, design = SINGLE_BEAM_DESIGN): number {
  const [between, detection] = split(eta);
  return rangeOf(singleBeamScheme(design, between, detection)) / rangeOf(plainDetector(detection));
}

/** Efficiency at which an increasing gain(η) crosses `target`, by bisection on [lo, 1] to 1e-5. */
function efficiencyFor(gain: (eta: number) => number, target: number, lo = 0.5): number {
  let a = lo;
  let b = 1;
  expect(gain(a), "the gain at the lower end is below the target").toBeLessThan(target);
  expect(gain(b), "the lossless gain reaches the target").toBeGreaterThan(target);
  while (b - a > 1e-5) {
    const m = (a + b) / 2;
    if (gain(m) > target) b = m;
    else a = m;
  }
  return (a + b) / 2;
}

const ETAS = [1, 0.99, 0.98, 0.97, 0.96, 0.95, 0.93, 0.9, 0.85, 0.8, 0.7];

describe("rule of thumb: a negative-mass reference could give a long-baseline detector about a factor 2 in broadband sensitivity, and needs end-to-end efficiencies above about 95 % for large gains (common practice, no source)", () => {
  describe("entangled-source scheme (-15 dB two-mode squeezing, negative-mass cell on beam 2)", () => {
    it("the lossless gain exceeds 2, and the design is a local optimum of it", () => {
      const g = entangledGain(1);
      console.info(`entangled scheme, lossless: range gain ${g.toFixed(3)}`);
      expect(g).toBeGreaterThan(2);
      for (const f of [0.9, 1.1]) {
        expect(entangledGain(1, EQUAL, { ...ENTANGLED_DESIGN, larmor: ENTANGLED_DESIGN.larmor * f })).toBeLessThan(g);
        expect(entangledGain(1, EQUAL, { ...ENTANGLED_DESIGN, rate: ENTANGLED_DESIGN.rate * f })).toBeLessThan(g);
      }
    });

    it("needs the negative mass: the same cell in its lowest energy state (positive mass) gives less than half the gain", () => {
      // Recorded when this file was written: 2.81 against 0.93 (worse than no reference at all).
      const negative = entangledGain(1);
      const positive = entangledGain(1, EQUAL, { ...ENTANGLED_DESIGN, orientation: "positive-mass" });
      expect(positive).toBeLessThan(negative / 2);
    });

    it("the gain falls monotonically with loss", () => {
      const gains = ETAS.map((eta) => entangledGain(eta));
      console.info(`entangled scheme, gain vs η: ${ETAS.map((e, k) => `${e}: ${gains[k].toFixed(3)}`).join(", ")}`);
      for (let k = 1; k < gains.length; k++) expect(gains[k], `η = ${ETAS[k]}`).toBeLessThan(gains[k - 1]);
    });

    it("a factor 2 needs an overall efficiency above 90 %, wherever the loss sits", () => {
      const found = (
        [
          ["split evenly", EQUAL],
          ["all before the systems", ALL_BEFORE],
          ["all at detection", ALL_AT_DETECTION],
        ] as const
      ).map(([where, split]) => ({ where, eta: efficiencyFor((eta) => entangledGain(eta, split), 2) }));
      console.info(`entangled scheme, η for a factor 2: ${found.map((f) => `${f.where} ${(100 * f.eta).toFixed(2)} %`).join(", ")}`);
      for (const f of found) expect(f.eta, f.where).toBeGreaterThan(0.9);
    });

    it("at 90 % no design on a grid of squeezing (-10 … -20 dB), cell frequency and readout rate reaches a factor 2", () => {
      let best = 0;
      for (const sq of [-10, -12, -15, -20]) {
        for (const larmor of [40, 50, 60, 70, 80]) {
          for (const rate of [10, 15, 20, 25, 30, 40]) best = Math.max(best, entangledGain(0.9, EQUAL, { larmor, rate }, sq));
        }
      }
      console.info(`entangled scheme at η = 90 %: best gain on the grid ${best.toFixed(3)}`);
      expect(best).toBeLessThan(2);
      expect(best).toBeGreaterThan(1); // the grid is not degenerate: the reference still helps
    });
  });

  describe("single-beam scheme (the cell in the dark-port beam after the interferometer, no squeezing)", () => {
    it("the lossless gain exceeds 2 and falls monotonically with loss", () => {
      const gains = ETAS.map((eta) => singleBeamGain(eta));
      console.info(`single beam, gain vs η: ${ETAS.map((e, k) => `${e}: ${gains[k].toFixed(3)}`).join(", ")}`);
      expect(gains[0]).toBeGreaterThan(2);
      for (let k = 1; k < gains.length; k++) expect(gains[k], `η = ${ETAS[k]}`).toBeLessThan(gains[k - 1]);
    });

    it("a factor 2 needs an overall efficiency above 90 % (loss split evenly, or all of it between interferometer and cell)", () => {
      const even = efficiencyFor((eta) => singleBeamGain(eta), 2);
      const between = efficiencyFor((eta) => singleBeamGain(eta, ALL_BEFORE), 2);
      console.info(`single beam, η for a factor 2: split evenly ${(100 * even).toFixed(2)} %, all between ${(100 * between).toFixed(2)} %`);
      expect(even).toBeGreaterThan(0.9);
      expect(between).toBeGreaterThan(0.9);
    });
  });
});
