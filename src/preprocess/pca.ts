/**
 * Principal component analysis by randomized truncated SVD (Halko,
 * Martinsson & Tropp, "Finding structure with randomness", SIAM Review
 * 53:217–288, 2011), with an exact path for small inputs.
 */
import { Matrix as MlMatrix, SingularValueDecomposition } from 'ml-matrix';

import type { Rng } from '../core/rng.js';
import type { Embedding, Matrix } from '../core/types.js';
import { multiplyABt, orthonormalizeRowsInPlace, transpose } from './dense.js';
import { centerColumns } from './scale.js';

/** Result of a PCA of an n × d matrix with k components. */
export interface PcaResult {
  /** n × k: the centred data projected on the components (= U·S of the thin SVD). */
  scores: Matrix;
  /** k × d: principal axes (right singular vectors) as orthonormal rows, sign-fixed. */
  components: Matrix;
  /** The k largest singular values of the centred data, descending. */
  singularValues: Float64Array;
  /** s² / (n − 1): variance along each component (sample variance, ddof 1). */
  explainedVariance: Float64Array;
  /** s² / ‖X_c‖²_F: share of the total variance along each component, exact even when truncated. */
  explainedVarianceRatio: Float64Array;
  /** The d column means subtracted before the decomposition. */
  mean: Float64Array;
}

export interface PcaOptions {
  /** Extra random directions beyond k (ℓ = k + oversample, capped at min(n, d)). Default 10. */
  oversample?: number;
  /**
   * Power (subspace) iterations q. Default as scikit-learn 1.2's
   * `randomized_svd(n_iter='auto')`: 7 when k < 0.1·min(n, d), otherwise 4.
   */
  powerIterations?: number;
  /**
   * 'auto' (default) takes the exact path when k ≥ min(n, d) or n·d ≤ 250 000,
   * the randomized one otherwise; 'exact' and 'randomized' force a path.
   */
  solver?: 'auto' | 'exact' | 'randomized';
}

/** Inputs with at most this many entries are decomposed exactly under `solver: 'auto'`. */
export const EXACT_PCA_MAX_ENTRIES = 250_000;

/**
 * PCA of the rows of `m` (n × d) keeping k components, 1 ≤ k ≤ min(n, d), n ≥ 2.
 *
 * Randomized path (subspace iteration, Halko et al. 2011, Algorithm 4.4):
 * with ℓ = min(k + oversample, min(n, d)), draw a d × ℓ Gaussian Ω from `rng`,
 * Q = orth(X_c·Ω); repeat q times Q = orth(X_c · orth(X_cᵀ·Q)); then the small
 * B = QᵀX_c (ℓ × d) is decomposed exactly (its rows orthonormalised, B = L·P,
 * then an ml-matrix SVD of the ℓ × ℓ factor L) and its top k right singular
 * vectors are the components. Orthonormalisation is modified Gram–Schmidt
 * applied twice. Products use register-tiled loops over a centred copy of the
 * data and its transpose (2·n·d doubles of working memory).
 *
 * Exact path: thin SVD of the centred matrix (ml-matrix 6.15).
 *
 * Sign rule (both paths, so results are deterministic): each component is
 * flipped so that its entry of largest absolute value is positive; among
 * equal absolute values the lowest index decides. Scores are X_c·componentsᵀ.
 *
 * Throws RangeError for k out of range, n < 2, bad options, non-finite input
 * or data with no variance at all.
 */
export function randomizedPca(m: Matrix, k: number, rng: Rng, opts: PcaOptions = {}): PcaResult {
  const { n, d } = m;
  const r = Math.min(n, d);
  if (n < 2) throw new RangeError(`PCA needs at least 2 rows, got ${n}`);
  if (!Number.isInteger(k) || k < 1 || k > r) {
    throw new RangeError(`k must be an integer in 1..min(n, d) = 1..${r}, got ${k}`);
  }
  const oversample = opts.oversample ?? 10;
  if (!Number.isInteger(oversample) || oversample < 0) {
    throw new RangeError(`oversample must be a non-negative integer, got ${oversample}`);
  }
  const q = opts.powerIterations ?? (k < 0.1 * r ? 7 : 4);
  if (!Number.isInteger(q) || q < 0) {
    throw new RangeError(`powerIterations must be a non-negative integer, got ${q}`);
  }
  const solver = opts.solver ?? 'auto';
  if (solver !== 'auto' && solver !== 'exact' && solver !== 'randomized') {
    throw new RangeError(`solver must be 'auto', 'exact' or 'randomized', got ${String(solver)}`);
  }

  const { centered, mean } = centerColumns(m);
  const xc = centered.data;
  const frob2 = sumOfSquares(xc);
  if (!Number.isFinite(frob2)) throw new RangeError('PCA input contains non-finite values');
  if (frob2 === 0) throw new RangeError('PCA input has no variance: all rows are identical');

  const exact = solver === 'exact' || (solver === 'auto' && (k >= r || n * d <= EXACT_PCA_MAX_ENTRIES));
  const { vRows, s } = exact ? exactRightVectors(xc, n, d, k) : randomizedRightVectors(xc, n, d, k, oversample, q, rng);

  fixSigns(vRows, k, d);
  const scores = multiplyABt(xc, n, vRows, k, d);
  const explainedVariance = new Float64Array(k);
  const explainedVarianceRatio = new Float64Array(k);
  for (let c = 0; c < k; c++) {
    const s2 = s[c] * s[c];
    explainedVariance[c] = s2 / (n - 1);
    explainedVarianceRatio[c] = s2 / frob2;
  }
  return {
    scores: { n, d: k, data: scores },
    components: { n: k, d, data: vRows },
    singularValues: s,
    explainedVariance,
    explainedVarianceRatio,
    mean,
  };
}

/**
 * The 2-D linear baseline embedding: scores of the first two principal
 * components (`randomizedPca(m, 2, rng)`; exact for inputs of at most
 * 250 000 entries). Needs n ≥ 2 and d ≥ 2.
 */
export function pca2(m: Matrix, rng: Rng): Embedding {
  if (m.d < 2) throw new RangeError(`a 2-D PCA embedding needs at least 2 columns, got ${m.d}`);
  const { scores } = randomizedPca(m, 2, rng);
  return { n: m.n, data: scores.data };
}

/**
 * Exact explained-variance ratios s_i² / ‖X_c‖²_F of all min(n, d) components,
 * descending, from a full thin SVD (ml-matrix 6.15) of the centred matrix.
 * Meant for tests and benchmarks: cost O(n·d·min(n, d)).
 */
export function fullPcaEvr(m: Matrix): Float64Array {
  const { n, d } = m;
  if (n < 2 || d < 1) throw new RangeError(`PCA needs at least 2 rows and 1 column, got ${n} × ${d}`);
  const { centered } = centerColumns(m);
  const frob2 = sumOfSquares(centered.data);
  if (!Number.isFinite(frob2)) throw new RangeError('PCA input contains non-finite values');
  if (frob2 === 0) throw new RangeError('PCA input has no variance: all rows are identical');
  const s = thinSvd(centered.data, n, d, false).s;
  const out = new Float64Array(s.length);
  for (let i = 0; i < s.length; i++) out[i] = (s[i] * s[i]) / frob2;
  return out;
}

function sumOfSquares(a: Float64Array): number {
  let s0 = 0, s1 = 0;
  let i = 0;
  for (; i + 2 <= a.length; i += 2) {
    s0 += a[i] * a[i];
    s1 += a[i + 1] * a[i + 1];
  }
  if (i < a.length) s0 += a[i] * a[i];
  return s0 + s1;
}

interface RightVectors {
  /** k × d, rows orthonormal. */
  vRows: Float64Array;
  /** k singular values, descending. */
  s: Float64Array;
}

/**
 * Thin SVD of a rows × cols block through ml-matrix, returning the singular
 * values (descending, length min(rows, cols)) and, if asked, the right
 * singular vectors as rows (min × cols). The SVD is always run on the tall
 * orientation so that ml-matrix never has to transpose on its own.
 */
function thinSvd(a: Float64Array, rows: number, cols: number, wantV: boolean): { s: Float64Array; vRows: Float64Array | null } {
  const r = Math.min(rows, cols);
  const tall = rows >= cols;
  const input = tall ? MlMatrix.from1DArray(rows, cols, a) : MlMatrix.from1DArray(cols, rows, transpose(a, rows, cols));
  const svd = new SingularValueDecomposition(input, {
    computeLeftSingularVectors: wantV && !tall,
    computeRightSingularVectors: wantV && tall,
  });
  const diag = svd.diagonal;
  // ml-matrix sorts descending already; order again (stable) so nothing rests on that.
  const order = Array.from({ length: r }, (_, i) => i).sort((x, y) => diag[y] - diag[x] || x - y);
  const s = new Float64Array(r);
  for (let c = 0; c < r; c++) s[c] = Math.max(0, diag[order[c]]);
  if (!wantV) return { s, vRows: null };
  // Right singular vectors of the input = right vectors of a tall input, left vectors of its transpose.
  const vecs = tall ? svd.rightSingularVectors : svd.leftSingularVectors;
  const vRows = new Float64Array(r * cols);
  for (let c = 0; c < r; c++) {
    const src = order[c];
    for (let t = 0; t < cols; t++) vRows[c * cols + t] = vecs.get(t, src);
  }
  return { s, vRows };
}

function exactRightVectors(xc: Float64Array, n: number, d: number, k: number): RightVectors {
  const { s, vRows } = thinSvd(xc, n, d, true);
  return { s: s.slice(0, k), vRows: (vRows as Float64Array).slice(0, k * d) };
}

function randomizedRightVectors(
  xc: Float64Array,
  n: number,
  d: number,
  k: number,
  oversample: number,
  q: number,
  rng: Rng,
): RightVectors {
  const ell = Math.min(k + oversample, n, d);
  const xcT = transpose(xc, n, d); // d × n

  // Ω stored as ℓ × d (its columns are the rows here), filled row by row.
  const omega = new Float64Array(ell * d);
  for (let i = 0; i < omega.length; i++) omega[i] = rng.normal();

  // Work buffers, reused across iterations.
  const y = new Float64Array(n * ell); // X_c·Z, n × ℓ
  const qT = new Float64Array(ell * n); // Qᵀ, rows orthonormal
  const zd = new Float64Array(d * ell); // X_cᵀ·Q, d × ℓ
  const zT = new Float64Array(ell * d); // Zᵀ, rows orthonormal

  // Qᵀ = orth((X_c·Ω)ᵀ); X_c·Ω is computed as X_c·(Ωᵀ)ᵀ.
  transpose(multiplyABt(xc, n, omega, ell, d, y), n, ell, qT);
  orthonormalizeRowsInPlace(qT, ell, n);
  for (let it = 0; it < q; it++) {
    // Zᵀ = orth((X_cᵀ·Q)ᵀ), then Qᵀ = orth((X_c·Z)ᵀ).
    transpose(multiplyABt(xcT, d, qT, ell, n, zd), d, ell, zT);
    orthonormalizeRowsInPlace(zT, ell, d);
    transpose(multiplyABt(xc, n, zT, ell, d, y), n, ell, qT);
    orthonormalizeRowsInPlace(qT, ell, n);
  }
  // B = QᵀX_c (ℓ × d), as the transpose of X_cᵀ·Q; the components are its right singular vectors.
  const b = transpose(multiplyABt(xcT, d, qT, ell, n, zd), d, ell, zT);
  // Small SVD without touching a d-sized decomposition: orthonormalise B's rows
  // (B = L·P with P = orth(B), L = B·Pᵀ of size ℓ × ℓ), take the SVD L = U·S·Wᵀ
  // (ml-matrix), and then B = U·S·(Wᵀ·P): the right singular vectors of B are Wᵀ·P.
  const p = b.slice();
  orthonormalizeRowsInPlace(p, ell, d);
  const factor = multiplyABt(b, ell, p, ell, d);
  const { s, vRows: wT } = thinSvd(factor, ell, ell, true);
  const vRows = multiplyABt((wT as Float64Array).subarray(0, k * ell), k, transpose(p, ell, d, zd), d, ell);
  return { s: s.slice(0, k), vRows };
}

/** Flip each row so that its entry of largest |value| (lowest index among equals) is positive. */
function fixSigns(vRows: Float64Array, k: number, d: number): void {
  for (let c = 0; c < k; c++) {
    const o = c * d;
    let best = 0;
    let bestAbs = -1;
    for (let t = 0; t < d; t++) {
      const a = Math.abs(vRows[o + t]);
      if (a > bestAbs) {
        bestAbs = a;
        best = t;
      }
    }
    if (vRows[o + best] < 0) {
      for (let t = 0; t < d; t++) vRows[o + t] = -vRows[o + t];
    }
  }
}
