import { describe, expect, it } from "vitest";
import { HBAR, SPEED_OF_LIGHT } from "../../src/constants";
import { evaluateSetup, loadSetup } from "../../src/pipeline";
import { freeMassForceSql } from "../../src/reference/limits";
import { expectAllClose } from "../helpers/close";
import { probedBody, sumTerms } from "../helpers/setups";

/**
 * A free mass read by a QND probe has the input-output structure b2 = a2 − K a1 + signal of
 * a conventional interferometer (Kimble et al., PRD 65, 022002 (2001)), with
 * K = S_F^ba/(ħmΩ²). For frequency-independent squeezed input (r, angle θ) the
 * force-referred noise is there given as
 *   S = (S_SQL/2)(K + 1/K)[cosh 2r − cos 2(θ + Φ) sinh 2r],  Φ = arccot K,
 * and our squeezing angle (from the amplitude quadrature) coincides with their θ.
 */
const MASS = 0.01;
const POWER = 0.5;
const OMEGA_L = (2 * Math.PI * SPEED_OF_LIGHT) / 1064e-9;
const S_BA = (8 * HBAR * OMEGA_L * POWER) / SPEED_OF_LIGHT ** 2;

function squeezedRun(light: { squeezing?: string; r?: number; angle: string }) {
  const params: Record<string, string | number> = { angle: light.angle };
  if (light.squeezing) params.squeezing = light.squeezing;
  if (light.r !== undefined) params.r = light.r;
  const s = loadSetup(
    probedBody({
      body: { mass: `${MASS} kg` },
      probe: { power: `${POWER} W` },
      light: { name: "light", type: "squeezed", params },
      referTo: "force",
    }),
  );
  return evaluateSetup(s, { from: 1, to: 1e4, points: 120 }).budget;
}

function kimbleSqueezed(f: number, r: number, theta: number): number {
  const omega = 2 * Math.PI * f;
  const K = S_BA / (HBAR * MASS * omega ** 2);
  const phi = Math.atan(1 / K);
  return (freeMassForceSql(MASS, omega) / 2) * (K + 1 / K) * (Math.cosh(2 * r) - Math.cos(2 * (theta + phi)) * Math.sinh(2 * r));
}

describe("squeezed light into a free-mass QND readout", () => {
  it.each([
    [0.3, 0],
    [1.1, Math.PI / 2],
    [0.8, Math.PI / 3],
    [1.5, -0.4],
  ])("matches the squeezed-input closed form for r = %f, θ = %f rad", (r, theta) => {
    const b = squeezedRun({ r, angle: `${theta} rad` });
    expectAllClose(
      b.total,
      Array.from(b.frequencies, (f) => kimbleSqueezed(f, r, theta)),
      1e-9,
      "total",
    );
  });

  it("10 dB of phase squeezing divides shot noise by 10 and multiplies back-action by 10 (squeezing in dB: 10·log10 e^{2r})", () => {
    const plain = squeezedRun({ r: 0, angle: "90 deg" });
    const sq = squeezedRun({ squeezing: "-10 dB", angle: "90 deg" });
    // At 90° the quadratures are uncorrelated, so they stay separate budget terms.
    const shot = (b: typeof plain) => sumTerms(b.terms, "phase quadrature");
    const ba = (b: typeof plain) => sumTerms(b.terms, "amplitude quadrature");
    expectAllClose(
      shot(sq).map((v) => v * 10),
      shot(plain),
      1e-12,
      "shot noise",
    );
    expectAllClose(
      ba(sq).map((v) => v / 10),
      ba(plain),
      1e-12,
      "back-action",
    );
  });

  it("keeps correlated quadratures (a tilted squeezing angle) as one budget term", () => {
    const b = squeezedRun({ r: 0.5, angle: "30 deg" });
    expect(b.terms.map((t) => t.label)).toEqual(["light: squeezed light"]);
  });
});
