import { describe, expect, it } from "vitest";
import { irreducibleBlocks, principalSubmatrix } from "../../src/linalg/block-triangular";

describe("irreducibleBlocks", () => {
  it("finds strongly connected components of the nonzero pattern", () => {
    // 0 ↔ 3 form a cycle, 1 → 0 one way only, 2 isolated, 4 ↔ 1 a cycle.
    const n = 5;
    const a = new Float64Array(n * n);
    const edges: [number, number][] = [
      [0, 3],
      [3, 0],
      [1, 0],
      [4, 1],
      [1, 4],
    ];
    for (const [i, j] of edges) a[i * n + j] = 1;
    for (let i = 0; i < n; i++) a[i * n + i] = 7; // diagonal never couples
    const blocks = irreducibleBlocks(a, n).map((b) => Array.from(b));
    expect(blocks.sort((x, y) => x[0] - y[0])).toEqual([[0, 3], [1, 4], [2]]);
  });

  it("treats a fully coupled matrix as one block", () => {
    const a = Float64Array.from([1, 2, 3, 4]);
    expect(irreducibleBlocks(a, 2).map((b) => Array.from(b))).toEqual([[0, 1]]);
  });

  it("extracts principal submatrices", () => {
    const a = Float64Array.from([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(Array.from(principalSubmatrix(a, 3, Int32Array.from([0, 2])))).toEqual([1, 3, 7, 9]);
  });
});
