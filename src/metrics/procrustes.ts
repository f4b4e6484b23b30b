/**
 * Procrustes superimposition of two configurations of the same points
 * (Gower 1975; Schönemann 1966 for the orthogonal step), following the
 * conventions of `scipy.spatial.procrustes` (scipy 1.10.1).
 */
import { SingularValueDecomposition, Matrix as MlMatrix } from 'ml-matrix';
import type { Matrix } from '../core/types.js';

/** Result of `procrustes`. All matrices are n × d, row-major. */
export interface ProcrustesResult {
  /**
   * Sum of squared differences between `standardizedA` and `aligned`, in
   * [0, 1]: 0 for configurations equal up to translation, rotation,
   * reflection and uniform scale.
   */
  readonly disparity: number;
  /** B centred, scaled to unit Frobenius norm, then mapped onto `standardizedA`: B̃ · rotation · scale. */
  readonly aligned: Matrix;
  /** A centred (column means removed) and divided by its Frobenius norm. */
  readonly standardizedA: Matrix;
  /**
   * d × d orthogonal matrix (row-major) applied on the right of the
   * standardised B. It is the transpose of the R that scipy's
   * `orthogonal_procrustes(Ã, B̃)` returns. Reflections are allowed.
   */
  readonly rotation: Float64Array;
  /** Uniform scale applied after the rotation: the sum of the singular values of ÃᵀB̃. */
  readonly scale: number;
}

/**
 * Standardised Procrustes analysis of two n × d configurations, as
 * `scipy.spatial.procrustes(A, B)` (scipy 1.10.1): both are centred and
 * scaled to unit Frobenius norm, then B is rotated/reflected by the
 * orthogonal matrix from the SVD of ÃᵀB̃ and scaled to best match A.
 * Two dimensions use a closed-form 2 × 2 polar decomposition.
 *
 * @param A n × d reference configuration.
 * @param B n × d configuration to fit onto A (same row order).
 * @throws RangeError when the shapes differ, n < 2, a value is not finite,
 *   or all points of a configuration coincide.
 */
export function procrustes(A: Matrix, B: Matrix): ProcrustesResult {
  checkPair(A, B);
  const a = standardize(A, 'first');
  const b = standardize(B, 'second');
  const { rotation, scale } = orthogonalFit(a.data, b.data, A.n, A.d);
  const aligned = applyFit(b.data, A.n, A.d, rotation, scale);
  let disparity = 0;
  for (let t = 0; t < aligned.length; t++) {
    const diff = a.data[t] - aligned[t];
    disparity += diff * diff;
  }
  return {
    disparity,
    aligned: { n: A.n, d: A.d, data: aligned },
    standardizedA: { n: A.n, d: A.d, data: a.data },
    rotation,
    scale,
  };
}

/**
 * `moving` translated, rotated/reflected and uniformly scaled onto
 * `reference`, expressed in the reference's own coordinates (the Procrustes
 * fit of `procrustes(reference, moving)` with the reference's
 * standardisation undone). Useful to overlay the maps of two seeds.
 *
 * @param reference n × d configuration that stays where it is.
 * @param moving n × d configuration to bring onto it.
 * @returns a new n × d matrix; the inputs are not modified.
 */
export function alignTo(reference: Matrix, moving: Matrix): Matrix {
  checkPair(reference, moving);
  const a = standardize(reference, 'reference');
  const b = standardize(moving, 'moving');
  const { n, d } = reference;
  const { rotation, scale } = orthogonalFit(a.data, b.data, n, d);
  const out = applyFit(b.data, n, d, rotation, scale);
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < d; c++) out[i * d + c] = out[i * d + c] * a.norm + a.mean[c];
  }
  return { n, d, data: out };
}

// ---------------------------------------------------------------------------

function checkPair(A: Matrix, B: Matrix): void {
  if (A.n !== B.n || A.d !== B.d) {
    throw new RangeError(`the two configurations must have the same shape; received ${A.n} × ${A.d} and ${B.n} × ${B.d}`);
  }
  if (A.n < 2) throw new RangeError(`at least 2 points are needed; received ${A.n}`);
  if (A.d < 1) throw new RangeError('the configurations have no columns');
}

interface Standardized {
  data: Float64Array;
  mean: Float64Array;
  norm: number;
}

function standardize(m: Matrix, which: string): Standardized {
  const { n, d, data } = m;
  const mean = new Float64Array(d);
  for (let t = 0; t < n * d; t++) {
    const v = data[t];
    if (!Number.isFinite(v)) {
      throw new RangeError(`the ${which} configuration has a non-finite value (${v}) at row ${Math.floor(t / d)}`);
    }
    mean[t % d] += v;
  }
  for (let c = 0; c < d; c++) mean[c] /= n;
  const out = new Float64Array(n * d);
  let ss = 0;
  for (let i = 0; i < n; i++) {
    for (let c = 0; c < d; c++) {
      const v = data[i * d + c] - mean[c];
      out[i * d + c] = v;
      ss += v * v;
    }
  }
  const norm = Math.sqrt(ss);
  if (norm === 0) throw new RangeError(`all points of the ${which} configuration are identical; at least 2 distinct points are needed`);
  for (let t = 0; t < n * d; t++) out[t] /= norm;
  return { data: out, mean, norm };
}

/**
 * Orthogonal Q (d × d) and scale s maximising trace(Ãᵀ B̃ Q): with
 * ÃᵀB̃ = U Σ Vᵀ, Q = V Uᵀ and s = Σσ.
 */
function orthogonalFit(a: Float64Array, b: Float64Array, n: number, d: number): { rotation: Float64Array; scale: number } {
  // M = ÃᵀB̃ (d × d)
  const M = new Float64Array(d * d);
  for (let i = 0; i < n; i++) {
    const o = i * d;
    for (let p = 0; p < d; p++) {
      const ap = a[o + p];
      for (let q = 0; q < d; q++) M[p * d + q] += ap * b[o + q];
    }
  }
  if (d === 1) {
    return { rotation: Float64Array.of(M[0] < 0 ? -1 : 1), scale: Math.abs(M[0]) };
  }
  if (d === 2) return polar2(M);
  const svd = new SingularValueDecomposition(new MlMatrix([...chunks(M, d)]), {
    computeLeftSingularVectors: true,
    computeRightSingularVectors: true,
  });
  const U = svd.leftSingularVectors;
  const V = svd.rightSingularVectors;
  const rotation = new Float64Array(d * d);
  for (let p = 0; p < d; p++) {
    for (let q = 0; q < d; q++) {
      let s = 0;
      for (let t = 0; t < d; t++) s += V.get(p, t) * U.get(q, t);
      rotation[p * d + q] = s;
    }
  }
  let scale = 0;
  for (const s of svd.diagonal) scale += s;
  return { rotation, scale };
}

/**
 * Closed-form orthogonal polar factor of a 2 × 2 matrix, transposed.
 * M = [[m00, m01], [m10, m11]] splits into a rotation-scaling part with
 * (e, h) = ((m00 + m11)/2, (m10 − m01)/2) and a reflection-scaling part with
 * (f, g) = ((m00 − m11)/2, (m10 + m01)/2). With r = |(e, h)| and s = |(f, g)|
 * the singular values are r + s and |r − s|; the polar factor is the rotation
 * (e, h)/r when r ≥ s (det M ≥ 0) and the reflection (f, g)/s otherwise, and
 * the nuclear norm is 2·max(r, s).
 */
function polar2(M: Float64Array): { rotation: Float64Array; scale: number } {
  const e = (M[0] + M[3]) / 2;
  const f = (M[0] - M[3]) / 2;
  const g = (M[2] + M[1]) / 2;
  const h = (M[2] - M[1]) / 2;
  const r = Math.hypot(e, h);
  const s = Math.hypot(f, g);
  if (r === 0 && s === 0) return { rotation: Float64Array.of(1, 0, 0, 1), scale: 0 };
  if (r >= s) {
    const c = e / r;
    const sn = h / r;
    // polar factor [[c, −sn], [sn, c]]; we return its transpose
    return { rotation: Float64Array.of(c, sn, -sn, c), scale: 2 * r };
  }
  const c = f / s;
  const sn = g / s;
  // polar factor [[c, sn], [sn, −c]] is symmetric
  return { rotation: Float64Array.of(c, sn, sn, -c), scale: 2 * s };
}

function applyFit(b: Float64Array, n: number, d: number, rotation: Float64Array, scale: number): Float64Array {
  const out = new Float64Array(n * d);
  for (let i = 0; i < n; i++) {
    const o = i * d;
    for (let q = 0; q < d; q++) {
      let s = 0;
      for (let p = 0; p < d; p++) s += b[o + p] * rotation[p * d + q];
      out[o + q] = s * scale;
    }
  }
  return out;
}

function* chunks(M: Float64Array, d: number): Generator<number[]> {
  for (let p = 0; p < d; p++) yield Array.from(M.subarray(p * d, (p + 1) * d));
}
