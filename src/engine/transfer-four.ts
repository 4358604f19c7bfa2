/**
 * The block solver's kernel for the commonest model, four states read by one output (a cavity
 * mode and one mechanical body): G = C_r M⁻¹ with M = −iΩ I − A at each frequency of a block,
 * every entry of M held in a local variable instead of an array, which makes it several times
 * faster than the loops over entries. Each step is the one of complexLuFactor and of
 * complexLuSolveTransposed with the pivots' reciprocals kept (the same pivot choice, exchanges,
 * reciprocals, updates and skipped zeros, in the same order) written out for n = 4, so every
 * frequency gets TransferEvaluator's bits; test/engine/transfer-block.test.ts holds it to them.
 */

/**
 * Fills G (stored transposed: state j at frequency f of the block at j·stride + f) for the
 * angular frequencies omegas[from … from + count − 1]. `negA` is −A (4×4, row-major), `cT` the
 * output's row of C. Returns the number of leading frequencies solved: the first at which a
 * pivot is zero or not finite (an undamped mode exactly there) stops it.
 */
export function solveFourStates(negA: Float64Array, cT: Float64Array, omegas: Float64Array, from: number, count: number, gRe: Float64Array, gIm: Float64Array, stride: number): number {
  // −A and C_r are read by index at each frequency: destructuring a typed array goes through its iterator, which costs more than the kernel.
  for (let f = 0; f < count; f++) {
    const omega = omegas[from + f];
    // M = −iΩ I − A
    let r00 = negA[0];
    let r01 = negA[1];
    let r02 = negA[2];
    let r03 = negA[3];
    let r10 = negA[4];
    let r11 = negA[5];
    let r12 = negA[6];
    let r13 = negA[7];
    let r20 = negA[8];
    let r21 = negA[9];
    let r22 = negA[10];
    let r23 = negA[11];
    let r30 = negA[12];
    let r31 = negA[13];
    let r32 = negA[14];
    let r33 = negA[15];
    let i00 = -omega;
    let i01 = 0;
    let i02 = 0;
    let i03 = 0;
    let i10 = 0;
    let i11 = -omega;
    let i12 = 0;
    let i13 = 0;
    let i20 = 0;
    let i21 = 0;
    let i22 = -omega;
    let i23 = 0;
    let i30 = 0;
    let i31 = 0;
    let i32 = 0;
    let i33 = -omega;
    // Step 0: the pivot (largest |re| + |im| in column 0, a NaN taken), the exchange, the reciprocal, the elimination.
    let best0 = Math.abs(r00) + Math.abs(i00);
    let p0 = 0;
    const m01 = Math.abs(r10) + Math.abs(i10);
    if (m01 > best0 || (m01 !== m01 && best0 === best0)) {
      best0 = m01;
      p0 = 1;
    }
    const m02 = Math.abs(r20) + Math.abs(i20);
    if (m02 > best0 || (m02 !== m02 && best0 === best0)) {
      best0 = m02;
      p0 = 2;
    }
    const m03 = Math.abs(r30) + Math.abs(i30);
    if (m03 > best0 || (m03 !== m03 && best0 === best0)) {
      best0 = m03;
      p0 = 3;
    }
    if (best0 === 0 || !Number.isFinite(best0)) return f;
    if (p0 === 1) {
      [r00, r10] = [r10, r00];
      [i00, i10] = [i10, i00];
      [r01, r11] = [r11, r01];
      [i01, i11] = [i11, i01];
      [r02, r12] = [r12, r02];
      [i02, i12] = [i12, i02];
      [r03, r13] = [r13, r03];
      [i03, i13] = [i13, i03];
    } else if (p0 === 2) {
      [r00, r20] = [r20, r00];
      [i00, i20] = [i20, i00];
      [r01, r21] = [r21, r01];
      [i01, i21] = [i21, i01];
      [r02, r22] = [r22, r02];
      [i02, i22] = [i22, i02];
      [r03, r23] = [r23, r03];
      [i03, i23] = [i23, i03];
    } else if (p0 === 3) {
      [r00, r30] = [r30, r00];
      [i00, i30] = [i30, i00];
      [r01, r31] = [r31, r01];
      [i01, i31] = [i31, i01];
      [r02, r32] = [r32, r02];
      [i02, i32] = [i32, i02];
      [r03, r33] = [r33, r03];
      [i03, i33] = [i33, i03];
    }
    const s0 = 1 / best0;
    const pr0 = r00 * s0;
    const pi0 = i00 * s0;
    const d0 = s0 / (pr0 * pr0 + pi0 * pi0);
    const ir0 = pr0 * d0;
    const ii0 = -pi0 * d0;
    if (r10 !== 0 || i10 !== 0) {
      const lr = r10 * ir0 - i10 * ii0;
      const li = r10 * ii0 + i10 * ir0;
      r10 = lr;
      i10 = li;
      r11 -= lr * r01 - li * i01;
      i11 -= lr * i01 + li * r01;
      r12 -= lr * r02 - li * i02;
      i12 -= lr * i02 + li * r02;
      r13 -= lr * r03 - li * i03;
      i13 -= lr * i03 + li * r03;
    }
    if (r20 !== 0 || i20 !== 0) {
      const lr = r20 * ir0 - i20 * ii0;
      const li = r20 * ii0 + i20 * ir0;
      r20 = lr;
      i20 = li;
      r21 -= lr * r01 - li * i01;
      i21 -= lr * i01 + li * r01;
      r22 -= lr * r02 - li * i02;
      i22 -= lr * i02 + li * r02;
      r23 -= lr * r03 - li * i03;
      i23 -= lr * i03 + li * r03;
    }
    if (r30 !== 0 || i30 !== 0) {
      const lr = r30 * ir0 - i30 * ii0;
      const li = r30 * ii0 + i30 * ir0;
      r30 = lr;
      i30 = li;
      r31 -= lr * r01 - li * i01;
      i31 -= lr * i01 + li * r01;
      r32 -= lr * r02 - li * i02;
      i32 -= lr * i02 + li * r02;
      r33 -= lr * r03 - li * i03;
      i33 -= lr * i03 + li * r03;
    }
    // Step 1: the pivot (largest |re| + |im| in column 1, a NaN taken), the exchange, the reciprocal, the elimination.
    let best1 = Math.abs(r11) + Math.abs(i11);
    let p1 = 1;
    const m12 = Math.abs(r21) + Math.abs(i21);
    if (m12 > best1 || (m12 !== m12 && best1 === best1)) {
      best1 = m12;
      p1 = 2;
    }
    const m13 = Math.abs(r31) + Math.abs(i31);
    if (m13 > best1 || (m13 !== m13 && best1 === best1)) {
      best1 = m13;
      p1 = 3;
    }
    if (best1 === 0 || !Number.isFinite(best1)) return f;
    if (p1 === 2) {
      [r10, r20] = [r20, r10];
      [i10, i20] = [i20, i10];
      [r11, r21] = [r21, r11];
      [i11, i21] = [i21, i11];
      [r12, r22] = [r22, r12];
      [i12, i22] = [i22, i12];
      [r13, r23] = [r23, r13];
      [i13, i23] = [i23, i13];
    } else if (p1 === 3) {
      [r10, r30] = [r30, r10];
      [i10, i30] = [i30, i10];
      [r11, r31] = [r31, r11];
      [i11, i31] = [i31, i11];
      [r12, r32] = [r32, r12];
      [i12, i32] = [i32, i12];
      [r13, r33] = [r33, r13];
      [i13, i33] = [i33, i13];
    }
    const s1 = 1 / best1;
    const pr1 = r11 * s1;
    const pi1 = i11 * s1;
    const d1 = s1 / (pr1 * pr1 + pi1 * pi1);
    const ir1 = pr1 * d1;
    const ii1 = -pi1 * d1;
    if (r21 !== 0 || i21 !== 0) {
      const lr = r21 * ir1 - i21 * ii1;
      const li = r21 * ii1 + i21 * ir1;
      r21 = lr;
      i21 = li;
      r22 -= lr * r12 - li * i12;
      i22 -= lr * i12 + li * r12;
      r23 -= lr * r13 - li * i13;
      i23 -= lr * i13 + li * r13;
    }
    if (r31 !== 0 || i31 !== 0) {
      const lr = r31 * ir1 - i31 * ii1;
      const li = r31 * ii1 + i31 * ir1;
      r31 = lr;
      i31 = li;
      r32 -= lr * r12 - li * i12;
      i32 -= lr * i12 + li * r12;
      r33 -= lr * r13 - li * i13;
      i33 -= lr * i13 + li * r13;
    }
    // Step 2: the pivot (largest |re| + |im| in column 2, a NaN taken), the exchange, the reciprocal, the elimination.
    let best2 = Math.abs(r22) + Math.abs(i22);
    let p2 = 2;
    const m23 = Math.abs(r32) + Math.abs(i32);
    if (m23 > best2 || (m23 !== m23 && best2 === best2)) {
      best2 = m23;
      p2 = 3;
    }
    if (best2 === 0 || !Number.isFinite(best2)) return f;
    if (p2 === 3) {
      [r20, r30] = [r30, r20];
      [i20, i30] = [i30, i20];
      [r21, r31] = [r31, r21];
      [i21, i31] = [i31, i21];
      [r22, r32] = [r32, r22];
      [i22, i32] = [i32, i22];
      [r23, r33] = [r33, r23];
      [i23, i33] = [i33, i23];
    }
    const s2 = 1 / best2;
    const pr2 = r22 * s2;
    const pi2 = i22 * s2;
    const d2 = s2 / (pr2 * pr2 + pi2 * pi2);
    const ir2 = pr2 * d2;
    const ii2 = -pi2 * d2;
    if (r32 !== 0 || i32 !== 0) {
      const lr = r32 * ir2 - i32 * ii2;
      const li = r32 * ii2 + i32 * ir2;
      r32 = lr;
      i32 = li;
      r33 -= lr * r23 - li * i23;
      i33 -= lr * i23 + li * r23;
    }
    // Step 3: the last pivot (nothing below it to choose from or eliminate) and its reciprocal.
    const best3 = Math.abs(r33) + Math.abs(i33);
    if (best3 === 0 || !Number.isFinite(best3)) return f;
    const s3 = 1 / best3;
    const pr3 = r33 * s3;
    const pi3 = i33 * s3;
    const d3 = s3 / (pr3 * pr3 + pi3 * pi3);
    const ir3 = pr3 * d3;
    const ii3 = -pi3 * d3;
    // Mᵀ gᵀ = c with the factors: entry j of g is x_j + i·y_j, starting from the output's row of C.
    // Uᵀ w = c: row i of U is column i of Uᵀ.
    let x0 = cT[0];
    let y0 = 0;
    let x1 = cT[1];
    let y1 = 0;
    let x2 = cT[2];
    let y2 = 0;
    let x3 = cT[3];
    let y3 = 0;
    const u0 = x0 * ir0 - y0 * ii0;
    y0 = x0 * ii0 + y0 * ir0;
    x0 = u0;
    if (r01 !== 0 || i01 !== 0) {
      const fr = -r01;
      const fi = -i01;
      x1 += fr * x0 - fi * y0;
      y1 += fr * y0 + fi * x0;
    }
    if (r02 !== 0 || i02 !== 0) {
      const fr = -r02;
      const fi = -i02;
      x2 += fr * x0 - fi * y0;
      y2 += fr * y0 + fi * x0;
    }
    if (r03 !== 0 || i03 !== 0) {
      const fr = -r03;
      const fi = -i03;
      x3 += fr * x0 - fi * y0;
      y3 += fr * y0 + fi * x0;
    }
    const u1 = x1 * ir1 - y1 * ii1;
    y1 = x1 * ii1 + y1 * ir1;
    x1 = u1;
    if (r12 !== 0 || i12 !== 0) {
      const fr = -r12;
      const fi = -i12;
      x2 += fr * x1 - fi * y1;
      y2 += fr * y1 + fi * x1;
    }
    if (r13 !== 0 || i13 !== 0) {
      const fr = -r13;
      const fi = -i13;
      x3 += fr * x1 - fi * y1;
      y3 += fr * y1 + fi * x1;
    }
    const u2 = x2 * ir2 - y2 * ii2;
    y2 = x2 * ii2 + y2 * ir2;
    x2 = u2;
    if (r23 !== 0 || i23 !== 0) {
      const fr = -r23;
      const fi = -i23;
      x3 += fr * x2 - fi * y2;
      y3 += fr * y2 + fi * x2;
    }
    const u3 = x3 * ir3 - y3 * ii3;
    y3 = x3 * ii3 + y3 * ir3;
    x3 = u3;
    // Lᵀ z = w: row i of L (left of the diagonal) is column i of Lᵀ above the diagonal.
    if (r30 !== 0 || i30 !== 0) {
      const fr = -r30;
      const fi = -i30;
      x0 += fr * x3 - fi * y3;
      y0 += fr * y3 + fi * x3;
    }
    if (r31 !== 0 || i31 !== 0) {
      const fr = -r31;
      const fi = -i31;
      x1 += fr * x3 - fi * y3;
      y1 += fr * y3 + fi * x3;
    }
    if (r32 !== 0 || i32 !== 0) {
      const fr = -r32;
      const fi = -i32;
      x2 += fr * x3 - fi * y3;
      y2 += fr * y3 + fi * x3;
    }
    if (r20 !== 0 || i20 !== 0) {
      const fr = -r20;
      const fi = -i20;
      x0 += fr * x2 - fi * y2;
      y0 += fr * y2 + fi * x2;
    }
    if (r21 !== 0 || i21 !== 0) {
      const fr = -r21;
      const fi = -i21;
      x1 += fr * x2 - fi * y2;
      y1 += fr * y2 + fi * x2;
    }
    if (r10 !== 0 || i10 !== 0) {
      const fr = -r10;
      const fi = -i10;
      x0 += fr * x1 - fi * y1;
      y0 += fr * y1 + fi * x1;
    }
    // x = Pᵀ z: the exchanges undone in reverse order.
    if (p2 === 3) {
      [x2, x3] = [x3, x2];
      [y2, y3] = [y3, y2];
    }
    if (p1 === 2) {
      [x1, x2] = [x2, x1];
      [y1, y2] = [y2, y1];
    } else if (p1 === 3) {
      [x1, x3] = [x3, x1];
      [y1, y3] = [y3, y1];
    }
    if (p0 === 1) {
      [x0, x1] = [x1, x0];
      [y0, y1] = [y1, y0];
    } else if (p0 === 2) {
      [x0, x2] = [x2, x0];
      [y0, y2] = [y2, y0];
    } else if (p0 === 3) {
      [x0, x3] = [x3, x0];
      [y0, y3] = [y3, y0];
    }
    gRe[f] = x0;
    gIm[f] = y0;
    gRe[stride + f] = x1;
    gIm[stride + f] = y1;
    gRe[2 * stride + f] = x2;
    gIm[2 * stride + f] = y2;
    gRe[3 * stride + f] = x3;
    gIm[3 * stride + f] = y3;
  }
  return count;
}
