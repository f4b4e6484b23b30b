/**
 * Dense kernels for the PCA stage: products with a register-tiled inner
 * loop, transposes and row orthonormalisation. All matrices are row-major
 * Float64Arrays with their shapes passed beside them. Internal to
 * src/preprocess; other stages should not depend on these signatures.
 */

/**
 * C = A · Bᵀ, with A of shape rA × len and B of shape rB × len, so that
 * C[i, j] = Σ_t A[i, t] · B[j, t] (rA × rB). Both operands are read along
 * contiguous rows; the body works on 4 × 4 tiles of C (16 accumulators) and
 * falls back to narrower loops on the edges.
 */
export function multiplyABt(
  a: Float64Array,
  rA: number,
  b: Float64Array,
  rB: number,
  len: number,
  out: Float64Array = new Float64Array(rA * rB),
): Float64Array {
  const rA4 = rA - (rA % 4);
  const rB4 = rB - (rB % 4);
  for (let i = 0; i < rA4; i += 4) {
    const a0 = i * len;
    const a1 = a0 + len;
    const a2 = a1 + len;
    const a3 = a2 + len;
    for (let j = 0; j < rB4; j += 4) {
      const b0 = j * len;
      const b1 = b0 + len;
      const b2 = b1 + len;
      const b3 = b2 + len;
      let c00 = 0, c01 = 0, c02 = 0, c03 = 0;
      let c10 = 0, c11 = 0, c12 = 0, c13 = 0;
      let c20 = 0, c21 = 0, c22 = 0, c23 = 0;
      let c30 = 0, c31 = 0, c32 = 0, c33 = 0;
      for (let t = 0; t < len; t++) {
        const x0 = a[a0 + t];
        const x1 = a[a1 + t];
        const x2 = a[a2 + t];
        const x3 = a[a3 + t];
        const y0 = b[b0 + t];
        const y1 = b[b1 + t];
        const y2 = b[b2 + t];
        const y3 = b[b3 + t];
        c00 += x0 * y0; c01 += x0 * y1; c02 += x0 * y2; c03 += x0 * y3;
        c10 += x1 * y0; c11 += x1 * y1; c12 += x1 * y2; c13 += x1 * y3;
        c20 += x2 * y0; c21 += x2 * y1; c22 += x2 * y2; c23 += x2 * y3;
        c30 += x3 * y0; c31 += x3 * y1; c32 += x3 * y2; c33 += x3 * y3;
      }
      let o = i * rB + j;
      out[o] = c00; out[o + 1] = c01; out[o + 2] = c02; out[o + 3] = c03;
      o += rB;
      out[o] = c10; out[o + 1] = c11; out[o + 2] = c12; out[o + 3] = c13;
      o += rB;
      out[o] = c20; out[o + 1] = c21; out[o + 2] = c22; out[o + 3] = c23;
      o += rB;
      out[o] = c30; out[o + 1] = c31; out[o + 2] = c32; out[o + 3] = c33;
    }
    // Right edge: the last rB % 4 columns of this band of four rows.
    for (let j = rB4; j < rB; j++) {
      const bj = j * len;
      let c0 = 0, c1 = 0, c2 = 0, c3 = 0;
      for (let t = 0; t < len; t++) {
        const y = b[bj + t];
        c0 += a[a0 + t] * y;
        c1 += a[a1 + t] * y;
        c2 += a[a2 + t] * y;
        c3 += a[a3 + t] * y;
      }
      out[i * rB + j] = c0;
      out[(i + 1) * rB + j] = c1;
      out[(i + 2) * rB + j] = c2;
      out[(i + 3) * rB + j] = c3;
    }
  }
  // Bottom edge: the last rA % 4 rows.
  for (let i = rA4; i < rA; i++) {
    const ai = i * len;
    for (let j = 0; j < rB; j++) {
      const bj = j * len;
      let c = 0;
      for (let t = 0; t < len; t++) c += a[ai + t] * b[bj + t];
      out[i * rB + j] = c;
    }
  }
  return out;
}

/** Transpose of a rows × cols row-major block (cols × rows), into `out` when given. */
export function transpose(
  a: Float64Array,
  rows: number,
  cols: number,
  out: Float64Array = new Float64Array(rows * cols),
): Float64Array {
  // Bands of 64 source columns: each source row segment is read once and the
  // 64 destination rows being written stay in cache.
  const band = 64;
  for (let j0 = 0; j0 < cols; j0 += band) {
    const j1 = Math.min(cols, j0 + band);
    for (let i = 0; i < rows; i++) {
      const src = i * cols;
      for (let j = j0; j < j1; j++) out[j * rows + i] = a[src + j];
    }
  }
  return out;
}

function dot(v: Float64Array, p: number, q: number, len: number): number {
  let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
  let t = 0;
  for (; t + 4 <= len; t += 4) {
    s0 += v[p + t] * v[q + t];
    s1 += v[p + t + 1] * v[q + t + 1];
    s2 += v[p + t + 2] * v[q + t + 2];
    s3 += v[p + t + 3] * v[q + t + 3];
  }
  for (; t < len; t++) s0 += v[p + t] * v[q + t];
  return s0 + s1 + (s2 + s3);
}

/**
 * Remove from row `j` its components along rows 0..j−1 (one modified
 * Gram–Schmidt sweep). Each pass subtracts the projection on row i and, in
 * the same loop, takes the dot product of the updated row with row i + 1 —
 * the coefficient modified Gram–Schmidt needs next — so row j is streamed
 * once per earlier row instead of twice.
 */
function sweep(v: Float64Array, j: number, len: number): void {
  if (j === 0) return;
  const q = j * len;
  const len4 = len - (len % 4);
  let r = dot(v, 0, q, len);
  for (let i = 0; i < j; i++) {
    const p = i * len;
    if (i + 1 === j) {
      for (let t = 0; t < len; t++) v[q + t] -= r * v[p + t];
      break;
    }
    const pn = p + len;
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0;
    let t = 0;
    for (; t < len4; t += 4) {
      const x0 = v[q + t] - r * v[p + t];
      const x1 = v[q + t + 1] - r * v[p + t + 1];
      const x2 = v[q + t + 2] - r * v[p + t + 2];
      const x3 = v[q + t + 3] - r * v[p + t + 3];
      v[q + t] = x0;
      v[q + t + 1] = x1;
      v[q + t + 2] = x2;
      v[q + t + 3] = x3;
      s0 += v[pn + t] * x0;
      s1 += v[pn + t + 1] * x1;
      s2 += v[pn + t + 2] * x2;
      s3 += v[pn + t + 3] * x3;
    }
    for (; t < len; t++) {
      const x = v[q + t] - r * v[p + t];
      v[q + t] = x;
      s0 += v[pn + t] * x;
    }
    r = s0 + s1 + (s2 + s3);
  }
}

/**
 * Orthonormalise the rows of a rows × len block in place (rows ≤ len), by
 * modified Gram–Schmidt applied twice, with a further sweep whenever a sweep
 * removes more than 1 − 1/√2 of the row's norm (the Daniel–Gragg–Kaufman–
 * Stewart criterion). A row that vanishes entirely (the block had lower rank)
 * is replaced by the first unit vector e_t, t = 0, 1, …, that survives
 * orthogonalisation, so the result is always an orthonormal set and stays
 * deterministic.
 */
export function orthonormalizeRowsInPlace(v: Float64Array, rows: number, len: number): void {
  if (rows > len) throw new RangeError(`cannot orthonormalise ${rows} rows of length ${len}`);
  let nextBasis = 0;
  for (let j = 0; j < rows; j++) {
    const q = j * len;
    let norm = Math.sqrt(dot(v, q, q, len));
    let ok = false;
    if (norm > 0) {
      for (let pass = 0; pass < 4; pass++) {
        sweep(v, j, len);
        const after = Math.sqrt(dot(v, q, q, len));
        const ratio = after / norm;
        norm = after;
        if (!(after > 0)) break;
        // The first two sweeps always run ("twice is enough"); more only after heavy cancellation.
        if (pass >= 1 && ratio > Math.SQRT1_2) {
          ok = true;
          break;
        }
      }
    }
    while (!ok) {
      // Replace a row that lies (numerically) in the span of the earlier ones.
      if (nextBasis >= len) throw new RangeError('no unit vector left to complete the basis');
      v.fill(0, q, q + len);
      v[q + nextBasis] = 1;
      nextBasis++;
      sweep(v, j, len);
      sweep(v, j, len);
      norm = Math.sqrt(dot(v, q, q, len));
      ok = norm > 0.5;
    }
    const inv = 1 / norm;
    for (let t = 0; t < len; t++) v[q + t] *= inv;
  }
}
