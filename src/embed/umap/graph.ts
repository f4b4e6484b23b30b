/**
 * UMAP's fuzzy simplicial set (McInnes, Healy & Melville 2018, arXiv
 * 1802.03426, §3.1 and Appendix), computed as umap-learn's
 * `fuzzy_simplicial_set` does with `local_connectivity = 1`, `bandwidth = 1`
 * and `set_op_mix_ratio = 1`, on compressed sparse rows.
 */
import type { KnnGraph } from '../../core/types.js';

/**
 * The symmetric fuzzy graph: n vertices in CSR form, row i's neighbours in
 * indices[indptr[i] .. indptr[i+1]) with columns ascending, membership
 * strengths in (0, 1] in `weights`; w_ij = w_ji exactly; no diagonal.
 */
export interface FuzzyGraph {
  readonly n: number;
  readonly indptr: Int32Array;
  readonly indices: Int32Array;
  readonly weights: Float64Array;
}

/** Bisection steps for σ_i (umap-learn `smooth_knn_dist`, n_iter = 64). */
export const SMOOTH_K_STEPS = 64;
/** Stop the bisection when |Σ_j exp(−(d_ij − ρ_i)/σ_i) − log2 k| is below this (umap-learn SMOOTH_K_TOLERANCE). */
export const SMOOTH_K_TOLERANCE = 1e-5;
/** σ_i is at least this fraction of the mean neighbour distance (umap-learn MIN_K_DIST_SCALE). */
export const MIN_K_DIST_SCALE = 1e-3;

/** Per-point distance to the nearest neighbour (ρ) and bandwidth (σ). */
export interface SmoothDistances {
  rhos: Float64Array;
  sigmas: Float64Array;
}

function checkKnn(knn: KnnGraph, nNeighbors: number): void {
  if (!Number.isInteger(nNeighbors) || nNeighbors < 2 || nNeighbors > knn.n) {
    throw new RangeError(`nNeighbors must be an integer in 2..n = 2..${knn.n}, got ${nNeighbors}`);
  }
  if (knn.k < nNeighbors - 1) {
    throw new RangeError(`neighbour graph has ${knn.k} columns; nNeighbors = ${nNeighbors} needs ${nNeighbors - 1}`);
  }
}

/**
 * ρ_i and σ_i for every point from its nNeighbors − 1 nearest other points
 * (umap-learn counts the point itself as the first of its n_neighbors, at
 * distance 0, so the first nNeighbors − 1 columns of `knn` are used).
 *
 * ρ_i is the smallest non-zero neighbour distance (0 when all are zero).
 * σ_i solves Σ_j exp(−max(0, d_ij − ρ_i)/σ_i) = log2(nNeighbors) by bisection:
 * start at 1, double until bracketed, at most 64 steps, stop within 1e-5.
 * Floor: σ_i ≥ 1e-3 × the mean of row i's distances (counting the zero to
 * itself), or of all rows' distances when ρ_i = 0.
 */
export function smoothKnnDistances(knn: KnnGraph, nNeighbors: number): SmoothDistances {
  checkKnn(knn, nNeighbors);
  const { n, k, distances } = knn;
  const m = nNeighbors - 1;
  const target = Math.log2(nNeighbors);
  const rhos = new Float64Array(n);
  const sigmas = new Float64Array(n);
  let globalMean = -1;
  for (let i = 0; i < n; i++) {
    const base = i * k;
    let rho = 0;
    let rowSum = 0;
    for (let j = 0; j < m; j++) {
      const dij = distances[base + j];
      rowSum += dij;
      if (rho === 0 && dij > 0) rho = dij;
    }
    let lo = 0;
    let hi = Number.POSITIVE_INFINITY;
    let mid = 1;
    for (let step = 0; step < SMOOTH_K_STEPS; step++) {
      let psum = 0;
      for (let j = 0; j < m; j++) {
        const dd = distances[base + j] - rho;
        psum += dd > 0 ? Math.exp(-(dd / mid)) : 1;
      }
      if (Math.abs(psum - target) < SMOOTH_K_TOLERANCE) break;
      if (psum > target) {
        hi = mid;
        mid = (lo + hi) / 2;
      } else {
        lo = mid;
        mid = hi === Number.POSITIVE_INFINITY ? mid * 2 : (lo + hi) / 2;
      }
    }
    let sigma = mid;
    if (rho > 0) {
      const rowMean = rowSum / nNeighbors;
      if (sigma < MIN_K_DIST_SCALE * rowMean) sigma = MIN_K_DIST_SCALE * rowMean;
    } else {
      if (globalMean < 0) {
        let s = 0;
        for (let r = 0; r < n; r++) for (let j = 0; j < m; j++) s += distances[r * k + j];
        globalMean = s / (n * nNeighbors);
      }
      if (sigma < MIN_K_DIST_SCALE * globalMean) sigma = MIN_K_DIST_SCALE * globalMean;
    }
    rhos[i] = rho;
    sigmas[i] = sigma;
  }
  return { rhos, sigmas };
}

/**
 * The fuzzy simplicial set of a k-nearest-neighbour graph.
 *
 * Directed memberships a_ij = exp(−max(0, d_ij − ρ_i)/σ_i) (1 when
 * d_ij ≤ ρ_i or σ_i = 0) for j among i's nNeighbors − 1 nearest other points,
 * then the fuzzy union (probabilistic t-conorm) W = A + Aᵀ − A∘Aᵀ. Entries
 * that underflow to 0 are dropped.
 *
 * @param knn neighbours of every point, self excluded, sorted by (distance,
 *   index), Euclidean distances, at least nNeighbors − 1 columns.
 * @param nNeighbors umap-learn's n_neighbors (counts the point itself), 2 ≤ nNeighbors ≤ n.
 * @returns the symmetric graph in CSR form (about 1.3–1.6 × n × (nNeighbors − 1) stored entries).
 */
export function fuzzySimplicialSet(knn: KnnGraph, nNeighbors: number): FuzzyGraph {
  const { rhos, sigmas } = smoothKnnDistances(knn, nNeighbors);
  const { n, k, indices, distances } = knn;
  const m = nNeighbors - 1;

  // A in CSR with each row's columns ascending.
  const aPtr = new Int32Array(n + 1);
  const aIdx = new Int32Array(n * m);
  const aVal = new Float64Array(n * m);
  const cols = new Int32Array(m);
  const vals = new Float64Array(m);
  let nnz = 0;
  for (let i = 0; i < n; i++) {
    let cnt = 0;
    for (let j = 0; j < m; j++) {
      const col = indices[i * k + j];
      if (col === i) continue;
      const dd = distances[i * k + j] - rhos[i];
      const v = dd <= 0 || sigmas[i] === 0 ? 1 : Math.exp(-(dd / sigmas[i]));
      if (v === 0) continue;
      // Insertion into the row, sorted by column.
      let p = cnt++;
      while (p > 0 && cols[p - 1] > col) {
        cols[p] = cols[p - 1];
        vals[p] = vals[p - 1];
        p--;
      }
      cols[p] = col;
      vals[p] = v;
    }
    aIdx.set(cols.subarray(0, cnt), nnz);
    aVal.set(vals.subarray(0, cnt), nnz);
    nnz += cnt;
    aPtr[i + 1] = nnz;
  }

  // Aᵀ by counting sort; rows come out with ascending columns because sources are visited in order.
  const tPtr = new Int32Array(n + 1);
  for (let e = 0; e < nnz; e++) tPtr[aIdx[e] + 1]++;
  for (let i = 0; i < n; i++) tPtr[i + 1] += tPtr[i];
  const tIdx = new Int32Array(nnz);
  const tVal = new Float64Array(nnz);
  const fill = tPtr.slice(0, n);
  for (let i = 0; i < n; i++) {
    for (let e = aPtr[i]; e < aPtr[i + 1]; e++) {
      const q = fill[aIdx[e]]++;
      tIdx[q] = i;
      tVal[q] = aVal[e];
    }
  }

  // W = A + Aᵀ − A∘Aᵀ by merging the two sorted rows.
  const indptr = new Int32Array(n + 1);
  const outIdx = new Int32Array(2 * nnz);
  const outVal = new Float64Array(2 * nnz);
  let w = 0;
  for (let i = 0; i < n; i++) {
    let p = aPtr[i];
    const pEnd = aPtr[i + 1];
    let q = tPtr[i];
    const qEnd = tPtr[i + 1];
    while (p < pEnd || q < qEnd) {
      const cp = p < pEnd ? aIdx[p] : n;
      const cq = q < qEnd ? tIdx[q] : n;
      let col: number;
      let v: number;
      if (cp === cq) {
        const x = aVal[p++];
        const y = tVal[q++];
        col = cp;
        v = x + y - x * y;
      } else if (cp < cq) {
        col = cp;
        v = aVal[p++];
      } else {
        col = cq;
        v = tVal[q++];
      }
      if (v !== 0) {
        outIdx[w] = col;
        outVal[w] = v;
        w++;
      }
    }
    indptr[i + 1] = w;
  }
  return { n, indptr, indices: outIdx.slice(0, w), weights: outVal.slice(0, w) };
}

/** Largest weight of the graph (0 when it has no edges). */
export function maxWeight(g: FuzzyGraph): number {
  let mx = 0;
  for (let e = 0; e < g.weights.length; e++) if (g.weights[e] > mx) mx = g.weights[e];
  return mx;
}

/**
 * A copy of g without the edges whose weight is below `threshold` (umap-learn
 * drops w < max(w)/n_epochs before optimising: such edges would be sampled
 * less than once). Symmetry is kept because w_ij = w_ji.
 */
export function pruneGraph(g: FuzzyGraph, threshold: number): FuzzyGraph {
  const { n, indptr, indices, weights } = g;
  const outPtr = new Int32Array(n + 1);
  let cnt = 0;
  for (let e = 0; e < weights.length; e++) if (!(weights[e] < threshold)) cnt++;
  const outIdx = new Int32Array(cnt);
  const outW = new Float64Array(cnt);
  let t = 0;
  for (let i = 0; i < n; i++) {
    for (let e = indptr[i]; e < indptr[i + 1]; e++) {
      if (weights[e] < threshold) continue;
      outIdx[t] = indices[e];
      outW[t] = weights[e];
      t++;
    }
    outPtr[i + 1] = t;
  }
  return { n, indptr: outPtr, indices: outIdx, weights: outW };
}
