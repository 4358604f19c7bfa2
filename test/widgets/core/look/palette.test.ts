import { describe, expect, test } from "vitest";
import { CURVE_ROLES, hexChannels, OKABE_ITO, ROLE_COLOURS, SHADES, shadeOf } from "../../../../widgets/core/look/palette";

/**
 * sRGB → CIELAB (D65). Source: IEC 61966-2-1 (sRGB transfer function and primaries matrix)
 * and CIE 15:2004 (L*a*b* from XYZ, white point Xn = 0.95047, Yn = 1, Zn = 1.08883).
 */
function linear(channel: number): number {
  const c = channel / 255;
  return c <= 0.04045 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4;
}

function lab([r, g, b]: readonly number[]): [number, number, number] {
  const X = 0.4124 * r + 0.3576 * g + 0.1805 * b;
  const Y = 0.2126 * r + 0.7152 * g + 0.0722 * b;
  const Z = 0.0193 * r + 0.1192 * g + 0.9505 * b;
  const f = (t: number): number => (t > 216 / 24389 ? Math.cbrt(t) : ((24389 / 27) * t + 16) / 116);
  const fx = f(X / 0.95047);
  const fy = f(Y);
  const fz = f(Z / 1.08883);
  return [116 * fy - 16, 500 * (fx - fy), 200 * (fy - fz)];
}

/** CIE 1976 colour difference ΔE*ab. */
function deltaE(a: readonly number[], b: readonly number[]): number {
  const A = lab(a);
  const B = lab(b);
  return Math.hypot(A[0] - B[0], A[1] - B[1], A[2] - B[2]);
}

/**
 * Full-severity dichromacy in linear RGB: Machado, Oliveira & Fernandes, IEEE TVCG 15 (2009)
 * 1291, Table of severity 1.0 (from memory of the published matrices).
 */
const DICHROMACY: Record<string, number[][]> = {
  protanopia: [
    [0.152286, 1.052583, -0.204868],
    [0.114503, 0.786281, 0.099216],
    [-0.003882, -0.048116, 1.051998],
  ],
  deuteranopia: [
    [0.367322, 0.860646, -0.227968],
    [0.280085, 0.672501, 0.047413],
    [-0.01182, 0.04294, 0.968881],
  ],
  tritanopia: [
    [1.255528, -0.076749, -0.178779],
    [-0.078411, 0.930809, 0.147602],
    [0.004733, 0.691367, 0.3039],
  ],
};

function seen(hex: string, vision: string): number[] {
  const rgb = hexChannels(hex).map(linear);
  const m = DICHROMACY[vision];
  if (!m) return rgb;
  return m.map((row) => Math.min(1, Math.max(0, row[0] * rgb[0] + row[1] * rgb[1] + row[2] * rgb[2])));
}

function closestPair(colours: Record<string, string>, vision: string): { pair: string; distance: number } {
  const names = Object.keys(colours);
  let best = { pair: "", distance: Infinity };
  for (let i = 0; i < names.length; i++) {
    for (let j = i + 1; j < names.length; j++) {
      const d = deltaE(seen(colours[names[i]], vision), seen(colours[names[j]], vision));
      if (d < best.distance) best = { pair: `${names[i]} / ${names[j]}`, distance: d };
    }
  }
  return best;
}

describe("the role palette", () => {
  test("the hues are the Okabe–Ito set's (Okabe & Ito 2008, Color Universal Design): values as published", () => {
    expect(OKABE_ITO).toEqual({ orange: "#E69F00", skyBlue: "#56B4E9", bluishGreen: "#009E73", blue: "#0072B2", vermillion: "#D55E00", reddishPurple: "#CC79A7" });
  });

  test("every role has its own colour", () => {
    expect(Object.keys(ROLE_COLOURS).sort()).toEqual([...CURVE_ROLES].sort());
    expect(new Set(Object.values(ROLE_COLOURS)).size).toBe(CURVE_ROLES.length);
  });

  // Thresholds: ΔE*ab ≈ 2.3 is a just-noticeable difference (Sharma, Digital Color Imaging
  // Handbook, 2003); 20 keeps two thin lines apart at a glance (common practice, no source).
  test("no two role colours are near-identical: CIELAB ΔE*ab ≥ 20 with normal vision", () => {
    const { pair, distance } = closestPair(ROLE_COLOURS, "normal");
    expect(distance, pair).toBeGreaterThanOrEqual(20);
  });

  test.each(Object.keys(DICHROMACY))("no two role colours merge under simulated %s: ΔE*ab ≥ 15", (vision) => {
    const { pair, distance } = closestPair(ROLE_COLOURS, vision);
    expect(distance, pair).toBeGreaterThanOrEqual(15);
  });

  test("the shades of a family differ visibly from its base (ΔE*ab ≥ 10) and from each other", () => {
    for (const base of Object.values(OKABE_ITO)) {
      const shades = Array.from({ length: SHADES }, (_, k) => shadeOf(base, k));
      expect(shades[0]).toBe(base);
      for (let i = 0; i < SHADES; i++) {
        for (let j = i + 1; j < SHADES; j++) expect(deltaE(seen(shades[i], "normal"), seen(shades[j], "normal")), `${shades[i]} / ${shades[j]}`).toBeGreaterThanOrEqual(10);
      }
    }
  });

  test("a tint mixes 40 % white, the shades 30 % and 50 % black (hand-computed for #0072B2)", () => {
    // 0x00 + 0.4 (255 − 0x00) = 102 = 0x66; 0x72 = 114 → 114 + 56.4 = 170.4 → 0xAA; 0xB2 = 178 → 208.8 → 0xD1.
    expect(shadeOf("#0072B2", 1)).toBe("#66AAD1");
    // 0.7 × (0, 114, 178) = (0, 79.8, 124.6) → (0x00, 0x50, 0x7D).
    expect(shadeOf("#0072B2", 2)).toBe("#00507D");
    // 0.5 × (0, 114, 178) = (0, 57, 89) → (0x00, 0x39, 0x59).
    expect(shadeOf("#0072B2", 3)).toBe("#003959");
  });
});
