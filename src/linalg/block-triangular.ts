/**
 * Splits a square matrix into irreducible diagonal blocks: the strongly connected
 * components of the directed graph with an edge i → j whenever a[i][j] ≠ 0 (i ≠ j).
 * Ordering the components topologically makes P A Pᵀ block upper triangular, so the
 * eigenvalues of A are the union of the eigenvalues of these principal submatrices.
 *
 * Why it matters here: decoupled subsystems of very different scale (a 1e-8 s⁻¹ damping
 * next to a 1e8 s⁻¹ cavity) are then never mixed by an orthogonal transformation, so the
 * rounding error of the large block cannot swamp the eigenvalues of the small one.
 */
export function irreducibleBlocks(a: Float64Array, n: number): Int32Array[] {
  // Tarjan's algorithm (recursion depth ≤ n; n is small here).
  const index = new Int32Array(n).fill(-1);
  const low = new Int32Array(n);
  const onStack = new Uint8Array(n);
  const stack = new Int32Array(n);
  let sp = 0;
  let counter = 0;
  const blocks: Int32Array[] = [];

  const visit = (v: number): void => {
    index[v] = counter;
    low[v] = counter;
    counter++;
    stack[sp++] = v;
    onStack[v] = 1;
    const row = v * n;
    for (let w = 0; w < n; w++) {
      if (w === v || a[row + w] === 0) continue;
      if (index[w] < 0) {
        visit(w);
        if (low[w] < low[v]) low[v] = low[w];
      } else if (onStack[w] && index[w] < low[v]) {
        low[v] = index[w];
      }
    }
    if (low[v] === index[v]) {
      let count = 0;
      for (let t = sp - 1; t >= 0; t--) {
        count++;
        if (stack[t] === v) break;
      }
      const block = new Int32Array(count);
      for (let t = 0; t < count; t++) {
        const w = stack[--sp];
        onStack[w] = 0;
        block[count - 1 - t] = w;
      }
      block.sort();
      blocks.push(block);
    }
  };

  for (let v = 0; v < n; v++) if (index[v] < 0) visit(v);
  return blocks;
}

/** Copies the principal submatrix of `a` on the given rows/columns into a new array. */
export function principalSubmatrix(a: Float64Array, n: number, idx: Int32Array): Float64Array {
  const m = idx.length;
  const out = new Float64Array(m * m);
  for (let i = 0; i < m; i++) {
    const src = idx[i] * n;
    for (let j = 0; j < m; j++) out[i * m + j] = a[src + idx[j]];
  }
  return out;
}
