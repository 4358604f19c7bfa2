import { describe, expect, it } from "vitest";
import { cos, exp, expm1, hypot, log, log10, pow, sin, tanh } from "../../src/numeric/portable-math";

/**
 * The model computes with these functions everywhere (kernel, CLI, browser). Node 20's Math
 * is the reference here: agreeing with it bit for bit shows the functions are as accurate as
 * the platform's, while, unlike Math, they give the same bits in every engine.
 */

// Fixed-seed generator: every run checks the same arguments.
function generator(seed: number) {
  let s = seed >>> 0;
  const next = (): number => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
  const view = new DataView(new ArrayBuffer(8));
  const anyBits = (): number => {
    view.setUint32(0, (next() * 4294967296) >>> 0);
    view.setUint32(4, (next() * 4294967296) >>> 0);
    return view.getFloat64(0);
  };
  // Powers of ten written as literals, so the arguments themselves use no library function.
  const decades = Array.from({ length: 629 }, (_, i) => Number(`1e${i - 320}`));
  const anyScale = (): number => (next() - 0.5) * decades[Math.floor(next() * decades.length)];
  return { next, anyBits, anyScale, decades };
}

const N = 40_000;

function mismatches(f: (x: number) => number, g: (x: number) => number, args: () => number): [number, number, number][] {
  const bad: [number, number, number][] = [];
  for (let i = 0; i < N; i++) {
    const x = args();
    if (!Object.is(f(x), g(x))) bad.push([x, f(x), g(x)]);
  }
  return bad.slice(0, 5);
}

const SPECIAL = [0, -0, 1, -1, 2, -2, 0.5, -0.5, 3, 1 / 3, 10, 0.1, 1e-310, -1e-310, 1e308, -1e308, Infinity, -Infinity, NaN];

describe("portable math agrees bit for bit with this engine's Math", () => {
  const r = generator(20240601);
  it.each([
    ["exp", exp, Math.exp, () => (r.next() < 0.1 ? r.anyScale() : (r.next() - 0.5) * 1500)],
    ["expm1", expm1, Math.expm1, () => (r.next() < 0.3 ? r.anyScale() : (r.next() - 0.5) * 100)],
    ["log", log, Math.log, () => (r.next() < 0.2 ? Math.abs(r.anyBits()) : r.next() < 0.2 ? 1 + (r.next() - 0.5) * 1e-5 : Math.abs(r.anyScale()))],
    ["log10", log10, Math.log10, () => (r.next() < 0.2 ? Math.abs(r.anyBits()) : Math.abs(r.anyScale()))],
    ["sin", sin, Math.sin, () => (r.next() < 0.2 ? Math.round(r.next() * 40) * (Math.PI / 2) + (r.next() - 0.5) * 1e-9 : (r.next() - 0.5) * r.decades[300 + Math.floor(r.next() * 26)])],
    ["cos", cos, Math.cos, () => (r.next() < 0.2 ? Math.round(r.next() * 40) * (Math.PI / 2) + (r.next() - 0.5) * 1e-9 : (r.next() - 0.5) * r.decades[300 + Math.floor(r.next() * 26)])],
    ["tanh", tanh, Math.tanh, () => (r.next() < 0.2 ? r.anyScale() : (r.next() - 0.5) * 50)],
  ] as const)("%s", (_name, portable, native, args) => {
    expect(mismatches(portable, native, args)).toEqual([]);
    for (const x of SPECIAL) expect(Object.is(portable(x), native(x)), `${_name}(${x})`).toBe(true);
  });

  it("pow, including integer, negative and huge exponents and every special pair", () => {
    const bad: number[][] = [];
    for (let i = 0; i < N; i++) {
      const x = r.next() < 0.1 ? -r.next() * 10 : r.next() < 0.05 ? r.anyBits() : r.next() * r.decades[300 + Math.floor(r.next() * 40)];
      const y = r.next() < 0.3 ? Math.round((r.next() - 0.5) * 20) : r.next() < 0.1 ? r.anyBits() : (r.next() - 0.5) * 40;
      if (!Object.is(pow(x, y), x ** y)) bad.push([x, y, pow(x, y), x ** y]);
    }
    expect(bad.slice(0, 5)).toEqual([]);
    for (const x of SPECIAL) for (const y of SPECIAL) expect(Object.is(pow(x, y), x ** y), `${x} ** ${y}`).toBe(true);
  });

  it("hypot", () => {
    for (let i = 0; i < N; i++) {
      const a = r.anyScale();
      const b = r.next() < 0.5 ? r.anyScale() : a * r.next();
      expect(Object.is(hypot(a, b), Math.hypot(a, b))).toBe(true);
    }
    expect(hypot()).toBe(0);
    expect(hypot(NaN, Infinity)).toBe(Infinity);
    expect(hypot(3, NaN)).toBeNaN();
  });
});
