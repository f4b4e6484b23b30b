/**
 * Dense kernels for the PCA stage: products with a register-tiled inner
 * loop, transposes and row orthonormalisation. All matrices are row-major
 * Float64Arrays with their shapes passed beside them. Internal to
 * src/preprocess; other stages should not depend on these signatures.
 */

/**
 * C = A · Bᵀ, with A of shape rA × len and B of shape rB × len, so that
 * C[i, j] = Σ_t A[i, t] · B[j, t] (rA × rB), into `out` when given. See
 * `multiplyABtBlock` for the kernel.
 */
export function multiplyABt(
  a: Float64Array,
  rA: number,
  b: Float64Array,
  rB: number,
  len: number,
  out: Float64Array = new Float64Array(rA * rB),
): Float64Array {
  multiplyABtBlock(a, 0, rA, b, 0, rB, len, out, rB);
  return out;
}

/**
 * The block rows i0..i1−1 × columns j0..j1−1 of C = A · Bᵀ (A and B row-major
 * with rows of length `len`), written to out[i · ldc + j]; other entries of
 * `out` are left alone. Both operands are read along contiguous rows, in
 * 4 × 4 tiles of C (16 accumulators; 1 × 4, 4 × 1 and 1 × 1 on the edges).
 * The operand with fewer rows in the block is swept in the inner loop, so
 * that it stays in cache while the other is streamed from memory once.
 *
 * Every entry is one left-to-right sum over t of the rounded products
 * A[i, t] · B[j, t], whichever tile computes it, so an entry's bits do not
 * depend on the block it was computed in: splitting C into blocks (for
 * instance over threads) gives the same bytes as one call for all of C.
 */
export function multiplyABtBlock(
  a: Float64Array,
  i0: number,
  i1: number,
  b: Float64Array,
  j0: number,
  j1: number,
  len: number,
  out: Float64Array,
  ldc: number,
): void {
  const i4 = i1 - ((i1 - i0) % 4);
  const j4 = j1 - ((j1 - j0) % 4);
  if (i1 - i0 <= j1 - j0) {
    // A's block is the smaller: stream B once, four rows at a time.
    for (let j = j0; j < j4; j += 4) {
      for (let i = i0; i < i4; i += 4) tile44(a, i, b, j, len, out, ldc);
      for (let i = i4; i < i1; i++) tile14(a, i, b, j, len, out, ldc);
    }
    for (let j = j4; j < j1; j++) {
      for (let i = i0; i < i4; i += 4) tile41(a, i, b, j, len, out, ldc);
      for (let i = i4; i < i1; i++) out[i * ldc + j] = dotRows(a, i * len, b, j * len, len);
    }
  } else {
    for (let i = i0; i < i4; i += 4) {
      for (let j = j0; j < j4; j += 4) tile44(a, i, b, j, len, out, ldc);
      for (let j = j4; j < j1; j++) tile41(a, i, b, j, len, out, ldc);
    }
    for (let i = i4; i < i1; i++) {
      for (let j = j0; j < j4; j += 4) tile14(a, i, b, j, len, out, ldc);
      for (let j = j4; j < j1; j++) out[i * ldc + j] = dotRows(a, i * len, b, j * len, len);
    }
  }
}

/** C[i..i+3, j..j+3] of A·Bᵀ. */
function tile44(a: Float64Array, i: number, b: Float64Array, j: number, len: number, out: Float64Array, ldc: number): void {
  const a0 = i * len;
  const a1 = a0 + len;
  const a2 = a1 + len;
  const a3 = a2 + len;
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
  let o = i * ldc + j;
  out[o] = c00; out[o + 1] = c01; out[o + 2] = c02; out[o + 3] = c03;
  o += ldc;
  out[o] = c10; out[o + 1] = c11; out[o + 2] = c12; out[o + 3] = c13;
  o += ldc;
  out[o] = c20; out[o + 1] = c21; out[o + 2] = c22; out[o + 3] = c23;
  o += ldc;
  out[o] = c30; out[o + 1] = c31; out[o + 2] = c32; out[o + 3] = c33;
}

/** C[i, j..j+3] of A·Bᵀ. */
function tile14(a: Float64Array, i: number, b: Float64Array, j: number, len: number, out: Float64Array, ldc: number): void {
  const ai = i * len;
  const b0 = j * len;
  const b1 = b0 + len;
  const b2 = b1 + len;
  const b3 = b2 + len;
  let c0 = 0, c1 = 0, c2 = 0, c3 = 0;
  for (let t = 0; t < len; t++) {
    const x = a[ai + t];
    c0 += x * b[b0 + t];
    c1 += x * b[b1 + t];
    c2 += x * b[b2 + t];
    c3 += x * b[b3 + t];
  }
  const o = i * ldc + j;
  out[o] = c0;
  out[o + 1] = c1;
  out[o + 2] = c2;
  out[o + 3] = c3;
}

/** C[i..i+3, j] of A·Bᵀ. */
function tile41(a: Float64Array, i: number, b: Float64Array, j: number, len: number, out: Float64Array, ldc: number): void {
  const a0 = i * len;
  const a1 = a0 + len;
  const a2 = a1 + len;
  const a3 = a2 + len;
  const bj = j * len;
  let c0 = 0, c1 = 0, c2 = 0, c3 = 0;
  for (let t = 0; t < len; t++) {
    const y = b[bj + t];
    c0 += a[a0 + t] * y;
    c1 += a[a1 + t] * y;
    c2 += a[a2 + t] * y;
    c3 += a[a3 + t] * y;
  }
  out[i * ldc + j] = c0;
  out[(i + 1) * ldc + j] = c1;
  out[(i + 2) * ldc + j] = c2;
  out[(i + 3) * ldc + j] = c3;
}

/** Σ_t a[p + t]·b[q + t], left to right. */
function dotRows(a: Float64Array, p: number, b: Float64Array, q: number, len: number): number {
  let c = 0;
  for (let t = 0; t < len; t++) c += a[p + t] * b[q + t];
  return c;
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
 * Orthonormalise rows from..rows−1 of a rows × len block in place (rows ≤ len)
 * against each other and against rows 0..from−1, which must already be
 * orthonormal and are not changed (default from = 0: all rows), by
 * modified Gram–Schmidt applied twice, with a further sweep whenever a sweep
 * removes more than 1 − 1/√2 of the row's norm (the Daniel–Gragg–Kaufman–
 * Stewart criterion). A row that vanishes entirely (the block had lower rank)
 * is replaced by the first unit vector e_t, t = 0, 1, …, that survives
 * orthogonalisation, so the result is always an orthonormal set and stays
 * deterministic.
 */
export function orthonormalizeRowsInPlace(v: Float64Array, rows: number, len: number, from = 0): void {
  if (rows > len) throw new RangeError(`cannot orthonormalise ${rows} rows of length ${len}`);
  let nextBasis = 0;
  for (let j = from; j < rows; j++) {
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
