/**
 * Principal component analysis by a randomized block Krylov method (C. Musco
 * & C. Musco, "Randomized block Krylov methods for stronger and faster
 * approximate singular value decomposition", NeurIPS 2015; the randomized
 * range finder framework of N. Halko, P.-G. Martinsson & J. A. Tropp,
 * "Finding structure with randomness", SIAM Review 53:217–288, 2011), with
 * an exact path for small inputs.
 */
import { EigenvalueDecomposition, Matrix as MlMatrix, SingularValueDecomposition } from 'ml-matrix';

import type { Rng } from '../core/rng.js';
import type { Embedding, Matrix } from '../core/types.js';
import { multiplyABt, orthonormalizeRowsInPlace, transpose } from './dense.js';
import { runTasks, sharedFloat64, startWorkers, toSharedFloat64 } from './parallel.js';
import { centerColumns, columnMeans } from './scale.js';
import { gemmTasks } from './tasks.js';

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
  /**
   * Block size b: random starting directions of the Krylov space. Default
   * max(4, ⌈k/5⌉) (10 for k = 50).
   */
  blockSize?: number;
  /**
   * Krylov depth q: the basis spans Ω, (X_cᵀX_c)·Ω, …, (X_cᵀX_c)^q·Ω, at the cost
   * of 2q + 1 products of X_c or X_cᵀ with b vectors. Default 12.
   */
  powerIterations?: number;
  /**
   * 'auto' (default) takes the exact path when k ≥ min(n, d) or n·d ≤ 250 000,
   * the randomized one otherwise; 'exact' and 'randomized' force a path.
   */
  solver?: 'auto' | 'exact' | 'randomized';
  /**
   * Threads for the large products of the randomized path, counting the
   * calling thread (default 1). Each entry of a product is computed by one
   * thread in a fixed order, so the result is the same bytes for any count.
   */
  threads?: number;
}

/** Inputs with at most this many entries are decomposed exactly under `solver: 'auto'`. */
export const EXACT_PCA_MAX_ENTRIES = 250_000;

/** Default Krylov depth q. */
export const DEFAULT_KRYLOV_DEPTH = 12;

/**
 * PCA of the rows of `m` (n × d) keeping k components, 1 ≤ k ≤ min(n, d), n ≥ 2.
 *
 * Randomized path (block Krylov with full reorthogonalisation and a
 * Rayleigh–Ritz step): draw a b × d Gaussian block from `rng` (row by row),
 * V_0 = orth(Ω); then V_{j+1} = orth((X_cᵀX_c)·V_j) against all earlier
 * blocks, until the basis V (K × d, orthonormal rows) has
 * K = min(min(n, d), max(b·(q + 1), k)) rows. Every product X_c·V_j is kept,
 * so U = X_c·Vᵀ (n × K) comes for free; the eigenvectors W of the K × K Gram
 * matrix UᵀU give the components Wᵀ·V (top k), their scores U·W, and the
 * singular values as the norms of those score columns. Orthonormalisation is
 * modified Gram–Schmidt applied twice. Working memory: the centred data and
 * its transpose (2·n·d doubles) plus K·(n + d).
 *
 * The Krylov basis resolves small gaps between singular values with far
 * fewer products than plain subspace iteration: on a 3000 × 1280 10-centre
 * Gaussian mixture (bench/mixture.ts), where the 10th and 11th
 * explained-variance ratios differ by 5e-7, the defaults (25 products with
 * 10 vectors) get the top 10 ratios within 2e-8 of an exact SVD, where
 * subspace iteration with 7 power iterations and 60 vectors (16 products,
 * scikit-learn 1.2's defaults) misses by 1.5e-6.
 *
 * Exact path: thin SVD of the centred matrix (ml-matrix 6.15).
 *
 * Sign rule (both paths, so results are deterministic): each component is
 * flipped so that its entry of largest absolute value is positive; among
 * equal absolute values the lowest index decides.
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
  const b = opts.blockSize ?? Math.max(4, Math.ceil(k / 5));
  if (!Number.isInteger(b) || b < 1) throw new RangeError(`blockSize must be a positive integer, got ${b}`);
  const q = opts.powerIterations ?? DEFAULT_KRYLOV_DEPTH;
  if (!Number.isInteger(q) || q < 0) {
    throw new RangeError(`powerIterations must be a non-negative integer, got ${q}`);
  }
  const solver = opts.solver ?? 'auto';
  if (solver !== 'auto' && solver !== 'exact' && solver !== 'randomized') {
    throw new RangeError(`solver must be 'auto', 'exact' or 'randomized', got ${String(solver)}`);
  }
  const threads = opts.threads ?? 1;
  if (!Number.isInteger(threads) || threads < 1) throw new RangeError(`threads must be a positive integer, got ${threads}`);

  const exact = solver === 'exact' || (solver === 'auto' && (k >= r || n * d <= EXACT_PCA_MAX_ENTRIES));
  // Worker threads start loading now, while this thread prepares.
  if (!exact && threads > 1) startWorkers(threads - 1);
  const mean = columnMeans(m);
  const frob2 = centredSumOfSquares(m, mean);
  if (!Number.isFinite(frob2)) throw new RangeError('PCA input contains non-finite values');
  if (frob2 === 0) throw new RangeError('PCA input has no variance: all rows are identical');

  let vRows: Float64Array;
  let s: Float64Array;
  let scores: Float64Array;
  if (exact) {
    const xc = centerColumns(m).centered.data;
    ({ vRows, s } = exactRightVectors(xc, n, d, k));
    fixSigns(vRows, null, k, d, n);
    scores = multiplyABt(xc, n, vRows, k, d);
  } else {
    ({ vRows, s, scores } = blockKrylov(m.data, mean, n, d, k, b, q, rng, threads));
    fixSigns(vRows, scores, k, d, n);
  }
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

/** Σ_ij (m_ij − mean_j)², two running sums. */
function centredSumOfSquares(m: Matrix, mean: Float64Array): number {
  const { n, d, data } = m;
  let s0 = 0, s1 = 0;
  for (let i = 0; i < n; i++) {
    const o = i * d;
    let j = 0;
    for (; j + 2 <= d; j += 2) {
      const a = data[o + j] - mean[j];
      const b = data[o + j + 1] - mean[j + 1];
      s0 += a * a;
      s1 += b * b;
    }
    if (j < d) {
      const a = data[o + j] - mean[j];
      s0 += a * a;
    }
  }
  return s0 + s1;
}

/** (X − 1·meanᵀ)ᵀ of the n × d row-major `x`, into `out` (d × n). */
function centredTranspose(x: Float64Array, mean: Float64Array, n: number, d: number, out: Float64Array): Float64Array {
  // Bands of 64 source columns, as `transpose`.
  const band = 64;
  for (let j0 = 0; j0 < d; j0 += band) {
    const j1 = Math.min(d, j0 + band);
    for (let i = 0; i < n; i++) {
      const src = i * d;
      for (let j = j0; j < j1; j++) out[j * n + i] = x[src + j] - mean[j];
    }
  }
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

/**
 * C = A·Bᵀ (rA × rB) into `out`, on `threads` threads when that pays (the
 * arrays must then live in shared memory).
 */
function product(
  a: Float64Array,
  rA: number,
  b: Float64Array,
  rB: number,
  len: number,
  out: Float64Array,
  threads: number,
): void {
  // Below ~2 Mflop a worker's wake-up costs more than it saves.
  if (threads === 1 || rA * rB * len < 1_000_000) multiplyABt(a, rA, b, rB, len, out);
  else runTasks(gemmTasks(a, rA, b, rB, len, out, threads));
}

interface KrylovResult extends RightVectors {
  /** n × k: the scores (X_c · componentᵀ). */
  scores: Float64Array;
}

/**
 * The randomized path of `randomizedPca`; see there. `x` is the uncentred
 * data: products X_c·v are formed as X·v − (meanᵀv)·1, which spares an n × d
 * centred copy, while X_cᵀ is stored centred.
 */
function blockKrylov(
  x0: Float64Array,
  mean: Float64Array,
  n: number,
  d: number,
  k: number,
  b: number,
  q: number,
  rng: Rng,
  threads: number,
): KrylovResult {
  const alloc = threads > 1 ? sharedFloat64 : (len: number) => new Float64Array(len);
  const K = Math.min(Math.min(n, d), Math.max(b * (q + 1), k));
  const x = threads > 1 ? toSharedFloat64(x0) : x0;
  const xT = centredTranspose(x0, mean, n, d, alloc(n * d)); // X_cᵀ, d × n
  const v = alloc(K * d); // basis, rows orthonormal
  const u = alloc(K * n); // u[i] = X_c · v[i]

  let rows = Math.min(b, K);
  for (let i = 0; i < rows * d; i++) v[i] = rng.normal();
  orthonormalizeRowsInPlace(v, rows, d);
  let start = 0;
  for (;;) {
    product(v.subarray(start * d, rows * d), rows - start, x, n, d, u.subarray(start * n, rows * n), threads);
    for (let i = start; i < rows; i++) {
      let shift = 0;
      for (let t = 0; t < d; t++) shift += v[i * d + t] * mean[t];
      for (let t = i * n; t < (i + 1) * n; t++) u[t] -= shift;
    }
    if (rows >= K) break;
    // Next block: rows (X_cᵀ·X_c·v_i)ᵀ = u_i·X_c for v_i in the last block,
    // orthogonalised against every earlier row.
    const nb = Math.min(b, K - rows);
    product(u.subarray(start * n, (start + nb) * n), nb, xT, d, n, v.subarray(rows * d, (rows + nb) * d), threads);
    orthonormalizeRowsInPlace(v.subarray(0, (rows + nb) * d), rows + nb, d, rows);
    start = rows;
    rows += nb;
  }

  // Rayleigh–Ritz: eigenvectors of the Gram matrix G = UᵀU (K × K; `u` holds
  // the columns of U as rows). Entry (i, j) and (j, i) are the same sum, so G
  // is symmetric to the bit.
  const g = alloc(K * K);
  product(u, K, u, K, n, g, threads);
  const rowsG: number[][] = [];
  for (let i = 0; i < K; i++) rowsG.push(Array.from(g.subarray(i * K, (i + 1) * K)));
  const evd = new EigenvalueDecomposition(new MlMatrix(rowsG), { assumeSymmetric: true });
  const lambda = evd.realEigenvalues;
  const vecs = evd.eigenvectorMatrix;
  const order = Array.from({ length: K }, (_, i) => i).sort((i, j) => lambda[j] - lambda[i] || i - j);

  // Components Wᵀ·V (k × d) and scores U·W (n × k) of the top k, as products
  // over the basis index (in order) with transposed copies of V and U.
  const wT = alloc(k * K);
  for (let c = 0; c < k; c++) for (let i = 0; i < K; i++) wT[c * K + i] = vecs.get(i, order[c]);
  const comp = alloc(k * d);
  product(wT, k, transpose(v, K, d, alloc(d * K)), d, K, comp, threads);
  const y = alloc(n * k);
  product(transpose(u, K, n, alloc(n * K)), n, wT, k, K, y, threads);
  // Singular values as score norms: accurate even far below σ₁, where the Gram matrix is not.
  const norms = new Float64Array(k);
  for (let i = 0; i < n; i++) for (let c = 0; c < k; c++) norms[c] += y[i * k + c] * y[i * k + c];
  for (let c = 0; c < k; c++) norms[c] = Math.sqrt(norms[c]);
  const byNorm = Array.from({ length: k }, (_, i) => i).sort((i, j) => norms[j] - norms[i] || i - j);
  const vRows = new Float64Array(k * d);
  const scores = new Float64Array(n * k);
  const s = new Float64Array(k);
  byNorm.forEach((src, c) => {
    vRows.set(comp.subarray(src * d, (src + 1) * d), c * d);
    for (let i = 0; i < n; i++) scores[i * k + c] = y[i * k + src];
    s[c] = norms[src];
  });
  return { vRows, s, scores };
}

/**
 * Flip each component row (k × d) so that its entry of largest |value| (lowest
 * index among equals) is positive, and the matching score column of `scores`
 * (n × k, when given) with it.
 */
function fixSigns(vRows: Float64Array, scores: Float64Array | null, k: number, d: number, n: number): void {
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
      if (scores !== null) for (let i = 0; i < n; i++) scores[i * k + c] = -scores[i * k + c];
    }
  }
}
