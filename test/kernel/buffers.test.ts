import { describe, expect, it } from "vitest";
import { checkBufferPaths, putBuffers, removeBuffers } from "../../widgets/core/comm/buffers";

// messages.md (@jupyter-widgets/schema), "Instantiating a widget object": buffer_paths
// [['x'], ['y', 'z', 0]] put the first buffer at state['x'] and the second at
// state['y']['z'][0]; a list item becomes null, a dictionary key is left out.

describe("removeBuffers", () => {
  it("splits the spec's example into state, paths and buffers", () => {
    const x = new Float64Array([1, 2]);
    const y0 = new Uint8Array([7]);
    const split = removeBuffers({ x, y: { z: [y0, 5] }, keep: "text" });
    expect(split.buffer_paths).toEqual([["x"], ["y", "z", 0]]);
    expect(split.state).toEqual({ y: { z: [null, 5] }, keep: "text" });
    expect(split.buffers[0].byteLength).toBe(16);
    expect([...split.buffers[1]]).toEqual([7]);
  });

  it("leaves the input state unchanged and shares the bytes without copying", () => {
    const x = new Float64Array([1.5]);
    const state = { x };
    const split = removeBuffers(state);
    expect(state.x).toBe(x);
    expect(split.buffers[0].buffer).toBe(x.buffer);
  });

  it("keeps the exact bytes of a typed array that is a view into a larger buffer", () => {
    const whole = new Float64Array([1, 2, 3, 4]);
    const view = whole.subarray(1, 3);
    const bytes = removeBuffers({ v: view }).buffers[0];
    expect([...new Float64Array(bytes.slice().buffer)]).toEqual([2, 3]);
  });
});

describe("putBuffers", () => {
  it("puts buffers back at the spec's example paths", () => {
    const state: Record<string, unknown> = { y: { z: [null, 5] } };
    const a = new Uint8Array([1]);
    const b = new Uint8Array([2]);
    putBuffers(state, [["x"], ["y", "z", 0]], [a, b]);
    expect(state).toEqual({ x: a, y: { z: [b, 5] } });
  });

  it("round-trips with removeBuffers", () => {
    const original = { curve: new Uint8Array([3, 4]), nested: { list: [1, new Uint8Array([5])] } };
    const split = removeBuffers(original);
    putBuffers(split.state, split.buffer_paths, split.buffers);
    expect(split.state).toEqual(original);
  });

  it("refuses a path that does not lead into the state", () => {
    expect(() => putBuffers({}, [["a", "b"]], [new Uint8Array(1)])).toThrow("does not lead into the state");
  });
});

describe("checkBufferPaths", () => {
  it("accepts matching paths and no paths without buffers", () => {
    expect(checkBufferPaths([["x"], ["y", 0]], 2)).toBeUndefined();
    expect(checkBufferPaths(undefined, 0)).toBeUndefined();
  });

  it("names what is wrong with a front-end's paths", () => {
    expect(checkBufferPaths(undefined, 1)).toBe("1 buffers came without buffer_paths");
    expect(checkBufferPaths("x", 0)).toBe("buffer_paths must be a list of paths");
    expect(checkBufferPaths([["x"]], 0)).toBe("buffer_paths names 1 buffers but 0 arrived");
    expect(checkBufferPaths([[]], 1)).toMatch("non-empty list of keys and indices");
    expect(checkBufferPaths([["x", -1]], 1)).toMatch("non-empty list of keys and indices");
  });

  it("refuses paths through __proto__, constructor or prototype, naming the path (the keys the state-file readers refuse)", () => {
    expect(checkBufferPaths([["x"], ["__proto__", "value"]], 2)).toBe('buffer_paths[1] goes through "__proto__", a name reserved by JavaScript objects; allowed: keys of the model\'s state');
    expect(checkBufferPaths([["constructor", "prototype", "value"]], 1)).toMatch('buffer_paths[0] goes through "constructor"');
    expect(checkBufferPaths([["a", "prototype"]], 1)).toMatch('goes through "prototype"');
  });
});

describe("putBuffers never writes onto a prototype", () => {
  it("does not follow inherited keys, and defines the last key on the object itself", () => {
    const state: Record<string, unknown> = {};
    expect(() => putBuffers(state, [["__proto__", "value"]], [new Uint8Array(1)])).toThrow("does not lead into the state");
    expect(() => putBuffers(state, [["constructor", "prototype", "value"]], [new Uint8Array(1)])).toThrow("does not lead into the state");
    expect(() => putBuffers(state, [["__proto__"]], [new Uint8Array(1)])).toThrow("reserved");
    expect(({} as Record<string, unknown>).value).toBeUndefined();
    expect(Object.getPrototypeOf(state)).toBe(Object.prototype);
  });
});
