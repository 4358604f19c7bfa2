import { beforeAll, describe, expect, it } from "vitest";
import { idlerRecyclingPhase } from "../../src/components/interferometer";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { QuietframeError } from "../../src/errors";
import { evaluate, loadSetup, prepare } from "../../src/pipeline";
import { assemble } from "../../src/setup/assemble";
import type { SetupDescription } from "../../src/setup/format";
import { loadMathjs, type MathJs } from "../helpers/mathjs";
import { setup } from "../helpers/setups";

/**
 * Two-carrier entangled light with the interferometer as the idler's filter, against the closed
 * form of Ma et al., Nature Physics 13, 776 (2017) ("Ma" below). Their conditional noise, written
 * from memory in this project's notation (equation number not checked):
 *   S_h^cond = (h_SQL²/(2K)) [ (1 + K²) cosh 2r − sinh² 2r (K cos Θ + sin Θ)² / cosh 2r ],
 *   Θ(Ω) = θ_i − ψ(Ω),
 * for a lossless tuned interferometer (K, h_SQL of Kimble et al., Phys. Rev. D 65, 022002 (2001)),
 * signal beam read in the phase quadrature, idler read at homodyne angle θ_i after the arms turn
 * its quadratures by ψ(Ω), and the two outputs combined optimally (conditioning). The rotation of
 * a lossless cavity of half-width γ detuned by Δ, seen in reflection, is
 *   ψ(Ω) = [arg r(Ω) + arg r(−Ω)]/2,  r(Ω) = −(γ + i(Ω + Δ))/(γ − i(Ω + Δ))
 * (Gardiner & Collett's input-output relation of one mode; the two-photon rotation as in
 * Kimble et al. 2001, Sec. V). Minimizing over Θ gives tan Θ = 1/K and
 *   S_h^cond = e^{−2r_eff} (h_SQL²/2)(K + 1/K),  e^{2r_eff} = cosh 2r:
 * frequency-dependent squeezing with the effective squeeze factor r_eff (Ma's statement that the
 * conditional squeezing costs about 3 dB at large r; from memory). The conditional variance
 * (1/2)/cosh 2r of one beam of a two-mode squeezed state given the other is the same statement at
 * one frequency.
 */

const MASS = 30;
const L = 4000;
const F_ARM = 100;
const GAMMA = 2 * Math.PI * F_ARM;
const OMEGA0 = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
/** I_SQL = mL²γ⁴/(4ω0) (Kimble et al. 2001); the interferometer runs at I0 = I_SQL. */
const I_SQL = (MASS * L * L * GAMMA ** 4) / (4 * OMEGA0);
/** P_arm = I0 c/(2Lγ) for lossless arms (see interferometer.ts). */
const ARM_POWER = (I_SQL * SPEED_OF_LIGHT) / (2 * L * GAMMA);
const R = 1;

function kimbleK(f: number): number {
  const w = 2 * Math.PI * f;
  return (2 * GAMMA ** 4) / (w ** 2 * (GAMMA ** 2 + w ** 2));
}

function hSql2(f: number): number {
  return (8 * HBAR) / (MASS * (2 * Math.PI * f) ** 2 * L ** 2);
}

/** ψ(Ω): the quadrature rotation of a lossless cavity (half-width γ, detuning Δ, rad/s) in reflection. */
function cavityRotation(f: number, gamma: number, delta: number): number {
  const arg = (w: number) => Math.atan2(-(w + delta), -gamma) - Math.atan2(-(w + delta), gamma);
  const w = 2 * Math.PI * f;
  return (arg(w) + arg(-w)) / 2;
}

/** Ma's conditional strain noise for idler homodyne angle θ_i (rad) and idler detuning Δ (rad/s). */
function maConditional(f: number, thetaIdler: number, delta: number, r = R): number {
  const K = kimbleK(f);
  const big = Math.cosh(2 * r);
  const theta = thetaIdler - cavityRotation(f, GAMMA, delta);
  const overlap = K * Math.cos(theta) + Math.sin(theta);
  return (hSql2(f) / (2 * K)) * ((1 + K * K) * big - (Math.sinh(2 * r) ** 2 * overlap * overlap) / big);
}

interface TwoCarrierOptions {
  idlerDetuningHz: number;
  idlerAngle: number; // rad
  signalAngle?: number; // rad
  extra?: Record<string, string | number>;
  power?: number;
  r?: number;
}

function twoCarrier(o: TwoCarrierOptions): SetupDescription {
  return setup(
    [
      { name: "epr", type: "entangled-source", params: { r: o.r ?? R } },
      {
        name: "ifo",
        type: "interferometer",
        params: {
          mass: `${MASS} kg`,
          armLength: `${L} m`,
          armBandwidth: `${F_ARM} Hz`,
          power: `${o.power ?? ARM_POWER} W`,
          idlerDetuning: `${o.idlerDetuningHz} Hz`,
          ...o.extra,
        },
      },
      { name: "signalDetector", type: "homodyne", params: { angle: `${o.signalAngle ?? Math.PI / 2} rad` } },
      { name: "idlerDetector", type: "homodyne", params: { angle: `${o.idlerAngle} rad` } },
    ],
    [
      ["epr.out1", "ifo.in"],
      ["epr.out2", "ifo.idlerIn"],
      ["ifo.out", "signalDetector.in"],
      ["ifo.idlerOut", "idlerDetector.in"],
    ],
    { signal: { kind: "strain", on: "ifo" }, readout: ["signalDetector", "idlerDetector"] },
  );
}

const FREQS = Float64Array.of(5, 12, 30, 55, 100, 180, 400, 1000);

describe("two-carrier entangled light against Ma et al. 2017", () => {
  it.each([
    [70, 0.7],
    [-40, 1.9],
    [100, Math.PI / 2],
  ])("idler detuned by %f Hz, read at %f rad: the conditional noise equals Ma's closed form (lossless)", (deltaHz, thetaIdler) => {
    const budget = evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: deltaHz, idlerAngle: thetaIdler }))), FREQS).budget;
    FREQS.forEach((f, k) => {
      const expected = maConditional(f, thetaIdler, 2 * Math.PI * deltaHz);
      expect(Math.abs(budget.total[k] / expected - 1), `${f} Hz`).toBeLessThan(1e-8);
    });
  });

  it("the optimal idler readout at each frequency gives frequency-dependent squeezing e^{−2r_eff}(h_SQL²/2)(K + 1/K), e^{2r_eff} = cosh 2r", () => {
    const deltaHz = 60;
    for (const r of [0.5, 1, 1.5]) {
      for (const f of FREQS) {
        // tan Θ = 1/K, Θ = θ_i − ψ(Ω): Ma's optimal idler quadrature.
        const thetaIdler = cavityRotation(f, GAMMA, 2 * Math.PI * deltaHz) + Math.atan(1 / kimbleK(f));
        const total = evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: deltaHz, idlerAngle: thetaIdler, r }))), Float64Array.of(f)).budget.total[0];
        const K = kimbleK(f);
        const effective = 1 / Math.cosh(2 * r); // e^{−2r_eff}
        expect(Math.abs(total / (effective * (hSql2(f) / 2) * (K + 1 / K)) - 1), `r = ${r}, ${f} Hz`).toBeLessThan(1e-8);
      }
    }
  });

  it("conditioning never does worse than the signal beam alone (an extra output cannot raise the optimal estimate's noise)", () => {
    const both = evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: 30, idlerAngle: 0.4 }))), FREQS).budget;
    const alone = twoCarrier({ idlerDetuningHz: 30, idlerAngle: 0.4 });
    alone.readout = ["signalDetector"];
    const single = evaluate(prepare(loadSetup(alone)), FREQS).budget;
    FREQS.forEach((f, k) => {
      expect(both.total[k]).toBeLessThanOrEqual(single.total[k] * (1 + 1e-12));
      // Unconditioned, one beam of a two-mode squeezed state is thermal: cosh 2r times the vacuum noise.
      const vacuum = (hSql2(f) / 2) * (kimbleK(f) + 1 / kimbleK(f));
      expect(Math.abs(single.total[k] / (Math.cosh(2 * R) * vacuum) - 1), `${f} Hz`).toBeLessThan(1e-8);
    });
  });
});

describe("two-carrier entangled light: the signal-recycled interferometer as the idler's single filter", () => {
  // The signal carrier sees tuned resonant sideband extraction (φ = 90°, half-width γ(1 + ρ)/(1 − ρ)),
  // the idler tuned signal recycling (φ_i = 0, half-width ε_i = γ(1 − ρ)/(1 + ρ)) plus its detuning:
  // one detuned cavity. A single cavity with Δ = ε_i turns quadratures by ψ − π = arctan(2ε_i²/Ω²),
  // which matches tan Θ = 1/K when K = Ω_SQL²/Ω² and ε_i = Ω_SQL/√2 (Kimble et al. 2001 Sec. V;
  // Evans et al., Phys. Rev. D 88, 022002 (2013), from memory), i.e. well below the signal's width.
  const T = 0.19;
  const rho = Math.sqrt(1 - T);
  const idlerWidth = (GAMMA * (1 - rho)) / (1 + rho);
  const signalWidth = (GAMMA * (1 + rho)) / (1 - rho);
  const sr = { srmTransmission: T, srDetuning: "90 deg", idlerSrDetuning: "0 deg" };

  /**
   * K from the unsqueezed lossless noise S_0 = (h_SQL²/2)(K + 1/K): of the two roots K and 1/K,
   * the one on the same side of 1 as `guess`.
   */
  function kFromVacuumNoise(power: number, f: number, guess: number): number {
    const vac = setup(
      [
        { name: "light", type: "vacuum" },
        { name: "ifo", type: "interferometer", params: { mass: `${MASS} kg`, armLength: `${L} m`, armBandwidth: `${F_ARM} Hz`, power: `${power} W`, srmTransmission: T, srDetuning: "90 deg" } },
        { name: "detector", type: "homodyne", params: { angle: "0 deg" } },
      ],
      [
        ["light.out", "ifo.in"],
        ["ifo.out", "detector.in"],
      ],
      { signal: { kind: "strain", on: "ifo" } },
    );
    const y = (2 * evaluate(prepare(loadSetup(vac)), Float64Array.of(f)).budget.total[0]) / hSql2(f);
    const above = y / 2 + Math.sqrt((y * y) / 4 - 1);
    return guess >= 1 ? above : 1 / above;
  }

  it("with Δ_i = ε_i and Ω_SQL = √2 ε_i, the conditional noise is e^{−2r_eff} times the unsqueezed noise, up to the single filter's mismatch 1 + sinh²2r sin²δ", () => {
    // Ω_SQL² = lim Ω²K(Ω); K is proportional to the power, so scale the power to put Ω_SQL at √2 ε_i.
    const fLow = 0.5;
    const wLow = 2 * Math.PI * fLow;
    const power = (ARM_POWER * 2 * idlerWidth * idlerWidth) / (kFromVacuumNoise(ARM_POWER, fLow, Infinity) * wLow * wLow * (1 + (wLow / signalWidth) ** 2));
    const freqs = Float64Array.of(2, 4, 8, 15, 25, 40);
    const budget = evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: idlerWidth / (2 * Math.PI), idlerAngle: 0, signalAngle: 0, power, extra: sr }))), freqs).budget;
    freqs.forEach((f, k) => {
      const w = 2 * Math.PI * f;
      const K = kFromVacuumNoise(power, f, (2 * idlerWidth * idlerWidth) / (w * w));
      const vacuum = (hSql2(f) / 2) * (K + 1 / K);
      // δ: the single filter's quadrature arctan(Ω²/(2ε_i²)) against the ideal arctan(1/K).
      const delta = Math.atan((w * w) / (2 * idlerWidth * idlerWidth)) - Math.atan(1 / K);
      const mismatch = 1 + Math.sinh(2 * R) ** 2 * Math.sin(delta) ** 2;
      expect(Math.abs(delta), `${f} Hz: the single filter is close to ideal here`).toBeLessThan(0.02);
      expect(Math.abs(budget.total[k] / ((vacuum * mismatch) / Math.cosh(2 * R)) - 1), `${f} Hz`).toBeLessThan(1e-6);
    });
  });
});

describe("two-carrier entangled light: set-ups without an idler and bad input", () => {
  it("an interferometer without idlerDetuning keeps its two modes (optical and differential arm length); an idler adds one optical mode", () => {
    const plain = twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0 });
    const without = setup(
      [
        { name: "light", type: "vacuum" },
        { name: "ifo", type: "interferometer", params: { mass: `${MASS} kg`, armLength: `${L} m`, armBandwidth: `${F_ARM} Hz`, power: `${ARM_POWER} W` } },
        { name: "detector", type: "homodyne", params: { angle: "90 deg" } },
      ],
      [
        ["light.out", "ifo.in"],
        ["ifo.out", "detector.in"],
      ],
      { signal: { kind: "strain", on: "ifo" } },
    );
    expect(assemble(loadSetup(without)).model.modes.length).toBe(2);
    expect(assemble(loadSetup(plain)).model.modes.length).toBe(3);
  });

  it("refuses an idler carrier whose idlerIn is left unconnected, light at idlerIn without an idler, and idlerOut read without an idler", () => {
    const unconnected = twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0 });
    unconnected.connections = unconnected.connections.filter(([, to]) => to !== "ifo.idlerIn");
    unconnected.components.push({ name: "dump", type: "homodyne", params: { angle: "0 deg" } });
    unconnected.connections.push(["epr.out2", "dump.in"]);
    expect(() => prepare(loadSetup(unconnected))).toThrow(/idlerIn.*unconnected|unconnected.*idler/);

    const noIdler = twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0 });
    delete (noIdler.components[1].params as Record<string, unknown>).idlerDetuning;
    let error: unknown;
    try {
      prepare(loadSetup(noIdler));
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(QuietframeError);
    expect(String((error as Error).message)).toMatch(/idlerIn|idlerOut/);
  });

  it("refuses idlerSrDetuning without an idler or without a signal-recycling mirror", () => {
    const desc = twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0, extra: { idlerSrDetuning: "0 deg" } });
    expect(() => loadSetup(desc)).toThrow(/idlerSrDetuning[\s\S]*srmTransmission/);
  });
});

describe("two-carrier entangled light: the idler's recycling phase from the recycling cavity's length", () => {
  // φ_i = φ + Δω·ℓ/c (mod 2π), Δω = 2π(c/2L + Δ_i/2π): the extra one-way phase of a carrier Δω above
  // the signal's over the length ℓ (a plane wave's phase ω·ℓ/c, common practice, no source needed).
  const T = 0.19;
  const DELTA_HZ = 35;
  const signalPhase = (desc: SetupDescription): number => loadSetup(desc).components.find((c) => c.name === "ifo")!.values.srDetuning as number;

  let math: MathJs;
  beforeAll(async () => {
    math = await loadMathjs();
  });

  /** The same phase in 60-digit decimal arithmetic (mathjs BigNumber), reduced to [0, 2π). */
  function bigPhase(phi: number, armLength: number, deltaHz: number, ell: number): number {
    const m = math.create(math.all, { number: "BigNumber", precision: 60 });
    const big = (x: number) => m.bignumber(x.toPrecision(17));
    const c = m.bignumber(SPEED_OF_LIGHT);
    const twoPi = m.bignumber(-1).acos().times(2);
    const offset = twoPi.times(c.div(big(armLength).times(2)).plus(big(deltaHz)));
    return big(phi)
      .plus(offset.times(big(ell)).div(c))
      .mod(twoPi)
      .toNumber();
  }

  it.each([
    ["90 deg", 4000, 35, 56],
    ["80 deg", 4000, -20, 7000],
    ["0 deg", 10e3, 12.5, 240],
    ["170 deg", 3000, 0, 4321.5],
  ])("φ = %s, L = %f m, Δ_i = %f Hz, ℓ = %f m: the derived phase agrees with a 60-digit evaluation", (sr, armLength, deltaHz, ell) => {
    const phi = signalPhase(twoCarrier({ idlerDetuningHz: deltaHz, idlerAngle: 0, extra: { srmTransmission: T, srDetuning: sr } }));
    const derived = idlerRecyclingPhase(phi, armLength, deltaHz, ell);
    expect(derived).toBeGreaterThanOrEqual(0);
    expect(derived).toBeLessThan(2 * Math.PI);
    // A few rounding errors of the double evaluation (phases up to 2π: ulp 8.9e-16).
    expect(Math.abs(derived - bigPhase(phi, armLength, deltaHz, ell))).toBeLessThan(4e-15);
  });

  it("ℓ = L adds half a turn plus 2π·Δ_i·L/c: the offset is one free spectral range", () => {
    const phi = 0.25;
    const expected = phi + Math.PI + (2 * Math.PI * DELTA_HZ * L) / SPEED_OF_LIGHT;
    expect(Math.abs(idlerRecyclingPhase(phi, L, DELTA_HZ, L) - expected)).toBeLessThan(4e-15);
  });

  it("with ℓ chosen so that the derived phase equals a given idlerSrDetuning, the budget is bit-identical to giving idlerSrDetuning", () => {
    const extra = { srmTransmission: T, srDetuning: "90 deg" };
    const phi = signalPhase(twoCarrier({ idlerDetuningHz: DELTA_HZ, idlerAngle: 0, extra }));
    // Targets above φ = π/2 and below 2π need no wrap, so a length within a few ulps hits their exact bits.
    for (const target of [1.9, 2.6, 3.3]) {
      // ℓ from φ_i = φ + Δω·ℓ/c, then stepped by one ulp at a time until the double evaluation
      // gives the target's exact bits.
      const offset = 2 * Math.PI * (SPEED_OF_LIGHT / (2 * L) + DELTA_HZ);
      const ell = nudgeUntil((x) => idlerRecyclingPhase(phi, L, DELTA_HZ, x) === target, ((target - phi) * SPEED_OF_LIGHT) / offset);
      expect(ell, `no length gives exactly ${target} rad`).toBeDefined();
      const fromLength = evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: DELTA_HZ, idlerAngle: 0.6, signalAngle: 0, extra: { ...extra, srcLength: `${ell} m` } }))), FREQS).budget;
      const given = evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: DELTA_HZ, idlerAngle: 0.6, signalAngle: 0, extra: { ...extra, idlerSrDetuning: `${target} rad` } }))), FREQS).budget;
      expect(Array.from(fromLength.total)).toEqual(Array.from(given.total));
      expect(fromLength.terms.map((t) => [t.id, Array.from(t.psd)])).toEqual(given.terms.map((t) => [t.id, Array.from(t.psd)]));
    }
  });

  it("a recycling cavity of another length changes the idler's filter and so the conditional noise", () => {
    const at = (ell: number) =>
      evaluate(prepare(loadSetup(twoCarrier({ idlerDetuningHz: DELTA_HZ, idlerAngle: 0.6, signalAngle: 0, extra: { srmTransmission: T, srDetuning: "90 deg", srcLength: `${ell} m` } }))), FREQS).budget
        .total;
    const short = at(20);
    const long = at(400);
    expect(FREQS.some((_, k) => Math.abs(short[k] / long[k] - 1) > 1e-3)).toBe(true);
  });

  it("refuses srcLength beside idlerSrDetuning, naming both, and srcLength without a mirror or an idler", () => {
    const both = twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0, extra: { srmTransmission: T, idlerSrDetuning: "0 deg", srcLength: "56 m" } });
    let error: unknown;
    try {
      loadSetup(both);
    } catch (e) {
      error = e;
    }
    expect(error).toBeInstanceOf(QuietframeError);
    expect(String((error as Error).message)).toMatch(/srcLength[\s\S]*idlerSrDetuning/);
    expect(() => loadSetup(twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0, extra: { srcLength: "56 m" } }))).toThrow(/srcLength[\s\S]*srmTransmission/);
    const noIdler = twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0, extra: { srmTransmission: T, srcLength: "56 m" } });
    delete (noIdler.components[1].params as Record<string, unknown>).idlerDetuning;
    expect(() => loadSetup(noIdler)).toThrow(/srcLength[\s\S]*idlerDetuning/);
    expect(() => loadSetup(twoCarrier({ idlerDetuningHz: 10, idlerAngle: 0, extra: { srmTransmission: T, srcLength: "-5 m" } }))).toThrow(/srcLength/);
  });
});

/** The first x within 200 ulps of `start` (searching outwards) for which `ok` holds. */
function nudgeUntil(ok: (x: number) => boolean, start: number): number | undefined {
  const bits = new DataView(new ArrayBuffer(8));
  const step = (x: number, by: number): number => {
    bits.setFloat64(0, x);
    bits.setBigInt64(0, bits.getBigInt64(0) + BigInt(by));
    return bits.getFloat64(0);
  };
  for (let k = 0; k <= 200; k++) {
    for (const x of k === 0 ? [start] : [step(start, k), step(start, -k)]) if (ok(x)) return x;
  }
  return undefined;
}
